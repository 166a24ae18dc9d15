package biaxial

import (
	"errors"
	"strconv"
	"strings"
)

// Categories of input problems. Every *ParseError wraps one of them, so a
// caller can branch with errors.Is while the message stays specific.
var (
	// ErrSyntax: the text is not valid CSV (an unclosed quote, a row with
	// more or fewer fields than the header, an unreadable encoding).
	ErrSyntax = errors.New("syntax")
	// ErrMissingColumn: a required kinematic or stress column is absent.
	ErrMissingColumn = errors.New("missing column")
	// ErrDuplicateColumn: one quantity appears in two columns.
	ErrDuplicateColumn = errors.New("duplicate column")
	// ErrMixedStress: stress columns of two kinds (for one axis or across
	// axes) were given.
	ErrMixedStress = errors.New("mixed stress kinds")
	// ErrNumber: a cell that must hold a finite number does not (text, an
	// empty cell, NaN, Inf).
	ErrNumber = errors.New("not a number")
	// ErrRange: a number is outside its physical range (stretch ≤ 0,
	// det F ≤ 0, a non-positive thickness or size, a cycle below 0).
	ErrRange = errors.New("out of range")
	// ErrUnit: a unit is unknown or missing where it is required.
	ErrUnit = errors.New("unit")
	// ErrGeometry: loads were given without the specimen geometry needed to
	// turn them into stresses.
	ErrGeometry = errors.New("geometry")
	// ErrProtocol: a protocol label is empty or a protocol has too few points
	// or lacks the branch or cycle asked for.
	ErrProtocol = errors.New("protocol")
	// ErrMetadata: a metadata line is repeated or malformed.
	ErrMetadata = errors.New("metadata")
	// ErrOptions: an Options value is invalid (reported without a location
	// in the file, or with the file name only).
	ErrOptions = errors.New("options")
)

// ParseError is a problem in an input file. It says where the problem is and
// what to do about it. Its text reads like
//
//	data.csv:14:3: stretch_1 is -0.2; stretches must be > 0 — check the column order or the marker export
//
// and, for a workbook, like
//
//	tests.xlsx:Sheet1!C14: stretch_1 is -0.2; ...
type ParseError struct {
	// File is the path or name of the input.
	File string
	// Line is the 1-based line of a CSV file (the row of a sheet), 0 when
	// the problem concerns the whole file.
	Line int
	// Column is the 1-based column (field number in the row, counting the
	// first field as 1), 0 when the problem concerns a whole line.
	Column int
	// Sheet and Cell locate the problem in an xlsx workbook, e.g. "Sheet1"
	// and "C14"; empty for CSV. Cell is empty when only a row is meant.
	Sheet string
	Cell  string
	// Msg says what is wrong, naming the column and value where there is one.
	Msg string
	// Fix says what to change in the file (may be empty).
	Fix string
	// Err is the category of the problem (ErrNumber, ErrRange, ...).
	Err error
}

// Error formats the location, the problem and the fix.
func (e *ParseError) Error() string {
	var b strings.Builder
	b.WriteString(e.Location())
	b.WriteString(": ")
	b.WriteString(e.Msg)
	if e.Fix != "" {
		b.WriteString(" — ")
		b.WriteString(e.Fix)
	}
	return b.String()
}

// Location formats the place of the problem: "file:line:column" for CSV,
// "file:Sheet!Cell" (or "file:Sheet row N") for xlsx, or just the file.
func (e *ParseError) Location() string {
	var b strings.Builder
	b.WriteString(e.File)
	switch {
	case e.Sheet != "" && e.Cell != "":
		b.WriteString(":" + e.Sheet + "!" + e.Cell)
	case e.Sheet != "" && e.Line > 0:
		b.WriteString(":" + e.Sheet + " row " + strconv.Itoa(e.Line))
	case e.Sheet != "":
		b.WriteString(":" + e.Sheet)
	case e.Line > 0:
		b.WriteString(":" + strconv.Itoa(e.Line))
		if e.Column > 0 {
			b.WriteString(":" + strconv.Itoa(e.Column))
		}
	}
	return b.String()
}

// Unwrap returns the category of the problem.
func (e *ParseError) Unwrap() error { return e.Err }
