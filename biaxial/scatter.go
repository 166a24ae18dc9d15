package biaxial

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/stat"
)

// Point-to-point scatter of the measured deformation gradient.
//
// Markers are tracked with noise. A loading branch is smooth in its point
// index, so the third differences Δ³F_i = F_{i+2} − 3F_{i+1} + 3F_i − F_{i−1}
// of a densely sampled branch are noise: for independent noise of standard
// deviation s they have variance 20 s² (the squares of the coefficients
// 1, −3, 3, −1), while a smooth path contributes only its third derivative
// times the step cubed. The scatter is estimated from their median
// absolute value, 1.4826·median|Δ³F|/√20 (the normal-consistent median
// absolute deviation; difference-based noise estimates are common practice
// in signal processing), so that a few slips do not dominate it; the
// median is gonum's empirical quantile at one half (for an even count the
// lower of the two middle values).
//
// Why it matters: on sutures or rakes the shear stresses are zero and are
// given as such, while the shear F12, F21 comes from the markers; a model's
// shear stress, evaluated at the measured shear, then scatters with the
// markers' noise times the model's shear stiffness, and a fit penalises
// fibre arrangements that resist shear for it. Synthetic sutured
// specimens with 0.1 % of tracking noise in the shear (0.001 in F12 and
// F21) already moved fibre-family verdicts (README, Data checks).

// ShearScatterLimit is the scatter of F12 or F21 (dimensionless) above
// which a specimen with measured shear stresses is warned about: half the
// 0.001 at which synthetic sutured specimens' verdicts moved.
const ShearScatterLimit = 0.0005

// strainScatter estimates the scatter of each entry of F (F11, F12, F21,
// F22) over pts (one branch, in order); zero with fewer than MinPoints
// points.
func strainScatter(pts []Point) [4]float64 {
	var out [4]float64
	n := len(pts) - 3
	if len(pts) < MinPoints || n < 1 {
		return out
	}
	d := make([]float64, n)
	for e := range out {
		for i := range d {
			d[i] = math.Abs(pts[i+3].F[e] - 3*pts[i+2].F[e] + 3*pts[i+1].F[e] - pts[i].F[e])
		}
		sort.Float64s(d)
		out[e] = 1.4826 * stat.Quantile(0.5, stat.Empirical, d, nil) / math.Sqrt(20)
	}
	return out
}

// warnShearScatter warns, once for the specimen, when its shear stresses
// are given and the measured shear F12 or F21 of a protocol scatters by
// more than ShearScatterLimit from point to point.
func warnShearScatter(s *Specimen) {
	if !s.Measured[C12] && !s.Measured[C21] {
		return
	}
	worst, over := -1, 0
	big := 0.0
	for i := range s.Protocols {
		sc := s.Protocols[i].StrainScatter
		v := math.Max(sc[1], sc[2])
		if v > ShearScatterLimit {
			over++
			if v > big {
				worst, big = i, v
			}
		}
	}
	if worst < 0 {
		return
	}
	pr := &s.Protocols[worst]
	s.warn(0, pr.Label, "protocol %s: the shear F12 and F21 scatter by about %.2g and %.2g from point to point (estimated from third differences of the kept points; %d of %d protocols above %g) — tracking noise of the markers? The shear stresses are given, so a model's shear stress is compared with them at shear that carries this scatter, which penalises fibre arrangements that resist shear; steadier tracking (more or larger markers, a larger tracked region) lowers it",
		pr.Label, pr.StrainScatter[1], pr.StrainScatter[2], over, len(s.Protocols), ShearScatterLimit)
}
