package aniso

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"
	"testing"

	"github.com/weft-tools/weft/biaxial"
)

// scaleSpecimen returns a copy of s with every stress multiplied by f and
// the residual weights divided by f, as reading the same data in another
// unit (or scaled) gives.
func scaleSpecimen(s *biaxial.Specimen, f float64, unit string) *biaxial.Specimen {
	c := *s
	c.StressUnit = unit
	c.Protocols = make([]biaxial.Protocol, len(s.Protocols))
	for i, pr := range s.Protocols {
		q := pr
		q.Points = append([]biaxial.Point(nil), pr.Points...)
		for j := range q.Points {
			for k := range q.Points[j].Stress {
				q.Points[j].Stress[k] *= f
			}
		}
		for k := range q.Weight {
			q.Weight[k] /= f
		}
		c.Protocols[i] = q
	}
	return &c
}

// outcome is what must not depend on the stress unit: the chosen form, its
// angles to 0.1° and the verdict.
type outcome struct {
	name, families string
	angles         []float64
}

// outcomeFrom reads the outcome of a discovery.
func outcomeFrom(d *Discovery) outcome {
	o := outcome{name: d.Best().Name, families: d.Verdict.Families}
	for _, f := range d.Best().Result.Model.Families {
		o.angles = append(o.angles, math.Round(10*f.Angle/deg)/10)
	}
	return o
}

// equal reports the same form and verdict and angles within 0.1°.
func (o outcome) equal(p outcome) bool {
	if o.name != p.name || o.families != p.families || len(o.angles) != len(p.angles) {
		return false
	}
	for i := range o.angles {
		if math.Abs(o.angles[i]-p.angles[i]) > 0.1+1e-9 {
			return false
		}
	}
	return true
}

// unitScales are the stress units and scalings the unit checks apply: the
// same data in Pa and MPa, scaled by factors over [1e-6, 1e6], and nudged
// by (1 ± 1e-9).
var unitScales = []struct {
	f    float64
	unit string
}{{1e3, "Pa"}, {1e-3, "MPa"}, {1e-6, "kPa"}, {1e6, "kPa"}, {37.5, "kPa"}, {1 - 1e-9, "kPa"}, {1 + 1e-9, "kPa"}}

// canonicalDiffers counts the numbers of the fitter's canonical form
// (Problem.Scale: the weighted targets and row weights; the kinematics do
// not depend on the stress unit) that differ, bit for bit, between p and q.
func canonicalDiffers(p, q *Problem) int {
	if len(p.Target) != len(q.Target) {
		return len(p.Target) + len(q.Target)
	}
	n := 0
	for i := range p.Target {
		if math.Float64bits(p.Target[i]) != math.Float64bits(q.Target[i]) {
			n++
		}
		if math.Float64bits(p.Data.rowWeight[i]) != math.Float64bits(q.Data.rowWeight[i]) {
			n++
		}
	}
	return n
}

// sameDiscovery reports how got, a discovery of the data of ref's times f
// (stresses × f, weights ÷ f), differs from ref. The search works on the
// canonical numbers only, so every loss, BIC, angle, dispersion, shape
// parameter, verdict, rule and reason must be the same bit for bit; the
// weights come out × f and the held-out errors are computed from the
// measured values in their own unit, so those must agree to 1e-12
// relative (round-off).
func sameDiscovery(ref, got *Discovery, f float64) []string {
	var diffs []string
	if ref.Verdict.Families != got.Verdict.Families || ref.Verdict.Decider != got.Verdict.Decider ||
		ref.Verdict.Reason != got.Verdict.Reason || ref.Rule != got.Rule || ref.Chosen != got.Chosen ||
		len(ref.Pareto) != len(got.Pareto) || len(ref.Presets) != len(got.Presets) {
		return append(diffs, fmt.Sprintf("verdict %s, chosen %d of %d (%s), rule %q; the reference: %s, %d of %d (%s), %q",
			got.Verdict.Families, got.Chosen, len(got.Pareto), got.Verdict.Reason, got.Rule,
			ref.Verdict.Families, ref.Chosen, len(ref.Pareto), ref.Verdict.Reason, ref.Rule))
	}
	near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-12*math.Max(math.Abs(a), math.Abs(b)) }
	same := func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }
	check := func(what string, a, b *Candidate) {
		ra, rb := a.Result, b.Result
		if a.Name != b.Name || !same(ra.Loss, rb.Loss) || !same(ra.BIC, rb.BIC) ||
			len(ra.Model.Families) != len(rb.Model.Families) || len(ra.Model.Terms) != len(rb.Model.Terms) {
			diffs = append(diffs, fmt.Sprintf("%s %s: loss %v, BIC %v; the reference: %s, %v, %v", what, b.Name, rb.Loss, rb.BIC, a.Name, ra.Loss, ra.BIC))
			return
		}
		for i, fa := range ra.Model.Families {
			fb := rb.Model.Families[i]
			if !same(fa.Angle, fb.Angle) || !same(fa.Dispersion, fb.Dispersion) || !same(fa.Concentration, fb.Concentration) {
				diffs = append(diffs, fmt.Sprintf("%s %s: family %d %+v; the reference: %+v", what, a.Name, i, fb, fa))
			}
		}
		for i, ta := range ra.Model.Terms {
			tb := rb.Model.Terms[i]
			ok := near(ta.Weight*f, tb.Weight) && len(ta.Params) == len(tb.Params)
			for k := 0; ok && k < len(ta.Params); k++ {
				ok = same(ta.Params[k], tb.Params[k])
			}
			if !ok {
				diffs = append(diffs, fmt.Sprintf("%s %s: term %d weight %v params %v; the reference × %g: %v, %v", what, a.Name, i, tb.Weight, tb.Params, f, ta.Weight*f, ta.Params))
			}
		}
		if (a.CV == nil) != (b.CV == nil) || a.CV != nil && (!near(a.CV.Mean, b.CV.Mean) || !near(a.CV.StdErr, b.CV.StdErr)) {
			diffs = append(diffs, fmt.Sprintf("%s %s: held-out error %s; the reference: %s", what, a.Name, cvText(b.CV), cvText(a.CV)))
		}
	}
	for i := range ref.Pareto {
		check("candidate", &ref.Pareto[i], &got.Pareto[i])
	}
	for i := range ref.Presets {
		check("preset", &ref.Presets[i], &got.Presets[i])
	}
	return diffs
}

// cvText gives a held-out error and its standard error to every digit.
func cvText(c *CVScore) string {
	if c == nil {
		return "none"
	}
	return fmt.Sprintf("%.17g ± %.17g", c.Mean, c.StdErr)
}

// checkUnits checks that the data of p0, in every unit and scaling of
// unitScales, give the discovery ref (made on p0 with set). Where the fitter's
// canonical numbers are the same bit for bit, so is its search, and only
// the scalings listed in full are discovered again and compared with ref in
// full (sameDiscovery): they keep checked that the search reads nothing but
// the canonical numbers. Where some differ (a value within round-off of a
// bit boundary, about one in 10⁶), the discovery is repeated and must give
// the same form, verdict and angles to 0.1°.
func checkUnits(t *testing.T, p0 *Problem, ref *Discovery, set DiscoverSettings, full ...float64) {
	t.Helper()
	spec := p0.Specimen
	for _, sc := range unitScales {
		ps, err := NewProblem(scaleSpecimen(spec, sc.f, sc.unit), nil)
		if err != nil {
			t.Fatal(err)
		}
		n := canonicalDiffers(p0, ps)
		if n == 0 && !slices.Contains(full, sc.f) {
			continue
		}
		d, err := Discover(ps, set)
		if err != nil {
			t.Fatal(err)
		}
		if n > 0 {
			t.Logf("×%g (%s): %d canonical numbers differ from the reference unit's; discovered again", sc.f, sc.unit, n)
			if got, want := outcomeFrom(d), outcomeFrom(ref); !got.equal(want) {
				t.Errorf("×%g (%s): %+v, the reference unit gave %+v", sc.f, sc.unit, got, want)
			}
			continue
		}
		for _, e := range sameDiscovery(ref, d, sc.f) {
			t.Errorf("×%g (%s): %s", sc.f, sc.unit, e)
		}
	}
}

