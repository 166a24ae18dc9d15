package aniso

import (
	"fmt"
	"math"
	"sort"
)

// Selection: the fibre-family verdict is decided first, from the evidence
// of whole layouts, and the model form inside the winning layout second.
//
// Forms are ranked from simplest to richest: fewer families first, then an
// ideal family before a spread one, a mirror pair before two free families
// (formRank). Each form is represented by its best cross-validated model.
// Walking the ranking, a richer form replaces the current winner only when
// it beats it by more than the noise can explain (compare), and a form
// with more families than the winner must also beat, in the same way, the
// form with the winner's number of families that predicts best
// (strongestRival). Beating means: the per-fold paired differences of
// their leave-one-protocol-out errors average more than two standard
// errors (the standard error never below the sampling error of the noise
// estimate, seFloor), by at least MinRelativeGain of the simpler form's
// error, and with ΔBIC ≥ MinDeltaBIC ("very strong" on the scale of Kass &
// Raftery 1995, J Am Stat Assoc 90:773–795). Inside the winning form the
// one-standard-error rule (Hastie, Tibshirani & Friedman 2009, §7.10)
// picks the smallest model.
//
// Numbers that agree within TieTolerance (relative) are ties, broken by
// fewer families, then fewer parameters, then catalogue order, so that the
// pick cannot flip with the stress unit or a rounding of the data.

const (
	// TieTolerance is the relative difference below which two losses or
	// held-out errors are treated as equal.
	TieTolerance = 1e-6
	// MinRelativeGain is the smallest improvement of the held-out error,
	// as a fraction of the simpler form's, that counts for a richer form.
	MinRelativeGain = 0.05
	// MinDeltaBIC is the BIC difference a richer form must reach.
	MinDeltaBIC = 10
	// DisagreeDeltaBIC is how far below the best one-direction model's BIC
	// a model with two distinct fibre directions must lie for the verdict
	// to be undecided when the held-out errors favour one direction
	// ("strong" evidence on the scale of Kass & Raftery 1995; see
	// inSampleDisagreement).
	DisagreeDeltaBIC = 6.0
	// pairedSE is how many paired standard errors the gain must exceed.
	pairedSE = 2
)

// less reports a < b beyond TieTolerance.
func less(a, b float64) bool {
	return a < b-TieTolerance*math.Max(math.Abs(a), math.Abs(b))
}

// formBest is a form's representative: its best cross-validated model.
type formBest struct {
	key  string
	rank int
	c    *Candidate
	idx  int // index into Pareto
}

// candidateLess orders candidates by held-out error (or BIC without
// cross-validation), ties broken by fewer families, fewer parameters, then
// name (catalogue order is encoded in the name's form and sizes).
func candidateLess(a, b *Candidate) bool {
	va, vb := a.Result.BIC, b.Result.BIC
	if a.CV != nil && b.CV != nil {
		va, vb = a.CV.Mean, b.CV.Mean
	}
	if less(va, vb) {
		return true
	}
	if less(vb, va) {
		return false
	}
	if fa, fb := a.Layout.Families(), b.Layout.Families(); fa != fb {
		return fa < fb
	}
	if a.Result.Complexity != b.Result.Complexity {
		return a.Result.Complexity < b.Result.Complexity
	}
	return a.Name < b.Name
}

// noiseLevel estimates the noise in held-out-error units from the lowest
// in-sample loss: √(loss / (protocols × components)), corrected for the
// fitted parameters.
func (d *Discovery) noiseLevel(ev evidence) float64 {
	best := math.Inf(1)
	k := 0
	for i := range d.Pareto {
		if r := d.Pareto[i].Result; r.Loss < best {
			best, k = r.Loss, r.FreeParams
		}
	}
	n := float64(ev.rows)
	dof := math.Max(n-float64(k), 1)
	return math.Sqrt(best * n / dof / float64(ev.series))
}

// seFloor is the smallest standard error a held-out comparison may claim:
// the sampling error of an RMS estimate from N residuals at the noise
// level σ, σ/√(2N) (common practice for a χ² variance estimate), so that
// identical protocols cannot make the evidence look infinitely precise.
func seFloor(noise float64, ev evidence) float64 {
	return noise / math.Sqrt(2*float64(ev.rows))
}

