package aniso

// Discovery's sixth stage (see Discover): the Pareto front of each form,
// the classical presets recorded beside it and every candidate's fit
// quality.

import (
	"fmt"
	"sort"
)

// paretoFront keeps, per form, the best refit at each number of parameters
// (weights and non-linear parameters) that improves on every smaller model
// of its form by more than the refinement's tolerance (relative to the
// loss): a smaller improvement is not resolved.
func (s *search) paretoFront() error {
	type pkey struct{ form, params int }
	bestP := map[pkey]*Result{}
	for _, rf := range s.refits {
		if rf.res == nil || !layoutSatisfied(rf.res) || activeTerms(rf.res) == 0 || activeTerms(rf.res) > s.set.MaxTerms {
			continue
		}
		k := pkey{rf.form, rf.res.Complexity}
		if old, ok := bestP[k]; !ok || rf.res.Loss < old.Loss {
			bestP[k] = rf.res
		}
	}
	var keys []pkey
	for k := range bestP {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(a, b int) bool {
		if keys[a].form != keys[b].form {
			return keys[a].form < keys[b].form
		}
		return keys[a].params < keys[b].params
	})
	lastLoss := map[int]float64{}
	unresolved := 0
	for _, k := range keys {
		r := bestP[k]
		if prev, ok := lastLoss[k.form]; ok && r.Loss >= prev*(1-s.fitSet.Tolerance) {
			if r.Loss < prev {
				// Lower by less than the refinement resolves: the
				// smaller model's fit with parameters that do nothing.
				unresolved++
			}
			continue
		}
		lastLoss[k.form] = r.Loss
		f := s.forms[k.form]
		n := activeTerms(r)
		s.d.Pareto = append(s.d.Pareto, Candidate{Name: fmt.Sprintf("%s-t%d-p%d", formName(f), n, k.params), Layout: f.Layout, Terms: n, Result: r})
	}
	if len(s.d.Pareto) == 0 {
		return ErrNoCandidate
	}
	if unresolved > 0 {
		s.d.Search = append(s.d.Search, fmt.Sprintf("front: %d models left off because they lower the loss of their form's next smaller model by less than the refinement resolves (relative %g) with parameters more", unresolved, s.fitSet.Tolerance))
	}
	return nil
}

// comparePresets records the classical presets, fitted to the same data
// beside the full forms (fitFullForms), in the order of the settings; a
// preset that could not be fitted is left out.
func (s *search) comparePresets() {
	for i, name := range s.set.Presets {
		if r := s.presets[i]; r != nil {
			s.d.Presets = append(s.d.Presets, Candidate{Name: "preset:" + name, Layout: r.Structure.Layout, Terms: activeTerms(r), Result: r})
		}
	}
}

// candidateMetrics fills the fit quality of the kept candidates and the
// presets (the search's refits skip it), side by side: each predicts on
// every point, a spread family with the accurate quadrature.
func (s *search) candidateMetrics() {
	var jobs []func()
	// Each candidate is its own fit today; the set keeps two jobs from
	// ever writing one Result's metrics at once if that changes.
	seen := map[*Result]bool{}
	for _, cs := range [][]Candidate{s.d.Pareto, s.d.Presets} {
		for i := range cs {
			if r := cs[i].Result; r.Metrics == nil && !seen[r] {
				seen[r] = true
				jobs = append(jobs, func() { r.metrics(s.p) })
			}
		}
	}
	s.pl.run(jobs)
}
