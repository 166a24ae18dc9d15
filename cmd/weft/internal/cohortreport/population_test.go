package cohortreport

import (
	"math"
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
