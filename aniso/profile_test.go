package aniso

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/biaxial"
	"gonum.org/v1/gonum/stat/distuv"

	"gonum.org/v1/gonum/optimize"
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
	t.Parallel()
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
		st := freeExpSqPair()
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

// TestPlacedProfileMatchesExhaustive: a profile that only places the angles
// far above the minimum (profileFarMargins) gives the exhaustive profile's
// 95 % interval and, near the minimum, its losses; far away its losses are
// upper bounds within 1e-3 of the exhaustive ones. Cases: one family with
// shear (a full period), two free families with shear, and a dispersed
// family with shear. Not parallel: it sets profileFarMargins, which every
// profile reads.
func TestPlacedProfileMatchesExhaustive(t *testing.T) {
	if testing.Short() {
		t.Skip("profiles three forms twice each")
	}
	one := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 4}, Term{Shape: lookup("fib-expsq"), Weight: 60, Params: []float64{8}}, 30)
	two := &Model{Families: []Family{{Angle: 10 * deg}, {Angle: 65 * deg}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 2},
		{Shape: lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{3}},
		{Shape: lookup("fib-expsq"), Family: 1, Weight: 10, Params: []float64{2}}}}
	spread := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 40, Params: []float64{3}}, -30)
	spread.Families[0].Planar, spread.Families[0].Concentration = true, 3
	for _, c := range []struct {
		name   string
		m      *Model
		layout Layout
	}{{"one family", one, LayoutSingle}, {"two families", two, LayoutFree}, {"dispersed family", spread, LayoutSingle}} {
		s := synthSpecimen(t, c.m, synthOptions{maxStrain: 0.2, noise: 0.01, points: 30, sutured: true})
		p, err := NewProblem(s, nil)
		if err != nil {
			t.Fatal(err)
		}
		st := Structure{Layout: c.layout, Planar: c.m.Families[0].Planar}
		for i, tm := range c.m.Terms {
			st.Terms = append(st.Terms, TermSpec{Shape: tm.Shape, Family: c.m.Terms[i].Family})
		}
		placed, err := Fit(p, st, Settings{Profile: true})
		if err != nil {
			t.Fatal(err)
		}
		keep := profileFarMargins
		profileFarMargins = 0
		full, err := Fit(p, st, Settings{Profile: true})
		profileFarMargins = keep
		if err != nil {
			t.Fatal(err)
		}
		if len(placed.Profiles) != len(full.Profiles) {
			t.Fatalf("%s: %d and %d profiles", c.name, len(placed.Profiles), len(full.Profiles))
		}
		for k := range full.Profiles {
			g, f := placed.Profiles[k], full.Profiles[k]
			if math.Abs(g.LoDeg-f.LoDeg) > 0.01 || math.Abs(g.HiDeg-f.HiDeg) > 0.01 || g.NotDetermined != f.NotDetermined {
				t.Errorf("%s %s: placed interval [%.4f, %.4f]°, exhaustive [%.4f, %.4f]°", c.name, f.Name, g.LoDeg, g.HiDeg, f.LoDeg, f.HiDeg)
			}
			margin := f.Threshold - full.Loss
			worst := 0.0
			for j := range f.Loss {
				d := g.Loss[j] - f.Loss[j]
				worst = math.Max(worst, math.Abs(d)/f.Loss[j])
				if f.Loss[j] < full.Loss+10*margin && math.Abs(d) > 1e-3*margin {
					t.Errorf("%s %s at %.2f°: placed loss %.10g, exhaustive %.10g (threshold margin %.3g)", c.name, f.Name, g.AnglesDeg[j], g.Loss[j], f.Loss[j], margin)
				}
				if math.Abs(d) > 1e-3*f.Loss[j] {
					t.Errorf("%s %s at %.2f°: placed loss %.6g, exhaustive %.6g", c.name, f.Name, g.AnglesDeg[j], g.Loss[j], f.Loss[j])
				}
			}
			t.Logf("%s %s: interval placed [%.4f, %.4f]°, exhaustive [%.4f, %.4f]°; largest loss difference %.2g of the loss", c.name, f.Name, g.LoDeg, g.HiDeg, f.LoDeg, f.HiDeg, worst)
		}
	}
}

// TestProfileIntervalEndsAreCrossings: each end of a 95 % profile interval
// is where the profile meets the threshold: minimised directly 0.002°
// inside an end, the loss is at most the threshold, 0.002° outside it is
// above, also for gonum's Nelder–Mead, a general-purpose minimiser (one
// family and two free families, with shear; and one family at 5° without
// shear, 2 % noise, whose interval is about ±0.6° wide). On that wide
// interval the search used to return its last trial once that trial's
// loss was within 1 % of the threshold margin of the threshold: the lower
// end came out at 4.52840°, 0.0024° beyond the crossing (seed 1); the end
// is now the secant root on the final bracket, 4.53081°.
func TestProfileIntervalEndsAreCrossings(t *testing.T) {
	one := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 4}, Term{Shape: lookup("fib-expsq"), Weight: 60, Params: []float64{8}}, 30)
	two := &Model{Families: []Family{{Angle: 10 * deg}, {Angle: 65 * deg}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 2},
		{Shape: lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{3}},
		{Shape: lookup("fib-expsq"), Family: 1, Weight: 10, Params: []float64{2}}}}
	near := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 5}, Term{Shape: lookup("fib-expsq"), Weight: 10, Params: []float64{20}}, 5)
	for _, c := range []struct {
		m      *Model
		layout Layout
		o      synthOptions
	}{
		{one, LayoutSingle, synthOptions{maxStrain: 0.2, noise: 0.01, points: 30, sutured: true}},
		{two, LayoutFree, synthOptions{maxStrain: 0.2, noise: 0.01, points: 30, sutured: true}},
		{near, LayoutSingle, synthOptions{maxStrain: 0.15, noise: 0.02, points: 30, seed: 1}},
	} {
		s := synthSpecimen(t, c.m, c.o)
		p, err := NewProblem(s, nil)
		if err != nil {
			t.Fatal(err)
		}
		st := Structure{Layout: c.layout}
		for _, tm := range c.m.Terms {
			st.Terms = append(st.Terms, TermSpec{Shape: tm.Shape, Family: tm.Family})
		}
		checkIntervalEnds(t, p, st, func(AngleProfile) float64 { return 0.002 })
	}
}