// The chosen form, its angles and the verdict are the same for the same
// data in Pa, kPa and MPa, scaled by factors over [1e-6, 1e6], and nudged
// by (1 ± 1e-9) (issue: unit and scale invariance; that a constitutive
// model's form cannot depend on the unit its stresses are written in is
// dimensional homogeneity, common practice). The fitter's canonical
// numbers are the same in every one of them (checkUnits); two scalings,
// the smallest and a nudge, are discovered again and compared in full
// (TestVerdictAcceptance compares MPa on every acceptance specimen).
func TestDiscoverUnitInvariance(t *testing.T) {
	if testing.Short() {
		t.Skip("runs discovery 3 times per specimen")
	}
	specimens := map[string]*biaxial.Specimen{
		"one family, no shear": synthFrom(t, fibreMaterial(3, spreadFamily{38 * deg, -1, expSqFibre(30, 4)}),
			synthOptions{noise: 0.02, points: 20}),
		"two families, sutured": synthFrom(t, fibreMaterial(2, spreadFamily{10 * deg, -1, expSqFibre(20, 3)}, spreadFamily{65 * deg, -1, expSqFibre(10, 2)}),
			synthOptions{noise: 0.02, points: 20, sutured: true, maxStrain: 0.2}),
	}
	set := DiscoverSettings{MaxTerms: 3}
	for name, s := range specimens {
		t.Run(name, func(t *testing.T) {
			t.Parallel()
			p, err := NewProblem(s, nil)
			if err != nil {
				t.Fatal(err)
			}
			ref, err := Discover(p, set)
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("kPa: %+v", outcomeFrom(ref))
			checkUnits(t, p, ref, set, 1e-6, 1+1e-9)
		})
	}
}

// Two fibre families at 10° and 70° without shear information, made by
// independent numerical integration (independent_test.go): the walk
// compares each form by its best held-out model, here two families near
// 0° and 90°, which does not beat one family. The verdict's ruled-out note
// on the two-free-families form must still name the form's lowest-BIC
// model, whose families lie near the true 10° and 70°, with its ΔBIC and
// held-out error, so that no evidence for two families is hidden. A form
// that only ties the winner (a mirror pair of one angle: the same loss
// and held-out error) is not said to fit better.
func TestRuledOutNamesTheFormsLowestBIC(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	d, _ := tenSeventy(t)
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	var free string
	for _, n := range d.Verdict.RuledOut {
		t.Logf("ruled out: %s", n)
		if strings.HasPrefix(n, "ruled out 2-free ") {
			free = n
		}
	}
	if d.Verdict.Families == "2" {
		// Nothing is hidden when two families win, so the specimen no
		// longer exercises the note: say so rather than pass silently.
		t.Skipf("verdict 2: two families won, and the note this test checks is not written")
	}
	_, rest, ok := strings.Cut(free, "the form's lowest BIC is ")
	if !ok {
		t.Fatalf("the 2-free note does not name the form's lowest-BIC model: %q", free)
	}
	var low *Candidate
	for i := range d.Pareto {
		if strings.HasPrefix(rest, d.Pareto[i].Name+"'s") {
			low = &d.Pareto[i]
		}
	}
	if low == nil || FormKey(low.Result.Structure) != "2-free" {
		t.Fatalf("the note names no 2-free candidate: %q", rest)
	}
	for _, c := range d.Pareto {
		if FormKey(c.Result.Structure) == "2-free" && c.Result.BIC < low.Result.BIC {
			t.Errorf("%s has a lower BIC (%.2f) than the named %s (%.2f)", c.Name, c.Result.BIC, low.Name, low.Result.BIC)
		}
	}
	for _, want := range []float64{10, 70} {
		best := nearestFamilyDeg(low.Result, want)
		if best > 3 {
			t.Errorf("the lowest-BIC 2-free model %s has no family within 3° of %g° (%s)", low.Name, want, anglesText(low.Result))
		}
	}
	if !strings.Contains(rest, "ΔBIC") || !strings.Contains(rest, "held-out error") {
		t.Errorf("the note lacks the ΔBIC or the held-out errors: %q", rest)
	}
	for _, lc := range d.Verdict.Comparisons {
		if lc.RelativeGain <= TieTolerance && lc.DeltaBIC <= 0 {
			for _, n := range d.Verdict.RuledOut {
				if strings.HasPrefix(n, "ruled out "+lc.Richer+" (") {
					t.Errorf("%s ties %s but is ruled out as fitting better: %q", lc.Richer, lc.Simpler, n)
				}
			}
		}
	}
}

// A pick that is not admissible where it was fitted is replaced by the
// next admissible candidate of its form, and the rule says why (the
// criteria of admissible.go: stability modulo rotation and strong
// ellipticity; an I5 term is not polyconvex and can lose stability).
func TestEnsureAdmissible(t *testing.T) {
	bad := &Model{Families: []Family{{Angle: 0.6}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 0.1},
		{Shape: lookup("i5-quad"), Family: 0, Weight: 100},
	}}
	good := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 30, Params: []float64{4}}, 35)
	spec := synthSpecimen(t, bad, synthOptions{points: 10})
	p, _ := NewProblem(spec, nil)
	st := Structure{Layout: LayoutSingle}
	d := &Discovery{Pareto: []Candidate{
		{Name: "bad", Layout: LayoutSingle, Result: &Result{Structure: st, Model: bad, Complexity: 3}},
		{Name: "good", Layout: LayoutSingle, Result: &Result{Structure: st, Model: good, Complexity: 4}},
	}}
	d.ensureAdmissible(problemEvidence(p))
	if d.Chosen != 1 || !strings.Contains(d.Rule, "bad was set aside because it is unstable") {
		t.Errorf("chosen %d, rule %q", d.Chosen, d.Rule)
	}
}

// inSampleDisagreement, on hand-made candidates: a two-direction model
// whose BIC lies DisagreeDeltaBIC or more below every one-direction model's
// is found, a smaller gap is not; a mirror pair at ±α counts as one
// direction without shear information (the same normal stresses as one
// family; package documentation, Mirror symmetry) and as two with it, and
// so do two free families at ±α; a mirror pair about a mean direction off
// the axes (families at 10° and 70°) is two directions either way; two
// families within 2° of each other are one direction (coincident).
func TestInSampleDisagreementRule(t *testing.T) {
	cand := func(name string, l Layout, bic float64, angles ...float64) Candidate {
		m := &Model{}
		for _, a := range angles {
			m.Families = append(m.Families, Family{Angle: Rad(a)})
		}
		return Candidate{Name: name, Layout: l, Result: &Result{Structure: Structure{Layout: l}, BIC: bic, Model: m}}
	}
	noShear, shear := evidence{}, evidence{hasShear: true}
	for _, c := range []struct {
		name string
		ev   evidence
		p    []Candidate
		two  string // "" when no disagreement
	}{
		{"gap of exactly the margin", noShear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("free", LayoutFree, -100-DisagreeDeltaBIC, 11, 72)}, "free"},
		{"gap just under the margin", noShear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("free", LayoutFree, -100-0.99*DisagreeDeltaBIC, 11, 72)}, ""},
		{"the best one-direction model decides", noShear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("pair", LayoutMirror, -105, 7, -7), cand("free", LayoutFree, -110, 11, 72)}, ""},
		{"a mirror pair is two directions with shear", shear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("pair", LayoutMirror, -110, 30, -30)}, "pair"},
		{"coincident families are one direction", noShear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("free", LayoutFree, -120, 10, 11)}, ""},
		{"the lowest two-direction BIC is named", noShear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("freeA", LayoutFree, -107, 5, 80), cand("freeB", LayoutFree, -115, 11, 72)}, "freeB"},
		{"no two-direction model", noShear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("iso", LayoutNone, -300)}, ""},
		{"a mirror pair off the axes is two directions without shear", noShear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("pair", LayoutMirror, -110, 70, 10)}, "pair"},
		{"a mirror pair off the axes is not the one-direction model", noShear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("pair", LayoutMirror, -104, 70, 10), cand("free", LayoutFree, -107, 11, 72)}, "free"},
		{"free families at ±α are one direction without shear", noShear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("free", LayoutFree, -110, 30, -30)}, ""},
		{"free families at ±α are two directions with shear", shear, []Candidate{cand("one", LayoutSingle, -100, 7), cand("free", LayoutFree, -110, 30, -30)}, "free"},
	} {
		d := &Discovery{Pareto: c.p}
		two, one, gap := d.inSampleDisagreement(c.ev)
		got := ""
		if two != nil {
			got = two.Name
			if want := one.Result.BIC - two.Result.BIC; gap != want {
				t.Errorf("%s: gap %g, want %g", c.name, gap, want)
			}
		}
		if got != c.two {
			t.Errorf("%s: found %q, want %q", c.name, got, c.two)
		}
	}
}

