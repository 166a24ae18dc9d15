package aniso

import (
	"math"
	"strings"
	"testing"
)

// isotropicPair is an invented Mooney–Rivlin-type material tested on two
// protocols to 10 % strain, where the I1 and I2 stress columns are almost
// proportional: their weights are not separately determined.
func isotropicPair(t *testing.T, seed uint64) (*Problem, Structure) {
	truth := &Model{Terms: []Term{{Shape: lookup("i1-lin"), Family: -1, Weight: 4}, {Shape: lookup("i2-lin"), Family: -1, Weight: 1}}}
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.02, maxStrain: 0.1, ratios: [][2]float64{{1, 1}, {1, 0.75}}, seed: seed})
	p, err := NewProblem(spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	return p, Structure{Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("i2-lin"), Family: -1}}}
}

// Two weights with |r| > 0.95 are "correlated", not "estimated", and the
// result states the combination the data determine. Its standard error is
// checked against a parametric bootstrap (Efron & Tibshirani 1993, An
// Introduction to the Bootstrap, ch. 6): the spread of the same
// combination over 60 refits to fresh noise agrees with the reported
// standard error within 30 %, as does each weight's own spread, and the
// combination is determined at least 5 times better than either weight.
func TestCorrelatedCombinationAgainstBootstrap(t *testing.T) {
	p, st := isotropicPair(t, 7)
	res, err := Fit(p, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range res.Estimates {
		if e.Status != StatusCorrelated {
			t.Errorf("%s: status %q, want %q (r = %.4f)", e.Name, e.Status, StatusCorrelated, res.Correlation[0][1])
		}
	}
	if len(res.Combinations) != 1 {
		t.Fatalf("combinations %+v, want one", res.Combinations)
	}
	c := res.Combinations[0]
	if len(c.Coefficients) != 2 {
		t.Fatalf("combination %+v: want one of the two weights", c)
	}
	noted := false
	for _, n := range res.Notes {
		noted = noted || n == c.Text
	}
	if !noted || !strings.Contains(c.Text, "weight[i1-lin]") || !strings.Contains(c.Text, "weight[i2-lin]") {
		t.Errorf("the notes do not state the combination: %q", c.Text)
	}
	const reps = 60
	var comb, w1, w2 []float64
	for i := 0; i < reps; i++ {
		q, _ := isotropicPair(t, uint64(100+i))
		r, err := Fit(q, st, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		comb = append(comb, c.Coefficients[0]*r.Weights[0]+c.Coefficients[1]*r.Weights[1])
		w1, w2 = append(w1, r.Weights[0]), append(w2, r.Weights[1])
	}
	for _, chk := range []struct {
		name      string
		got, want float64
	}{{"combination", sd(comb), c.StdErr}, {"weight[i1-lin]", sd(w1), c.MemberStdErr[0]}, {"weight[i2-lin]", sd(w2), c.MemberStdErr[1]}} {
		if math.Abs(chk.got/chk.want-1) > 0.3 {
			t.Errorf("%s: bootstrap spread %.4g, reported standard error %.4g", chk.name, chk.got, chk.want)
		}
	}
	if 5*c.StdErr > math.Min(c.MemberStdErr[0], c.MemberStdErr[1]) {
		t.Errorf("combination standard error %.3g is not well below its members' %v", c.StdErr, c.MemberStdErr)
	}
	t.Logf("%s; bootstrap %.4g / %.4g / %.4g", c.Text, sd(comb), sd(w1), sd(w2))
}

func sd(x []float64) float64 {
	m := 0.0
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	s := 0.0
	for _, v := range x {
		s += (v - m) * (v - m)
	}
	return math.Sqrt(s / float64(len(x)-1))
}

// On every fit below, no member of a pair with |r| > 0.95 is reported as
// "estimated", every correlated estimate belongs to a stated combination,
// and every interval stays inside its quantity's domain: weights ≥ 0,
// dispersion in [0, 1/3] (Gasser, Ogden & Holzapfel 2006), half angles and
// |α| without shear in [0°, 90°], no angle interval wider than 180°.
func TestStatusesAgreeWithEvidence(t *testing.T) {
	t.Parallel()
	weak := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 5}, Term{Shape: lookup("fib-quad"), Weight: 0.4}, 40)
	one := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 2}, Term{Shape: lookup("fib-expsq"), Weight: 12, Params: []float64{3}}, 35)
	goh, _ := PresetStructure("goh")
	goh.HoldPairAxis = false
	for _, c := range []struct {
		name  string
		truth *Model
		o     synthOptions
		st    Structure
	}{
		{"weak family, no shear", weak, synthOptions{noise: 0.02, points: 15, maxStrain: 0.1},
			Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-quad"), Family: 0}}}},
		{"dispersed pair on one family", one, synthOptions{noise: 0.01}, goh},
		{"two families on one, sutured", one, synthOptions{noise: 0.01, sutured: true},
			freeExpSqPair()},
	} {
		t.Run(c.name, func(t *testing.T) {
			p, err := NewProblem(synthSpecimen(t, c.truth, c.o), nil)
			if err != nil {
				t.Fatal(err)
			}
			res, err := Fit(p, c.st, Settings{Profile: true})
			if err != nil {
				t.Fatal(err)
			}
			status := map[string]string{}
			for _, e := range res.Estimates {
				status[e.Name] = e.Status
				checkDomain(t, e, p.HasShear)
			}
			for a := range res.Correlation {
				for b := 0; b < a; b++ {
					if math.Abs(res.Correlation[a][b]) > CorrelationFlagLevel {
						for _, n := range []string{res.CorrelationNames[a], res.CorrelationNames[b]} {
							if status[n] == StatusEstimated {
								t.Errorf("%s is in a pair with r = %.3f but reported %q", n, res.Correlation[a][b], StatusEstimated)
							}
						}
					}
				}
			}
			inCombination := map[string]bool{}
			for _, cb := range res.Combinations {
				for _, n := range cb.Names {
					inCombination[n] = true
				}
			}
			for n, s := range status {
				if s == StatusCorrelated && !inCombination[n] {
					t.Errorf("%s is correlated but no combination names it", n)
				}
			}
			for _, pr := range res.Profiles {
				if !pr.NotDetermined && pr.HiDeg-pr.LoDeg > 180 {
					t.Errorf("profile %s interval [%.1f, %.1f] wider than the period", pr.Name, pr.LoDeg, pr.HiDeg)
				}
			}
		})
	}
}

