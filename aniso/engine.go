package aniso

import (
	"math"
	"slices"
)

// engine evaluates the variable-projection objective of one model form on
// one Problem: for given non-linear parameters θ (angles, dispersion, shape
// parameters) it fills the stress columns, solves the weights exactly by
// non-negative least squares, and returns the weighted residual sum of
// squares. With derivatives it also returns the Jacobian of the residual
// with respect to θ in the form of Kaufman 1975 (BIT 15:49–57): the
// derivative of the columns times the weights, projected off the span of
// the active columns (Golub & Pereyra 1973, SIAM J Numer Anal 10:413–432).
//
// Design column g is the sum of the model terms in groups[g] (a mirror pair
// shares one weight). Model family f takes the angle of structural family
// famOf[f]; structural angles come from θ through the layout.
type engine struct {
	p      *Problem
	model  *Model
	groups [][]int
	famOf  []int
	layout Layout
	params []param

	cols     Columns
	rows, ng int
	A        []float64 // design columns, column-major rows×ng
	G, b     []float64 // scaled cross products
	norm     []float64
	allowed  []bool
	nn       nnls
	w        []float64 // weights of the design columns (unscaled)
	r        []float64 // residual A w − y
	v        [][]float64
	loss     float64
	feasible bool
	// skipOverflow drops overflowing columns instead of making the whole
	// evaluation infeasible (for dictionary scans, where some grid stiffening values
	// are bound to overflow at large stretch).
	skipOverflow bool
	// static marks design groups whose columns cannot change between
	// evaluations (isotropic terms with no free parameter); their columns
	// and cross products are computed once.
	static     []bool
	staticDone bool
	// shaped marks design groups with a free shape parameter. keep marks,
	// for the current evaluation, the groups whose columns and cross
	// products are those of the previous one: static groups, and in an
	// evaluation without derivatives every group without a free shape
	// parameter whose families did not move (in a coarse scan of two free
	// families, the family the inner loop holds). prevFam are the model's
	// families at the last complete evaluation (valid with prevOK).
	shaped  []bool
	keep    []bool
	prevFam []Family
	prevOK  bool
	// isoShaped marks shaped groups whose terms are all isotropic (their
	// columns depend on their own shape parameters only). filledWith
	// holds, for such a group, its terms' shape parameters at its last
	// complete fill with derivatives (valid while filledOK): an evaluation
	// with derivatives keeps its columns and derivative columns while the
	// parameters have not moved. In a fit of the whole catalogue a term
	// that non-negativity holds at zero has a zero gradient, so its
	// parameters stay where they are and its column need not be filled
	// again. paramBuf is markKept's scratch.
	isoShaped  []bool
	filledWith [][]float64
	filledOK   []bool
	paramBuf   []float64
	// derivsAt says that the last evaluation, at e.at, was feasible and
	// filled the derivatives: the state a minimiser leaves (minimize).
	derivsAt bool
	// tol is the relative loss decrease below which minimize stops (two
	// steps in a row); 0 means 1e-10.
	tol float64
	// at is the θ of the last evaluation (the state e.A, e.w and e.r
	// describe).
	at []float64
	// lossOffset is subtracted from every loss: a profile that integrates
	// dispersion with the search rule shifts its losses by the rule's error
	// at the optimum, so that they compare with the fit's (see profiles).
	lossOffset float64
	// dotCols is crossProducts' scratch list of columns.
	dotCols []int
	// memo, when set, serves the term columns and cross products of an
	// evaluation without derivatives that an earlier one computed (a
	// coarse scan of two angles, see scanMemo).
	memo *scanMemo
}

// paramKind says what a non-linear parameter moves.
type paramKind int

const (
	kindAngle         paramKind = iota // structural angle parameter (radians)
	kindKappa                          // dispersion κ of one or both structural families
	kindConcentration                  // in-plane concentration b of one or both structural families
	kindShape                          // a shape parameter of one design group
)

// param is one non-linear parameter of a model form.
type param struct {
	Kind paramKind
	// Name is shown in results, e.g. "angle", "half_angle", "stiffening[fib-expsq]".
	Name string
	// Angle is the structural angle index (0 or 1) for kindAngle.
	Angle int
	// Families are the structural families a κ parameter sets.
	Families []int
	// Group and Index locate a shape parameter.
	Group, Index int
	// Lo and Hi bound the parameter; Periodic angles wrap with period π.
	Lo, Hi   float64
	Periodic bool
}

