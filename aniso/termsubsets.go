package aniso

// The term-subset search of discovery's second stage (refits.go): which
// subsets of a full fit's terms to refit, ranked by non-negative least
// squares on the full fit's columns at its angles and shape parameters.

import (
	"fmt"
	"math"
	"sort"

	"github.com/weft-tools/weft/terms"
)

// fullStructure has every candidate shape of a form: isotropic ones once
// and fibre ones on each family of the layout (fibre-stretch shapes only on
// in-plane dispersed families).
func fullStructure(shapes []*terms.Shape, f Structure) Structure {
	st := f.withTerms(nil)
	l := f.Layout
	for _, sh := range shapes {
		if !sh.Arg.NeedsFamily() {
			st.Terms = append(st.Terms, TermSpec{Shape: sh, Family: -1})
		}
	}
	nf := l.Families()
	if l == LayoutMirror {
		nf = 1
	}
	for f := 0; f < nf; f++ {
		for _, sh := range shapes {
			if sh.Arg.NeedsFamily() && (!st.Planar || sh.Arg == terms.Fibre) {
				st.Terms = append(st.Terms, TermSpec{Shape: sh, Family: f})
			}
		}
	}
	return st
}

// subset is a set of design terms of a full structure with its fixed-angle
// loss.
type subset struct {
	terms []int
	loss  float64
}

// maxAnchors is how many local optima of the full candidate fit anchor the
// subset search; forwardBranch how many single-term additions are refitted
// per forward step, spreadForwardBranch how many for a family spread in
// the plane, whose fits cost an angular integration per point (its subset
// refits are cut the same way: one anchor, the best subset of each size).
const (
	maxAnchors          = 2
	forwardBranch       = 3
	spreadForwardBranch = 1
)

// paramsAt names a full fit's non-linear parameters at θ.
func paramsAt(full *Result, theta []float64) map[string]float64 {
	out := map[string]float64{}
	for i, q := range full.e.params {
		out[q.Name] = theta[i]
	}
	return out
}

// rankAdditions returns the indices (into the full structure) of the n
// terms not in base whose addition to base lowers the non-negative least
// squares loss most, with the columns evaluated at the named parameters.
func rankAdditions(full *Result, params map[string]float64, base Structure, n int) []int {
	e := full.e
	theta := append([]float64(nil), full.theta...)
	for i, q := range e.params {
		if v, ok := params[q.Name]; ok {
			theta[i] = v
		}
	}
	e.eval(theta, false)
	var baseIdx []int
	for g, t := range full.Structure.Terms {
		if hasTerm(base, t) {
			baseIdx = append(baseIdx, g)
		}
	}
	yy := sumSquares(e.p.Target)
	type cand struct {
		g    int
		loss float64
	}
	var cs []cand
	var q nnls
	m := len(baseIdx) + 1
	G := make([]float64, m*m)
	b := make([]float64, m)
	for g := range full.Structure.Terms {
		if containsInt(baseIdx, g) {
			continue
		}
		set := append(append([]int(nil), baseIdx...), g)
		if l := nnlsSubsetLoss(e, set, yy, &q, G, b); !math.IsInf(l, 1) {
			cs = append(cs, cand{g, l})
		}
	}
	sort.SliceStable(cs, func(a, b int) bool { return cs[a].loss < cs[b].loss })
	var out []int
	for i := 0; i < len(cs) && i < n; i++ {
		out = append(out, cs[i].g)
	}
	return out
}

// hasShapeParams reports whether group g of a full fit has shape
// parameters to profile (profileShapes).
func hasShapeParams(full *Result, g int) bool {
	for _, q := range full.e.params {
		if q.Kind == kindShape && q.Group == g {
			return true
		}
	}
	return false
}

// idleProfiled returns theta with the shape parameters of every group the
// full fit gives no weight at theta set where that term alone fits the
// data best (profileShapes): at theta they are wherever the loss, which
// does not depend on them, left them. A form with spread families is left
// as it is.
func idleProfiled(full *Result, theta []float64) []float64 {
	return ownProfiled(full, theta, true)
}

