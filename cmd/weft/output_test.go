//go:build unix

package main

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
)

// tmpTag marks the temporary files and folders weft writes beside an
// output (package safeout), as a user sees them.
const tmpTag = ".weft-tmp-"

// noHelpers fails when a temporary, old-copy or lock file of weft is left
// in dir (or, recursively, below it).
func noHelpers(t *testing.T, dir string) {
	t.Helper()
	filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err == nil && safeout.IsHelper(d.Name()) {
			t.Errorf("weft left %s behind", p)
		}
		return nil
	})
}

// Finding 1: --force replaces only a folder weft wrote and that holds
// nothing else; anything else is refused with exit 2 and kept.
func TestForceReplacesOnlyWeftFolders(t *testing.T) {
	root := t.TempDir()
	proj := filepath.Join(root, "proj")
	os.MkdirAll(filepath.Join(proj, "raw"), 0o755)
	data := quickData(t, filepath.Join(proj, "raw"), "x.csv")
	os.WriteFile(filepath.Join(proj, "notes.txt"), []byte("mine"), 0o644)

	// The input lives inside the folder named by -o.
	_, errs, code := quickFit(t, data, proj, "--force")
	if code != exitBadInput || !strings.Contains(errs, "lies inside") {
		t.Fatalf("fit into the input's own project folder: exit %d, %s", code, errs)
	}
	// A folder weft did not write.
	other := filepath.Join(root, "other")
	os.Mkdir(other, 0o755)
	os.WriteFile(filepath.Join(other, "keep.txt"), []byte("mine"), 0o644)
	if _, errs, code := quickFit(t, data, other, "--force"); code != exitBadInput || !strings.Contains(errs, "not written by weft") {
		t.Errorf("fit into a foreign folder: exit %d, %s", code, errs)
	}
	// A regular file named by -o.
	file := filepath.Join(root, "file")
	os.WriteFile(file, []byte("mine"), 0o644)
	if _, errs, code := quickFit(t, data, file, "--force"); code != exitBadInput || !strings.Contains(errs, "is a file") {
		t.Errorf("fit onto a file: exit %d, %s", code, errs)
	}
	// Without --force the same file is named as a file, not offered to
	// --force, which would refuse it too.
	if _, errs, code := quickFit(t, data, file); code != exitBadInput || !strings.Contains(errs, "is a file") || strings.Contains(errs, "pass --force") {
		t.Errorf("fit onto a file without --force: exit %d, %s", code, errs)
	}
	for _, p := range []string{data, filepath.Join(proj, "notes.txt"), filepath.Join(other, "keep.txt"), file} {
		if b, err := os.ReadFile(p); err != nil || len(b) == 0 {
			t.Errorf("%s was lost: %v", p, err)
		}
	}

	// weft's own folder is replaced, but not once the user added a file.
	out := filepath.Join(root, "out")
	if _, errs, code := quickFit(t, data, out); code != 0 {
		t.Fatalf("first fit: exit %d, %s", code, errs)
	}
	marker, err := os.ReadFile(filepath.Join(out, safeout.MarkerName))
	if err != nil || !strings.Contains(string(marker), "\nmodel.json\n") {
		t.Fatalf("marker %q: %v", marker, err)
	}
	os.WriteFile(filepath.Join(out, "plots", "my-figure.svg"), []byte("<svg/>"), 0o644)
	if _, errs, code := quickFit(t, data, out, "--force"); code != exitBadInput || !strings.Contains(errs, "plots/my-figure.svg") {
		t.Errorf("fit over a folder with a user file: exit %d, %s", code, errs)
	}
	if _, err := os.Stat(filepath.Join(out, "plots", "my-figure.svg")); err != nil {
		t.Errorf("the user's file was lost: %v", err)
	}
	os.Remove(filepath.Join(out, "plots", "my-figure.svg"))
	if _, errs, code := quickFit(t, data, out, "--force"); code != 0 {
		t.Errorf("fit over weft's own folder: exit %d, %s", code, errs)
	}
	// A folder written before markers existed is recognised by its card.
	os.Remove(filepath.Join(out, safeout.MarkerName))
	if _, errs, code := quickFit(t, data, out, "--force"); code != 0 {
		t.Errorf("fit over a folder without a marker but with weft's card: exit %d, %s", code, errs)
	}
	// The report's rebuild replaces plots/ only while it holds weft's plots.
	os.WriteFile(filepath.Join(out, "plots", "notes.txt"), []byte("mine"), 0o644)
	if _, errs, code := runWeft(t, "report", out, "--force"); code != exitBadInput || !strings.Contains(errs, "plots/notes.txt") {
		t.Errorf("report over a plots folder with a user file: exit %d, %s", code, errs)
	}
	noHelpers(t, root)
}

