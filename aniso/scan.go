package aniso

import (
	"math"
	"sort"

	"github.com/weft-tools/weft/terms"
)

// kappaGrid is the dictionary grid of the dispersion κ over its range;
// shape parameters take theirs from terms.Param.Grid. Used only to find
// starting points.
var kappaGrid = []float64{0, 0.15, 0.3}

// concentrationGrid spans wide (standard deviation of the density about
// 23°) and narrow (10°) in-plane spreads.
var concentrationGrid = []float64{1.5, 8}

// dictEntry says which structure term, shape parameter values and κ a
// dictionary column stands for.
type dictEntry struct {
	spec   int
	params [terms.MaxParams]float64
	hasP   bool
	kappa  int // index into kappaGrid (or concentrationGrid), or −1
}

// paramGrid returns every combination of a shape's scan-grid values that
// lie within the parameters' bounds (the first parameter varying
// slowest); a parameter without a grid stays at its default.
func paramGrid(sh *terms.Shape) [][terms.MaxParams]float64 {
	out := [][terms.MaxParams]float64{{}}
	for j, q := range sh.Params {
		values := []float64{q.Default}
		if len(q.Grid) > 0 {
			values = values[:0]
			for _, v := range q.Grid {
				if v >= q.Min && v <= q.Max {
					values = append(values, v)
				}
			}
		}
		var next [][terms.MaxParams]float64
		for _, c := range out {
			for _, v := range values {
				c[j] = v
				next = append(next, c)
			}
		}
		out = next
	}
	return out
}

// dictionary builds the stiffening- and dispersion-agnostic model used by the
// coarse angle scan: every shape parameter and κ replaced by copies on a
// grid, all in one non-negative least-squares problem, so that a scan over
// angles alone finds good starting points for everything.
func dictionary(st Structure) (*Model, [][]int, []int, []dictEntry) {
	nf := st.Layout.Families()
	kap := []float64{0}
	switch {
	case st.Dispersion:
		kap = kappaGrid
	case st.Planar:
		kap = concentrationGrid
	}
	m := &Model{}
	var famOf []int
	famIndex := map[[2]int]int{}
	for f := 0; f < nf; f++ {
		for ki, k := range kap {
			famIndex[[2]int{f, ki}] = len(m.Families)
			if st.Planar {
				m.Families = append(m.Families, Family{Planar: true, Concentration: k})
			} else {
				m.Families = append(m.Families, Family{Dispersion: k})
			}
			famOf = append(famOf, f)
		}
	}
	var groups [][]int
	var entries []dictEntry
	for s, t := range st.Terms {
		values := paramGrid(t.Shape)
		hasP := len(t.Shape.Params) > 0
		kis := []int{-1}
		if t.Family >= 0 {
			kis = kis[:0]
			for ki := range kap {
				kis = append(kis, ki)
			}
		}
		for _, v := range values {
			for _, ki := range kis {
				params := append([]float64(nil), v[:len(t.Shape.Params)]...)
				var g []int
				fams := []int{t.Family}
				if t.Family < 0 {
					fams = []int{-1}
				} else if st.Layout == LayoutMirror {
					fams = []int{0, 1}
				}
				for _, sf := range fams {
					fam := -1
					if sf >= 0 {
						fam = famIndex[[2]int{sf, ki}]
					}
					g = append(g, len(m.Terms))
					m.Terms = append(m.Terms, Term{Shape: t.Shape, Family: fam, Params: append([]float64(nil), params...)})
				}
				groups = append(groups, g)
				entries = append(entries, dictEntry{spec: s, params: v, hasP: hasP, kappa: ki})
			}
		}
	}
	return m, groups, famOf, entries
}

// scanPoint is one coarse-scan evaluation.
type scanPoint struct {
	angles [2]float64
	loss   float64
	i, j   int
}

// offSymmetry moves an angle that sits on 0 or 90° (stationary points of
// the loss by mirror symmetry when the data have no shear) by half a degree.
func offSymmetry(a float64) float64 {
	nudge := Rad(0.5)
	w := wrapAngle(a)
	switch {
	case math.Abs(w) < nudge/2:
		return nudge
	case math.Pi/2-math.Abs(w) < nudge/2:
		return math.Pi/2 - nudge
	}
	return a
}

// scanEngine returns the engine of st's coarse angle scan on p: the
// dictionary model (see dictionary) with the angle parameters of params
// alone, overflowing columns dropped, and a memo when two angles are
// scanned (see scanMemo); and the dictionary's entries.
func scanEngine(p *Problem, st Structure, params []param) (*engine, []dictEntry) {
	dm, dg, dfam, entries := dictionary(st)
	var dparams []param
	for _, q := range params {
		if q.Kind == kindAngle {
			dparams = append(dparams, q)
		}
	}
	de := newEngine(p, dm, dg, dfam, st.Layout, dparams)
	de.skipOverflow = true
	if st.Planar {
		de.cols.scan = &planarScan{}
	}
	if len(dparams) == 2 {
		de.memo = newScanMemo(de)
	}
	return de, entries
}

