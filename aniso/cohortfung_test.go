package aniso

import (
	"math"
	"path/filepath"
	"strings"
	"testing"

	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/terms"
)

// readCohort reads testdata/cohort/NAME-{a,b,c}.csv (SYNTHETIC, made by
// independent code; testdata/cohort/README.md).
func readCohort(t *testing.T, name string) []*Problem {
	t.Helper()
	var ps []*Problem
	for _, x := range []string{"a", "b", "c"} {
		s, err := biaxial.ReadFile(filepath.Join("testdata", "cohort", name+"-"+x+".csv"), biaxial.Options{})
		if err != nil {
			t.Fatal(err)
		}
		p, err := NewProblem(s, nil)
		if err != nil {
			t.Fatal(err)
		}
		ps = append(ps, p)
	}
	return ps
}

// pooledPreset returns the discovery's pooled preset named name, or nil.
func pooledPreset(d *Discovery, name string) *Candidate {
	for i := range d.Presets {
		if d.Presets[i].Name == name {
			return &d.Presets[i]
		}
	}
	return nil
}

// A cohort of Fung-type orthotropic solids without fibres (Tong & Fung
// 1976; three SYNTHETIC specimens made by independent numpy code,
// testdata/cohort) is undecided by the rule of a single specimen's
// discovery (orthotropyRule): before the cohort fitted the Fung-type
// presets, its pooled verdict was a confident 2 at ±0.0°, ±33.4° while
// `weft fit` of two of the three specimens said undecided by that rule.
// The pooled preset is checked against an independent recomputation
// (scipy.optimize.least_squares of the Tong & Fung closed form per
// specimen, weights, BIC and held-out error as the README defines them,
// pooled BIC the sum, held-out error the mean over specimens and its
// standard error over them): BIC −19076.085, held-out error 0.0190183 ±
// 0.0030467. And the three specimens reach the verdict word on their own
// but only one puts its fibres where the cohort's model does (the others
// at 19° and 21° from it), which the direction count tells. One scout
// keeps the test cheap and makes the comparison fit the preset itself on
// the two specimens that are not scouts (the scouts' fits are reused).
func TestCohortFungTypeSolidsUndecided(t *testing.T) {
	t.Parallel()
	if testing.Short() {
		t.Skip("a cohort discovery")
	}
	c, err := FitCohort(readCohort(t, "fungco"), CohortSettings{Scouts: 1})
	if err != nil {
		t.Fatal(err)
	}
	d := c.Discovery
	v := d.Verdict
	t.Logf("verdict %s: %s", v.Families, v.Reason)
	if v.Families != "undecided" || !strings.Contains(v.Reason, "Fung-type preset") {
		t.Errorf("verdict %s, want undecided by the Fung-type comparison", v.Families)
	}
	name, ok := strings.CutPrefix(v.InSampleBest, "preset:")
	if !ok {
		t.Fatalf("in-sample best %q, want a preset", v.InSampleBest)
	}
	st, err := PresetStructure(name)
	if err != nil || st.Layout != LayoutNone || st.Terms[0].Shape.Arg != terms.Green {
		t.Errorf("in-sample best %s (%v): want a preset without fibres with a Green-strain term", name, err)
	}
	pc := pooledPreset(d, "preset:fung")
	if pc == nil || pc.CV == nil {
		t.Fatalf("no pooled, cross-validated preset:fung among %d presets", len(d.Presets))
	}
	// Independent recomputation (scipy), see above.
	if math.Abs(pc.Result.BIC-(-19076.085)) > 0.05 {
		t.Errorf("pooled BIC of preset:fung %.4f, recomputed −19076.085", pc.Result.BIC)
	}
	if math.Abs(pc.CV.Mean-0.0190183) > 2e-6 || math.Abs(pc.CV.StdErr-0.0030467) > 2e-6 {
		t.Errorf("pooled held-out error of preset:fung %.7f ± %.7f, recomputed 0.0190183 ± 0.0030467", pc.CV.Mean, pc.CV.StdErr)
	}
	s := c.Support
	if s.SameDirection >= s.SameVerdict || s.SameVerdict == 0 {
		t.Errorf("support %+v: want fewer specimens with the cohort's directions than with its verdict word", s)
	}
}