// Finding 2: two writers of one output path — exactly one succeeds; the
// other fails at once with a clear message, and nothing is mixed.
func TestConcurrentWritersOfOnePath(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	a, err := safeout.PrepareDir(dir, false, nil)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := safeout.PrepareDir(dir, true, nil); err == nil || !strings.Contains(err.Error(), "being written by another weft run") || exitCode(err) != exitBadInput {
		t.Fatalf("second writer: %v", err)
	}
	if _, err := safeout.PrepareFile(dir, true, false); err == nil {
		t.Fatal("a file writer got the same path while a folder writer held it")
	}
	if err := a.Write("model.json", []byte("a")); err != nil {
		t.Fatal(err)
	}
	if err := a.Commit(false); err != nil {
		t.Fatal(err)
	}
	a.Close()
	if b, _ := os.ReadFile(filepath.Join(dir, "model.json")); string(b) != "a" {
		t.Errorf("model.json = %q", b)
	}
	noHelpers(t, filepath.Dir(dir))

	// Two processes fitting into one folder at the same time.
	data := quickData(t, t.TempDir(), "x.csv")
	out := filepath.Join(t.TempDir(), "out")
	var procs [2]*exec.Cmd
	var errs [2]bytes.Buffer
	for i := range procs {
		procs[i] = weftProcess("fit", data, "--preset", "neo-hookean", "-o", out, "--quiet")
		procs[i].Stderr = &errs[i]
		if err := procs[i].Start(); err != nil {
			t.Fatal(err)
		}
	}
	ok := 0
	for i, p := range procs {
		err := p.Wait()
		var ee *exec.ExitError
		switch {
		case err == nil:
			ok++
		case errors.As(err, &ee) && ee.ExitCode() == exitBadInput:
			if !strings.Contains(errs[i].String(), "being written by another weft run") && !strings.Contains(errs[i].String(), "exists") {
				t.Errorf("the losing run says %q", errs[i].String())
			}
		default:
			t.Errorf("run %d: %v, %s", i, err, errs[i].String())
		}
	}
	if ok != 1 {
		t.Errorf("%d of 2 concurrent runs succeeded, want exactly 1", ok)
	}
	if _, err := os.Stat(filepath.Join(out, "model.json")); err != nil {
		t.Error(err)
	}
	noHelpers(t, filepath.Dir(out))
}

// Finding 2 (re-check at the final rename): a folder that appears at the
// output path while weft works is kept, and the run fails (exit 1).
func TestOutputAppearingDuringTheRunIsKept(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	o, err := safeout.PrepareDir(dir, true, nil)
	if err != nil {
		t.Fatal(err)
	}
	defer o.Close()
	os.Mkdir(dir, 0o755)
	os.WriteFile(filepath.Join(dir, "theirs.txt"), []byte("theirs"), 0o644)
	o.Write("model.json", []byte("ours"))
	err = o.Commit(true)
	if err == nil || !strings.Contains(err.Error(), "not replaced") || exitCode(err) != exitFailed {
		t.Fatalf("commit over a folder that appeared: %v", err)
	}
	if b, _ := os.ReadFile(filepath.Join(dir, "theirs.txt")); string(b) != "theirs" {
		t.Error("the folder that appeared was changed")
	}
	x := filepath.Join(filepath.Dir(dir), "x.csv")
	f, err := safeout.PrepareFile(x, false, false)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	os.WriteFile(x, []byte("theirs"), 0o644)
	if err := f.Commit([]byte("ours")); err == nil {
		t.Error("a file that appeared was replaced")
	}
	if b, _ := os.ReadFile(x); string(b) != "theirs" {
		t.Errorf("file = %q", b)
	}
}