// Two equal-order families at 10° and 70° without shear information (made
// by independent numerical integration; 30 points a protocol, 2 % noise):
// leave-one-protocol-out favours one family at ±7° (the ps-pos term
// stiffens the second axis), while the true form, found at about ±11.8°
// and ±71.9°, has a BIC 9.6 lower with no more parameters. Before the
// in-sample rule the verdict was a confident 1-or-mirror-pair; it is now
// undecided, naming the two-family model and the gap, and the chosen model
// is still the one the held-out errors favour.
func TestInSampleDisagreementIsUndecided(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	d, p := tenSeventy(t)
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "undecided" {
		t.Fatalf("verdict %s, want undecided", d.Verdict.Families)
	}
	two, one, gap := d.inSampleDisagreement(problemEvidence(p))
	if two == nil {
		t.Fatal("no in-sample disagreement found")
	}
	if gap < DisagreeDeltaBIC {
		t.Errorf("gap %.2f below the margin %g", gap, DisagreeDeltaBIC)
	}
	for _, want := range []float64{10, 70} {
		best := nearestFamilyDeg(two.Result, want)
		if best > 3 {
			t.Errorf("the two-direction model %s has no family within 3° of %g° (%s)", two.Name, want, anglesText(two.Result))
		}
	}
	for _, s := range []string{two.Name, one.Name, fmt.Sprintf("ΔBIC %.1f", gap), "Kass & Raftery 1995"} {
		if !strings.Contains(d.Verdict.Reason, s) {
			t.Errorf("the reason does not say %q: %q", s, d.Verdict.Reason)
		}
	}
	if d.Verdict.Decider == "" {
		t.Error("an undecided verdict names no measurement that would decide")
	}
	if l := d.Best().Result.Structure.Layout; l != LayoutSingle && l != LayoutMirror {
		t.Errorf("chosen %s: the pick should stay the held-out errors' one-direction model", d.Best().Name)
	}
}

// tenSeventy discovers (once per test binary, see discoverSpecimen) two
// equal-order families at 10° and 70° without shear information, made by
// independent numerical integration: 30 points a protocol, 2 % noise,
// noise seed 1.
func tenSeventy(t *testing.T) (*Discovery, *Problem) {
	t.Helper()
	spec := synthFrom(t, fibreMaterial(3, spreadFamily{10 * deg, -1, expSqFibre(30, 4)}, spreadFamily{70 * deg, -1, expSqFibre(25, 3)}),
		synthOptions{noise: 0.02, points: 30, seed: 1})
	return discoverSpecimen(t, spec)
}

// One fibre family spread widely in the plane (mean direction 45°, von
// Mises concentration b = 1), sutured so that the shear is measured, made
// by independent numerical integration (30 points a protocol, 2 % noise,
// strains to 0.2, noise seed 1). A mirror pair at about 27° and 63°
// brackets the spread direction: it beats the ideal one-family form by
// more than the noise explains (7 % of its held-out error) but not the
// spread one (2 %, ΔBIC 4.9), which had not itself beaten the ideal form
// decisively. The walk had compared the pair only with the form it held,
// and the verdict was a confident 2; the number of families is now
// decided against the best one-family form, so the verdict is 1, and the
// notes say which form the pair had to beat. Since the broad-spread tie
// (broadSpreadTie) the pair, which fits and predicts about as well as the
// broad family (concentration 1.17 fitted), leaves it undecided instead:
// right too for a family this broad (the verdict battery's rule), and not
// the confident 2 this test was written against.
func TestMoreFamiliesMustBeatTheBestWithFewer(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	spec := synthFrom(t, fibreMaterial(3, spreadFamily{45 * deg, 1, expSqFibre(40, 3)}),
		synthOptions{noise: 0.02, points: 30, seed: 1, sutured: true, maxStrain: 0.2})
	d, _ := discoverSpecimen(t, spec)
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "1" && (d.Verdict.Families != "undecided" || !strings.Contains(d.Verdict.Reason, "either side of it")) {
		t.Fatalf("verdict %s, want 1, or undecided by the broad-spread tie", d.Verdict.Families)
	}
	var blocked *LayoutComparison
	for i, lc := range d.Verdict.Comparisons {
		if lc.Simpler == "1+dispersed" && strings.HasPrefix(lc.Richer, "2-") {
			blocked = &d.Verdict.Comparisons[i]
		}
	}
	if blocked == nil || blocked.Decisive {
		t.Fatalf("no comparison of a two-family form with 1+dispersed that stopped it: %+v", d.Verdict.Comparisons)
	}
	said := false
	for _, n := range d.Verdict.RuledOut {
		said = said || strings.Contains(n, "decided against the best form with fewer") && strings.Contains(n, blocked.Richer)
	}
	if !said {
		t.Errorf("the notes do not say why %s was compared with 1+dispersed: %q", blocked.Richer, d.Verdict.RuledOut)
	}
}

// nearestFamilyDeg is how far, in degrees, the family of r nearest to the
// direction want lies from it, comparing |α| (the sign is not known
// without shear information).
func nearestFamilyDeg(r *Result, want float64) float64 {
	best := math.Inf(1)
	for _, f := range r.Model.Families {
		best = math.Min(best, math.Abs(math.Abs(WrapDeg(Deg(f.Angle)))-want))
	}
	return best
}

