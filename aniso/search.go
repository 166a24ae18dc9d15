package aniso

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
// per forward step.
const (
	maxAnchors    = 2
	forwardBranch = 3
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
	yy := 0.0
	for _, y := range e.p.Target {
		yy += y * y
	}
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
		if containsInt(baseIdx, g) || !e.allowed[g] {
			continue
		}
		set := append(append([]int(nil), baseIdx...), g)
		ok := true
		for a, i := range set {
			if !e.allowed[i] {
				ok = false
			}
			b[a] = e.b[i]
			for c, j := range set {
				G[a*m+c] = e.G[i*e.ng+j]
			}
		}
		if !ok {
			continue
		}
		w := q.solve(G, b, m, nil)
		l := yy
		for a := 0; a < m; a++ {
			l -= 2 * w[a] * b[a]
			for c := 0; c < m; c++ {
				l += w[a] * G[a*m+c] * w[c]
			}
		}
		cs = append(cs, cand{g, l})
	}
	sort.SliceStable(cs, func(a, b int) bool { return cs[a].loss < cs[b].loss })
	var out []int
	for i := 0; i < len(cs) && i < n; i++ {
		out = append(out, cs[i].g)
	}
	return out
}

// searchSubsets finds, for every size k = 1…K, the best `keep` subsets of
// the full fit's design terms at its angles and shape parameters, using
// non-negative least squares on the cross products. Subsets must keep a
// fibre term in every family of the layout, and every weight of a kept
// subset must be positive (otherwise it is a smaller subset).
func searchSubsets(full *Result, theta []float64, K, keep, limit int) ([][]subset, string) {
	e := full.e
	e.eval(theta, false)
	n := e.ng
	fams := full.Structure.Layout.Families()
	if full.Structure.Layout == LayoutMirror {
		fams = 1
	}
	familyOf := make([]int, n)
	for g, t := range full.Structure.Terms {
		familyOf[g] = t.Family
	}
	yy := 0.0
	for _, y := range e.p.Target {
		yy += y * y
	}
	var q nnls
	subG := make([]float64, K*K)
	subB := make([]float64, K)
	lossOf := func(set []int) (float64, bool) {
		m := len(set)
		for a, i := range set {
			if !e.allowed[i] {
				return math.Inf(1), false
			}
			subB[a] = e.b[i]
			for b, j := range set {
				subG[a*m+b] = e.G[i*n+j]
			}
		}
		w := q.solve(subG[:m*m], subB[:m], m, nil)
		l := yy
		for a := 0; a < m; a++ {
			if w[a] <= 0 {
				return 0, false
			}
			l -= 2 * w[a] * subB[a]
			for b := 0; b < m; b++ {
				l += w[a] * subG[a*m+b] * w[b]
			}
		}
		return math.Max(l, 0), true
	}
	valid := func(set []int) bool {
		for f := 0; f < fams; f++ {
			ok := false
			for _, i := range set {
				if familyOf[i] == f {
					ok = true
				}
			}
			if !ok {
				return false
			}
		}
		return true
	}
	best := make([][]subset, K+1)
	consider := func(set []int, l float64) {
		k := len(set)
		lst := best[k]
		if len(lst) == keep && l >= lst[len(lst)-1].loss {
			return
		}
		lst = append(lst, subset{terms: append([]int(nil), set...), loss: l})
		sort.SliceStable(lst, func(a, b int) bool { return lst[a].loss < lst[b].loss })
		if len(lst) > keep {
			lst = lst[:keep]
		}
		best[k] = lst
	}
	total := 0
	for k := 1; k <= K && k <= n; k++ {
		total += binomial(n, k)
	}
	how := ""
	if total <= limit {
		count := 0
		set := make([]int, 0, K)
		var rec func(from int)
		rec = func(from int) {
			if len(set) > 0 && valid(set) {
				count++
				if l, ok := lossOf(set); ok {
					consider(set, l)
				}
			}
			if len(set) == K {
				return
			}
			for i := from; i < n; i++ {
				set = append(set, i)
				rec(i + 1)
				set = set[:len(set)-1]
			}
		}
		rec(0)
		how = fmt.Sprintf("exhaustive search of %d term subsets of %d candidates (sizes 1–%d)", count, n, K)
	} else {
		// Forward selection with swaps: grow the best set of size k−1 by
		// the best addition, then swap members for non-members while the
		// loss falls.
		cur := []int{}
		evals := 0
		for k := 1; k <= K && k <= n; k++ {
			bestL, bestSet := math.Inf(1), []int(nil)
			for i := 0; i < n; i++ {
				if containsInt(cur, i) {
					continue
				}
				s := append(append([]int(nil), cur...), i)
				evals++
				if l, ok := lossOf(s); ok && valid(s) && l < bestL {
					bestL, bestSet = l, s
				}
			}
			if bestSet == nil {
				// No valid growth alone (families need terms): add the term
				// with the best loss regardless of validity and continue.
				for i := 0; i < n; i++ {
					if !containsInt(cur, i) {
						s := append(append([]int(nil), cur...), i)
						if l, ok := lossOf(s); ok && l < bestL {
							bestL, bestSet = l, s
						}
					}
				}
				if bestSet == nil {
					break
				}
				cur = bestSet
				continue
			}
			for improved := true; improved; {
				improved = false
				for a := range bestSet {
					for i := 0; i < n; i++ {
						if containsInt(bestSet, i) {
							continue
						}
						s := append([]int(nil), bestSet...)
						s[a] = i
						evals++
						if l, ok := lossOf(s); ok && valid(s) && l < bestL*(1-1e-12) {
							bestL, bestSet, improved = l, s, true
						}
					}
				}
			}
			consider(bestSet, bestL)
			cur = bestSet
		}
		how = fmt.Sprintf("forward selection with swaps over %d candidates (%d subsets evaluated; %d would be needed exhaustively)", n, evals, total)
	}
	return best[1:], how
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
