package aniso

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/optimize"
)

func hgoStructure() Structure {
	return Structure{Layout: LayoutMirror, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
}

func angleErr(a, b float64) float64 {
	d := math.Mod(math.Abs(a-b), 180)
	return math.Min(d, 180-d)
}

func within(t *testing.T, name string, got, want, rel float64) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.5g, true value %.5g (tolerance %.0f %%)", name, got, want, rel*100)
	}
}

// Recovery of the media and adventitia parameter sets of Holzapfel, Gasser
// & Ogden 2000 (J Elasticity 61:1–48; values quoted from memory) from
// synthetic pure-biaxial data with 1 % noise: fibre angle within 2°, weights
// within 10 %.
func TestRecoverHGO2000(t *testing.T) {
	for _, c := range []struct {
		name            string
		c, k1, k2, beta float64
		strain          float64
	}{
		{"media", 3.0, 2.3632, 0.8393, 29, 0.3},
		{"adventitia", 0.3, 0.562, 0.7112, 62, 0.3},
	} {
		t.Run(c.name, func(t *testing.T) {
			truth := hgoModel(c.c, c.k1, c.k2, c.beta)
			spec := synthSpecimen(t, truth, synthOptions{noise: 0.01, maxStrain: c.strain})
			p, err := NewProblem(spec, nil)
			if err != nil {
				t.Fatal(err)
			}
			res, err := Fit(p, hgoStructure(), Settings{})
			if err != nil {
				t.Fatal(err)
			}
			for f, fam := range res.Model.Families {
				if e := angleErr(math.Abs(fam.Angle/deg), c.beta); e > 2 {
					t.Errorf("family %d: |angle| %.2f°, true %.1f°", f, math.Abs(fam.Angle/deg), c.beta)
				}
			}
			within(t, "matrix weight", res.Weights[0], c.c/2, 0.10)
			within(t, "fibre weight k1", res.Weights[1], c.k1, 0.10)
			if res.SignKnown {
				t.Error("sign reported known without shear information")
			}
			t.Logf("%s: %s, angles %.2f/%.2f, iterations %d, %v", c.name, res.Summary(), res.Model.Families[0].Angle/deg, res.Model.Families[1].Angle/deg, res.Iterations, res.Elapsed)
		})
	}
}

// An invented one-family material (neo-Hookean matrix, exponential-of-square
// fibres at −35°) tested on sutures: the specimen shears freely, markers
// give F12 and F21, and the measured shear stresses are zero. The shear
// information identifies the angle's sign (package documentation, Mirror
// symmetry).
func TestRecoverSignFromSuturedShear(t *testing.T) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 4}, Term{Shape: lookup("fib-expsq"), Weight: 25, Params: []float64{6}}, -35)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.01, sutured: true, maxStrain: 0.2})
	sheared := false
	for _, pt := range spec.Protocols[0].Points {
		if math.Abs(pt.F[1])+math.Abs(pt.F[2]) > 1e-3 {
			sheared = true
		}
	}
	if !sheared {
		t.Fatal("the sutured specimen did not shear; the test would not test anything")
	}
	p, err := NewProblem(spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
	res, err := Fit(p, st, Settings{Profile: true})
	if err != nil {
		t.Fatal(err)
	}
	got := res.Model.Families[0].Angle / deg
	if angleErr(got, -35) > 2 {
		t.Errorf("angle %.2f°, true −35° (sign must be recovered)", got)
	}
	if !res.SignKnown {
		t.Error("sign not reported as known despite shear information")
	}
	within(t, "matrix weight", res.Weights[0], 4, 0.10)
	within(t, "fibre weight", res.Weights[1], 25, 0.10)
	if len(res.Profiles) != 1 || !res.Profiles[0].Closed || res.Profiles[0].LoDeg > -35 || res.Profiles[0].HiDeg < -35 {
		t.Errorf("profile interval %+v should be closed and contain −35°", res.Profiles)
	}
}

