package aniso

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// Selection: the fibre-family verdict is decided first, from the evidence
// of whole layouts, and the model form inside the winning layout second.
//
// Forms are ranked from simplest to richest: fewer families first, then an
// ideal family before a spread one, a mirror pair before two free families
// (formRank). Each form is represented by its best cross-validated model.
// Walking the ranking, a richer form replaces the current winner only when
// it beats it by more than the noise can explain (beats): the per-fold
// paired differences of their leave-one-protocol-out errors average more
// than two standard errors (the standard error never below the sampling
// error of the noise estimate, seFloor), by at least MinRelativeGain of the
// simpler form's error, and with ΔBIC ≥ MinDeltaBIC ("very strong" on the
// scale of Kass & Raftery 1995, J Am Stat Assoc 90:773–795). Inside the
// winning form the one-standard-error rule (Hastie, Tibshirani & Friedman
// 2009, §7.10) picks the smallest model.
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
	// pairedSE is how many paired standard errors the gain must exceed.
	pairedSE = 2
)

// less reports a < b beyond TieTolerance.
func less(a, b float64) bool {
	return a < b-TieTolerance*math.Max(math.Abs(a), math.Abs(b))
}

// FormKey names a model form for the verdict's evidence: "0" (isotropic),
// "1", "2-mirror" or "2-free", followed by "+dispersed" for families spread
// in the plane or "+kappa" for a three-dimensional dispersion.
func FormKey(st Structure) string {
	k := map[Layout]string{LayoutNone: "0", LayoutSingle: "1", LayoutMirror: "2-mirror", LayoutFree: "2-free"}[st.Layout]
	switch {
	case st.Planar:
		k += "+dispersed"
	case st.Dispersion:
		k += "+kappa"
	}
	return k
}

// formRank orders forms from simplest to richest (see the package note).
func formRank(st Structure) int {
	r := map[Layout]int{LayoutNone: 0, LayoutSingle: 10, LayoutMirror: 20, LayoutFree: 30}[st.Layout]
	switch {
	case st.Planar:
		r += 1
	case st.Dispersion:
		r += 2
	}
	return r
}

// LayoutComparison is one step of the walk over forms: whether a richer
// form's best model beats the current winner by more than the noise.
type LayoutComparison struct {
	// Simpler and Richer are form keys (see FormKey).
	Simpler, Richer string
	// Gain is the mean per-fold reduction of the held-out error (simpler
	// minus richer; dimensionless, like CVFold.Error), StdErr its standard
	// error (floored), RelativeGain Gain over the simpler form's error.
	Gain, StdErr, RelativeGain float64
	// DeltaBIC is the simpler model's BIC minus the richer one's.
	DeltaBIC float64
	// Decisive is true when every criterion holds, so the richer form
	// became the winner; Suggestive when the richer form is better by at
	// least one standard error and ΔBIC > 2 without being decisive.
	Decisive, Suggestive bool
}

