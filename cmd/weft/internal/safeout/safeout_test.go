package safeout

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"runtime"
	"strings"
	"testing"
	"time"
)

// problemOf returns the Problem of an *Error, failing the test for any
// other error.
func problemOf(t *testing.T, err error) *Error {
	t.Helper()
	var e *Error
	if !errors.As(err, &e) {
		t.Fatalf("error %v (%T) is not an *Error", err, err)
	}
	return e
}

// A file output: refused without force, replaced with it, and what
// appears while the work runs is kept (a Late error, whose advice comes
// before the note that nothing was replaced).
func TestFileOutput(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "x.csv")
	os.WriteFile(p, []byte("theirs"), 0o644)
	_, err := PrepareFile(p, false, false)
	if e := problemOf(t, err); e.Problem != Exists || e.Late || e.Path != p || e.Error() != p+" exists" {
		t.Errorf("without force: %+v, %q", e, e)
	}
	f, err := PrepareFile(p, true, false)
	if err != nil {
		t.Fatal(err)
	}
	if err := f.Commit([]byte("ours")); err != nil {
		t.Fatal(err)
	}
	f.Close()
	if b, _ := os.ReadFile(p); string(b) != "ours" {
		t.Errorf("with force the file holds %q", b)
	}

	q := filepath.Join(dir, "y.csv")
	g, err := PrepareFile(q, false, false)
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile(q, []byte("theirs"), 0o644)
	e := problemOf(t, g.Commit([]byte("ours")))
	e.Advice = "; ADVICE"
	if !e.Late || e.Error() != q+" exists; ADVICE; it was not replaced" {
		t.Errorf("late: %+v, %q", e, e)
	}
	if b, _ := os.ReadFile(q); string(b) != "theirs" {
		t.Errorf("the file that appeared holds %q", b)
	}
	g.Close()
	assertNoHelpers(t, dir)
}

// Two writers of one path: the second is Busy at once.
func TestBusy(t *testing.T) {
	p := filepath.Join(t.TempDir(), "out")
	l, err := Acquire(p)
	if err != nil {
		t.Fatal(err)
	}
	_, err = PrepareDir(p, true, nil)
	if e := problemOf(t, err); e.Problem != Busy || e.Late || e.Target != TargetFolder {
		t.Errorf("second writer: %+v", e)
	}
	l.Release()
	d, err := PrepareDir(p, false, nil)
	if err != nil {
		t.Fatalf("after release: %v", err)
	}
	d.Close()
}

// A folder output: its marker lists what was written, force replaces it
// while it holds only that, and a file of the user's keeps it.
func TestFolderOutput(t *testing.T) {
	root := t.TempDir()
	p := filepath.Join(root, "out")
	write := func(force bool, files ...string) error {
		d, err := PrepareDir(p, force, nil)
		if err != nil {
			return err
		}
		defer d.Close()
		sub := d.Sub("spec")
		for _, f := range files {
			if err := sub.Write(f, []byte(f)); err != nil {
				return err
			}
		}
		if err := sub.WriteMarker(); err != nil {
			return err
		}
		if err := d.Write("top.csv", []byte("top")); err != nil {
			return err
		}
		return d.Commit(force)
	}
	if err := write(false, "b.csv", "plots/a.svg"); err != nil {
		t.Fatal(err)
	}
	listed, found, err := ReadMarker(p)
	want := map[string]bool{"spec/.weft-output": true, "spec/b.csv": true, "spec/plots/a.svg": true, "top.csv": true}
	if err != nil || !found || !reflect.DeepEqual(listed, want) {
		t.Errorf("marker lists %v (found %v, %v), want %v", listed, found, err, want)
	}
	if _, found, _ := ReadMarker(filepath.Join(p, "spec")); !found {
		t.Error("the subfolder has no marker of its own")
	}
	if e := problemOf(t, write(false, "c.csv")); e.Problem != Exists || e.Target != TargetFolder {
		t.Errorf("without force: %+v", e)
	}
	if err := write(true, "c.csv"); err != nil {
		t.Fatalf("force over weft's own folder: %v", err)
	}
	if _, err := os.Stat(filepath.Join(p, "spec", "b.csv")); !os.IsNotExist(err) {
		t.Error("the old folder's files survived the replacement")
	}
	os.WriteFile(filepath.Join(p, "spec", "mine.txt"), []byte("mine"), 0o644)
	e := problemOf(t, write(true, "d.csv"))
	if e.Problem != Foreign || !reflect.DeepEqual(e.Entries, []string{"spec/mine.txt"}) || e.Late {
		t.Errorf("force over a folder with a user's file: %+v", e)
	}
	if b, _ := os.ReadFile(filepath.Join(p, "spec", "mine.txt")); string(b) != "mine" {
		t.Error("the user's file was changed")
	}
	assertNoHelpers(t, root)
}