// ownProfiled returns theta with the shape parameters of each group (only
// the groups the full fit gives no weight at theta when idleOnly) set
// where that term alone fits the data best, with the angles at theta
// (profileShapes). A form with spread families is returned as it is:
// every evaluation refills their columns, an angular integration per
// point each.
func ownProfiled(full *Result, theta []float64, idleOnly bool) []float64 {
	if full.Structure.Planar {
		return theta
	}
	e := full.e
	e.eval(theta, false)
	var which []int
	for g := range e.groups {
		if (!idleOnly || e.w[g] == 0) && hasShapeParams(full, g) {
			which = append(which, g)
		}
	}
	if len(which) == 0 {
		return theta
	}
	yy := sumSquares(e.p.Target)
	var q nnls
	G, b := make([]float64, 1), make([]float64, 1)
	th := theta
	for _, g := range which {
		th, _ = profileShapes(e, th, g, func() float64 { return nnlsSubsetLoss(e, []int{g}, yy, &q, G, b) })
	}
	return th
}

// nnlsSubsetLoss returns the non-negative least-squares loss of the groups
// in set from the engine's cross products (G and b are buffers of at least
// len(set)² and len(set)); +Inf when a column is unusable.
func nnlsSubsetLoss(e *engine, set []int, yy float64, q *nnls, G, b []float64) float64 {
	m := len(set)
	for a, i := range set {
		if !e.allowed[i] {
			return math.Inf(1)
		}
		b[a] = e.b[i]
		for c, j := range set {
			G[a*m+c] = e.G[i*e.ng+j]
		}
	}
	w := q.solve(G[:m*m], b[:m], m, nil)
	l := yy
	for a := 0; a < m; a++ {
		l -= 2 * w[a] * b[a]
		for c := 0; c < m; c++ {
			l += w[a] * G[a*m+c] * w[c]
		}
	}
	return l
}

// sumSquares returns Σ y².
func sumSquares(y []float64) float64 {
	s := 0.0
	for _, v := range y {
		s += v * v
	}
	return s
}

// searchSubsets finds, for every size k = 1…K, the best `keep` subsets of
// the full fit's design terms at its angles and shape parameters, using
// non-negative least squares on the cross products. Subsets must keep a
// fibre term in every family of the layout, and every weight of a kept
// subset must be positive (otherwise it is a smaller subset). Losses equal
// within TieTolerance keep the enumeration's order, which is catalogue
// order.
func searchSubsets(full *Result, theta []float64, K, keep, limit int) ([][]subset, string) {
	e := full.e
	e.eval(theta, false)
	ss := &subsetSearch{e: e, K: K, keep: keep, n: e.ng, best: make([][]subset, K+1),
		subG: make([]float64, K*K), subB: make([]float64, K)}
	ss.fams = full.Structure.Layout.Families()
	if full.Structure.Layout == LayoutMirror {
		ss.fams = 1
	}
	ss.familyOf = make([]int, ss.n)
	for g, t := range full.Structure.Terms {
		ss.familyOf[g] = t.Family
	}
	for _, y := range e.p.Target {
		ss.yy += y * y
	}
	total := 0
	for k := 1; k <= K && k <= ss.n; k++ {
		total += binomial(ss.n, k)
	}
	if total <= limit {
		count := ss.exhaustive()
		return ss.best[1:], fmt.Sprintf("exhaustive search of %d term subsets of %d candidates (sizes 1–%d)", count, ss.n, K)
	}
	evals := ss.forward()
	return ss.best[1:], fmt.Sprintf("forward selection with swaps over %d candidates (%d subsets evaluated; %d would be needed exhaustively)", ss.n, evals, total)
}

// subsetSearch holds the cross products of a full fit and the best subsets
// found so far.
type subsetSearch struct {
	e          *engine
	K, keep, n int
	fams       int
	familyOf   []int
	yy         float64
	q          nnls
	subG, subB []float64
	best       [][]subset
}

