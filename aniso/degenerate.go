package aniso

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/weft-tools/weft/biaxial"
)

// Thresholds of the degeneracy test (Result.Degenerate). They are relative
// to the data's own stress scale, so they do not depend on the stress unit.
const (
	// SliverContribution is the share of a protocol-axis's measured stress
	// range (max − min) above which a term's contribution at a point counts
	// as felt there: 1 %.
	SliverContribution = 0.01
	// SliverPoints is the share of a protocol's points on which a term must
	// be felt, on at least one protocol and loading axis, to be supported
	// by the data: 10 %.
	SliverPoints = 0.10
	// MaxWeightRatio bounds a term's weight by this multiple of the largest
	// measured stress magnitude: 10⁴. A stiffer term would carry the
	// largest stress at strains of 10⁻⁴, which no tested tissue shows.
	MaxWeightRatio = 1e4
	// MinWeightRatio is the share of the largest active weight below which
	// a weight is negligible: 10⁻⁹ (rounding, not stiffness).
	MinWeightRatio = 1e-9
)

// Reasons a term is degenerate (Degeneracy.Reasons).
const (
	// DegenerateSliver: the term is felt on too few points (see
	// SliverContribution and SliverPoints).
	DegenerateSliver = "sliver"
	// DegenerateHugeWeight: the weight exceeds MaxWeightRatio × the largest
	// measured stress.
	DegenerateHugeWeight = "huge-weight"
	// DegenerateNegligibleWeight: the weight is below MinWeightRatio × the
	// largest active weight.
	DegenerateNegligibleWeight = "negligible-weight"
)

// Degeneracy says why an active term of a fitted form is not supported by
// the data.
type Degeneracy struct {
	// Term indexes Structure.Terms.
	Term int
	// Reasons are DegenerateSliver, DegenerateHugeWeight and
	// DegenerateNegligibleWeight, in that order, as they apply.
	Reasons []string
	// Detail states the numbers behind the reasons.
	Detail string
}

// Degenerate returns the active terms of r that the data in p do not
// support (p is normally the problem r was fitted to): a term whose
// contribution exceeds SliverContribution of a protocol-axis's measured
// stress range on fewer than SliverPoints of that protocol's points on
// every protocol and loading axis (it engages on a sliver of the data, or
// nowhere); a weight above MaxWeightRatio × the largest measured stress
// magnitude; or a weight below MinWeightRatio × the largest active weight.
// Terms are listed in Structure order; nil when every term is supported.
func (r *Result) Degenerate(p *Problem) []Degeneracy {
	maxW, maxStress := 0.0, 0.0
	for _, w := range r.Weights {
		maxW = math.Max(maxW, w)
	}
	for _, y := range p.Measured {
		maxStress = math.Max(maxStress, math.Abs(y))
	}
	felt := r.feltShare(p)
	var out []Degeneracy
	for g, w := range r.Weights {
		if !(w > 0) {
			continue
		}
		var reasons, details []string
		if w < MinWeightRatio*maxW {
			reasons = append(reasons, DegenerateNegligibleWeight)
			details = append(details, fmt.Sprintf("its weight %.3g is below %.0e of the largest weight %.3g", w, MinWeightRatio, maxW))
		}
		if maxStress > 0 && w > MaxWeightRatio*maxStress {
			reasons = append(reasons, DegenerateHugeWeight)
			details = append(details, fmt.Sprintf("its weight %.3g %s exceeds %.0e × the largest measured stress %.3g %s", w, p.Specimen.StressUnit, MaxWeightRatio, maxStress, p.Specimen.StressUnit))
		}
		if f := felt[g]; f.axes > 0 && f.share < SliverPoints {
			reasons = append(reasons, DegenerateSliver)
			details = append(details, fmt.Sprintf("its contribution exceeds %.0f %% of the stress range on at most %.0f %% of a protocol's points (%s), fewer than %.0f %%", 100*SliverContribution, 100*f.share, f.where, 100*SliverPoints))
		}
		if len(reasons) > 0 {
			out = append(out, Degeneracy{Term: g, Reasons: reasons, Detail: strings.Join(details, "; ")})
		}
	}
	return out
}

// felt is where a term is felt most: the largest share of a protocol's
// points on which its contribution exceeds SliverContribution of the
// protocol-axis's stress range, over the axes that have a range.
type felt struct {
	share float64
	where string
	axes  int
}