// compare measures how much richer beats simpler.
func compare(simpler, richer *formBest, floor float64) LayoutComparison {
	lc := LayoutComparison{Simpler: simpler.key, Richer: richer.key,
		DeltaBIC: simpler.c.Result.BIC - richer.c.Result.BIC}
	s, r := simpler.c.CV, richer.c.CV
	if s == nil || r == nil {
		// Without cross-validation only the BIC speaks.
		lc.Decisive = lc.DeltaBIC >= MinDeltaBIC
		lc.Suggestive = !lc.Decisive && lc.DeltaBIC > 2
		lc.StdErr, lc.Gain, lc.RelativeGain = math.NaN(), math.NaN(), math.NaN()
		return lc
	}
	n := len(s.Folds)
	diffs := make([]float64, 0, n)
	for f := 0; f < n && f < len(r.Folds); f++ {
		a, b := s.Folds[f].Error, r.Folds[f].Error
		if math.IsInf(a, 0) || math.IsInf(b, 0) || math.IsNaN(a) || math.IsNaN(b) {
			continue
		}
		diffs = append(diffs, a-b)
	}
	if len(diffs) == 0 {
		lc.Gain, lc.StdErr, lc.RelativeGain = math.NaN(), math.NaN(), math.NaN()
		return lc
	}
	mean := 0.0
	for _, x := range diffs {
		mean += x
	}
	mean /= float64(len(diffs))
	v := 0.0
	for _, x := range diffs {
		v += (x - mean) * (x - mean)
	}
	se := 0.0
	if len(diffs) > 1 {
		se = math.Sqrt(v/float64(len(diffs)-1)) / math.Sqrt(float64(len(diffs)))
	}
	lc.Gain, lc.StdErr = mean, math.Max(se, floor)
	if s.Mean > 0 {
		lc.RelativeGain = mean / s.Mean
	}
	lc.Decisive = lc.Gain > pairedSE*lc.StdErr && lc.RelativeGain >= MinRelativeGain && lc.DeltaBIC >= MinDeltaBIC
	lc.Suggestive = !lc.Decisive && lc.Gain > lc.StdErr && lc.RelativeGain >= MinRelativeGain/2 && lc.DeltaBIC > 2
	return lc
}

// formBests returns each form's best model, simplest form first.
func (d *Discovery) formBests() []*formBest {
	by := map[string]*formBest{}
	for i := range d.Pareto {
		c := &d.Pareto[i]
		if d.hasCV && c.CV == nil {
			continue
		}
		k := FormKey(c.Result.Structure)
		if fb, ok := by[k]; !ok || candidateLess(c, fb.c) {
			by[k] = &formBest{key: k, rank: formRank(c.Result.Structure), c: c, idx: i}
		}
	}
	out := make([]*formBest, 0, len(by))
	for _, fb := range by {
		out = append(out, fb)
	}
	sort.Slice(out, func(a, b int) bool { return out[a].rank < out[b].rank })
	return out
}

// decide walks the forms, picks the winner and the model inside it, and
// writes the rule and the verdict;
// idealOnly says that no in-plane spread forms were searched.
func (d *Discovery) decide(p *Problem, idealOnly bool) {
	ev := problemEvidence(p)
	ev.idealOnly = idealOnly
	d.decideOn(ev)
}

// decideOn is decide on the evidence ev, which a cohort pools over its
// specimens.
func (d *Discovery) decideOn(ev evidence) {
	noise := d.noiseLevel(ev)
	floor := seFloor(noise, ev)
	bests := d.formBests()
	var notes []string
	win := bests[0]
	var comps []LayoutComparison
	var open []LayoutComparison // suggestive steps to a different family count
	for _, fb := range bests[1:] {
		if coincident(fb.c.Result) {
			notes = append(notes, fmt.Sprintf("%s was not considered: its two families point the same way (%s), which is one family", fb.key, anglesText(fb.c.Result)))
			continue
		}
		lc := compare(win, fb, floor)
		comps = append(comps, lc)
		if lc.Decisive && familyCount(fb.c.Result) > familyCount(win.c.Result) {
			if rival := strongestRival(bests, win, fb); rival != nil {
				// More families must beat the fewer families' best
				// predictor too, not only the form the walk holds.
				lc2 := compare(rival, fb, floor)
				comps = append(comps, lc2)
				if !lc2.Decisive {
					flat := ""
					if flatTop(rival.c.Result) {
						flat = " (a spread pair whose densities sum to one peak: one family)"
					}
					notes = append(notes, fmt.Sprintf("%s beats %s decisively but not %s%s, the form with as many families that predicts best (%s): the number of fibre families is decided against the best form with fewer", fb.key, win.key, rival.key, flat, lc2))
					if lc2.Suggestive {
						open = append(open, lc2)
					}
					continue
				}
			}
		}
		if lc.Decisive {
			win = fb
			open = open[:0]
			continue
		}
		if lc.Suggestive && familyCount(fb.c.Result) != familyCount(win.c.Result) {
			open = append(open, lc)
		}
	}
	d.Chosen = d.oneSE(win.key, floor)
	d.ensureAdmissible(ev)
	d.Verdict = d.verdictFor(ev, win, comps, open, notes)
	d.orthotropyRule(&d.Verdict)
	d.presetCaution(&d.Verdict)
	d.Verdict.Noise, d.Verdict.StdErrFloor = noise, floor
}