// Finding 7: problems with the output are bad input (2), found before the
// work starts, and name the user's path, never a temporary one; devices and
// pipes are never replaced.
func TestOutputProblemsAreBadInput(t *testing.T) {
	root := t.TempDir()
	// Discovery on all-zero stress fails (exit 1) as soon as it starts, so
	// exit 2 shows that the output was checked first.
	var z strings.Builder
	z.WriteString("protocol,stretch_1,stretch_2,cauchy_11,cauchy_22\n")
	for i := 0; i < 8; i++ {
		fmt.Fprintf(&z, "1:1,%g,%g,0,0\n", 1+0.02*float64(i), 1+0.02*float64(i))
	}
	zero := filepath.Join(root, "zero.csv")
	os.WriteFile(zero, []byte(z.String()), 0o644)
	fifo := filepath.Join(root, "pipe")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	notDir := filepath.Join(root, "plain")
	os.WriteFile(notDir, []byte("x"), 0o644)
	card := filepath.Join("..", "..", "testdata", "example", "hgo-media.json")
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"fit", zero, "-o", filepath.Join(root, "missing", "out")}, "does not exist"},
		{[]string{"fit", zero, "-o", filepath.Join(notDir, "out")}, "is not a folder"},
		{[]string{"fit", zero, "-o", ".", "--force"}, "cannot replace"},
		{[]string{"fit", zero, "-o", root, "--force"}, "lies inside"},
		{[]string{"fit", zero, "-o", fifo, "--force"}, "is a named pipe"},
		{[]string{"export", card, "-o", fifo, "--force"}, "is a named pipe"},
		{[]string{"predict", card, zero, "-o", fifo, "--force"}, "is a named pipe"},
		{[]string{"export", "--schema", "-o", filepath.Join(root, "missing", "s.json")}, "does not exist"},
		{[]string{"export", "--schema", "-o", notDir}, "exists; pass --force"},
	}
	if os.Getuid() != 0 { // root writes into read-only folders anyway
		ro := filepath.Join(root, "ro")
		os.Mkdir(ro, 0o555)
		cases = append(cases, struct {
			args []string
			want string
		}{[]string{"fit", zero, "-o", filepath.Join(ro, "out")}, "cannot write in " + ro + " (permission denied); check that the folder exists and is writable or choose another output"})
		// The default output lies beside the input: a read-only data
		// folder is the common case, and the message says to write
		// elsewhere (it said only to check the folder).
		in := filepath.Join(root, "rodata")
		os.Mkdir(in, 0o755)
		b, _ := os.ReadFile(zero)
		os.WriteFile(filepath.Join(in, "zero.csv"), b, 0o644)
		os.Chmod(in, 0o555)
		t.Cleanup(func() { os.Chmod(in, 0o755) })
		cases = append(cases, struct {
			args []string
			want string
		}{[]string{"fit", filepath.Join(in, "zero.csv")}, "cannot write in " + in + " (permission denied); check that the folder exists and is writable or choose another output"})
	}
	for _, c := range cases {
		_, errs, code := runWeft(t, c.args...)
		if code != exitBadInput || !strings.Contains(errs, c.want) || strings.Contains(errs, tmpTag) {
			t.Errorf("%v: exit %d, %q; want exit 2 and %q", c.args, code, errs, c.want)
		}
	}
	if st, err := os.Lstat(fifo); err != nil || st.Mode()&fs.ModeNamedPipe == 0 {
		t.Errorf("the named pipe was replaced: %v", err)
	}
	if b, _ := os.ReadFile(notDir); string(b) != "x" {
		t.Error("a file was overwritten without --force")
	}
	noHelpers(t, root)
}

// failingWriter fails every write, like a full disk or a closed pipe.
type failingWriter struct{}

func (failingWriter) Write([]byte) (int, error) { return 0, syscall.ENOSPC }

