package cohortreport

import (
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/terms"
)

// The table of the two models at the largest stretch holds stresses in
// the cohort's measure, and the report must say which. An incompressible
// neo-Hookean membrane, Ψ = w(I1 − 3), stretched equibiaxially by λ
// carries σ11 = 2w(λ² − λ⁻⁴) and nominal stress P11 = σ11/λ = 2w(λ − λ⁻⁵)
// (Treloar 1975, equibiaxial extension of a neo-Hookean sheet; from
// memory): w = 3 kPa, λ = 1.2 give P11 = 4.7887 kPa, σ11 = 5.7465 kPa.
// Until 2026-12-05 the report's column was "axis" with cells "11" and
// "22", so a nominal cohort's P11 read as a Cauchy σ11, 17 % below it
// here.
func TestLargestStretchTableNamesTheStressMeasure(t *testing.T) {
	const w, lam = 3.0, 1.2
	model := &aniso.Model{Terms: []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: w}}}
	spec := &biaxial.Specimen{Name: "S", Protocols: []biaxial.Protocol{{Label: "1:1",
		Points: []biaxial.Point{{F: [4]float64{1.1, 0, 0, 1.1}}, {F: [4]float64{lam, 0, 0, lam}}}}}}
	for _, c := range []struct {
		kind, head, symbol string
		want               float64
	}{
		{"nominal", "nominal stress", "P11", 2 * w * (lam - math.Pow(lam, -5))},
		{"cauchy", "Cauchy stress", "σ11", 2 * w * (lam*lam - math.Pow(lam, -4))},
	} {
		in := &Input{Cohort: &aniso.Cohort{InPopulation: []int{0}}, Population: model, MeanParameters: model,
			StressUnit: "kPa", StressKind: c.kind,
			Specimens: []Specimen{{File: "s.csv", Name: "S", Problem: &aniso.Problem{Specimen: spec}}}}
		s := &Summary{StressUnit: "kPa", StressKind: c.kind, Population: populationInfo(in)}
		rows := s.Population.AtLargestStretch
		if len(rows) != 2 || rows[0].Component != "11" {
			t.Fatalf("%s: rows %+v", c.kind, rows)
		}
		if got := float64(rows[0].Population); math.Abs(got-c.want) > 1e-12*c.want {
			t.Errorf("%s: population stress 11 = %.10g kPa, closed form %.10g kPa", c.kind, got, c.want)
		}
		v := &pageView{}
		s.populationView(v, nil)
		if v.Largest.Head[1] != c.head || v.Largest.Rows[0].Cells[1] != c.symbol || v.Largest.Rows[1].Cells[1] != c.symbol[:len(c.symbol)-2]+"22" {
			t.Errorf("%s: column %q, cells %q, %q; want %q, %q", c.kind, v.Largest.Head[1], v.Largest.Rows[0].Cells[1], v.Largest.Rows[1].Cells[1], c.head, c.symbol)
		}
	}
}

// The report's file list describes cohort.csv as the README's table of
// outputs does (weft's own contract, "Outputs in DIR"): one row per file,
// failed ones included, with lowest_r2, heldout_error and misfit_ratio.
// Until 2026-12-05 it said "one row per specimen" and left out the
// failed rows and the misfit ratio. Invented rows.
func TestFileListDescribesTheCSV(t *testing.T) {
	s := &Summary{Specimens: []SpecimenRow{{File: "a.csv", Specimen: "A", Status: "ok"}, {File: "b.csv", Specimen: "b", Status: "failed", Error: "no stress columns"}}}
	b, err := s.CSV()
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	if len(lines) != 3 {
		t.Fatalf("cohort.csv has %d lines, want a header and one row per file:\n%s", len(lines), b)
	}
	words := map[string]string{"lowest_r2": "lowest R²", "heldout_error": "held-out error", "misfit_ratio": "misfit ratio", "error": "error"}
	for _, col := range strings.Split(lines[0], ",") {
		if w, ok := words[col]; ok && !strings.Contains(csvFileLine, w) {
			t.Errorf("the file list does not name column %s (%q): %q", col, w, csvFileLine)
		}
	}
	if !strings.Contains(csvFileLine, "one row per file") || !strings.Contains(csvFileLine, "failed") {
		t.Errorf("the file list does not say cohort.csv has a row per file, failed ones too: %q", csvFileLine)
	}
}