// TestProfileIntervalEndsOnDenseData: with many points the 95 % interval
// of a fibre angle is far narrower than the profile's 2° grid step (here
// about ±0.01°), and its ends must still be the crossings, to 2 % of the
// interval's half-width: minimised directly that far inside an end, the
// loss is at most the threshold, that far outside it is above, also for
// gonum's Nelder–Mead. The data
// are 5 × 2 000 points without shear, made by independent numerical
// integration (independent_test.go) of a neo-Hookean matrix with one
// exponential fibre family at 30° (Holzapfel, Gasser & Ogden 2000).
// Before the crossing's search worked on the square root of the loss
// above its minimum, its 8 trials stopped short of the crossing on such
// data and the end was extrapolated, 10 % of the half-width off.
func TestProfileIntervalEndsOnDenseData(t *testing.T) {
	if testing.Short() {
		t.Skip("fits 5 × 2 000 points")
	}
	t.Parallel()
	p, st := denseOneFamily(t, 2000)
	checkIntervalEnds(t, p, st, func(pr AngleProfile) float64 {
		half := math.Min(pr.OptimumDeg-pr.LoDeg, pr.HiDeg-pr.OptimumDeg)
		if !(half > 0) || half > 0.5 {
			t.Fatalf("interval [%.5f, %.5f]° about %.5f°: not the narrow interval this test is about", pr.LoDeg, pr.HiDeg, pr.OptimumDeg)
		}
		return 0.02 * half
	})
}

// denseOneFamily is the problem of 5 × points points without shear, made by
// independent numerical integration (independent_test.go) of a neo-Hookean
// matrix with one exponential fibre family at 30° (Holzapfel, Gasser &
// Ogden 2000), 1 % noise, and the true form.
func denseOneFamily(t *testing.T, points int) (*Problem, Structure) {
	t.Helper()
	s := synthFrom(t, fibreMaterial(4, spreadFamily{30 * deg, -1, expSqFibre(60, 8)}), synthOptions{noise: 0.01, points: points})
	p, err := NewProblem(s, nil)
	if err != nil {
		t.Fatal(err)
	}
	return p, Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
}

// A profile of one angle on many rows runs its work side by side: the
// family-off fit beside the guide on the search subset, the guide's halves
// above and below the optimum on two engines, the full data's loss at the
// guide's parameters shared between two engines, then the halves. Since
// an engine's result does not depend on what it evaluated before, the
// profile must equal, bit for bit, the one computed on a single engine one
// step after the other.
func TestProfileSideBySideEqualsSerial(t *testing.T) {
	if testing.Short() {
		t.Skip("profiles 5 × 1 000 points twice")
	}
	t.Parallel()
	p, st := denseOneFamily(t, 1000)
	if p.Rows() <= profileGuideRows {
		t.Fatalf("%d rows: the profile is not guided", p.Rows())
	}
	set := Settings{}
	r, err := Fit(p, st, set)
	if err != nil {
		t.Fatal(err)
	}
	guideOn, err := searchSubset(p, DefaultSearchPoints)
	if err != nil {
		t.Fatal(err)
	}
	fq := distuv.F{D1: 1, D2: float64(r.Rows - r.FreeParams)}.Quantile(0.95)
	set = set.withDefaults(1, false)
	for i, q := range r.e.params {
		if q.Kind != kindAngle {
			continue
		}
		side := r.profileOne(r.profileEngine(p), r.profileEngine(p), p, guideOn, i, set, fq)
		serial := r.profileOne(r.profileEngine(p), nil, p, guideOn, i, set, fq)
		same := func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }
		if !same(side.LoDeg, serial.LoDeg) || !same(side.HiDeg, serial.HiDeg) || len(side.Loss) != len(serial.Loss) {
			t.Fatalf("side by side [%.9f, %.9f]° over %d angles, serial [%.9f, %.9f]° over %d", side.LoDeg, side.HiDeg, len(side.Loss), serial.LoDeg, serial.HiDeg, len(serial.Loss))
		}
		for j := range side.Loss {
			if !same(side.Loss[j], serial.Loss[j]) || !same(side.AnglesDeg[j], serial.AnglesDeg[j]) {
				t.Errorf("angle %d: loss %.17g at %g° side by side, %.17g at %g° serial", j, side.Loss[j], side.AnglesDeg[j], serial.Loss[j], serial.AnglesDeg[j])
			}
		}
	}
}

// checkIntervalEnds fits st to p with profiles and checks that each
// angle's interval ends are crossings of the threshold: the directly
// minimised loss d(profile) degrees inside an end is at most the
// threshold, d outside it is above, and gonum's Nelder–Mead started there
// finds nothing lower than the threshold.
func checkIntervalEnds(t *testing.T, p *Problem, st Structure, d func(AngleProfile) float64) {
	t.Helper()
	set := Settings{Profile: true}
	r, err := Fit(p, st, set)
	if err != nil {
		t.Fatal(err)
	}
	k := 0
	for i, q := range r.e.params {
		if q.Kind != kindAngle {
			continue
		}
		pr := r.Profiles[k]
		k++
		pe := newEngine(p, cloneModelDeep(r.e.model), r.e.groups, r.e.famOf, r.e.layout, r.e.params)
		pf := newProfiler(r, p, pe, i, set.withDefaults(2, false))
		dd := d(pr)
		for _, end := range []struct{ at, inside float64 }{{pr.LoDeg, pr.LoDeg + dd}, {pr.HiDeg, pr.HiDeg - dd}} {
			outside := 2*end.at - end.inside
			_, lin := pf.at(Rad(end.inside), r.theta)
			thOut, lout := pf.at(Rad(outside), r.theta)
			if lin > pr.Threshold || lout <= pr.Threshold {
				t.Errorf("%s end %.5f°: loss %.10g at %.5f° (inside), %.10g at %.5f° (outside), threshold %.10g", pr.Name, end.at, lin, end.inside, lout, outside, pr.Threshold)
			}
			// Outside, a general-purpose minimiser (gonum's Nelder–Mead)
			// started where weft's stopped finds no loss at or below the
			// threshold either: the end is not an artefact of a stalled
			// minimisation.
			if nm := nelderMeadHeld(t, pe, thOut, i); nm <= pr.Threshold {
				t.Errorf("%s end %.5f°: Nelder–Mead reached %.10g at %.5f° (outside), at or below the threshold %.10g", pr.Name, end.at, nm, outside, pr.Threshold)
			}
		}
		t.Logf("%s: interval [%.5f, %.5f]°", pr.Name, pr.LoDeg, pr.HiDeg)
	}
}

