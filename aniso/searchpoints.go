package aniso

import (
	"math"

	"github.com/weft-tools/weft/biaxial"
)

// Discovery searches, cross-validates and selects on a representative
// subset of each protocol's points, so that its cost does not grow with the
// tester's sampling rate; the chosen model is then refitted on every point.
// A protocol with more than DiscoverSettings.SearchPoints points keeps that
// many, evenly spaced in its driving stretch (the axis it moves most along),
// ends included, so that the curve's toe and its steep part are both kept;
// the protocol's residual weights are scaled by √(points/kept) so that it
// keeps its share of the loss.

// DefaultSearchPoints is the default number of points per protocol that
// discovery's search uses.
const DefaultSearchPoints = 60

// searchSubset returns the problem discovery searches on: p itself when no
// protocol has more than max points, else a problem on a thinned copy of
// its specimen.
func searchSubset(p *Problem, max int) (*Problem, error) {
	s := p.Specimen
	thin := false
	for _, pi := range p.Protocols {
		if len(s.Protocols[pi].Points) > max {
			thin = true
		}
	}
	if !thin {
		return p, nil
	}
	c := *s
	c.Protocols = append([]biaxial.Protocol(nil), s.Protocols...)
	for _, pi := range p.Protocols {
		pr := &c.Protocols[pi]
		n := len(pr.Points)
		if n <= max {
			continue
		}
		keep := evenInDrivingStretch(pr.Points, max)
		pts := make([]biaxial.Point, len(keep))
		for i, k := range keep {
			pts[i] = pr.Points[k]
		}
		pr.Points = pts
		scale := math.Sqrt(float64(n) / float64(len(keep)))
		for k := range pr.Weight {
			pr.Weight[k] *= scale
		}
	}
	return NewProblem(&c, p.Protocols)
}

// evenInDrivingStretch returns the indices of up to m points spaced evenly
// in the stretch of the axis with the larger range (first and last point
// always kept), in their original order.
func evenInDrivingStretch(pts []biaxial.Point, m int) []int {
	axis := 0
	lo, hi := [2]float64{math.Inf(1), math.Inf(1)}, [2]float64{math.Inf(-1), math.Inf(-1)}
	for _, pt := range pts {
		for a, v := range [2]float64{pt.F[0], pt.F[3]} {
			lo[a], hi[a] = math.Min(lo[a], v), math.Max(hi[a], v)
		}
	}
	if hi[1]-lo[1] > hi[0]-lo[0] {
		axis = 1
	}
	drive := func(i int) float64 {
		if axis == 0 {
			return pts[i].F[0]
		}
		return pts[i].F[3]
	}
	taken := make([]bool, len(pts))
	taken[0], taken[len(pts)-1] = true, true
	a, b := drive(0), drive(len(pts)-1)
	for k := 1; k < m-1; k++ {
		target := a + (b-a)*float64(k)/float64(m-1)
		best, bd := -1, math.Inf(1)
		for i := range pts {
			if d := math.Abs(drive(i) - target); !taken[i] && d < bd {
				best, bd = i, d
			}
		}
		if best >= 0 {
			taken[best] = true
		}
	}
	var out []int
	for i, t := range taken {
		if t {
			out = append(out, i)
		}
	}
	return out
}
