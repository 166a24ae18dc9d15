package safeout

import (
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// CheckParent makes sure the folder that will hold target exists: a
// NoParent, ParentNotFolder or CannotCreate *Error when it does not.
func CheckParent(target string) error {
	parent := filepath.Dir(target)
	st, err := os.Stat(parent)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return &Error{Problem: NoParent, Path: target, Folder: parent}
	case err != nil:
		return &Error{Problem: CannotCreate, Path: target, Err: err}
	case !st.IsDir():
		return &Error{Problem: ParentNotFolder, Path: target, Folder: parent}
	}
	return nil
}

// EnsureFolder creates the folder dir, to write output files into, when it
// does not exist (its parent must). An existing non-folder is a NotFolder
// *Error.
func EnsureFolder(dir string) error {
	st, err := os.Stat(dir)
	switch {
	case err == nil && st.IsDir():
		return nil
	case err == nil:
		return &Error{Problem: NotFolder, Path: dir, Found: KindOf(st.Mode())}
	case !errors.Is(err, fs.ErrNotExist):
		return &Error{Problem: Unusable, Path: dir, Err: err}
	}
	if err := CheckParent(filepath.Clean(dir)); err != nil {
		return err
	}
	if err := os.Mkdir(dir, 0o777); err != nil && !errors.Is(err, fs.ErrExist) {
		return &Error{Problem: CannotCreate, Path: dir, Err: err}
	}
	return nil
}

// createTemp creates an empty temporary file beside target with the mode
// the umask allows (0644 under umask 022) and records it for cleanup.
func createTemp(target string) (*os.File, error) {
	cleanup.mu.Lock()
	defer cleanup.mu.Unlock()
	for {
		name := helperPath(target, tmpTag+randomTag())
		f, err := os.OpenFile(name, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o666)
		if errors.Is(err, fs.ErrExist) {
			continue
		}
		if err == nil {
			trackTemp(name)
		}
		return f, err
	}
}

// writeNewFile writes data to a new file (it must not exist) with the mode
// the umask allows.
func writeNewFile(path string, data []byte) error {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o666)
	if err != nil {
		return err
	}
	_, werr := f.Write(data)
	return errors.Join(werr, f.Close())
}

// File is one output file being written: checked and locked by
// PrepareFile, written by Commit, released by Close.
type File struct {
	final   string
	force   bool
	existed bool
	lock    *Lock
}

// PrepareFile checks, before any work, that path can be written: its
// folder exists and is writable, nobody else is writing it, and it does
// not exist (or, with force, is a regular file). locked is true when the
// caller already holds a lock covering path (a file inside an output
// folder it locked). Call Close when done.
func PrepareFile(path string, force, locked bool) (*File, error) {
	o := &File{final: filepath.Clean(path), force: force}
	if err := CheckParent(o.final); err != nil {
		return nil, err
	}
	if !locked {
		l, err := Acquire(o.final)
		if err != nil {
			return nil, err
		}
		o.lock = l
	} else if err := probeFolder(o.final); err != nil {
		// Creating the lock file is what shows, for an unlocked path,
		// that its folder is writable; a caller's lock lies beside the
		// folder it covers, not in it, so a read-only folder would
		// otherwise be found only by Commit, after the work.
		return nil, err
	}
	if err := o.check(); err != nil {
		o.Close()
		return nil, err
	}
	return o, nil
}

// probeFolder creates and removes a temporary file beside target: an
// Unwritable *Error when the folder that holds target cannot take one.
func probeFolder(target string) error {
	f, err := createTemp(target)
	if err != nil {
		return &Error{Problem: Unwritable, Path: target, Folder: filepath.Dir(target), Err: err}
	}
	tmp := f.Name()
	f.Close()
	os.Remove(tmp)
	untrackTemp(tmp)
	return nil
}

// check looks at what is at the path now.
func (o *File) check() *Error {
	st, e := existing(o.final, TargetFile, o.force, &o.existed)
	if e == nil && st != nil && !st.Mode().IsRegular() {
		return &Error{Problem: NotRegular, Path: o.final, Found: KindOf(st.Mode())}
	}
	return e
}

