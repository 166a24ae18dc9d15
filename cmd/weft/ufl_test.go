package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/weft-tools/weft/cmd/weft/internal/fe"
)

// uflCards are hand-written cards that hold every term a card can: every
// I1 and I2 shape, both principal-stretch shapes, the Fung-type term, a
// family with the dispersion κ carrying every fibre shape, a cofactor and
// an I5 term, an ideal family with a recruitment of zero spread, two
// families spread in the plane (one concentrated with the kinks of a
// recruitment range, one spread over every direction) and a spread family
// whose sign the data did not determine (its three alternatives).
var uflCards = map[string]string{
	"all-terms": `{"format": "weft.model/1", "stress_unit": "kPa",
 "families": [{"name": "f1", "angle_deg": 35, "dispersion": 0.1}, {"name": "f2", "angle_deg": -70}],
 "terms": [{"id": "i1-lin", "weight": 1.5}, {"id": "i1-quad", "weight": 0.4}, {"id": "i1-cube", "weight": 0.2},
  {"id": "i1-exp", "weight": 0.8, "params": {"stiffening": 1.5}}, {"id": "i1-expsq", "weight": 0.3, "params": {"stiffening": 2}},
  {"id": "i1-gent", "weight": 0.6, "params": {"limit": 3}}, {"id": "i2-lin", "weight": 0.5}, {"id": "i2-quad", "weight": 0.1},
  {"id": "i2-cube", "weight": 0.05}, {"id": "i2-exp", "weight": 0.2, "params": {"stiffening": 1}}, {"id": "i2-gent", "weight": 0.2, "params": {"limit": 4}},
  {"id": "ps-pos", "weight": 0.7, "params": {"exponent": 9}}, {"id": "ps-neg", "weight": 0.3, "params": {"exponent": -4}},
  {"id": "fung", "weight": 0.25, "params": {"b1": 6, "b2": 4, "b3": 1, "b4": 3}},
  {"id": "fung-general", "weight": 0.2, "params": {"b1": 5, "b2": 7, "b3": -1, "b4": 4, "b5": 1.5, "b6": -2}},
  {"id": "fib-quad", "weight": 2, "family": "f1"}, {"id": "fib-expsq", "weight": 4, "params": {"stiffening": 3}, "family": "f1"},
  {"id": "fib-exp", "weight": 3, "params": {"stiffening": 4}, "family": "f1"}, {"id": "fib-recruit", "weight": 20, "params": {"onset": 1.04, "spread": 0.1}, "family": "f1"},
  {"id": "cof-quad", "weight": 1, "family": "f1"}, {"id": "i5-quad", "weight": 0.5, "family": "f1"},
  {"id": "fib-expsq", "weight": 6, "params": {"stiffening": 0}, "family": "f2"}, {"id": "fib-recruit", "weight": 15, "params": {"onset": 1.02, "spread": 0}, "family": "f2"}]}`,
	"in-plane": `{"format": "weft.model/1", "stress_unit": "kPa",
 "families": [{"name": "f1", "angle_deg": 35, "concentration": 3}, {"name": "f2", "angle_deg": -60, "concentration": 0}],
 "terms": [{"id": "i1-lin", "weight": 2},
  {"id": "fib-expsq", "weight": 8, "params": {"stiffening": 2}, "family": "f1"},
  {"id": "fib-recruit", "weight": 30, "params": {"onset": 1.03, "spread": 0.12}, "family": "f1"},
  {"id": "fib-exp", "weight": 5, "params": {"stiffening": 3}, "family": "f2"}]}`,
	"undetermined": `{"format": "weft.model/1", "stress_unit": "kPa",
 "families": [{"name": "f1", "angle_deg": 28, "angle_sign_known": false, "concentration": 12}],
 "terms": [{"id": "i1-lin", "weight": 3}, {"id": "fib-expsq", "weight": 20, "params": {"stiffening": 4}, "family": "f1"}]}`,
}