// Invented material (Demiray-type matrix, one exponential fibre family at
// 50°): a protocol left out of the fit is predicted within 3 % normalised
// RMSE, and the angle is recovered within 2°.
func TestLeaveOneProtocolOutPrediction(t *testing.T) {
	truth := oneFamily(Term{Shape: lookup("i1-exp"), Weight: 1.2, Params: []float64{2.5}}, Term{Shape: lookup("fib-exp"), Weight: 40, Params: []float64{9}}, 50)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.01, maxStrain: 0.22})
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-exp"), Family: -1}, {Shape: lookup("fib-exp"), Family: 0}}}
	for leave := range spec.Protocols {
		var keep []int
		for i := range spec.Protocols {
			if i != leave {
				keep = append(keep, i)
			}
		}
		p, err := NewProblem(spec, keep)
		if err != nil {
			t.Fatal(err)
		}
		res, err := Fit(p, st, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		if e := angleErr(res.Model.Families[0].Angle/deg, 50); e > 2 {
			t.Errorf("leaving out %s: |angle| %.2f°, true 50°", spec.Protocols[leave].Label, res.Model.Families[0].Angle/deg)
		}
		held, err := NewProblem(spec, []int{leave})
		if err != nil {
			t.Fatal(err)
		}
		pred, err := Predict(held, res.Model)
		if err != nil {
			t.Fatal(err)
		}
		for _, m := range Metrics(held, pred) {
			if !m.NRMSEDefined || m.NRMSE > 0.03 {
				t.Errorf("held-out %s axis %s: NRMSE %.4f > 3 %%", m.Protocol, m.Component, m.NRMSE)
			}
		}
	}
}

// Robustness (never a panic or NaN for data a parser accepts): all-zero
// stress, a single protocol, negative stresses, stretches where an
// exponential term overflows, and a fibre term the data cannot activate.
func TestFitRobustness(t *testing.T) {
	t.Parallel()
	nh := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 10, Params: []float64{2}}, 20)
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
	check := func(name string, spec func() *Problem, st Structure) {
		t.Run(name, func(t *testing.T) {
			p := spec()
			res, err := Fit(p, st, Settings{Profile: true})
			if err != nil {
				// Acceptable only as a message that says what to try.
				if !strings.Contains(err.Error(), "try") {
					t.Fatalf("error without advice: %v", err)
				}
				return
			}
			if math.IsNaN(res.Loss) {
				t.Fatal("NaN loss")
			}
			for _, e := range res.Estimates {
				if math.IsNaN(e.Value) {
					t.Errorf("NaN estimate %s", e.Name)
				}
			}
			for _, m := range res.Metrics {
				if math.IsNaN(m.R2) || math.IsNaN(m.RMSE) {
					t.Errorf("NaN metric %+v", m)
				}
			}
		})
	}
	mk := func(mod func(*Model), o synthOptions, edit func(s *Problem)) func() *Problem {
		return func() *Problem {
			m := cloneModel(nh)
			if mod != nil {
				mod(m)
			}
			spec := synthSpecimen(t, m, o)
			p, err := NewProblem(spec, nil)
			if err != nil {
				t.Fatal(err)
			}
			if edit != nil {
				edit(p)
			}
			return p
		}
	}
	check("all-zero stress", mk(func(m *Model) { m.Terms[0].Weight, m.Terms[1].Weight = 0, 0 }, synthOptions{}, nil), st)
	check("one protocol", mk(nil, synthOptions{ratios: [][2]float64{{1, 1}}}, nil), st)
	check("negative stresses", mk(nil, synthOptions{}, func(p *Problem) {
		for i := range p.Target {
			p.Target[i] -= 0.5 * p.RowWeight[i] * 10
			p.Measured[i] -= 5
		}
	}), st)
	check("overflow at large stretch", mk(nil, synthOptions{maxStrain: 3}, nil),
		Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}, {Shape: lookup("i1-exp"), Family: -1}}})
	check("fibre never stretched", mk(func(m *Model) { m.Terms[1].Weight = 0 }, synthOptions{ratios: [][2]float64{{0, 1}, {0, 0.5}}}, func(p *Problem) {}),
		Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-quad"), Family: 0}}})
}

