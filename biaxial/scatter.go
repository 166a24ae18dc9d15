package biaxial

import (
	"fmt"
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
// F21) already moved fibre-family verdicts (README, the tracking-noise
// paragraph of Discovering the model).

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
			d[i] = thirdDifference(pts[i].F[e], pts[i+1].F[e], pts[i+2].F[e], pts[i+3].F[e])
		}
		out[e] = scatterOfThirds(d)
	}
	return out
}

// StrainScatterOf estimates the point-to-point scatter (standard
// deviation, dimensionless) of each entry of F (F11, F12, F21, F22) over
// pts, one branch in order, as Protocol.StrainScatter is estimated for a
// file (third differences, above); zero with fewer than MinPoints points.
// It lets a reader of points written out by a fit (fit.csv) estimate the
// tracking noise those points carry.
func StrainScatterOf(pts []Point) [4]float64 { return strainScatter(pts) }

// stressScatter estimates the point-to-point scatter of component c's
// stress over pts (in order) from its third differences, as strainScatter
// does for F: a smooth stress–stretch curve has almost none, independent
// noise of standard deviation s gives s. Zero with fewer than MinPoints
// points.
func stressScatter(pts []Point, c Component) float64 {
	n := len(pts) - 3
	if len(pts) < MinPoints || n < 1 {
		return 0
	}
	d := make([]float64, n)
	for i := range d {
		d[i] = thirdDifference(pts[i].Stress[c], pts[i+1].Stress[c], pts[i+2].Stress[c], pts[i+3].Stress[c])
	}
	return scatterOfThirds(d)
}

// thirdDifference is |Δ³| of four values one step apart: |d − 3c + 3b − a|.
func thirdDifference(a, b, c, d float64) float64 { return math.Abs(d - 3*c + 3*b - a) }

// scatterOfThirds is the scatter estimate 1.4826·median/√20 of absolute
// third differences (see above); v is sorted in place; 0 for none.
func scatterOfThirds(v []float64) float64 {
	if len(v) == 0 {
		return 0
	}
	sort.Float64s(v)
	return 1.4826 * stat.Quantile(0.5, stat.Empirical, v, nil) / math.Sqrt(20)
}

// NoisiestShear returns, among the protocols of s given by index (nil:
// all), the one whose shear F12 or F21, as a fit uses it
// (Protocol.FittedStrainScatter: as measured, or what smoothing leaves),
// scatters most from point to point, and how many scatter by more than
// ShearScatterLimit; worst is −1 when none does or when s gives no shear
// stress (the scatter then penalises nothing).
func (s *Specimen) NoisiestShear(protocols []int) (worst, over int) {
	worst = -1
	if !s.Measured[C12] && !s.Measured[C21] {
		return worst, 0
	}
	if protocols == nil {
		for i := range s.Protocols {
			protocols = append(protocols, i)
		}
	}
	big := ShearScatterLimit
	for _, i := range protocols {
		sc := s.Protocols[i].FittedStrainScatter()
		if v := math.Max(sc[1], sc[2]); v > ShearScatterLimit {
			over++
			if v > big {
				worst, big = i, v
			}
		}
	}
	return worst, over
}

// warnShearScatter warns, once for the specimen, when its shear stresses
// are given and the shear F12 or F21 that a fit uses scatters by more than
// ShearScatterLimit from point to point (NoisiestShear).
func warnShearScatter(s *Specimen) {
	worst, over := s.NoisiestShear(nil)
	if worst < 0 {
		return
	}
	pr := &s.Protocols[worst]
	smoothed := ""
	if pr.SmoothWindow > 0 {
		f := pr.FittedStrainScatter()
		smoothed = fmt.Sprintf("; smoothed over %d points, about %.2g and %.2g remain", pr.SmoothWindow, f[1], f[2])
	}
	s.warn(0, pr.Label, "protocol %s: the shear F12 and F21 scatter by about %.2g and %.2g from point to point (estimated from third differences of the kept points%s; %d of %d protocols above %g) — tracking noise of the markers? The shear stresses are given, so a model's shear stress is compared with them at shear that carries this scatter, which penalises fibre arrangements that resist shear; steadier tracking (more or larger markers, a larger tracked region) or smoothing the tracked strains over more points lowers it",
		pr.Label, pr.StrainScatter[1], pr.StrainScatter[2], smoothed, over, len(s.Protocols), ShearScatterLimit)
}

// smoothStrain replaces each entry of F over pts by its quadratic
// Savitzky–Golay smoothing over window points (see Options.SmoothStrain):
// the interior by the centred window's fit at its centre, the first and
// last window/2 points by the first and last window's fit at them.
func smoothStrain(pts []Point, window int) {
	m := window / 2
	n := len(pts)
	// The weights depend only on where in its window a point sits: w[at+m]
	// for offsets at = −m … m (the interior uses at = 0).
	w := make([][]float64, window)
	for at := -m; at <= m; at++ {
		w[at+m] = make([]float64, window)
		for k := range w[at+m] {
			w[at+m][k] = savitzkyGolayWeight(m, k-m, at)
		}
	}
	x := make([]float64, n)
	for e := 0; e < 4; e++ {
		for i := range pts {
			x[i] = pts[i].F[e]
		}
		for i := range pts {
			lo, at := i-m, 0
			switch {
			case i < m:
				lo, at = 0, i-m
			case i >= n-m:
				lo, at = n-window, i-(n-m-1)
			}
			v := 0.0
			for k, wk := range w[at+m] {
				v += wk * x[lo+k]
			}
			pts[i].F[e] = v
		}
	}
}

