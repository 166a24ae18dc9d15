package aniso

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"sort"
	"strings"
	"sync"
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

// CVFold is one leave-one-protocol-out fold.
type CVFold struct {
	// Protocol is the held-out protocol's label.
	Protocol string
	// Error is the held-out normalised RMSE: √(weighted SSE / components),
	// with the rows weighted as package biaxial delivers them (each
	// protocol-axis by 1/(range·√points)), so 0.01 is about 1 % of range.
	Error float64
	// Metrics of the held-out prediction per component.
	Metrics []Metric
}

// CVScore summarises leave-one-protocol-out cross-validation.
type CVScore struct {
	Folds []CVFold
	// Mean and StdErr (standard deviation / √folds) of the fold errors.
	Mean, StdErr float64
}

// Candidate is a fitted model form considered by discovery.
type Candidate struct {
	// Name is "preset:<name>" for presets, else
	// "<layout>[+dispersed|+kappa]-k<terms>-p<parameters>".
	Name   string
	Layout Layout
	// Terms is the number of active terms.
	Terms  int
	Result *Result
	// CV is nil when the data have a single protocol.
	CV *CVScore
}

// Verdict is the answer on the number of fibre families.
type Verdict struct {
	// Families is "0", "1", "2", "1-or-mirror-pair" (without shear
	// information one family and a mirror pair give the same normal
	// stresses) or "undecided" (the evidence points at another family
	// count without settling it, or one protocol cannot decide).
	Families string
	// Reason states the evidence in words and numbers.
	Reason string
	// DeltaBIC is each form's best BIC minus the best over forms, keyed by
	// FormKey ("0", "1", "1+dispersed", "2-mirror", "2-free", ...).
	DeltaBIC map[string]float64
	// CVError is each form's best held-out error, same keys; empty
	// without cross-validation.
	CVError map[string]float64
	// Comparisons are the steps of the walk from the simplest form to the
	// richest (see select.go).
	Comparisons []LayoutComparison
	// RuledOut names the richer explanations that fitted better without
	// beating the verdict's form by more than the noise, and look-alikes.
	RuledOut []string
	// Noise is the estimated noise in held-out-error units and StdErrFloor
	// the smallest standard error a comparison may claim.
	Noise, StdErrFloor float64
	// Decider names the extra measurement that would settle an undecided
	// case, or is empty.
	Decider string
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
	// Search describes how subsets were searched per layout.
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
}

// Best returns the chosen candidate.
func (d *Discovery) Best() *Candidate { return &d.Pareto[d.Chosen] }

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

// pool runs jobs on n workers and keeps results in job order, so that the
// outcome does not depend on scheduling.
type pool struct {
	n        int
	progress func(done, total int)
	mu       sync.Mutex
	done     int
	total    int
}

func (p *pool) run(jobs []func()) {
	p.mu.Lock()
	p.total += len(jobs)
	p.mu.Unlock()
	ch := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < p.n; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range ch {
				jobs[i]()
				p.mu.Lock()
				p.done++
				d, t := p.done, p.total
				p.mu.Unlock()
				if p.progress != nil {
					p.progress(d, t)
				}
			}
		}()
	}
	for i := range jobs {
		ch <- i
	}
	close(ch)
	wg.Wait()
}

// subset is a set of design terms of a full structure with its fixed-angle
// loss.
type subset struct {
	terms []int
	loss  float64
}

// Errors of Discover that say the data gave it nothing to work with.
var (
	// ErrAllZero: every measured stress is zero.
	ErrAllZero = errors.New("every measured stress is zero, so there is nothing to discover; check the stress or load columns and their units")
	// ErrNoCandidate: not one candidate form could be fitted.
	ErrNoCandidate = errors.New("no candidate model could be fitted; check the data (units, stress kind) or fit a chosen model form")
)

