package safeout

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

// Dir is an output folder being written: files go into a temporary
// sibling folder, and Commit moves the finished folder into place, so an
// interrupted run leaves either the old folder or the new one, never a
// mixture.
type Dir struct {
	final   string
	tmp     string
	existed bool
	inputs  []string
	lock    *Lock
	files   []string // written so far, slash-separated, relative
}

// PrepareDir checks, before any work, that the folder dir can be written:
// its parent exists and is writable, nobody else is writing it, and it
// does not exist — or, with force, is a folder weft wrote that holds
// nothing else and contains none of inputs (the files the run reads). It
// then creates the temporary folder. Call Close when done.
func PrepareDir(dir string, force bool, inputs []string) (*Dir, error) {
	d, err := prepareDir(dir, force, inputs)
	var e *Error
	if errors.As(err, &e) {
		e.Target = TargetFolder
	}
	return d, err
}

func prepareDir(dir string, force bool, inputs []string) (*Dir, error) {
	o := &Dir{final: filepath.Clean(dir), inputs: inputs}
	if b := filepath.Base(o.final); b == "." || b == ".." || b == string(filepath.Separator) {
		return nil, &Error{Problem: NotWholeFolder, Path: dir}
	}
	if err := CheckParent(o.final); err != nil {
		return nil, err
	}
	l, err := Acquire(o.final)
	if err != nil {
		return nil, err
	}
	o.lock = l
	if err := o.check(force); err != nil {
		o.Close()
		return nil, err
	}
	RemoveStale(o.final)
	cleanup.mu.Lock()
	o.tmp = helperPath(o.final, tmpTag+randomTag())
	err = os.Mkdir(o.tmp, 0o777)
	if err == nil {
		trackTemp(o.tmp)
	}
	cleanup.mu.Unlock()
	if err != nil {
		o.tmp = ""
		o.Close()
		return nil, &Error{Problem: Unwritable, Path: o.final, Folder: filepath.Dir(o.final), Err: err}
	}
	return o, nil
}

// check looks at what is at the folder's path now.
func (o *Dir) check(force bool) *Error {
	st, e := existing(o.final, TargetFolder, true, &o.existed)
	if e != nil || st == nil {
		return e
	}
	if !force {
		if m := st.Mode(); !m.IsDir() || m&fs.ModeSymlink != 0 {
			// What force could never replace is named as what it is,
			// not offered to force.
			return &Error{Target: TargetFolder, Path: o.final, Problem: NotOutputFolder, Found: KindOf(m)}
		}
		return &Error{Problem: Exists, Target: TargetFolder, Path: o.final}
	}
	return replaceable(o.final, st.Mode(), o.inputs)
}

// replaceable says why force may not replace the folder dir, or nil.
func replaceable(dir string, mode fs.FileMode, inputs []string) *Error {
	e := &Error{Target: TargetFolder, Path: dir}
	if !mode.IsDir() || mode&fs.ModeSymlink != 0 {
		e.Problem, e.Found = NotOutputFolder, KindOf(mode)
		return e
	}
	abs, err := filepath.Abs(dir)
	if err != nil {
		e.Problem, e.Err = Unusable, err
		return e
	}
	if wd, err := os.Getwd(); err == nil && within(wd, abs) {
		e.Problem = HoldsWorkDir
		return e
	}
	for _, in := range inputs {
		if a, err := filepath.Abs(in); err == nil && within(a, abs) {
			e.Problem, e.Input = HoldsInput, in
			return e
		}
	}
	listed, hasMarker, me := readMarker(dir)
	if me != nil {
		me.Target = TargetFolder
		return me
	}
	if !hasMarker && !legacyOutput(dir) {
		e.Problem = NoMarker
		return e
	}
	if foreign := foreignEntries(dir, listed, hasMarker); len(foreign) > 0 {
		e.Problem, e.Entries = Foreign, foreign
		return e
	}
	return nil
}

// within reports whether path p is dir or lies inside it (both absolute).
func within(p, dir string) bool {
	rel, err := filepath.Rel(dir, p)
	return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator))
}

// Sink is where the files of one output folder go: a *Dir, or a SubFolder
// of one.
type Sink interface {
	// Write writes one file, rel relative to the folder (it may name
	// subfolders, e.g. plots/x.svg).
	Write(rel string, data []byte) error
	// Dirs returns where the files written so far can be read back and
	// the folder's name as the user will see it.
	Dirs() (tmp, final string)
}

// Dirs implements Sink.
func (o *Dir) Dirs() (string, string) { return o.tmp, o.final }

// Sub is the folder rel inside o.
func (o *Dir) Sub(rel string) SubFolder { return SubFolder{od: o, rel: rel} }

