package aniso

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"sort"
	"strings"
	"time"

	"github.com/weft-tools/weft/terms"
)

// DiscoverSettings tune model discovery. The zero value gives the defaults.
type DiscoverSettings struct {
	// MaxTerms is the largest model size K searched (default 5).
	MaxTerms int
	// Layouts are the fibre layouts compared (default: none, single,
	// mirror, free).
	Layouts []Layout
	// NoPlanar leaves out the in-plane dispersed variant of every fibre
	// layout (each family spread over the plane with a learned
	// concentration, see Structure.Planar), which is searched by default:
	// real collagen is spread over directions.
	NoPlanar bool
	// Dispersion also tries every fibre layout with a learned
	// three-dimensional dispersion κ (Gasser, Ogden & Holzapfel 2006);
	// off by default (for membranes the in-plane spread is the physical
	// one).
	Dispersion bool
	// Shapes are the candidate shapes (default: the whole catalogue but the
	// Green-strain shape of Tong & Fung 1976, which is a classical model to
	// compare with, fitted as a preset, not a mechanism to discover).
	Shapes []*terms.Shape
	// RefitPerSize is how many of the best subsets of each size are refitted
	// with their own angles and shape parameters (default 2).
	RefitPerSize int
	// Presets are the classical presets fitted for comparison (default
	// neo-hookean, hgo, goh, fung).
	Presets []string
	// SearchPoints is the most points per protocol that the search,
	// cross-validation and selection use (default DefaultSearchPoints;
	// see subset.go); the chosen model is refitted on every point.
	SearchPoints int
	// ExhaustiveLimit is the largest number of subsets searched exhaustively
	// per layout (default 200 000); beyond it a forward search with swaps
	// is used.
	ExhaustiveLimit int
	// Workers run independent fits in parallel (default: all cores).
	Workers int
	// Fit settings for every fit (profiles are computed for the chosen model
	// only).
	Fit Settings
	// Progress, when set, is called after each finished job with the number
	// done and the total known so far.
	Progress func(done, total int)
}

func (s DiscoverSettings) withDefaults() DiscoverSettings {
	if s.MaxTerms <= 0 {
		s.MaxTerms = 5
	}
	if s.Layouts == nil {
		s.Layouts = []Layout{LayoutNone, LayoutSingle, LayoutMirror, LayoutFree}
	}
	if s.Shapes == nil {
		for _, sh := range terms.Catalogue() {
			if sh.Arg != terms.Green {
				s.Shapes = append(s.Shapes, sh)
			}
		}
	}
	if s.RefitPerSize <= 0 {
		s.RefitPerSize = 2
	}
	if s.Presets == nil {
		s.Presets = []string{"neo-hookean", "hgo", "goh", "fung"}
	}
	if s.SearchPoints <= 0 {
		s.SearchPoints = DefaultSearchPoints
	}
	if s.ExhaustiveLimit <= 0 {
		s.ExhaustiveLimit = 200000
	}
	if s.Workers <= 0 {
		s.Workers = runtime.NumCPU()
	}
	return s
}

// Candidate is a fitted model form considered by discovery.
type Candidate struct {
	// Name is "preset:<name>" for presets, else
	// "<layout>[+dispersed|+kappa]-t<terms>-p<parameters>".
	Name   string
	Layout Layout
	// Terms is the number of active terms.
	Terms int
	// Result is the candidate's fit on the points discovery searched (see
	// DiscoverSettings.SearchPoints); for the chosen candidate, its refit
	// on every point.
	Result *Result
	// Searched is, for the chosen candidate, its fit on the searched
	// points that the refit replaced (nil otherwise): the fit to compare
	// with the other candidates, whose losses and BICs are on those
	// points (see Compared).
	Searched *Result
	// CV is nil when the data have a single protocol.
	CV *CVScore
}

