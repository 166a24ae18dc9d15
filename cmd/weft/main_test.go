package main

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
)

// runWeft runs the weft command tree in-process and returns stdout, stderr
// and the exit code main would use.
func runWeft(t testing.TB, args ...string) (string, string, int) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(args, &out, &errb)
	return out.String(), errb.String(), code
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

// TestMain lets a test run weft as a separate process (weftProcess): the
// test binary runs main when WEFT_RUN_MAIN is set.
func TestMain(m *testing.M) {
	if os.Getenv("WEFT_RUN_MAIN") == "1" {
		main()
	}
	os.Exit(m.Run())
}

// weftProcess returns a command that runs weft with args as a separate
// process (the test binary itself, see TestMain).
func weftProcess(args ...string) *exec.Cmd {
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), "WEFT_RUN_MAIN=1")
	return cmd
}