func newEngine(p *Problem, m *Model, groups [][]int, famOf []int, layout Layout, params []param) *engine {
	e := &engine{p: p, model: m, groups: groups, famOf: famOf, layout: layout, params: params}
	e.rows, e.ng = p.Rows(), len(groups)
	e.A = make([]float64, e.rows*e.ng)
	e.G = make([]float64, e.ng*e.ng)
	e.b = make([]float64, e.ng)
	e.norm = make([]float64, e.ng)
	e.allowed = make([]bool, e.ng)
	e.w = make([]float64, e.ng)
	e.r = make([]float64, e.rows)
	e.v = make([][]float64, len(params))
	for i := range e.v {
		e.v[i] = make([]float64, e.rows)
	}
	e.static = make([]bool, e.ng)
	free := map[int]bool{}
	for _, q := range params {
		if q.Kind == kindShape {
			free[q.Group] = true
		}
	}
	e.cols.Skip = make([]bool, len(m.Terms))
	e.cols.valuesOnly = make([]bool, len(m.Terms))
	e.shaped = make([]bool, e.ng)
	e.keep = make([]bool, e.ng)
	e.isoShaped = make([]bool, e.ng)
	e.filledWith = make([][]float64, e.ng)
	e.filledOK = make([]bool, e.ng)
	for g, members := range groups {
		e.shaped[g] = free[g]
		e.static[g] = !free[g]
		iso := true
		for _, k := range members {
			if m.Terms[k].Family >= 0 {
				e.static[g], iso = false, false
			}
		}
		e.isoShaped[g] = free[g] && iso
	}
	return e
}

// structuralAngles maps the angle parameters to the structural families'
// angles: one family α; a mirror pair θ ± β; two free angles α1, α2.
func structuralAngles(layout Layout, a0, a1 float64) [2]float64 {
	switch layout {
	case LayoutMirror:
		return [2]float64{a0 + a1, a0 - a1}
	case LayoutFree:
		return [2]float64{a0, a1}
	}
	return [2]float64{a0, 0}
}

// angleCoef is ∂(structural angle sf)/∂(angle parameter a).
func angleCoef(layout Layout, a, sf int) float64 {
	switch layout {
	case LayoutMirror:
		if a == 1 && sf == 1 {
			return -1
		}
		return 1
	case LayoutFree:
		if a == sf {
			return 1
		}
		return 0
	}
	if a == 0 && sf == 0 {
		return 1
	}
	return 0
}

// apply writes θ into the model.
func (e *engine) apply(theta []float64) {
	var ang [2]float64
	for i, q := range e.params {
		if q.Kind == kindAngle {
			ang[q.Angle] = theta[i]
		}
	}
	sa := structuralAngles(e.layout, ang[0], ang[1])
	for f := range e.model.Families {
		e.model.Families[f].Angle = sa[e.famOf[f]]
	}
	for i, q := range e.params {
		switch q.Kind {
		case kindKappa, kindConcentration:
			for f := range e.model.Families {
				for _, sf := range q.Families {
					if e.famOf[f] != sf {
						continue
					}
					if q.Kind == kindKappa {
						e.model.Families[f].Dispersion = theta[i]
					} else {
						e.model.Families[f].Concentration = theta[i]
					}
				}
			}
		case kindShape:
			for _, k := range e.groups[q.Group] {
				e.model.Terms[k].Params[q.Index] = theta[i]
			}
		}
	}
}

// eval computes the objective at θ; with derivs it also fills e.v with the
// unprojected derivative vectors ∂(A w)/∂θ_i. It returns the loss, +Inf when
// a column overflows.
func (e *engine) eval(theta []float64, derivs bool) float64 {
	e.at = append(e.at[:0], theta...)
	e.derivsAt = false
	e.apply(theta)
	e.markKept(derivs)
	memo := e.memo
	if derivs {
		memo = nil
	}
	if memo != nil {
		memo.look(e)
	}
	for g, members := range e.groups {
		// Derivatives are filled for the groups that had a positive
		// weight at the previous evaluation; a group that gains one now
		// gets them afterwards (completeDerivatives).
		// (staticDone: e.w holds the weights of an earlier evaluation.)
		skipDerivs := e.static[g] || (e.staticDone && e.w[g] == 0)
		for _, k := range members {
			e.cols.Skip[k] = e.keep[g] || memo != nil && memo.have[k]
			e.cols.valuesOnly[k] = skipDerivs
		}
	}
	e.p.Data.Fill(e.model, &e.cols, derivs)
	rows, ng := e.rows, e.ng
	e.feasible = true
	col := func(k int) []float64 {
		if memo != nil {
			return memo.column(k, &e.cols, rows)
		}
		return e.cols.A[k*rows : (k+1)*rows]
	}
	for g, members := range e.groups {
		if e.keep[g] {
			continue
		}
		a := e.A[g*rows : (g+1)*rows]
		copy(a, col(members[0]))
		for _, k := range members[1:] {
			src := col(k)
			for r := range a {
				a[r] += src[r]
			}
		}
		s := 0.0
		for _, x := range a {
			s += x * x
		}
		if (math.IsInf(s, 0) || math.IsNaN(s)) && !e.skipOverflow {
			e.feasible = false
		}
		e.norm[g] = math.Sqrt(s)
		e.allowed[g] = s > 0 && !math.IsInf(s, 0) && !math.IsNaN(s)
	}
	if !e.feasible {
		e.loss = math.Inf(1)
		return e.loss
	}
	e.crossProducts(memo)
	e.noteFilled(derivs)
	e.staticDone = true
	e.prevFam = append(e.prevFam[:0], e.model.Families...)
	e.prevOK = true
	ws := e.nn.solve(e.G, e.b, ng, e.allowed)
	for g := range e.w {
		e.w[g] = 0
		if ws[g] > 0 {
			e.w[g] = ws[g] / e.norm[g]
		}
	}
	copy(e.r, e.p.Target)
	for r := range e.r {
		e.r[r] = -e.r[r]
	}
	for g, w := range e.w {
		if w == 0 {
			continue
		}
		a := e.A[g*rows : (g+1)*rows]
		for r := range e.r {
			e.r[r] += w * a[r]
		}
	}
	loss := 0.0
	for _, x := range e.r {
		loss += x * x
	}
	loss -= e.lossOffset
	e.loss = loss
	if derivs {
		e.completeDerivatives()
		e.derivatives()
		e.derivsAt = true
	}
	return loss
}