// Discovery is the outcome of model discovery for one specimen.
type Discovery struct {
	// Pareto holds, per form (layout, with or without dispersion), the best
	// model at each number of parameters that improves on every smaller one
	// (at most K terms).
	Pareto []Candidate
	// Presets are the classical models fitted to the same data.
	Presets []Candidate
	// Chosen indexes Pareto; Rule states the selection rule and numbers.
	Chosen int
	Rule   string
	// Verdict on the number of fibre families.
	Verdict Verdict
	// Search notes, in words, how each form was searched, which models
	// were left out of a stage and why, and which candidates were
	// cross-validated.
	Search []string
	// CrossR2[i][j] is the mean R² over components of protocol j predicted
	// by the chosen form fitted to protocol i alone (NaN where undefined).
	CrossR2 [][]float64
	// Elapsed wall time.
	Elapsed time.Duration
	// Points is the number of points of the problem; SearchPoints how many
	// of them the search, cross-validation and selection used (see
	// DiscoverSettings.SearchPoints). The chosen model is fitted on all.
	Points, SearchPoints int

	// hasCV is true when candidates were cross-validated (two protocols or
	// more); those with CV nil were then left out as clearly worse.
	hasCV bool
	// unvalidated holds, per form key, the lowest-BIC model of a form none
	// of whose models was cross-validated because each reduces to a
	// simpler form's (see crossValidate), and why; the verdict reports it.
	unvalidated map[string]formLeftOut
}

// formLeftOut is a form that the verdict could not weigh, with its best
// in-sample model and the reason.
type formLeftOut struct {
	c   *Candidate
	why string
}

// Compared returns the fit by which c is compared with the other
// candidates: Searched when the chosen model was refitted on every point,
// else Result. Losses, information criteria and R² of candidates are
// comparable only on the same points.
func (c *Candidate) Compared() *Result {
	if c.Searched != nil {
		return c.Searched
	}
	return c.Result
}

// Best returns the chosen candidate.
func (d *Discovery) Best() *Candidate { return &d.Pareto[d.Chosen] }

// Errors of Discover that say the data gave it nothing to work with.
var (
	// ErrAllZero: every measured stress is zero.
	ErrAllZero = errors.New("every measured stress is zero, so there is nothing to discover; check the stress or load columns and their units")
	// ErrNoCandidate: not one candidate form could be fitted.
	ErrNoCandidate = errors.New("no candidate model could be fitted; check the data (units, stress kind) or fit a chosen model form")
)

// Discover finds which catalogue terms and how many fibre families the data
// support. For each form (layout, ideal or spread) it fits the whole
// candidate set (non-negativity already zeroes many weights), searches
// every subset of up to K terms at the learned angles and shape parameters
// with non-negative least squares on the cross products, refits the best
// subsets of each size with their own angles and shape parameters, grows
// them term by term, and cross-validates by leaving one protocol out. The
// verdict on the fibre families comes first, from whole forms (select.go);
// the pick inside the winning form follows the one-standard-error rule
// (Hastie, Tibshirani & Friedman 2009, §7.10). The stages are the methods
// of search below, in the order Discover calls them.
func Discover(all *Problem, set DiscoverSettings) (*Discovery, error) {
	start := time.Now()
	s, err := newSearch(all, set)
	if err != nil {
		return nil, err
	}
	s.fitFullForms()
	s.refitSubsets()
	s.forwardSteps()
	s.planarVariants()
	if err := s.paretoFront(); err != nil {
		return nil, err
	}
	s.comparePresets()
	s.candidateMetrics()
	s.crossValidate()
	s.d.decide(s.p)
	s.polish()
	s.d.Elapsed = time.Since(start)
	return s.d, nil
}

// search is the state of one discovery: the problem at full size and the
// subset searched, the forms, their full fits and every refit so far.
type search struct {
	all, p *Problem
	set    DiscoverSettings
	fitSet Settings
	pl     *pool
	d      *Discovery

	forms     []Structure
	variantOf map[int]int // planar form → its ideal layout, for derived forms
	full      []*Result
	fullErr   []error
	presets   []*Result // per DiscoverSettings.Presets; nil where the fit failed
	refits    []*refit
}

// refit is one candidate form's fit, warm-started from init.
type refit struct {
	form int
	st   Structure
	init map[string]float64
	res  *Result
}

// sizeKey indexes the best refit of a form at one number of active terms.
type sizeKey struct{ form, size int }

