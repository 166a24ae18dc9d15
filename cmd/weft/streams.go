package main

import (
	"encoding/json"
	"io"
	"os"
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
// into it; where the platform allows (isTTY), the terminal's own settings
// must be readable.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0 && isTTY(f)
}

// writeJSON writes v as indented JSON with a trailing newline, without
// HTML escaping (model text such as "<" stays readable).
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}
