package safeout

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
)

// CheckPlots makes sure the plots folder plotsPath of an output folder
// whose marker lists listed (found says whether it has one; ReadMarker)
// may be replaced: it does not exist, or (with force) it is a folder that
// holds only plots weft wrote. Problems are *Error with TargetPlots.
func CheckPlots(plotsPath string, force bool, listed map[string]bool, found bool) error {
	e := &Error{Target: TargetPlots, Path: plotsPath}
	st, err := os.Lstat(plotsPath)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		e.Problem, e.Err = Unusable, err
		return e
	case !force:
		e.Problem = Exists
		return e
	case !st.IsDir() || st.Mode()&fs.ModeSymlink != 0:
		e.Problem, e.Found = NotOutputFolder, KindOf(st.Mode())
		return e
	}
	entries, err := os.ReadDir(plotsPath)
	if err != nil {
		e.Problem, e.Err = Unreadable, err
		return e
	}
	var foreign []string
	for _, d := range entries {
		rel := "plots/" + d.Name()
		ok := d.Type().IsRegular() && (found && listed[rel] || !found && legacyPlot(rel)) || IsHelper(d.Name())
		if !ok && len(foreign) < 5 {
			foreign = append(foreign, rel)
		}
	}
	if len(foreign) > 0 {
		e.Problem, e.Entries = Foreign, foreign
		return e
	}
	return nil
}

// FileData is one file to write: its name and its bytes.
type FileData struct {
	// Name is the file's name inside its folder.
	Name string
	// Data is the file's contents.
	Data []byte
}

// ReplacePlots writes files into a temporary sibling of the plots folder
// path and swaps it in for path, so that a reader never sees a mixture of
// old and new plots. The caller holds the lock of the output folder that
// holds path and has checked that path may be replaced (CheckPlots).
// It is StagePlots followed by Commit.
func ReplacePlots(path string, files []FileData) error {
	s, err := StagePlots(path, files)
	if err != nil {
		return err
	}
	defer s.Discard()
	return s.Commit()
}

// StagedPlots is a plots folder written in full beside its final place
// and not yet swapped in: the writing, which is work, is done by
// StagePlots, and Commit is a rename or two, short enough to be held
// against an interruption (HoldInterruptions).
type StagedPlots struct {
	path, tmp string
}

// StagePlots writes files into a temporary sibling of the plots folder
// path, for Commit to swap in; an interruption before then removes it.
// Call Discard when done (after Commit it does nothing). The caller holds
// the lock of the output folder that holds path.
func StagePlots(path string, files []FileData) (*StagedPlots, error) {
	cleanup.mu.Lock()
	tmp := helperPath(path, tmpTag+randomTag())
	err := os.Mkdir(tmp, 0o777)
	if err == nil {
		trackTemp(tmp)
	}
	cleanup.mu.Unlock()
	if err != nil {
		return nil, plotsFailed(WriteFailed, path, err)
	}
	s := &StagedPlots{path: path, tmp: tmp}
	for _, f := range files {
		if err := writeNewFile(filepath.Join(tmp, f.Name), f.Data); err != nil {
			s.Discard()
			return nil, plotsFailed(WriteFailed, filepath.Join(path, f.Name), err)
		}
	}
	return s, nil
}

// Discard removes the staged folder if it was not swapped in.
func (s *StagedPlots) Discard() {
	os.RemoveAll(s.tmp)
	untrackTemp(s.tmp)
}

// Commit swaps the staged folder in for the plots folder (which need not
// exist); the old folder is removed after. Checked by CheckPlots before
// staging, the plots folder may be replaced.
func (s *StagedPlots) Commit() error {
	path, tmp := s.path, s.tmp
	cleanup.mu.Lock()
	old := ""
	if _, err := os.Lstat(path); err == nil {
		old = helperPath(path, oldTag+randomTag())
		if err := os.Rename(path, old); err != nil {
			cleanup.mu.Unlock()
			return plotsFailed(ReplaceFailed, path, err)
		}
		trackTemp(old)
	}
	if err := os.Rename(tmp, path); err != nil {
		if old != "" && os.Rename(old, path) == nil {
			delete(cleanup.temps, old)
		}
		cleanup.mu.Unlock()
		return plotsFailed(WriteFailed, path, err)
	}
	cleanup.mu.Unlock()
	if old != "" {
		os.RemoveAll(old)
		untrackTemp(old)
	}
	return nil
}

// plotsFailed is the error of a plots folder that could not be written or
// put in place, found after the work was done.
func plotsFailed(p Problem, at string, err error) error {
	return &Error{Problem: p, Target: TargetPlots, Path: at, Err: err, Late: true}
}