// newSearch checks the data, takes the search subset and sets up the forms.
func newSearch(all *Problem, set DiscoverSettings) (*search, error) {
	set = set.withDefaults()
	p, err := searchSubset(all, set.SearchPoints)
	if err != nil {
		return nil, err
	}
	nonzero := false
	for _, y := range p.Target {
		if y != 0 {
			nonzero = true
			break
		}
	}
	if !nonzero {
		return nil, ErrAllZero
	}
	if len(p.Protocols) < 2 {
		// One protocol cannot separate one family from two or from a
		// spread: those forms are not offered (the verdict says so).
		var ls []Layout
		for _, l := range set.Layouts {
			if l == LayoutNone || l == LayoutSingle {
				ls = append(ls, l)
			}
		}
		set.Layouts, set.NoPlanar, set.Dispersion = ls, true, false
	}
	s := &search{all: all, p: p, set: set, pl: &pool{n: set.Workers, progress: set.Progress},
		d: &Discovery{Points: all.Data.Points(), SearchPoints: p.Data.Points()}}
	if p != all {
		s.d.Search = append(s.d.Search, fmt.Sprintf("points: the search, the cross-validation and the comparison of candidates used %d of the %d points (at most %d a protocol, evenly spaced in each protocol's driving stretch, ends included, with the protocol's weights rescaled so that it keeps its share of the loss); the chosen model was refitted on all %d", s.d.SearchPoints, s.d.Points, set.SearchPoints, s.d.Points))
	}
	s.fitSet = set.Fit
	s.fitSet.Profile = false
	s.fitSet.noMetrics = true
	if s.fitSet.Tolerance == 0 {
		// Comparing models needs their losses to a few digits, not ten;
		// the chosen model is polished at the default (polish), with the
		// accurate quadrature.
		s.fitSet.Tolerance = searchTolerance
		s.fitSet.SearchQuadrature = true
	}
	if s.fitSet.MaxIterations == 0 {
		s.fitSet.MaxIterations = searchMaxIterations
	}
	// One dispersed family is searched like any form; the two-family
	// dispersed forms are variants of their ideal layout's best models
	// (planarVariants), not searched on their own: an angular integration
	// per point makes each of their fits tens of times dearer, and a search
	// over two angles would multiply that again.
	s.variantOf = map[int]int{}
	for _, l := range set.Layouts {
		s.forms = append(s.forms, Structure{Layout: l})
		if l != LayoutNone && !set.NoPlanar {
			if l != LayoutSingle {
				s.variantOf[len(s.forms)] = len(s.forms) - 1
			}
			s.forms = append(s.forms, Structure{Layout: l, Planar: true})
		}
		if l != LayoutNone && set.Dispersion {
			s.forms = append(s.forms, Structure{Layout: l, Dispersion: true})
		}
	}
	return s, nil
}

// fitFullForms fits the whole candidate set of every searched form, and
// the classical presets beside them: the presets do not depend on the
// search, and in a round of their own they would leave a worker idle
// while the dearest one finished (comparePresets records them).
func (s *search) fitFullForms() {
	s.full = make([]*Result, len(s.forms))
	s.fullErr = make([]error, len(s.forms))
	var jobs []func()
	var cost []float64
	for i, f := range s.forms {
		if _, ok := s.variantOf[i]; ok {
			s.fullErr[i] = errVariant
			continue
		}
		st := fullStructure(s.set.Shapes, f)
		jobs = append(jobs, func() {
			s.full[i], s.fullErr[i] = Fit(s.p, st, s.fitSet)
		})
		cost = append(cost, fitCost(st))
	}
	s.presets = make([]*Result, len(s.set.Presets))
	for i, name := range s.set.Presets {
		st, err := PresetStructure(name)
		if err != nil {
			continue
		}
		jobs = append(jobs, func() {
			if r, err := Fit(s.p, st, s.fitSet); err == nil {
				s.presets[i] = r
			}
		})
		cost = append(cost, fitCost(st))
	}
	s.pl.runDearFirst(jobs, cost)
}

// fitCost estimates the relative cost of fitting st, for scheduling
// only: a column per term and point, a spread family's about twenty
// quadrature directions per point, two families' angles doubling the
// iterations and scans.
func fitCost(st Structure) float64 {
	c := 1.0
	for _, t := range st.Terms {
		c++
		if t.Family >= 0 && st.Planar {
			c += 20
		}
	}
	if st.Layout.Families() == 2 {
		c *= 2
	}
	return c
}