// The same input gives the same output, bit for bit.
func TestFitDeterministic(t *testing.T) {
	truth := hgoModel(3, 2.3632, 0.8393, 29)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.01})
	var first *Result
	for i := 0; i < 3; i++ {
		p, _ := NewProblem(spec, nil)
		res, err := Fit(p, hgoStructure(), Settings{Profile: true})
		if err != nil {
			t.Fatal(err)
		}
		if first == nil {
			first = res
			continue
		}
		if res.Loss != first.Loss || res.Weights[0] != first.Weights[0] || res.Model.Families[0].Angle != first.Model.Families[0].Angle {
			t.Fatalf("run %d differs: %v vs %v", i, res.Summary(), first.Summary())
		}
		for j := range res.Profiles[0].Loss {
			if res.Profiles[0].Loss[j] != first.Profiles[0].Loss[j] {
				t.Fatal("profiles differ between runs")
			}
		}
	}
}

// benchProblem is 5 protocols × 100 points of an invented one-family material.
func benchProblem(b testing.TB, m *Model) *Problem {
	spec := synthSpecimen(b, m, synthOptions{noise: 0.01, points: 100})
	p, err := NewProblem(spec, nil)
	if err != nil {
		b.Fatal(err)
	}
	return p
}

// BenchmarkFitOneFamily: neo-Hookean + one exponential fibre family with
// free angle, 5 protocols × 100 points (target ≤ 20 ms).
func BenchmarkFitOneFamily(b *testing.B) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{5}}, 40)
	p := benchProblem(b, truth)
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Fit(p, st, Settings{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFitTwoFreeFamilies: neo-Hookean + exponential fibres in two
// families at free angles (invented: 10° and 80°), 5 × 100 points (target
// ≤ 200 ms).
func BenchmarkFitTwoFreeFamilies(b *testing.B) {
	truth := &Model{Families: []Family{{Angle: 10 * deg}, {Angle: 80 * deg}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 3},
		{Shape: lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{5}},
		{Shape: lookup("fib-expsq"), Family: 1, Weight: 8, Params: []float64{3}}}}
	p := benchProblem(b, truth)
	st := freeExpSqPair()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Fit(p, st, Settings{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFitOneFamilyWithProfile adds the angle loss profile.
func BenchmarkFitOneFamilyWithProfile(b *testing.B) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{5}}, 40)
	p := benchProblem(b, truth)
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Fit(p, st, Settings{Profile: true}); err != nil {
			b.Fatal(err)
		}
	}
}

// generalPurposeLoss fits the same one-family model with a general-purpose
// optimiser from a reference library (gonum/optimize BFGS on all
// parameters, weights through w = u² to keep them ≥ 0) from 8 starts and
// returns the best weighted loss.
func generalPurposeLoss(t testing.TB, p *Problem) float64 {
	sh1, sh2 := lookup("i1-lin"), lookup("fib-expsq")
	m := &Model{Families: []Family{{}}, Terms: []Term{{Shape: sh1, Family: -1}, {Shape: sh2, Family: 0, Params: []float64{1}}}}
	var c Columns
	loss := func(x []float64) float64 {
		m.Terms[0].Weight, m.Terms[1].Weight = x[0]*x[0], x[1]*x[1]
		m.Families[0].Angle = x[2]
		m.Terms[1].Params[0] = math.Min(1000, math.Abs(x[3]))
		p.Data.Fill(m, &c, false)
		s := 0.0
		for r := range p.Target {
			v := m.Terms[0].Weight*c.A[r] + m.Terms[1].Weight*c.A[c.Rows+r] - p.Target[r]
			s += v * v
		}
		if math.IsNaN(s) {
			return math.Inf(1)
		}
		return s
	}
	best := math.Inf(1)
	for s := 0; s < 8; s++ {
		x0 := []float64{1, 2, float64(s)*math.Pi/8 - math.Pi/2 + 0.1, 1 + float64(s%4)}
		prob := optimize.Problem{Func: loss, Grad: func(g, x []float64) { fd.Gradient(g, loss, x, nil) }}
		res, err := optimize.Minimize(prob, x0, &optimize.Settings{MajorIterations: 400}, &optimize.BFGS{})
		if res != nil && (err == nil || res.F < best) {
			best = math.Min(best, res.F)
		}
	}
	return best
}

