package aniso

import "math"

// scanMemo remembers, during a coarse scan of two angles, each term's
// column and the cross products of one-term design groups by what
// determines them: the term (shape, parameters, its family's spread) and
// its family's angle, bit for bit. Such a scan meets the same family
// angles many times: two free families visit every pair of grid angles,
// and a mirror pair's θ ± β take a few dozen distinct values over the
// whole grid of θ and β (53 of 180 without shear, 79 of 360 with it).
// Served from the memo, a column and a product carry the bits a fill and
// a dot product would give, so the scan's result does not depend on the
// memo; only its cost does.
type scanMemo struct {
	// termClass[k] numbers model term k by its content up to its family's
	// angle, groupClass[g] design group g likewise.
	termClass, groupClass []int
	// At the current evaluation: each term's and group's signature, and
	// whether the memo holds the term's column.
	termSig  []memoSig
	groupSig []memoSig
	have     []bool
	cols     map[memoSig][]float64
	target   map[memoSig]float64
	cross    map[[2]memoSig]float64
	// bytes is what the stored columns hold; none is stored beyond
	// scanMemoBudget, so that a scan of a large problem stays in memory.
	bytes int
}

// memoSig is a term's or a one-term design group's class with its
// family's angle (bits; 0 for an isotropic term). A group of two terms, a
// mirror pair's, has class −1: its products are not remembered, since a
// pair's two angles rarely meet again.
type memoSig struct {
	class int
	angle uint64
}

// scanMemoBudget bounds the bytes of columns a scan memo stores.
const scanMemoBudget = 16 << 20

func newScanMemo(e *engine) *scanMemo {
	m := &scanMemo{termClass: make([]int, len(e.model.Terms)), groupClass: make([]int, e.ng),
		termSig: make([]memoSig, len(e.model.Terms)), groupSig: make([]memoSig, e.ng),
		have: make([]bool, len(e.model.Terms)),
		cols: map[memoSig][]float64{}, target: map[memoSig]float64{}, cross: map[[2]memoSig]float64{}}
	for k := range e.model.Terms {
		m.termClass[k] = k
		for h := 0; h < k; h++ {
			if e.sameTerm(h, k) {
				m.termClass[k] = m.termClass[h]
				break
			}
		}
	}
	for g, members := range e.groups {
		m.groupClass[g] = -1
		if len(members) == 1 {
			m.groupClass[g] = m.termClass[members[0]]
		}
	}
	return m
}

// sameTerm reports whether model terms h and k are the same up to their
// families' angles.
func (e *engine) sameTerm(h, k int) bool {
	s, t := &e.model.Terms[h], &e.model.Terms[k]
	if s.Shape != t.Shape || len(s.Params) != len(t.Params) || (s.Family < 0) != (t.Family < 0) {
		return false
	}
	for j := range s.Params {
		if math.Float64bits(s.Params[j]) != math.Float64bits(t.Params[j]) {
			return false
		}
	}
	if s.Family < 0 {
		return true
	}
	f, g := &e.model.Families[s.Family], &e.model.Families[t.Family]
	return f.Planar == g.Planar && f.Concentration == g.Concentration && f.Dispersion == g.Dispersion
}

// look sets every term's and group's signature at the model's current
// angles and which terms' columns the memo holds.
func (m *scanMemo) look(e *engine) {
	for k := range e.model.Terms {
		var bits uint64
		if f := e.model.Terms[k].Family; f >= 0 {
			bits = math.Float64bits(e.model.Families[f].Angle)
		}
		m.termSig[k] = memoSig{m.termClass[k], bits}
		_, m.have[k] = m.cols[m.termSig[k]]
	}
	for g, members := range e.groups {
		m.groupSig[g] = memoSig{m.groupClass[g], m.termSig[members[0]].angle}
	}
}

// column returns term k's column: the memo's, or the fill's in c, which
// it then stores.
func (m *scanMemo) column(k int, c *Columns, rows int) []float64 {
	if m.have[k] {
		return m.cols[m.termSig[k]]
	}
	a := c.A[k*rows : (k+1)*rows]
	if _, ok := m.cols[m.termSig[k]]; !ok && m.bytes+8*rows <= scanMemoBudget {
		m.bytes += 8 * rows
		m.cols[m.termSig[k]] = append([]float64(nil), a...)
		m.have[k] = true
	}
	return a
}

// product returns the stored scaled cross product of groups i and j
// (j = ng: the target), if there is one.
func (m *scanMemo) product(e *engine, i, j int) (float64, bool) {
	x := m.groupSig[i]
	if x.class < 0 {
		return 0, false
	}
	if j == e.ng {
		v, ok := m.target[x]
		return v, ok
	}
	y := m.groupSig[j]
	if y.class < 0 {
		return 0, false
	}
	v, ok := m.cross[[2]memoSig{x, y}]
	return v, ok
}

// store records the scaled cross product of groups i and j (j = ng: the
// target). Only products that a scan meets again are kept: with the
// target, with an isotropic group, or between groups at the same angle;
// those of two families at two different angles are met once.
func (m *scanMemo) store(e *engine, i, j int, v float64) {
	x := m.groupSig[i]
	if x.class < 0 {
		return
	}
	if j == e.ng {
		m.target[x] = v
		return
	}
	y := m.groupSig[j]
	if y.class >= 0 && (x.angle == y.angle || x.angle == 0 || y.angle == 0) {
		m.cross[[2]memoSig{x, y}] = v
	}
}
