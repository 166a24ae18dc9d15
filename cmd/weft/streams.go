package main

import (
	"encoding/json"
	"io"
	"os"

	"golang.org/x/term"
)

// streams are where a command reads and writes. Every command's options
// carry them, so that tests run a command with buffers and no cobra.
type streams struct {
	In     io.Reader
	Out    io.Writer
	ErrOut io.Writer
	// ErrIsTerminal says whether ErrOut is a terminal: progress bars are
	// drawn only there.
	ErrIsTerminal bool
}

// isTerminal reports whether w is a terminal. Being a character device
// is not enough: /dev/null is one, so '2>/dev/null' drew progress bars
// into it; golang.org/x/term asks the terminal's own settings, on every
// platform.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && term.IsTerminal(int(f.Fd()))
}

// writeJSON writes v as indented JSON with a trailing newline, without
// HTML escaping (model text such as "<" stays readable).
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}
