package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// writeFileAtomic writes data to path through a temporary file in the same
// directory and a rename, so a reader never sees a half-written file. It
// refuses to replace an existing file unless force is set.
func writeFileAtomic(path string, data []byte, force bool) error {
	if !force {
		if _, err := os.Stat(path); err == nil {
			return badInputf("%s exists; pass --force to overwrite it or choose another output", path)
		}
	}
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return err
	}
	name := tmp.Name()
	_, werr := tmp.Write(data)
	cerr := tmp.Close()
	if err := errors.Join(werr, cerr); err != nil {
		os.Remove(name)
		return err
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return err
	}
	return nil
}

// outputDir prepares an output folder: files are written into a temporary
// sibling folder and moved into place by commit, so an interrupted run
// leaves either the old folder or the new one, never a mixture.
type outputDir struct {
	final, tmp string
	force      bool
}

// newOutputDir refuses an existing dir unless force is set.
func newOutputDir(dir string, force bool) (*outputDir, error) {
	if st, err := os.Stat(dir); err == nil {
		if !force {
			return nil, badInputf("%s exists; pass --force to replace it or choose another folder with -o", dir)
		}
		if !st.IsDir() {
			return nil, badInputf("%s exists and is not a folder", dir)
		}
	} else if !errors.Is(err, fs.ErrNotExist) {
		return nil, err
	}
	parent := filepath.Dir(filepath.Clean(dir))
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, err
	}
	tmp, err := os.MkdirTemp(parent, "."+filepath.Base(dir)+".tmp-*")
	if err != nil {
		return nil, err
	}
	return &outputDir{final: dir, tmp: tmp, force: force}, nil
}

// path returns where a file named rel is written before commit.
func (o *outputDir) path(rel string) string { return filepath.Join(o.tmp, rel) }

// write writes one file of the folder.
func (o *outputDir) write(rel string, data []byte) error {
	p := o.path(rel)
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		return err
	}
	return os.WriteFile(p, data, 0o644)
}

// commit moves the finished folder into place, replacing an old one.
func (o *outputDir) commit() error {
	if err := os.Chmod(o.tmp, 0o755); err != nil {
		return err
	}
	var old string
	if _, err := os.Stat(o.final); err == nil {
		old = o.tmp + ".old"
		if err := os.Rename(o.final, old); err != nil {
			return fmt.Errorf("moving the old %s aside: %w", o.final, err)
		}
	}
	if err := os.Rename(o.tmp, o.final); err != nil {
		if old != "" {
			os.Rename(old, o.final)
		}
		return err
	}
	if old != "" {
		return os.RemoveAll(old)
	}
	return nil
}

// abort removes the temporary folder.
func (o *outputDir) abort() { os.RemoveAll(o.tmp) }

// writeJSON writes v as indented JSON with a trailing newline, without
// HTML escaping (model text such as "<" stays readable).
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}