// weft's variable-projection fit reaches a loss at least as low as a
// general-purpose optimiser from 8 starts (gonum/optimize, a reference
// library) on the same model and data.
func TestFitAtLeastAsGoodAsGeneralPurpose(t *testing.T) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{5}}, 40)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.01})
	p, _ := NewProblem(spec, nil)
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
	res, err := Fit(p, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	gp := generalPurposeLoss(t, p)
	if res.Loss > gp*(1+1e-6) {
		t.Errorf("weft loss %.8g > general-purpose optimiser's %.8g", res.Loss, gp)
	}
	t.Logf("weft %.8g (%v), BFGS from 8 starts %.8g", res.Loss, res.Elapsed, gp)
}

// BenchmarkGeneralPurposeOneFamily times the general-purpose comparison fit
// (gonum/optimize BFGS from 8 starts) for the README's comparison.
func BenchmarkGeneralPurposeOneFamily(b *testing.B) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{5}}, 40)
	p := benchProblem(b, truth)
	for i := 0; i < b.N; i++ {
		generalPurposeLoss(b, p)
	}
}

// A model without non-linear parameters (neo-Hookean) fits exactly by
// non-negative least squares: the weight equals the closed-form linear
// least-squares solution w = Σ a·y / Σ a·a (common practice).
func TestFitLinearOnly(t *testing.T) {
	truth := &Model{Terms: []Term{{Shape: lookup("i1-lin"), Family: -1, Weight: 4}}}
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.02})
	p, _ := NewProblem(spec, nil)
	st, err := PresetStructure("neo-hookean")
	if err != nil {
		t.Fatal(err)
	}
	res, err := Fit(p, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	// The closed form on the physical rows: a = RowWeight × column.
	w := make([]float64, len(p.RowWeight))
	copy(w, p.RowWeight)
	F := make([][4]float64, p.Data.Points())
	for i := range F {
		F[i] = p.Data.Kinematics(i).F
	}
	d, err := NewDataset(F, p.Output, w)
	if err != nil {
		t.Fatal(err)
	}
	var c Columns
	d.Fill(res.Model, &c, false)
	num, den := 0.0, 0.0
	for r, m := range p.Measured {
		y := p.RowWeight[r] * m
		num += c.A[r] * y
		den += c.A[r] * c.A[r]
	}
	if math.Abs(res.Weights[0]-num/den) > 1e-9*num/den {
		t.Errorf("weight %.12g, closed-form least squares %.12g", res.Weights[0], num/den)
	}
}

// BenchmarkDiscoverOneFamily is the full default discovery of the same
// specimen as BenchmarkGeneralPurposeOneFamily (5 × 100 points; the search
// uses 60 per protocol), on all cores: the README reports the ratio of the
// two, discovery over one classical fit of a fixed model.
func BenchmarkDiscoverOneFamily(b *testing.B) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{5}}, 40)
	p := benchProblem(b, truth)
	for i := 0; i < b.N; i++ {
		if _, err := Discover(p, DiscoverSettings{}); err != nil {
			b.Fatal(err)
		}
	}
}