// Discover finds which catalogue terms and how many fibre families the data
// support. For each layout it fits the whole candidate set (non-negativity
// already zeroes many weights), searches every subset of up to K terms at
// the learned angles and shape parameters with non-negative least squares on
// the cross products, refits the best subsets of each size with their own
// angles and shape parameters, and cross-validates by leaving one protocol
// out. The pick is the smallest model whose cross-validated error is within
// one standard error of the best (Hastie, Tibshirani & Friedman 2009, §7.10).
func Discover(all *Problem, set DiscoverSettings) (*Discovery, error) {
	start := time.Now()
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
	pl := &pool{n: set.Workers, progress: set.Progress}
	fitSet := set.Fit
	fitSet.Profile = false
	if fitSet.Tolerance == 0 {
		// Comparing models needs their losses to a few digits, not ten;
		// the chosen model is polished at the default below, with the
		// accurate quadrature.
		fitSet.Tolerance = searchTolerance
		fitSet.SearchQuadrature = true
	}
	if fitSet.MaxIterations == 0 {
		fitSet.MaxIterations = searchMaxIterations
	}

	// 1. Full candidate fits per form (layout, with or without dispersion).
	// One dispersed family is searched like any form; the two-family
	// dispersed forms are variants of their ideal layout's best models
	// (step 2b), not searched on their own: an angular integration per
	// point makes each of their fits tens of times dearer, and a search
	// over two angles would multiply that again.
	var forms []Structure
	variantOf := map[int]int{}
	for _, l := range set.Layouts {
		forms = append(forms, Structure{Layout: l})
		if l != LayoutNone && !set.NoPlanar {
			if l != LayoutSingle {
				variantOf[len(forms)] = len(forms) - 1
			}
			forms = append(forms, Structure{Layout: l, Planar: true})
		}
		if l != LayoutNone && set.Dispersion {
			forms = append(forms, Structure{Layout: l, Dispersion: true})
		}
	}
	full := make([]*Result, len(forms))
	fullErr := make([]error, len(forms))
	var jobs []func()
	for i, f := range forms {
		i, f := i, f
		if _, ok := variantOf[i]; ok {
			fullErr[i] = errVariant
			continue
		}
		jobs = append(jobs, func() {
			st := fullStructure(set.Shapes, f)
			full[i], fullErr[i] = Fit(p, st, fitSet)
		})
	}
	pl.run(jobs)

	// 2. Subset search at fixed angles and shape parameters, then a refit
	// of the best subsets of each size with their own angles and shape
	// parameters.
	d := &Discovery{Points: all.Data.Points(), SearchPoints: p.Data.Points()}
	type refit struct {
		layout int
		st     Structure
		init   map[string]float64
		res    *Result
	}
	var refits []*refit
	runRefits := func(rs []*refit) {
		var jobs []func()
		for _, rf := range rs {
			rf := rf
			jobs = append(jobs, func() {
				s := fitSet
				s.Init = rf.init
				s.NoScan = true
				rf.res, _ = Fit(p, rf.st, s)
			})
		}
		pl.run(jobs)
		refits = append(refits, rs...)
	}
	var round []*refit
	for i, f := range forms {
		l := formName(f)
		if _, ok := variantOf[i]; ok {
			continue
		}
		if fullErr[i] != nil {
			d.Search = append(d.Search, fmt.Sprintf("%s: the full candidate fit failed (%v)", l, fullErr[i]))
			continue
		}
		// Anchors: the full fit's optimum and its other local minima, so
		// that one poor optimum of the whole catalogue does not decide which
		// subsets are tried.
		anchors := full[i].alternates
		if len(anchors) > maxAnchors {
			anchors = anchors[:maxAnchors]
		}
		seen := map[string]bool{}
		var how string
		for ai, th := range anchors {
			best, h := searchSubsets(full[i], th, set.MaxTerms, set.RefitPerSize, set.ExhaustiveLimit)
			if ai == 0 {
				how = h
			}
			init := paramsAt(full[i], th)
			for _, group := range best {
				for _, s := range group {
					key := fmt.Sprint(s.terms)
					if seen[key] {
						continue
					}
					seen[key] = true
					st := f.withTerms(nil)
					for _, k := range s.terms {
						st.Terms = append(st.Terms, full[i].Structure.Terms[k])
					}
					round = append(round, &refit{layout: i, st: st, init: init})
				}
			}
		}
		d.Search = append(d.Search, fmt.Sprintf("%s: %s at %d local optima of the full candidate fit, then forward steps adding to the best refitted model of each size the %d terms that reduce the loss most", l, how, len(anchors), forwardBranch))
	}
	runRefits(round)

	// The best refit of each (layout, active size).
	type key struct {
		layout, size int
	}
	bestOf := func() map[key]*Result {
		m := map[key]*Result{}
		for _, rf := range refits {
			if rf.res == nil || !layoutSatisfied(rf.res) {
				continue
			}
			k := key{rf.layout, activeTerms(rf.res)}
			if k.size == 0 {
				continue
			}
			if old, ok := m[k]; !ok || rf.res.Loss < old.Loss {
				m[k] = rf.res
			}
		}
		return m
	}
	// Forward steps: the best model of size k−1 plus each other candidate
	// term, warm-started, so that the front is nested as well as searched.
	for k := 2; k <= set.MaxTerms; k++ {
		bm := bestOf()
		round = round[:0:0]
		for i, f := range forms {
			base, ok := bm[key{i, k - 1}]
			if !ok || fullErr[i] != nil {
				continue
			}
			bst := activeStructure(base)
			init := full[i].Params()
			for name, v := range base.Params() {
				init[name] = v
			}
			for _, j := range rankAdditions(full[i], init, bst, forwardBranch) {
				t := full[i].Structure.Terms[j]
				st := f.withTerms(append(append([]TermSpec(nil), bst.Terms...), t))
				round = append(round, &refit{layout: i, st: st, init: init})
			}
		}
		runRefits(round)
	}

	// 2b. In-plane dispersed variants: the best model of every size of each
	// ideal two-family layout whose BIC is within cvBICWindow of the
	// layout's best, refitted with its families spread in the plane,
	// warm-started from the ideal fit.
	bm := bestOf()
	round = round[:0:0]
	for i, f := range forms {
		base, ok := variantOf[i]
		if !ok {
			continue
		}
		n := 0
		minBIC := math.Inf(1)
		for size := 1; size <= set.MaxTerms; size++ {
			if r, ok := bm[key{base, size}]; ok {
				minBIC = math.Min(minBIC, r.BIC)
			}
		}
		for size := 1; size <= set.MaxTerms; size++ {
			r, ok := bm[key{base, size}]
			if !ok || r.BIC-minBIC > cvBICWindow {
				continue
			}
			st, ok := planarVariant(activeStructure(r))
			if !ok {
				continue
			}
			round = append(round, &refit{layout: i, st: st, init: r.Params()})
			n++
		}
		d.Search = append(d.Search, fmt.Sprintf("%s: the best model of each size of the %s layout within ΔBIC 10 of its best (%d) refitted with its families spread in the plane (concentration learned)", formName(f), f.Layout, n))
	}
	runRefits(round)

	// 3. Pareto front per form: over every refit, the best loss at each
	// number of parameters (weights and non-linear parameters), kept only
	// when it improves on every smaller model of its form.
	type pkey struct {
		form, params int
	}
	bestP := map[pkey]*Result{}
	for _, rf := range refits {
		if rf.res == nil || !layoutSatisfied(rf.res) || activeTerms(rf.res) == 0 || activeTerms(rf.res) > set.MaxTerms {
			continue
		}
		k := pkey{rf.layout, rf.res.Complexity}
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
	for _, k := range keys {
		r := bestP[k]
		if prev, ok := lastLoss[k.form]; ok && r.Loss >= prev {
			continue
		}
		lastLoss[k.form] = r.Loss
		f := forms[k.form]
		n := activeTerms(r)
		d.Pareto = append(d.Pareto, Candidate{Name: fmt.Sprintf("%s-t%d-p%d", formName(f), n, k.params), Layout: f.Layout, Terms: n, Result: r})
	}
	if len(d.Pareto) == 0 {
		return nil, ErrNoCandidate
	}

	// 4. Classical presets on the same data.
	presetRes := make([]*Result, len(set.Presets))
	presetErr := make([]error, len(set.Presets))
	jobs = jobs[:0]
	for i, name := range set.Presets {
		i, name := i, name
		jobs = append(jobs, func() {
			st, err := PresetStructure(name)
			if err != nil {
				presetErr[i] = err
				return
			}
			presetRes[i], presetErr[i] = Fit(p, st, fitSet)
		})
	}
	pl.run(jobs)
	for i, name := range set.Presets {
		if presetErr[i] != nil {
			continue
		}
		r := presetRes[i]
		d.Presets = append(d.Presets, Candidate{Name: "preset:" + name, Layout: r.Structure.Layout, Terms: activeTerms(r), Result: r})
	}

	// 5. Leave-one-protocol-out cross-validation of every candidate that
	// could be its form's best: a candidate whose BIC is more than
	// cvBICWindow above its form's best is worse in-sample even after the
	// penalty for its size, and is not cross-validated.
	if len(p.Protocols) >= 2 {
		d.hasCV = true
		all := make([]*Candidate, 0, len(d.Pareto)+len(d.Presets))
		minBIC := map[string]float64{}
		for i := range d.Pareto {
			k := FormKey(d.Pareto[i].Result.Structure)
			if v, ok := minBIC[k]; !ok || d.Pareto[i].Result.BIC < v {
				minBIC[k] = d.Pareto[i].Result.BIC
			}
		}
		for i := range d.Pareto {
			if d.Pareto[i].Result.BIC-minBIC[FormKey(d.Pareto[i].Result.Structure)] <= cvBICWindow {
				all = append(all, &d.Pareto[i])
			}
		}
		for i := range d.Presets {
			all = append(all, &d.Presets[i])
		}
		crossValidate(p, all, fitSet, pl)
	}

	// 6. The verdict, then the pick inside its form.
	d.decide(p)

	// 7. The chosen model refitted on every point and polished, with its
	// profiles; the one-protocol cross matrix.
	best := d.Best()
	prof := set.Fit
	prof.Profile = true
	prof.Init = best.Result.Params()
	prof.NoScan = true
	if r, err := Fit(all, activeStructure(best.Result), prof); err == nil {
		// The polish uses the accurate quadrature, so a dispersed model's
		// loss may move by the search rule's error either way.
		if activeTerms(r) == best.Terms && (r.Structure.Planar || p != all || r.Loss <= best.Result.Loss*(1+1e-9)) {
			best.Result = r
		} else {
			best.Result.Profiles = r.Profiles
		}
	}
	d.CrossR2 = crossMatrix(p, best.Result, fitSet, pl)
	d.Elapsed = time.Since(start)
	return d, nil
}

// errVariant marks a form that discovery derives from another instead of
// searching it.
var errVariant = errors.New("derived from its ideal layout")

// planarVariant returns a form with its families spread in the plane;
// ok is false when a term cannot sit on such a family (cofactor and I5
// terms).
func planarVariant(st Structure) (Structure, bool) {
	for _, t := range st.Terms {
		if t.Family >= 0 && t.Shape.Arg != terms.Fibre {
			return st, false
		}
	}
	st.Planar = true
	return st, true
}

// formName names a model form for results: the layout, then "+dispersed"
// when the families spread in the plane with a learned concentration, or
// "+kappa" when they have a learned three-dimensional dispersion κ.
func formName(f Structure) string {
	switch {
	case f.Planar:
		return f.Layout.String() + "+dispersed"
	case f.Dispersion:
		return f.Layout.String() + "+kappa"
	}
	return f.Layout.String()
}

// PresetStructure returns the model form of a named preset. A preset's
// mirror pair is held symmetric about axis 1 (Structure.HoldPairAxis), as
// published; clear HoldPairAxis to learn the pair's axis as well.
func PresetStructure(name string) (Structure, error) {
	pr := terms.LookupPreset(name)
	if pr == nil {
		var names []string
		for _, p := range terms.Presets() {
			names = append(names, p.Name)
		}
		return Structure{}, fmt.Errorf("no preset %q; choose one of %s", name, strings.Join(names, ", "))
	}
	// A preset's pair is symmetric about axis 1, as published.
	st := Structure{Dispersion: pr.Dispersion, HoldPairAxis: pr.Mirror}
	switch {
	case pr.Families == 0:
		st.Layout = LayoutNone
	case pr.Families == 1:
		st.Layout = LayoutSingle
	case pr.Mirror:
		st.Layout = LayoutMirror
	default:
		st.Layout = LayoutFree
	}
	for _, t := range pr.Terms {
		sh := terms.Lookup(t.ID)
		if t.Family == 0 {
			st.Terms = append(st.Terms, TermSpec{Shape: sh, Family: -1})
			continue
		}
		if st.Layout == LayoutMirror && t.Family == 2 {
			continue // the mirror pair shares the first family's terms
		}
		st.Terms = append(st.Terms, TermSpec{Shape: sh, Family: t.Family - 1})
	}
	return st, nil
}

func hasTerm(st Structure, t TermSpec) bool {
	for _, u := range st.Terms {
		if u.Shape == t.Shape && u.Family == t.Family {
			return true
		}
	}
	return false
}

// activeStructure is r's form without its inactive terms.
func activeStructure(r *Result) Structure {
	st := r.Structure.withTerms(nil)
	for i, t := range r.Structure.Terms {
		if r.Weights[i] > 0 {
			st.Terms = append(st.Terms, t)
		}
	}
	return st
}

func activeTerms(r *Result) int {
	n := 0
	for _, w := range r.Weights {
		if w > 0 {
			n++
		}
	}
	return n
}

// layoutSatisfied reports whether every family of the layout still has an
// active fibre term (otherwise the fit is really a smaller layout).
func layoutSatisfied(r *Result) bool {
	nf := r.Structure.Layout.Families()
	if r.Structure.Layout == LayoutMirror {
		nf = 1
	}
	for f := 0; f < nf; f++ {
		ok := false
		for i, t := range r.Structure.Terms {
			if t.Family == f && r.Weights[i] > 0 {
				ok = true
			}
		}
		if !ok {
			return false
		}
	}
	return true
}

// cvBICWindow is how far above its form's best BIC a candidate may lie and
// still be cross-validated ("very strong" evidence against it beyond that;
// Kass & Raftery 1995).
const cvBICWindow = 10

// searchMaxIterations bounds each local refinement of the search: a form
// that fits badly creeps on by tiny steps, and the comparison of forms does
// not need its last digits.
const searchMaxIterations = 60

// searchTolerance is the refinement tolerance of discovery's search,
// cross-validation and comparison fits (see Settings.Tolerance).
const searchTolerance = 1e-6

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

// crossValidate fits every candidate's form with one protocol left out,
// warm-started from its full-data fit, and scores the held-out prediction.
func crossValidate(p *Problem, cands []*Candidate, set Settings, pl *pool) {
	nf := len(p.Protocols)
	folds := make([][]CVFold, len(cands))
	for i := range folds {
		folds[i] = make([]CVFold, nf)
	}
	var jobs []func()
	for ci, c := range cands {
		for f := 0; f < nf; f++ {
			ci, c, f := ci, c, f
			jobs = append(jobs, func() { folds[ci][f] = cvFold(p, c.Result, f, set) })
		}
	}
	pl.run(jobs)
	for ci, c := range cands {
		sc := &CVScore{Folds: folds[ci]}
		for _, f := range sc.Folds {
			sc.Mean += f.Error
		}
		sc.Mean /= float64(nf)
		v := 0.0
		for _, f := range sc.Folds {
			v += (f.Error - sc.Mean) * (f.Error - sc.Mean)
		}
		if nf > 1 {
			sc.StdErr = math.Sqrt(v/float64(nf-1)) / math.Sqrt(float64(nf))
		}
		c.CV = sc
	}
}

// HeldOut refits r's model form to every protocol of p but the f-th
// (index into p.Protocols), warm-started from r's parameters without an
// angle scan, and predicts the left-out protocol: the prediction on the
// rows of test, a Problem holding that protocol alone.
func HeldOut(p *Problem, r *Result, f int, set Settings) (pred []float64, test *Problem, err error) {
	held := p.Protocols[f]
	var keep []int
	for i, pi := range p.Protocols {
		if i != f {
			keep = append(keep, pi)
		}
	}
	train, err := NewProblem(p.Specimen, keep)
	if err != nil {
		return nil, nil, err
	}
	s := set
	s.Init = r.Params()
	s.NoScan = true
	s.Profile = false
	fit, err := Fit(train, r.Structure, s)
	if err != nil {
		return nil, nil, err
	}
	if test, err = NewProblem(p.Specimen, []int{held}); err != nil {
		return nil, nil, err
	}
	pred, err = Predict(test, fit.Model)
	return pred, test, err
}

// cvFold scores r's form on the f-th protocol left out.
func cvFold(p *Problem, r *Result, f int, set Settings) CVFold {
	fold := CVFold{Protocol: p.Specimen.Protocols[p.Protocols[f]].Label, Error: math.Inf(1)}
	pred, test, err := HeldOut(p, r, f, set)
	if err != nil {
		return fold
	}
	sse := 0.0
	for i, v := range pred {
		d := test.RowWeight[i] * (v - test.Measured[i])
		sse += d * d
	}
	fold.Error = math.Sqrt(sse / float64(len(test.Output.Components)))
	fold.Metrics = Metrics(test, pred)
	return fold
}

// crossMatrix fits the chosen form to each protocol alone and predicts
// every protocol, returning the mean R² over components.
func crossMatrix(p *Problem, r *Result, set Settings, pl *pool) [][]float64 {
	n := len(p.Protocols)
	out := make([][]float64, n)
	var jobs []func()
	for i := 0; i < n; i++ {
		i := i
		out[i] = make([]float64, n)
		jobs = append(jobs, func() {
			for j := range out[i] {
				out[i][j] = math.NaN()
			}
			train, err := NewProblem(p.Specimen, []int{p.Protocols[i]})
			if err != nil {
				return
			}
			s := set
			s.Init = r.Params()
			s.NoScan = true
			fit, err := Fit(train, r.Structure, s)
			if err != nil {
				return
			}
			for j := 0; j < n; j++ {
				test, err := NewProblem(p.Specimen, []int{p.Protocols[j]})
				if err != nil {
					continue
				}
				pred, err := Predict(test, fit.Model)
				if err != nil {
					continue
				}
				sum, cnt := 0.0, 0
				for _, m := range Metrics(test, pred) {
					if m.R2Defined {
						sum += m.R2
						cnt++
					}
				}
				if cnt > 0 {
					out[i][j] = sum / float64(cnt)
				}
			}
		})
	}
	pl.run(jobs)
	return out
}
