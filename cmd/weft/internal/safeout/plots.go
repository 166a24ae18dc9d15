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
func ReplacePlots(path string, files []FileData) error {
	failed := func(p Problem, at string, err error) error {
		return &Error{Problem: p, Target: TargetPlots, Path: at, Err: err, Late: true}
	}
	cleanup.mu.Lock()
	tmp := helperPath(path, tmpTag+randomTag())
	err := os.Mkdir(tmp, 0o777)
	if err == nil {
		trackTemp(tmp)
	}
	cleanup.mu.Unlock()
	if err != nil {
		return failed(WriteFailed, path, err)
	}
	defer func() {
		os.RemoveAll(tmp)
		untrackTemp(tmp)
	}()
	for _, f := range files {
		if err := writeNewFile(filepath.Join(tmp, f.Name), f.Data); err != nil {
			return failed(WriteFailed, filepath.Join(path, f.Name), err)
		}
	}
	cleanup.mu.Lock()
	old := ""
	if _, err := os.Lstat(path); err == nil {
		old = helperPath(path, oldTag+randomTag())
		if err := os.Rename(path, old); err != nil {
			cleanup.mu.Unlock()
			return failed(ReplaceFailed, path, err)
		}
		trackTemp(old)
	}
	if err := os.Rename(tmp, path); err != nil {
		if old != "" && os.Rename(old, path) == nil {
			delete(cleanup.temps, old)
		}
		cleanup.mu.Unlock()
		return failed(WriteFailed, path, err)
	}
	cleanup.mu.Unlock()
	if old != "" {
		os.RemoveAll(old)
		untrackTemp(old)
	}
	return nil
}