// nelderMeadHeld minimises e's loss over every parameter but the held one,
// from th, with gonum's Nelder–Mead, and returns the lowest loss found.
func nelderMeadHeld(t *testing.T, e *engine, th []float64, held int) float64 {
	t.Helper()
	th = append([]float64(nil), th...)
	var rest []int
	for i := range th {
		if i != held {
			rest = append(rest, i)
		}
	}
	x0 := make([]float64, len(rest))
	for k, i := range rest {
		x0[k] = th[i]
	}
	loss := func(x []float64) float64 {
		for k, i := range rest {
			th[i] = e.params[i].project(x[k])
		}
		return e.eval(th, false)
	}
	res, err := optimize.Minimize(optimize.Problem{Func: loss}, x0, nil, &optimize.NelderMead{})
	if err != nil {
		t.Fatal(err)
	}
	return res.F
}

// TestGuidedProfileMatchesFullSweep: a profile of many points guided by the
// search subset's starts gives the profile the full sweep gives (the
// exhaustive computation on every point): the same 95 % interval and the
// same loss near the minimum, on a one-family specimen without shear (|α|)
// and on a sutured one (a full period of α). Not parallel: it sets
// profileGuideRows and profileFarMargins, which every profile reads.
func TestGuidedProfileMatchesFullSweep(t *testing.T) {
	if testing.Short() {
		t.Skip("fits 5 × 700 and 5 × 300 points twice each")
	}
	m := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 4}, Term{Shape: lookup("fib-expsq"), Weight: 60, Params: []float64{8}}, 30)
	for _, sutured := range []bool{false, true} {
		// A sutured specimen has four rows a point (P11, P22, P12, P21).
		points := 700
		if sutured {
			points = 300
		}
		s := synthSpecimen(t, m, synthOptions{maxStrain: 0.15, noise: 0.01, points: points, sutured: sutured})
		p, err := NewProblem(s, nil)
		if err != nil {
			t.Fatal(err)
		}
		if p.Rows() <= profileGuideRows {
			t.Fatalf("%d rows: not enough for a guided profile (%d)", p.Rows(), profileGuideRows)
		}
		st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
		guided, err := Fit(p, st, Settings{Profile: true})
		if err != nil {
			t.Fatal(err)
		}
		keep, far := profileGuideRows, profileFarMargins
		profileGuideRows, profileFarMargins = 1<<30, 0
		full, err := Fit(p, st, Settings{Profile: true})
		profileGuideRows, profileFarMargins = keep, far
		if err != nil {
			t.Fatal(err)
		}
		g, f := guided.Profiles[0], full.Profiles[0]
		if len(g.Loss) != len(f.Loss) {
			t.Fatalf("sutured %v: %d and %d profile points", sutured, len(g.Loss), len(f.Loss))
		}
		if math.Abs(g.LoDeg-f.LoDeg) > 0.01 || math.Abs(g.HiDeg-f.HiDeg) > 0.01 {
			t.Errorf("sutured %v: guided interval [%.4f, %.4f]°, full sweep [%.4f, %.4f]°", sutured, g.LoDeg, g.HiDeg, f.LoDeg, f.HiDeg)
		}
		margin := f.Threshold - full.Loss
		worst := 0.0
		for j := range g.Loss {
			d := math.Abs(g.Loss[j] - f.Loss[j])
			worst = math.Max(worst, d/f.Loss[j])
			if f.Loss[j] < full.Loss+10*margin && d > 1e-3*margin {
				t.Errorf("sutured %v: at %.2f° guided loss %.10g, full sweep %.10g (threshold margin %.3g)", sutured, g.AnglesDeg[j], g.Loss[j], f.Loss[j], margin)
			}
			if d > 1e-3*f.Loss[j] {
				t.Errorf("sutured %v: at %.2f° guided loss %.6g, full sweep %.6g", sutured, g.AnglesDeg[j], g.Loss[j], f.Loss[j])
			}
		}
		t.Logf("sutured %v: %d rows, interval guided [%.4f, %.4f]°, full [%.4f, %.4f]°; largest loss difference %.2g of the loss", sutured, p.Rows(), g.LoDeg, g.HiDeg, f.LoDeg, f.HiDeg, worst)
	}
}

