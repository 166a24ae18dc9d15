package aniso

// The fibre direction across model forms. A fitted angle's interval
// (Wald or profile) says how far the data let the angle move while the
// chosen form is the material's; it says nothing of where other forms
// that predict as well put it. On a synthetic specimen with one family
// at 0° on a Demiray (1972) matrix (independent code, 1 % noise, no
// shear information) the chosen model (a principal-stretch matrix, the
// fibre term and an I5 term) put the family at ±12.9° [12.0°, 13.8°],
// while a model with the family spread in the plane, as good on held-out
// protocols, put it at 0°, the truth.

import (
	"fmt"
	"math"
	"strings"
)

// formAngleMinDeg is how far (degrees) another form's direction must lie
// from the chosen one, and outside its interval, to be flagged: closer
// than that the difference is below what planar tests resolve in
// practice (common practice: fibre directions from imaging or mechanics
// are quoted to a few degrees).
const formAngleMinDeg = 5

// formAngleFlag adds to the chosen model a flag when its one fibre
// direction (one family, ideal or spread) is not where other models with
// one fibre direction that predict the held-out protocols as well put
// theirs: held-out error within the chosen model's one-standard-error
// threshold (its error plus its standard error, floored as the verdict
// floors it), a direction more than formAngleMinDeg away and outside the
// chosen angle's 95 % interval. Without shear information directions are
// compared by magnitude (package documentation, Mirror symmetry).
func (d *Discovery) formAngleFlag(hasShear bool) {
	best := d.Best()
	r := best.Result
	if best.CV == nil || r.Structure.Layout != LayoutSingle || len(r.Model.Families) != 1 {
		return
	}
	var est *Estimate
	for i := range r.Estimates {
		if e := &r.Estimates[i]; e.Kind == "angle" && e.Name == "angle" {
			est = e
		}
	}
	if est == nil {
		return
	}
	// The interval reported: the profile's where the angle has one (as the
	// summary and the card report it), else the Wald interval.
	lo95, hi95 := est.Lo, est.Hi
	for _, pr := range r.Profiles {
		if pr.Name == est.Name && !pr.NotDetermined && pr.Closed {
			lo95, hi95 = pr.LoDeg, pr.HiDeg
		}
	}
	if math.IsNaN(lo95) || math.IsNaN(hi95) {
		return
	}
	thr := best.CV.Mean + math.Max(best.CV.StdErr, d.Verdict.StdErrFloor)
	// Every angle is measured from the chosen one, at, in its own frame:
	// a signed offset in (−90°, 90°] with shear information (fibre angles
	// are modulo 180°, and an interval may pass through ±90°), an offset
	// of magnitudes without it (package documentation, Mirror symmetry).
	at := Deg(r.Model.Families[0].Angle)
	offset := func(a float64) float64 { return WrapDeg(a - at) }
	if !hasShear {
		at = math.Abs(WrapDeg(at))
		offset = func(a float64) float64 { return math.Abs(WrapDeg(a)) - at }
		lo95, hi95 = foldInterval(lo95, hi95)
	}
	dLo, dHi := WrapDeg(lo95-at), WrapDeg(hi95-at)
	if !hasShear {
		dLo, dHi = lo95-at, hi95-at
	}
	lo, hi := 0.0, 0.0 // the offsets the flagged models reach
	var names []string
	for i := range d.Pareto {
		c := &d.Pareto[i]
		cr := c.Result
		if c == best || c.CV == nil || less(thr, c.CV.Mean) || cr.Structure.Layout != LayoutSingle || len(cr.Model.Families) != 1 {
			continue
		}
		o := offset(Deg(cr.Model.Families[0].Angle))
		if math.Abs(o) <= formAngleMinDeg || (o >= dLo && o <= dHi) {
			continue
		}
		names = append(names, fmt.Sprintf("%s at %s", c.Name, anglesText(cr)))
		lo, hi = math.Min(lo, o), math.Max(hi, o)
	}
	if len(names) == 0 {
		return
	}
	lo, hi = at+lo, at+hi
	r.Flags = append(r.Flags, fmt.Sprintf("the fibre direction depends on the model form: models with one fibre direction that predict the held-out protocols as well (held-out error within %.3g) put it elsewhere (%s), so the data place it anywhere from %.1f° to %.1f°; the angle's interval [%.2f°, %.2f°] holds for the chosen form only",
		thr, strings.Join(names, "; "), lo, hi, lo95, hi95))
}

// foldInterval returns the interval of |α| that an interval [lo, hi] of α
// (degrees, in (−90°, 90°]) covers: [0, max] when it contains 0.
func foldInterval(lo, hi float64) (float64, float64) {
	if lo <= 0 && hi >= 0 {
		return 0, math.Max(-lo, hi)
	}
	a, b := math.Abs(lo), math.Abs(hi)
	return math.Min(a, b), math.Max(a, b)
}
