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
	// count without settling it, one protocol cannot decide, or a
	// look-alike or a tie the walk cannot weigh stands beside its answer:
	// lookAlikeRules, architectureTieRule).
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
	// InSampleBest names the candidate (in Discovery.Pareto) that fits the
	// data better in sample, by ΔBIC ≥ DisagreeDeltaBIC, than every model
	// the held-out errors favour, when that is why the verdict is
	// undecided: a model with two fibre directions against every
	// one-direction model (inSampleDisagreement), or a model with fibres
	// against every isotropic model (fibreDisagreement); empty otherwise.
	InSampleBest string
	// TiesWith names the candidate (in Discovery.Pareto) with two fibre
	// families placed elsewhere that fits and predicts as well as the
	// one-family answer, when that tie is why the verdict is undecided
	// (architectureTie); empty otherwise.
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

// symmetricLookAlike says why fibres placed symmetrically about the 45°
// line are, without shear information, a look-alike of an isotropic
// material. Under a pure biaxial stretch a family at θ has
// I4 = C11 cos²θ + C22 sin²θ, and swapping the tester's axes turns it into
// a family at 90° − θ. A family at ±45° (I4 the mean of C11 and C22), or
// two families with one set of terms at α and 90° − α (at 0° and 90°,
// say), therefore have an energy, as a function of the two stretches
// (which is all the normal stresses of an incompressible membrane
// determine), symmetric in them, as every isotropic material's is: nothing
// in such data singles out a direction. Whether an isotropic form follows
// the fibres as closely depends on the shapes. Made by independent
// numerical integration (README, Fibre families): an ideal family at 45°
// on a neo-Hookean matrix, stretch-controlled, was explained within the
// noise by the catalogue's isotropic terms (verdict 0); an isotropic solid
// outside the catalogue (the exponentiated Hencky energy), load-controlled,
// was fitted better than by any isotropic form by a family at ±45.0°
// (verdict 1-or-mirror-pair before symmetricAbout45) and, in another noise
// seed, by a pair at ±48.1° and ±41.8° (verdict 2). Shear information or
// an off-axis protocol breaks the symmetry.
const symmetricLookAlike = "without shear information fibres placed symmetrically about the 45° line (one family at ±45°, or a pair of families with one stiffness at α and 90° − α, such as 0° and 90°) stiffen the two axes alike, as an isotropic material does, and the two can fit the data about equally well"

// symmetricLookAlikeSheared is symmetricLookAlike for data with shear
// information: a material symmetric about the tester's axes does not
// shear a sutured specimen, so the shear measured on sutures cannot tell
// such fibres from an isotropic material. Made by independent numerical
// integration: equal ideal families at ±45° on a neo-Hookean matrix,
// sutured (30 points a protocol, 2 % noise), were called a confident 0
// with no caution (a pair at ±44.9° fitted and predicted alike: held-out
// gain 1.7 %, ΔBIC −4.3).
const symmetricLookAlikeSheared = "the measured shear is that of a material symmetric about the tester's axes, as fibres placed symmetrically about both the axes and the 45° line (equal families at ±45°, or at 0° and 90°) are too, and such fibres stiffen the two axes alike, as an isotropic material does; the two can fit the data about equally well"

// shearedDecider settles symmetricLookAlikeSheared: an isotropic material
// responds alike in every mounting, a pair of fibre families does not,
// and turned off its symmetry axes it shears a sutured specimen.
const shearedDecider = "a specimen cut or mounted at another angle to its current axes (45° or 22.5°, say), on sutures or rakes with markers tracking F12 and F21: an isotropic material responds alike in every mounting, fibres placed symmetrically about the present axes do not, and turned off those axes they shear the specimen"

// axisSymmetric reports whether r's fibres are placed symmetrically about
// the tester's axes, so that r shears no sutured specimen: every family
// within 1° of 0° or 90°, or two families whose angles sum to 0° within
// 1° (a mirror pair at ±α).
func axisSymmetric(r *Result) bool {
	fs := r.Model.Families
	if len(fs) == 0 {
		return true
	}
	if everyFamilyNear(fs, 0, 90) {
		return true
	}
	return len(fs) == 2 && math.Abs(WrapDeg(Deg(fs[0].Angle+fs[1].Angle))) < 1
}

