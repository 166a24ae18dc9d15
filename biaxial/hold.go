package biaxial

import "math"

// Held loads. Under load control a test that holds the peak load lets the
// stretch creep on at that load, and the rows of the hold, each at a larger
// stretch and the same stress, end the loading branch (which ends at the
// largest stretch): fitted as loading, they read as a material that stops
// stiffening. The cycle split cannot tell them from the ramp, since it
// follows the stretch alone; warnHeldLoad says they are there.

// Thresholds of warnHeldLoad, as fractions of a cycle's ranges: each held
// row's normal stresses lie within holdStressFraction of their range of
// the last row's, and the hold covers holdMinRows rows or more and
// holdStretchFraction of the driving stretch's range or more. A stiffening ramp rises fastest at
// its end: sampled however densely, the rows of its last 2 % of stretch
// span far more than 1 % of its stress. The creep must also exceed
// peakScatter times the stretch's point-to-point scatter: the loading
// branch ends at its highest row, which with tracking noise is the row
// the noise lifted most, so on a noisy ramp its last rows seem to creep
// while their stresses, a few rows apart, agree within their own noise
// (synthetic neo-Hookean ramps with 500 rows a branch, 0.5 % stress noise
// and a scatter of 0.002 to 0.006 in each entry of F: up to 3.7 times the
// scatter of spurious creep, warned in 20 of 180 files).
const (
	holdStressFraction  = 0.01
	holdMinRows         = 3
	holdStretchFraction = 0.02
)

// warnHeldLoad warns, for each kept loading branch that ends in rows
// holding the stress while the stretch creeps on, where those rows are.
func warnHeldLoad(s *Specimen, opt Options) {
	if opt.Branch != BranchLoading {
		return
	}
	for i := range s.Protocols {
		pr := &s.Protocols[i]
		for start := 0; start < len(pr.Points); {
			end := start
			for end < len(pr.Points) && pr.Points[end].Cycle == pr.Points[start].Cycle {
				end++
			}
			if from, ok := heldTail(s, pr.Points[start:end], maxScatter(pr.StrainScatter)); ok {
				p, last := pr.Points[start+from], pr.Points[end-1]
				s.warn(p.Line, pr.Label, "protocol %s: the last %d kept rows of cycle %d (lines %d–%d) hold the stress within %g %% of its range while the stretch creeps on by %.3g: a load held at the peak, or the material yielding? The loading branch ends at the largest stretch, so they are fitted as loading, as a material that stops stiffening; remove them from the file if the fit should see only the ramp",
					pr.Label, end-start-from, p.Cycle, p.Line, last.Line, 100*holdStressFraction, drive(&last.F)-drive(&p.F))
			}
			start = end
		}
	}
}

// heldTail finds the held rows at the end of one cycle's loading branch
// pts: the index of the first, and whether there is such a hold (see the
// thresholds above); noise is the point-to-point scatter of the entries
// of F (dimensionless), which the creep must exceed peakScatter times.
func heldTail(s *Specimen, pts []Point, noise float64) (from int, ok bool) {
	n := len(pts)
	if n < holdMinRows+2 {
		return 0, false
	}
	var comps []Component
	rng := map[Component]float64{}
	for _, c := range []Component{C11, C22} {
		if !s.Measured[c] {
			continue
		}
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, p := range pts {
			lo, hi = math.Min(lo, p.Stress[c]), math.Max(hi, p.Stress[c])
		}
		if hi > lo {
			comps, rng[c] = append(comps, c), hi-lo
		}
	}
	dLo, dHi := math.Inf(1), math.Inf(-1)
	for i := range pts {
		d := drive(&pts[i].F)
		dLo, dHi = math.Min(dLo, d), math.Max(dHi, d)
	}
	if len(comps) == 0 || !(dHi > dLo) {
		return 0, false
	}
	last := pts[n-1]
	from = n - 1
	for from > 0 {
		held := true
		for _, c := range comps {
			held = held && math.Abs(pts[from-1].Stress[c]-last.Stress[c]) <= holdStressFraction*rng[c]
		}
		if !held {
			break
		}
		from--
	}
	creep := drive(&last.F) - drive(&pts[from].F)
	if n-from < holdMinRows || creep < math.Max(holdStretchFraction*(dHi-dLo), peakScatter*noise) {
		return 0, false
	}
	return from, true
}

// maxScatter is the largest of the scatters of the entries of F: the
// driving stretch is the largest entry of |F − I|, so its scatter is at
// most about that.
func maxScatter(sc [4]float64) float64 {
	return math.Max(math.Max(sc[0], sc[1]), math.Max(sc[2], sc[3]))
}
