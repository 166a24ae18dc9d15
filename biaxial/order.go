package biaxial

import (
	"math"
	"sort"
)

// Protocol order.
//
// A fit sums over every row of every protocol, and floating-point sums
// depend on their order; on a specimen whose candidate models tie to the
// last digits, the order in which a file lists its protocols could then
// decide which model is chosen. Prepare therefore lists a specimen's
// protocols in an order taken from their data alone, never from their
// labels or their place in the file, so that the same protocols written in
// any order, or relabelled, give the same specimen and the same fit.
//
// The order is the usual sequence of a stretch-ratio study (common
// practice): the most balanced protocol first (equibiaxial), then ever
// less balanced ones, each axis-1-dominated protocol before its axis-2
// mirror (1:1, 1:0.75, 0.75:1, 1:0.5, 0.5:1, …).
//
//   - An axis's peak is its Green strain (E11 or E22) of largest
//     magnitude, with its sign.
//   - Balance is the smaller axis peak over the larger (in magnitude),
//     rounded to 0.01 so that the scatter of measured stretches does not
//     split a protocol from its mirror. It is negative when the axes
//     strain in opposite senses (a uniaxial test with free edges counts as
//     unbalanced), and an unloading branch re-referenced at its peak is as
//     balanced as its loading.
//   - Ties are broken by the larger peak's magnitude (smaller first), the
//     peak in-plane shear strain |E12| (smaller first), the number of
//     points (fewer first), the points' deformations and stresses compared
//     number by number, and last the labels; protocols equal in all of
//     these keep their order.

// protocolKey is what a protocol is ordered by (see Protocol order).
type protocolKey struct {
	balance   float64 // the smaller axis peak over the larger, rounded to 0.01
	axis2     bool    // the peak E22 is larger than the peak E11
	peak      float64 // the magnitude of the larger axis peak
	peakShear float64 // the largest |E12|
}

func keyOf(pr *Protocol) protocolKey {
	var e11, e22, e12 float64
	for i := range pr.Points {
		F := &pr.Points[i].F
		// Green strain E = (FᵀF − 1)/2 of F = [[F11, F12], [F21, F22]];
		// the peak of each axis is its value of largest magnitude, signed.
		if e := 0.5 * (F[0]*F[0] + F[2]*F[2] - 1); math.Abs(e) > math.Abs(e11) {
			e11 = e
		}
		if e := 0.5 * (F[1]*F[1] + F[3]*F[3] - 1); math.Abs(e) > math.Abs(e22) {
			e22 = e
		}
		e12 = math.Max(e12, math.Abs(0.5*(F[0]*F[1]+F[2]*F[3])))
	}
	big, small := e11, e22
	k := protocolKey{axis2: math.Abs(e22) > math.Abs(e11), peakShear: e12}
	if k.axis2 {
		big, small = e22, e11
	}
	k.peak = math.Abs(big)
	if big != 0 {
		k.balance = math.Round(100*small/big) / 100
	}
	return k
}

// protocolBefore reports whether protocol a comes before b in the protocol
// order, given their keys.
func protocolBefore(a, b *Protocol, ka, kb protocolKey) bool {
	switch {
	case ka.balance != kb.balance:
		return ka.balance > kb.balance
	case ka.axis2 != kb.axis2:
		return !ka.axis2
	case ka.peak != kb.peak:
		return ka.peak < kb.peak
	case ka.peakShear != kb.peakShear:
		return ka.peakShear < kb.peakShear
	case len(a.Points) != len(b.Points):
		return len(a.Points) < len(b.Points)
	}
	for i := range a.Points {
		pa, pb := &a.Points[i], &b.Points[i]
		for j := range pa.F {
			if pa.F[j] != pb.F[j] {
				return pa.F[j] < pb.F[j]
			}
		}
		for j := range pa.Stress {
			if pa.Stress[j] != pb.Stress[j] {
				return pa.Stress[j] < pb.Stress[j]
			}
		}
	}
	return a.Label < b.Label
}

// SortProtocols puts the specimen's protocols in the protocol order
// (package documentation, Protocol order: the most balanced first, each
// axis-1-dominated protocol before its mirror), which depends on their
// data alone. Prepare calls it; a caller that builds a Specimen in
// code may call it so that the order of its protocols cannot change a fit.
func (s *Specimen) SortProtocols() {
	keys := make([]protocolKey, len(s.Protocols))
	idx := make([]int, len(s.Protocols))
	for i := range s.Protocols {
		keys[i] = keyOf(&s.Protocols[i])
		idx[i] = i
	}
	sort.SliceStable(idx, func(x, y int) bool {
		i, j := idx[x], idx[y]
		return protocolBefore(&s.Protocols[i], &s.Protocols[j], keys[i], keys[j])
	})
	sorted := make([]Protocol, len(s.Protocols))
	for k, i := range idx {
		sorted[k] = s.Protocols[i]
	}
	copy(s.Protocols, sorted)
}