// Fibre specimens (one family at about 30°, two at about 10° and 70°, on
// neo-Hookean matrices; SYNTHETIC, independent code, testdata/cohort) keep
// their verdict with fibres: the Fung-type preset is fitted and compared,
// but fits worse in sample, so the rule does not fire. Its pooled BIC is
// checked against the independent scipy recomputation (−17274.392 and
// −13183.397); the verdicts and angles are those of `weft fit` of each
// specimen, and every specimen agrees with the cohort in direction.
func TestCohortFibresAreNotFungType(t *testing.T) {
	t.Parallel()
	if testing.Short() {
		t.Skip("two cohort discoveries")
	}
	// One scout is enough for fib1; the fib2 specimens reach the cohort's
	// verdict on their own only with the default scouts, whose discoveries
	// give each its own candidate forms.
	for _, tc := range []struct {
		name, verdict string
		bic           float64
		scouts        int
	}{{"fib1", "1-or-mirror-pair", -17274.392, 1}, {"fib2", "2", -13183.397, 0}} {
		c, err := FitCohort(readCohort(t, tc.name), CohortSettings{Scouts: tc.scouts})
		if err != nil {
			t.Fatal(err)
		}
		d := c.Discovery
		t.Logf("%s: verdict %s: %s", tc.name, d.Verdict.Families, d.Verdict.Reason)
		if d.Verdict.Families != tc.verdict || d.Verdict.InSampleBest != "" {
			t.Errorf("%s: verdict %s (in-sample best %q), want %s", tc.name, d.Verdict.Families, d.Verdict.InSampleBest, tc.verdict)
		}
		pc := pooledPreset(d, "preset:fung")
		if pc == nil {
			t.Fatalf("%s: the Fung-type preset was not compared", tc.name)
		}
		if math.Abs(pc.Result.BIC-tc.bic) > 0.05 {
			t.Errorf("%s: pooled BIC of preset:fung %.4f, recomputed %.3f", tc.name, pc.Result.BIC, tc.bic)
		}
		if s := c.Support; s.SameVerdict != 3 || s.SameDirection != 3 {
			t.Errorf("%s: support %+v, want 3 of 3 in verdict and direction", tc.name, s)
		}
	}
}

// directionGapDeg compares fibre directions modulo 180° (common practice:
// a fibre has no sense), families matched by angle, by magnitude without
// shear information. Expected values by hand.
func TestDirectionGapDeg(t *testing.T) {
	fam := func(deg ...float64) *Model {
		m := &Model{}
		for _, a := range deg {
			m.Families = append(m.Families, Family{Angle: Rad(a)})
		}
		return m
	}
	for _, tc := range []struct {
		a, b      *Model
		signKnown bool
		want      float64
	}{
		{fam(15, 70), fam(70, 15), true, 0},        // labels swapped
		{fam(47, -47), fam(-47, 47), true, 0},      // a mirror pair read the other way round
		{fam(47, -47), fam(133, 47), true, 0},      // θ ± β as θ + 90° ∓ (90° − β), θ = 0°, β = 47°
		{fam(30), fam(-30), true, 60},              // signs known: ±30° differ
		{fam(30), fam(-30), false, 0},              // without shear information only |α| counts
		{fam(30), fam(30, -30), false, 0},          // one family against a pair at ±α
		{fam(0, 33.4), fam(24.8, 90), false, 56.6}, // matched 0°–24.8°, 33.4°–90°
		{fam(89), fam(-89), true, 2},               // across ±90°
		{fam(), fam(), true, 0},                    // no fibres either
		{fam(), fam(30), true, math.Inf(1)},        // fibres against none
		{fam(10, 70), fam(12, 100), true, 30},      // 70° against 100°
	} {
		if got := directionGapDeg(tc.a, tc.b, tc.signKnown); math.Abs(got-tc.want) > 1e-9 && !(math.IsInf(got, 1) && math.IsInf(tc.want, 1)) {
			t.Errorf("directionGapDeg(%v, %v, %t) = %g, want %g", tc.a.Families, tc.b.Families, tc.signKnown, got, tc.want)
		}
	}
}
