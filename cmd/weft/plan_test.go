package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/cmd/weft/internal/planning"
)

// planJSON runs weft plan --json on dir with extra arguments and decodes
// the plan.
func planJSON(t *testing.T, dir string, extra ...string) (planning.Report, string) {
	t.Helper()
	out, errOut, code := runWeft(t, append([]string{"plan", dir, "--json"}, extra...)...)
	if code != 0 {
		t.Fatalf("weft plan: exit %d: %s", code, errOut)
	}
	var pl planning.Report
	if err := json.Unmarshal([]byte(out), &pl); err != nil {
		t.Fatalf("plan JSON: %v\n%s", err, out)
	}
	return pl, out
}

// The demo membrane M1 (SYNTHETIC: one family at +30°, tested without
// shear information) leaves open whether it is one family at +30°, at −30°
// or a mirror pair. No stretch ratio in the current mounting can tell them
// apart (under a pure stretch ±α give the same normal stresses: package
// aniso documentation, Mirror symmetry), so the most
// discriminating test measures shear or turns the specimen, separating the
// layouts by at least five noise standard deviations; it comes first, and
// the files --write and --plot ask for hold its path and its plot.
func TestPlanDemoMembrane(t *testing.T) {
	t.Parallel()
	dir := demoFitCopy(t, "membrane-M1")
	tmp := t.TempDir()
	path, svg := filepath.Join(tmp, "next.csv"), filepath.Join(tmp, "next.svg")
	pl, raw := planJSON(t, dir, "--write", path, "--plot", svg)
	if pl.Format != planning.Format || len(pl.Questions) == 0 || pl.Questions[0].Topic != "fibre layout" || !pl.Questions[0].Verdict {
		t.Fatalf("questions %+v; want the fibre layout first", pl.Questions)
	}
	best := -1
	for i, c := range pl.Candidates {
		d := float64(c.Questions[0].Discrimination)
		if !c.Sutured && c.MountingDeg == 0 && d > 1e-9 {
			t.Errorf("%s: discrimination %g under a pure stretch", c.Test, d)
		}
		if best < 0 || d > float64(pl.Candidates[best].Questions[0].Discrimination) {
			best = i
		}
	}
	top := pl.Candidates[best]
	if !top.Sutured && top.MountingDeg == 0 {
		t.Errorf("the most discriminating test %q neither measures shear nor turns the specimen", top.Test)
	}
	if float64(top.Separation) < 5 {
		t.Errorf("it separates the layouts by %.3g noise standard deviations, want ≥ 5", float64(top.Separation))
	}
	first := pl.Candidates[0]
	if len(first.Decides) == 0 || !strings.HasPrefix(first.Decides[0], "fibre layout") {
		t.Errorf("the first-ranked test decides %q", first.Decides)
	}
	checkPlannedPath(t, path, first, pl.Points)
	// The fit does not know the sign of its angle: under −α the sheet
	// shears the other way (package aniso, Mirror symmetry), so the
	// operator's file must not present the sign of the shear as predicted.
	if b, _ := os.ReadFile(path); first.Sutured && !strings.Contains(string(b), "the sign of this shear is not known") {
		t.Errorf("the path on sutures of a fit that does not know its angle's sign presents the shear's sign as predicted:\n%s", b[:min(len(b), 400)])
	}
	// Every candidate writes outside[], empty as [] when the test stays
	// inside the fitted range.
	var keys struct {
		Candidates []map[string]json.RawMessage `json:"candidates"`
	}
	if err := json.Unmarshal([]byte(raw), &keys); err != nil {
		t.Fatal(err)
	}
	inside := 0
	for _, c := range keys.Candidates {
		o, ok := c["outside"]
		switch {
		case !ok || string(o) == "null":
			t.Fatalf("a candidate without outside[]: %s", o)
		case string(o) == "[]":
			inside++
		}
	}
	if inside == 0 {
		t.Error("no candidate stays inside the fitted range; outside[] written as [] is not exercised")
	}
	if b, err := os.ReadFile(svg); err != nil || !bytes.Contains(b, []byte("<svg")) {
		t.Errorf("the plot is not an SVG file (%v)", err)
	}
	// The same folder gives the same plan, byte for byte.
	if _, again := planJSON(t, dir); again != strings.Replace(raw, `,
  "wrote": [
    "`+path+`",
    "`+svg+`"
  ]`, "", 1) {
		t.Error("a second plan of the same folder differs")
	}
	text, _, code := runWeft(t, "plan", dir, "--top", "3")
	for _, want := range []string{"[A] fibre layout", "settles", "holds if the model's family", "Not for clinical decisions"} {
		if code != 0 || !strings.Contains(text, want) {
			t.Errorf("the table lacks %q (exit %d)", want, code)
		}
	}
}