// strongestRival returns, when richer has more fibre families than the
// walk's winner, the form with the winner's number of families
// (familyCount) whose best model predicts best (candidateLess), if that is
// not the winner itself; nil otherwise. The rival may rank after richer:
// a spread pair whose densities sum to one flat-topped peak (flatTop) is
// one family but ranks after the ideal pairs. Without it, an ideal pair
// bracketing a broad single family could win on the strength of beating
// the von Mises family alone (on an independently integrated sutured
// specimen, a wrapped-normal family about 35° with a standard deviation of
// 20°, noise seed 4: a pair at ±16° about 35° beat the spread family by
// 5.6 % of its held-out error, ΔBIC 63.8, and lost to the flat-topped
// pair by 1.4 %, ΔBIC −9.2; TestTwoFamiliesMustBeatAFlatTop). A spread
// one-family form that did not beat the ideal one decisively stays the
// winner's rival: two families bracketing a widely spread direction beat
// the ideal family by more than the noise explains but not the spread
// one (on an
// independently integrated sutured specimen, one family spread about 45°
// with concentration b = 1, a mirror pair at 26.8° and 63.1° beat the
// ideal family by 7.0 % of its held-out error, ΔBIC 54.5, and the spread
// family by 2.1 %, ΔBIC 4.9; TestMoreFamiliesMustBeatTheBestWithFewer).
func strongestRival(bests []*formBest, win, richer *formBest) *formBest {
	n := familyCount(win.c.Result)
	var rival *formBest
	for _, o := range bests {
		if o != richer && familyCount(o.c.Result) == n && (rival == nil || candidateLess(o.c, rival.c)) {
			rival = o
		}
	}
	if rival == win {
		return nil
	}
	return rival
}

// inSampleDisagreement looks, when the walk (which weighs held-out
// errors) has found one fibre direction (verdictFor asks), for a model
// with two distinct fibre directions (twoDirections) whose BIC lies at
// least DisagreeDeltaBIC below that of every one-direction model
// (oneDirection: one family, ideal or spread; without shear information
// also two families at ±α, which have its normal stresses). Such a model fits the data better
// in sample, its extra parameters counted against it, so one family is
// not a safe answer even though it predicts the left-out protocols as
// well. Calibration (README, Fibre families): equal families at 10° and
// 70° without shear information, 30 points a protocol and 2 % noise, gave
// gaps of 9.6–17.8 in three noise seeds, all with a one-direction verdict
// by held-out error, and every two-family specimen of the verdict panel
// without shear 9.6 or more (8.9 or more weighted as a file is); 36 one-family specimens in the same
// conditions (three matrices; ideal, spread and recruited families) −3.4
// at most, the one-family acceptance specimens −2.6 at most
// (TestInSampleDisagreementIsUndecided, TestVerdictPanel). It sees only
// the models the search found; the second-family refits
// (secondFamilyRefits) put the plain two-family form of the best
// one-family models among them. It returns the two-direction model, the
// best one-direction model and the gap, or nils.
func (d *Discovery) inSampleDisagreement(ev evidence) (two, one *Candidate, gap float64) {
	return d.bicDisagreement(
		func(r *Result) bool { return oneDirection(r, ev.hasShear) },
		func(r *Result) bool { return twoDirections(r, ev.hasShear) })
}