// fenicsPython returns a Python interpreter that imports dolfinx and ufl:
// WEFT_PYTHON, /usr/bin/python3 (where Debian's python3-dolfinx installs)
// or python3 on PATH. It fails the test when none does, unless
// WEFT_NO_FENICS=1 skips it.
func fenicsPython(t *testing.T) string {
	t.Helper()
	if os.Getenv("WEFT_NO_FENICS") == "1" {
		t.Skip("WEFT_NO_FENICS=1: the UFL export is not checked against FEniCS")
	}
	cands := []string{os.Getenv("WEFT_PYTHON"), "/usr/bin/python3", "python3"}
	for _, py := range cands {
		if py == "" {
			continue
		}
		if exec.Command(py, "-c", "import dolfinx, ufl").Run() == nil {
			return py
		}
	}
	t.Fatal("no Python with FEniCS (dolfinx, ufl) found: install python3-dolfinx (Debian: apt-get install python3-dolfinx), name the interpreter with WEFT_PYTHON, or set WEFT_NO_FENICS=1 to skip this test")
	return ""
}

// uflJob is what testdata/uflcheck.py reads.
type uflJob struct {
	Module string                  `json:"module"`
	Models map[string][][4]float64 `json:"models"`
	Bulk   float64                 `json:"bulk_modulus"`
}

// uflResult is what it writes, per model.
type uflResult struct {
	Membrane             [][5]float64 `json:"membrane"`
	NearlyIncompressible [][6]float64 `json:"nearly_incompressible"`
}

// The UFL export against the real library: for each card, the energy
// written by 'weft export --format ufl' is compiled by FFCx and evaluated
// by dolfinx (testdata/uflcheck.py) at every verification row of 'weft
// export --format json' (every alternative's); its stress, by UFL automatic
// differentiation of the energy, and the energy itself agree with weft's
// rows within 1e-10 of the row's stress scale (the larger of its largest
// nominal stress and the sum of the weights). Rows weft flags (a family on
// its switch, a lateral stretch that is not unique) are the ones an
// implementation may reproduce differently and are counted, not compared.
// The nearly incompressible form of the same module, with the suggested
// bulk modulus (three_dimensional.suggested_bulk_modulus) and F33 solved for plane
// stress, gives the membrane's nominal stress within 1e-3 of the same
// scale. The cards: uflCards and the example card of the arterial media
// (Holzapfel, Gasser & Ogden 2000, from memory). FFCx compiles one
// expression per card (every model, membrane and nearly incompressible,
// together); the rows only set its constants.
func TestExportUFLAgainstFEniCS(t *testing.T) {
	py := fenicsPython(t)
	t.Parallel()
	dir := t.TempDir()
	cards := map[string]string{}
	for name, text := range uflCards {
		p := filepath.Join(dir, name+".json")
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		cards[name] = p
	}
	cards["example hgo-media"] = filepath.Join("..", "..", "testdata", "example", "hgo-media.json")
	// Every card's export is checked in one run of uflcheck.py (one
	// Python start and FEniCS import for them all); FFCx still compiles one
	// expression per card.
	names := make([]string, 0, len(cards))
	for name := range cards {
		names = append(names, name)
	}
	sort.Strings(names)
	compared, flagged := 0, 0
	jobs := make([]uflJob, len(names))
	rows := make([]map[string][]fe.ExportPoint, len(names))
	weights := make([]float64, len(names))
	for k, name := range names {
		path := cards[name]
		doc := exportJSON(t, path)
		module := filepath.Join(dir, strings.ReplaceAll(name, " ", "_")+".py")
		if _, errs, code := runWeft(t, "export", path, "--format", "ufl", "-o", module); code != 0 {
			t.Fatalf("%s: export --format ufl: exit %d: %s", name, code, errs)
		}
		jobs[k] = uflJob{Module: module, Models: map[string][][4]float64{}, Bulk: doc.ThreeD.SuggestedBulkModulus}
		rows[k] = map[string][]fe.ExportPoint{}
		for _, p := range doc.Verification {
			model := p.Alternative
			if model == "" {
				model = "card"
			}
			if len(p.Flags) > 0 {
				flagged++
				continue
			}
			jobs[k].Models[model] = append(jobs[k].Models[model], [4]float64{p.F11, p.F12, p.F21, p.F22})
			rows[k][model] = append(rows[k][model], p)
		}
		for _, p := range doc.Parameters {
			weights[k] += p.Weight
		}
	}
	results := runUFLCheck(t, py, jobs)
	worst, worstNI := 0.0, 0.0 // largest differences, as fractions of the row's scale
	for k, name := range names {
		c, w := compareUFL(t, name, rows[k], results[k], weights[k])
		compared += c
		worst, worstNI = math.Max(worst, w[0]), math.Max(worstNI, w[1])
	}
	if compared < 500 {
		t.Fatalf("only %d rows compared", compared)
	}
	t.Logf("%d verification rows compared with FEniCS, %d flagged rows not compared; largest difference %.2g of the row's scale (membrane), %.2g (nearly incompressible, the suggested bulk modulus)", compared, flagged, worst, worstNI)
}