// historyProblem is the small sutured two-family specimen (invented: 10°
// and 65°) on which engines are checked against fresh ones.
func historyProblem(t *testing.T) *Problem {
	t.Helper()
	two := &Model{Families: []Family{{Angle: 10 * deg}, {Angle: 65 * deg}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 2},
		{Shape: lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{3}},
		{Shape: lookup("fib-expsq"), Family: 1, Weight: 10, Params: []float64{2}}}}
	spec := synthSpecimen(t, two, synthOptions{noise: 0.01, points: 15, sutured: true})
	p, err := NewProblem(spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// An engine's loss at θ does not depend on what it evaluated before: the
// columns and cross products it keeps between evaluations (static terms,
// families that did not move, fibre kinematics at unchanged angles) equal
// what a fresh engine computes, bit for bit. The coarse scan of two free
// families and the profiles running their halves on separate engines rely
// on it. Checked on the scan dictionary of two free families (the inner
// loop holding one family, without derivatives) and on a fitted form
// evaluated with derivatives in an arbitrary order.
func TestEngineLossIndependentOfHistory(t *testing.T) {
	p := historyProblem(t)
	st := canonical(Structure{Layout: LayoutFree, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1},
		{Shape: lookup("fib-expsq"), Family: 0}, {Shape: lookup("fib-exp"), Family: 0},
		{Shape: lookup("fib-expsq"), Family: 1}, {Shape: lookup("fib-exp"), Family: 1}}})
	_, _, _, params := build(st)
	var angles []param
	for _, q := range params {
		if q.Kind == kindAngle {
			angles = append(angles, q)
		}
	}
	dm, dg, dfam, _ := dictionary(st)
	scan := newEngine(p, dm, dg, dfam, st.Layout, angles)
	scan.skipOverflow = true
	grid := []float64{-1.2, -0.4, 0.3, 1.1}
	for _, a := range grid {
		for _, b := range grid {
			got := scan.eval([]float64{a, b}, false)
			m2, g2, f2, _ := dictionary(st)
			fresh := newEngine(p, m2, g2, f2, st.Layout, angles)
			fresh.skipOverflow = true
			if want := fresh.eval([]float64{a, b}, false); got != want {
				t.Errorf("scan at (%.2f, %.2f): loss %.17g after earlier evaluations, %.17g fresh", a, b, got, want)
			}
		}
	}
	res, err := Fit(p, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	thetas := [][]float64{append([]float64(nil), res.theta...), append([]float64(nil), res.theta...), append([]float64(nil), res.theta...)}
	thetas[1][0] += 0.1
	thetas[2][len(thetas[2])-1] *= 1.1
	checkEngineHistory(t, p, res, thetas, "fitted form")
	// The whole catalogue on one family: non-negativity keeps most terms at
	// zero weight and which ones changes between the points, so an engine
	// that fills derivatives only for the terms active at its previous
	// evaluation must complete them for the others.
	full, err := Fit(p, fullStructure(DiscoverSettings{}.withDefaults().Shapes, Structure{Layout: LayoutSingle}), Settings{})
	if err != nil {
		t.Fatal(err)
	}
	fth := [][]float64{append([]float64(nil), full.theta...), append([]float64(nil), full.theta...), append([]float64(nil), full.theta...)}
	fth[1][0] += 0.4
	for i := 1; i < len(fth[2]); i++ {
		fth[2][i] *= 1.3
	}
	checkEngineHistory(t, p, full, fth, "whole catalogue")
}

