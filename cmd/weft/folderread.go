package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// fitFolder is what a command read from an output folder that 'weft fit'
// wrote.
type fitFolder struct {
	// entries are the names in the folder, those starting with "." left
	// out.
	entries []string
	// files holds each file read by name; an optional file that is absent
	// has none.
	files map[string][]byte
}

// readFitFolder reads from dir, an output folder that 'weft fit' wrote,
// every required file and each optional one that exists: model.json within
// the card limits cl, the others within the file size limit of dl. A
// folder that does not exist, is not a folder or is a cohort's, or that
// lacks a required file, is bad input (exit 2); the message for a missing
// file ends with needs, what the command needs of the folder.
func readFitFolder(dir string, dl biaxial.Limits, cl card.Limits, needs string, required, optional []string) (*fitFolder, error) {
	st, err := os.Stat(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil, badInputf("%s does not exist; give the output folder that 'weft fit' wrote", dir)
	case err != nil:
		return nil, badInput(err)
	case !st.IsDir():
		return nil, badInputf("%s is not a folder; give the output folder that 'weft fit' wrote (with model.json and fit.csv)", dir)
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, badInput(err)
	}
	if err := notCohortFolder(dir, entries); err != nil {
		return nil, err
	}
	f := &fitFolder{files: map[string][]byte{}}
	for _, e := range entries {
		if !strings.HasPrefix(e.Name(), ".") {
			f.entries = append(f.entries, e.Name())
		}
	}
	dl, cl = withDefaultSizes(dl, cl)
	read := func(name string, isRequired bool) error {
		path := filepath.Join(dir, name)
		max, category := dl.MaxBytes, biaxial.ErrFileSize
		if name == "model.json" {
			max, category = cl.MaxBytes, card.ErrCardSize
		}
		b, err := readAtMost(path, max)
		switch {
		case errors.Is(err, errTooLarge):
			return tooLargeError(path, max, category)
		case errors.Is(err, fs.ErrNotExist) && !isRequired:
			return nil
		case errors.Is(err, fs.ErrNotExist):
			return badInputf("%s: %s is missing; %s", dir, name, needs)
		case err != nil:
			return badInput(err)
		}
		f.files[name] = b
		return nil
	}
	for _, name := range required {
		if err := read(name, true); err != nil {
			return nil, err
		}
	}
	for _, name := range optional {
		if err := read(name, false); err != nil {
			return nil, err
		}
	}
	return f, nil
}

// withDefaultSizes gives the file size limits of dl and cl their defaults
// where they are unset (zero or negative).
func withDefaultSizes(dl biaxial.Limits, cl card.Limits) (biaxial.Limits, card.Limits) {
	if cl.MaxBytes <= 0 {
		cl.MaxBytes = card.DefaultLimits.MaxBytes
	}
	if dl.MaxBytes <= 0 {
		dl.MaxBytes = biaxial.DefaultLimits.MaxBytes
	}
	return dl, cl
}

// notCohortFolder refuses, naming what to give instead, a folder that
// 'weft cohort' wrote (it has cohort.json and no model.json): its report
// is written with it, and each specimen's folder inside it is a fit's.
func notCohortFolder(dir string, entries []os.DirEntry) error {
	var cohort, model bool
	var first string
	for _, e := range entries {
		switch n := e.Name(); {
		case n == "cohort.json":
			cohort = true
		case n == "model.json":
			model = true
		case first == "" && e.IsDir() && strings.HasSuffix(n, ".weft"):
			first = n
		}
	}
	if !cohort || model {
		return nil
	}
	hint := ""
	if first != "" {
		hint = fmt.Sprintf(", e.g. %s", filepath.Join(dir, first))
	}
	return badInputf("%s is a cohort's folder ('weft cohort' wrote its report with it); give one specimen's folder inside it%s", dir, hint)
}