// crossProducts fills the scaled cross products G and b of every group
// whose column changed. Each product is summed over the rows in order, as
// a plain dot product would be, but up to four columns are taken against
// group i in one pass over its column (dots4), which reads it once
// instead of four times.
func (e *engine) crossProducts(memo *scanMemo) {
	rows, ng := e.rows, e.ng
	y := e.p.Target
	js := e.dotCols[:0]
	for i := 0; i < ng; i++ {
		ai := e.A[i*rows : (i+1)*rows]
		if !e.allowed[i] {
			for j := 0; j < ng; j++ {
				e.G[i*ng+j], e.G[j*ng+i] = 0, 0
			}
			e.b[i] = 0
			continue
		}
		// Column index ng stands for the target y.
		js = js[:0]
		for j := 0; j <= i; j++ {
			if !e.allowed[j] || e.keep[i] && e.keep[j] {
				continue
			}
			js = append(js, j)
		}
		if !e.keep[i] {
			js = append(js, ng)
		}
		if memo != nil {
			// Products the memo holds are not computed again.
			n := 0
			for _, j := range js {
				if v, ok := memo.product(e, i, j); ok {
					e.setProduct(i, j, v)
					continue
				}
				js[n] = j
				n++
			}
			js = js[:n]
		}
		col := func(j int) []float64 {
			if j == ng {
				return y
			}
			return e.A[j*rows : (j+1)*rows]
		}
		put := func(j int, s float64) {
			if j == ng {
				s /= e.norm[i]
			} else {
				s /= e.norm[i] * e.norm[j]
			}
			if memo != nil {
				memo.store(e, i, j, s)
			}
			e.setProduct(i, j, s)
		}
		k := 0
		for ; k+4 <= len(js); k += 4 {
			s := dots4(ai, col(js[k]), col(js[k+1]), col(js[k+2]), col(js[k+3]))
			for m := range s {
				put(js[k+m], s[m])
			}
		}
		for ; k < len(js); k++ {
			put(js[k], dot(ai, col(js[k])))
		}
	}
	e.dotCols = js
}

// setProduct sets the scaled cross product of groups i and j (j = ng:
// the target, b).
func (e *engine) setProduct(i, j int, v float64) {
	if j == e.ng {
		e.b[i] = v
		return
	}
	e.G[i*e.ng+j], e.G[j*e.ng+i] = v, v
}

// dot returns Σ a[r]·b[r], summed in order of r.
func dot(a, b []float64) float64 {
	b = b[:len(a)]
	s := 0.0
	for r, x := range a {
		s += x * b[r]
	}
	return s
}

// dots4 returns the four dot products of a with b0…b3, each summed in
// order of r exactly as dot sums it.
func dots4(a, b0, b1, b2, b3 []float64) [4]float64 {
	n := len(a)
	b0, b1, b2, b3 = b0[:n], b1[:n], b2[:n], b3[:n]
	var s0, s1, s2, s3 float64
	for r, x := range a {
		s0 += x * b0[r]
		s1 += x * b1[r]
		s2 += x * b2[r]
		s3 += x * b3[r]
	}
	return [4]float64{s0, s1, s2, s3}
}

// holdsDerivatives reports whether the engine's state is a derivative
// evaluation at θ exactly, which evaluating there again would reproduce
// bit for bit.
func (e *engine) holdsDerivatives(theta []float64) bool {
	return e.derivsAt && slices.Equal(e.at, theta)
}