// checkPlannedPath reads the --write file: weft's input layout without
// stress columns, one row per planned point, ending at the test's peak.
func checkPlannedPath(t *testing.T, path string, c planning.Candidate, points int) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var body []string
	for _, l := range strings.Split(strings.TrimSpace(string(b)), "\n") {
		if !strings.HasPrefix(l, "#") {
			body = append(body, l)
		}
	}
	rows, err := csv.NewReader(strings.NewReader(strings.Join(body, "\n"))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	h := strings.Join(rows[0], ",")
	if strings.Contains(h, "nominal") || strings.Contains(h, "cauchy") || strings.Contains(h, "load") {
		t.Errorf("the path has stress columns: %s", h)
	}
	if len(rows)-1 != points {
		t.Errorf("%d rows, want %d", len(rows)-1, points)
	}
	last := rows[len(rows)-1]
	col := func(name string) float64 {
		for j, n := range rows[0] {
			if n == name {
				v, err := strconv.ParseFloat(last[j], 64)
				if err != nil {
					t.Fatal(err)
				}
				return v
			}
		}
		t.Fatalf("no column %s in %s", name, h)
		return 0
	}
	l1, l2 := "stretch_1", "stretch_2"
	if c.Sutured {
		l1, l2 = "F11", "F22"
	}
	if math.Abs(col(l1)-float64(c.PeakStretch1)) > 1e-6 || math.Abs(col(l2)-float64(c.PeakStretch2)) > 1e-6 {
		t.Errorf("the path ends at %g, %g; the test peaks at %g, %g", col(l1), col(l2), float64(c.PeakStretch1), float64(c.PeakStretch2))
	}
}

// An undecided verdict is a question too: a copy of the membrane's card
// whose verdict points, without settling it, towards a mirror pair gets
// the chosen model and the mirror pair's best fit as its explanations.
func TestPlanUndecidedVerdict(t *testing.T) {
	t.Parallel()
	dir := demoFitCopy(t, "membrane-M1")
	editCard(t, dir, func(raw map[string]any) {
		v := raw["verdict"].(map[string]any)
		v["families"] = "undecided"
		for _, c := range v["comparisons"].([]any) {
			if c := c.(map[string]any); c["richer"] == "2-mirror" {
				c["suggestive"] = true
			}
		}
	})
	pl, _ := planJSON(t, dir)
	found := false
	for _, q := range pl.Questions {
		if q.Topic == "fibre families (undecided verdict)" {
			found = true
			if !q.Verdict || len(q.Explanations) != 2 || !strings.Contains(q.Explanations[1], "2-mirror") {
				t.Errorf("undecided question %+v", q)
			}
		}
	}
	if !found {
		t.Errorf("no question for the undecided verdict: %+v", pl.Questions)
	}
}

// The demo patch P2's angle sits on the symmetry line at 0° without shear
// information: its profile bounds it, but the stresses have no slope in
// it there, so the plan leaves it out of the information count and says
// so (it was left out silently).
func TestPlanSaysWhyALineAngleIsLeftOut(t *testing.T) {
	t.Parallel()
	pl, _ := planJSON(t, demoFitCopy(t, "patch-P2"))
	if slices.Contains(pl.Parameters, "angle") {
		t.Errorf("parameters %q include the angle on the line", pl.Parameters)
	}
	if !strings.Contains(strings.Join(pl.Notes, " "), "angle lies on a symmetry line") {
		t.Errorf("no note on the angle on the line: %q", pl.Notes)
	}
}

// An isotropic fit (the neo-Hookean preset on the quick synthetic
// membrane) plans stretch ratios only and claims no fibre question.
func TestPlanIsotropic(t *testing.T) {
	tmp := t.TempDir()
	out := filepath.Join(tmp, "nh.weft")
	if _, e, code := quickFit(t, quickData(t, tmp, "nh.csv"), out); code != 0 {
		t.Fatalf("fit: %s", e)
	}
	pl, _ := planJSON(t, out)
	if len(pl.Questions) != 0 {
		t.Errorf("questions for an isotropic fit: %+v", pl.Questions)
	}
	for _, c := range pl.Candidates {
		if c.Sutured || c.MountingDeg != 0 || len(c.Decides) > 0 {
			t.Errorf("%s planned for an isotropic model", c.Test)
		}
	}
	if len(pl.Notes) == 0 || !strings.Contains(strings.Join(pl.Notes, " "), "isotropic") {
		t.Errorf("notes %q", pl.Notes)
	}
}

