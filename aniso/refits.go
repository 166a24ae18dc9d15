package aniso

// Discovery's second and third stages (see Discover): the term subsets of
// each form searched at its full fit's optima (termsubsets.go) and the best
// of each size refitted, then grown one term at a time.

import (
	"fmt"
	"maps"
	"math"
)

// ownSubsetSize is the largest subset searched again at each term's own
// best shape parameters (subsetRound).
const ownSubsetSize = 2

// refitSubsets searches the term subsets of every form at up to
// maxAnchors local optima of its full fit (so that one poor optimum of the
// whole catalogue does not decide which subsets are tried) and refits the
// best of each size with their own angles and shape parameters.
func (s *search) refitSubsets() {
	// The forms' searches run side by side (each on its own full fit's
	// engine); their refits and notes are gathered in form order.
	rounds := make([][]*refit, len(s.forms))
	s.fullAt = make([]map[string]float64, len(s.forms))
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
	type anchor struct {
		full *Result
		th   []float64
	}
	var at []anchor
	for _, th := range anchors {
		at = append(at, anchor{full, th})
	}
	where := fmt.Sprintf("at %d local optima of the full candidate fit", len(anchors))
	if perp := s.perpendicularFull(f, full); perp != nil {
		at = append(at, anchor{perp, perp.theta})
		where += " and at its refit with the second family turned to 90° from the first"
	}
	var round []*refit
	seen := map[string]bool{}
	// refitEach adds a refit of every subset of best not yet added,
	// started from init, and returns how many it added.
	refitEach := func(best [][]subset, init map[string]float64) int {
		added := 0
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
				added++
			}
		}
		return added
	}
	var how string
	for ai, an := range at {
		th := an.th
		if f.Layout == LayoutNone {
			th = idleProfiled(an.full, an.th)
		}
		best, h := searchSubsets(an.full, th, s.set.MaxTerms, keep, s.set.ExhaustiveLimit)
		if ai == 0 {
			how = h
		}
		init := paramsAt(an.full, th)
		if ai == 0 && f.Layout == LayoutNone {
			s.fullAt[i] = maps.Clone(init)
		}
		refitEach(best, init)
	}
	// The smallest subsets again with every term's shape parameters where
	// that term alone fits best: a term the full fit shares the load with
	// others ranks there with parameters fitted for the mixture (a
	// synthetic Gent (1996) solid, fitted by i1-gent alone at its own
	// limit, was not refitted alone).
	if len(anchors) > 0 && f.Layout == LayoutNone {
		own := ownProfiled(full, anchors[0], false)
		best, _ := searchSubsets(full, own, min(ownSubsetSize, s.set.MaxTerms), keep, s.set.ExhaustiveLimit)
		added := refitEach(best, paramsAt(full, own))
		if added > 0 {
			where += fmt.Sprintf(", and subsets of up to %d terms at each term's own best shape parameters", min(ownSubsetSize, s.set.MaxTerms))
		}
	}
	return round, fmt.Sprintf("%s: %s %s, then forward steps adding to the best refitted model of each size %s", formName(f), how, where, additionsText(branchOf(f)))
}

// additions returns the refits that grow base, a model of form i, by
// each of the n terms of the form's full candidate set that lower its loss
// most (rankAdditions), warm-started from base's parameters over the full
// fit's.
func (s *search) additions(i int, base *Result, n int) []*refit {
	bst := activeStructure(base)
	init := s.full[i].Params()
	if i < len(s.fullAt) && s.fullAt[i] != nil {
		init = maps.Clone(s.fullAt[i])
	}
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

// perpendicularFull refits the full candidate fit of the free two-family
// form (ideal families) from its best optimum with the second family
// turned to 90° from the first, and returns that fit as an extra anchor
// for the term subsets, unless an optimum already has its families within
// 20° of there or the refit fails. The full fit's optima miss two families
// at right angles when both of its families settle near one direction: a
// Demiray matrix with spread families at 0° and 90°, on sutures, ended as
// a confident 1 at 0°, while the true form, fitted on its own, lands at
// 0°/90° with a BIC 17.8 below every model found.
func (s *search) perpendicularFull(f Structure, full *Result) *Result {
	if f.Layout != LayoutFree || f.Planar || f.Dispersion || len(full.alternates) == 0 {
		return nil
	}
	i1, i2 := -1, -1
	for i, q := range full.e.params {
		switch q.Name {
		case "angle_1":
			i1 = i
		case "angle_2":
			i2 = i
		}
	}
	if i1 < 0 || i2 < 0 {
		return nil
	}
	th := append([]float64(nil), full.alternates[0]...)
	th[i2] = wrapAngle(th[i1] + math.Pi/2)
	for _, a := range full.alternates {
		if math.Abs(wrapAngle(a[i2]-th[i2])) < Rad(20) && math.Abs(wrapAngle(a[i1]-th[i1])) < Rad(20) {
			return nil
		}
	}
	set := s.fitSet
	set.Init, set.NoScan = paramsAt(full, th), true
	r, err := Fit(s.p, full.Structure, set)
	if err != nil {
		return nil
	}
	return r
}
