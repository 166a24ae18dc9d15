package main

import (
	"html"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso/card"
)

// The cautions and the synthetic label reach every output a user or an FE
// analyst receives of a card (README, "Cautions in detail": parameters are
// research-grade and specimen-specific, valid within the tested range, not
// for clinical decisions; example data are labelled synthetic). Before, a
// card fitted to a file that says it is synthetic kept the label only in
// its data section: the fit summary, export (every format), check,
// evaluate and plan showed the cautions without it, and predict's CSV
// and plan's --plot figure showed no caution at all.

// wantCautions fails t unless out holds every caution, with
// card.SyntheticCaution exactly when synthetic.
func wantCautions(t *testing.T, what, out string, synthetic bool) {
	t.Helper()
	for _, c := range card.Cautions {
		if !strings.Contains(out, c) {
			t.Errorf("%s: caution %q missing", what, c)
		}
	}
	if got := strings.Contains(out, card.SyntheticCaution); got != synthetic {
		t.Errorf("%s: synthetic caution shown %v, want %v", what, got, synthetic)
	}
}

// cardOutputs runs every command that prints a card's results on the fit
// of data and returns each output by name.
func cardOutputs(t *testing.T, data, dir string) map[string]string {
	t.Helper()
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "fit")
	outs := map[string]string{}
	text, errs, code := quickFit(t, data, out)
	if code != 0 {
		t.Fatalf("fit: exit %d: %s", code, errs)
	}
	outs["fit summary"] = text
	js, errs, code := runWeft(t, "fit", data, "--preset", "neo-hookean", "-o", filepath.Join(dir, "fit-json"), "--quiet", "--json")
	if code != 0 {
		t.Fatalf("fit --json: exit %d: %s", code, errs)
	}
	outs["fit --json"] = js
	model := filepath.Join(out, "model.json")
	b, err := os.ReadFile(model)
	if err != nil {
		t.Fatal(err)
	}
	outs["model.json"] = string(b)
	for _, f := range []string{"table", "csv", "json", "latex", "ufl"} {
		outs["export "+f] = mustRun(t, "export", model, "--format", f)
	}
	// The UFL module's docstring, which help(module) shows without the
	// comment lines above it, carries them too.
	if parts := strings.SplitN(outs["export ufl"], `"""`, 3); len(parts) == 3 {
		outs["export ufl docstring"] = strings.Join(strings.Fields(parts[1]), " ")
	} else {
		t.Errorf("export ufl: no docstring")
	}
	outs["check"] = mustRun(t, "check", model)
	outs["check --json"] = mustRun(t, "check", model, "--json")
	outs["evaluate"] = mustRun(t, "evaluate", model, "--stretch", "1.1,1.05")
	outs["evaluate --json"] = mustRun(t, "evaluate", model, "--stretch", "1.1,1.05", "--json")
	path := writeTemp(t, "path.csv", "stretch_1,stretch_2\n1.05,1.02\n")
	outs["predict"] = mustRun(t, "predict", model, path)
	outs["plan"] = mustRun(t, "plan", out)
	outs["plan --json"] = mustRun(t, "plan", out, "--json")
	svg := filepath.Join(dir, "next.svg")
	mustRun(t, "plan", out, "--plot", svg)
	b, err = os.ReadFile(svg)
	if err != nil {
		t.Fatal(err)
	}
	var words []string // the figure's text, its lines joined
	for _, m := range svgText.FindAllStringSubmatch(string(b), -1) {
		words = append(words, html.UnescapeString(m[1]))
	}
	outs["plan --plot"] = strings.Join(words, " ")
	return outs
}

// svgText matches a text element of an SVG and captures its content.
var svgText = regexp.MustCompile(`<text[^>]*>([^<]*)</text>`)

// mustRun runs weft with args and returns its standard output; the exit
// code must be 0.
func mustRun(t *testing.T, args ...string) string {
	t.Helper()
	out, errs, code := runWeft(t, args...)
	if code != 0 {
		t.Fatalf("%v: exit %d: %s", args, code, errs)
	}
	return out
}

func TestEveryCardOutputCarriesCautionsAndSyntheticLabel(t *testing.T) {
	dir := t.TempDir()
	data := quickData(t, dir, "syn.csv") // its notes say "synthetic"
	for what, out := range cardOutputs(t, data, filepath.Join(dir, "syn")) {
		wantCautions(t, what, out, true)
	}
}

func TestMeasuredDataCarryNoSyntheticLabel(t *testing.T) {
	dir := t.TempDir()
	p := quickData(t, dir, "m.csv")
	b, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	data := writeTemp(t, "measured.csv", strings.Replace(string(b), "# notes = synthetic\n", "# notes = bench test 4\n", 1))
	for what, out := range cardOutputs(t, data, filepath.Join(dir, "m")) {
		wantCautions(t, what, out, false)
	}
}