func checkDomain(t *testing.T, e Estimate, shear bool) {
	t.Helper()
	if math.IsNaN(e.Lo) != math.IsNaN(e.Hi) || !math.IsNaN(e.Lo) && e.Status != StatusEstimated && e.Status != StatusCorrelated {
		t.Errorf("%s (%s): interval [%g, %g]", e.Name, e.Status, e.Lo, e.Hi)
	}
	if math.IsNaN(e.Lo) {
		return
	}
	lo, hi := math.Inf(-1), math.Inf(1)
	switch {
	case e.Kind == "weight":
		lo = 0
	case e.Kind == "dispersion":
		lo, hi = 0, 1.0/3
	case e.Name == "half_angle" || e.Kind == "angle" && !shear:
		lo, hi = 0, 90
	}
	if e.Lo < lo || e.Hi > hi || (e.Kind == "angle" && e.Hi-e.Lo > 180) {
		t.Errorf("%s: interval [%g, %g] leaves its domain [%g, %g]", e.Name, e.Lo, e.Hi, lo, hi)
	}
}

// A weak fibre family without shear information: its angle's Wald
// interval would span more than the 180° period, so the angle is
// "not-determined" with a flag, and the weight interval is clipped at 0.
func TestAngleWiderThanPeriodNotDetermined(t *testing.T) {
	weak := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 5}, Term{Shape: lookup("fib-quad"), Weight: 0.4}, 40)
	p, _ := NewProblem(synthSpecimen(t, weak, synthOptions{noise: 0.02, points: 15, maxStrain: 0.1}), nil)
	res, err := Fit(p, Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-quad"), Family: 0}}}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range res.Estimates {
		switch e.Name {
		case "angle":
			if e.Status != StatusNotDetermined || !math.IsNaN(e.Lo) {
				t.Errorf("angle %+v: want not-determined without an interval", e)
			}
		case "weight[fib-quad@f1]":
			if !(e.Lo == 0 && e.Value-e.StdErr*2 < 0) {
				t.Errorf("fibre weight %+v: want its interval clipped at 0", e)
			}
		}
	}
	found := false
	for _, f := range res.Flags {
		found = found || strings.HasPrefix(f, "angle is not determined") && strings.Contains(f, "180°")
	}
	if !found {
		t.Errorf("no flag on the angle: %q", res.Flags)
	}
}

// hand-counted share of a protocol's points on which one term's stress
// (Model.Evaluate of that term alone, nominal stress) exceeds 1 % of the
// protocol-axis's measured range; the largest over protocols and axes.
func handFeltShare(t *testing.T, p *Problem, m *Model, k int) float64 {
	alone := &Model{Families: m.Families, Terms: []Term{m.Terms[k]}}
	best := 0.0
	for _, pr := range p.Specimen.Protocols {
		for c := 0; c < 2; c++ {
			lo, hi := math.Inf(1), math.Inf(-1)
			for _, pt := range pr.Points {
				lo, hi = math.Min(lo, pt.Stress[c]), math.Max(hi, pt.Stress[c])
			}
			n := 0
			for _, pt := range pr.Points {
				ev, err := alone.Evaluate(pt.F)
				if err != nil {
					t.Fatal(err)
				}
				if math.Abs(ev.Nominal[c]) > 0.01*(hi-lo) {
					n++
				}
			}
			best = math.Max(best, float64(n)/float64(len(pr.Points)))
		}
	}
	return best
}