// savitzkyGolayWeight is the weight of the point at offset u (from −m to
// m) in the value at offset at of the least-squares quadratic through a
// window of 2m + 1 equally spaced points: the row of the fit's hat matrix,
// [1 at at²] (XᵀX)⁻¹ [1 u u²]ᵀ. With the window's moments S0 = 2m + 1,
// S2 = Σ k², S4 = Σ k⁴ (odd moments vanish), (XᵀX)⁻¹ has the constant
// block [[S4, −S2], [−S2, S0]]/(S0 S4 − S2²) and 1/S2 for the linear term.
func savitzkyGolayWeight(m, u, at int) float64 {
	var s0, s2, s4 float64
	for k := -m; k <= m; k++ {
		k2 := float64(k * k)
		s0++
		s2 += k2
		s4 += k2 * k2
	}
	det := s0*s4 - s2*s2
	a, uu := float64(at), float64(u)
	return (s4-s2*uu*uu)/det + a*uu/s2 + a*a*(s0*uu*uu-s2)/det
}

// SmoothingNoiseFactor is the ratio of the standard deviation of
// independent noise after and before a quadratic Savitzky–Golay filter
// over window points, at an interior point: √(Σ w²) of the centre's
// weights, which equals √w0 for a least-squares filter (e.g. 0.505 for 9
// points). 1 for a window of 0.
func SmoothingNoiseFactor(window int) float64 {
	if window <= 0 {
		return 1
	}
	return math.Sqrt(savitzkyGolayWeight(window/2, 0, 0))
}

// warnNoiseOnlyShear warns that F12 and F21, the data's only shear
// information (no shear stress is given), stay on every kept point within
// what their scatter explains (shearBeyondScatter), and says what the
// reader made of it (Specimen.ShearWithinScatter): no shear information,
// so a fit takes them as zero and leaves the sign of a fibre angle open.
func warnNoiseOnlyShear(s *Specimen) {
	worst := largestShearScatter(s)
	s.warn(0, "", "the shear F12 and F21 stay within %g times their point-to-point scatter (up to %.2g) of zero on every kept point, and no shear stress is given — a pure biaxial stretch seen through tracking noise? Taken as no shear information: a fit takes F12 = F21 = 0 and leaves the sign of a fibre angle (a family at +α or −α, which give the same normal stresses under a pure stretch) undetermined, as that noise cannot decide it; shear stress columns, an off-axis protocol or a specimen sheared on purpose would decide it",
		float64(peakScatter), worst)
}

// shearBeyondScatter reports whether some kept point's shear F12 or F21
// departs from zero by more than peakScatter times the largest
// point-to-point scatter of F12 and F21 over the protocols
// (Protocol.StrainScatter). Without a shear stress, a fibre angle's sign is
// told only by the shear of F: the stresses of a family at +α and at −α
// differ at first order in F12 and F21 (Holzapfel, Gasser & Ogden 2000:
// I4 = a·Ca depends on the sign of α only through the off-diagonal C12).
// Shear that is only tracking noise about a zero mean decides that sign at
// random: a synthetic one-family specimen at +30° (three protocols of 100
// rows, a scatter of 0.004 in each entry of F and no shear stress) was
// fitted at −29.3° and its sign called identified; such shear now counts
// as none (Specimen.ShearWithinScatter). Gaussian scatter
// reaches 4 standard deviations about once in 16 000 values, so 5 leaves
// noise below it. The largest scatter, not each entry's own: from 30 rows
// one estimate came out at half the true 0.004, and the noise of that
// entry passed for shear (9 of 36 noise-only files of 30 rows a branch
// were not warned). A path without scatter (zero estimate) counts from any
// non-zero shear, as before.
func shearBeyondScatter(s *Specimen) bool {
	worst := largestShearScatter(s)
	for i := range s.Protocols {
		for _, p := range s.Protocols[i].Points {
			if math.Abs(p.F[1]) > peakScatter*worst || math.Abs(p.F[2]) > peakScatter*worst {
				return true
			}
		}
	}
	return false
}

// largestShearScatter is the largest point-to-point scatter of F12 and F21
// over the protocols (Protocol.StrainScatter).
func largestShearScatter(s *Specimen) float64 {
	worst := 0.0
	for i := range s.Protocols {
		sc := s.Protocols[i].StrainScatter
		worst = math.Max(worst, math.Max(sc[1], sc[2]))
	}
	return worst
}