// An evaluation with derivatives keeps the columns of an isotropic term
// whose shape parameters have not moved since its last complete fill with
// derivatives (engine.filledWith), and only then: after an evaluation that
// overflowed and so stopped before its cross products, a term it refilled
// is filled again. On the whole catalogue on one family: θ1 moves one
// isotropic term's parameter and sends another's far beyond its bound so
// that its column overflows; θ2 brings the second back and keeps the
// first's new value (filled again: θ1 did not complete); θ3 moves the
// angle only (the first's column kept). At each point the loss, the scaled
// cross products and the derivative vectors equal a fresh engine's, bit
// for bit.
func TestEngineKeepsIsotropicColumnsOnlyWhileValid(t *testing.T) {
	p := historyProblem(t)
	full, err := Fit(p, fullStructure(DiscoverSettings{}.withDefaults().Shapes, Structure{Layout: LayoutSingle}), Settings{})
	if err != nil {
		t.Fatal(err)
	}
	// Two isotropic shaped parameters: one to move, one to overflow.
	var iso []int
	for i, q := range full.e.params {
		if q.Kind == kindShape && full.e.isoShaped[q.Group] {
			iso = append(iso, i)
		}
	}
	if len(iso) < 3 {
		t.Fatalf("%d isotropic shape parameters in the catalogue, want at least 3", len(iso))
	}
	moved, blown := iso[0], iso[1]
	th0 := append([]float64(nil), full.theta...)
	th1 := append([]float64(nil), th0...)
	th1[moved] *= 1.25
	th1[blown] = 1e6 // e^(1e6·(I − 3)) overflows at any stretch
	th2 := append([]float64(nil), th1...)
	th2[blown] = th0[blown]
	th3 := append([]float64(nil), th2...)
	for i, q := range full.e.params {
		if q.Kind == kindAngle {
			th3[i] += 0.1
		}
	}
	e := full.profileEngine(p)
	for k, th := range [][]float64{th0, th1, th2, th3} {
		got := e.eval(th, true)
		fresh := full.profileEngine(p)
		want := fresh.eval(th, true)
		if k == 1 && !math.IsInf(want, 1) {
			t.Fatalf("θ1: loss %g, want +Inf (the overflowing column)", want)
		}
		if math.Float64bits(got) != math.Float64bits(want) {
			t.Errorf("θ%d: loss %.17g after earlier evaluations, %.17g fresh", k, got, want)
		}
		if math.IsInf(want, 1) {
			continue
		}
		if kept := e.keep[full.e.params[moved].Group]; kept != (k == 3) {
			t.Errorf("θ%d: the moved term's column kept %v, want %v", k, kept, k == 3)
		}
		for i := range fresh.G {
			if math.Float64bits(e.G[i]) != math.Float64bits(fresh.G[i]) {
				t.Fatalf("θ%d: cross product %d is %.17g after earlier evaluations, %.17g fresh", k, i, e.G[i], fresh.G[i])
			}
		}
		for i := range fresh.v {
			for row := range fresh.v[i] {
				if math.Float64bits(e.v[i][row]) != math.Float64bits(fresh.v[i][row]) {
					t.Fatalf("θ%d: derivative %d row %d is %.17g after earlier evaluations, %.17g fresh", k, i, row, e.v[i][row], fresh.v[i][row])
				}
			}
		}
	}
}

// checkEngineHistory evaluates r's form with derivatives at thetas in an
// arbitrary order on one engine and compares the loss and the derivative
// vectors, bit for bit, with a fresh engine's at each point.
func checkEngineHistory(t *testing.T, p *Problem, r *Result, thetas [][]float64, what string) {
	t.Helper()
	e := r.profileEngine(p)
	active := map[string]bool{}
	for _, k := range []int{1, 0, 2, 0, 1, 2} {
		got := e.eval(thetas[k], true)
		fresh := r.profileEngine(p)
		if want := fresh.eval(thetas[k], true); got != want {
			t.Errorf("%s at θ%d: loss %.17g after earlier evaluations, %.17g fresh", what, k, got, want)
		}
		active[fmt.Sprint(e.activeGroups())] = true
		for i := range fresh.v {
			for row := range fresh.v[i] {
				if math.Float64bits(e.v[i][row]) != math.Float64bits(fresh.v[i][row]) {
					t.Fatalf("%s at θ%d: derivative %d row %d is %.17g after earlier evaluations, %.17g fresh", what, k, i, row, e.v[i][row], fresh.v[i][row])
				}
			}
		}
	}
	t.Logf("%s: %d different active sets", what, len(active))
}