// A fit of the Fung-type preset (Tong & Fung 1976) has no fibre family
// but is not isotropic: the note says its term is orthotropic about the
// tester's axes (it was once called isotropic), and only stretch ratios
// are planned (demo membrane M1, synthetic).
func TestPlanFungIsNotCalledIsotropic(t *testing.T) {
	t.Parallel()
	pl, _ := planJSON(t, presetFit(t, "fung"))
	notes := strings.Join(pl.Notes, " ")
	if !strings.Contains(notes, "orthotropic about the tester's axes") || strings.Contains(notes, "the model is isotropic") {
		t.Errorf("notes %q", pl.Notes)
	}
	for _, c := range pl.Candidates {
		if c.Sutured || c.MountingDeg != 0 {
			t.Errorf("%s planned for a Fung-type model", c.Test)
		}
	}
}

// A card whose own model (terms, families) was edited after the fit is
// refused (exit 1): the plan rebuilds the fit from the card's fit section
// and would plan for a model the card no longer holds (an edited family
// angle and weight once gave the unedited plan, exit 0).
func TestPlanRefusesAnEditedModel(t *testing.T) {
	t.Parallel()
	for name, edit := range map[string]func(raw map[string]any){
		"weight": func(raw map[string]any) {
			tm := raw["terms"].([]any)[0].(map[string]any)
			tm["weight"] = tm["weight"].(float64) * 10
		},
		"angle": func(raw map[string]any) {
			raw["families"].([]any)[0].(map[string]any)["angle_deg"] = 60.0
		},
	} {
		dir := demoFitCopy(t, "membrane-M1")
		editCard(t, dir, edit)
		if _, e, code := runWeft(t, "plan", dir); code != 1 || !strings.Contains(e, "edited after the fit") {
			t.Errorf("edited %s: exit %d, %s", name, code, e)
		}
	}
}

// A fit of a chosen form has no verdict: its fibre-layout question (the
// hgo preset's pair or one family, no shear information, demo membrane
// M1) is the data's, not one "left open by the verdict" as it was once
// labelled.
func TestPlanLayoutQuestionWithoutVerdict(t *testing.T) {
	t.Parallel()
	out := presetFit(t, "hgo")
	pl, _ := planJSON(t, out)
	if len(pl.Questions) == 0 || pl.Questions[0].Verdict || !pl.Questions[0].Layout {
		t.Fatalf("questions %+v, want the layout question, not a verdict's", pl.Questions)
	}
	stdout, _, code := runWeft(t, "plan", out)
	if code != 0 || !strings.Contains(stdout, "(left open by the data)") || strings.Contains(stdout, "left open by the verdict") {
		t.Errorf("exit %d; the plan's question is not labelled as the data's:\n%s", code, stdout)
	}
}