// feltShare computes felt for every term of r's structure on p's normal
// stress rows (the loading axes 11 and 22).
func (r *Result) feltShare(p *Problem) []felt {
	out := make([]felt, len(r.Structure.Terms))
	contrib, ok := r.groupContributions(p)
	if !ok {
		return out
	}
	type axis struct {
		pi   int
		comp Component
	}
	var axes []axis
	for _, pi := range p.Protocols {
		for _, comp := range p.Output.Components {
			if comp == 0 || comp == 1 { // the normal components 11 and 22
				axes = append(axes, axis{pi, comp})
			}
		}
	}
	// Where each group is felt most: the axis and its count, formatted at
	// the end.
	type most struct {
		ax, count int
		n         int // 0 until the group has an axis
	}
	best := make([]most, len(r.e.groups))
	var rows []int
	for ai, ax := range axes {
		lo, hi := math.Inf(1), math.Inf(-1)
		rows = rows[:0]
		for row := range p.Measured {
			if p.RowProtocol[row] == ax.pi && p.RowComponent[row] == ax.comp {
				lo, hi = math.Min(lo, p.Measured[row]), math.Max(hi, p.Measured[row])
				rows = append(rows, row)
			}
		}
		n := len(rows)
		rng := hi - lo
		if n == 0 || !(rng > 0) || math.IsInf(rng, 0) {
			continue
		}
		for g := range r.e.groups {
			count := 0
			for _, row := range rows {
				if math.Abs(contrib(g, row)) > SliverContribution*rng {
					count++
				}
			}
			f := &out[g]
			f.axes++
			if sh := float64(count) / float64(n); sh > f.share || best[g].n == 0 {
				f.share = sh
				best[g] = most{ax: ai, count: count, n: n}
			}
		}
	}
	for g, b := range best {
		if b.n > 0 {
			ax := axes[b.ax]
			out[g].where = fmt.Sprintf("most on protocol %s axis %s: %d of %d points", p.Specimen.Protocols[ax.pi].Label, biaxial.Component(ax.comp).String(), b.count, b.n)
		}
	}
	return out
}

// maxPruneRounds bounds how often discovery drops degenerate terms from one
// candidate and refits it.
const maxPruneRounds = 3

// withoutDegenerate drops the terms of r the data do not support
// (Degenerate) and refits the rest, warm-started from r, until none is
// left: such terms never reach a discovered card. It returns r itself when
// it has none, and nil when nothing would be left or a refit fails.
func withoutDegenerate(p *Problem, r *Result, set Settings) *Result {
	for round := 0; round < maxPruneRounds; round++ {
		deg := r.Degenerate(p)
		if len(deg) == 0 {
			return r
		}
		drop := map[int]bool{}
		for _, d := range deg {
			drop[d.Term] = true
		}
		st := r.Structure.withTerms(nil)
		for i, t := range r.Structure.Terms {
			if r.Weights[i] > 0 && !drop[i] {
				st.Terms = append(st.Terms, t)
			}
		}
		if len(st.Terms) == 0 || st.Validate() != nil {
			return nil
		}
		s := set
		s.Init, s.NoScan = r.Params(), true
		next, err := Fit(p, st, s)
		if err != nil {
			return nil
		}
		r = next
	}
	if len(r.Degenerate(p)) > 0 {
		return nil
	}
	return r
}

// groupContributions returns a function giving design group g's
// contribution to row `row` of p, unweighted, in the stress unit. When p is
// the problem r was fitted to, it reads the engine's weighted design
// columns at the optimum (re-evaluated there if the engine has moved);
// otherwise it fills the model's columns on p.
func (r *Result) groupContributions(p *Problem) (func(g, row int) float64, bool) {
	e := r.e
	if e != nil && e.p == p {
		if !slices.Equal(e.at, r.theta) {
			e.eval(r.theta, false)
		}
		rows := e.rows
		return func(g, row int) float64 {
			rw := p.Data.rowWeight[row] // canonical: e.w is in units of p.Scale
			if rw == 0 {
				return 0
			}
			return mul0(e.w[g], e.A[g*rows+row]) / rw * p.Scale
		}, true
	}
	c, err := unweightedColumns(p, r.Model)
	if err != nil {
		return nil, false
	}
	return func(g, row int) float64 {
		s := 0.0
		for _, k := range r.e.groups[g] {
			s += mul0(r.Model.Terms[k].Weight, c.A[k*c.Rows+row])
		}
		return s
	}, true
}
