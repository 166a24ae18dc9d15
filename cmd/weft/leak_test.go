package main

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
	"time"
)

// A fit that fails (discovery on all-zero stress stops as soon as it
// starts) leaves no goroutine behind: the view of the whole record,
// prepared beside each fit, is collected on the failure path too. The
// first run is not counted: packages start their own goroutines once.
// The count is compared after a bounded number of yields (not a time
// limit), as a goroutine that has delivered its result may still be
// returning.
func TestFailedFitLeavesNoGoroutines(t *testing.T) {
	root := t.TempDir()
	var z strings.Builder
	z.WriteString("protocol,stretch_1,stretch_2,cauchy_11,cauchy_22\n")
	for i := 0; i < 8; i++ {
		fmt.Fprintf(&z, "1:1,%g,%g,0,0\n", 1+0.02*float64(i), 1+0.02*float64(i))
	}
	var files []string
	for _, name := range []string{"zero-a.csv", "zero-b.csv"} {
		p := filepath.Join(root, name)
		if err := os.WriteFile(p, []byte(z.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		files = append(files, p)
	}
	fit := func(out string) {
		if err := os.Mkdir(out, 0o755); err != nil {
			t.Fatal(err)
		}
		_, stderr, code := runWeft(t, append([]string{"fit", "-o", out, "--quiet"}, files...)...)
		if code != exitFailed || !strings.Contains(stderr, "every measured stress is zero") {
			t.Fatalf("exit %d, want %d, stderr:\n%s", code, exitFailed, stderr)
		}
		if left, _ := os.ReadDir(out); len(left) != 0 {
			t.Errorf("the failed fits left %d entries in %s", len(left), out)
		}
	}
	fit(filepath.Join(root, "warm"))
	before := runtime.NumGoroutine()
	for i := 0; i < 3; i++ {
		fit(filepath.Join(root, fmt.Sprint("out", i)))
	}
	after := runtime.NumGoroutine()
	for i := 0; i < 2000 && after > before; i++ {
		runtime.Gosched()
		time.Sleep(time.Millisecond)
		after = runtime.NumGoroutine()
	}
	if after > before {
		t.Errorf("%d goroutines before three failed runs of two fits, %d after", before, after)
	}
}
