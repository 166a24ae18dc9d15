package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/cmd/weft/internal/fe"
)

// fibreOnlyCard has no matrix term: its only term switches off wherever
// its family is not stretched.
const fibreOnlyCard = `{"format": "weft.model/1", "stress_unit": "kPa",
 "families": [{"name": "f1", "angle_deg": 30}],
 "terms": [{"id": "fib-expsq", "weight": 10, "params": {"stiffening": 2}, "family": "f1"}]}`

// A card without stiffness fails check (exit 1) with the likely cause
// named, in text and in JSON (which stays valid JSON: no value is
// infinite), and export, evaluate and fit warn. A membrane of fibres alone
// has a zero tangent wherever its family is slack (F = I included): the
// fibre terms switch off for I4 ≤ 1 (Holzapfel, Gasser & Ogden 2000).
func TestNoStiffnessIsAFailure(t *testing.T) {
	path := writeTemp(t, "fibres.json", fibreOnlyCard)
	const cause = "no matrix term with a positive weight"
	out, errs, code := runWeft(t, "check", path)
	if code != 1 || !strings.Contains(out+errs, cause) || !strings.Contains(out, "WITHOUT STIFFNESS") {
		t.Fatalf("check: exit %d\n%s\n%s", code, out, errs)
	}
	out, errs, code = runWeft(t, "check", path, "--json")
	var rep map[string]any
	if code != 1 || json.Unmarshal([]byte(out), &rep) != nil || rep["passed"] != false {
		t.Fatalf("check --json: exit %d, %s\n%.400s", code, errs, out)
	}
	if fs, _ := rep["failures"].([]any); len(fs) == 0 || !strings.Contains(fs[0].(string), cause) {
		t.Errorf("check --json failures: %v", rep["failures"])
	}
	if w, _ := rep["matrix_weight"].(float64); w != 0 {
		t.Errorf("matrix_weight %v", rep["matrix_weight"])
	}
	for _, args := range [][]string{{"export", path}, {"export", path, "--format", "csv"}, {"evaluate", path, "--stretch", "1.1,1"}} {
		out, errs, code := runWeft(t, args...)
		if code != 0 || !strings.Contains(out+errs, "no matrix term") {
			t.Errorf("%v: exit %d, no warning\n%s%s", args, code, out, errs)
		}
	}
	out, errs, code = runWeft(t, "fit", "-o", t.TempDir()+"/out", "--quiet", "--terms", "fib-expsq", "--families", "1", demoFile("patch-P2.csv"))
	if code != 0 || !strings.Contains(errs, "zero matrix weight") || !strings.Contains(out, "warning:  the fitted model has zero matrix weight") {
		t.Errorf("fit of fibres alone: exit %d, no warning\n%s\n%s", code, out, errs)
	}
}

// undeterminedCard is a family whose angle sign the data did not fix.
const undeterminedCard = `{"format": "weft.model/1", "stress_unit": "kPa",
 "families": [{"name": "f1", "angle_deg": 28, "angle_sign_known": false}],
 "terms": [{"id": "i1-lin", "weight": 3}, {"id": "fib-expsq", "weight": 20, "params": {"stiffening": 4}, "family": "f1"}]}`