// A fit takes its result from the state its minimiser left at the optimum
// instead of evaluating there again; evaluating again gives the same
// numbers bit for bit (loss, weights, estimates and their intervals).
func TestSettleWithoutReevaluation(t *testing.T) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{5}}, 40)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.01, points: 20})
	p, err := NewProblem(spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}, {Shape: lookup("fib-exp"), Family: 0}}}
	res, err := Fit(p, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	if !res.e.holdsDerivatives(res.theta) {
		t.Fatal("the engine does not hold the optimum after the fit")
	}
	again := *res
	again.e.derivsAt = false
	again.settle(p, again.e, append([]float64(nil), res.theta...))
	same := func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }
	if !same(again.Loss, res.Loss) {
		t.Errorf("loss %.17g evaluated again, %.17g from the minimiser's state", again.Loss, res.Loss)
	}
	for i := range res.Weights {
		if !same(again.Weights[i], res.Weights[i]) {
			t.Errorf("weight %d: %.17g evaluated again, %.17g", i, again.Weights[i], res.Weights[i])
		}
	}
	if len(again.Estimates) != len(res.Estimates) {
		t.Fatalf("%d estimates evaluated again, %d", len(again.Estimates), len(res.Estimates))
	}
	for i, e := range res.Estimates {
		a := again.Estimates[i]
		if !same(a.Value, e.Value) || !same(a.StdErr, e.StdErr) || a.Status != e.Status {
			t.Errorf("estimate %s: %+v evaluated again, %+v", e.Name, a, e)
		}
	}
}

// A refinement with nothing to gain spends no evaluations on trial steps.
// Without shear information the loss is even in a fibre angle about 0°
// (package documentation, Mirror symmetry), so with only the angle free
// and the angle exactly on 0° the gradient is zero: every damped step is
// zero and the model predicts no decrease. The minimiser stops after its
// first evaluation instead of trying twelve dampings of a step of nothing
// and evaluating the start again (fourteen evaluations before this rule).
func TestRefinementWithNothingToGainStops(t *testing.T) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 20, Params: []float64{5}}, 0)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.01, points: 20})
	p, err := NewProblem(spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	if p.HasShear {
		t.Fatal("the specimen has shear information")
	}
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
	res, err := Fit(p, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	theta := append([]float64(nil), res.theta...)
	free := make([]bool, len(theta))
	for i, q := range res.e.params {
		if q.Kind == kindAngle {
			theta[i], free[i] = 0, true
		}
	}
	start := append([]float64(nil), theta...)
	lr := res.e.minimize(theta, free, 200)
	if lr.Evals != 1 {
		t.Errorf("%d evaluations, want 1 (the start's)", lr.Evals)
	}
	if !slices.Equal(theta, start) {
		t.Errorf("the parameters moved from %v to %v", start, theta)
	}
	if !(lr.Loss < math.Inf(1)) || !res.e.holdsDerivatives(theta) {
		t.Errorf("loss %g; the engine must hold the start's evaluation", lr.Loss)
	}
}

// A given start (Settings.Init, as cross-validation and refits use) with
// its angle exactly on 0° or 90° and no shear information is refined on
// the line and probed off it (minimizeOnLines). On data made by
// independent numerical integration (independent_test.go): fibres along
// axis 2 started on 90° stay exactly there, at the loss of a fit from the
// global scan; fibres at 30° started on 0° leave the line and reach the
// scan fit's loss (the line is a maximum of the loss in the angle there;
// without the probe off the line the fit stays there, checked).
func TestFitStartedOnASymmetryLine(t *testing.T) {
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
	for _, c := range []struct {
		truth, start float64 // degrees
		stays        bool
	}{{90, 90, true}, {30, 0, false}} {
		spec := synthFrom(t, fibreMaterial(2, spreadFamily{c.truth * deg, -1, expSqFibre(20, 3)}), synthOptions{noise: 0.02, points: 20, seed: 3})
		p, err := NewProblem(spec, nil)
		if err != nil {
			t.Fatal(err)
		}
		scan, err := Fit(p, st, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		init := scan.Params()
		init["angle"] = c.start * deg
		r, err := Fit(p, st, Settings{Init: init, NoScan: true})
		if err != nil {
			t.Fatal(err)
		}
		onLine := onSymmetryLine(r.theta[0])
		if onLine != c.stays {
			t.Errorf("truth %g°, start %g°: ended at %.6g°, on the line %v, want %v", c.truth, c.start, wrapAngle(r.theta[0])/deg, onLine, c.stays)
		}
		if math.Abs(r.Loss/scan.Loss-1) > 1e-6 {
			t.Errorf("truth %g°, start %g°: loss %.10g, the scan fit's %.10g", c.truth, c.start, r.Loss, scan.Loss)
		}
	}
}
