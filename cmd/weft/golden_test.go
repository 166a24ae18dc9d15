package main

import (
	"crypto/sha256"
	"flag"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"testing"
)

// update rewrites testdata/demo-outputs.sha256 from the current code:
//
//	go test ./cmd/weft -run TestDemoOutputsUnchanged -update
var update = flag.Bool("update", false, "rewrite testdata/demo-outputs.sha256 from the current outputs")

// goldenFile lists the SHA-256 of every file 'weft fit' writes for the
// bundled demo specimens, one "HASH  PATH" line per file (the format of
// sha256sum), PATH relative to the -o folder.
const goldenFile = "testdata/demo-outputs.sha256"

// demoInputs are the bundled synthetic specimens whose outputs are pinned.
var demoInputs = []string{"membrane-M1.csv", "membrane-M3-sutured.csv", "patch-P2.csv"}

// TestDemoOutputsUnchanged runs 'weft fit' (discovery, the default
// options) on every bundled demo specimen and compares each written file,
// byte for byte through its SHA-256, with the committed list: a change of
// structure must not change what weft writes. A change that alters outputs
// on purpose (a catalogue entry, a new report section) regenerates the list
// with -update and says so in its commit.
func TestDemoOutputsUnchanged(t *testing.T) {
	t.Parallel()
	out := demoFits(t).dir
	got, err := hashTree(out)
	if err != nil {
		t.Fatal(err)
	}
	if *update {
		if err := os.WriteFile(goldenFile, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(goldenFile)
	if err != nil {
		t.Fatalf("%v (create it with -update)", err)
	}
	if got == string(want) {
		return
	}
	wantBy := hashLines(string(want))
	gotBy := hashLines(got)
	for _, p := range sortedKeys(wantBy, gotBy) {
		switch w, g := wantBy[p], gotBy[p]; {
		case g == "":
			t.Errorf("%s: no longer written", p)
		case w == "":
			t.Errorf("%s: newly written", p)
		case g != w:
			t.Errorf("%s: contents changed", p)
		}
	}
	t.Log("if the change is intended, regenerate with: go test ./cmd/weft -run TestDemoOutputsUnchanged -update")
}

// hashTree returns "HASH  PATH\n" for every regular file below dir, sorted
// by path, with '/' as separator.
func hashTree(dir string) (string, error) {
	var lines []string
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || !d.Type().IsRegular() {
			return err
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		rel, err := filepath.Rel(dir, p)
		if err != nil {
			return err
		}
		lines = append(lines, fmt.Sprintf("%x  %s\n", sha256.Sum256(b), filepath.ToSlash(rel)))
		return nil
	})
	sort.Slice(lines, func(i, j int) bool { return lines[i][66:] < lines[j][66:] })
	return strings.Join(lines, ""), err
}

// hashLines maps each path of a hash list to its hash.
func hashLines(s string) map[string]string {
	m := map[string]string{}
	for _, l := range strings.Split(s, "\n") {
		if h, p, ok := strings.Cut(l, "  "); ok {
			m[p] = h
		}
	}
	return m
}

// sortedKeys returns the keys of both maps, sorted, each once.
func sortedKeys(a, b map[string]string) []string {
	seen := map[string]bool{}
	var ks []string
	for _, m := range []map[string]string{a, b} {
		for k := range m {
			if !seen[k] {
				seen[k] = true
				ks = append(ks, k)
			}
		}
	}
	sort.Strings(ks)
	return ks
}

// demoFitRun is one 'weft fit' of every demo specimen (discovery, default
// options) into one -o folder, which the tests that need those fits share
// read-only: each discovery runs once per test binary.
type demoFitRun struct {
	dir, stdout, stderr string
	code                int
}

var (
	demoFitOnce   sync.Once
	demoFitResult demoFitRun
)

// demoFits returns the shared fit of the demo specimens, running it on
// first use; the test fails when the fit did not succeed. Its folder is
// removed when the test binary ends (TestMain).
func demoFits(t *testing.T) demoFitRun {
	t.Helper()
	demoFitOnce.Do(func() {
		dir, err := os.MkdirTemp("", "weft-demo-fits-")
		if err != nil {
			demoFitResult = demoFitRun{stderr: err.Error(), code: -1}
			return
		}
		addSharedDir(dir)
		out := filepath.Join(dir, "out")
		args := []string{"fit", "-o", out, "--quiet"}
		for _, n := range demoInputs {
			args = append(args, demoFile(n))
		}
		var o, e strings.Builder
		code := run(args, &o, &e)
		demoFitResult = demoFitRun{dir: out, stdout: o.String(), stderr: e.String(), code: code}
	})
	if r := demoFitResult; r.code != 0 {
		t.Fatalf("weft fit of the demo specimens: exit %d: %s", r.code, r.stderr)
	}
	return demoFitResult
}

// demoFitCopy copies the shared fit of one demo specimen (its folder name
// without .weft) into a fresh folder that the test may change.
func demoFitCopy(t *testing.T, name string) string {
	t.Helper()
	dst := filepath.Join(t.TempDir(), "out.weft")
	copyFolder(t, filepath.Join(demoFits(t).dir, name+".weft"), dst)
	return dst
}

// sharedFit is one 'weft fit ARGS -o FOLDER --quiet', made once for every
// test that asks for the same ARGS and folder name.
type sharedFit struct {
	once        sync.Once
	dir, stderr string
	code        int
}

// sharedFits holds sharedFitCopyAs's runs, keyed by the folder's name and
// the arguments as the tests give them.
var sharedFits sync.Map

// sharedFitCopy runs 'weft fit data -o FOLDER --quiet' (discovery, default
// options) once per test binary, whichever test asks first, and copies
// FOLDER to a fit.weft folder in the calling test's temporary folder,
// which the test may change, returning its path; the test fails when the
// fit did not succeed (sharedFitCopyAs).
func sharedFitCopy(t *testing.T, data string) string {
	t.Helper()
	return sharedFitCopyAs(t, "fit.weft", data)
}

// sharedFitCopyAs runs 'weft fit args -o FOLDER --quiet', FOLDER named
// name, once per test binary for the same name and args, whichever test
// asks first, and copies FOLDER to a folder of the same name in the
// calling test's temporary folder, which the test may change, returning
// its path; the test fails when the fit did not succeed.
// Tests that ran the same command each on their own share its fit so,
// which gives the same bytes every run (TestDemoOutputsUnchanged pins
// them; aniso.TestDiscoverDeterministicAcrossWorkers,
// TestFitPresetForceAndDeterminism); a test that checks that a fit is
// deterministic or independent of history (the protocol order, the path
// as typed) runs its own fits instead.
func sharedFitCopyAs(t *testing.T, name string, args ...string) string {
	t.Helper()
	v, _ := sharedFits.LoadOrStore(name+"\x00"+strings.Join(args, "\x00"), new(sharedFit))
	f := v.(*sharedFit)
	f.once.Do(func() {
		dir, err := os.MkdirTemp("", "weft-shared-fit-")
		if err != nil {
			f.stderr, f.code = err.Error(), -1
			return
		}
		addSharedDir(dir)
		f.dir = filepath.Join(dir, name)
		var o, e strings.Builder
		f.code = run(append(append([]string{"fit"}, args...), "-o", f.dir, "--quiet"), &o, &e)
		f.stderr = e.String()
	})
	if f.code != 0 {
		t.Fatalf("weft fit %s: exit %d: %s", strings.Join(args, " "), f.code, f.stderr)
	}
	dst := filepath.Join(t.TempDir(), name)
	copyFolder(t, f.dir, dst)
	return dst
}

// copyFolder copies the folder src, files and subfolders, to dst.
func copyFolder(t *testing.T, src, dst string) {
	t.Helper()
	err := filepath.WalkDir(src, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(src, p)
		if d.IsDir() {
			return os.MkdirAll(filepath.Join(dst, rel), 0o755)
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		return os.WriteFile(filepath.Join(dst, rel), b, 0o644)
	})
	if err != nil {
		t.Fatal(err)
	}
}

// planGoldenFile lists the SHA-256 of what 'weft plan --json --top 0'
// prints for each demo specimen's fit folder, the folder's path replaced
// by its name.
const planGoldenFile = "testdata/demo-plans.sha256"

// TestDemoPlansUnchanged runs 'weft plan' on every demo specimen's fit and
// compares what it prints, through its SHA-256, with the committed list,
// as TestDemoOutputsUnchanged does for the fit's files: a change meant for
// another output must not move the plan unnoticed (a shared reading of a
// protocol's direction once made demo M3's plan offer a ratio it had run).
// Regenerate with -update when a change is meant.
func TestDemoPlansUnchanged(t *testing.T) {
	t.Parallel()
	dir := demoFits(t).dir
	var got strings.Builder
	for _, n := range demoInputs {
		name := strings.TrimSuffix(n, ".csv") + ".weft"
		stdout, stderr, code := runWeft(t, "plan", filepath.Join(dir, name), "--json", "--top", "0")
		if code != 0 {
			t.Fatalf("weft plan %s: exit %d: %s", name, code, stderr)
		}
		stdout = strings.ReplaceAll(stdout, filepath.Join(dir, name), name)
		fmt.Fprintf(&got, "%x  %s\n", sha256.Sum256([]byte(stdout)), name)
	}
	if *update {
		if err := os.WriteFile(planGoldenFile, []byte(got.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(planGoldenFile)
	if err != nil {
		t.Fatalf("%v (create it with -update)", err)
	}
	if got.String() != string(want) {
		t.Errorf("weft plan of the demo fits changed:\n%s\nwant\n%s\nif the change is intended, regenerate with: go test ./cmd/weft -run TestDemoPlansUnchanged -update", got.String(), want)
	}
}