// A cohort's summary, cohort.json and its own cards (population and mean
// parameters, whose data sections do not carry the specimens' labels) say
// synthetic when its specimens do; export of the mean card keeps it.
func TestCohortOutputsCarryCautionsAndSyntheticLabel(t *testing.T) {
	dir := t.TempDir()
	a, b := quickData(t, dir, "a.csv"), quickData(t, dir, "b.csv")
	out := filepath.Join(dir, "cohort")
	text := mustRun(t, "cohort", "-o", out, "--quiet", "--preset", "neo-hookean", "--no-specimen-reports", a, b)
	wantCautions(t, "cohort summary", text, true)
	for _, f := range []string{"cohort.json", "population.json", "mean-parameters.json"} {
		bs, err := os.ReadFile(filepath.Join(out, f))
		if err != nil {
			t.Fatal(err)
		}
		wantCautions(t, f, string(bs), true)
	}
	wantCautions(t, "export of mean-parameters.json", mustRun(t, "export", filepath.Join(out, "mean-parameters.json")), true)
}

// predict's CSV says, in its own # lines, how many rows leave the card's
// fitted data range (as export's warning does); before, a row at stretch
// 1.6 × 1.5 of a card fitted to at most 1.15 returned 1.1e10 kPa unmarked.
func TestPredictMarksRowsOutsideTheDataRange(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "fit")
	if _, errs, code := quickFit(t, quickData(t, dir, "syn.csv"), out); code != 0 { // stretches up to 1.175
		t.Fatalf("fit: exit %d: %s", code, errs)
	}
	path := writeTemp(t, "path.csv", "stretch_1,stretch_2\n1.05,1.02\n1.6,1.5\n1.1,1.1\n")
	text, errs, code := runWeft(t, "predict", filepath.Join(out, "model.json"), path)
	want := "1 of 3 rows lie outside the fitted data range"
	if code != 0 || !strings.Contains(text, "# WARNING: "+want) || !strings.Contains(errs, want) {
		t.Fatalf("exit %d\n%s\n%s", code, text, errs)
	}
	text, errs, _ = runWeft(t, "predict", filepath.Join(out, "model.json"), writeTemp(t, "in.csv", "stretch_1,stretch_2\n1.05,1.02\n"))
	if strings.Contains(text, "WARNING") || strings.Contains(errs, "outside") {
		t.Errorf("a row inside the range marked:\n%s\n%s", text, errs)
	}
}

// The help of weft and of every command whose output holds a model's
// numbers carries the cautions in the outputs' words (README, "Cautions in
// detail"); before, check, evaluate, export and predict had none, and fit,
// cohort, report and plan a shorter paraphrase without the regulations.
func TestHelpCarriesTheCautions(t *testing.T) {
	for _, cmd := range [][]string{{"--help"}, {"fit", "--help"}, {"cohort", "--help"}, {"report", "--help"}, {"plan", "--help"},
		{"check", "--help"}, {"evaluate", "--help"}, {"export", "--help"}, {"predict", "--help"}} {
		out := strings.Join(strings.Fields(mustRun(t, cmd...)), " ")
		for _, c := range card.Cautions {
			if !strings.Contains(out, c) {
				t.Errorf("weft %s: caution %q missing", strings.Join(cmd, " "), c)
			}
		}
	}
}

// plan --write replaces the specimen's notes with its own, and a file
// whose notes were its only synthetic label (quickData's) lost it: the
// planned path of a synthetic fit now says so in its notes (README: example
// data are labelled synthetic); a measured fit's does not.
func TestPlannedPathKeepsTheSyntheticLabel(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct {
		notes     string
		synthetic bool
	}{{"synthetic", true}, {"bench test 4", false}} {
		p := quickData(t, dir, "p.csv")
		b, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		data := writeTemp(t, "d.csv", strings.Replace(string(b), "# notes = synthetic\n", "# notes = "+c.notes+"\n", 1))
		out := filepath.Join(dir, "fit-"+strings.Fields(c.notes)[0])
		if _, errs, code := quickFit(t, data, out); code != 0 {
			t.Fatalf("fit: exit %d: %s", code, errs)
		}
		path := filepath.Join(dir, "next-"+strings.Fields(c.notes)[0]+".csv")
		mustRun(t, "plan", out, "--write", path)
		bs, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if got := strings.Contains(strings.ToUpper(string(bs)), "SYNTHETIC"); got != c.synthetic {
			t.Errorf("notes %q: planned path says synthetic %v, want %v:\n%s", c.notes, got, c.synthetic, bs)
		}
	}
}

// inspect's table says when a file says its data are synthetic, as the card
// and the report of a fit to it do (README: example data are labelled
// synthetic); before, only --json's metadata held the word.
func TestInspectLabelsSyntheticData(t *testing.T) {
	dir := t.TempDir()
	p := quickData(t, dir, "s.csv")
	if out := mustRun(t, "inspect", p); !strings.Contains(out, "label:      SYNTHETIC") {
		t.Errorf("synthetic file without the label:\n%s", out)
	}
	b, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	m := writeTemp(t, "m.csv", strings.Replace(string(b), "# notes = synthetic\n", "# notes = bench test 4\n", 1))
	if out := mustRun(t, "inspect", m); strings.Contains(out, "SYNTHETIC") {
		t.Errorf("measured file labelled synthetic:\n%s", out)
	}
}