// Two equal fibre families at 0° and 90° on a neo-Hookean matrix, tested
// under load control (nominal-stress ratios 1:1, 1:0.75, 0.75:1, 1:0.5,
// 0.5:1 up to 150 kPa; 30 points a protocol, 2 % noise, no shear; made by
// independent numerical integration): each family stiffens its own axis
// much as an isotropic principal-stretch term stiffens both, and
// leave-one-protocol-out favours the isotropic form (the two-family forms
// gain about 3 % of its held-out error). In sample the mirror pair near
// 0° and 90° fits better than every isotropic model by ΔBIC 9.4. Before
// the rule the verdict was a confident 0; it is now undecided, naming the
// model with fibres, while the chosen model stays the held-out errors'
// isotropic one. An isotropic one-term principal-stretch solid (Ogden
// 1972, α = 9) tested the same way keeps its verdict 0.
func TestFibresFitBetterThanIsotropicIsUndecided(t *testing.T) {
	if testing.Short() {
		t.Skip("two discoveries")
	}
	t.Parallel()
	o := synthOptions{noise: 0.02, points: 30, seed: 1, loadMax: 150}
	orthogonal := fibreMaterial(3, spreadFamily{0, -1, expSqFibre(20, 5)}, spreadFamily{90 * deg, -1, expSqFibre(20, 5)})
	d, _ := discoverSpecimen(t, synthFrom(t, orthogonal, o))
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "undecided" {
		t.Fatalf("verdict %s, want undecided", d.Verdict.Families)
	}
	fib, iso, gap := d.fibreDisagreement()
	if fib == nil {
		t.Fatal("no in-sample disagreement between fibres and isotropy found")
	}
	if len(fib.Result.Model.Families) == 0 || iso.Result.Structure.Layout != LayoutNone || gap < DisagreeDeltaBIC {
		t.Errorf("disagreement %s over %s by %.2f", fib.Name, iso.Name, gap)
	}
	if d.Verdict.InSampleBest != fib.Name {
		t.Errorf("in_sample_best %q, want %q", d.Verdict.InSampleBest, fib.Name)
	}
	for _, s := range []string{"favour an isotropic material", fib.Name, iso.Name, fmt.Sprintf("ΔBIC %.1f", gap), "Kass & Raftery 1995"} {
		if !strings.Contains(d.Verdict.Reason, s) {
			t.Errorf("the reason does not say %q: %q", s, d.Verdict.Reason)
		}
	}
	if d.Verdict.Decider == "" {
		t.Error("an undecided verdict names no measurement that would decide")
	}
	if l := d.Best().Result.Structure.Layout; l != LayoutNone {
		t.Errorf("chosen %s: the pick should stay the held-out errors' isotropic model", d.Best().Name)
	}

	o.loadMax = 60
	d, _ = discoverSpecimen(t, synthFrom(t, ogdenMaterial(3, 9), o))
	t.Logf("isotropic solid: verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "0" {
		t.Errorf("isotropic solid under load control: verdict %s, want 0", d.Verdict.Families)
	}
}

// Without shear information fibres placed symmetrically about the 45°
// line stiffen both axes alike, as an isotropic material does
// (symmetricLookAlike). Both specimens are made by independent numerical
// integration (30 points a protocol, noise seed 1, no shear). An isotropic
// solid outside the catalogue's shapes (the exponentiated Hencky energy,
// μ = 4 kPa, k = 6), tested under load control to 40 kPa with 5 % noise,
// was fitted better than by any isotropic form by a mirror pair at ±48.1°
// and ±41.8° (held-out gain 11 %, ΔBIC 13.1): the verdict had been a
// confident 2 and became undecided, naming the isotropic look-alike (with
// 2 % noise a family at ±45.0° made it a confident 1-or-mirror-pair).
// Since the isotropic subsets are ranked at each term's own shape
// parameters, the isotropic form's best holds the walk (the pair gains
// 11.2 % of its held-out error, ΔBIC 10.3, suggestive): the verdict is
// undecided pointing towards the pair, its best-supported answer
// isotropic with the fibres symmetric about 45° named as its look-alike,
// and either way the decider is shear information or an off-axis test,
// which settles such fibres against isotropy. An ideal
// family at 45° on a neo-Hookean matrix, tested under stretch control to a
// strain of 0.25 with 2 % noise, is explained within the noise by the
// isotropic terms: the verdict is 0, and it says that such fibres cannot
// be ruled out and what would decide.
func TestFortyFiveDegreesWithoutShear(t *testing.T) {
	if testing.Short() {
		t.Skip("two discoveries")
	}
	t.Parallel()
	o := synthOptions{noise: 0.05, points: 30, seed: 1, loadMax: 40}
	d, _ := discoverSpecimen(t, synthFrom(t, expHenckyMaterial(4, 6), o))
	t.Logf("isotropic solid: verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "undecided" {
		t.Errorf("isotropic solid, load-controlled: verdict %s, want undecided", d.Verdict.Families)
	}
	if r := d.Best().Result; len(r.Model.Families) > 0 && !symmetricAbout45(r) {
		t.Errorf("chosen %s (%s): expected a family at ±45° or none", d.Best().Name, anglesText(r))
	}
	if !strings.Contains(d.Verdict.Reason, symmetricLookAlike) || d.Verdict.Decider != decider {
		t.Errorf("the verdict does not name the ±45° look-alike and its decider: %q, decider %q", d.Verdict.Reason, d.Verdict.Decider)
	}
	// The look-alike is the other side of the question: an isotropic
	// candidate beside fibres, fibres symmetric about 45° beside isotropy.
	if c := candidateNamed(d, d.Verdict.LookAlike); c == nil || (c.Result.Structure.Layout != LayoutNone) == (len(d.Best().Result.Model.Families) > 0) ||
		len(c.Result.Model.Families) > 0 && !symmetricAbout45(c.Result) {
		t.Errorf("LookAlike %q does not name the other side: an isotropic candidate beside fibres, or fibres symmetric about 45° beside isotropy", d.Verdict.LookAlike)
	}

	o = synthOptions{noise: 0.02, points: 30, seed: 1}
	d, _ = discoverSpecimen(t, synthFrom(t, fibreMaterial(3, spreadFamily{45 * deg, -1, expSqFibre(20, 5)}), o))
	t.Logf("family at 45°: verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families == "0" && (!strings.Contains(d.Verdict.Reason, "such fibres cannot be ruled out") || d.Verdict.Decider != decider) {
		t.Errorf("an isotropic verdict without shear information does not say that fibres at ±45° cannot be ruled out: %q, decider %q", d.Verdict.Reason, d.Verdict.Decider)
	}
	if c := candidateNamed(d, d.Verdict.LookAlike); d.Verdict.Families == "0" && (c == nil || !symmetricAbout45(c.Result)) {
		t.Errorf("LookAlike %q does not name a candidate with fibres symmetric about the 45° line", d.Verdict.LookAlike)
	}
	if f := d.Verdict.Families; f != "0" && f != "undecided" {
		t.Errorf("family at 45° without shear information: verdict %s, want 0 (with the caution) or undecided", f)
	}
}

// One fibre family whose directions follow a wrapped normal density about
// 35° (standard deviation 20°) rather than the von Mises density of the
// catalogue's spread families, on a neo-Hookean matrix, sutured so that
// the shear is measured (made by independent numerical integration; 30
// points a protocol, 3 % noise, strains to 0.2, noise seed 2). Before the
// flat-top refits (flatTopRefits) two ideal families bracketing 35°, at
// 61.9° and 16.5°, predicted the left-out protocols 9.4 % better than the
// von Mises family, and the verdict was a confident 2. A spread pair at
// about 48° and 22° whose densities sum to one flat-topped peak fits
// better than both: the verdict is 1, and says why.
func TestFlatToppedSpreadIsOneFamily(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	d, _ := discoverSpecimen(t, wrappedNormalSpecimen(t, 2))
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "1" {
		t.Fatalf("verdict %s, want 1", d.Verdict.Families)
	}
	r := d.Best().Result
	if !flatTop(r) || familyCount(r) != 1 {
		t.Fatalf("chosen %s (%s): want a spread pair whose densities sum to one flat-topped peak", d.Best().Name, anglesText(r))
	}
	if mean, _ := pairGeometryDeg(r); angleErr(mean, 35) > 3 {
		t.Errorf("mean direction %.1f°, true 35°", mean)
	}
	if !strings.Contains(d.Verdict.Reason, "flatter top than a von Mises density") {
		t.Errorf("the reason does not say the spread is flat-topped: %q", d.Verdict.Reason)
	}
}