// An undetermined layout is explicit: export writes the verification rows
// of each alternative (or of the one --alternative names), evaluate and
// check warn naming them. The physics the alternatives rest on (mirror
// symmetry, common practice): every alternative gives the same stress
// under a pure stretch along the tester's axes, and the family at −α is
// the mirror image of the one at +α, so under simple shear along axis 1
// (F12 = γ) its nominal P12 at −γ is minus that of +α at +γ — while the
// alternatives differ at the sheared rows, which is why the choice matters.
func TestUndeterminedLayoutAlternatives(t *testing.T) {
	path := writeTemp(t, "undetermined.json", undeterminedCard)
	names := []string{"single-plus", "single-minus", "mirror-pair"}
	doc := exportJSON(t, path)
	rows := map[string]map[string]fe.ExportPoint{}
	for _, p := range doc.Verification {
		if rows[p.Alternative] == nil {
			rows[p.Alternative] = map[string]fe.ExportPoint{}
		}
		rows[p.Alternative][p.Case+" "+fmtG(p.DirectionDeg)+" "+fmtG(p.StretchOrShear)] = p
	}
	if len(rows) != 3 || doc.Alternatives == nil || len(doc.Warnings) == 0 {
		t.Fatalf("export: %d alternatives in the rows, section %v, warnings %v", len(rows), doc.Alternatives, doc.Warnings)
	}
	for _, n := range names {
		if len(rows[n]) == 0 || !strings.Contains(strings.Join(doc.Warnings, " "), n) {
			t.Errorf("alternative %s: %d rows, warnings %v", n, len(rows[n]), doc.Warnings)
		}
	}
	plus, minus, pair := rows["single-plus"], rows["single-minus"], rows["mirror-pair"]
	for _, key := range []string{"equibiaxial 0 1.2", "strip-biaxial 0 1.3", "strip-biaxial 90 0.9"} {
		a, b, c := plus[key], minus[key], pair[key]
		for _, v := range [][2]float64{{a.Nominal11, b.Nominal11}, {a.Nominal11, c.Nominal11}, {a.Nominal22, b.Nominal22}, {a.Nominal22, c.Nominal22}} {
			if math.Abs(v[0]-v[1]) > 1e-12*math.Max(1, math.Abs(v[0])) {
				t.Errorf("%s: the alternatives differ under a pure stretch: %+v, %+v, %+v", key, a, b, c)
			}
		}
	}
	for _, g := range []float64{0.1, 0.2, 0.3} {
		fp := [4]float64{1, g, 0, 1}
		fm := [4]float64{1, -g, 0, 1}
		ep, _, _ := runWeft(t, "evaluate", path, "--deformation", fmtF4(fp), "--json")
		em, _, _ := runWeft(t, "evaluate", path, "--deformation", fmtF4(fm), "--json")
		var rp, rm fe.Evaluation
		if json.Unmarshal([]byte(ep), &rp) != nil || json.Unmarshal([]byte(em), &rm) != nil || len(rp.Alternatives) != 3 || len(rm.Alternatives) != 3 {
			t.Fatalf("evaluate --json: %.300s", ep)
		}
		var p12 = map[string][2]float64{}
		for i, a := range rp.Alternatives {
			p12[a.Name] = [2]float64{a.Nominal["12"], rm.Alternatives[i].Nominal["12"]}
		}
		if s := p12["single-plus"][0] + p12["single-minus"][1]; math.Abs(s) > 1e-12*math.Abs(p12["single-plus"][0]) {
			t.Errorf("γ = %g: P12 of +α at +γ %g, of −α at −γ %g: not mirror images", g, p12["single-plus"][0], p12["single-minus"][1])
		}
		if d := math.Abs(p12["single-plus"][0] - p12["single-minus"][0]); !(d > 1e-3*math.Abs(p12["single-plus"][0])) {
			t.Errorf("γ = %g: +α and −α give the same shear stress (%g)", g, p12["single-plus"][0])
		}
		if !strings.Contains(strings.Join(rp.Warnings, " "), "mirror-pair") {
			t.Errorf("evaluate names no alternatives: %v", rp.Warnings)
		}
	}
	out, errs, code := runWeft(t, "export", path, "--format", "csv", "--alternative", "single-minus")
	if code != 0 || strings.Contains(out, ",single-plus\n") || !strings.Contains(out, ",single-minus\n") {
		t.Errorf("export --alternative single-minus: exit %d %s\n%.600s", code, errs, out)
	}
	if _, errs, code := runWeft(t, "export", path, "--alternative", "no-such"); code != 2 || !strings.Contains(errs, "--alternative") {
		t.Errorf("unknown alternative: exit %d, %s", code, errs)
	}
	out, errs, code = runWeft(t, "check", path)
	if code != 0 || !strings.Contains(out, "single-minus") || !strings.Contains(out, "mirror-pair") {
		t.Errorf("check: exit %d, alternatives not named\n%s%s", code, out, errs)
	}
}

// fmtG writes a number as the rows' keys use it (shortest form).
func fmtG(v float64) string { return fullFloat(v) }

// fmtF4 writes F for --deformation.
func fmtF4(F [4]float64) string {
	return fullFloat(F[0]) + "," + fullFloat(F[1]) + "," + fullFloat(F[2]) + "," + fullFloat(F[3])
}