// fibreDisagreement is inSampleDisagreement for an isotropic verdict: it
// looks for a model with fibres whose BIC lies at least DisagreeDeltaBIC
// below that of every isotropic model. Two families near 0° and 90° stiffen
// each axis much as an isotropic matrix with principal-stretch terms does,
// so within the tested protocols their held-out errors can tie while the
// fibres still fit better. Calibration (README, Fibre families): 92
// discoveries of isotropic materials made by independent code (neo-Hookean,
// one- and three-term principal-stretch, Gent, Yeoh, Demiray and
// exponentiated Hencky matrices; stretch- and load-controlled protocols,
// 2 and 5 % noise, with and without shear, two seeds) gave −0.3 at most;
// equal fibre families at 0° and 90° on a neo-Hookean matrix,
// load-controlled at 2 % noise, 6.3–10.0 with an isotropic verdict by
// held-out error (TestFibresFitBetterThanIsotropicIsUndecided).
// It returns the model with fibres, the best isotropic model and the gap,
// or nils.
func (d *Discovery) fibreDisagreement() (fibres, iso *Candidate, gap float64) {
	return d.bicDisagreement(
		func(r *Result) bool { return r.Structure.Layout == LayoutNone },
		func(r *Result) bool { return len(r.Model.Families) > 0 })
}

// bicDisagreement returns the lowest-BIC candidate of the richer kind, the
// lowest-BIC candidate of the simpler kind and the gap between their BICs
// (on the compared points) when the gap reaches DisagreeDeltaBIC, or nils.
// The two kinds are disjoint in every caller, so each is searched on its
// own (lowestBICCandidate).
func (d *Discovery) bicDisagreement(simpler, richer func(*Result) bool) (rich, simp *Candidate, gap float64) {
	simp, rich = d.lowestBICCandidate(simpler), d.lowestBICCandidate(richer)
	if simp == nil || rich == nil {
		return nil, nil, 0
	}
	gap = simp.Compared().BIC - rich.Compared().BIC
	if gap < DisagreeDeltaBIC {
		return nil, nil, 0
	}
	return rich, simp, gap
}

// oneDirection reports whether r has one fibre direction as the data can
// see it: one family (a spread pair with one peak too, see flatTop), or
// without shear information two families whose
// angles differ only in sign (within 1°, as verdictFor tells a mirror pair
// from two families), which give the normal stresses of one family.
func oneDirection(r *Result, hasShear bool) bool {
	switch {
	case r.Structure.Layout == LayoutSingle || flatTop(r):
		return true
	case len(r.Model.Families) == 2 && !hasShear:
		return absAngleGapDeg(r) < 1
	}
	return false
}

// twoDirections reports whether r has two fibre directions the data can
// tell apart: two families not within 2° of each other (coincident) and,
// without shear information, whose angles differ by at least 2° in
// magnitude too. A mirror pair about a mean direction off the axes (at
// 10° and 70°, say) is two directions without shear as much as two free
// families are.
func twoDirections(r *Result, hasShear bool) bool {
	if len(r.Model.Families) != 2 || coincident(r) || flatTop(r) {
		return false
	}
	return hasShear || absAngleGapDeg(r) >= 2
}

// oneSE applies the one-standard-error rule inside one form and returns
// the index of the pick in Pareto.
func (d *Discovery) oneSE(form string, floor float64) int {
	var in []int
	for i := range d.Pareto {
		if FormKey(d.Pareto[i].Result.Structure) == form && (!d.hasCV || d.Pareto[i].CV != nil) {
			in = append(in, i)
		}
	}
	best := in[0]
	for _, i := range in[1:] {
		if candidateLess(&d.Pareto[i], &d.Pareto[best]) {
			best = i
		}
	}
	b := &d.Pareto[best]
	if b.CV == nil {
		d.Rule = fmt.Sprintf("one protocol only, so no cross-validation: inside form %s the pick is the lowest BIC (%s, BIC %.1f)", form, b.Name, b.Result.BIC)
		return best
	}
	se := math.Max(b.CV.StdErr, floor)
	thr := b.CV.Mean + se
	pick := best
	for _, i := range in {
		c := &d.Pareto[i]
		if less(thr, c.CV.Mean) {
			continue
		}
		pc := &d.Pareto[pick]
		switch {
		case c.Result.Complexity < pc.Result.Complexity:
			pick = i
		case c.Result.Complexity == pc.Result.Complexity && candidateLess(c, pc):
			pick = i
		}
	}
	c := &d.Pareto[pick]
	d.Rule = fmt.Sprintf("inside form %s (the verdict's), the smallest model (fewest weights and non-linear parameters) whose leave-one-protocol-out error is within one standard error of the form's best: best %s %.4f ± %.4f (standard error floored at %.2g), threshold %.4f; picked %s (%d parameters, error %.4f)",
		form, b.Name, b.CV.Mean, se, floor, thr, c.Name, c.Result.Complexity, c.CV.Mean)
	return pick
}