// Finding 8: a failed write to standard output fails the run (exit 1) for
// every command that prints.
func TestFailedStdoutWriteFails(t *testing.T) {
	card := filepath.Join("..", "..", "testdata", "example", "hgo-media.json")
	data := quickData(t, t.TempDir(), "x.csv")
	for _, args := range [][]string{
		{"terms"}, {"terms", "--json"},
		{"check", card, "--steps", "3", "--directions", "4"},
		{"check", card, "--steps", "3", "--directions", "4", "--json"},
		{"evaluate", card, "--stretch", "1.1,1.05"},
		{"evaluate", card, "--stretch", "1.1,1.05", "--json"},
		{"export", card}, {"inspect", data},
		{"fit", data, "--preset", "neo-hookean", "-o", filepath.Join(t.TempDir(), "out"), "--quiet"},
	} {
		var errb bytes.Buffer
		code := run(args, failingWriter{}, &errb)
		if code != exitFailed || !strings.Contains(errb.String(), "cannot write to standard output (no space left on device)") {
			t.Errorf("%v: exit %d, %q", args, code, errb.String())
		}
	}
	if f, err := os.OpenFile("/dev/full", os.O_WRONLY, 0); err == nil {
		defer f.Close()
		var errb bytes.Buffer
		if code := run([]string{"terms"}, f, &errb); code != exitFailed {
			t.Errorf("terms > /dev/full: exit %d, %s", code, errb.String())
		}
	}
}

// Finding 9: output files and folders get the mode the umask allows.
func TestOutputModesFollowUmask(t *testing.T) {
	data := quickData(t, t.TempDir(), "x.csv")
	for _, c := range []struct{ umask, file, dir fs.FileMode }{{0o022, 0o644, 0o755}, {0o027, 0o640, 0o750}} {
		old := syscall.Umask(int(c.umask))
		root := t.TempDir()
		out := filepath.Join(root, "out")
		_, errs, code := quickFit(t, data, out)
		_, errs2, code2 := runWeft(t, "export", "--schema", "-o", filepath.Join(root, "schema.json"))
		syscall.Umask(old)
		if code != 0 || code2 != 0 {
			t.Fatalf("exit %d, %d: %s %s", code, code2, errs, errs2)
		}
		filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
			if err != nil || p == root {
				return err
			}
			st, _ := d.Info()
			want := c.file
			if d.IsDir() {
				want = c.dir
			}
			if st.Mode().Perm() != want {
				t.Errorf("umask %03o: %s has mode %03o, want %03o", c.umask, p, st.Mode().Perm(), want)
			}
			return nil
		})
	}
}

// Finding 12: a fit of several files tries every file, writes what
// succeeds, lists each failure at the end and exits 1.
func TestMultiFileFitTriesEveryFile(t *testing.T) {
	dir := t.TempDir()
	a := quickData(t, dir, "a.csv")
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("protocol,stretch_1,stretch_2,cauchy_11,cauchy_22\n1:1,1.1,x,1,2\n"), 0o644)
	c := quickData(t, dir, "c.csv")
	out := filepath.Join(dir, "all")
	stdout, errs, code := runWeft(t, "fit", a, bad, c, "--preset", "neo-hookean", "-o", out, "--quiet")
	if code != exitFailed || !strings.Contains(errs, "1 of 3 files failed") || !strings.Contains(errs, "bad.csv:2:3") {
		t.Fatalf("exit %d, %s", code, errs)
	}
	for _, n := range []string{"a.weft", "c.weft"} {
		if _, err := os.Stat(filepath.Join(out, n, "model.json")); err != nil {
			t.Errorf("%s not written: %v", n, err)
		}
		if !strings.Contains(stdout, filepath.Join(out, n)) {
			t.Errorf("no summary for %s", n)
		}
	}
	// Every file bad: exit 2, nothing written, not even the -o folder.
	out2 := filepath.Join(dir, "none")
	if _, errs, code := runWeft(t, "fit", bad, bad+".missing", "-o", out2, "--quiet"); code != exitBadInput || !strings.Contains(errs, "2 of 2 files failed") {
		t.Errorf("all bad: exit %d, %s", code, errs)
	}
	if _, err := os.Stat(out2); err == nil {
		t.Error("a run that wrote nothing left its -o folder")
	}
	// The help states both codes, as the README does; it said "the exit
	// code is 1" only, while the run above exits 2.
	help, _, _ := runWeft(t, "fit", "--help")
	if !strings.Contains(strings.Join(strings.Fields(help), " "), "the exit code is 1 (2 when every file was bad input and nothing was written)") {
		t.Errorf("fit --help does not state the exit codes of a multi-file fit:\n%s", help)
	}
}