// Without shear information the loss is even in a fibre angle about 0°
// and 90° (package documentation, Mirror symmetry), so its slope vanishes
// there and the refinement used to stop a hair from such a line with the
// other parameters short of their optimum: discovery compared such fits,
// and a profile met the lower point on the line, so the fit was refitted
// and profiled a second time. On data made by independent numerical
// integration (independent_test.go), with noise seeds for which that
// happened: one family along axis 2; a family spread in the plane about
// axis 2 (b = 3); two free families along the axes. Fitted with
// discovery's search settings and with profiles, every angle that ends
// within symmetrySnap of a line ends exactly on it (the fibres along axis
// 2 always do), gonum's Nelder–Mead (a general-purpose minimiser) started
// from the fit finds no lower loss over the other parameters, an angle on
// a line correlates with nothing and is named in no flag, and a profiled
// fit profiles once and meets no lower point.
func TestFitsSettleOnSymmetryLines(t *testing.T) {
	t.Parallel()
	fibre := func(f int) TermSpec { return TermSpec{Shape: lookup("fib-expsq"), Family: f} }
	matrix := TermSpec{Shape: lookup("i1-lin"), Family: -1}
	for _, c := range []struct {
		name  string
		mat   material
		st    Structure
		seeds []uint64
	}{
		{"one family at 90°", fibreMaterial(2, spreadFamily{90 * deg, -1, expSqFibre(20, 3)}),
			Structure{Layout: LayoutSingle, Terms: []TermSpec{matrix, fibre(0)}}, []uint64{1, 3}},
		{"one family spread about 90°", fibreMaterial(2, spreadFamily{90 * deg, 3, expSqFibre(20, 3)}),
			Structure{Layout: LayoutSingle, Planar: true, Terms: []TermSpec{matrix, fibre(0)}}, []uint64{1, 2}},
		{"two families at 0° and 90°", fibreMaterial(2, spreadFamily{0, -1, expSqFibre(20, 3)}, spreadFamily{90 * deg, -1, expSqFibre(10, 2)}),
			Structure{Layout: LayoutFree, Terms: []TermSpec{matrix, fibre(0), fibre(1)}}, []uint64{1, 2}},
	} {
		for _, seed := range c.seeds {
			spec := synthFrom(t, c.mat, synthOptions{noise: 0.02, points: 20, seed: seed})
			p, err := NewProblem(spec, nil)
			if err != nil {
				t.Fatal(err)
			}
			for _, set := range []Settings{{Tolerance: searchTolerance, MaxIterations: searchMaxIterations}, {Profile: true}} {
				r, err := Fit(p, c.st, set)
				if err != nil {
					t.Fatal(err)
				}
				what := fmt.Sprintf("%s, seed %d, profile %v", c.name, seed, set.Profile)
				checkOnSymmetryLines(t, what, r)
				if !set.Profile {
					continue
				}
				if r.sweeps != 1 {
					t.Errorf("%s: profiled %d times, want once", what, r.sweeps)
				}
				if _, l := r.profileMinimum(); l < r.Loss*(1-1e-9) {
					t.Errorf("%s: the profile met loss %.10g below the fit's %.10g", what, l, r.Loss)
				}
				// On the line an angle has no Wald interval; a profile
				// that bounds it determines it (README, status table).
				for _, pr := range r.Profiles {
					for _, est := range r.Estimates {
						if est.Name == pr.Name && est.onMirrorLine && !pr.NotDetermined && est.Status != StatusEstimated {
							t.Errorf("%s: %s on its symmetry line has the profile interval [%.2f°, %.2f°] but status %s", what, est.Name, pr.LoDeg, pr.HiDeg, est.Status)
						}
					}
				}
			}
		}
	}
}

// checkOnSymmetryLines checks a fit to data without shear information as
// TestFitsSettleOnSymmetryLines describes.
func checkOnSymmetryLines(t *testing.T, what string, r *Result) {
	t.Helper()
	var rest []int // the parameters Nelder–Mead varies
	online := map[string]bool{}
	for i, q := range r.e.params {
		w := math.Abs(wrapAngle(r.theta[i]))
		switch {
		case q.Kind != kindAngle || !q.Periodic:
			rest = append(rest, i)
		case onSymmetryLine(r.theta[i]):
			online[q.Name] = true
		case w < symmetrySnap || math.Pi/2-w < symmetrySnap:
			t.Errorf("%s: %s = %.9g°, within %.2g° of a line but not on it", what, q.Name, w/deg, symmetrySnap/deg)
		default:
			rest = append(rest, i)
		}
	}
	if q := r.e.params[0]; q.Kind == kindAngle && r.Structure.Layout == LayoutSingle && !online[q.Name] {
		t.Errorf("%s: %s = %.9g°, want 90° exactly", what, q.Name, math.Abs(wrapAngle(r.theta[0]))/deg)
	}
	th := append([]float64(nil), r.theta...)
	x0 := make([]float64, len(rest))
	for k, i := range rest {
		x0[k] = th[i]
	}
	loss := func(x []float64) float64 {
		for k, i := range rest {
			th[i] = r.e.params[i].project(x[k])
		}
		return r.e.eval(th, false)
	}
	res, err := optimize.Minimize(optimize.Problem{Func: loss}, x0, nil, &optimize.NelderMead{})
	if err != nil {
		t.Fatal(err)
	}
	if res.F < r.Loss*(1-1e-6) {
		t.Errorf("%s: Nelder–Mead reached %.10g, below the fit's %.10g", what, res.F, r.Loss)
	}
	// On a line the angle's slope is zero by symmetry: no correlation
	// with anything, no flag.
	for a, name := range r.CorrelationNames {
		for b, cr := range r.Correlation[a] {
			if (online[name] || online[r.CorrelationNames[b]]) && cr != 0 {
				t.Errorf("%s: correlation of %s with %s is %.3g, want 0", what, name, r.CorrelationNames[b], cr)
			}
		}
	}
	for _, f := range r.Flags {
		for name := range online {
			if strings.Contains(f, name+" ") {
				t.Errorf("%s: flag %q", what, f)
			}
		}
	}
}

