package safeout

import (
	"encoding/json"
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
)

// MarkerName is the file weft writes into every output folder; it lists
// the folder's files, which is how force recognises a folder weft wrote.
const MarkerName = ".weft-output"

// markerHead is the marker's first lines; the file names follow, one a line.
const markerHead = "# Written by weft. 'weft fit --force' replaces this folder only while it\n" +
	"# holds nothing beyond the files listed below; add nothing you want to keep.\n"

// legacyNames are the files weft writes at the top of an output folder. A
// folder without a marker (written before weft wrote markers) is
// recognised by its model card and may hold only these and plots.
var legacyNames = map[string]bool{"model.json": true, "fit.csv": true, "selection.csv": true,
	"heldout.csv": true, "report.html": true, "curves.csv": true, "raw.csv": true}

// markerBytes is the marker listing files (sorted, so the same outputs
// give the same bytes).
func markerBytes(files []string) []byte {
	fs := append([]string(nil), files...)
	sort.Strings(fs)
	var b strings.Builder
	b.WriteString(markerHead)
	for i, f := range fs {
		if f == MarkerName || i > 0 && f == fs[i-1] {
			continue
		}
		b.WriteString(f + "\n")
	}
	return []byte(b.String())
}

// ReadMarker returns the files listed in the marker of the folder dir
// (slash-separated, relative to dir) and whether it has one; a marker that
// cannot be read is an Unreadable *Error.
func ReadMarker(dir string) (listed map[string]bool, found bool, err error) {
	listed, found, e := readMarker(dir)
	if e != nil {
		return nil, false, e
	}
	return listed, found, nil
}

func readMarker(dir string) (map[string]bool, bool, *Error) {
	p := filepath.Join(dir, MarkerName)
	st, err := os.Lstat(p)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, false, nil
	}
	if err != nil {
		return nil, false, &Error{Problem: Unreadable, Path: p, Err: err}
	}
	if !st.Mode().IsRegular() || st.Size() > 1<<20 {
		return nil, false, nil
	}
	b, err := os.ReadFile(p)
	if err != nil {
		return nil, false, &Error{Problem: Unreadable, Path: p, Err: err}
	}
	listed := map[string]bool{}
	for _, ln := range strings.Split(string(b), "\n") {
		if ln != "" && !strings.HasPrefix(ln, "#") {
			listed[ln] = true
		}
	}
	return listed, true, nil
}

// UpdateMarker rewrites the marker of the output folder dir, whose lock
// the caller holds, after its folder sub was replaced on its own: listed
// are the files the marker listed (ReadMarker); those under sub/ leave the
// list and files (relative to dir, slash-separated) join it.
func UpdateMarker(dir string, listed map[string]bool, sub string, files []string) error {
	var names []string
	for k := range listed {
		if !strings.HasPrefix(k, sub+"/") {
			names = append(names, k)
		}
	}
	names = append(names, files...)
	m, err := PrepareFile(filepath.Join(dir, MarkerName), true, true)
	if err != nil {
		return err
	}
	return m.Commit(markerBytes(names))
}

// legacyOutput recognises an output folder written before markers existed:
// it holds a weft model card.
func legacyOutput(dir string) bool {
	f, err := os.Open(filepath.Join(dir, "model.json"))
	if err != nil {
		return false
	}
	defer f.Close()
	var head struct {
		Format string `json:"format"`
	}
	if json.NewDecoder(io.LimitReader(f, 64<<20)).Decode(&head) != nil {
		return false
	}
	return strings.HasPrefix(head.Format, "weft.model/")
}

// foreignEntries lists (up to five) entries of dir that weft did not
// write: not in the marker's list (or, for a folder without a marker, not
// one of the names weft used to write), not weft's helper files, and any
// entry that is not a regular file or folder.
func foreignEntries(dir string, listed map[string]bool, hasMarker bool) []string {
	var out []string
	_ = filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			out = append(out, filepath.Base(p)+" (unreadable)")
			return fs.SkipAll
		}
		if p == dir {
			return nil
		}
		rel, _ := filepath.Rel(dir, p)
		rel = filepath.ToSlash(rel)
		name := d.Name()
		switch {
		case IsHelper(name):
			if d.IsDir() {
				return fs.SkipDir
			}
			return nil
		case d.IsDir() && rel == "plots" || d.IsDir() && hasMarker && listedPrefix(listed, rel+"/"):
			return nil
		case d.Type().IsRegular() && (rel == MarkerName && hasMarker || listed[rel] ||
			!hasMarker && (legacyNames[rel] || legacyPlot(rel))):
			return nil
		}
		if d.IsDir() {
			rel += "/"
		}
		out = append(out, rel)
		if len(out) >= 5 {
			return fs.SkipAll
		}
		if d.IsDir() {
			return fs.SkipDir
		}
		return nil
	})
	return out
}

func listedPrefix(listed map[string]bool, prefix string) bool {
	for k := range listed {
		if strings.HasPrefix(k, prefix) {
			return true
		}
	}
	return false
}

// legacyPlot reports whether rel is a plot as weft writes them.
func legacyPlot(rel string) bool {
	name, ok := strings.CutPrefix(rel, "plots/")
	return ok && !strings.Contains(name, "/") && (strings.HasSuffix(name, ".svg") || strings.HasSuffix(name, ".png"))
}
