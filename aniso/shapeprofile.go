package aniso

// Shape parameters of a term the subset search weighs at a point where
// they were not fitted for it: a term the full candidate fit gives no
// weight (its shape parameters then drift where the loss does not care),
// or a term that shares the load with others there (its shape parameters
// fitted for the mixture, not for the term alone). Its column at those values can rank it far below
// what it does at its own best ones: on a synthetic Demiray (1972) solid,
// fitted exactly by i1-exp alone at b = 2, the full isotropic fit left
// i1-exp idle at b = 25.5, the subset {i1-exp} ranked below the best
// three one-term subsets there (i2-exp, i2-gent, i2-lin at losses
// 0.0058–0.0087) and was never refitted, and the chosen model was four
// other terms.

import (
	"math"
	"slices"
)

// profileSteps is how many golden-section steps refine a shape parameter
// between the neighbours of its best scan value: the bracket shrinks by
// 0.618 a step, to about 0.3 % of itself, which ranks terms, not fits them
// (the refits that follow do).
const profileSteps = 12

// profileShapes minimises loss over the shape parameters of group g, one
// parameter at a time, with every other parameter at theta: first over
// the scan grid of the parameter's shape (terms.Param.Grid) and its value
// in theta, then by golden-section search between the best value's
// neighbours, in the logarithm of the parameter where the bracket is
// positive and spans more than a decade. loss is called after e.eval at
// each trial point without derivatives, and is +Inf where a column
// overflows. It returns the parameters found (a copy of theta, changed in
// g's shape parameters only where the loss fell) and their loss.
func profileShapes(e *engine, theta []float64, g int, loss func() float64) ([]float64, float64) {
	th := slices.Clone(theta)
	cur := func() float64 {
		if math.IsInf(e.eval(th, false), 1) {
			return math.Inf(1)
		}
		return loss()
	}
	at := func(i int, v float64) float64 {
		old := th[i]
		th[i] = v
		l := cur()
		th[i] = old
		return l
	}
	best := cur()
	for i, q := range e.params {
		if q.Kind != kindShape || q.Group != g {
			continue
		}
		k := e.groups[g][0]
		spec := e.model.Terms[k].Shape.Params[q.Index]
		vals := []float64{th[i]}
		for _, v := range spec.Grid {
			if v >= q.Lo && v <= q.Hi {
				vals = append(vals, v)
			}
		}
		slices.Sort(vals)
		vals = slices.Compact(vals)
		bi, bv := -1, best
		for j, v := range vals {
			if l := at(i, v); l < bv {
				bi, bv = j, l
			}
		}
		if bi < 0 {
			bi = slices.Index(vals, th[i])
		}
		lo, hi := q.Lo, q.Hi
		if bi > 0 {
			lo = vals[bi-1]
		}
		if bi < len(vals)-1 {
			hi = vals[bi+1]
		}
		x, l := goldenSection(func(v float64) float64 { return at(i, v) }, lo, hi, vals[bi], bv)
		if l < best {
			th[i], best = x, l
		}
	}
	return th, best
}

// goldenSection minimises f over [lo, hi] (in the logarithm where lo > 0
// and hi > 10 lo) in profileSteps steps, and returns the best point seen,
// x0 (with value f0) included.
func goldenSection(f func(float64) float64, lo, hi, x0, f0 float64) (float64, float64) {
	logScale := lo > 0 && hi > 10*lo
	to, from := func(x float64) float64 { return x }, func(u float64) float64 { return u }
	if logScale {
		to, from = math.Log, math.Exp
	}
	a, b := to(lo), to(hi)
	const r = 0.6180339887498949
	c, d := b-r*(b-a), a+r*(b-a)
	fc, fd := f(from(c)), f(from(d))
	bx, bf := x0, f0
	for s := 0; s < profileSteps; s++ {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - r*(b-a)
			fc = f(from(c))
		} else {
			a, c, fc = c, d, fd
			d = a + r*(b-a)
			fd = f(from(d))
		}
	}
	for _, p := range [][2]float64{{c, fc}, {d, fd}} {
		if p[1] < bf {
			bx, bf = math.Min(hi, math.Max(lo, from(p[0]))), p[1]
		}
	}
	return bx, bf
}