// TestProfileConfidenceSetInPieces: the 95 % profile confidence set of an
// angle, {angle: profile ≤ threshold} (Venzon & Moolgavkar 1988), can be
// more than the interval about the optimum. One exponential family at 30°
// on a neo-Hookean matrix (Holzapfel, Gasser & Ogden 2000), sheared, 2 %
// noise, fitted with two free families: the second family is spare, and
// where the profiled family is moved well away from 30° the spare one
// takes its place, so the profile dips below the threshold again. A flag
// must say so (before, the interval alone was reported: [29.38°, 30.28°]
// on such a specimen, while the profile lay below the threshold from 40°
// to 136°); the dip is confirmed by gonum's Nelder–Mead, a general-purpose
// minimiser, from a minimum there.
func TestProfileConfidenceSetInPieces(t *testing.T) {
	m := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 5}, Term{Shape: lookup("fib-expsq"), Weight: 10, Params: []float64{20}}, 30)
	s := synthSpecimen(t, m, synthOptions{maxStrain: 0.15, noise: 0.02, points: 30, sutured: true, seed: 3})
	p, err := NewProblem(s, nil)
	if err != nil {
		t.Fatal(err)
	}
	st := freeExpSqPair()
	r, err := Fit(p, st, Settings{Profile: true})
	if err != nil {
		t.Fatal(err)
	}
	pieces := 0
	k := 0
	for i, q := range r.e.params {
		if q.Kind != kindAngle {
			continue
		}
		pr := r.Profiles[k]
		k++
		if pr.NotDetermined {
			continue
		}
		away := -1
		for j, a := range pr.AnglesDeg {
			d := math.Mod(a-pr.HiDeg+360, 180)
			if pr.Loss[j] <= pr.Threshold && d > 1e-9 && d < 180-(pr.HiDeg-pr.LoDeg)-1e-9 && (away < 0 || pr.Loss[j] < pr.Loss[away]) {
				away = j
			}
		}
		flagged := false
		for _, f := range r.Flags {
			flagged = flagged || strings.HasPrefix(f, pr.Name+": its loss profile also falls below the 95 % threshold")
		}
		if away < 0 {
			if flagged {
				t.Errorf("%s: flagged, but its profile lies above the threshold outside [%.2f, %.2f]°", pr.Name, pr.LoDeg, pr.HiDeg)
			}
			continue
		}
		pieces++
		if !flagged {
			t.Errorf("%s: profile %.8g ≤ threshold %.8g at %.1f°, outside its interval [%.2f, %.2f]°, and no flag says so (flags %q)", pr.Name, pr.Loss[away], pr.Threshold, pr.AnglesDeg[away], pr.LoDeg, pr.HiDeg, r.Flags)
		}
		pe := newEngine(p, cloneModelDeep(r.e.model), r.e.groups, r.e.famOf, r.e.layout, r.e.params)
		pf := newProfiler(r, p, pe, i, Settings{Profile: true}.withDefaults(2, false))
		// Started from the fit, and from the fit with the two families
		// exchanged (angle and stiffening: the other family takes this
		// one's place).
		swapped := append([]float64(nil), r.theta...)
		var angles, shapes []int
		for o, qo := range r.e.params {
			switch qo.Kind {
			case kindAngle:
				angles = append(angles, o)
			case kindShape:
				shapes = append(shapes, o)
			}
		}
		for _, pair := range [][]int{angles, shapes} {
			swapped[pair[0]], swapped[pair[1]] = r.theta[pair[1]], r.theta[pair[0]]
		}
		th, _ := pf.at(Rad(pr.AnglesDeg[away]), r.theta, swapped)
		if nm := nelderMeadHeld(t, pe, th, i); nm > pr.Threshold {
			t.Errorf("%s at %.1f°: Nelder–Mead's loss %.8g is above the threshold %.8g", pr.Name, pr.AnglesDeg[away], nm, pr.Threshold)
		}
	}
	if pieces == 0 {
		t.Fatalf("no profile lies below its threshold away from its interval: not the case this test is about (flags %q)", r.Flags)
	}
}

// A mirror pair with a learned axis is the same two families at (θ, β)
// and at (θ + 90°, 90° − β) (elementary geometry: θ + 90° ± (90° − β) is
// θ − β + 180° and θ + β), so its mean angle's profile comes back to the
// fitted loss 90° on, and its half angle's at 90° − β. That is the fitted
// model seen from its other bisector, not a second region the data leave
// open, and no flag may call it one (before the equivalence was known to
// the flag, it fired on both specimens here). A synthetic pair at
// 20° ± 30° on a neo-Hookean matrix (Holzapfel, Gasser & Ogden 2000), 2 %
// noise, without shear and sutured; the equivalence itself is checked on
// the fitted model's loss.
func TestPairProfileTwinIsNotAPiece(t *testing.T) {
	pair := &Model{Families: []Family{{Angle: 50 * deg}, {Angle: -10 * deg}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 5},
		{Shape: lookup("fib-expsq"), Family: 0, Weight: 8, Params: []float64{15}},
		{Shape: lookup("fib-expsq"), Family: 1, Weight: 8, Params: []float64{15}}}}
	for _, o := range []synthOptions{
		{maxStrain: 0.15, noise: 0.02, points: 30, seed: 2},
		{maxStrain: 0.15, noise: 0.02, points: 30, sutured: true, seed: 1},
	} {
		s := synthSpecimen(t, pair, o)
		p, err := NewProblem(s, nil)
		if err != nil {
			t.Fatal(err)
		}
		st := Structure{Layout: LayoutMirror, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
		r, err := Fit(p, st, Settings{Profile: true})
		if err != nil {
			t.Fatal(err)
		}
		th := append([]float64(nil), r.theta...)
		for i, q := range r.e.params {
			switch q.Name {
			case "mean_angle":
				th[i] += math.Pi / 2
			case "half_angle":
				th[i] = math.Pi/2 - th[i]
			}
		}
		pe := newEngine(p, cloneModelDeep(r.e.model), r.e.groups, r.e.famOf, r.e.layout, r.e.params)
		if l := pe.eval(th, false); math.Abs(l-r.Loss) > 1e-9*r.Loss {
			t.Fatalf("sutured %v: loss %.12g at (θ + 90°, 90° − β), %.12g at the fit: not the same model", o.sutured, l, r.Loss)
		}
		// Without shear information the pair at β ± θ has the same fibre
		// directions up to their signs, which the data cannot tell: a
		// flag for that region must say so.
		for _, f := range r.Flags {
			if strings.Contains(f, "also falls below the 95 % threshold") && (o.sutured || !strings.Contains(f, "up to their signs")) {
				t.Errorf("sutured %v: flag for the pair's own equivalent: %s", o.sutured, f)
			}
		}
	}
}