// A plan needs the fit the folder holds: a missing table or folder is bad
// input (exit 2), a table edited after the fit fails to reproduce the
// card's loss (exit 1), and an existing --write file is kept without
// --force before any work is done.
func TestPlanRefusesWhatItCannotUse(t *testing.T) {
	tmp := t.TempDir()
	out := filepath.Join(tmp, "nh.weft")
	if _, e, code := quickFit(t, quickData(t, tmp, "nh.csv"), out); code != 0 {
		t.Fatalf("fit: %s", e)
	}
	if _, e, code := runWeft(t, "plan", filepath.Join(tmp, "none")); code != 2 || !strings.Contains(e, "does not exist") {
		t.Errorf("missing folder: exit %d, %s", code, e)
	}
	existing := filepath.Join(tmp, "keep.csv")
	os.WriteFile(existing, []byte("mine"), 0o644)
	if _, e, code := runWeft(t, "plan", out, "--write", existing); code != 2 || !strings.Contains(e, "--force") {
		t.Errorf("existing --write file: exit %d, %s", code, e)
	}
	if b, _ := os.ReadFile(existing); string(b) != "mine" {
		t.Error("the existing file was changed")
	}
	// The fit's own files are the plan's inputs: even with --force no plan
	// file is written into its folder (fit.csv was once replaced).
	card0, _ := os.ReadFile(filepath.Join(out, "model.json"))
	for _, args := range [][]string{{"--write", filepath.Join(out, "fit.csv")}, {"--plot", filepath.Join(out, "model.json")}, {"--plot", filepath.Join(out, "plan.svg")}} {
		if _, e, code := runWeft(t, append([]string{"plan", out, "--force"}, args...)...); code != 2 || !strings.Contains(e, "inside the fit's folder") {
			t.Errorf("%v into the fit's folder: exit %d, %s", args, code, e)
		}
	}
	if b, _ := os.ReadFile(filepath.Join(out, "model.json")); string(b) != string(card0) {
		t.Error("the fit's model.json was changed")
	}
	// However the folder is spelled: through a symbolic link to it, as DIR
	// or in the output path, --force replaced the fit's fit.csv with the
	// planned path (README, Outputs: an output is never an input of the
	// same run, however the path is spelled).
	fit0, _ := os.ReadFile(filepath.Join(out, "fit.csv"))
	link := filepath.Join(tmp, "link.weft")
	if err := os.Symlink(out, link); err == nil {
		for _, args := range [][]string{{link, "--write", filepath.Join(out, "fit.csv")}, {out, "--write", filepath.Join(link, "fit.csv")},
			{out, "--plot", filepath.Join(link, "plan.svg")}, {link, "--write", filepath.Join(out, "next.csv")}} {
			if _, e, code := runWeft(t, append([]string{"plan", "--force"}, args...)...); code != 2 || !strings.Contains(e, "inside the fit's folder") {
				t.Errorf("plan %v: exit %d, %s", args, code, e)
			}
		}
		if b, _ := os.ReadFile(filepath.Join(out, "fit.csv")); string(b) != string(fit0) {
			t.Fatal("the fit's fit.csv was replaced through a symbolic link to its folder")
		}
		if _, err := os.Stat(filepath.Join(out, "plan.svg")); err == nil {
			t.Error("a plot was written into the fit's folder through a symbolic link to it")
		}
	}
	// --write and --plot naming one file through a link to its folder
	// were told apart by name only, and the run stopped claiming another
	// weft run was writing the file.
	if err := os.Symlink(tmp, filepath.Join(tmp, "here")); err == nil {
		if _, e, code := runWeft(t, "plan", out, "--write", filepath.Join(tmp, "p.svg"), "--plot", filepath.Join(tmp, "here", "p.svg")); code != 2 || !strings.Contains(e, "name the same file") {
			t.Errorf("--write and --plot one file by two names: exit %d, %s", code, e)
		}
	}
	// --plot draws SVG or PNG only: another name (a .pdf, a .jpg) got SVG
	// under a name that promises another format.
	for _, name := range []string{"plan.pdf", "plan.jpg", "plan"} {
		if _, e, code := runWeft(t, "plan", out, "--plot", filepath.Join(tmp, name)); code != 2 || !strings.Contains(e, ".svg") {
			t.Errorf("--plot %s: exit %d, %s", name, code, e)
		}
		if _, err := os.Stat(filepath.Join(tmp, name)); err == nil {
			t.Errorf("--plot %s was written", name)
		}
	}
	fc := filepath.Join(out, "fit.csv")
	b, err := os.ReadFile(fc)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(b), "\n")
	f := strings.Split(lines[3], ",")
	v, _ := strconv.ParseFloat(f[7], 64)
	f[7] = strconv.FormatFloat(v*1.5, 'g', -1, 64)
	lines[3] = strings.Join(f, ",")
	os.WriteFile(fc, []byte(strings.Join(lines, "\n")), 0o644)
	if _, e, code := runWeft(t, "plan", out); code != 1 || !strings.Contains(e, "not from the same fit") {
		t.Errorf("edited fit.csv: exit %d, %s", code, e)
	}
	os.Remove(fc)
	if _, e, code := runWeft(t, "plan", out); code != 2 || !strings.Contains(e, "fit.csv is missing") {
		t.Errorf("missing fit.csv: exit %d, %s", code, e)
	}
}

