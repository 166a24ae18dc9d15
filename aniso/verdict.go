package aniso

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// Verdict is the answer on the number of fibre families.
type Verdict struct {
	// Families is "0", "1", "2", "1-or-mirror-pair" (without shear
	// information one family and a mirror pair give the same normal
	// stresses) or "undecided" (the evidence points at another family
	// count without settling it, one protocol cannot decide, a look-alike
	// or a tie the walk cannot weigh stands beside its answer, or a
	// Fung-type preset without fibres fits better: lookAlikeRules,
	// architectureTieRule in lookalikes.go, orthotropyRule in
	// presetrules.go).
	Families string
	// Reason states the evidence in words and numbers.
	Reason string
	// DeltaBIC is each form's best BIC minus the best over forms, keyed by
	// FormKey ("0", "1", "1+dispersed", "2-mirror", "2-free", ...).
	DeltaBIC map[string]float64
	// HeldoutError is each form's best held-out error, same keys; empty
	// without cross-validation.
	HeldoutError map[string]float64
	// Comparisons are the steps of the walk from the simplest form to the
	// richest, with a form with more families that beat the walk's form
	// also compared with the best-predicting form with the walk's number of
	// families (strongestRival; see select.go).
	Comparisons []LayoutComparison
	// RuledOut names the richer explanations that fitted better without
	// beating the verdict's form by more than the noise, and look-alikes,
	// and the forms that were not considered, with why (two families that
	// point the same way; spread families all at the concentration bound).
	// When a ruled-out form's lowest-BIC model is not its best by held-out
	// error, its note names that model too (otherInSampleBest).
	RuledOut []string
	// Noise is the estimated noise in held-out-error units and StdErrFloor
	// the smallest standard error a comparison may claim.
	Noise, StdErrFloor float64
	// Decider names the extra measurement that would settle an undecided
	// case, or is empty.
	Decider string
	// InSampleBest names the candidate that fits the data better in
	// sample, by ΔBIC ≥ DisagreeDeltaBIC, than every model the held-out
	// errors favour, when that is why the verdict is undecided: a model
	// (in Discovery.Pareto) with two fibre directions against every
	// one-direction model (inSampleDisagreement), or one with fibres
	// against every isotropic model (fibreDisagreement); or a Fung-type
	// preset without fibres (in Discovery.Presets, "preset:fung" or
	// "preset:fung-general") against the chosen model with fibres
	// (orthotropyRule, presetrules.go); empty otherwise.
	InSampleBest string
	// TiesWith names the candidate (in Discovery.Pareto) with two fibre
	// families, placed elsewhere or adding one far from the one-family
	// answer's, that fits and predicts as well as that answer, when that
	// tie is why the verdict is undecided (architectureTie); empty
	// otherwise.
	TiesWith string
	// LookAlike names the candidate (in Discovery.Pareto) of the
	// look-alike the reason names, when it names one: for an isotropic
	// verdict the lowest-BIC model with fibres placed symmetrically about
	// the 45° line (and about the tester's axes, with shear information;
	// symmetricLookAlike), for a verdict left undecided by that look-alike
	// the lowest-BIC isotropic model; empty when there is none.
	LookAlike string
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
	if math.IsNaN(c.Gain) {
		// One protocol leaves none out: in-sample evidence only.
		return fmt.Sprintf("%s over %s: no held-out error (no protocol to leave out), ΔBIC %.1f — %s", c.Richer, c.Simpler, c.DeltaBIC, v)
	}
	return fmt.Sprintf("%s over %s: held-out gain %.4g ± %.2g (%.1f %% of %s's error), ΔBIC %.1f — %s",
		c.Richer, c.Simpler, c.Gain, c.StdErr, 100*c.RelativeGain, c.Simpler, c.DeltaBIC, v)
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

// absAngleGapDeg is how far apart, in degrees, the two families of r lie
// when the signs of their angles are not known: without shear information
// a family at α and one at −α give the same normal stresses (package
// documentation, Mirror symmetry), so only |α| tells them apart.
func absAngleGapDeg(r *Result) float64 {
	fs := r.Model.Families
	return Deg(math.Abs(math.Abs(fs[0].Angle) - math.Abs(fs[1].Angle)))
}

// anglesText writes a result's family angles, two free families in the
// family order (familyorder.go) as its card will list them.
func anglesText(r *Result) string {
	var s []string
	fs := r.Model.Families
	if familiesOutOfOrder(r) {
		fs = []Family{fs[1], fs[0]}
	}
	for _, f := range fs {
		a := Deg(f.Angle)
		if math.Abs(a) < 0.05 {
			a = 0 // within round-off of an axis: no "-0.0°"
		}
		if r.SignKnown {
			s = append(s, fmt.Sprintf("%.1f°", a))
		} else {
			s = append(s, fmt.Sprintf("±%.1f°", math.Abs(a)))
		}
	}
	return strings.Join(s, ", ")
}

// answerWords writes the angles and the in-plane spread the verdict's
// answer quotes: those of the chosen model, which the card carries, when
// it is of the winning form. The form's best can be a larger model of the
// same form whose angles differ by degrees (a pair at ±40.7°, ±53.9°
// quoted beside a chosen ±37.2°, ±53.7°).
func (d *Discovery) answerWords(win *formBest) (angles, spread string) {
	shown := d.answerModel(win)
	if shown.Structure.Planar {
		var bs []string
		for _, f := range shown.Model.Families {
			bs = append(bs, fmt.Sprintf("%.3g", f.Concentration))
		}
		spread = fmt.Sprintf(", spread in the plane (concentration %s)", strings.Join(bs, ", "))
	}
	return anglesText(shown), spread
}

// answerMovedDeg is how far (degrees) the refit on every point may move
// a fibre angle the verdict's answer quotes before the reason says where
// the card's model has it; a spread's concentration may move by
// answerMovedSpread (relative).
const (
	answerMovedDeg    = 1
	answerMovedSpread = 0.2
)

// noteRefittedAnswer adds to the reason where the chosen candidate c,
// refitted on every point (polish), puts its fibres, when its answer
// quotes the searched fit and the refit moved an angle by more than
// answerMovedDeg or a concentration by more than answerMovedSpread. The
// answer is written before the refit, from the fit the candidates were
// compared on; an angle the data hardly determine can move far in the
// refit (a spread pair quoted at ±9.9°, ±76.1° and carried by the card at
// ±0.0°, ±76.4°; synthetic, three families, 2026-12-05), and the reason
// then disagreed with the card it is written in.
func (d *Discovery) noteRefittedAnswer(c *Candidate) {
	was, now := c.Searched, c.Result
	if was == nil || len(was.Model.Families) == 0 || len(was.Model.Families) != len(now.Model.Families) ||
		!strings.Contains(d.Verdict.Reason, " at "+anglesText(was)) {
		return
	}
	// directionGapDeg pairs each searched family with the refitted one it
	// is nearest to: the refit may list two free families in the other
	// order.
	moved := directionGapDeg(was.Model, now.Model, now.SignKnown) > answerMovedDeg
	if was.Structure.Planar {
		var b0, b1 []float64
		for f := range was.Model.Families {
			b0 = append(b0, was.Model.Families[f].Concentration)
			b1 = append(b1, now.Model.Families[f].Concentration)
		}
		sort.Float64s(b0)
		sort.Float64s(b1)
		for i := range b0 {
			moved = moved || math.Abs(b1[i]-b0[i]) > answerMovedSpread*math.Max(b0[i], 1)
		}
	}
	if !moved {
		return
	}
	spread := ""
	if now.Structure.Planar {
		var bs []string
		for _, f := range now.Model.Families {
			bs = append(bs, fmt.Sprintf("%.3g", f.Concentration))
		}
		spread = fmt.Sprintf(" (concentration %s)", strings.Join(bs, ", "))
	}
	d.Verdict.Reason += fmt.Sprintf(". The angles quoted are those of the fit the candidates were compared on; refitted on every point, as the card carries it, the chosen model puts its fibres at %s%s", anglesText(now), spread)
}

// answerModel is the model the verdict's answer describes: the chosen
// one when it is of the winning form, else the form's best.
func (d *Discovery) answerModel(win *formBest) *Result {
	if ch := d.Pareto[d.Chosen].Result; FormKey(ch.Structure) == win.key {
		return ch
	}
	return win.c.Result
}

// decider is the measurement that settles one family against a mirror
// pair (package documentation, Mirror symmetry).
const decider = "shear information: track F12 and F21 with markers (a specimen on sutures or rakes shears when its fibres are off-axis), or add an off-axis protocol (the specimen cut or mounted at 45° to the current axes)"

// undecidedDecider is what settles an undecided family count.
const undecidedDecider = "more protocols (other stretch ratios), more points per protocol or lower noise; shear information where the sign of an angle matters"

// undecided turns v into an undecided verdict over the open steps to
// another number of families. It points towards the form that gains most
// on held-out error, the walk's first criterion.
func undecided(v *Verdict, open []LayoutComparison) {
	var alt []string
	toward := open[0]
	for _, lc := range open {
		alt = append(alt, lc.String())
		if lc.Gain > toward.Gain {
			toward = lc
		}
	}
	v.Reason = fmt.Sprintf("undecided: the evidence points towards %s but does not settle it (%s); the best-supported answer so far: %s", toward.Richer, strings.Join(alt, "; "), v.Reason)
	v.Families = "undecided"
	if v.LookAlike == "" {
		// An isotropic answer whose look-alike, fibres symmetric about
		// the 45° line, stands beside it keeps the measurement that
		// settles that look-alike (isotropicCaution): the fibres the
		// evidence points towards are then such fibres, or fibres that
		// the same turned or sheared test tells apart from isotropy.
		v.Decider = undecidedDecider
	}
}

// verdictFor writes the verdict of the winning form.
func (d *Discovery) verdictFor(ev evidence, win *formBest, comps, open []LayoutComparison, notes []string) Verdict {
	v := Verdict{DeltaBIC: map[string]float64{}, HeldoutError: map[string]float64{}, Comparisons: comps}
	bests := d.formBests()
	minBIC := math.Inf(1)
	for _, fb := range bests {
		minBIC = math.Min(minBIC, fb.c.Result.BIC)
	}
	var left []string
	for k := range d.unvalidated {
		left = append(left, k)
	}
	sort.Slice(left, func(a, b int) bool {
		return formRank(d.unvalidated[left[a]].c.Result.Structure) < formRank(d.unvalidated[left[b]].c.Result.Structure)
	})
	for _, k := range left {
		lo := d.unvalidated[k]
		minBIC = math.Min(minBIC, lo.c.Result.BIC)
		notes = append(notes, fmt.Sprintf("%s was not considered: %s", k, lo.why))
	}
	for _, k := range left {
		v.DeltaBIC[k] = d.unvalidated[k].c.Result.BIC - minBIC
	}
	byKey := map[string]*formBest{}
	for _, fb := range bests {
		byKey[fb.key] = fb
		v.DeltaBIC[fb.key] = fb.c.Result.BIC - minBIC
		if fb.c.CV != nil {
			v.HeldoutError[fb.key] = fb.c.CV.Mean
		}
	}
	for _, lc := range comps {
		// A richer form that ties (the same loss and held-out error within
		// TieTolerance, such as a mirror pair of one angle) is no better.
		better := lc.RelativeGain > TieTolerance ||
			(lc.DeltaBIC > 0 && less(byKey[lc.Richer].c.Result.Loss, byKey[lc.Simpler].c.Result.Loss))
		if lc.Decisive || !better {
			continue
		}
		n := fmt.Sprintf("ruled out %s (%s): it fits better, but not by more than the noise explains (%s)", lc.Richer, anglesText(byKey[lc.Richer].c.Result), lc)
		if la := lookAlike(byKey[lc.Richer].c.Result); la != "" {
			n += "; " + la
		}
		if o := d.otherInSampleBest(byKey[lc.Richer], byKey[lc.Simpler]); o != "" {
			n += "; " + o
		}
		notes = append(notes, n)
	}
	v.RuledOut = notes
	r := win.c.Result
	ang, spread := d.answerWords(win)
	why := whyItWon(win, comps)
	switch r.Structure.Layout {
	case LayoutNone:
		v.Families = "0"
		v.Reason = "isotropic: " + why
		d.isotropicCaution(ev, &v)
	case LayoutSingle:
		if ev.hasShear {
			v.Families = "1"
			v.Reason = fmt.Sprintf("one fibre family at %s%s: %s", ang, spread, why)
		} else {
			v.Families = "1-or-mirror-pair"
			v.Reason = fmt.Sprintf("one fibre direction at %s%s: %s; without shear information one family at α and a mirror pair at ±α give the same normal stresses, so the data cannot tell them apart", ang, spread, why)
			v.Decider = decider
		}
	case LayoutMirror:
		same := absAngleGapDeg(r) < 1
		switch {
		case flatTop(r):
			// Described by the chosen model where it is flat-topped too,
			// as the other answers are (answerWords).
			shown := d.answerModel(win)
			if !flatTop(shown) {
				shown = r
			}
			flatTopVerdict(ev, shown, why, &v)
		case !ev.hasShear && same:
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
	if !ev.hasShear && r.Structure.Layout != LayoutNone && r.Structure.Layout != LayoutSingle && !flatTop(r) {
		v.Reason += "; signs of the angles are unknown without shear information"
	}
	if len(open) > 0 {
		undecided(&v, open)
	}
	d.lookAlikeRules(ev, r, &v)
	d.architectureTieRule(ev, win, &v)
	preloadCaution(ev, r, &v)
	shearScatterCaution(ev, r, &v)
	idealOnlyCaution(ev, r, &v)
	if ev.oneProtocol {
		v.Reason += "; one protocol cannot tell one fibre family from two or from a spread of directions, so only the isotropic and one-family forms were offered: test at least three stretch ratios to decide"
		if v.Families != "0" {
			v.Families = "undecided"
		}
	}
	return v
}

// flatTopVerdict writes the verdict of a winning spread pair whose
// densities sum to one flat-topped peak (flatTop): one family about the
// pair's mean direction; why says why the walk ended on it.
func flatTopVerdict(ev evidence, r *Result, why string, v *Verdict) {
	mean, half := pairGeometryDeg(r)
	flat := fmt.Sprintf("one fibre family about %.1f°, spread in the plane with a flatter top than a von Mises density: a spread pair at %s (concentration %.3g, %.1f° either side) whose densities sum to a single peak", mean, anglesText(r), r.Model.Families[0].Concentration, half)
	if ev.hasShear {
		v.Families = "1"
		v.Reason = fmt.Sprintf("%s: %s", flat, why)
		return
	}
	v.Families = "1-or-mirror-pair"
	v.Reason = fmt.Sprintf("%s: %s; without shear information the signs of the angles are unknown", flat, why)
	v.Decider = decider
}

// whyItWon says why the walk ended on win: the comparison it won
// decisively, and the forms with more families that beat it but not the
// best-predicting form with as many families as it (strongestRival).
func whyItWon(win *formBest, comps []LayoutComparison) string {
	why := "no richer form beats it by more than the noise explains"
	for _, lc := range comps {
		if lc.Decisive && lc.Richer == win.key {
			why = fmt.Sprintf("it beats %s decisively (%s), and no richer form beats it", lc.Simpler, lc)
		}
	}
	// Forms with more families that beat the winner but not the best form
	// with the winner's number of families (strongestRival).
	var blocked []string
	rival := ""
	for _, lc := range comps {
		if !lc.Decisive || lc.Simpler != win.key || lc.Richer == win.key {
			continue
		}
		for _, lc2 := range comps {
			if lc2.Richer == lc.Richer && lc2.Simpler != win.key && !lc2.Decisive {
				blocked, rival = append(blocked, lc.Richer), lc2.Simpler
			}
		}
	}
	if len(blocked) > 0 {
		why = strings.Replace(why, ", and no richer form beats it", "", 1)
		why += fmt.Sprintf("; %s beat it too, but not %s, the form with as many families that predicts best, so the number of families stays (see the ruled-out notes)", strings.Join(blocked, " and "), rival)
	}
	return why
}

// otherInSampleBest describes the model of richer's form with the lowest
// BIC when it is not the form's representative (its best by held-out
// error) and its BIC beats the simpler form's representative by more than
// 2 ("positive" evidence on the scale of Kass & Raftery 1995). The walk
// compares forms by their held-out errors, so such a model does not
// decide the verdict; the note keeps it from being hidden. It returns ""
// otherwise.
func (d *Discovery) otherInSampleBest(richer, simpler *formBest) string {
	if richer == nil || simpler == nil {
		return ""
	}
	var low *Candidate
	for i := range d.Pareto {
		c := &d.Pareto[i]
		if FormKey(c.Result.Structure) != richer.key {
			continue
		}
		if low == nil || less(c.Result.BIC, low.Result.BIC) {
			low = c
		}
	}
	if low == nil || low == richer.c {
		return ""
	}
	dBIC := simpler.c.Result.BIC - low.Result.BIC
	if dBIC <= 2 || !less(low.Result.BIC, richer.c.Result.BIC) {
		return ""
	}
	held := "not cross-validated"
	if low.CV != nil && simpler.c.CV != nil {
		held = fmt.Sprintf("held-out error %.4g against %.4g", low.CV.Mean, simpler.c.CV.Mean)
	}
	return fmt.Sprintf("the form's lowest BIC is %s's (%s): ΔBIC %.1f over %s, %s; forms are compared by held-out error",
		low.Name, anglesText(low.Result), dBIC, simpler.c.Name, held)
}
