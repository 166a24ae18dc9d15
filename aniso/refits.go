package aniso

// Discovery's second and third stages (see Discover): the term subsets of
// each form searched at its full fit's optima (termsubsets.go) and the best
// of each size refitted, then grown one term at a time.

import "fmt"

// refitSubsets searches the term subsets of every form at up to
// maxAnchors local optima of its full fit (so that one poor optimum of the
// whole catalogue does not decide which subsets are tried) and refits the
// best of each size with their own angles and shape parameters.
func (s *search) refitSubsets() {
	// The forms' searches run side by side (each on its own full fit's
	// engine); their refits and notes are gathered in form order.
	rounds := make([][]*refit, len(s.forms))
	notes := make([]string, len(s.forms))
	var jobs []func()
	var cost []float64
	for i, f := range s.forms {
		if _, ok := s.variantOf[i]; ok {
			continue
		}
		if s.fullErr[i] != nil {
			notes[i] = fmt.Sprintf("%s: the full candidate fit failed (%v)", formName(f), s.fullErr[i])
			continue
		}
		jobs = append(jobs, func() { rounds[i], notes[i] = s.subsetRound(i) })
		cost = append(cost, float64(len(s.full[i].Structure.Terms)))
	}
	s.pl.runDearFirst(jobs, cost)
	var round []*refit
	for i := range s.forms {
		if notes[i] != "" {
			s.d.Search = append(s.d.Search, notes[i])
		}
		round = append(round, rounds[i]...)
	}
	s.runRefits(round)
}

// subsetRound searches the term subsets of form i at its anchors and
// returns the refits to run and the search note.
func (s *search) subsetRound(i int) ([]*refit, string) {
	f, full := s.forms[i], s.full[i]
	anchors := full.alternates
	keep := s.set.RefitPerSize
	if f.Planar {
		// A dispersed form's fits cost an angular integration per
		// point: one anchor, the best subset of each size.
		anchors, keep = anchors[:min(len(anchors), 1)], 1
	}
	if len(anchors) > maxAnchors {
		anchors = anchors[:maxAnchors]
	}
	var round []*refit
	seen := map[string]bool{}
	var how string
	for ai, th := range anchors {
		best, h := searchSubsets(full, th, s.set.MaxTerms, keep, s.set.ExhaustiveLimit)
		if ai == 0 {
			how = h
		}
		init := paramsAt(full, th)
		for _, group := range best {
			for _, sub := range group {
				key := fmt.Sprint(sub.terms)
				if seen[key] {
					continue
				}
				seen[key] = true
				st := f.withTerms(nil)
				for _, k := range sub.terms {
					st.Terms = append(st.Terms, full.Structure.Terms[k])
				}
				round = append(round, &refit{form: i, st: st, init: init})
			}
		}
	}
	return round, fmt.Sprintf("%s: %s at %d local optima of the full candidate fit, then forward steps adding to the best refitted model of each size %s", formName(f), how, len(anchors), additionsText(branchOf(f)))
}

// additions returns the refits that grow base, a model of form i, by
// each of the n terms of the form's full candidate set that lower its loss
// most (rankAdditions), warm-started from base's parameters over the full
// fit's.
func (s *search) additions(i int, base *Result, n int) []*refit {
	bst := activeStructure(base)
	init := s.full[i].Params()
	for name, v := range base.Params() {
		init[name] = v
	}
	var out []*refit
	for _, j := range rankAdditions(s.full[i], init, bst, n) {
		t := s.full[i].Structure.Terms[j]
		out = append(out, &refit{form: i, st: s.forms[i].withTerms(append(append([]TermSpec(nil), bst.Terms...), t)), init: init})
	}
	return out
}

// branchOf is how many single-term additions a forward step of form f
// refits.
func branchOf(f Structure) int {
	if f.Planar {
		return spreadForwardBranch
	}
	return forwardBranch
}

// additionsText says in words which additions a forward step refits.
func additionsText(n int) string {
	if n == 1 {
		return "the one term that reduces the loss most"
	}
	return fmt.Sprintf("each of the %d terms that reduce the loss most", n)
}

// bestBySize returns the best refit of each form and number of active
// terms whose families all keep a fibre term.
func (s *search) bestBySize() map[sizeKey]*Result {
	m := map[sizeKey]*Result{}
	for _, rf := range s.refits {
		if rf.res == nil || !layoutSatisfied(rf.res) {
			continue
		}
		k := sizeKey{rf.form, activeTerms(rf.res)}
		if k.size == 0 {
			continue
		}
		if old, ok := m[k]; !ok || rf.res.Loss < old.Loss {
			m[k] = rf.res
		}
	}
	return m
}

// forwardSteps grows the best model of each size k−1 by each of the
// forwardBranch terms that lower its loss most (spreadForwardBranch for a
// spread form), warm-started, so that the front is nested as well as
// searched.
func (s *search) forwardSteps() {
	reduced := make([]int, len(s.forms))
	for k := 2; k <= s.set.MaxTerms; k++ {
		bm := s.bestBySize()
		var round []*refit
		for i, f := range s.forms {
			base, ok := bm[sizeKey{i, k - 1}]
			if !ok || s.fullErr[i] != nil {
				continue
			}
			if _, ok := s.simplerForm(base); ok {
				// A simpler form's model with parameters more: that form's
				// own forward steps grow it.
				reduced[i]++
				continue
			}
			round = append(round, s.additions(i, base, branchOf(f))...)
		}
		s.runRefits(round)
	}
	for i, n := range reduced {
		if n > 0 {
			s.d.Search = append(s.d.Search, fmt.Sprintf("%s: no forward steps from %d best models that are a simpler form's with parameters more (every family spread at the fit's bound on the concentration, b = %d, which is an ideal family; or two families within 2°, which is one): that form's own forward steps grow them", formName(s.forms[i]), n, FitMaxConcentration))
		}
	}
}