// String states the comparison with its numbers.
func (c LayoutComparison) String() string {
	v := "not enough"
	switch {
	case c.Decisive:
		v = "decisive"
	case c.Suggestive:
		v = "suggestive, not decisive"
	}
	return fmt.Sprintf("%s over %s: held-out gain %.4g ± %.2g (%.1f %% of %s's error), ΔBIC %.1f — %s",
		c.Richer, c.Simpler, c.Gain, c.StdErr, 100*c.RelativeGain, c.Simpler, c.DeltaBIC, v)
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
func (d *Discovery) noiseLevel(p *Problem) float64 {
	best := math.Inf(1)
	k := 0
	for i := range d.Pareto {
		if r := d.Pareto[i].Result; r.Loss < best {
			best, k = r.Loss, r.FreeParams
		}
	}
	n := float64(p.Rows())
	dof := math.Max(n-float64(k), 1)
	return math.Sqrt(best * n / dof / float64(len(p.Protocols)*len(p.Output.Components)))
}

// seFloor is the smallest standard error a held-out comparison may claim:
// the sampling error of an RMS estimate from N residuals at the noise
// level σ, σ/√(2N) (common practice for a χ² variance estimate), so that
// identical protocols cannot make the evidence look infinitely precise.
func seFloor(noise float64, p *Problem) float64 {
	return noise / math.Sqrt(2*float64(p.Rows()))
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

// coincident reports a two-family model whose families point the same way
// (within 2°): really one family, whatever its layout says.
func coincident(r *Result) bool {
	if len(r.Model.Families) != 2 {
		return false
	}
	d := math.Abs(WrapDeg(Deg(r.Model.Families[0].Angle - r.Model.Families[1].Angle)))
	return d < 2
}

// decide walks the forms, picks the winner and the model inside it, and
// writes the rule and the verdict.
func (d *Discovery) decide(p *Problem) {
	noise := d.noiseLevel(p)
	floor := seFloor(noise, p)
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
		if lc.Decisive {
			win = fb
			open = open[:0]
			continue
		}
		if lc.Suggestive && fb.c.Layout.Families() != win.c.Layout.Families() {
			open = append(open, lc)
		}
	}
	d.Chosen = d.oneSE(win.key, floor)
	d.ensureAdmissible(p)
	d.Verdict = d.verdictFor(p, win, comps, open, notes)
	d.Verdict.Noise, d.Verdict.StdErrFloor = noise, floor
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

// anglesText writes a result's family angles.
func anglesText(r *Result) string {
	var s []string
	for _, f := range r.Model.Families {
		a := Deg(f.Angle)
		if r.SignKnown {
			s = append(s, fmt.Sprintf("%.1f°", a))
		} else {
			s = append(s, fmt.Sprintf("±%.1f°", math.Abs(a)))
		}
	}
	return strings.Join(s, ", ")
}

// decider is the measurement that settles one family against a mirror
// pair (package documentation, Mirror symmetry).
const decider = "shear information: track F12 and F21 with markers (a specimen on sutures or rakes shears when its fibres are off-axis), or add an off-axis protocol (the specimen cut or mounted at 45° to the current axes)"

// lookAlike describes a richer form's best model when it has a known
// simpler look-alike, or returns "".
func lookAlike(r *Result) string {
	fs := r.Model.Families
	if len(fs) != 2 {
		return ""
	}
	a := WrapDeg(Deg(fs[0].Angle))
	b := WrapDeg(Deg(fs[1].Angle))
	near := func(x, y float64) bool { return math.Abs(WrapDeg(x-y)) < 10 }
	if (near(a, 0) && near(b, 90)) || (near(a, 90) && near(b, 0)) {
		return "two families near 0° and 90° stiffen both axes alike, a look-alike of isotropic stiffening"
	}
	if !r.SignKnown {
		// Without shear information only |α| is known.
		a, b = math.Abs(a), math.Abs(b)
	}
	if d := math.Abs(WrapDeg(a - b)); d > 2 && d < 60 {
		mid := WrapDeg(a + WrapDeg(b-a)/2)
		return fmt.Sprintf("two families bracketing %.1f° (at %.1f° and %.1f°) are a look-alike of one family spread about %.1f°", mid, a, b, mid)
	}
	return ""
}

// verdictFor writes the verdict of the winning form.
func (d *Discovery) verdictFor(p *Problem, win *formBest, comps, open []LayoutComparison, notes []string) Verdict {
	v := Verdict{DeltaBIC: map[string]float64{}, CVError: map[string]float64{}, Comparisons: comps}
	bests := d.formBests()
	minBIC := math.Inf(1)
	for _, fb := range bests {
		minBIC = math.Min(minBIC, fb.c.Result.BIC)
	}
	byKey := map[string]*formBest{}
	for _, fb := range bests {
		byKey[fb.key] = fb
		v.DeltaBIC[fb.key] = fb.c.Result.BIC - minBIC
		if fb.c.CV != nil {
			v.CVError[fb.key] = fb.c.CV.Mean
		}
	}
	for _, lc := range comps {
		if lc.Decisive || !(lc.Gain > 0 || lc.DeltaBIC > 0) {
			continue
		}
		n := fmt.Sprintf("ruled out %s (%s): it fits better, but not by more than the noise explains (%s)", lc.Richer, anglesText(byKey[lc.Richer].c.Result), lc)
		if la := lookAlike(byKey[lc.Richer].c.Result); la != "" {
			n += "; " + la
		}
		notes = append(notes, n)
	}
	v.RuledOut = notes
	r := win.c.Result
	spread := ""
	if r.Structure.Planar {
		var bs []string
		for _, f := range r.Model.Families {
			bs = append(bs, fmt.Sprintf("%.3g", f.Concentration))
		}
		spread = fmt.Sprintf(", spread in the plane (concentration %s)", strings.Join(bs, ", "))
	}
	why := "no richer form beats it by more than the noise explains"
	for _, lc := range comps {
		if lc.Decisive && lc.Richer == win.key {
			why = fmt.Sprintf("it beats %s decisively (%s), and no richer form beats it", lc.Simpler, lc)
		}
	}
	ang := anglesText(r)
	switch r.Structure.Layout {
	case LayoutNone:
		v.Families = "0"
		v.Reason = "isotropic: " + why
	case LayoutSingle:
		if p.HasShear {
			v.Families = "1"
			v.Reason = fmt.Sprintf("one fibre family at %s%s: %s", ang, spread, why)
		} else {
			v.Families = "1-or-mirror-pair"
			v.Reason = fmt.Sprintf("one fibre direction at %s%s: %s; without shear information one family at α and a mirror pair at ±α give the same normal stresses, so the data cannot tell them apart", ang, spread, why)
			v.Decider = decider
		}
	case LayoutMirror:
		fs := r.Model.Families
		same := Deg(math.Abs(math.Abs(fs[0].Angle)-math.Abs(fs[1].Angle))) < 1
		switch {
		case !p.HasShear && same:
			v.Families = "1-or-mirror-pair"
			v.Reason = fmt.Sprintf("a mirror pair at %s%s: %s; without shear information it cannot be told from one family at that angle", ang, spread, why)
			v.Decider = decider
		default:
			v.Families = "2"
			v.Reason = fmt.Sprintf("two fibre families, a pair at %s sharing their stiffness%s: %s", ang, spread, why)
		}
	case LayoutFree:
		v.Families = "2"
		v.Reason = fmt.Sprintf("two fibre families at %s%s: %s", ang, spread, why)
	}
	if !p.HasShear && r.Structure.Layout != LayoutNone && r.Structure.Layout != LayoutSingle {
		v.Reason += "; signs of the angles are unknown without shear information"
	}
	if len(open) > 0 {
		var alt []string
		for _, lc := range open {
			alt = append(alt, lc.String())
		}
		v.Reason = fmt.Sprintf("undecided: the evidence points towards %s but does not settle it (%s); the best-supported answer so far: %s", open[len(open)-1].Richer, strings.Join(alt, "; "), v.Reason)
		v.Families = "undecided"
		v.Decider = "more protocols (other stretch ratios), more points per protocol or lower noise; shear information where the sign of an angle matters"
	}
	if len(p.Protocols) == 1 {
		v.Reason += "; one protocol cannot tell one fibre family from two or from a spread of directions, so only the isotropic and one-family forms were offered: test at least three stretch ratios to decide"
		if v.Families != "0" {
			v.Families = "undecided"
		}
	}
	return v
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
	tol := 1e-10 * weightSum(m)
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

// ensureAdmissible keeps the pick if it is admissible where it was fitted;
// otherwise it takes the next candidate of the same form that is (fewest
// parameters, then lowest held-out error) and says why in the rule.
func (d *Discovery) ensureAdmissible(p *Problem) {
	c := &d.Pareto[d.Chosen]
	why := admissibleOnData(c.Result.Model, p)
	if why == "" {
		return
	}
	form := FormKey(c.Result.Structure)
	var in []int
	for i := range d.Pareto {
		if i != d.Chosen && FormKey(d.Pareto[i].Result.Structure) == form {
			in = append(in, i)
		}
	}
	sort.SliceStable(in, func(a, b int) bool {
		ca, cb := &d.Pareto[in[a]], &d.Pareto[in[b]]
		if ca.Result.Complexity != cb.Result.Complexity {
			return ca.Result.Complexity < cb.Result.Complexity
		}
		return candidateLess(ca, cb)
	})
	for _, i := range in {
		if admissibleOnData(d.Pareto[i].Result.Model, p) == "" {
			d.Rule += fmt.Sprintf("; %s was set aside because it is %s, inside its fitted range; the next admissible candidate of the form, %s, was taken", c.Name, why, d.Pareto[i].Name)
			d.Chosen = i
			return
		}
	}
	d.Rule += fmt.Sprintf("; CAUTION: %s is %s, inside its fitted range, and no other candidate of its form is admissible there", c.Name, why)
}
