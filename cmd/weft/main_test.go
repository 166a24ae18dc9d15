package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
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
// test binary runs main when WEFT_RUN_MAIN is set, and records its peak
// memory in the file WEFT_PEAK_FILE names where recordPeak is available.
func TestMain(m *testing.M) {
	if os.Getenv("WEFT_RUN_MAIN") == "1" {
		if os.Getenv("WEFT_SIGNAL_BETWEEN_COMMITS") == "1" {
			betweenReportCommits = signalSelfAndYield
		}
		if os.Getenv("WEFT_SIGNAL_AFTER_STAGING") == "1" {
			afterReportPlotsStaged = signalSelfAndYield
		}
		if path := os.Getenv("WEFT_PEAK_FILE"); path != "" && recordPeak != nil {
			os.Exit(recordPeak(path))
		}
		main()
	}
	code := m.Run()
	for _, d := range sharedDirs {
		os.RemoveAll(d)
	}
	os.Exit(code)
}

// recordPeak, where the system tells a process its own peak memory, runs
// weft as main does and writes that peak to path; it returns the exit code.
var recordPeak func(path string) int

// sharedDirs are folders that several tests read (demoFits,
// sharedFitCopy), removed when the tests end; sharedDirsMu guards it, as
// tests in parallel add to it.
var (
	sharedDirs   []string
	sharedDirsMu sync.Mutex
)

// addSharedDir adds dir to sharedDirs.
func addSharedDir(dir string) {
	sharedDirsMu.Lock()
	defer sharedDirsMu.Unlock()
	sharedDirs = append(sharedDirs, dir)
}

// weftProcess returns a command that runs weft with args as a separate
// process (the test binary itself, see TestMain).
func weftProcess(args ...string) *exec.Cmd {
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), "WEFT_RUN_MAIN=1")
	return cmd
}

// quickData writes a small synthetic specimen (two protocols of an
// incompressible neo-Hookean membrane, μ = 10 kPa, Cauchy stress
// σ_ii = μ(λ_i² − 1/(λ1²λ2²)), the classical closed form, e.g. Ogden 1984)
// that a preset fits in a fraction of a second.
func quickData(t *testing.T, dir, name string) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("# specimen = " + strings.TrimSuffix(name, filepath.Ext(name)) + "\n# notes = synthetic\nprotocol,stretch_1,stretch_2,cauchy_11,cauchy_22\n")
	for _, r := range []float64{1, 0.5} {
		for i := 0; i < 8; i++ {
			l1 := 1 + 0.025*float64(i)
			l2 := 1 + 0.025*float64(i)*r
			s3 := 1 / (l1 * l1 * l2 * l2)
			fmt.Fprintf(&b, "1:%g,%g,%g,%.10g,%.10g\n", r, l1, l2, 10*(l1*l1-s3), 10*(l2*l2-s3))
		}
	}
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// quickFit fits data with the neo-Hookean preset into out.
func quickFit(t *testing.T, data, out string, extra ...string) (string, string, int) {
	t.Helper()
	return runWeft(t, append([]string{"fit", data, "--preset", "neo-hookean", "-o", out, "--quiet"}, extra...)...)
}

// An unknown shell for 'weft completion' or an unknown topic for 'weft
// help' is bad input (exit 2, a message on stderr, nothing on stdout),
// like an unknown command; known ones still print their script or help.
func TestUnknownHelpTopicAndShellAreBadInput(t *testing.T) {
	for _, args := range [][]string{{"completion", "tcsh"}, {"help", "nosuch"}, {"help", "fit", "--no-such-flag"}} {
		out, errs, code := runWeft(t, args...)
		if code != exitBadInput || out != "" || !strings.HasPrefix(errs, "weft: ") {
			t.Errorf("%v: exit %d, stdout %q, stderr %q; want exit 2 with a message on stderr only", args, code, out, errs)
		}
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"completion", "bash"}, "bash completion"},
		{[]string{"completion"}, "Usage:"},
		{[]string{"help", "fit"}, "weft fit"},
		{[]string{"help"}, "Available Commands"},
	} {
		out, errs, code := runWeft(t, c.args...)
		if code != 0 || !strings.Contains(out, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want exit 0 and %q on stdout", c.args, code, errs, c.want)
		}
	}
}