// runRefits fits each refit's form, warm-started, drops the terms the
// data do not support (withoutDegenerate) and records the refits.
func (s *search) runRefits(rs []*refit) {
	var jobs []func()
	var cost []float64
	for _, rf := range rs {
		jobs = append(jobs, func() {
			set := s.fitSet
			set.Init, set.NoScan = rf.init, true
			if r, err := Fit(s.p, rf.st, set); err == nil {
				rf.res = withoutDegenerate(s.p, r, set)
			}
		})
		cost = append(cost, fitCost(rf.st))
	}
	s.pl.runDearFirst(jobs, cost)
	s.refits = append(s.refits, rs...)
}

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
			bst := activeStructure(base)
			init := s.full[i].Params()
			for name, v := range base.Params() {
				init[name] = v
			}
			for _, j := range rankAdditions(s.full[i], init, bst, branchOf(f)) {
				t := s.full[i].Structure.Terms[j]
				st := f.withTerms(append(append([]TermSpec(nil), bst.Terms...), t))
				round = append(round, &refit{form: i, st: st, init: init})
			}
		}
		s.runRefits(round)
	}
	for i, n := range reduced {
		if n > 0 {
			s.d.Search = append(s.d.Search, fmt.Sprintf("%s: no forward steps from %d best models that are a simpler form's with parameters more (every family spread at the fit's bound on the concentration, b = %d, which is an ideal family; or two families within 2°, which is one): that form's own forward steps grow them", formName(s.forms[i]), n, FitMaxConcentration))
		}
	}
}

// planarVariants refits, with the families spread in the plane, the best
// model of every size of each ideal two-family layout whose BIC is within
// cvBICWindow of that layout's best, warm-started from the ideal fit; not
// one whose families coincide (one family: the one-family spread form is
// searched on its own).
func (s *search) planarVariants() {
	bm := s.bestBySize()
	var round []*refit
	for i, f := range s.forms {
		base, ok := s.variantOf[i]
		if !ok {
			continue
		}
		minBIC := math.Inf(1)
		for size := 1; size <= s.set.MaxTerms; size++ {
			if r, ok := bm[sizeKey{base, size}]; ok {
				minBIC = math.Min(minBIC, r.BIC)
			}
		}
		n, same := 0, 0
		for size := 1; size <= s.set.MaxTerms; size++ {
			r, ok := bm[sizeKey{base, size}]
			if !ok || r.BIC-minBIC > cvBICWindow {
				continue
			}
			if coincident(r) && s.hasForm(Structure{Layout: LayoutSingle, Planar: true}) {
				// Two families that point the same way are one family, and
				// so is their spread variant: the one-family spread form
				// is searched on its own.
				same++
				continue
			}
			st, ok := planarVariant(activeStructure(r))
			if !ok {
				continue
			}
			round = append(round, &refit{form: i, st: st, init: r.Params()})
			n++
		}
		note := fmt.Sprintf("%s: the best model of each size of the %s layout within ΔBIC 10 of its best (%d) refitted with its families spread in the plane (concentration learned)", formName(f), f.Layout, n)
		if same > 0 {
			note += fmt.Sprintf("; %d more left out because their two families point the same way (within 2°), which is one family", same)
		}
		s.d.Search = append(s.d.Search, note)
	}
	s.runRefits(round)
}

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

// crossValidate leaves one protocol out for every candidate that could
// speak for its form. Left out, and named in the search notes: one whose
// BIC is more than cvBICWindow above its form's best (worse in-sample even
// after the penalty for its size); a spread model with every family at the
// fit's concentration bound (the ideal form's model with a parameter
// more); and two families within 2° (one family, which the verdict would
// not consider; see coincident), when the forms they reduce to are
// searched. Presets are cross-validated for comparison.
func (s *search) crossValidate() {
	if len(s.p.Protocols) < 2 {
		return
	}
	d := s.d
	d.hasCV = true
	var cands []*Candidate
	minBIC := map[string]float64{}
	for i := range d.Pareto {
		k := FormKey(d.Pareto[i].Result.Structure)
		if v, ok := minBIC[k]; !ok || d.Pareto[i].Result.BIC < v {
			minBIC[k] = d.Pareto[i].Result.BIC
		}
	}
	far := 0
	var bound, one []string
	why := map[*Candidate]string{} // why a model reduces to a simpler form's
	for i := range d.Pareto {
		c := &d.Pareto[i]
		f, reduces := s.simplerForm(c.Result)
		switch {
		case c.Result.BIC-minBIC[FormKey(c.Result.Structure)] > cvBICWindow:
			far++
		case reduces && spreadAtBound(c.Result):
			bound = append(bound, c.Name)
			why[c] = fmt.Sprintf("every family of its models is spread at the fit's bound on the concentration (b = %d), an ideal family, which makes them %s's models with a parameter more", FitMaxConcentration, FormKey(f))
		case reduces:
			one = append(one, c.Name)
			why[c] = fmt.Sprintf("its two families point the same way (%s), which is one family", anglesText(c.Result))
		default:
			cands = append(cands, c)
		}
	}
	d.noteUnvalidated(cands, why)
	for i := range d.Presets {
		cands = append(cands, &d.Presets[i])
	}
	note := fmt.Sprintf("cross-validation: %d of the %d candidates cross-validated; %d left out because their BIC is more than %d above their form's best", len(d.Pareto)-far-len(bound)-len(one), len(d.Pareto), far, cvBICWindow)
	if len(bound) > 0 {
		note += fmt.Sprintf("; %s left out because every family of theirs is spread at the fit's bound on the concentration (b = %d, an ideal family within the resolution of a fitted angle), which makes them their ideal form's model with a parameter more", strings.Join(bound, ", "), FitMaxConcentration)
	}
	if len(one) > 0 {
		note += fmt.Sprintf("; %s left out because their two families point the same way (within 2°), which makes them a one-family model with parameters more", strings.Join(one, ", "))
	}
	d.Search = append(d.Search, note)
	crossValidate(s.p, cands, s.fitSet, s.pl)
}