// TestProfileMemoChangesNothing: a profile serves a minimisation it has
// already run (the same start at the same angle, a cap it stopped within)
// from its memo instead of running it again; the profiles are bit for bit
// those with every minimisation run, at fewer loss evaluations. Two free
// families without shear information (|α| profiled, sweeps repeated) and
// one family spread in the plane. Not parallel: it sets
// profileMemo, which every profile reads.
func TestProfileMemoChangesNothing(t *testing.T) {
	if testing.Short() {
		t.Skip("profiles two forms twice each")
	}
	two := &Model{Families: []Family{{Angle: 10 * deg}, {Angle: 65 * deg}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 3},
		{Shape: lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{5}},
		{Shape: lookup("fib-expsq"), Family: 1, Weight: 8, Params: []float64{3}}}}
	spread := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 40, Params: []float64{3}}, -30)
	spread.Families[0].Planar, spread.Families[0].Concentration = true, 3
	for _, c := range []struct {
		name    string
		m       *Model
		layout  Layout
		sutured bool
	}{{"two families, no shear", two, LayoutFree, false}, {"spread family, no shear", spread, LayoutSingle, false}} {
		s := synthSpecimen(t, c.m, synthOptions{noise: 0.02, points: 20, sutured: c.sutured})
		p, err := NewProblem(s, nil)
		if err != nil {
			t.Fatal(err)
		}
		st := Structure{Layout: c.layout, Planar: c.m.Families[0].Planar}
		for _, tm := range c.m.Terms {
			st.Terms = append(st.Terms, TermSpec{Shape: tm.Shape, Family: tm.Family})
		}
		keep := profileMemo
		profileMemo = false
		every, err := Fit(p, st, Settings{Profile: true})
		profileMemo = keep
		if err != nil {
			t.Fatal(err)
		}
		memo, err := Fit(p, st, Settings{Profile: true})
		if err != nil {
			t.Fatal(err)
		}
		if len(memo.Profiles) != len(every.Profiles) {
			t.Fatalf("%s: %d and %d profiles", c.name, len(memo.Profiles), len(every.Profiles))
		}
		same := func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }
		n, m := 0, 0
		for k, g := range memo.Profiles {
			f := every.Profiles[k]
			n, m = n+f.Evaluations, m+g.Evaluations
			if !same(g.LoDeg, f.LoDeg) || !same(g.HiDeg, f.HiDeg) || len(g.Loss) != len(f.Loss) {
				t.Errorf("%s %s: [%.9f, %.9f]° with the memo, [%.9f, %.9f]° without", c.name, f.Name, g.LoDeg, g.HiDeg, f.LoDeg, f.HiDeg)
				continue
			}
			for j := range f.Loss {
				if !same(g.Loss[j], f.Loss[j]) {
					t.Errorf("%s %s at %g°: loss %.17g with the memo, %.17g without", c.name, f.Name, f.AnglesDeg[j], g.Loss[j], f.Loss[j])
				}
			}
		}
		if m >= n {
			t.Errorf("%s: %d evaluations with the memo, %d without", c.name, m, n)
		}
		t.Logf("%s: %d evaluations with the memo, %d without", c.name, m, n)
	}
}