// Finding 5: SIGINT and SIGTERM remove the temporary folder and the lock
// file, leave no output, and exit 1 saying the run was interrupted; a
// temporary folder left by kill -9 is removed by the next run.
func TestInterruptAndKill(t *testing.T) {
	if testing.Short() {
		t.Skip("runs weft as a separate process")
	}
	data := filepath.Join(copyDemo(t, "patch-P2.csv"), "patch-P2.csv")
	// SIGHUP (a closed terminal or remote session) is handled like the
	// others; it killed the run outright, leaving the temporary folder and
	// the lock file and the exit status 129.
	for _, sig := range []os.Signal{os.Interrupt, syscall.SIGTERM, syscall.SIGHUP, syscall.SIGKILL} {
		root := t.TempDir()
		out := filepath.Join(root, "out")
		p := weftProcess("fit", data, "-o", out, "--quiet")
		var errb bytes.Buffer
		p.Stderr = &errb
		if err := p.Start(); err != nil {
			t.Fatal(err)
		}
		// Discovery takes seconds; signal once the temporary folder exists.
		awaitTemporaryFolder(root)
		p.Process.Signal(sig)
		err := p.Wait()
		var ee *exec.ExitError
		if sig == syscall.SIGKILL {
			if m, _ := filepath.Glob(filepath.Join(root, ".out"+tmpTag+"*")); len(m) == 0 {
				t.Fatal("no temporary folder to test the next run with")
			}
			if _, errs, code := quickFit(t, quickData(t, t.TempDir(), "x.csv"), out); code != 0 {
				t.Fatalf("run after kill -9: exit %d, %s", code, errs)
			}
			noHelpers(t, root)
			continue
		}
		if !errors.As(err, &ee) || ee.ExitCode() != exitFailed || !strings.Contains(errb.String(), "interrupted") {
			t.Errorf("%v: %v, stderr %q", sig, err, errb.String())
		}
		entries, _ := os.ReadDir(root)
		if len(entries) != 0 {
			t.Errorf("%v left %v", sig, entries)
		}
	}
}

// A signal ignored when weft starts (nohup for SIGHUP; a background job
// of a script for SIGINT, POSIX sh) stays ignored, so the run finishes and
// writes its folder; catching every signal it handles would undo what the
// caller asked for (Go's os/signal: Notify on an ignored SIGHUP or SIGINT
// installs a handler).
func TestIgnoredSignalsStayIgnored(t *testing.T) {
	if testing.Short() {
		t.Skip("runs weft as a separate process")
	}
	data := filepath.Join(copyDemo(t, "patch-P2.csv"), "patch-P2.csv")
	root := t.TempDir()
	out := filepath.Join(root, "out")
	p := exec.Command("sh", "-c", `trap '' INT HUP; exec "$0" "$@"`, os.Args[0], "fit", data, "-o", out, "--quiet")
	p.Env = append(os.Environ(), "WEFT_RUN_MAIN=1")
	var errb bytes.Buffer
	p.Stderr = &errb
	if err := p.Start(); err != nil {
		t.Fatal(err)
	}
	awaitTemporaryFolder(root)
	p.Process.Signal(syscall.SIGHUP)
	p.Process.Signal(os.Interrupt)
	if err := p.Wait(); err != nil {
		t.Fatalf("ignored SIGHUP and SIGINT stopped the run: %v, %s", err, errb.String())
	}
	if _, err := os.Stat(filepath.Join(out, "model.json")); err != nil {
		t.Errorf("no output folder: %v", err)
	}
	noHelpers(t, root)
}