// noteUnvalidated records every form of the front none of whose models is
// among cands (the front models to be cross-validated) and that has a
// model reducing to a simpler form's (why, keyed by candidate, says how),
// with its lowest-BIC such model and the reason.
func (d *Discovery) noteUnvalidated(cands []*Candidate, why map[*Candidate]string) {
	has := map[string]bool{}
	for _, c := range cands {
		has[FormKey(c.Result.Structure)] = true
	}
	for i := range d.Pareto {
		c := &d.Pareto[i]
		k := FormKey(c.Result.Structure)
		w, reduces := why[c]
		if has[k] || !reduces {
			continue
		}
		if old, ok := d.unvalidated[k]; ok && old.c.Result.BIC <= c.Result.BIC {
			continue
		}
		if d.unvalidated == nil {
			d.unvalidated = map[string]formLeftOut{}
		}
		d.unvalidated[k] = formLeftOut{c: c, why: w}
	}
}

// hasForm reports whether st's form (layout, spread, dispersion) is
// searched.
func (s *search) hasForm(st Structure) bool {
	for _, f := range s.forms {
		if f.Layout == st.Layout && f.Planar == st.Planar && f.Dispersion == st.Dispersion {
			return true
		}
	}
	return false
}

// simplerForm returns the searched form whose model r is with parameters
// more, if there is one: a spread model with every family at the
// concentration bound is its ideal layout's (spreadAtBound), two families
// within 2° are one family's, spread or not as r is (coincident). Such a
// model is neither cross-validated nor grown: the simpler form speaks for
// it.
func (s *search) simplerForm(r *Result) (Structure, bool) {
	var f Structure
	switch {
	case spreadAtBound(r):
		f = Structure{Layout: r.Structure.Layout}
	case coincident(r):
		f = Structure{Layout: LayoutSingle, Planar: r.Structure.Planar, Dispersion: r.Structure.Dispersion}
	default:
		return Structure{}, false
	}
	return f, s.hasForm(f)
}

// spreadAtBound reports whether r spreads its families in the plane with
// every concentration at FitMaxConcentration: a spread form's model that
// the data drove back to the ideal family.
func spreadAtBound(r *Result) bool {
	if !r.Structure.Planar || len(r.Model.Families) == 0 {
		return false
	}
	for _, f := range r.Model.Families {
		if f.Concentration < FitMaxConcentration {
			return false
		}
	}
	return true
}

// polish refits the chosen model on every point with the default
// tolerance and the accurate quadrature, with its angle profiles, and
// fills the one-protocol cross matrix.
func (s *search) polish() {
	best := s.d.Best()
	prof := s.set.Fit
	prof.Profile = true
	prof.Init = best.Result.Params()
	prof.NoScan = true
	if r, err := Fit(s.all, activeStructure(best.Result), prof); err == nil {
		// The polish fits more points and integrates dispersion accurately,
		// so the loss may move either way; a lower one always replaces.
		if activeTerms(r) == best.Terms && (r.Structure.Planar || s.p != s.all || r.Loss <= best.Result.Loss*(1+1e-9)) {
			best.Searched, best.Result = best.Result, r
		} else {
			best.Result.Profiles = r.Profiles
		}
	}
	s.d.CrossR2 = crossMatrix(s.p, best.Result, s.fitSet, s.pl)
}

// searchMaxIterations bounds each local refinement of the search: a form
// that fits badly creeps on by tiny steps, and the comparison of forms does
// not need its last digits.
const searchMaxIterations = 60

// searchTolerance is the refinement tolerance of discovery's search,
// cross-validation and comparison fits (see Settings.Tolerance).
const searchTolerance = 1e-6