// Degenerate terms: a second fibre family fitted to a one-family specimen
// ends with a negligible weight, and the stated thresholds (1 % of a
// protocol-axis's range on fewer than 10 % of the points; weight above
// 10⁴ × the largest measured stress; below 10⁻⁹ of the largest weight)
// agree with a hand count of the points each term is felt on, computed
// from the model's own stress evaluation. Degenerate quantities have their
// own status, no interval, and a flag saying why.
func TestDegenerateTerms(t *testing.T) {
	one := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 2}, Term{Shape: lookup("fib-expsq"), Weight: 12, Params: []float64{3}}, 35)
	p, err := NewProblem(synthSpecimen(t, one, synthOptions{noise: 0.01}), nil)
	if err != nil {
		t.Fatal(err)
	}
	st := freeExpSqPair()
	res, err := Fit(p, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	maxW, maxS := 0.0, 0.0
	for _, w := range res.Weights {
		maxW = math.Max(maxW, w)
	}
	for _, y := range p.Measured {
		maxS = math.Max(maxS, math.Abs(y))
	}
	want := map[int]bool{}
	for g, w := range res.Weights {
		if w > 0 && (w < 1e-9*maxW || w > 1e4*maxS || handFeltShare(t, p, res.Model, g) < 0.1) {
			want[g] = true
		}
	}
	if len(want) != 1 {
		t.Fatalf("weights %v: the hand count finds %d degenerate terms, the test expects the spare family's one", res.Weights, len(want))
	}
	got := res.Degenerate(p)
	if len(got) != 1 || !want[got[0].Term] || got[0].Reasons[0] != DegenerateNegligibleWeight {
		t.Fatalf("Degenerate = %+v, hand count %v", got, want)
	}
	g := got[0].Term
	for _, e := range res.Estimates {
		if e.Term == g && e.Status != StatusDegenerate || e.Status == StatusDegenerate && !math.IsNaN(e.Lo) {
			t.Errorf("%s: status %s, interval [%g, %g]", e.Name, e.Status, e.Lo, e.Hi)
		}
	}
	flagged := false
	for _, f := range res.Flags {
		flagged = flagged || strings.HasPrefix(f, st.Terms[g].Label(LayoutFree)+" is degenerate")
	}
	if !flagged {
		t.Errorf("no flag for the degenerate term: %q", res.Flags)
	}
	// Its own flag says it all: no correlation flag names a degenerate
	// quantity (a weight of 1e-47 once read r = 1.000 with an angle).
	for _, f := range res.Flags {
		for _, e := range res.Estimates {
			if e.Status == StatusDegenerate && strings.Contains(f, "not separately determined") && strings.Contains(f, e.Name+" ") {
				t.Errorf("a correlation flag names the degenerate %s: %q", e.Name, f)
			}
		}
	}

	// The same fit with the spare family set by hand along the true one:
	// a steep term at the smallest weight (over a decade scan) at which the
	// hand count feels it anywhere, so that it shows only at the largest
	// stretches; then a term far too stiff.
	sliver := 0.0
	res.Model.Families[1].Angle = res.Model.Families[0].Angle
	setSpare := func(w, rate float64) {
		res.Weights[g] = w
		for k := range res.Model.Terms {
			if res.Model.Terms[k].Family == 1 {
				res.Model.Terms[k].Weight, res.Model.Terms[k].Params[0] = w, rate
			}
		}
	}
	for w := 1e-8; w < 1 && sliver == 0; w *= 10 {
		setSpare(w, 60)
		if handFeltShare(t, p, res.Model, 2) > 0 {
			sliver = w
		}
	}
	for _, c := range []struct {
		w, rate float64
		reason  string
	}{{sliver, 60, DegenerateSliver}, {2e4 * maxS, 3, DegenerateHugeWeight}} {
		setSpare(c.w, c.rate)
		share := handFeltShare(t, p, res.Model, 2)
		got := res.Degenerate(p)
		if c.reason == DegenerateSliver && (share == 0 || share >= 0.1) {
			t.Fatalf("test set-up: the hand-set term is felt on %.0f %% of a protocol's points, not on a sliver", 100*share)
		}
		if len(got) != 1 || got[0].Term != g || !containsString(got[0].Reasons, c.reason) {
			t.Errorf("weight %g, rate %g (felt on %.0f %% by hand): Degenerate = %+v, want %s", c.w, c.rate, 100*share, got, c.reason)
		}
	}
}

func containsString(s []string, x string) bool {
	for _, v := range s {
		if v == x {
			return true
		}
	}
	return false
}
