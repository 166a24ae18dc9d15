package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// runWeft runs the weft command tree in-process and returns stdout, stderr
// and the exit code main would use.
func runWeft(t testing.TB, args ...string) (string, string, int) {
	t.Helper()
	root := newRootCmd()
	var out, errb bytes.Buffer
	root.SetOut(&out)
	root.SetErr(&errb)
	root.SetArgs(args)
	err := root.Execute()
	if err != nil {
		errb.WriteString("weft: " + err.Error() + "\n")
	}
	return out.String(), errb.String(), exitCode(err)
}

// writeTemp writes content to name in a fresh temporary folder.
func writeTemp(t *testing.T, name, content string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}
