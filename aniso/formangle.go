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
	dist := func(a, b float64) float64 {
		if !hasShear {
			a, b = math.Abs(WrapDeg(a)), math.Abs(WrapDeg(b))
		}
		return math.Abs(WrapDeg(a - b))
	}
	outside := func(a float64) bool {
		if !hasShear {
			a = math.Abs(WrapDeg(a))
		}
		return a < lo95 || a > hi95
	}
	thr := best.CV.Mean + math.Max(best.CV.StdErr, d.Verdict.StdErrFloor)
	at := Deg(r.Model.Families[0].Angle)
	lo, hi := at, at
	var names []string
	for i := range d.Pareto {
		c := &d.Pareto[i]
		cr := c.Result
		if c == best || c.CV == nil || less(thr, c.CV.Mean) || cr.Structure.Layout != LayoutSingle || len(cr.Model.Families) != 1 {
			continue
		}
		a := Deg(cr.Model.Families[0].Angle)
		if dist(a, at) <= formAngleMinDeg || !outside(a) {
			continue
		}
		names = append(names, fmt.Sprintf("%s at %s", c.Name, anglesText(cr)))
		if !hasShear {
			a = math.Abs(WrapDeg(a))
		}
		lo, hi = math.Min(lo, a), math.Max(hi, a)
	}
	if len(names) == 0 {
		return
	}
	if !hasShear {
		at = math.Abs(WrapDeg(at))
		lo, hi = math.Min(lo, at), math.Max(hi, at)
	}
	r.Flags = append(r.Flags, fmt.Sprintf("the fibre direction depends on the model form: models with one fibre direction that predict the held-out protocols as well (held-out error within %.3g) put it elsewhere (%s), so the data place it anywhere from %.1f° to %.1f°; the angle's interval [%.2f°, %.2f°] holds for the chosen form only",
		thr, strings.Join(names, "; "), lo, hi, lo95, hi95))
}