// coarseStarts scans the angle parameters with the dictionary model and
// returns starting θ vectors for the best local minima.
func coarseStarts(p *Problem, st Structure, set Settings, nAngles int, params []param) [][]float64 {
	de, entries := scanEngine(p, st, params)
	dparams := de.params
	step := Rad(set.ScanStepDeg)
	grid := func(q param) []float64 {
		// Periodic grids are offset by half a step: without shear, α = 0
		// and α = 90° are stationary points of the loss by symmetry, where a
		// local refinement would never move.
		lo, hi := -math.Pi/2+step/2, math.Pi/2
		if !q.Periodic {
			lo, hi = q.Lo, q.Hi
		} else if !p.HasShear {
			// Without shear only |α| matters (package documentation, Mirror symmetry).
			lo = step / 2
		}
		var g []float64
		for x := lo; x <= hi+1e-12; x += step {
			g = append(g, x)
		}
		return g
	}
	var pts []scanPoint
	var g0, g1 []float64
	switch nAngles {
	case 0:
		pts = append(pts, scanPoint{loss: de.eval(nil, false)})
	case 1:
		g0 = grid(dparams[0])
		for i, a := range g0 {
			pts = append(pts, scanPoint{angles: [2]float64{a}, loss: de.eval([]float64{a}, false), i: i})
		}
	case 2:
		g0, g1 = grid(dparams[0]), grid(dparams[1])
		for i, a := range g0 {
			for j, b := range g1 {
				// Free families are interchangeable: scan α1 ≤ α2 only.
				if st.Layout == LayoutFree && b < a {
					pts = append(pts, scanPoint{angles: [2]float64{a, b}, loss: math.NaN(), i: i, j: j})
					continue
				}
				pts = append(pts, scanPoint{angles: [2]float64{a, b}, loss: de.eval([]float64{a, b}, false), i: i, j: j})
			}
		}
	}
	// Local minima of the scan (periodic in a periodic angle), best first.
	var cands []scanPoint
	for k, pt := range pts {
		if math.IsNaN(pt.loss) || math.IsInf(pt.loss, 1) {
			continue
		}
		if nAngles >= 1 && !isLocalMin(pts, k, len(g0), len(g1), nAngles, dparams, p.HasShear) {
			continue
		}
		cands = append(cands, pt)
	}
	sort.SliceStable(cands, func(a, b int) bool { return cands[a].loss < cands[b].loss })
	if len(cands) > set.Starts {
		cands = cands[:set.Starts]
	}
	var starts [][]float64
	for _, c := range cands {
		th := make([]float64, len(params))
		var ang []float64
		if nAngles > 0 {
			ang = c.angles[:nAngles]
		}
		de.eval(ang, false)
		k := 0
		for i, q := range params {
			switch q.Kind {
			case kindAngle:
				th[i] = c.angles[k]
				k++
			case kindKappa:
				th[i] = dominantSpread(de, entries, st, q.Families, kappaGrid)
			case kindConcentration:
				th[i] = dominantSpread(de, entries, st, q.Families, concentrationGrid)
			case kindShape:
				th[i] = dominantParam(de, entries, q, st.Terms[q.Group].Shape.Params[q.Index])
			}
		}
		starts = append(starts, th)
	}
	return starts
}

func isLocalMin(pts []scanPoint, k, n0, n1, nAngles int, dparams []param, shear bool) bool {
	l := pts[k].loss
	at := func(i, j int) float64 {
		if nAngles == 1 {
			return pts[i].loss
		}
		return pts[i*n1+j].loss
	}
	wrap := func(i, n int, q param) (int, bool) {
		if i >= 0 && i < n {
			return i, true
		}
		if q.Periodic && shear {
			return (i + n) % n, true
		}
		return 0, false
	}
	i, j := pts[k].i, pts[k].j
	for di := -1; di <= 1; di++ {
		for dj := -1; dj <= 1; dj++ {
			if di == 0 && dj == 0 || (nAngles == 1 && dj != 0) {
				continue
			}
			ii, ok := wrap(i+di, n0, dparams[0])
			if !ok {
				continue
			}
			jj := 0
			if nAngles == 2 {
				jj, ok = wrap(j+dj, n1, dparams[1])
				if !ok {
					continue
				}
			}
			v := at(ii, jj)
			if !math.IsNaN(v) && v < l {
				return false
			}
		}
	}
	return true
}

// dominantParam returns the grid value of a structure term's shape
// parameter sp (fit parameter q) in the dictionary column that carries
// the largest share of stress.
func dominantParam(de *engine, entries []dictEntry, q param, sp terms.Param) float64 {
	best, v := 0.0, math.NaN()
	for g, en := range entries {
		if en.spec != q.Group || !en.hasP {
			continue
		}
		if c := de.w[g] * de.norm[g]; c > best {
			best, v = c, en.params[q.Index]
		}
	}
	if math.IsNaN(v) {
		// The term takes no stress in the scan: start it where it is
		// gentlest, which cannot overflow where a steeper start might.
		v = sp.IdleStart
	}
	return math.Min(q.Hi, math.Max(q.Lo, v))
}

// dominantSpread returns the spread (κ or concentration, from grid) of the
// dictionary fibre column with the largest share of stress in the given
// structural families.
func dominantSpread(de *engine, entries []dictEntry, st Structure, fams []int, grid []float64) float64 {
	best, v := 0.0, grid[0]
	for g, en := range entries {
		if en.kappa < 0 {
			continue
		}
		t := st.Terms[en.spec]
		if !containsInt(fams, t.Family) {
			continue
		}
		if c := de.w[g] * de.norm[g]; c > best {
			best, v = c, grid[en.kappa]
		}
	}
	return v
}