// compareUFL compares one card's rows with uflcheck.py's results for them
// (TestExportUFLAgainstFEniCS's tolerances), returning how many rows it
// compared and the largest differences, membrane and nearly
// incompressible, as fractions of the row's scale.
func compareUFL(t *testing.T, name string, rows map[string][]fe.ExportPoint, res map[string]uflResult, weights float64) (int, [2]float64) {
	t.Helper()
	compared, worst := 0, [2]float64{}
	for model, pts := range rows {
		r := res[model]
		if len(r.Membrane) != len(pts) || len(r.NearlyIncompressible) != len(pts) {
			t.Fatalf("%s %s: %d rows, %d membrane results, %d nearly incompressible", name, model, len(pts), len(r.Membrane), len(r.NearlyIncompressible))
		}
		for i, p := range pts {
			want := [5]float64{p.Energy, p.Nominal11, p.Nominal12, p.Nominal21, p.Nominal22}
			scale := weights
			for _, v := range want[1:] {
				scale = math.Max(scale, math.Abs(v))
			}
			got, ni := r.Membrane[i], r.NearlyIncompressible[i]
			for j := range want {
				worst[0] = math.Max(worst[0], math.Abs(got[j]-want[j])/scale)
				if j > 0 {
					worst[1] = math.Max(worst[1], math.Abs(ni[j]-want[j])/scale)
				}
				if math.Abs(got[j]-want[j]) > 1e-10*scale {
					t.Errorf("%s %s %s θ=%g %g: component %d: UFL %.17g, weft %.17g (difference %.3g of the scale %.3g)", name, model, p.Case, p.DirectionDeg, p.StretchOrShear, j, got[j], want[j], math.Abs(got[j]-want[j])/scale, scale)
				}
				if j > 0 && math.Abs(ni[j]-want[j]) > 1e-3*scale {
					t.Errorf("%s %s %s θ=%g %g: nearly incompressible P[%d] = %.10g, membrane %.10g (%.3g of the scale)", name, model, p.Case, p.DirectionDeg, p.StretchOrShear, j, ni[j], want[j], math.Abs(ni[j]-want[j])/scale)
				}
			}
			compared++
		}
	}
	return compared, worst
}

// runUFLCheck runs testdata/uflcheck.py once on a list of jobs and returns
// its results, one per job in the same order.
func runUFLCheck(t *testing.T, py string, jobs []uflJob) []map[string]uflResult {
	t.Helper()
	in, err := json.Marshal(jobs)
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(py, filepath.Join("testdata", "uflcheck.py"))
	cmd.Stdin = bytes.NewReader(in)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	if err := cmd.Run(); err != nil {
		t.Fatalf("uflcheck.py: %v\n%s", err, errb.String())
	}
	var res []map[string]uflResult
	if err := json.Unmarshal(out.Bytes(), &res); err != nil {
		t.Fatalf("uflcheck.py output: %v\n%s", err, out.String())
	}
	if len(res) != len(jobs) {
		t.Fatalf("uflcheck.py: %d results for %d jobs", len(res), len(jobs))
	}
	return res
}
