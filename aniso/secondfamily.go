package aniso

// Discovery's fourth stage (see Discover): the best one-family models
// refitted with a second free family of the same kind, and grown by one
// term; and, after the spread variants, refitted as a mirror pair.

import (
	"fmt"
	"sort"
)

// secondFamilyRefits asks of every best one-family model whether a second
// family of the same kind fits better: for the best refit of each size of
// the ideal one-family form, it refits the free two-family form with the
// same isotropic terms and a copy of each fibre term on the second family,
// and the same again with each isotropic term left out in turn (a second
// family can carry stiffening the one-family model had to give to the
// matrix). Both angles are scanned, the first also started where the
// one-family model has it. The best of these refits of each size is then
// grown by each of the forwardBranch terms that lower its loss most, as
// the forward steps grow the others (the matrix the two families need
// may not be the one-family model's).
//
// The term-subset search ranks subsets at the full fit's optima, where a
// two-family model's families may both sit near one direction; the
// refits from there can miss the plain two-family form that the
// in-sample rule (inSampleDisagreement) needs to see. On the twelve
// two-family specimens without shear information of the verdict panel,
// weighted as a file is, this stage turned both confident one-family
// verdicts into undecided (0°/60° seed 1: ΔBIC 4.5 → 11.1; 10°/70° seed
// 1: 0.6 → 8.9, where it found the true form near the true angles) and
// left the 36 one-family specimens of the same conditions unchanged
// (README, How (our design)).
func (s *search) secondFamilyRefits() {
	single, free := s.formsOf(false, LayoutFree)
	if single < 0 || free < 0 || s.fullErr[single] != nil || s.fullErr[free] != nil {
		return
	}
	bm := s.bestBySize()
	var sizes []int
	for k := range bm {
		if k.form == single {
			sizes = append(sizes, k.size)
		}
	}
	sort.Ints(sizes)
	var round []*refit
	for _, n := range sizes {
		round = append(round, s.secondFamilyOf(bm[sizeKey{single, n}], free)...)
	}
	if len(round) == 0 {
		return
	}
	s.runRefits(round)
	grown := s.growBest(round, free)
	s.runRefits(grown)
	s.d.Search = append(s.d.Search, fmt.Sprintf("%s: %d refits of the best %s model of each size with a second family carrying copies of its fibre terms (and with each isotropic term left out in turn), both angles scanned, and %d of the best of them grown by one term", formName(s.forms[free]), len(round), formName(s.forms[single]), len(grown)))
}

// secondFamilyOf returns the refits of one-family model res in form free
// (the free two-family layout): its terms with a copy of each fibre term
// on the second family, and the same with each isotropic term left out
// in turn; none larger than the search's K.
func (s *search) secondFamilyOf(res *Result, free int) []*refit {
	var iso, fib []TermSpec
	for _, t := range activeStructure(res).Terms {
		if t.Family < 0 {
			iso = append(iso, t)
		} else {
			fib = append(fib, t)
		}
	}
	// The one-family model's parameters carry over by name: its fibre
	// terms are labelled on f1 in both layouts.
	init := map[string]float64{}
	for name, v := range res.Params() {
		if name == "angle" {
			name = "angle_1"
		}
		init[name] = v
	}
	var out []*refit
	add := func(iso []TermSpec) {
		st := s.forms[free].withTerms(append([]TermSpec(nil), iso...))
		st.Terms = append(st.Terms, fib...)
		for _, t := range fib {
			st.Terms = append(st.Terms, TermSpec{Shape: t.Shape, Family: 1})
		}
		if len(st.Terms) <= s.set.MaxTerms {
			out = append(out, &refit{form: free, st: st, init: init, scan: true})
		}
	}
	add(iso)
	for j := range iso {
		add(append(append([]TermSpec(nil), iso[:j]...), iso[j+1:]...))
	}
	return out
}

// growBest returns, for the best of rs at each number of active terms
// below the search's K (both families keeping a fibre term), the refits
// that grow it as a forward step does (additions).
func (s *search) growBest(rs []*refit, free int) []*refit {
	best := map[int]*Result{}
	var sizes []int
	for _, rf := range rs {
		if rf.res == nil || !layoutSatisfied(rf.res) {
			continue
		}
		n := activeTerms(rf.res)
		if n == 0 || n >= s.set.MaxTerms {
			continue
		}
		old, ok := best[n]
		if !ok {
			sizes = append(sizes, n)
		}
		if !ok || rf.res.Loss < old.Loss {
			best[n] = rf.res
		}
	}
	sort.Ints(sizes)
	var out []*refit
	for _, n := range sizes {
		out = append(out, s.additions(free, best[n], forwardBranch)...)
	}
	return out
}

// mirrorRefits refits the best model of each size of the ideal one-family
// form as a mirror pair with the same terms (its fibre terms shared by
// both families): the one-family model with one angle more, the pair's
// mean direction started at the family's and both angles scanned, so that
// the pair a one-family answer must be weighed against (architectureTie)
// is fitted with the terms that answer found. The mirror form's term
// subsets are ranked where its full fit put the pair, and there both
// families can sit on one direction: on two families spread about ±40°
// on an Ogden α = 20 matrix, sutured (independent numerical integration),
// every mirror model from two terms up had both at 0°, and the verdict was
// a confident 1 at 0°; refitted with the one-family answer's five terms,
// the pair lands at ±32.5°, ΔBIC 6.5 above one family with a held-out
// error 0.3 % lower, which ties (TestMirrorRefitsFindThePair). It runs
// after the spread variants, which it leaves as they were: run before
// them, the new mirror models seeded other spread pairs and displaced a
// spread pair at ±38° that ties with one family under tracking noise
// (TestBetterPredictingRivalTies).
func (s *search) mirrorRefits() {
	single, mirror := s.formsOf(false, LayoutMirror)
	if single < 0 || mirror < 0 || s.fullErr[single] != nil || s.fullErr[mirror] != nil {
		return
	}
	bm := s.bestBySize()
	var round []*refit
	for size := 1; size <= s.set.MaxTerms; size++ {
		res, ok := bm[sizeKey{single, size}]
		if !ok {
			continue
		}
		init := map[string]float64{}
		for name, v := range res.Params() {
			if name == "angle" {
				name = "mean_angle"
			}
			init[name] = v
		}
		st := s.forms[mirror].withTerms(append([]TermSpec(nil), activeStructure(res).Terms...))
		round = append(round, &refit{form: mirror, st: st, init: init, scan: true})
	}
	s.runRefits(round)
	s.d.Search = append(s.d.Search, fmt.Sprintf("%s: %d refits of the best %s model of each size as a mirror pair with the same terms, both angles scanned", formName(s.forms[mirror]), len(round), formName(s.forms[single])))
}

// formsOf returns the indices in s.forms of the one-family form and of the
// form of layout other, each spread in the plane (planar) or ideal (not
// planar) and without a κ dispersion; −1 where the search has none.
func (s *search) formsOf(planar bool, other Layout) (single, second int) {
	single, second = -1, -1
	for i, f := range s.forms {
		if f.Planar != planar || f.Dispersion {
			continue
		}
		switch f.Layout {
		case LayoutSingle:
			single = i
		case other:
			second = i
		}
	}
	return single, second
}