// wrappedNormalSpecimen is a sutured specimen (3 % noise, 30 points a
// protocol) of one broad fibre family made by independent numerical
// integration: directions about 35° with a wrapped normal density of
// standard deviation 20° (not a von Mises density), exponential fibres on
// a neo-Hookean matrix.
func wrappedNormalSpecimen(t *testing.T, seed uint64) *biaxial.Specimen {
	mat := withMatrix(3, wrappedNormalFamily(35*deg, 20*deg, expSqFibre(40, 3)))
	return synthFrom(t, mat, synthOptions{noise: 0.03, points: 30, seed: seed, sutured: true, maxStrain: 0.2})
}

// A pair of ideal families bracketing one broad family can beat the
// catalogue's von Mises family by more than the noise explains, because
// the broad family's density has a flatter top than a von Mises one; the
// spread pair whose densities sum to one flat-topped peak (flatTop) is the
// one-family explanation it must beat too, although that form ranks after
// the ideal pairs (strongestRival). In noise seed 4 of the wrapped-normal
// specimen the ideal pair at about ±16° about 35° beat the von Mises family
// decisively but not the flat-topped pair; before the rule the verdict was
// a confident 2. The truth is one family; undecided is accepted because a
// free pair still fits better in sample by ΔBIC 6.4 (inSampleDisagreement).
func TestTwoFamiliesMustBeatAFlatTop(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	d, _ := discoverSpecimen(t, wrappedNormalSpecimen(t, 4))
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if f := d.Verdict.Families; f != "1" && f != "undecided" {
		t.Fatalf("verdict %s for one broad family, want 1 or undecided", f)
	}
	found := false
	for _, lc := range d.Verdict.Comparisons {
		if lc.Simpler == "2-mirror+dispersed" && lc.Richer == "2-mirror" {
			found = true
			if lc.Decisive {
				t.Errorf("the ideal pair beats the flat-topped pair decisively: %s", lc)
			}
		}
	}
	if !found {
		t.Fatalf("the ideal pair was not compared with the flat-topped pair: %v", d.Verdict.Comparisons)
	}
	if r := d.Best().Result; familyCount(r) != 1 {
		t.Errorf("chosen %s (%s): want a one-family explanation", d.Best().Name, anglesText(r))
	}
	noted := false
	for _, n := range d.Verdict.RuledOut {
		noted = noted || strings.Contains(n, "densities sum to one peak: one family")
	}
	if !noted {
		t.Errorf("no ruled-out note says the rival is one family: %q", d.Verdict.RuledOut)
	}
}

// twoFamilyMagnitudes returns the smaller and the larger angle magnitude
// (degrees, 0–90) of the two-family candidate of d named name, failing t
// when there is no such candidate.
func twoFamilyMagnitudes(t *testing.T, d *Discovery, name string) (lo, hi float64) {
	t.Helper()
	c := candidateNamed(d, name)
	if c == nil || familyCount(c.Result) != 2 {
		t.Fatalf("%q does not name a two-family candidate", name)
	}
	a1, a2 := math.Abs(WrapDeg(Deg(c.Result.Model.Families[0].Angle))), math.Abs(WrapDeg(Deg(c.Result.Model.Families[1].Angle)))
	return min(a1, a2), max(a1, a2)
}

// candidateNamed returns d's Pareto candidate of that name, or nil.
func candidateNamed(d *Discovery, name string) *Candidate {
	for i := range d.Pareto {
		if d.Pareto[i].Name == name {
			return &d.Pareto[i]
		}
	}
	return nil
}

// The geometric tests behind two look-alike rules, on hand-made models:
// fibres placed symmetrically about the 45° line (symmetricAbout45) and a
// spread pair whose densities sum to one peak with a visible top
// (flatTop). The flat-top limit βmax solves b·sin²2β = cos 2β (derived in
// flatTop's comment; for b = 4, cos 2βmax = (√65 − 1)/8, βmax ≈ 13.9°);
// the test checks each pair against a brute-force count of the summed
// density's maxima over 20 000 directions, which does not use the limit.
func TestLookAlikeGeometry(t *testing.T) {
	res := func(l Layout, planar bool, b float64, angles ...float64) *Result {
		m := &Model{}
		for _, a := range angles {
			m.Families = append(m.Families, Family{Angle: Rad(a), Planar: planar, Concentration: b})
		}
		return &Result{Structure: Structure{Layout: l, Planar: planar}, Model: m}
	}
	for _, c := range []struct {
		name string
		r    *Result
		want bool
	}{
		{"one family at 45°", res(LayoutSingle, false, 0, 45.4), true},
		{"one family at −45°", res(LayoutSingle, false, 0, -44.6), true},
		{"one family at 43.9°", res(LayoutSingle, false, 0, 43.9), false},
		{"a pair at ±48.1° and ±41.8°", res(LayoutMirror, false, 0, 48.1, -41.8), true},
		{"a pair at 0° and 90°", res(LayoutMirror, false, 0, 0.3, 89.9), true},
		{"a pair at ±40° about axis 1", res(LayoutMirror, false, 0, 40, -40), false},
		{"free families at 5° and 85° (two stiffnesses)", res(LayoutFree, false, 0, 5, 85), false},
		{"isotropic", res(LayoutNone, false, 0), false},
	} {
		if got := symmetricAbout45(c.r); got != c.want {
			t.Errorf("symmetricAbout45, %s: %v, want %v", c.name, got, c.want)
		}
	}
	bmax := Deg(math.Acos((math.Sqrt(65)-1)/8)) / 2
	for _, c := range []struct {
		name string
		r    *Result
		want bool
	}{
		{"b 4, β just inside βmax", res(LayoutMirror, true, 4, 35+0.99*bmax, 35-0.99*bmax), true},
		{"b 4, β just beyond βmax: two peaks", res(LayoutMirror, true, 4, 35+1.01*bmax, 35-1.01*bmax), false},
		{"b 4, β just above βmax/2", res(LayoutMirror, true, 4, 35+0.51*bmax, 35-0.51*bmax), true},
		{"b 4, β under βmax/2: a von Mises family in all but name", res(LayoutMirror, true, 4, 35+0.49*bmax, 35-0.49*bmax), false},
		{"ideal pair", res(LayoutMirror, false, 4, 45, 25), false},
		{"free spread families", res(LayoutFree, true, 4, 45, 25), false},
		{"b 0: no peak", res(LayoutMirror, true, 0, 45, 25), false},
	} {
		if got := flatTop(c.r); got != c.want {
			t.Errorf("flatTop, %s: %v, want %v", c.name, got, c.want)
		}
	}
	// The single peak itself, counted on a fine grid of x = 2(θ − α).
	peaks := func(b, beta float64) int {
		const n = 20000
		g := make([]float64, n)
		for i := range g {
			x := -math.Pi + 2*math.Pi*float64(i)/n
			g[i] = math.Exp(b*math.Cos(x-2*beta)) + math.Exp(b*math.Cos(x+2*beta))
		}
		k := 0
		for i := range g {
			if g[i] > g[(i+n-1)%n] && g[i] >= g[(i+1)%n] {
				k++
			}
		}
		return k
	}
	for _, f := range []float64{0.51, 0.99} {
		if k := peaks(4, Rad(f*bmax)); k != 1 {
			t.Errorf("b 4, β = %.2f βmax: the summed density has %d maxima, flatTop says one", f, k)
		}
	}
	if k := peaks(4, Rad(1.01*bmax)); k != 2 {
		t.Errorf("b 4, β = 1.01 βmax: the summed density has %d maxima, flatTop says two", k)
	}
}