// threeFamilies reads testdata/three-families-0-45-90.csv (synthetic: three
// ideal fibre families at 0°, 45° and 90° on a neo-Hookean matrix, no
// shear information, made by an independent script; testdata/README.md)
// and returns it with the form discovery chooses for it (issue 14): two
// free families spread in the plane, an I2 matrix, an exponential-squared
// first family and a second with an exponential and a recruitment term (13
// non-linear parameters and weights).
func threeFamilies(t *testing.T) (*Problem, Structure) {
	t.Helper()
	s, err := biaxial.ReadFile("../testdata/three-families-0-45-90.csv", biaxial.Options{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := NewProblem(s, nil)
	if err != nil {
		t.Fatal(err)
	}
	return p, Structure{Layout: LayoutFree, Planar: true, Terms: []TermSpec{
		{Shape: lookup("i2-exp"), Family: -1},
		{Shape: lookup("fib-expsq"), Family: 0},
		{Shape: lookup("fib-exp"), Family: 1},
		{Shape: lookup("fib-recruit"), Family: 1}}}
}

// threeFamiliesFrom fits the three-family specimen's chosen form from
// init without an angle scan and returns the problem, the fit and the
// settings it was fitted with.
func threeFamiliesFrom(t *testing.T, init map[string]float64) (*Problem, *Result, Settings) {
	t.Helper()
	p, st := threeFamilies(t)
	set := Settings{Init: init, NoScan: true}
	r, err := Fit(p, st, set)
	if err != nil {
		t.Fatal(err)
	}
	return p, r, set
}

// TestProfileRefitSettlesOnSymmetryLine: a refit from a profile's lower
// point exactly on 0° (no shear information) is settled on the line, as
// the first fit is (README, Angles on a symmetry line). Until 2026-12-05
// the refit of the three-family specimen of issue 14 stopped at 0.0003°:
// its angle's slope nearly zero there, the Wald interval came out
// ±4.45e6°, the angle was reported not-determined beside its bounded
// profile interval [0°, 17.5°], and six correlation flags (|r| up to
// 0.999) named it and the quantities tied to it.
func TestProfileRefitSettlesOnSymmetryLine(t *testing.T) {
	if testing.Short() {
		t.Skip("fits a 13-parameter spread form")
	}
	t.Parallel()
	// Where discovery's polish of this specimen started (its searched
	// model): the fit stops at a second minimum near 7°, and the angle's
	// profile meets a lower loss on 0°.
	p, r, set := threeFamiliesFrom(t, map[string]float64{"angle_1": 0.15899, "angle_2": 1.32724, "concentration_1": 2.777, "concentration_2": 200,
		"onset[fib-recruit@f2]": 1.05398, "spread[fib-recruit@f2]": 0.077805, "stiffening[fib-exp@f2]": 1.0999,
		"stiffening[fib-expsq@f1]": 5.1976, "stiffening[i2-exp]": 0})
	i := -1
	for j, q := range r.e.params {
		if q.Name == "angle_1" {
			i = j
		}
	}
	th := append([]float64(nil), r.theta...)
	th[i] = 0
	before := r.Loss
	if !r.refitFrom(p, r.e, set.withDefaults(2, true), th) {
		t.Fatalf("the refit from 0° did not replace the fit (loss %.10g)", before)
	}
	if r.theta[i] != 0 {
		t.Errorf("angle_1 refitted to %.3g°, not on 0°", Deg(r.theta[i]))
	}
	// On the line the angle has no Wald interval; its profile gives it one.
	for _, est := range r.Estimates {
		if est.Name == "angle_1" && !est.onMirrorLine {
			t.Errorf("angle_1 %.3g° is %s with the Wald interval [%.4g°, %.4g°]", est.Value, est.Status, est.Lo, est.Hi)
		}
	}
	for _, f := range r.Flags {
		if strings.Contains(f, "angle_1") {
			t.Errorf("flag: %s", f)
		}
	}
	t.Logf("loss %.10g -> %.10g, angle_1 %.4g°", before, r.Loss, Deg(r.theta[i]))
}

// TestProfileRefitKeptOnlyWhereItCounts: a refit from a profile's lower
// point replaces the fit (and is profiled again) only when it lowers the
// loss by at least profileRefitGain of the 95 % threshold's margin; a
// smaller gain moves no interval end by more than about 5e-4 of its
// half-width. Until 2026-12-05 any gain counted: discovery's polish of the
// three-family specimen of issue 14 profiled its chosen model four times,
// the last three refits lowering the loss by about 1e-9 of itself.
func TestProfileRefitKeptOnlyWhereItCounts(t *testing.T) {
	if testing.Short() {
		t.Skip("fits a 13-parameter spread form")
	}
	t.Parallel()
	// The chosen model's optimum, angle_1 on 0°.
	p, r, set := threeFamiliesFrom(t, map[string]float64{"angle_1": 0, "angle_2": 1.33343, "concentration_1": 2.2220, "concentration_2": 200,
		"onset[fib-recruit@f2]": 1.053481, "spread[fib-recruit@f2]": 0.078291, "stiffening[fib-exp@f2]": 1.0529,
		"stiffening[fib-expsq@f1]": 5.19895, "stiffening[i2-exp]": 0})
	// A start a little off the optimum, from which the refit may lower the
	// loss by round-off only.
	th := append([]float64(nil), r.theta...)
	for j, q := range r.e.params {
		if q.Kind == kindConcentration {
			th[j] *= 1 + 1e-4
		}
	}
	loss, theta := r.Loss, append([]float64(nil), r.theta...)
	if r.refitFrom(p, r.e, set.withDefaults(2, true), th) {
		t.Fatalf("a refit from next to the optimum replaced the fit: loss %.12g -> %.12g (margin %.3g)", loss, r.Loss, r.thresholdMargin())
	}
	if r.Loss != loss || !r.e.holdsDerivatives(theta) {
		t.Errorf("the fit moved: loss %.12g -> %.12g", loss, r.Loss)
	}
	// Far enough off, the refit counts.
	th = append([]float64(nil), r.theta...)
	for j, q := range r.e.params {
		if q.Name == "angle_1" {
			th[j] = Rad(6)
		}
	}
	r.theta, r.Loss = th, r.e.eval(th, true)
	worse := r.Loss
	if !r.refitFrom(p, r.e, set.withDefaults(2, true), append([]float64(nil), theta...)) {
		t.Errorf("a refit lowering the loss from %.10g to about %.10g did not replace the fit (margin %.3g)", worse, loss, r.thresholdMargin())
	}
}

// TestProfileReachesTheEndOfTheRange: without shear information only |α|
// is profiled, over [0°, 90°], and 90° is a natural end of an interval
// (README, Angle profiles: the ends of |α| ∈ [0°, 90°] are natural ends);
// a profile still below its threshold at the last grid angle before 90°
// reaches 90°. On a 4° grid the profile used to end at 88° (the step does
// not divide 90°): one family near 86° (2 % noise) was given [84.18°,
// 88°], and one near 88°, fitted at 88.52° beyond the last grid angle,
// [85.38°, 88.52°], its fitted angle as the interval's upper end.
func TestProfileReachesTheEndOfTheRange(t *testing.T) {
	t.Parallel()
	for _, a := range []float64{86, 88} {
		m := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 5, Params: []float64{3}}, a)
		p, err := NewProblem(synthSpecimen(t, m, synthOptions{noise: 0.02, points: 20}), nil)
		if err != nil {
			t.Fatal(err)
		}
		st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
		r, err := Fit(p, st, Settings{Profile: true, ProfileStepDeg: 4})
		if err != nil {
			t.Fatal(err)
		}
		pr := r.Profiles[0]
		last := len(pr.AnglesDeg) - 1
		if math.Abs(pr.AnglesDeg[last]-90) > 1e-9 || math.Abs(pr.AnglesDeg[0]+90) > 1e-9 {
			t.Errorf("family at %g°: the profile spans [%.4f°, %.4f°], not [−90°, 90°]", a, pr.AnglesDeg[0], pr.AnglesDeg[last])
		}
		if pr.Loss[last] <= pr.Threshold && pr.HiDeg != 90 {
			t.Errorf("family at %g°: the profile is below its threshold at 90° (%.8g ≤ %.8g) but the interval is [%.4f°, %.4f°]", a, pr.Loss[last], pr.Threshold, pr.LoDeg, pr.HiDeg)
		}
		if pr.HiDeg != 90 {
			t.Errorf("family at %g° (fitted %.3f°): interval [%.4f°, %.4f°], want it to reach 90°", a, pr.OptimumDeg, pr.LoDeg, pr.HiDeg)
		}
	}
}

// TestProfileWorkBound: a sweep stops at its bound of work (profileWork
// loss evaluations per grid angle, checked between rounds) and then says
// so: a profile stopped while its last round still lowered it is
// Unresolved and flagged, since it may lie above the true profile and its
// interval may be too narrow. With the default bound the same profile
// converges unflagged. Not parallel: it sets profileWork.
func TestProfileWorkBound(t *testing.T) {
	two := &Model{Families: []Family{{Angle: 10 * deg}, {Angle: 65 * deg}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 3},
		{Shape: lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{5}},
		{Shape: lookup("fib-expsq"), Family: 1, Weight: 8, Params: []float64{3}}}}
	p, err := NewProblem(synthSpecimen(t, two, synthOptions{noise: 0.02, points: 20}), nil)
	if err != nil {
		t.Fatal(err)
	}
	st := Structure{Layout: LayoutFree}
	for _, tm := range two.Terms {
		st.Terms = append(st.Terms, TermSpec{Shape: tm.Shape, Family: tm.Family})
	}
	full, err := Fit(p, st, Settings{Profile: true})
	if err != nil {
		t.Fatal(err)
	}
	keep := profileWork
	profileWork = 1
	bound, err := Fit(p, st, Settings{Profile: true})
	profileWork = keep
	if err != nil {
		t.Fatal(err)
	}
	stopped := 0
	for k, pr := range full.Profiles {
		b := bound.Profiles[k]
		if pr.Unresolved {
			t.Errorf("%s: unresolved under the default bound (%d evaluations)", pr.Name, pr.Evaluations)
		}
		if b.Evaluations > pr.Evaluations {
			t.Errorf("%s: %d evaluations under a bound of one per grid angle, %d without", pr.Name, b.Evaluations, pr.Evaluations)
		}
		if !b.Unresolved {
			continue
		}
		stopped++
		flagged := false
		for _, f := range bound.Flags {
			flagged = flagged || strings.HasPrefix(f, pr.Name+": its loss profile was still falling")
		}
		if !flagged && !b.NotDetermined {
			t.Errorf("%s: unresolved but not flagged: %q", pr.Name, bound.Flags)
		}
		t.Logf("%s: stopped at %d evaluations (%d to converge); interval [%.4f°, %.4f°] against [%.4f°, %.4f°]", pr.Name, b.Evaluations, pr.Evaluations, b.LoDeg, b.HiDeg, pr.LoDeg, pr.HiDeg)
	}
	if stopped == 0 {
		t.Errorf("no profile needed a second round: the case does not test the bound")
	}
}