// everyFamilyNear reports whether every family's angle lies within 1° of
// ± one of the given angles (degrees); true when there are none.
func everyFamilyNear(fs []Family, deg ...float64) bool {
	for _, f := range fs {
		a := math.Abs(WrapDeg(Deg(f.Angle)))
		near := false
		for _, d := range deg {
			near = near || math.Abs(a-d) < 1
		}
		if !near {
			return false
		}
	}
	return true
}

// symmetricAbout45 reports whether r's fibres are placed symmetrically
// about the 45° line (symmetricLookAlike): every family within 1° of
// ±45°, or a mirror pair (one set of terms on both families) whose angles'
// magnitudes add up to 90° within 1°. One degree is the tolerance within
// which verdictFor tells a mirror pair from one direction.
func symmetricAbout45(r *Result) bool {
	fs := r.Model.Families
	if len(fs) == 0 {
		return false
	}
	if everyFamilyNear(fs, 45) {
		return true
	}
	if r.Structure.Layout != LayoutMirror || len(fs) != 2 {
		return false
	}
	sum := math.Abs(WrapDeg(Deg(fs[0].Angle))) + math.Abs(WrapDeg(Deg(fs[1].Angle)))
	return math.Abs(sum-90) < 1
}

// undecidedDecider is what settles an undecided family count.
const undecidedDecider = "more protocols (other stretch ratios), more points per protocol or lower noise; shear information where the sign of an angle matters"

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
	spread := ""
	if r.Structure.Planar {
		var bs []string
		for _, f := range r.Model.Families {
			bs = append(bs, fmt.Sprintf("%.3g", f.Concentration))
		}
		spread = fmt.Sprintf(", spread in the plane (concentration %s)", strings.Join(bs, ", "))
	}
	why := whyItWon(win, comps)
	ang := anglesText(r)
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
			flatTopVerdict(ev, r, why, &v)
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
		var alt []string
		for _, lc := range open {
			alt = append(alt, lc.String())
		}
		v.Reason = fmt.Sprintf("undecided: the evidence points towards %s but does not settle it (%s); the best-supported answer so far: %s", open[len(open)-1].Richer, strings.Join(alt, "; "), v.Reason)
		v.Families = "undecided"
		v.Decider = undecidedDecider
	}
	d.lookAlikeRules(ev, r, &v)
	d.architectureTieRule(ev, win, &v)
	if ev.oneProtocol {
		v.Reason += "; one protocol cannot tell one fibre family from two or from a spread of directions, so only the isotropic and one-family forms were offered: test at least three stretch ratios to decide"
		if v.Families != "0" {
			v.Families = "undecided"
		}
	}
	return v
}

// isotropicCaution adds to an isotropic verdict that fibres placed
// symmetrically about the 45° line cannot be ruled out, and what would
// rule them out: shear information where there is none
// (symmetricLookAlike), a specimen turned off the axes where the shear
// measured on sutures is that of a symmetric material
// (symmetricLookAlikeSheared).
func (d *Discovery) isotropicCaution(ev evidence, v *Verdict) {
	v.LookAlike = d.lowestBIC(func(r *Result) bool {
		return len(r.Model.Families) > 0 && symmetricAbout45(r) && (!ev.hasShear || axisSymmetric(r))
	})
	if !ev.hasShear {
		v.Reason += "; " + symmetricLookAlike + ", so without shear information such fibres cannot be ruled out"
		v.Decider = decider
		return
	}
	v.Reason += "; " + symmetricLookAlikeSheared + ", so such fibres cannot be ruled out"
	v.Decider = shearedDecider
}