// The plots folder is checked against the marker and replaced whole; the
// marker then lists the new plots instead of the old.
func TestPlots(t *testing.T) {
	dir := t.TempDir()
	plots := filepath.Join(dir, "plots")
	os.Mkdir(plots, 0o755)
	os.WriteFile(filepath.Join(plots, "old.svg"), nil, 0o644)
	listed := map[string]bool{"model.json": true, "plots/old.svg": true}
	if e := problemOf(t, CheckPlots(plots, false, listed, true)); e.Problem != Exists || e.Target != TargetPlots {
		t.Errorf("without force: %+v", e)
	}
	if err := CheckPlots(plots, true, listed, true); err != nil {
		t.Fatalf("plots weft wrote: %v", err)
	}
	os.WriteFile(filepath.Join(plots, "notes.txt"), nil, 0o644)
	e := problemOf(t, CheckPlots(plots, true, listed, true))
	if e.Problem != Foreign || !strings.Contains(e.Error(), "plots/notes.txt") || !strings.Contains(e.Error(), "replacing plots/") {
		t.Errorf("a user's file in plots/: %+v, %q", e, e)
	}
	os.Remove(filepath.Join(plots, "notes.txt"))
	if err := ReplacePlots(plots, []FileData{{Name: "new.svg", Data: []byte("<svg/>")}}); err != nil {
		t.Fatal(err)
	}
	if err := UpdateMarker(dir, listed, "plots", []string{"plots/new.svg"}); err != nil {
		t.Fatal(err)
	}
	got, _, _ := ReadMarker(dir)
	if want := map[string]bool{"model.json": true, "plots/new.svg": true}; !reflect.DeepEqual(got, want) {
		t.Errorf("marker after the plots were replaced lists %v, want %v", got, want)
	}
	if _, err := os.Stat(filepath.Join(plots, "old.svg")); !os.IsNotExist(err) {
		t.Error("an old plot survived")
	}
	assertNoHelpers(t, dir)
}

func assertNoHelpers(t *testing.T, dir string) {
	t.Helper()
	filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err == nil && IsHelper(d.Name()) {
			t.Errorf("left behind: %s", p)
		}
		return nil
	})
}

// A file inside a folder the caller has locked (report.html of an output
// folder) gets no lock file of its own, so its folder's writability is
// probed apart: a read-only folder is Unwritable before the work, not a
// late WriteFailed after it. Read-only permission bits (POSIX, common
// practice) do not stop root, so the test needs another user.
func TestLockedFileInReadOnlyFolder(t *testing.T) {
	if os.Getuid() == 0 {
		t.Skip("root writes into read-only folders anyway")
	}
	ro := filepath.Join(t.TempDir(), "ro")
	if err := os.Mkdir(ro, 0o555); err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(ro, "report.html")
	_, err := PrepareFile(p, true, true)
	if e := problemOf(t, err); e.Problem != Unwritable || e.Late || e.Folder != ro {
		t.Errorf("read-only folder: %+v, %q; want Unwritable, found before the work", e, e)
	}
	assertNoHelpers(t, ro)
}

// HandleSignals' watcher ends when stop is called: a process (or a test
// binary) that handles signals around each run does not collect one
// blocked goroutine per run. The first call is made before counting, as
// package os/signal starts its own delivery goroutine once, for good.
func TestHandleSignalsStopEndsItsGoroutine(t *testing.T) {
	never := func(os.Signal) int {
		t.Error("no signal was sent")
		return 1
	}
	HandleSignals(never)()
	before := runtime.NumGoroutine()
	for i := 0; i < 20; i++ {
		HandleSignals(never)()
	}
	// Count yields, not time: a watcher told to stop may still be
	// returning.
	after := runtime.NumGoroutine()
	for i := 0; i < 2000 && after > before; i++ {
		runtime.Gosched()
		time.Sleep(time.Millisecond)
		after = runtime.NumGoroutine()
	}
	if after > before {
		t.Errorf("%d goroutines before 20 runs with signals handled, %d after", before, after)
	}
}

// Staged plots are not visible at plots/ until Commit; Discard before it
// leaves the old plots and no helper folder, and after it does nothing.
func TestStagedPlotsDiscardAndCommit(t *testing.T) {
	dir := t.TempDir()
	plots := filepath.Join(dir, "plots")
	os.Mkdir(plots, 0o755)
	os.WriteFile(filepath.Join(plots, "old.svg"), []byte("old"), 0o644)
	s, err := StagePlots(plots, []FileData{{Name: "new.svg", Data: []byte("<svg/>")}})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(plots, "new.svg")); !os.IsNotExist(err) {
		t.Error("a staged plot is visible before Commit")
	}
	s.Discard()
	if b, _ := os.ReadFile(filepath.Join(plots, "old.svg")); string(b) != "old" {
		t.Error("Discard changed the old plots")
	}
	assertNoHelpers(t, dir)
	s, err = StagePlots(plots, []FileData{{Name: "new.svg", Data: []byte("<svg/>")}})
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Commit(); err != nil {
		t.Fatal(err)
	}
	s.Discard()
	if b, _ := os.ReadFile(filepath.Join(plots, "new.svg")); string(b) != "<svg/>" {
		t.Errorf("after Commit and Discard plots/new.svg reads %q", b)
	}
	if _, err := os.Stat(filepath.Join(plots, "old.svg")); !os.IsNotExist(err) {
		t.Error("an old plot survived Commit")
	}
	assertNoHelpers(t, dir)
}