// ensureAdmissible keeps the pick if it is admissible where it was fitted;
// otherwise it takes the next candidate of the same form that is, in the
// pick's own order: a cross-validated one within the one-standard-error
// threshold (fewest parameters, then lowest held-out error), then any
// cross-validated one (lowest held-out error), then one without a
// held-out error (lowest BIC); and says why in the rule. Fewest
// parameters first over the whole form once took a candidate the search
// had not cross-validated, with 93 times the form's best loss and a
// lowest R² of 0.64 (a synthetic pair at 10°/70°, independent code,
// without shear, 1 % noise).
func (d *Discovery) ensureAdmissible(ev evidence) {
	c := &d.Pareto[d.Chosen]
	why := ev.admissible(c)
	if why == "" {
		return
	}
	form := FormKey(c.Result.Structure)
	var in []int
	var best *Candidate // the form's best cross-validated candidate, as oneSE takes it
	for i := range d.Pareto {
		ci := &d.Pareto[i]
		if FormKey(ci.Result.Structure) != form {
			continue
		}
		if ci.CV != nil && (best == nil || candidateLess(ci, best)) {
			best = ci
		}
		if i != d.Chosen {
			in = append(in, i)
		}
	}
	thr := math.Inf(-1)
	if best != nil {
		thr = best.CV.Mean + math.Max(best.CV.StdErr, seFloor(d.noiseLevel(ev), ev))
	}
	group := func(c *Candidate) int {
		switch {
		case c.CV != nil && !less(thr, c.CV.Mean):
			return 0
		case c.CV != nil:
			return 1
		}
		return 2
	}
	sort.SliceStable(in, func(a, b int) bool {
		ca, cb := &d.Pareto[in[a]], &d.Pareto[in[b]]
		if ga, gb := group(ca), group(cb); ga != gb {
			return ga < gb
		}
		if group(ca) == 0 && ca.Result.Complexity != cb.Result.Complexity {
			return ca.Result.Complexity < cb.Result.Complexity
		}
		return candidateLess(ca, cb)
	})
	for _, i := range in {
		if ev.admissible(&d.Pareto[i]) == "" {
			d.Rule += fmt.Sprintf("; %s was set aside because it is %s, inside its fitted range; the next admissible candidate of the form, %s, was taken", c.Name, why, d.Pareto[i].Name)
			d.Chosen = i
			return
		}
	}
	d.Rule += fmt.Sprintf("; CAUTION: %s is %s, inside its fitted range, and no other candidate of its form is admissible there", c.Name, why)
}

// admissibleOnData checks stability and strong ellipticity (see
// admissible.go) at the deformations a model was fitted to, at most
// maxChecks of them spread evenly; it returns "" when they pass, else what
// failed where.
func admissibleOnData(m *Model, p *Problem) string {
	const maxChecks, directions = 60, 36
	n := p.Data.Points()
	step := 1
	if n > maxChecks {
		step = (n + maxChecks - 1) / maxChecks
	}
	tol := 1e-10 * m.StressScale()
	for i := 0; i < n; i += step {
		F := p.Data.Kinematics(i).F
		ps, err := m.StabilityAt(F, directions)
		if err != nil {
			return fmt.Sprintf("cannot be evaluated at F = %.4g: %v", F, err)
		}
		if f, _ := ps.fails(ps.MinModuloRotation, tol); f {
			return fmt.Sprintf("unstable at F = %.4g (smallest tangent eigenvalue modulo rotation %.3g)", F, ps.MinModuloRotation)
		}
		if f, _ := ps.fails(ps.MinEllipticity, tol); f {
			return fmt.Sprintf("not strongly elliptic at F = %.4g (%.3g)", F, ps.MinEllipticity)
		}
	}
	return ""
}
