package safeout

import (
	"crypto/rand"
	"encoding/hex"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
)

// Suffixes of weft's own hidden helper files beside or inside an output.
const (
	tmpTag  = ".weft-tmp-"
	oldTag  = ".weft-old-"
	lockTag = ".weft-lock"
)

// randomTag returns a short random hex string for temporary names.
func randomTag() string {
	var b [6]byte
	_, _ = rand.Read(b[:])
	return hex.EncodeToString(b[:])
}

// helperPath is the hidden helper beside target: "." + its name + tag.
func helperPath(target, tag string) string {
	return filepath.Join(filepath.Dir(target), "."+filepath.Base(target)+tag)
}

// IsHelper reports whether a file name is one of weft's hidden temporary,
// old-copy or lock files, which only a killed run leaves behind.
func IsHelper(name string) bool {
	return strings.HasPrefix(name, ".") && (strings.Contains(name, tmpTag) || strings.Contains(name, oldTag) || strings.HasSuffix(name, lockTag))
}

// Lock is an exclusive lock on one output path, held from the checks
// before the work until the output is in place.
type Lock struct {
	path string
	f    *os.File
}

// errBusy says that another run holds the lock.
var errBusy = errors.New("busy")

// Acquire locks the output path target through the lock file
// ".NAME.weft-lock" in its folder, without waiting: a lock another run
// holds is a Busy *Error, a lock file that cannot be created LockFailed.
func Acquire(target string) (*Lock, error) {
	l, err := acquire(target)
	switch {
	case errors.Is(err, errBusy):
		e := &Error{Problem: Busy, Target: TargetFile, Path: target}
		if !lockIsExclusive {
			e.LockFile = helperPath(target, lockTag)
		}
		return nil, e
	case err != nil:
		return nil, &Error{Problem: LockFailed, Path: target, Folder: filepath.Dir(target), Err: err}
	}
	return l, nil
}

func acquire(target string) (*Lock, error) {
	path := helperPath(target, lockTag)
	cleanup.mu.Lock()
	defer cleanup.mu.Unlock()
	for attempt := 0; attempt < 5; attempt++ {
		flags := os.O_RDWR | os.O_CREATE
		if !lockIsExclusive {
			flags |= os.O_EXCL
		}
		f, err := os.OpenFile(path, flags, 0o666)
		if errors.Is(err, fs.ErrExist) {
			return nil, errBusy
		}
		if err != nil {
			return nil, err
		}
		busy, err := lockFile(f)
		if busy || err != nil {
			f.Close()
			if busy {
				return nil, errBusy
			}
			return nil, err
		}
		// The previous holder may have removed the file between our open
		// and our lock; then the lock is on a file nobody else will see.
		st1, err1 := f.Stat()
		st2, err2 := os.Stat(path)
		if err1 == nil && err2 == nil && os.SameFile(st1, st2) {
			cleanup.locks[path] = true
			return &Lock{path: path, f: f}, nil
		}
		f.Close()
	}
	return nil, errBusy
}

// Release removes the lock file and drops the lock; a nil *Lock does
// nothing.
func (l *Lock) Release() {
	if l == nil {
		return
	}
	cleanup.mu.Lock()
	os.Remove(l.path)
	delete(cleanup.locks, l.path)
	cleanup.mu.Unlock()
	l.f.Close()
}

// RemoveStale removes the temporary and old copies of target that a
// killed run left behind. The caller holds target's lock (or the lock of
// the output folder that holds it), so no live run owns them.
func RemoveStale(target string) {
	dir, base := filepath.Dir(target), filepath.Base(target)
	for _, tag := range []string{tmpTag, oldTag} {
		matches, _ := filepath.Glob(filepath.Join(dir, "."+escapeGlob(base)+tag+"*"))
		for _, m := range matches {
			os.RemoveAll(m)
		}
	}
}

func escapeGlob(s string) string {
	r := strings.NewReplacer(`\`, `\\`, `*`, `\*`, `?`, `\?`, `[`, `\[`)
	return r.Replace(s)
}