// lossOf returns the non-negative least-squares loss of a subset; ok is
// false when a column is unusable or a weight is not positive.
func (ss *subsetSearch) lossOf(set []int) (float64, bool) {
	e, m := ss.e, len(set)
	for a, i := range set {
		if !e.allowed[i] {
			return math.Inf(1), false
		}
		ss.subB[a] = e.b[i]
		for b, j := range set {
			ss.subG[a*m+b] = e.G[i*ss.n+j]
		}
	}
	w := ss.q.solve(ss.subG[:m*m], ss.subB[:m], m, nil)
	l := ss.yy
	for a := 0; a < m; a++ {
		if w[a] <= 0 {
			return 0, false
		}
		l -= 2 * w[a] * ss.subB[a]
		for b := 0; b < m; b++ {
			l += w[a] * ss.subG[a*m+b] * w[b]
		}
	}
	return math.Max(l, 0), true
}

// valid reports whether every family of the layout keeps a term.
func (ss *subsetSearch) valid(set []int) bool {
	for f := 0; f < ss.fams; f++ {
		ok := false
		for _, i := range set {
			if ss.familyOf[i] == f {
				ok = true
			}
		}
		if !ok {
			return false
		}
	}
	return true
}

// consider keeps set among the best of its size.
func (ss *subsetSearch) consider(set []int, l float64) {
	k := len(set)
	lst := ss.best[k]
	if len(lst) == ss.keep && !less(l, lst[len(lst)-1].loss) {
		return
	}
	lst = append(lst, subset{terms: append([]int(nil), set...), loss: l})
	sort.SliceStable(lst, func(a, b int) bool { return less(lst[a].loss, lst[b].loss) })
	if len(lst) > ss.keep {
		lst = lst[:ss.keep]
	}
	ss.best[k] = lst
}

// exhaustive visits every subset of up to K terms and returns how many
// valid ones it scored.
func (ss *subsetSearch) exhaustive() int {
	count := 0
	set := make([]int, 0, ss.K)
	var rec func(from int)
	rec = func(from int) {
		if len(set) > 0 && ss.valid(set) {
			count++
			if l, ok := ss.lossOf(set); ok {
				ss.consider(set, l)
			}
		}
		if len(set) == ss.K {
			return
		}
		for i := from; i < ss.n; i++ {
			set = append(set, i)
			rec(i + 1)
			set = set[:len(set)-1]
		}
	}
	rec(0)
	return count
}

// forward grows the best set of size k−1 by the best addition, then swaps
// members for non-members while the loss falls; it returns how many
// subsets it scored.
func (ss *subsetSearch) forward() int {
	cur := []int{}
	evals := 0
	for k := 1; k <= ss.K && k <= ss.n; k++ {
		bestL, bestSet := ss.bestAddition(cur, true, &evals)
		if bestSet == nil {
			// No valid growth alone (families need terms): add the term
			// with the best loss regardless of validity and continue.
			_, bestSet = ss.bestAddition(cur, false, &evals)
			if bestSet == nil {
				break
			}
			cur = bestSet
			continue
		}
		for improved := true; improved; {
			improved = false
			for a := range bestSet {
				for i := 0; i < ss.n; i++ {
					if containsInt(bestSet, i) {
						continue
					}
					s := append([]int(nil), bestSet...)
					s[a] = i
					evals++
					if l, ok := ss.lossOf(s); ok && ss.valid(s) && l < bestL*(1-1e-12) {
						bestL, bestSet, improved = l, s, true
					}
				}
			}
		}
		ss.consider(bestSet, bestL)
		cur = bestSet
	}
	return evals
}

// bestAddition returns cur plus the term that lowers the loss most (only
// valid subsets when mustBeValid), or nil.
func (ss *subsetSearch) bestAddition(cur []int, mustBeValid bool, evals *int) (float64, []int) {
	bestL, bestSet := math.Inf(1), []int(nil)
	for i := 0; i < ss.n; i++ {
		if containsInt(cur, i) {
			continue
		}
		s := append(append([]int(nil), cur...), i)
		*evals++
		if l, ok := ss.lossOf(s); ok && (!mustBeValid || ss.valid(s)) && l < bestL {
			bestL, bestSet = l, s
		}
	}
	return bestL, bestSet
}

func binomial(n, k int) int {
	if k < 0 || k > n {
		return 0
	}
	r := 1
	for i := 1; i <= k; i++ {
		r = r * (n - k + i) / i
	}
	return r
}
