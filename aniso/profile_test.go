package aniso

import (
	"math"
	"testing"
)

// familyOffLoss is the best loss of r's form with every term of structural
// family f removed, found by an independent fit with its own global angle
// scan: a profile over an angle of family f can never lie above it, since
// zero weights for that family are admissible at every angle (the profile
// is the minimum over all other parameters; Bates & Watts 1988, §6.1).
func familyOffLoss(t *testing.T, p *Problem, st Structure, f int) float64 {
	t.Helper()
	off := Structure{Layout: LayoutNone, Dispersion: st.Dispersion}
	for _, ts := range st.Terms {
		switch {
		case ts.Family < 0:
			off.Terms = append(off.Terms, ts)
		case ts.Family != f && st.Layout == LayoutFree:
			off.Layout = LayoutSingle
			off.Terms = append(off.Terms, TermSpec{Shape: ts.Shape, Family: 0})
		}
	}
	if off.Layout == LayoutNone {
		off.Dispersion = false
	}
	r, err := Fit(p, off, Settings{ScanStepDeg: 1, Starts: 6})
	if err != nil {
		t.Fatal(err)
	}
	return r.Loss
}

// Profiles are true profiles on two-family fits (free layout), with and
// without shear information, including a weak second family whose profile
// used to rise far above the reachable loss: at every grid angle the
// profiled loss is at most the best loss of the model with that family
// removed (found by an independent, finer global fit); the profile at the
// fitted angle is the fitted loss, and no angle has a lower loss than the
// fit (the fit is the profile's minimum).
func TestProfileIsATrueProfile(t *testing.T) {
	for _, c := range []struct {
		a1, a2, w2 float64
		sutured    bool
	}{{10, 65, 8, true}, {10, 65, 0.3, false}, {0, 90, 8, false}} {
		truth := &Model{Families: []Family{{Angle: c.a1 * deg}, {Angle: c.a2 * deg}}, Terms: []Term{
			{Shape: lookup("i1-lin"), Family: -1, Weight: 3},
			{Shape: lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{5}},
			{Shape: lookup("fib-expsq"), Family: 1, Weight: c.w2, Params: []float64{3}}}}
		spec := synthSpecimen(t, truth, synthOptions{noise: 0.02, sutured: c.sutured, points: 20})
		p, err := NewProblem(spec, nil)
		if err != nil {
			t.Fatal(err)
		}
		st := Structure{Layout: LayoutFree, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}, {Shape: lookup("fib-expsq"), Family: 1}}}
		res, err := Fit(p, st, Settings{Profile: true})
		if err != nil {
			t.Fatal(err)
		}
		if len(res.Profiles) != 2 {
			t.Fatalf("%+v: %d profiles, want 2", c, len(res.Profiles))
		}
		for f, pr := range res.Profiles {
			bound := familyOffLoss(t, p, st, f)
			atOpt := false
			for j, l := range pr.Loss {
				if l > bound*(1+1e-9) {
					t.Errorf("%+v %s at %.2f°: profiled loss %.8g above the loss %.8g with that family removed", c, pr.Name, pr.AnglesDeg[j], l, bound)
				}
				if l < res.Loss*(1-1e-9) {
					t.Errorf("%+v %s at %.2f°: profiled loss %.8g below the fitted loss %.8g", c, pr.Name, pr.AnglesDeg[j], l, res.Loss)
				}
				if math.Abs(pr.AnglesDeg[j]-pr.OptimumDeg) < 1e-9 && l == res.Loss {
					atOpt = true
				}
			}
			if !atOpt {
				t.Errorf("%+v %s: no profile point at the fitted angle %.4f° with the fitted loss %.8g", c, pr.Name, pr.OptimumDeg, res.Loss)
			}
		}
	}
}