// Fibres placed symmetrically about the tester's axes (axisSymmetric) put
// no shear stress on a specimen stretched along those axes, so they do
// not shear it on sutures, and fibres placed otherwise do: checked against
// the independent integration of independent_test.go (σ12 at
// F = diag(1.2, 1.1)), not the package's own stress. The predicate allows
// 1° either way, as the verdict's other angle tests do.
func TestAxisSymmetricShearsNoSuturedSpecimen(t *testing.T) {
	law := expSqFibre(20, 3)
	F := [4]float64{1.2, 0, 0, 1.1}
	for _, c := range []struct {
		name   string
		layout Layout
		angles []float64
		want   bool
	}{
		{"one family at 0°", LayoutSingle, []float64{0}, true},
		{"one family at 90°", LayoutSingle, []float64{90}, true},
		{"one family at 30°", LayoutSingle, []float64{30}, false},
		{"a pair at ±40°", LayoutMirror, []float64{40, -40}, true},
		{"a pair at 40° and −35°", LayoutMirror, []float64{40, -35}, false},
		{"families at 0° and 90°", LayoutFree, []float64{0, 90}, true},
		{"families at 10° and 80°", LayoutFree, []float64{10, 80}, false},
	} {
		m := &Model{}
		var fams []spreadFamily
		for _, a := range c.angles {
			m.Families = append(m.Families, Family{Angle: Rad(a)})
			fams = append(fams, spreadFamily{Rad(a), -1, law})
		}
		s := fibreMaterial(1, fams...)(F)
		scale := math.Max(math.Abs(s[0]), math.Abs(s[1]))
		sheared := math.Abs(s[2]) > 1e-3*scale
		if !c.want && !sheared || c.want && math.Abs(s[2]) > 1e-9*scale {
			t.Fatalf("%s: σ12 = %.3g against %.3g (independent integration): the case is mislabelled", c.name, s[2], scale)
		}
		r := &Result{Structure: Structure{Layout: c.layout}, Model: m, SignKnown: true}
		if got := axisSymmetric(r); got != c.want {
			t.Errorf("%s: axisSymmetric %v, want %v (σ12 = %.3g)", c.name, got, c.want, s[2])
		}
		// Within the tolerance of 1° the answer holds.
		for i := range m.Families {
			m.Families[i].Angle += Rad(0.6 * float64(1-2*(i%2)))
		}
		if got := axisSymmetric(r); got != c.want {
			t.Errorf("%s, moved by 0.6°: axisSymmetric %v, want %v", c.name, got, c.want)
		}
	}
}

// Two spread families at ±40° on sutures leave the shear at zero (their
// symmetry about axis 1), and one family at 0° with isotropic terms fits
// and predicts the protocols about as well as the true pair; the walk
// keeps fewer families unless more beat them and had answered a confident
// 1 at 0°. The architecture-tie rule makes it undecided and names the
// pair. The control is one broad family at 0° (concentration 1), whose
// rival pair at about ±28° brackets it within 60°, a look-alike of the
// spread: the architecture tie leaves it, and the broad-spread tie
// (TestBroadSpreadTieIsUndecided) makes it undecided, which the verdict
// battery counts right for a family this broad.
func TestArchitectureTieIsUndecided(t *testing.T) {
	if testing.Short() {
		t.Skip("two discoveries")
	}
	t.Parallel()
	o := synthOptions{noise: 0.02, points: 30, seed: 1, sutured: true, maxStrain: 0.2}
	pair := fibreMaterial(3, spreadFamily{40 * deg, 4, expSqFibre(30, 3)}, spreadFamily{-40 * deg, 4, expSqFibre(30, 3)})
	d, _ := discoverSpecimen(t, synthFrom(t, pair, o))
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "undecided" || d.Verdict.Decider != archDecider {
		t.Fatalf("spread pair at ±40° on sutures: verdict %s (decider %q), want undecided with the off-axis decider", d.Verdict.Families, d.Verdict.Decider)
	}
	if !strings.Contains(d.Verdict.Reason, "with their fibres in different places") {
		t.Errorf("the reason does not name the tie: %q", d.Verdict.Reason)
	}
	if c := candidateNamed(d, d.Verdict.TiesWith); c == nil || familyCount(c.Result) != 2 {
		t.Errorf("TiesWith %q does not name a two-family candidate", d.Verdict.TiesWith)
	}
	o.seed = 2
	one := fibreMaterial(3, spreadFamily{0, 1, expSqFibre(30, 3)})
	d, _ = discoverSpecimen(t, synthFrom(t, one, o))
	t.Logf("control: verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if strings.Contains(d.Verdict.Reason, "with their fibres in different places") || !strings.Contains(d.Verdict.Reason, "either side of it") {
		t.Errorf("one broad family at 0° on sutures: the reason should be the broad-spread tie, not the architecture tie: %q", d.Verdict.Reason)
	}
}

// Two families spread about ±35° (concentration 2) on a neo-Hookean
// matrix, sutured, made by independent numerical integration
// (independent_test.go), were a confident 1 at 0°: the one family's fit
// spread in the plane is broad, and a pair either side of 0° fits and
// predicts alike (broadSpreadTie). The verdict is undecided and names the
// pair. The control is one family at 0° of concentration 5, whose one
// spread fit is not broad: a pair at about ±13° either side fits better
// in sample there too, but it stays 1.
func TestBroadSpreadTieIsUndecided(t *testing.T) {
	if testing.Short() {
		t.Skip("two discoveries")
	}
	t.Parallel()
	o := synthOptions{noise: 0.02, points: 30, seed: 3, sutured: true, maxStrain: 0.2}
	pair := fibreMaterial(3, spreadFamily{35 * deg, 2, expSqFibre(30, 3)}, spreadFamily{-35 * deg, 2, expSqFibre(30, 3)})
	d, _ := discoverSpecimen(t, synthFrom(t, pair, o))
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "undecided" || d.Verdict.Decider != archDecider || !strings.Contains(d.Verdict.Reason, "either side of it") {
		t.Fatalf("spread pair at ±35° on sutures: verdict %s (decider %q), want undecided by the broad-spread tie", d.Verdict.Families, d.Verdict.Decider)
	}
	c := candidateNamed(d, d.Verdict.TiesWith)
	if c == nil || familyCount(c.Result) != 2 {
		t.Fatalf("TiesWith %q does not name a two-family candidate", d.Verdict.TiesWith)
	}
	if a, b := Deg(c.Result.Model.Families[0].Angle), Deg(c.Result.Model.Families[1].Angle); a*b >= 0 {
		t.Errorf("the tying pair at %.1f°, %.1f° is not either side of 0°", a, b)
	}
	o.seed = 1
	narrow := fibreMaterial(3, spreadFamily{0, 5, expSqFibre(30, 3)})
	d, _ = discoverSpecimen(t, synthFrom(t, narrow, o))
	t.Logf("control: verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "1" {
		t.Errorf("one family at 0° of concentration 5 on sutures: verdict %s, want 1", d.Verdict.Families)
	}
}

// The places of a two-family rival against one family (tieGeometry), on
// hand-made angles: the ±40° pair against 0° lies elsewhere; 0°/90°,
// ±9°/±81°, ±9°/±60° and ±15°/±55° without shear add a family; a pair
// bracketing the winner, a second family within 45° of the winner's, or
// two families elsewhere closer than 60° do neither; with shear, −40° is
// 80° from 40°.
func TestTieGeometry(t *testing.T) {
	for _, c := range []struct {
		dir, a1, a2     float64
		hasShear        bool
		elsewhere, adds bool
	}{
		{0, 40, -40, true, true, false},
		{0, 0, 90, true, false, true},
		{9.3, -81.3, 9.3, false, false, true},
		{9.3, 9.3, 60, false, false, true},    // 50.7° from the winner, on one side
		{9.4, 12.3, 63.5, false, false, true}, // ±10°/65° without shear
		{9.3, 9.3, 50, false, false, false},   // 40.7°: a broadening of one family
		{0, -28.4, 28.4, true, false, false},  // brackets it, 56.8° apart
		{40, 40, -40, false, false, false},    // one direction by magnitude
		{40, 40, -40, true, false, true},
		{0, 25, 85, true, true, false},
		{0, 25, 75, true, false, false},     // each 20° or more away, but 50° apart
		{0, -15, 40, true, false, false},    // 55° apart, but the far one only 40° from the winner
		{0, 15.2, 54.8, false, false, true}, // 39.6° apart, both on one side: a family added (a turned mounting)
	} {
		e, a := tieGeometry(c.dir, c.a1, c.a2, c.hasShear)
		if e != c.elsewhere || a != c.adds {
			t.Errorf("families at %g° and %g° against %g° (shear %v): elsewhere %v, adds %v; want %v, %v", c.a1, c.a2, c.dir, c.hasShear, e, a, c.elsewhere, c.adds)
		}
	}
}