// runPlan prints what 'weft plan' prints.
func TestPlanRunsWithoutCobra(t *testing.T) {
	tmp := t.TempDir()
	out := filepath.Join(tmp, "nh.weft")
	if _, e, code := quickFit(t, quickData(t, tmp, "nh.csv"), out); code != 0 {
		t.Fatalf("fit: %s", e)
	}
	var buf bytes.Buffer
	if err := runPlan(&planOptions{streams: streams{Out: &buf}, dir: out, top: 15}); err != nil {
		t.Fatal(err)
	}
	cli, _, code := runWeft(t, "plan", out)
	if code != 0 || buf.String() != cli {
		t.Errorf("runPlan printed what 'weft plan' does not (exit %d)", code)
	}
}

// BenchmarkPlan is 'weft plan' (in process) of the demo membrane M1's fit:
// five protocols × 40 points, the default candidate set, one family
// without shear information and a form band. Target: ≤ 1 s.
func BenchmarkPlan(b *testing.B) {
	dir := filepath.Join(b.TempDir(), "m1.weft")
	var o, e strings.Builder
	if code := run([]string{"fit", demoFile("membrane-M1.csv"), "-o", dir, "--quiet"}, &o, &e); code != 0 {
		b.Fatalf("fit: %s", e.String())
	}
	for b.Loop() {
		var out bytes.Buffer
		if err := runPlan(&planOptions{streams: streams{Out: &out}, dir: dir, top: 15}); err != nil {
			b.Fatal(err)
		}
	}
}

// A verdict left undecided because a two-direction model fits better in
// sample than every one-direction model (in_sample_best; no suggestive
// step in the walk) is scored too: the plan pits the chosen model against
// that candidate.
func TestPlanInSampleUndecidedVerdict(t *testing.T) {
	t.Parallel()
	dir := demoFitCopy(t, "membrane-M1")
	free := ""
	editCard(t, dir, func(raw map[string]any) {
		// The first two-free-family candidate with its model: in the demo
		// a later one of the same form has a lower held-out error, and the
		// plan must still take the candidate the verdict names.
		for _, c := range raw["selection"].(map[string]any)["pareto"].([]any) {
			c := c.(map[string]any)
			if name := c["name"].(string); free == "" && strings.HasPrefix(name, "free-") && c["model"] != nil {
				free = name
			}
		}
		if free == "" {
			t.Fatal("the demo's selection has no two-free-family candidate with its model")
		}
		v := raw["verdict"].(map[string]any)
		v["families"] = "undecided"
		v["in_sample_best"] = free
		for _, c := range v["comparisons"].([]any) {
			if c.(map[string]any)["suggestive"] == true {
				t.Fatal("the demo's walk already has a suggestive step; the test needs none")
			}
		}
	})
	pl, _ := planJSON(t, dir)
	found := false
	for _, q := range pl.Questions {
		if q.Topic == "fibre families (undecided verdict)" {
			found = true
			if !q.Verdict || len(q.Explanations) != 2 || !strings.Contains(q.Explanations[1], "form 2-free ("+free+":") {
				t.Errorf("undecided question %+v, want %s against the chosen model", q, free)
			}
		}
	}
	if !found {
		t.Errorf("no question for the undecided verdict: %+v", pl.Questions)
	}
}

// editCard applies edit to the model.json of the output folder dir, read
// as generic JSON, and writes it back.
func editCard(t *testing.T, dir string, edit func(raw map[string]any)) {
	t.Helper()
	p := filepath.Join(dir, "model.json")
	b, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	var raw map[string]any
	if err := json.Unmarshal(b, &raw); err != nil {
		t.Fatal(err)
	}
	edit(raw)
	b, _ = json.MarshalIndent(raw, "", "  ")
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Fatal(err)
	}
}