// lowestBIC names the candidate of d.Pareto with the lowest BIC (on the
// compared points) among those for which want holds, or "".
func (d *Discovery) lowestBIC(want func(*Result) bool) string {
	var best *Candidate
	for i := range d.Pareto {
		c := &d.Pareto[i]
		if want(c.Compared()) && (best == nil || less(c.Compared().BIC, best.Compared().BIC)) {
			best = c
		}
	}
	if best == nil {
		return ""
	}
	return best.Name
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

// lookAlikeRules makes the walk's verdict v undecided where a look-alike
// the walk cannot weigh stands beside its answer: fibres placed
// symmetrically about the 45° line without shear information
// (symmetricLookAlike), and a model that fits better in
// sample, by ΔBIC ≥ DisagreeDeltaBIC, than every model of the kind the
// held-out errors favour (inSampleDisagreement, fibreDisagreement). r is
// the walk's winning model.
func (d *Discovery) lookAlikeRules(ev evidence, r *Result, v *Verdict) {
	if (v.Families == "1" || v.Families == "1-or-mirror-pair" || v.Families == "2") && symmetricAbout45(r) {
		iso := func(r *Result) bool { return r.Structure.Layout == LayoutNone }
		switch {
		case !ev.hasShear:
			v.Reason = fmt.Sprintf("undecided: %s, so the data do not settle whether fibres are needed: the fibres may stand in for an isotropic stiffening the catalogue lacks; the best-supported answer: %s", symmetricLookAlike, v.Reason)
			v.Families, v.Decider, v.LookAlike = "undecided", decider, d.lowestBIC(iso)
		case axisSymmetric(r):
			v.Reason = fmt.Sprintf("undecided: %s, so the data do not settle whether fibres are needed: the fibres may stand in for an isotropic stiffening the catalogue lacks; the best-supported answer: %s", symmetricLookAlikeSheared, v.Reason)
			v.Families, v.Decider, v.LookAlike = "undecided", shearedDecider, d.lowestBIC(iso)
		}
	}
	if v.Families == "1" || v.Families == "1-or-mirror-pair" {
		if two, one, gap := d.inSampleDisagreement(ev); two != nil {
			v.Reason = fmt.Sprintf("undecided: the held-out errors favour one fibre direction, but %s with two fibre directions (%s) fits the data better in sample than every one-direction model, by ΔBIC %.1f over %s (%s), strong evidence on the scale of Kass & Raftery 1995; the two criteria disagree, so the data do not settle one family against two; the best-supported answer by held-out error: %s",
				two.Name, anglesText(two.Result), gap, one.Name, anglesText(one.Result), v.Reason)
			v.Families, v.InSampleBest, v.Decider = "undecided", two.Name, undecidedDecider
		}
	}
	if v.Families == "0" {
		if fib, iso, gap := d.fibreDisagreement(); fib != nil {
			v.Reason = fmt.Sprintf("undecided: the held-out errors favour an isotropic material, but %s with fibres (%s) fits the data better in sample than every isotropic model, by ΔBIC %.1f over %s, strong evidence on the scale of Kass & Raftery 1995; the two criteria disagree, so the data do not settle whether fibres are needed; the best-supported answer by held-out error: %s",
				fib.Name, anglesText(fib.Result), gap, iso.Name, v.Reason)
			v.Families, v.InSampleBest, v.Decider = "undecided", fib.Name, undecidedDecider
		}
	}
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

// Architecture ties. A broad spread of fibres can be followed, within the
// tested protocols, by fibres placed elsewhere: made by independent
// numerical integration, two spread families at ±40° (concentration 2 or
// 4) on a neo-Hookean matrix, sutured (their symmetry about axis 1 leaves
// the shear at zero), were fitted and predicted alike by one family at 0°
// with isotropic terms and by a pair at about ±40° (held-out gains of the
// pair 0.3–2.2 % of the error, within 0.8 standard errors; ΔBIC −5.4 to
// 4.8), and the walk, which keeps fewer families unless more beat them,
// answered a confident 1 at 0°. The two explanations put the fibres 40°
// apart and differ off the tested axes, so neither answer is safe.

// archTieMinDeg is how far (degrees) every family of a rival must lie from
// the winner's fibre direction for the two to place fibres differently:
// more than the spread of a family the data resolve (a concentration of 3
// has a standard deviation of about 17°), so that a pair bracketing the
// winner's direction closely, a look-alike of one spread family, is not
// such a rival; and archTieMinGapDeg is how far apart the rival's two
// families must lie for the same reason (lookAlike's bracketing window).
const (
	archTieMinDeg    = 20
	archTieMinGapDeg = 60
)

// architectureTie returns, when the walk's winner win has one fibre
// family, the form with two fibre families placed elsewhere (every family
// at least archTieMinDeg from the winner's direction, archTieMinGapDeg
// apart) that ties with it: held-out error not worse by more than one
// standard error and BIC not worse by DisagreeDeltaBIC or more. Of several
// such forms it returns the one whose held-out gain is largest in standard
// errors; nil when there is none.
func (d *Discovery) architectureTie(ev evidence, win *formBest) (*formBest, LayoutComparison) {
	wr := win.c.Result
	if familyCount(wr) != 1 || win.c.CV == nil {
		return nil, LayoutComparison{}
	}
	dir := Deg(wr.Model.Families[0].Angle)
	if flatTop(wr) {
		dir, _ = pairGeometryDeg(wr)
	}
	dist := func(a, b float64) float64 {
		if !ev.hasShear {
			a, b = math.Abs(WrapDeg(a)), math.Abs(WrapDeg(b))
		}
		return math.Abs(WrapDeg(a - b))
	}
	floor := seFloor(d.noiseLevel(ev), ev)
	// The gain in standard errors; the standard error is floored
	// (seFloor) and zero only for data without noise, where the tiny
	// floor here keeps the order by gain.
	z := func(c LayoutComparison) float64 { return c.Gain / math.Max(c.StdErr, math.SmallestNonzeroFloat64) }
	var tie *formBest
	var tieLC LayoutComparison
	for _, fb := range d.formBests() {
		r := fb.c.Result
		if fb.key == win.key || fb.c.CV == nil || familyCount(r) != 2 || !twoDirections(r, ev.hasShear) {
			continue
		}
		a1, a2 := Deg(r.Model.Families[0].Angle), Deg(r.Model.Families[1].Angle)
		if dist(a1, dir) < archTieMinDeg || dist(a2, dir) < archTieMinDeg || dist(a1, a2) < archTieMinGapDeg {
			continue
		}
		lc := compare(win, fb, floor)
		if math.IsNaN(lc.Gain) || lc.Gain < -lc.StdErr || lc.DeltaBIC <= -DisagreeDeltaBIC {
			continue
		}
		if tie == nil || z(lc) > z(tieLC) {
			tie, tieLC = fb, lc
		}
	}
	return tie, tieLC
}

// archDecider is what settles an architecture tie.
const archDecider = "an off-axis protocol (the specimen cut or mounted at 45° to the current axes) or other stretch ratios, where fibres at the two places load differently"

// architectureTieRule makes a one-family verdict undecided when a form
// with two families placed elsewhere ties with it (architectureTie).
func (d *Discovery) architectureTieRule(ev evidence, win *formBest, v *Verdict) {
	if v.Families != "1" && v.Families != "1-or-mirror-pair" {
		return
	}
	tie, lc := d.architectureTie(ev, win)
	if tie == nil {
		return
	}
	v.Reason = fmt.Sprintf("undecided: one fibre family at %s (%s) and two families at %s (%s) fit and predict the tested protocols alike (%s), with their fibres in different places; the data do not settle how many families there are or where they lie, and the two explanations differ off the tested axes; the best-supported answer by the rule that keeps fewer families unless more beat them: %s",
		anglesText(win.c.Result), win.c.Name, anglesText(tie.c.Result), tie.c.Name, lc, v.Reason)
	v.Families, v.Decider, v.TiesWith = "undecided", archDecider, tie.c.Name
}