// existing returns what is at path (nil when nothing is, or on an error)
// and records in *existed whether anything is; the error says why it may
// not be replaced: any entry without force, or one that cannot be examined.
func existing(path string, target Target, force bool, existed *bool) (fs.FileInfo, *Error) {
	st, err := os.Lstat(path)
	*existed = err == nil
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil, nil
	case err != nil:
		return nil, &Error{Problem: Unusable, Target: target, Path: path, Err: err}
	case !force:
		return nil, &Error{Problem: Exists, Target: target, Path: path}
	}
	return st, nil
}

// Commit writes data through a temporary file and puts it in place. A file
// that appeared at the path since PrepareFile is not replaced (a Late
// *Error).
func (o *File) Commit(data []byte) error {
	f, err := createTemp(o.final)
	if err != nil {
		return &Error{Problem: WriteFailed, Path: o.final, Err: err, Late: true}
	}
	tmp := f.Name()
	defer func() {
		os.Remove(tmp)
		untrackTemp(tmp)
	}()
	_, werr := f.Write(data)
	if err := errors.Join(werr, f.Close()); err != nil {
		return &Error{Problem: WriteFailed, Path: o.final, Err: err, Late: true}
	}
	existed := o.existed
	if e := o.check(); e != nil || o.existed != existed {
		if e == nil {
			e = &Error{Problem: Appeared, Path: o.final}
		}
		e.Late = true
		return e
	}
	cleanup.mu.Lock()
	defer cleanup.mu.Unlock()
	if !existed {
		// A hard link never replaces: if something appeared at the path in
		// the last instant, it is kept.
		err := os.Link(tmp, o.final)
		if errors.Is(err, fs.ErrExist) {
			return &Error{Problem: Appeared, Path: o.final, Late: true}
		}
		if err == nil {
			return nil
		}
		// File systems without hard links: the check above must do.
	}
	if err := os.Rename(tmp, o.final); err != nil {
		return &Error{Problem: WriteFailed, Path: o.final, Err: err, Late: true}
	}
	return nil
}

// Close releases the lock; it may be called more than once, and on nil.
func (o *File) Close() {
	if o != nil {
		o.lock.Release()
		o.lock = nil
	}
}

// Result is where a command's one result goes: a writer such as standard
// output, or an output file checked before the work starts.
type Result struct {
	w    io.Writer
	file *File
}

// OpenResult checks the output file path; with path "" or "-" the result
// goes to w instead. inputs are the files the run reads: path may be none
// of them (an IsInput *Error, even with force), since the run would
// replace what it reads. Call Close when done.
func OpenResult(w io.Writer, path string, force bool, inputs ...string) (*Result, error) {
	r := &Result{w: w}
	if path == "" || path == "-" {
		return r, nil
	}
	if err := notAnInput(path, inputs); err != nil {
		return nil, err
	}
	f, err := PrepareFile(path, force, false)
	if err != nil {
		return nil, err
	}
	r.file = f
	return r, nil
}

// notAnInput returns an IsInput *Error when the output path names the same
// file as one of inputs (SameFile). Paths that cannot be examined are left
// to the checks that follow and to the readers.
func notAnInput(path string, inputs []string) *Error {
	for _, in := range inputs {
		if SameFile(path, in) {
			return &Error{Problem: IsInput, Target: TargetFile, Path: filepath.Clean(path), Input: in}
		}
	}
	return nil
}

// SameFile reports whether the existing paths a and b name the same file
// on disk: Stat follows symbolic links and os.SameFile compares device and
// inode, so a link, a hard link or another spelling of the path counts as
// well as the same string. False when either cannot be examined.
func SameFile(a, b string) bool {
	x, err := os.Stat(a)
	if err != nil {
		return false
	}
	y, err := os.Stat(b)
	return err == nil && os.SameFile(x, y)
}

// Write writes the whole result.
func (r *Result) Write(data []byte) error {
	if r.file == nil {
		_, err := r.w.Write(data)
		return err
	}
	return r.file.Commit(data)
}

// Close releases the output file's lock; it may be called on nil.
func (r *Result) Close() {
	if r != nil {
		r.file.Close()
	}
}