// A valve-like specimen without shear information, made by independent
// numerical integration: a concentrated family at 0° and a weak spread one
// at 90° (fibre stiffness 5 kPa on a 2 kPa matrix). One family near 0°
// with isotropic terms and two families, one there and one near 90°, fit
// and predict alike, so the verdict is undecided and names the pair
// (before: a confident 1-or-mirror-pair at about ±9°); so are ideal
// families at 10° and 65°. The one-family specimens of
// TestVerdictAcceptance, still 1-or-mirror-pair, are the control (a
// narrow family at 20° stays 1-or-mirror-pair too: it was checked here
// once, and the battery pins such families), and TestTieGeometry checks
// where the rule applies.
func TestWeakSecondFamilyTieIsUndecided(t *testing.T) {
	if testing.Short() {
		t.Skip("two discoveries")
	}
	t.Parallel()
	o := synthOptions{noise: 0.02, points: 30, seed: 1}
	valve := fibreMaterial(2, spreadFamily{0, 10, expSqFibre(40, 5)}, spreadFamily{90 * deg, 3, expSqFibre(5, 2)})
	d, _ := discoverSpecimen(t, synthFrom(t, valve, o))
	v := d.Verdict
	t.Logf("verdict %s: %s", v.Families, v.Reason)
	if v.Families != "undecided" || v.Decider != archDecider {
		t.Fatalf("valve-like 0°/90°, no shear: verdict %s (decider %q), want undecided with the off-axis decider", v.Families, v.Decider)
	}
	if !strings.Contains(v.Reason, "stand in for a weak second family") {
		t.Errorf("the reason does not name the weak second family: %q", v.Reason)
	}
	if lo, hi := twoFamilyMagnitudes(t, d, v.TiesWith); lo > 20 || hi < 60 {
		t.Errorf("TiesWith %s has families at ±%.1f° and ±%.1f°, want one near 0° and one near 90°", v.TiesWith, lo, hi)
	}
	// Ideal families at 10° and 65° (the second 55° from the first, on one
	// side): before, a confident 1-or-mirror-pair at ±9°.
	two := fibreMaterial(2, spreadFamily{10 * deg, -1, expSqFibre(20, 3)}, spreadFamily{65 * deg, -1, expSqFibre(10, 2)})
	d, _ = discoverSpecimen(t, synthFrom(t, two, o))
	t.Logf("10°/65°: verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "undecided" || d.Verdict.TiesWith == "" {
		t.Errorf("ideal families at 10° and 65°, no shear: verdict %s (ties with %q), want undecided by the tie", d.Verdict.Families, d.Verdict.TiesWith)
	}
}

// Equal fibre families at ±45° on sutures: the measured shear is zero, as
// an isotropic material's is, and the pair stiffens both axes alike, so
// the isotropic verdict must say such fibres cannot be ruled out and name
// the protocol that would (before: a confident 0 with no caution).
func TestFortyFiveDegreePairOnSutures(t *testing.T) {
	// The rule alone, on hand-made winners: a pair at ±45° on sutures is
	// undecided; one family at 45° shears a sutured specimen, so the shear
	// decides and its verdict stands.
	for _, c := range []struct {
		name   string
		layout Layout
		angles []float64
		in     string
		want   string
	}{
		{"a pair at ±45°", LayoutMirror, []float64{45.3, -44.8}, "2", "undecided"},
		{"one family at 45°", LayoutSingle, []float64{45}, "1", "1"},
		{"a pair at ±40°", LayoutMirror, []float64{40, -40}, "2", "2"},
	} {
		m := &Model{}
		for _, a := range c.angles {
			m.Families = append(m.Families, Family{Angle: Rad(a)})
		}
		r := &Result{Structure: Structure{Layout: c.layout}, Model: m, SignKnown: true}
		v := Verdict{Families: c.in}
		(&Discovery{}).lookAlikeRules(evidence{hasShear: true}, r, &v)
		if v.Families != c.want {
			t.Errorf("%s on sutures: verdict %s, want %s", c.name, v.Families, c.want)
		}
		if c.want == "undecided" && v.Decider != shearedDecider {
			t.Errorf("%s on sutures: decider %q", c.name, v.Decider)
		}
	}
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	m := fibreMaterial(3, spreadFamily{45 * deg, -1, expSqFibre(30, 3)}, spreadFamily{-45 * deg, -1, expSqFibre(30, 3)})
	d, _ := discoverSpecimen(t, synthFrom(t, m, synthOptions{noise: 0.02, points: 30, seed: 3, sutured: true, maxStrain: 0.2}))
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	switch d.Verdict.Families {
	case "0":
		if !strings.Contains(d.Verdict.Reason, symmetricLookAlikeSheared) || d.Verdict.Decider != shearedDecider {
			t.Errorf("an isotropic verdict on sutures without the look-alike caution: %q (decider %q)", d.Verdict.Reason, d.Verdict.Decider)
		}
		if c := candidateNamed(d, d.Verdict.LookAlike); c == nil || !symmetricAbout45(c.Result) || !axisSymmetric(c.Result) {
			t.Errorf("LookAlike %q does not name a candidate with fibres symmetric about the axes and the 45° line", d.Verdict.LookAlike)
		}
	case "2", "undecided":
	default:
		t.Errorf("verdict %s for a pair at ±45°", d.Verdict.Families)
	}
}

// An isotropic verdict names fibres placed symmetrically about the 45°
// line as a look-alike only where the data leave them open. A neo-Hookean
// membrane (made by independent integration, fibreMaterial with no
// families; three protocols 1:1, 1:0.5 and 0.5:1 to a strain of 0.2, 1 %
// noise, no shear) is fitted far better by the isotropic terms than by any
// fibres at ±45°: the verdict says the data rule them out and names no
// look-alike, so that weft plan asks no settled question.
func TestIsotropicVerdictRulesOutAFarWorseLookAlike(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	o := synthOptions{noise: 0.01, points: 30, seed: 1, maxStrain: 0.2, ratios: [][2]float64{{1, 1}, {1, 0.5}, {0.5, 1}}}
	d, _ := discoverSpecimen(t, synthFrom(t, fibreMaterial(5), o))
	if d.Verdict.Families != "0" {
		t.Fatalf("verdict %s, want 0: %s", d.Verdict.Families, d.Verdict.Reason)
	}
	if d.Verdict.LookAlike != "" || d.Verdict.Decider != "" || !strings.Contains(d.Verdict.Reason, "so the data rule them out") {
		t.Errorf("look-alike %q, decider %q, reason %q: want the ±45° fibres ruled out and no look-alike", d.Verdict.LookAlike, d.Verdict.Decider, d.Verdict.Reason)
	}
}

