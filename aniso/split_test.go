package aniso

import (
	"math"
	"testing"
)

// The split is consistent: shares sum to one per component, and a fibre
// family along axis 1 carries no stress along axis 2 under pure biaxial
// stretch, because a⊗a = e1⊗e1 has no 22 component (Holzapfel 2000, §6.6;
// common practice).
func TestSplitFibreAlongAxis1(t *testing.T) {
	m := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{3}}, 0)
	m.Families[0].Name = "f1"
	spec := synthSpecimen(t, m, synthOptions{})
	p, _ := NewProblem(spec, nil)
	s, err := Split(p, m)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Groups) != 2 || s.Groups[1] != "f1" {
		t.Fatalf("groups %v", s.Groups)
	}
	for _, ps := range s.Protocols {
		for _, cs := range ps.Components {
			sum := 0.0
			for _, v := range cs.GroupShare {
				sum += v
			}
			if math.Abs(sum-1) > 1e-12 {
				t.Errorf("%s %s: group shares sum to %g", ps.Protocol, cs.Component, sum)
			}
			if cs.Component == "22" && cs.GroupShare[1] != 0 {
				t.Errorf("%s: fibre share of axis 2 is %g, want 0", ps.Protocol, cs.GroupShare[1])
			}
			if cs.Component == "11" && cs.GroupShare[1] <= 0 {
				t.Errorf("%s: fibre share of axis 1 is %g, want > 0", ps.Protocol, cs.GroupShare[1])
			}
		}
		e := ps.GroupEnergyShare[0] + ps.GroupEnergyShare[1]
		if math.Abs(e-1) > 1e-12 {
			t.Errorf("%s: energy shares sum to %g", ps.Protocol, e)
		}
	}
}

// A sutured specimen: at the solved shears both nominal shear stresses
// vanish, and a fibre family on an axis (α = 0) gives no shear at all
// (symmetry; common practice).
func TestSuturedShear(t *testing.T) {
	m := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{3}}, 30)
	x, err := m.SuturedShear(1.15, 1.08, [2]float64{})
	if err != nil {
		t.Fatal(err)
	}
	r, _ := m.Evaluate([4]float64{1.15, x[0], x[1], 1.08})
	if math.Abs(r.Nominal[2]) > 1e-9 || math.Abs(r.Nominal[3]) > 1e-9 || math.Abs(x[0])+math.Abs(x[1]) < 1e-4 {
		t.Errorf("shear %v gives P12=%g, P21=%g", x, r.Nominal[2], r.Nominal[3])
	}
	m.Families[0].Angle = 0
	x, _ = m.SuturedShear(1.15, 1.08, [2]float64{})
	if math.Abs(x[0])+math.Abs(x[1]) > 1e-12 {
		t.Errorf("on-axis family sheared: %v", x)
	}
}