// completeDerivatives fills the derivative columns of the groups that have
// a positive weight but were filled without them (evaluated as inactive
// at the previous evaluation), at the current θ. Only such groups enter
// the Jacobian (derivatives), so in a fit of the whole catalogue the many
// terms non-negativity keeps at zero never pay for derivatives. Their
// columns are filled again on the way, to the same bits: in a fill with
// derivatives a column is formed the same way whether or not its own
// derivatives are asked for (Dataset.Fill).
func (e *engine) completeDerivatives() {
	missing := false
	for g, members := range e.groups {
		need := e.w[g] > 0 && !e.static[g] && e.cols.valuesOnly[members[0]]
		missing = missing || need
		for _, k := range members {
			e.cols.Skip[k] = !need
			e.cols.valuesOnly[k] = false
		}
	}
	if missing {
		e.p.Data.Fill(e.model, &e.cols, true)
	}
}

// markKept fills e.keep for the evaluation about to run (see keep) and
// invalidates the previous state until this evaluation completes.
func (e *engine) markKept(derivs bool) {
	same := e.prevOK && !derivs && len(e.prevFam) == len(e.model.Families)
	for g, members := range e.groups {
		k := e.staticDone && e.static[g]
		if !k && same && e.staticDone && !e.shaped[g] {
			k = true
			for _, t := range members {
				if f := e.model.Terms[t].Family; f >= 0 && e.familyMoved(f) {
					k = false
				}
			}
		}
		if !k && derivs && e.staticDone && e.isoShaped[g] && e.filledOK[g] {
			e.paramBuf = e.groupParams(g, e.paramBuf[:0])
			k = slices.EqualFunc(e.filledWith[g], e.paramBuf, func(a, b float64) bool {
				return math.Float64bits(a) == math.Float64bits(b)
			})
		}
		e.keep[g] = k
	}
	e.prevOK = false
	for g, k := range e.keep {
		if !k {
			// Refilled now; recorded again only once this evaluation
			// completes with its cross products (noteFilled).
			e.filledOK[g] = false
		}
	}
}

// groupParams appends the shape parameters of every term of group g to
// buf.
func (e *engine) groupParams(g int, buf []float64) []float64 {
	for _, k := range e.groups[g] {
		buf = append(buf, e.model.Terms[k].Params...)
	}
	return buf
}

// noteFilled records, once an evaluation has filled its columns and their
// cross products, the shape parameters each isotropic shaped group was
// filled with (see filledWith).
func (e *engine) noteFilled(derivs bool) {
	for g, iso := range e.isoShaped {
		if !iso || e.keep[g] {
			continue
		}
		e.filledOK[g] = derivs
		if derivs {
			e.filledWith[g] = e.groupParams(g, e.filledWith[g][:0])
		}
	}
}

// familyMoved reports whether family f differs from the last complete
// evaluation's.
func (e *engine) familyMoved(f int) bool {
	a, b := &e.model.Families[f], &e.prevFam[f]
	return a.Angle != b.Angle || a.Concentration != b.Concentration || a.Dispersion != b.Dispersion || a.Planar != b.Planar
}

// derivatives fills e.v[i] = Σ_g w_g ∂A_g/∂θ_i.
func (e *engine) derivatives() {
	rows := e.rows
	for i, q := range e.params {
		v := e.v[i]
		clear(v)
		for g, members := range e.groups {
			w := e.w[g]
			if w == 0 {
				continue
			}
			for _, k := range members {
				t := &e.model.Terms[k]
				var src []float64
				c := 1.0
				switch q.Kind {
				case kindAngle:
					if t.Family < 0 {
						continue
					}
					c = angleCoef(e.layout, q.Angle, e.famOf[t.Family])
					src = e.cols.DAngle
				case kindKappa, kindConcentration:
					// Both spreads' derivatives live in DKappa: a family has
					// one or the other.
					if t.Family < 0 || !containsInt(q.Families, e.famOf[t.Family]) {
						continue
					}
					src = e.cols.DKappa
				case kindShape:
					if g != q.Group {
						continue
					}
					src = e.cols.DParam[q.Index]
				}
				if c == 0 {
					continue
				}
				d := src[k*rows : (k+1)*rows]
				for r := range v {
					v[r] += c * w * d[r]
				}
			}
		}
	}
}

func containsInt(s []int, x int) bool {
	for _, v := range s {
		if v == x {
			return true
		}
	}
	return false
}

// activeGroups returns the design groups with a positive weight.
func (e *engine) activeGroups() []int {
	var act []int
	for g, w := range e.w {
		if w > 0 {
			act = append(act, g)
		}
	}
	return act
}
