package aniso

import (
	"math"
	"testing"
)

// A combination of correlated quantities states the same thing whatever
// the stress unit: a change of unit multiplies every weight by k, so a
// weight's coefficient divides by k, the value of a combination led by a
// weight multiplies by k, and every other coefficient stays (dimensional
// analysis, derived here). Before, the member with the largest coefficient
// in its own unit was set to 1; with a weight and an angle in one block
// that member changed with the unit, and the same test in Pa read
// "0.0222·weight[i1-lin] + 0.00328·weight[fib-expsq@f1] + angle = 163"
// where in kPa it read "weight[i1-lin] + 0.148·weight[fib-expsq@f1] +
// 0.0451·angle = 7.35".
func TestCombinationDoesNotDependOnTheStressUnit(t *testing.T) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{3}}, 30)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.05, maxStrain: 0.04})
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
	combos := map[string]Combination{}
	for _, u := range []string{"Pa", "kPa", "MPa"} {
		s, err := spec.InStressUnit(u)
		if err != nil {
			t.Fatal(err)
		}
		p, err := NewProblem(s, nil)
		if err != nil {
			t.Fatal(err)
		}
		res, err := Fit(p, st, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		if len(res.Combinations) != 1 {
			t.Fatalf("%s: %d combinations, want 1 (weights and angle correlated)", u, len(res.Combinations))
		}
		combos[u] = res.Combinations[0]
	}
	ref := combos["kPa"]
	isWeight := func(name string) bool { return len(name) > 7 && name[:7] == "weight[" }
	hasAngle := false
	for _, n := range ref.Names {
		hasAngle = hasAngle || !isWeight(n)
	}
	if !hasAngle {
		t.Fatalf("combination %v has only weights; the test needs a block that mixes units", ref.Names)
	}
	lead := -1
	for i, x := range ref.Coefficients {
		if x == 1 {
			lead = i
		}
	}
	if lead < 0 {
		t.Fatalf("no coefficient is 1 in %v", ref.Coefficients)
	}
	for u, k := range map[string]float64{"Pa": 1e3, "MPa": 1e-3} {
		c := combos[u]
		if len(c.Names) != len(ref.Names) {
			t.Fatalf("%s: members %v, kPa %v", u, c.Names, ref.Names)
		}
		for i, n := range ref.Names {
			want := ref.Coefficients[i]
			if isWeight(n) != isWeight(ref.Names[lead]) {
				if isWeight(n) {
					want /= k
				} else {
					want *= k
				}
			}
			if c.Names[i] != n || math.Abs(c.Coefficients[i]-want) > 1e-6*math.Abs(want) {
				t.Errorf("%s: %s coefficient %.6g, want %.6g (kPa %.6g)\n  %s\n  kPa: %s", u, c.Names[i], c.Coefficients[i], want, ref.Coefficients[i], c.Text, ref.Text)
			}
		}
		want := ref.Value
		if isWeight(ref.Names[lead]) {
			want *= k
		}
		if math.Abs(c.Value-want) > 1e-6*math.Abs(want) {
			t.Errorf("%s: value %.6g, want %.6g", u, c.Value, want)
		}
	}
}