// A verdict left undecided between the isotropic model it picked and a
// model with fibres that fits better in sample (testdata/orthogonal-
// fibres-load-controlled.csv, SYNTHETIC: equal families at 0° and 90°
// tested under load control, made by aniso's independent generator) is a
// question the plan weighs, although the chosen model has no fibres: the
// explanations are the isotropic pick and the model with fibres, tests on
// sutures and off-axis mountings are among the candidates, and the first
// ranked test settles it.
func TestPlanIsotropicPickAgainstFibres(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	_, pl := fitAndPlan(t, "orthogonal-fibres-load-controlled.csv")
	q := questionOn(t, pl, "fibre families (undecided verdict)")
	if !q.Verdict || len(q.Explanations) != 2 || !strings.Contains(q.Explanations[0], "form 0 as chosen") || !strings.Contains(q.Explanations[1], "@") {
		t.Errorf("undecided question %+v, want the isotropic pick against a model with fibres", *q)
	}
	turned := false
	for _, c := range pl.Candidates {
		turned = turned || c.Sutured || c.MountingDeg != 0
	}
	if !turned {
		t.Error("no test on sutures or in another mounting among the candidates, though one explanation has fibres")
	}
	if len(pl.Candidates) == 0 || len(pl.Candidates[0].Decides) == 0 {
		t.Errorf("the first ranked test settles nothing: %+v", pl.Candidates[:min(1, len(pl.Candidates))])
	}
	// A ratio not run, peaking at the tested stretch, starts at the
	// reference state like every test: its first points, below the first
	// kept point of the data (principal stretch 1.019 here), are not an
	// extrapolation (they once flagged 40 of 46 tests).
	for _, c := range pl.Candidates {
		if c.MountingDeg == 0 && !c.Sutured && c.Extrapolates {
			t.Errorf("%s flagged as extrapolating: %q", c.Test, c.Outside)
		}
	}
}

// An undecided verdict from an architecture tie (one family at 0° against
// a spread pair at ±40°, which fit and predict the sutured protocols
// alike; aniso.TestArchitectureTieIsUndecided, on the same independently
// generated specimen) becomes a question, and an off-axis protocol on
// sutures settles it: turned 45°, the pair and the single family load the
// tester's axes differently.
func TestPlanArchitectureTie(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	c, pl := fitAndPlan(t, "spread-pair-40-sutured.csv")
	if c.Verdict.Families != "undecided" || c.Verdict.TiesWith == "" {
		t.Fatalf("verdict %s, ties_with %q: want undecided by an architecture tie", c.Verdict.Families, c.Verdict.TiesWith)
	}
	q := questionOn(t, pl, "fibre families (undecided verdict)")
	if len(q.Explanations) != 2 || !strings.Contains(q.Explanations[0], "form 1 as chosen") || !strings.Contains(q.Explanations[1], c.Verdict.TiesWith) {
		t.Errorf("undecided question %+v, want the one-family pick against %s", *q, c.Verdict.TiesWith)
	}
	if len(pl.Candidates) == 0 || pl.Candidates[0].MountingDeg == 0 || !pl.Candidates[0].Sutured || len(pl.Candidates[0].Decides) == 0 {
		t.Errorf("the first ranked test is not an off-axis test on sutures that settles the question: %+v", pl.Candidates[:min(1, len(pl.Candidates))])
	}
}

// An isotropic verdict that cannot rule out fibres placed symmetrically
// about the axes and the 45° line (equal families at ±45° on sutures, the
// specimen of aniso.TestFortyFiveDegreePairOnSutures) names their model
// (verdict.look_alike) and the classical preset that fits better in
// sample than the pick, and the plan weighs the pick against it: the
// first ranked test settles it, and a test in a turned mounting on
// sutures is among the candidates (an isotropic material responds alike
// in every mounting, the pair does not).
func TestPlanLookAlikeOfIsotropicVerdict(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	c, pl := fitAndPlan(t, "pair-45-sutured.csv")
	if c.Verdict.Families != "0" || c.Verdict.LookAlike == "" {
		t.Fatalf("verdict %s, look_alike %q: want 0 with the look-alike named", c.Verdict.Families, c.Verdict.LookAlike)
	}
	// The hgo preset, a pair near ±45°, fits better in sample than the
	// isotropic pick (ΔBIC 11.3 on 2026-12-04); the verdict says so.
	if !strings.Contains(c.Verdict.Reason, "the classical preset hgo (") {
		t.Errorf("the verdict does not name the preset that fits better than the pick: %s", c.Verdict.Reason)
	}
	q := questionOn(t, pl, "fibres symmetric about the 45° line (look-alike of the isotropic verdict)")
	if len(q.Explanations) != 2 || !strings.Contains(q.Explanations[0], "form 0 as chosen") || !strings.Contains(q.Explanations[1], c.Verdict.LookAlike) {
		t.Errorf("look-alike question %+v, want the isotropic pick against %s", *q, c.Verdict.LookAlike)
	}
	if len(pl.Candidates) == 0 || len(pl.Candidates[0].Decides) == 0 {
		t.Errorf("the first ranked test settles nothing: %+v", pl.Candidates[:min(1, len(pl.Candidates))])
	}
	turned := false
	for _, cd := range pl.Candidates {
		turned = turned || (cd.Sutured && cd.MountingDeg != 0 && len(cd.Decides) > 0)
	}
	if !turned {
		t.Error("no test in a turned mounting on sutures settles the look-alike")
	}
}