// Finding 6: outputs name the input by its base name only, so the same data
// give the same bytes however the path was typed (here with a notice about
// the separator and a warning about a negative stress, which name the file).
func TestOutputsDoNotDependOnThePathAsTyped(t *testing.T) {
	dir := t.TempDir()
	b, _ := os.ReadFile(quickData(t, dir, "x.csv"))
	lines := strings.Split(strings.ReplaceAll(string(b), ",", ";"), "\n")
	f := strings.Split(lines[4], ";")
	f[3] = "-5"
	lines[4] = strings.Join(f, ";")
	data := filepath.Join(dir, "x.csv")
	os.WriteFile(data, []byte(strings.Join(lines, "\n")), 0o644)
	os.Mkdir(filepath.Join(dir, "sub"), 0o755)
	spellings := []string{data, filepath.Join(dir, "sub", "..", ".", "x.csv")}
	var outs []string
	for i, p := range spellings {
		out := filepath.Join(t.TempDir(), fmt.Sprint("out", i))
		if _, errs, code := quickFit(t, p, out); code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		outs = append(outs, out)
	}
	model, _ := os.ReadFile(filepath.Join(outs[0], "model.json"))
	if !strings.Contains(string(model), "x.csv: semicolon-separated") || !strings.Contains(string(model), "x.csv:5: protocol 1:1:") {
		t.Fatalf("the card lacks the notice or the warning:\n%s", model)
	}
	filepath.WalkDir(outs[0], func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, _ := filepath.Rel(outs[0], p)
		a, _ := os.ReadFile(p)
		b, err := os.ReadFile(filepath.Join(outs[1], rel))
		if err != nil || !bytes.Equal(a, b) {
			t.Errorf("%s differs between two spellings of the input path", rel)
		}
		if bytes.Contains(a, []byte(dir)) {
			t.Errorf("%s holds the input's folder %s", rel, dir)
		}
		return nil
	})
}

// An output file is never an input of the same run: `weft predict CARD
// DATA -o DATA --force` would replace the user's test data with
// predictions, and `weft export CARD -o CARD --force` the card with an
// export document. Both are refused (exit 2) whatever the spelling of the
// path (the same string, another relative form, a symbolic link), and the
// inputs keep their bytes.
func TestOutputIsNeverAnInputOfTheRun(t *testing.T) {
	root := t.TempDir()
	cardBytes, err := os.ReadFile(filepath.Join("..", "..", "testdata", "example", "hgo-media.json"))
	if err != nil {
		t.Fatal(err)
	}
	card := filepath.Join(root, "model.json")
	os.WriteFile(card, cardBytes, 0o644)
	const kin = "stretch_1,stretch_2\n1.05,1.02\n1.1,1.04\n"
	data := filepath.Join(root, "path.csv")
	os.WriteFile(data, []byte(kin), 0o644)
	link := filepath.Join(root, "link.csv")
	if err := os.Symlink("path.csv", link); err != nil {
		t.Fatal(err)
	}
	other := filepath.Join(root, "sub", "..", "path.csv")
	os.Mkdir(filepath.Join(root, "sub"), 0o755)
	cases := [][]string{
		{"predict", card, data, "-o", data, "--force"},
		{"predict", card, data, "-o", other, "--force"},
		{"predict", card, data, "-o", link, "--force"},
		{"predict", card, data, "-o", card, "--force"},
		{"predict", card, data, "-o", data}, // not offered to --force
		{"export", card, "--format", "json", "-o", card, "--force"},
		{"export", card, "--format", "csv", "-o", card},
	}
	for _, args := range cases {
		_, errs, code := runWeft(t, args...)
		if code != exitBadInput || !strings.Contains(errs, "input") || strings.Contains(errs, "pass --force") {
			t.Errorf("%v: exit %d, %q; want exit 2 naming the input", args, code, errs)
		}
	}
	if b, _ := os.ReadFile(data); string(b) != kin {
		t.Errorf("the kinematics file was replaced: %q", b)
	}
	if b, _ := os.ReadFile(card); !bytes.Equal(b, cardBytes) {
		t.Error("the model card was replaced")
	}
	// Another file is still written.
	if _, errs, code := runWeft(t, "predict", card, data, "-o", filepath.Join(root, "out.csv")); code != 0 {
		t.Errorf("predict into a new file: exit %d, %s", code, errs)
	}
	noHelpers(t, root)
}

