package aniso

import (
	"math"
	"testing"
)

// A cohort's pooled model takes each parameter's median over the
// specimens, family by family; a specimen whose fit calls its two families
// the other way round must be matched first. Three specimens of a free
// pair near 10° and 65° (expsq stiffer on the 10° family), the middle one
// labelled the other way round: the medians by hand are 10°, 65° and the
// stiffer family's weight 20 kPa on f1. Unmatched they were 14°, 60°, and
// 15 and 15 kPa.
func TestCohortMedianMatchesSwappedFamilies(t *testing.T) {
	sh := lookup("fib-expsq")
	iso := lookup("i1-lin")
	st := Structure{Layout: LayoutFree, Terms: []TermSpec{{Shape: iso, Family: -1}, {Shape: sh, Family: 0}, {Shape: sh, Family: 1}}}
	fit := func(a1, a2, w1, w2 float64) *Result {
		m := &Model{Families: []Family{{Name: "f1", Angle: a1 * deg}, {Name: "f2", Angle: a2 * deg}},
			Terms: []Term{{Shape: iso, Family: -1, Weight: 3}, {Shape: sh, Family: 0, Weight: w1, Params: []float64{2}}, {Shape: sh, Family: 1, Weight: w2, Params: []float64{3}}}}
		return &Result{Structure: st, Model: m, Weights: []float64{3, w1, w2}, SignKnown: true}
	}
	fits := []*Result{fit(9, 66, 19, 10), fit(64, 14, 11, 21), fit(10, 65, 20, 9)}
	lm := newLabelMaps(fits, true)
	if !lm.swapped[1] || lm.swapped[0] || lm.swapped[2] {
		t.Fatalf("swapped %v, want only the second fit", lm.swapped)
	}
	m := medianModel(fits, lm)
	if a, b := Deg(m.Families[0].Angle), Deg(m.Families[1].Angle); math.Abs(a-10) > 1e-9 || math.Abs(b-65) > 1e-9 {
		t.Errorf("median angles %.6g°, %.6g°, want 10° and 65°", a, b)
	}
	if w := m.Terms[1].Weight; w != 20 {
		t.Errorf("median weight of f1's term %g kPa, want 20", w)
	}
	if w := m.Terms[2].Weight; w != 10 {
		t.Errorf("median weight of f2's term %g kPa, want 10", w)
	}
	// Other shapes on the two families: a swap would pair unlike terms,
	// so the labels are kept.
	other := st
	other.Terms = []TermSpec{{Shape: iso, Family: -1}, {Shape: sh, Family: 0}, {Shape: lookup("fib-exp"), Family: 1}}
	for _, f := range fits {
		f.Structure = other
		f.Model.Terms[2].Shape = other.Terms[2].Shape
	}
	if lm := newLabelMaps(fits, true); lm.swapped[1] {
		t.Error("families with different shapes were matched as swapped")
	}
}