// presetFit fits the synthetic demo membrane M1 with a preset ('weft fit
// M1 --preset PRESET -o PRESET.weft --quiet') and returns a copy of the
// output folder that the test may change. The fit is made once per preset
// and shared (sharedFitCopyAs): TestReportTitleWithoutFibres and
// TestPlanFungIsNotCalledIsotropic both read the fung preset's.
func presetFit(t *testing.T, preset string) string {
	t.Helper()
	return sharedFitCopyAs(t, preset+".weft", demoFile("membrane-M1.csv"), "--preset", preset)
}

// fitAndPlan fits the test file name (in testdata) with weft fit and
// plans its next test with weft plan, returning the card and the plan.
// The fit is shared with the other tests that fit the same file
// (sharedFitCopy: TestReportLayoutAnglesWithoutShear fits the one of
// TestPlanIsotropicPickAgainstFibres).
func fitAndPlan(t *testing.T, name string) (*card.Card, planning.Report) {
	t.Helper()
	dir := sharedFitCopy(t, filepath.Join("testdata", name))
	c, _ := readCardFile(t, filepath.Join(dir, "model.json"))
	pl, _ := planJSON(t, dir)
	return c, pl
}

// questionOn returns the plan's question on topic, failing the test when
// there is none.
func questionOn(t *testing.T, pl planning.Report, topic string) *planning.Question {
	t.Helper()
	for i := range pl.Questions {
		if pl.Questions[i].Topic == topic {
			return &pl.Questions[i]
		}
	}
	t.Fatalf("no question on %q: %+v (notes %q)", topic, pl.Questions, pl.Notes)
	return nil
}

// A file whose F12 and F21 are only tracking noise (a scatter of 0.004 in
// every entry of F, no shear stress) carries no shear information: the
// fit takes the shear as zero and its card says so
// (shear_within_scatter), and the plan rebuilds that fit (it refused the
// folder: "disagree on whether the data carry shear information"). The
// stresses are an incompressible neo-Hookean membrane in plane stress,
// σ = 2 c10 (B − λ3² I) (Rivlin 1948, as in Holzapfel 2000, Nonlinear
// Solid Mechanics, §6.5), with c10 = 10 kPa; the plan's fibre question
// is the data's (+α, −α or a pair), not one the noise settled.
func TestPlanRebuildsShearWithinScatter(t *testing.T) {
	t.Parallel()
	data := filepath.Join(t.TempDir(), "tracked.csv")
	if err := os.WriteFile(data, []byte(trackedNeoHookeanCSV()), 0o644); err != nil {
		t.Fatal(err)
	}
	out := fitPath(t, data, "--preset", "hgo")
	c, _ := readCardFile(t, filepath.Join(out, "model.json"))
	if c.Data.HasShear || !c.Data.ShearWithinScatter {
		t.Fatalf("card: has_shear %v, shear_within_scatter %v; want false, true", c.Data.HasShear, c.Data.ShearWithinScatter)
	}
	// The card, its fit notes and the export say what the data are: F12
	// and F21 within their scatter, not "a pure biaxial stretch" (until
	// 2026-12-05 the alternatives' reason and the first note said so).
	if c.Alternatives == nil || c.Alternatives.Reason != card.AlternativesReasonScatter {
		t.Errorf("alternatives reason %v, want the within-scatter one", c.Alternatives)
	}
	for _, n := range c.Fit.Notes {
		if strings.Contains(n, "pure biaxial stretch") {
			t.Errorf("fit note calls noisy F12, F21 a pure biaxial stretch: %q", n)
		}
	}
	if ex, _, _ := runWeft(t, "export", filepath.Join(out, "model.json"), "--format", "table"); strings.Contains(ex, "pure biaxial stretch") || !strings.Contains(ex, "F12 and F21 stay within their point-to-point scatter of zero") {
		t.Errorf("export does not say F12 and F21 were within their scatter")
	}
	pl, _ := planJSON(t, out)
	if len(pl.Questions) == 0 || !pl.Questions[0].Layout {
		t.Errorf("questions %+v, want the fibre-layout question the data leave open", pl.Questions)
	}
}

