package aniso

// Cautions a verdict with fibres carries (verdictFor adds them): what in
// the data, beside the material, can put a fibre family where the verdict
// finds it — a preload that was not tared, shear that scatters from point
// to point, the ideal families of a two-family model.

import (
	"fmt"
	"math"
)

// Preloads. Made by independent integration, an isotropic principal-stretch
// solid (Ogden 1972, α = 9) pre-stretched 1.005 × 1.001 before the
// markers were zeroed — its file starting at stretch 1 with 4 % of the
// stress range still on — was a confident 1-or-mirror-pair at 0°, on
// sutures a confident 1: a preload that stretches one axis more stiffens
// that axis's incremental response, the signature of fibres along it.
// The data cannot tell the two apart, so a verdict with fibres along a
// test axis says so when the data carry a preload that was not tared
// (biaxial.Protocol.Preload); a tared preload leaves no trace in the data
// and is a caution of the README.

// axisCautionDeg is how close (degrees) to a test axis a fibre family must
// lie for preloadCaution and shearScatterCaution to name their finding:
// within the spread of the directions a pre-stretch along that axis is
// fitted with (the synthetic pairs misread under tracking noise lay
// within 0.1° of an axis).
const axisCautionDeg = 10

// preloadCaution adds to a verdict with fibres, when ev records a preload
// that was not tared and a family of r lies within axisCautionDeg of a
// test axis, that the fibres may be the preload's.
func preloadCaution(ev evidence, r *Result, v *Verdict) {
	if ev.preload != "" && familyNearAxis(r, axisCautionDeg) {
		v.Reason += fmt.Sprintf("; caution: the data carry a preload that was not tared (%s), and a preload that stretches one axis more than the other makes even an isotropic material respond like one with fibres along that axis, so the fibres found along a test axis may be the preload's (taring does not undo the pre-stretch): stretches measured from the unloaded, stress-free state would tell", ev.preload)
	}
}

// familyNearAxis reports whether a fibre family of r lies within maxDeg
// of a test axis.
func familyNearAxis(r *Result, maxDeg float64) bool {
	if r.Structure.Layout == LayoutNone {
		return false
	}
	for _, f := range r.Model.Families {
		a := math.Abs(WrapDeg(Deg(f.Angle)))
		if min(a, math.Abs(90-a)) <= maxDeg {
			return true
		}
	}
	return false
}

// Ideal families only. Made by independent integration, one family of
// fibres spread with a standard deviation of 12° about 30° and recruited
// gradually was fitted as closely by a pair of ideal families at ±18.8°
// and ±41.5° as by one spread family, and a search without the in-plane
// spread forms called it a decisive 2 (ΔBIC 118 over one family): ideal
// families split a spread of directions they cannot express into two
// that straddle it (TestDiscoverOutsideCatalogue).

// idealOnlyCaution adds to a verdict whose model has two families
// bracketing a direction (lookAlike), when no in-plane spread forms were
// searched, that they may be one family spread about that direction.
func idealOnlyCaution(ev evidence, r *Result, v *Verdict) {
	if !ev.idealOnly || r.Structure.Planar {
		return
	}
	if la := bracketingLookAlike(r); la != "" {
		v.Reason += "; caution: only ideal fibre families were searched, no family spread in the plane, and " + la + ": ideal families split a spread of directions they cannot express into two that straddle it, so a discovery that includes the in-plane spread forms would tell"
	}
}

// Scatter of the measured shear. Made by independent integration, spread
// mirror pairs at ±30° (concentration 2) and ±50° (concentration 5) on
// sutures, `undecided` or `2` without tracking noise, became a confident
// 1 with a family along a test axis once the measured F12 and F21
// carried noise of 0.001 (0.0005 left them alone): the shear stresses
// are zero on sutures, a model's shear stress is compared with them at
// the noisy shear, and the comparison penalises fibres that resist
// shear, such as a pair symmetric about an axis, more than one family
// along it. A verdict with a family along a test axis says so when the
// data's shear scatters above biaxial.ShearScatterLimit
// (biaxial.Protocol.StrainScatter).

// shearScatterCaution adds to a verdict with a fibre family within
// axisCautionDeg of a test axis, when ev records shear that scatters
// above biaxial.ShearScatterLimit, that the family may owe its place to
// that scatter.
func shearScatterCaution(ev evidence, r *Result, v *Verdict) {
	if ev.shearScatter != "" && familyNearAxis(r, axisCautionDeg) {
		v.Reason += fmt.Sprintf("; caution: the measured shear scatters from point to point (%s; tracking noise?) while the shear stresses are given (zero on sutures), so a model's shear stress is compared with them at noisy shear, which penalises fibres that resist shear — a pair symmetric about the axis more than one family along it — and can put the fibres found along a test axis there: steadier tracking of the shear would tell", ev.shearScatter)
	}
}