// SubFolder is a folder inside an output folder being written, such as
// one specimen's folder inside a cohort's.
type SubFolder struct {
	od  *Dir
	rel string
}

// Write implements Sink.
func (s SubFolder) Write(rel string, data []byte) error {
	return s.od.Write(filepath.Join(s.rel, rel), data)
}

// Dirs implements Sink.
func (s SubFolder) Dirs() (string, string) {
	return filepath.Join(s.od.tmp, s.rel), filepath.Join(s.od.final, s.rel)
}

// WriteMarker writes the subfolder's own marker, listing the files written
// into it so far, so that the subfolder, copied out on its own, is still
// recognised as weft's.
func (s SubFolder) WriteMarker() error {
	prefix := filepath.ToSlash(s.rel) + "/"
	var files []string
	for _, f := range s.od.files {
		if r, ok := strings.CutPrefix(f, prefix); ok {
			files = append(files, r)
		}
	}
	return s.Write(MarkerName, markerBytes(files))
}

// path returns where a file named rel is written before Commit.
func (o *Dir) path(rel string) string { return filepath.Join(o.tmp, rel) }

// Write writes one file of the folder (rel may name subfolders, e.g.
// plots/x.svg). Errors name the final path, not the temporary one.
func (o *Dir) Write(rel string, data []byte) error {
	p := o.path(rel)
	if d := filepath.Dir(p); d != o.tmp {
		if err := mkdirsBelow(o.tmp, d); err != nil {
			return &Error{Problem: WriteFailed, Target: TargetFolder, Path: filepath.Join(o.final, rel), Err: err, Late: true}
		}
	}
	if err := writeNewFile(p, data); err != nil {
		return &Error{Problem: WriteFailed, Target: TargetFolder, Path: filepath.Join(o.final, rel), Err: err, Late: true}
	}
	o.files = append(o.files, filepath.ToSlash(rel))
	return nil
}

// mkdirsBelow creates the folders from root (which must exist) down to
// dir, one level at a time and never with MkdirAll: if an interruption
// removed the temporary folder root, nothing recreates it.
func mkdirsBelow(root, dir string) error {
	rel, err := filepath.Rel(root, dir)
	if err != nil {
		return err
	}
	cur := root
	for _, part := range strings.Split(rel, string(filepath.Separator)) {
		cur = filepath.Join(cur, part)
		if err := os.Mkdir(cur, 0o777); err != nil && !errors.Is(err, fs.ErrExist) {
			return err
		}
	}
	return nil
}

// Commit writes the marker and moves the finished folder into place,
// replacing the old one only if it still may be replaced (force as for
// PrepareDir); otherwise it returns a Late *Error and keeps what is there.
func (o *Dir) Commit(force bool) error {
	if err := writeNewFile(o.path(MarkerName), markerBytes(o.files)); err != nil {
		return &Error{Problem: WriteFailed, Target: TargetFolder, Path: filepath.Join(o.final, MarkerName), Err: err, Late: true}
	}
	existed := o.existed
	if e := o.check(force); e != nil || o.existed != existed {
		if e == nil {
			e = &Error{Problem: Appeared, Target: TargetFolder, Path: o.final}
		}
		e.Late = true
		return e
	}
	failed := func(p Problem, err error) error {
		return &Error{Problem: p, Target: TargetFolder, Path: o.final, Err: err, Late: true}
	}
	cleanup.mu.Lock()
	old := ""
	if existed {
		old = helperPath(o.final, oldTag+randomTag())
		if err := os.Rename(o.final, old); err != nil {
			cleanup.mu.Unlock()
			return failed(ReplaceFailed, err)
		}
		trackTemp(old)
	}
	// Without an old folder the rename fails if a non-empty folder appeared
	// in the last instant, which is then kept.
	if err := os.Rename(o.tmp, o.final); err != nil {
		if old != "" && os.Rename(old, o.final) == nil {
			delete(cleanup.temps, old)
		}
		cleanup.mu.Unlock()
		return failed(WriteFailed, err)
	}
	delete(cleanup.temps, o.tmp)
	o.tmp = ""
	cleanup.mu.Unlock()
	if old != "" {
		os.RemoveAll(old)
		untrackTemp(old)
	}
	return nil
}

// Close removes the temporary folder if it was not committed and releases
// the lock; it may be called more than once, and on nil.
func (o *Dir) Close() {
	if o == nil {
		return
	}
	if o.tmp != "" {
		os.RemoveAll(o.tmp)
		untrackTemp(o.tmp)
		o.tmp = ""
	}
	o.lock.Release()
	o.lock = nil
}