// 'weft report DIR --force' on a read-only output folder is bad input
// (exit 2), found before the report is built, like every other output
// path (README, Overwriting and --force: "a read-only folder ... reported
// at once"); it was exit 1 with "cannot write DIR/plots (permission
// denied)" after the work. Permission bits do not stop root (POSIX).
func TestReportIntoReadOnlyFolderIsBadInput(t *testing.T) {
	if os.Getuid() == 0 {
		t.Skip("root writes into read-only folders anyway")
	}
	dir := demoFitCopy(t, "membrane-M1")
	if err := os.Chmod(dir, 0o555); err != nil {
		t.Fatal(err)
	}
	defer os.Chmod(dir, 0o755)
	_, errs, code := runWeft(t, "report", dir, "--force")
	if code != exitBadInput || !strings.Contains(errs, "cannot write in "+dir) {
		t.Errorf("exit %d, %q; want exit 2 and %q", code, errs, "cannot write in "+dir)
	}
}

// 'weft demo DIR --force' replaces only demo files, recognised by their
// first line; a project's own README.md (or any file of a demo name that
// 'weft demo' did not write) is kept and the run is bad input (exit 2)
// before any file is written. Until 2026-12-05 'weft demo . --force'
// replaced a project's README.md with the demo's.
func TestDemoForceReplacesOnlyDemoFiles(t *testing.T) {
	dir := t.TempDir()
	if _, errs, code := runWeft(t, "demo", dir); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	readme := filepath.Join(dir, "README.md")
	csv := filepath.Join(dir, "membrane-M1.csv")
	// A demo file saved again with CRLF line ends is still weft's.
	b, _ := os.ReadFile(csv)
	os.WriteFile(csv, bytes.ReplaceAll(b, []byte("\n"), []byte("\r\n")), 0o644)
	if _, errs, code := runWeft(t, "demo", dir, "--force"); code != 0 {
		t.Fatalf("--force over the demo's own files: exit %d: %s", code, errs)
	}
	os.WriteFile(readme, []byte("# My project\n"), 0o644)
	os.Remove(csv)
	_, errs, code := runWeft(t, "demo", dir, "--force")
	if code != exitBadInput || !strings.Contains(errs, "README.md exists and was not written by 'weft demo'") {
		t.Errorf("--force over a project's README.md: exit %d, %q; want exit 2", code, errs)
	}
	if got, _ := os.ReadFile(readme); string(got) != "# My project\n" {
		t.Errorf("README.md was replaced: %q", got)
	}
	if _, err := os.Stat(csv); err == nil {
		t.Error("a demo file was written although another was refused")
	}
	noHelpers(t, dir)
}

// 'weft report DIR' writes only inside DIR, so a parent folder the user
// may not write (a shared results folder) does not stop it: the lock it
// could not create beside DIR is taken inside DIR instead. It stopped with
// exit 2, "cannot write in PARENT (permission denied)". Permission bits
// do not stop root (POSIX), so the test needs another user.
func TestReportInReadOnlyParent(t *testing.T) {
	if os.Getuid() == 0 {
		t.Skip("root writes into read-only folders anyway")
	}
	dir := demoFitCopy(t, "membrane-M1")
	parent := filepath.Dir(dir)
	if err := os.Chmod(parent, 0o555); err != nil {
		t.Fatal(err)
	}
	defer os.Chmod(parent, 0o755)
	if _, errs, code := runWeft(t, "report", dir, "--force"); code != exitOK {
		t.Errorf("exit %d, %q; want 0", code, errs)
	}
	noHelpers(t, dir)
}

// awaitTemporaryFolder waits (at most 20 s) until a run writing root/out
// has made its temporary folder, so that a signal reaches it mid-run.
func awaitTemporaryFolder(root string) {
	deadline := time.Now().Add(20 * time.Second)
	for {
		m, _ := filepath.Glob(filepath.Join(root, ".out"+tmpTag+"*"))
		if len(m) > 0 || time.Now().After(deadline) {
			return
		}
		time.Sleep(10 * time.Millisecond)
	}
}