// When the pick is not admissible, the replacement is the next candidate
// in the pick's own order, not the form's smallest. Two ideal families at
// 10° and 70° on an Ogden matrix without shear information
// (testdata/two-families-10-70.csv, SYNTHETIC, independent code): the pick
// free-t2-p6 is not strongly elliptic at rest, and the fewest-parameters
// fallback took free-t2-p5, which the search had not cross-validated, with
// 93 times the form's best loss, a lowest R² of 0.64 and families at
// ±0.0°/±75.2°, quoted by the confident verdict. It is now a
// cross-validated candidate within the one-standard-error threshold.
func TestInadmissiblePickReplacedInItsOrder(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	s, err := biaxial.ReadFile("../testdata/two-families-10-70.csv", biaxial.Options{})
	if err != nil {
		t.Fatal(err)
	}
	d, _ := discoverSpecimen(t, s)
	c := d.Best()
	t.Logf("verdict %s, chosen %s (%s); rule: %s", d.Verdict.Families, c.Name, anglesText(c.Result), d.Rule)
	if !strings.Contains(d.Rule, "was set aside because it is") {
		t.Fatalf("the pick was admissible (rule %q): the case this test needs is gone", d.Rule)
	}
	if c.CV == nil {
		t.Errorf("the replacement %s has no held-out error", c.Name)
	}
	for _, want := range []float64{10, 70} {
		if e := nearestFamilyDeg(c.Result, want); e > 3 {
			t.Errorf("the replacement %s has no family within 3° of %g° (%s)", c.Name, want, anglesText(c.Result))
		}
	}
}

// Two families spread about ±40° (concentration 4) on a neo-Hookean
// matrix, sutured, with tracking noise of 0.001 in every measured F entry,
// made by independent numerical integration of the fibre stress over
// directions (independent_test.go; the verdict battery's specimen), were a
// confident 1 at 0°: a spread mirror pair at about ±38° predicted the
// left-out protocols better than the one family and fitted worse in sample
// by ΔBIC 6.8, just beyond the strong bound of 6 (Kass & Raftery 1995).
// The held-out error favours the pair and the in-sample evidence against it
// is short of the very strong 10 the walk asks (tieBICBound), so the
// verdict is undecided and names the pair. The control, one family at 90°
// (concentration 3) on a Demiray matrix, sutured, made the same way, is
// right only as 1: two families at 0° and 90° predict its left-out
// protocols better too (ΔBIC −7.2), but they are the look-alike of the
// matrix's isotropic stiffening (lookAlike), so the strong bound stays and
// so does the 1.
func TestBetterPredictingRivalTies(t *testing.T) {
	if testing.Short() {
		t.Skip("two discoveries")
	}
	t.Parallel()
	o := synthOptions{noise: 0.02, points: 30, seed: 1, sutured: true, maxStrain: 0.2, stretchNoise: 0.001}
	pair := fibreMaterial(3, spreadFamily{40 * deg, 4, expSqFibre(30, 3)}, spreadFamily{-40 * deg, 4, expSqFibre(30, 3)})
	d, _ := discoverSpecimen(t, synthFrom(t, pair, o))
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "undecided" || d.Verdict.Decider != archDecider {
		t.Fatalf("spread pair at ±40° on sutures with tracking noise: verdict %s (decider %q), want undecided with the off-axis decider", d.Verdict.Families, d.Verdict.Decider)
	}
	if !strings.Contains(d.Verdict.Reason, "predict the left-out protocols better") {
		t.Errorf("the reason does not say that the pair predicts better: %q", d.Verdict.Reason)
	}
	c := candidateNamed(d, d.Verdict.TiesWith)
	if c == nil || familyCount(c.Result) != 2 {
		t.Fatalf("TiesWith %q does not name a two-family candidate", d.Verdict.TiesWith)
	}
	// The true families lie at ±40° (the generator's); the tying pair must
	// put its fibres there, 20° or more from the answer's 0° on both sides.
	for _, f := range c.Result.Model.Families {
		if a := math.Abs(Deg(f.Angle)); a < 30 || a > 50 {
			t.Errorf("the tying pair has a family at %.1f°, not near the true ±40°", Deg(f.Angle))
		}
	}
	o = synthOptions{noise: 0.02, points: 30, seed: 1, sutured: true, maxStrain: 0.2}
	one := plus(demirayMatrix(2, 5), fibreMaterial(0.001, spreadFamily{90 * deg, 3, expSqFibre(20, 3)}))
	d, _ = discoverSpecimen(t, synthFrom(t, one, o))
	t.Logf("control: verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	if d.Verdict.Families != "1" {
		t.Errorf("one family at 90° on a Demiray matrix, sutured: verdict %s, want 1 (its 0°/90° rival is the matrix's look-alike)", d.Verdict.Families)
	}
}

// TestTieBICBound checks the bound's three cases on made-up comparisons:
// a rival that predicts better and has no look-alike ties up to the very
// strong ΔBIC of 10, one that predicts worse, or is a look-alike (families
// near 0° and 90°, or a pair bracketing one direction), up to the strong 6
// (Kass & Raftery 1995; the scale's grades from memory).
func TestTieBICBound(t *testing.T) {
	res := func(a1, a2 float64) *Result {
		return &Result{Model: &Model{Families: []Family{{Angle: a1 * deg}, {Angle: a2 * deg}}}, SignKnown: true}
	}
	for _, c := range []struct {
		gain   float64
		r      *Result
		want   float64
		reason string
	}{
		{1e-5, res(38, -38), 10, "predicts better, fibres elsewhere"},
		{-1e-5, res(38, -38), 6, "predicts worse"},
		{0, res(38, -38), 6, "predicts alike"},
		{1e-5, res(0.1, 90), 6, "0°/90°: the look-alike of isotropic stiffening"},
		{1e-5, res(-13, 13), 6, "brackets 0°: the look-alike of one spread family"},
	} {
		if got := tieBICBound(LayoutComparison{Gain: c.gain}, c.r); got != c.want {
			t.Errorf("%s: bound %g, want %g", c.reason, got, c.want)
		}
	}
}

// A tie weighs each two-family form's lowest-BIC model beside its
// best-predicting one (tieRivals). Made by independent numerical
// integration (aniso/independent_test.go; the battery's unequal families):
// ideal families at 20° and 75° of fibre stiffness 30 and 10 kPa on a
// 2 kPa neo-Hookean matrix, five protocols without shear, 2 % noise. The
// one-family answer near ±27° was a confident 1-or-mirror-pair: the free
// pair's best-predicting model fitted worse by more than the tie's ΔBIC
// bound, while another model of that form, near 21°/81°, fitted and
// predicted alike. The verdict is now undecided and names a two-family
// rival with one family near each of the tissue's directions (within 10°;
// without shear angles are compared by magnitude).
func TestTieWeighsTheFormsLowestBICModel(t *testing.T) {
	if testing.Short() {
		t.Skip("a discovery")
	}
	t.Parallel()
	m := fibreMaterial(2, spreadFamily{20 * deg, -1, expSqFibre(30, 3)}, spreadFamily{75 * deg, -1, expSqFibre(10, 3)})
	d, _ := discoverSpecimen(t, synthFrom(t, m, synthOptions{noise: 0.02, points: 30, seed: 1}))
	v := d.Verdict
	t.Logf("verdict %s: %s", v.Families, v.Reason)
	if v.Families != "undecided" || v.TiesWith == "" {
		t.Fatalf("verdict %s (ties with %q), want undecided with a two-family rival", v.Families, v.TiesWith)
	}
	var rival *Candidate
	for i := range d.Pareto {
		if d.Pareto[i].Name == v.TiesWith {
			rival = &d.Pareto[i]
		}
	}
	if rival == nil || familyCount(rival.Result) != 2 {
		t.Fatalf("the rival %s is not a two-family candidate", v.TiesWith)
	}
	got := []float64{math.Abs(WrapDeg(Deg(rival.Result.Model.Families[0].Angle))), math.Abs(WrapDeg(Deg(rival.Result.Model.Families[1].Angle)))}
	sort.Float64s(got)
	if math.Abs(got[0]-20) > 10 || math.Abs(got[1]-75) > 10 {
		t.Errorf("the rival %s has families at ±%.1f° and ±%.1f°, want near 20° and 75°", v.TiesWith, got[0], got[1])
	}
}