// TestProfileIntervalsAgreeWithScipy: profile intervals of the chosen
// models of two synthetic specimens made by independent scripts
// (testdata/README.md) against an independent recomputation with SciPy
// 1.10 (the profile audit of 2026-12-05): stresses, weighting and
// threshold written from the README's definitions, not from weft's code;
// at each trial angle every other non-linear parameter re-minimised by
// scipy.optimize.least_squares (trf, tolerances 1e-12, from the fit's
// optimum) with the weights by scipy.optimize.nnls; the ends found by
// scipy.optimize.brentq to 1e-6°. SciPy's ends agree with weft's to
// 6e-5°; the tolerance is the 0.002° to which weft places an end.
func TestProfileIntervalsAgreeWithScipy(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		file  string
		terms []TermSpec
		ends  map[string][2]float64 // SciPy's interval of each angle, degrees
	}{
		{"two-families-10-70.csv", []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}, {Shape: lookup("fib-expsq"), Family: 1}},
			map[string][2]float64{"angle_1": {9.91885, 10.50232}, "angle_2": {69.96533, 70.28695}}},
		{"one-family-0-demiray.csv", []TermSpec{{Shape: lookup("ps-pos"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}, {Shape: lookup("i5-quad"), Family: 0}},
			map[string][2]float64{"angle": {11.99228, 13.82455}}},
	} {
		s, err := biaxial.ReadFile("../testdata/"+c.file, biaxial.Options{})
		if err != nil {
			t.Fatal(err)
		}
		p, err := NewProblem(s, nil)
		if err != nil {
			t.Fatal(err)
		}
		layout := LayoutSingle
		if len(c.ends) == 2 {
			layout = LayoutFree
		}
		r, err := Fit(p, Structure{Layout: layout, Terms: c.terms}, Settings{Profile: true})
		if err != nil {
			t.Fatal(err)
		}
		for _, pr := range r.Profiles {
			want, ok := c.ends[pr.Name]
			if !ok {
				t.Fatalf("%s: no reference for %s", c.file, pr.Name)
			}
			if math.Abs(pr.LoDeg-want[0]) > 0.002 || math.Abs(pr.HiDeg-want[1]) > 0.002 {
				t.Errorf("%s %s: [%.5f°, %.5f°], SciPy [%.5f°, %.5f°]", c.file, pr.Name, pr.LoDeg, pr.HiDeg, want[0], want[1])
			}
		}
	}
}

// TestThreeFamilyProfileIsBoundedAndAgreesWithScipy: the chosen model of
// the three-family specimen of issue 14 (threeFamilies: 13 parameters,
// two spread families, angular integration in every evaluation) is
// profiled within its bound of work, counted in loss evaluations, its
// profiles converged; and its interval ends agree with an independent
// recomputation with SciPy 1.10 (the profile audit of 2026-12-05: stresses,
// in-plane spread on 900 directions, weighting and threshold written from
// the README, not from weft's code; every other non-linear parameter
// re-minimised by scipy.optimize.least_squares (trf) from weft's grid
// neighbours' parameters, the weights by scipy.optimize.nnls; the end by
// scipy.optimize.brentq to 0.005°) to within 0.05°, 0.25 % of the
// intervals' widths: SciPy's end of angle_2 is 69.8166°, weft's 69.848°,
// and of angle_1 17.478°, weft's 17.496°, since a profile point is a local minimisation capped at 40
// iterations and on this form lies up to about 1e-6 of the loss above
// SciPy's (SciPy's own minimisations scatter by about as much there).
func TestThreeFamilyProfileIsBoundedAndAgreesWithScipy(t *testing.T) {
	if testing.Short() {
		t.Skip("profiles a 13-parameter spread form")
	}
	t.Parallel()
	p, st := threeFamilies(t)
	init := map[string]float64{"angle_1": 0, "angle_2": 1.33343, "concentration_1": 2.2220, "concentration_2": 200,
		"onset[fib-recruit@f2]": 1.053481, "spread[fib-recruit@f2]": 0.078291, "stiffening[fib-exp@f2]": 1.0529,
		"stiffening[fib-expsq@f1]": 5.19895, "stiffening[i2-exp]": 0}
	r, err := Fit(p, st, Settings{Init: init, NoScan: true, Profile: true})
	if err != nil {
		t.Fatal(err)
	}
	scipy := map[string]float64{"angle_1": 17.478, "angle_2": 69.8166}
	for _, pr := range r.Profiles {
		grid := (len(pr.AnglesDeg) + 1) / 2 // mirrored: |α| on [0°, 90°]
		if pr.Unresolved || pr.Evaluations > profileWork*grid {
			t.Errorf("%s: %d loss evaluations over %d grid angles (bound %d), unresolved %v", pr.Name, pr.Evaluations, grid, profileWork*grid, pr.Unresolved)
		}
		end := pr.HiDeg
		if pr.Name == "angle_2" {
			end = pr.LoDeg
		}
		if math.Abs(end-scipy[pr.Name]) > 0.05 {
			t.Errorf("%s: interval [%.4f°, %.4f°], SciPy's end at %.4f°", pr.Name, pr.LoDeg, pr.HiDeg, scipy[pr.Name])
		}
		t.Logf("%s: [%.4f°, %.4f°] (SciPy's end %.4f°), %d evaluations over %d grid angles", pr.Name, pr.LoDeg, pr.HiDeg, scipy[pr.Name], pr.Evaluations, grid)
	}
}