// A Fung-type orthotropic solid without fibres (testdata/fung-orthotropic.csv,
// SYNTHETIC, made by independent code) is undecided because the fung preset
// explains it better (in_sample_best), and the plan asks that question: the
// chosen fibre model against the preset, which the plan once left out (the
// preset is no selection candidate), leaving only the angles' signs.
func TestPlanAsksFibresAgainstTheFungPreset(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	out := fitPath(t, filepath.Join("..", "..", "testdata", "fung-orthotropic.csv"))
	c, _ := readCardFile(t, filepath.Join(out, "model.json"))
	if c.Verdict.Families != "undecided" || c.Verdict.InSampleBest != "preset:fung" {
		t.Fatalf("verdict %s, in_sample_best %q; want undecided by the fung preset", c.Verdict.Families, c.Verdict.InSampleBest)
	}
	pl, _ := planJSON(t, out)
	q := questionOn(t, pl, "fibre families (undecided verdict)")
	if len(q.Explanations) != 2 || !strings.Contains(q.Explanations[1], "the classical preset fung") || !strings.Contains(q.Explanations[1], "no fibre family") {
		t.Errorf("undecided question %+v, want the chosen model against the fung preset", *q)
	}
}

// A plan scores tests on sutures as if their shear were tracked without
// scatter. When the fitted points' own shear scatters more than
// biaxial.ShearScatterLimit, the plan says so: a sutured test tracked as
// noisily compares each model's shear stress with zero shear tractions at
// noisy shear, which moved the verdict of a SYNTHETIC mirror pair at
// ±35° (audit data made by independent code) onto one family at 0.3°
// where the plan had promised a separation of 178 noise standard
// deviations. Until 2026-12-05 nothing in the plan said so. The check: the
// scatter the note quotes is the standard deviation of the independent
// Gaussian noise added to F12 and F21 (its definition; the estimator is
// normal-consistent), within 25 %, and a file tracked 20 times more
// steadily gets no note.
func TestPlanWarnsThatSuturedTestsAssumeSteadyTracking(t *testing.T) {
	t.Parallel()
	fitNoisy := func(s float64, seed uint64) planning.Report {
		rng := rand.New(rand.NewPCG(seed, 11))
		var b strings.Builder
		b.WriteString("# specimen = SYN-noisy-markers (synthetic)\nprotocol,F11,F12,F21,F22,cauchy_11 [kPa],cauchy_22 [kPa]\n")
		for _, r := range [][2]float64{{1, 1}, {1, 0.5}, {0.5, 1}} {
			for i := 1; i <= 40; i++ {
				e := 0.15 * float64(i) / 40
				l1, l2 := 1+r[0]*e, 1+r[1]*e
				s3 := 1 / (l1 * l1 * l2 * l2)
				n := func() float64 { return s * rng.NormFloat64() }
				fmt.Fprintf(&b, "%g:%g,%.6f,%.6f,%.6f,%.6f,%.6g,%.6g\n", r[0], r[1], l1+n(), n(), n(), l2+n(), 20*(l1*l1-s3), 20*(l2*l2-s3))
			}
		}
		data := filepath.Join(t.TempDir(), "tracked.csv")
		if err := os.WriteFile(data, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		pl, _ := planJSON(t, fitPath(t, data, "--preset", "hgo"))
		return pl
	}
	note := func(pl planning.Report) string {
		for _, n := range pl.Notes {
			if strings.Contains(n, "tests on sutures are scored as if their shear were tracked without scatter") {
				return n
			}
		}
		return ""
	}
	pl := fitNoisy(0.004, 5)
	sutured := false
	for _, c := range pl.Candidates {
		sutured = sutured || c.Sutured
	}
	if !sutured {
		t.Fatal("no test on sutures was planned; the case does not exercise the note")
	}
	n := note(pl)
	if n == "" {
		t.Fatalf("no note on the tracking noise of F12 and F21 (0.004); notes %q", pl.Notes)
	}
	var s12, s21 float64
	if _, err := fmt.Sscanf(n[strings.Index(n, "by about "):], "by about %g in F12 and %g in F21", &s12, &s21); err != nil {
		t.Fatalf("note %q: %v", n, err)
	}
	for _, v := range []float64{s12, s21} {
		if math.Abs(v/0.004-1) > 0.25 {
			t.Errorf("note quotes a scatter of %g; the noise added has a standard deviation of 0.004: %q", v, n)
		}
	}
	if n := note(fitNoisy(0.0002, 5)); n != "" {
		t.Errorf("a scatter of 0.0002, below 0.0005, is noted: %q", n)
	}
}