// A fit's output folder or a test file given where a model card belongs
// (check, export, evaluate, predict) is bad input whose message names the
// card to give instead, not only the operating system's or the JSON
// parser's complaint.
func TestFolderOrTestFileForACardSaysWhatToGive(t *testing.T) {
	dir := t.TempDir()
	cardBytes, err := os.ReadFile(filepath.Join("..", "..", "testdata", "example", "hgo-media.json"))
	if err != nil {
		t.Fatal(err)
	}
	fitDir := filepath.Join(dir, "x.weft")
	os.Mkdir(fitDir, 0o755)
	os.WriteFile(filepath.Join(fitDir, "model.json"), cardBytes, 0o644)
	empty := filepath.Join(dir, "empty")
	os.Mkdir(empty, 0o755)
	data := quickData(t, dir, "x.csv")
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"check", fitDir}, "give the card inside it: " + filepath.Join(fitDir, "model.json")},
		{[]string{"export", fitDir}, "give the card inside it: " + filepath.Join(fitDir, "model.json")},
		{[]string{"evaluate", fitDir, "--stretch", "1.1,1"}, "give the card inside it"},
		{[]string{"predict", fitDir, data}, "give the card inside it"},
		{[]string{"check", empty}, "is a folder, not a model card; give the model.json"},
		{[]string{"check", data}, "looks like a test file; give the model card (model.json)"},
	}
	for _, c := range cases {
		out, errs, code := runWeft(t, c.args...)
		if code != exitBadInput || out != "" || !strings.Contains(errs, c.want) {
			t.Errorf("%v: exit %d, %q; want exit 2 and %q", c.args, code, errs, c.want)
		}
	}
}

// Every --help example runs as written from a folder holding only the
// files it names: weft creates no missing parent folder of an output
// (README, Outputs, limits and exit codes: "a missing parent folder (weft
// creates none …)"), so an example's output path (-o, --write, --plot)
// may not lie in a folder that no example makes. 'weft fit skin-A.csv
// --preset hgo -o out/skin-A' stopped with exit 2 ("the folder out does
// not exist"), and predict's example read out/model.json, which no
// example wrote.
func TestHelpExamplesNeedNoMissingFolder(t *testing.T) {
	root := newRootCmd(&streams{Out: io.Discard, ErrOut: io.Discard})
	made := map[string]bool{} // folders the examples' commands write
	var outs, cards []string
	for _, c := range root.Commands() {
		for _, line := range strings.Split(c.Example, "\n") {
			f := strings.Fields(line)
			if len(f) < 2 || f[0] != "weft" {
				continue
			}
			for i := 2; i < len(f); i++ {
				switch {
				case (f[i] == "-o" || f[i] == "--write" || f[i] == "--plot") && i+1 < len(f):
					outs = append(outs, line+" → "+f[i+1])
					if f[1] == "fit" || f[1] == "cohort" {
						made[f[i+1]] = true
					}
				case strings.HasSuffix(f[i], ".json") && strings.Contains(f[i], "/"):
					cards = append(cards, line+" → "+f[i])
				}
			}
		}
	}
	for _, o := range outs {
		p := o[strings.LastIndex(o, " → ")+len(" → "):]
		if d := filepath.Dir(p); d != "." && !made[d] {
			t.Errorf("%s: the folder %s is made by no example, and weft creates none", o, d)
		}
	}
	for _, c := range cards {
		p := c[strings.LastIndex(c, " → ")+len(" → "):]
		if d := filepath.Dir(p); !made[d] && !strings.HasSuffix(d, ".weft") {
			t.Errorf("%s: no example writes the folder %s", c, d)
		}
	}
}

// An unknown command, and too many arguments to demo, are bad input whose
// message says what to type besides what is wrong, as every other usage
// error does; 'weft bogus' printed only `unknown command "bogus" for
// "weft"`, and 'weft demo a b' only "demo takes at most one DIR".
func TestUsageErrorsSayWhatToType(t *testing.T) {
	for _, c := range []struct {
		args []string
		want []string
	}{
		{[]string{"bogus"}, []string{`unknown command "bogus"`, "'weft --help' lists the commands"}},
		{[]string{"fti"}, []string{`unknown command "fti"`, "'weft --help' lists the commands", "Did you mean this?\n\tfit"}},
		{[]string{"demo", "a", "b"}, []string{"at most one DIR", "'weft demo --help'"}},
	} {
		out, errs, code := runWeft(t, c.args...)
		if code != exitBadInput || out != "" {
			t.Errorf("%v: exit %d, stdout %q; want exit 2 and nothing on standard output", c.args, code, out)
		}
		for _, w := range c.want {
			if !strings.Contains(errs, w) {
				t.Errorf("%v: %q lacks %q", c.args, errs, w)
			}
		}
	}
}
