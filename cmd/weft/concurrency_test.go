package main

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
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

// signalSelfAndYield sends SIGINT to this process and then yields 2000
// times (about two seconds), ample for the signal handler to run if
// nothing holds it back. It counts yields rather than waiting for a time.
func signalSelfAndYield() {
	syscall.Kill(os.Getpid(), syscall.SIGINT)
	for i := 0; i < 2000; i++ {
		runtime.Gosched()
		time.Sleep(time.Millisecond)
	}
}

// A report rebuilt with --force commits three things: plots/, report.html
// and the folder's marker. SIGINT delivered between the first two (the
// test binary, run as weft, signals itself there) waits for all three, so
// the folder holds the new page with the new plots and the marker lists
// them. The signal used to be handled at once: the new PNGs stood
// unlisted beside the old page, and every later 'weft report --force' or
// 'weft fit --force' on the folder refused them as files weft did not
// write (exit 2). The handler may run before or after the command's own
// end, so the exit code is 0 or 1; the folder is the same either way.
func TestInterruptedReportKeepsFolderConsistent(t *testing.T) {
	if testing.Short() {
		t.Skip("runs weft as a separate process")
	}
	root, out := fittedFolder(t)
	oldPage, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	p := weftProcess("report", out, "--png", "--strain", "--force")
	p.Env = append(p.Env, "WEFT_SIGNAL_BETWEEN_COMMITS=1")
	var errb bytes.Buffer
	p.Stderr = &errb
	err = p.Run()
	var ee *exec.ExitError
	if err != nil && (!errors.As(err, &ee) || ee.ExitCode() != exitFailed || !strings.Contains(errb.String(), "interrupted")) {
		t.Fatalf("interrupted report: %v, stderr %q", err, errb.String())
	}
	t.Logf("exit %v (the handler ran %s the command's end)", err, map[bool]string{true: "before", false: "after"}[err != nil])
	page, _ := os.ReadFile(filepath.Join(out, "report.html"))
	if bytes.Equal(page, oldPage) {
		t.Error("the new plots/ is in place beside the old report.html")
	}
	pngs, _ := filepath.Glob(filepath.Join(out, "plots", "*.png"))
	if len(pngs) == 0 {
		t.Error("no PNG in plots/: the new plots/ is not in place")
	}
	noHelpers(t, root)
	if _, errs, code := runWeft(t, "report", out, "--force"); code != 0 {
		t.Errorf("the next report --force: exit %d, %s", code, errs)
	}
	if _, errs, code := quickFit(t, quickData(t, root, "q.csv"), out, "--force"); code != 0 {
		t.Errorf("the next fit --force: exit %d, %s", code, errs)
	}
}

// Writing the new plots is work, not a commit: a SIGINT delivered once
// they are written beside plots/ and before the first commit is handled at
// once, leaving the old report whole (the old page, the old plots, the
// marker as it was) and no staged folder behind. While the hold covered
// the writing as well, such a signal waited for every plot to be written
// and all three commits, and the run ended with the new report in place.
func TestInterruptBeforeReportCommitsKeepsOldReport(t *testing.T) {
	if testing.Short() {
		t.Skip("runs weft as a separate process")
	}
	root, out := fittedFolder(t)
	read := func(name string) []byte {
		b, err := os.ReadFile(filepath.Join(out, name))
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	oldPage, oldMarker := read("report.html"), read(safeout.MarkerName)
	p := weftProcess("report", out, "--png", "--strain", "--force")
	p.Env = append(p.Env, "WEFT_SIGNAL_AFTER_STAGING=1")
	var errb bytes.Buffer
	p.Stderr = &errb
	err := p.Run()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != exitFailed || !strings.Contains(errb.String(), "interrupted") {
		t.Fatalf("report interrupted before its commits: %v, stderr %q", err, errb.String())
	}
	if !bytes.Equal(read("report.html"), oldPage) {
		t.Error("report.html was replaced after the interruption")
	}
	if !bytes.Equal(read(safeout.MarkerName), oldMarker) {
		t.Error("the marker was changed after the interruption")
	}
	if pngs, _ := filepath.Glob(filepath.Join(out, "plots", "*.png")); len(pngs) != 0 {
		t.Errorf("the new plots/ (with PNGs) was put in place after the interruption: %d PNGs", len(pngs))
	}
	noHelpers(t, root)
	if _, errs, code := runWeft(t, "report", out, "--force"); code != 0 {
		t.Errorf("the next report --force: exit %d, %s", code, errs)
	}
}

// When report.html cannot be put in place after the new plots/ was (here a
// report.html appears during the run, which is kept), the marker still
// lists the new plots: the next 'weft report --force' replaces them
// instead of refusing them as files weft did not write.
func TestReportPageFailureKeepsPlotsListed(t *testing.T) {
	_, out := fittedFolder(t)
	page := filepath.Join(out, "report.html")
	if err := os.Remove(page); err != nil {
		t.Fatal(err)
	}
	betweenReportCommits = func() { os.WriteFile(page, []byte("theirs"), 0o644) }
	_, errs, code := runWeft(t, "report", out, "--png", "--force")
	betweenReportCommits = nil
	if code != exitFailed || !strings.Contains(errs, "report.html") {
		t.Fatalf("a page that appeared: exit %d, %s", code, errs)
	}
	if b, _ := os.ReadFile(page); string(b) != "theirs" {
		t.Errorf("the page that appeared was replaced: %.40q", b)
	}
	marker, _ := os.ReadFile(filepath.Join(out, safeout.MarkerName))
	pngs, _ := filepath.Glob(filepath.Join(out, "plots", "*.png"))
	if len(pngs) == 0 {
		t.Fatal("no PNG in plots/")
	}
	for _, p := range pngs {
		if !strings.Contains(string(marker), "plots/"+filepath.Base(p)+"\n") {
			t.Errorf("%s is not listed in the marker:\n%s", p, marker)
		}
	}
	os.Remove(page)
	if _, errs, code := runWeft(t, "report", out, "--force"); code != 0 {
		t.Errorf("the next report --force: exit %d, %s", code, errs)
	}
}

// fittedFolder fits a quick synthetic specimen into root/out, a new
// folder whose report the tests rebuild, and returns root and the folder.
func fittedFolder(t *testing.T) (root, out string) {
	t.Helper()
	root = t.TempDir()
	out = filepath.Join(root, "out")
	if _, errs, code := quickFit(t, quickData(t, root, "q.csv"), out); code != 0 {
		t.Fatalf("fit: exit %d, %s", code, errs)
	}
	return root, out
}
