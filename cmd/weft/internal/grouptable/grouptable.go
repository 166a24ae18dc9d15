// Package grouptable reads a study's group table: a two-column CSV of
// test file and group that assigns a cohort's specimens to groups. A first
// row whose second cell is "group" is a header; '#' starts a comment line;
// a spreadsheet's byte-order mark is dropped. A file given two different
// groups is refused, since which one was meant cannot be told.
package grouptable

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"path"
	"path/filepath"
	"strings"
)

// Row is a file's row of the table: its group and the line of the table
// it stands on (from 1, comment and blank lines counted).
type Row struct {
	Group string
	Line  int
}

// Table maps each file of the table, cleaned and '/' separated, to its
// row.
type Table map[string]Row

// Error is a table that cannot be used; its message starts with the
// table's path and, where one is to blame, the line.
type Error struct{ Msg string }

func (e *Error) Error() string { return e.Msg }

func errorf(format string, args ...any) error {
	return &Error{Msg: fmt.Sprintf(format, args...)}
}

// Parse parses b, the bytes of the table read from the file at path.
func Parse(b []byte, path string) (Table, error) {
	// A spreadsheet's "CSV UTF-8" starts with a byte-order mark, which
	// would otherwise become part of the first file's name.
	r := csv.NewReader(bytes.NewReader(bytes.TrimPrefix(b, []byte("\ufeff"))))
	r.Comment = '#'
	r.FieldsPerRecord = -1
	t := Table{}
	// Rows are read one at a time so that each error names the row's line
	// in the file: comment lines, blank lines and quoted line breaks make
	// it differ from the row's count.
	for i := 0; ; i++ {
		row, err := r.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, errorf("%s: %v", path, err)
		}
		line, _ := r.FieldPos(0)
		if len(row) != 2 {
			return nil, errorf("%s:%d: want two columns, file and group; found %d", path, line, len(row))
		}
		if i == 0 && strings.EqualFold(strings.TrimSpace(row[1]), "group") {
			continue
		}
		k, g := filepath.ToSlash(filepath.Clean(strings.TrimSpace(row[0]))), strings.TrimSpace(row[1])
		if prev, ok := t[k]; ok && prev.Group != g {
			return nil, errorf("%s:%d: %s has the group %q here and %q at line %d; give each file one group", path, line, k, g, prev.Group, prev.Line)
		} else if ok {
			continue
		}
		t[k] = Row{Group: g, Line: line}
	}
	return t, nil
}

// Lookup finds a file (cleaned, '/' separated) in the table: by its path,
// else by its base name (base is then true).
func (t Table) Lookup(file string) (r Row, base bool) {
	if r, ok := t[file]; ok {
		return r, false
	}
	r, ok := t[path.Base(file)]
	return r, ok
}
