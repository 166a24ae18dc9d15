package aniso

import (
	"errors"
	"fmt"
	"runtime"
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
	// neo-hookean, hgo, goh, fung, and fung-general when the data have
	// in-plane shear strain: without it fung-general's couplings are held
	// at 0 and it is fung).
	Presets []string
	// SearchPoints is the most points per protocol that the search,
	// cross-validation and selection use (default DefaultSearchPoints;
	// see searchpoints.go); the chosen model is refitted on every point.
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
	// NotCrossValidated says why a candidate of the front was not
	// cross-validated: NotValidatedBIC, NotValidatedAtBound or
	// NotValidatedCoincident; empty when it was, and without
	// cross-validation (a single protocol).
	NotCrossValidated string
}

// Why a candidate was not cross-validated (Candidate.NotCrossValidated).
const (
	// NotValidatedBIC: its BIC lies more than cvBICWindow (10) above its
	// form's best.
	NotValidatedBIC = "bic-window"
	// NotValidatedAtBound: every family of it is spread at the fit's
	// bound on the concentration (FitMaxConcentration), an ideal family:
	// its ideal form's model with a parameter more.
	NotValidatedAtBound = "concentration-bound"
	// NotValidatedCoincident: its two families point the same way
	// (within 2°), which is one family.
	NotValidatedCoincident = "coincident"
)

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

// Discover finds which catalogue terms and how many fibre families the
// data support. For each form (layout, ideal or spread) it fits the whole
// candidate set (non-negativity already zeroes many weights), searches
// every subset of up to K terms at the learned angles and shape parameters
// with non-negative least squares on the cross products, refits the best
// subsets of each size with their own angles and shape parameters, grows
// them term by term, refits the best one-family models with a second
// family of the same kind and as a mirror pair, and cross-validates by leaving one protocol
// out. The verdict on the fibre families comes first, from whole forms
// (select.go); the pick inside the winning form follows the
// one-standard-error rule (Hastie, Tibshirani & Friedman 2009, §7.10). The
// stages are methods of search, each in a file named after it (package
// documentation, Where things live), called in turn: searchForms (which a
// cohort's scouts share: fitFullForms, refitSubsets, forwardSteps,
// secondFamilyRefits, planarVariants, mirrorRefits), paretoFront,
// comparePresets, candidateMetrics, crossValidate, decide and polish.
func Discover(all *Problem, set DiscoverSettings) (*Discovery, error) {
	start := time.Now()
	s, err := newSearch(all, set)
	if err != nil {
		return nil, err
	}
	s.searchForms()
	if err := s.paretoFront(); err != nil {
		return nil, err
	}
	s.comparePresets()
	s.candidateMetrics()
	s.crossValidate()
	s.d.decide(s.p, s.set.NoPlanar)
	s.polish()
	s.d.Elapsed = time.Since(start)
	return s.d, nil
}

// searchForms runs the stages that fit candidate models: the full forms,
// the term subsets and forward steps, the second-family refits, the
// spread variants and the mirror refits. Discover and a cohort's scouts
// both search so.
func (s *search) searchForms() {
	s.fitFullForms()
	s.refitSubsets()
	s.forwardSteps()
	s.secondFamilyRefits()
	s.planarVariants()
	s.mirrorRefits()
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
	// fullAt is the isotropic form's full fit's parameters at its best
	// optimum, with the terms it gives no weight at their own best shape
	// parameters (idleProfiled); its forward steps start from them. Nil
	// for the other forms, whose forward steps start from the full fit's
	// own parameters.
	fullAt  []map[string]float64
	presets []*Result // per DiscoverSettings.Presets; nil where the fit failed
	refits  []*refit
}

// refit is one candidate form's fit, warm-started from init.
type refit struct {
	form int
	st   Structure
	init map[string]float64
	// scan also starts the refit from the coarse angle scan's best minima
	// (Settings.NoScan false), not from init alone.
	scan bool
	res  *Result
}

// sizeKey indexes the best refit of a form at one number of active terms.
type sizeKey struct{ form, size int }

// newSearch checks the data, takes the search subset and sets up the forms.
func newSearch(all *Problem, set DiscoverSettings) (*search, error) {
	defaultPresets := set.Presets == nil
	set = set.withDefaults()
	p, err := searchSubset(all, set.SearchPoints)
	if err != nil {
		return nil, err
	}
	if defaultPresets && p.Data.hasShearStrain() {
		// Turned material axes show only with shear (fung.go): Tong &
		// Fung's form, in the tester's axes, cannot follow them there.
		set.Presets = append(set.Presets, "fung-general")
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

// searchMaxIterations bounds each local refinement of the search: a form
// that fits badly creeps on by tiny steps, and the comparison of forms does
// not need its last digits.
const searchMaxIterations = 60

// searchTolerance is the refinement tolerance of discovery's search,
// cross-validation and comparison fits (see Settings.Tolerance).
const searchTolerance = 1e-6
