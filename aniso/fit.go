package aniso

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"
	"time"

	"github.com/weft-tools/weft/terms"
)

// Layout is how fibre families are arranged in a model form.
type Layout int

const (
	// LayoutNone has no fibre family: an isotropic model.
	LayoutNone Layout = iota
	// LayoutSingle has one family at a learned angle α.
	LayoutSingle
	// LayoutMirror has two families at θ + β and θ − β sharing every fibre
	// term's weight and parameters (Holzapfel, Gasser & Ogden 2000).
	LayoutMirror
	// LayoutFree has two families at independent angles α1, α2, each with
	// its own fibre terms.
	LayoutFree
)

// String returns "none", "single", "mirror" or "free".
func (l Layout) String() string {
	return [...]string{"none", "single", "mirror", "free"}[l]
}

// Families returns the number of fibre families of the layout.
func (l Layout) Families() int {
	switch l {
	case LayoutNone:
		return 0
	case LayoutSingle:
		return 1
	}
	return 2
}

// TermSpec is one term of a model form: a catalogue shape and, for fibre
// shapes, its family.
type TermSpec struct {
	Shape *terms.Shape
	// Family is −1 for isotropic shapes and 0 or 1 for fibre shapes. In a
	// mirror layout fibre terms use Family 0 and act on both members.
	Family int
}

// Label names the term as in results, e.g. "fib-expsq@f1".
func (t TermSpec) Label(l Layout) string {
	if t.Family < 0 {
		return t.Shape.ID
	}
	if l == LayoutMirror {
		return t.Shape.ID + "@pair"
	}
	return fmt.Sprintf("%s@f%d", t.Shape.ID, t.Family+1)
}

// Structure is a model form to fit: its terms, fibre layout and how the
// families spread about their mean direction.
type Structure struct {
	Terms  []TermSpec
	Layout Layout
	// Dispersion gives each family a learned three-dimensional dispersion
	// κ (Gasser, Ogden & Holzapfel 2006).
	Dispersion bool
	// Planar spreads each family's fibres in the plane with a learned von
	// Mises concentration b (angular integration, see planar.go; a mirror
	// pair shares one b). Only fibre-stretch terms (argument E_f) sit on
	// such families. Dispersion and Planar exclude each other.
	Planar bool
	// HoldPairAxis holds a mirror pair's mean direction θ at 0, so that the
	// families sit at ±β, symmetric about axis 1: the published form of
	// Holzapfel, Gasser & Ogden 2000 and Gasser, Ogden & Holzapfel 2006.
	// Since β ranges over [0°, 90°], a pair symmetric about axis 2 is the
	// same form (θ = 90°, β' = 90° − β). False (the default) learns θ.
	// Only a mirror layout uses it.
	HoldPairAxis bool
}

// withTerms returns the same form (layout and spread) with other terms.
func (s Structure) withTerms(ts []TermSpec) Structure {
	s.Terms = ts
	return s
}

// planarStartConcentration is where a learned concentration b starts: the
// density's standard deviation is then about 14°, between a wide spread
// and an ideal family.
const planarStartConcentration = 4

// Validate checks that the terms fit the layout.
func (s Structure) Validate() error {
	if len(s.Terms) == 0 {
		return errors.New("no terms: give at least one energy term")
	}
	nf := s.Layout.Families()
	fibre := false
	for _, t := range s.Terms {
		if t.Shape == nil {
			return errors.New("a term has no shape")
		}
		if !t.Shape.Arg.NeedsFamily() {
			if t.Family != -1 {
				return fmt.Errorf("%s is isotropic and takes no family", t.Shape.ID)
			}
			continue
		}
		fibre = true
		if nf == 0 {
			return fmt.Errorf("%s is a fibre-family term but the model has no fibre family; ask for 1 or 2 families", t.Shape.ID)
		}
		if t.Family < 0 || t.Family >= nf || (s.Layout == LayoutMirror && t.Family != 0) {
			return fmt.Errorf("%s: family %d does not exist in a %s layout", t.Shape.ID, t.Family, s.Layout)
		}
	}
	if nf > 0 && !fibre {
		return fmt.Errorf("%d fibre famil(ies) but no fibre term; add one such as fib-expsq", nf)
	}
	if (s.Dispersion || s.Planar) && nf == 0 {
		return errors.New("dispersion needs a fibre family")
	}
	if s.Dispersion && s.Planar {
		return errors.New("a family spreads either in the plane (concentration b) or in three dimensions (κ), not both")
	}
	if s.Planar {
		for _, t := range s.Terms {
			if t.Family >= 0 && t.Shape.Arg != terms.Fibre {
				return fmt.Errorf("%s: a family spread in the plane takes fibre-stretch terms only (argument E_f)", t.Shape.ID)
			}
		}
	}
	if s.HoldPairAxis && s.Layout != LayoutMirror {
		return fmt.Errorf("a held pair axis needs a mirror pair, not a %s layout", s.Layout)
	}
	return nil
}

// Settings tune a fit. The zero value gives the defaults.
type Settings struct {
	// ScanStepDeg is the coarse angle scan step in degrees: default 2.5
	// for one angle (5 for a family spread in the plane, whose loss varies
	// more slowly with its mean direction and costs an angular
	// integration per scan point), 10 for two.
	ScanStepDeg float64
	// Starts is how many of the best scan minima are refined locally
	// (default 3).
	Starts int
	// MaxIterations bounds each local refinement (default 200).
	MaxIterations int
	// Profile computes the profile of the loss over every angle parameter
	// (needed for profile-likelihood intervals and the report).
	Profile bool
	// ProfileStepDeg is the profile's grid step in degrees (default 2; 4
	// for two angles, whose profiles each re-optimise the other, and for a
	// family spread in the plane, whose profile varies slowly and costs an
	// angular integration per point; interval ends are refined by
	// bisection either way).
	ProfileStepDeg float64
	// Init, when non-nil, adds a starting point: non-linear parameters by
	// name (as in Result.Params; angles in radians). Parameters it does not
	// name start at their defaults.
	Init map[string]float64
	// NoScan skips the coarse angle scan and refines from Init alone (for
	// warm starts such as cross-validation folds).
	NoScan bool
	// SearchQuadrature integrates in-plane dispersed families with the
	// cheaper search rule (about 1e-5 relative instead of 1e-8, half the
	// directions), for fits that are only compared with each other; the
	// model finally reported is refitted without it.
	SearchQuadrature bool
	// Tolerance stops a local refinement once two accepted steps in a row
	// lower the loss by less than this fraction of it (default 1e-10).
	// Searches that only compare models use a looser one; the reported
	// model is polished at the default.
	Tolerance float64
}

func (s Settings) withDefaults(nAngles int, planar bool) Settings {
	if s.ScanStepDeg <= 0 {
		s.ScanStepDeg = 2.5
		if planar {
			s.ScanStepDeg = 5
		}
		if nAngles == 2 {
			s.ScanStepDeg = 10
		}
	}
	if s.Starts <= 0 {
		s.Starts = 3
	}
	if s.MaxIterations <= 0 {
		s.MaxIterations = 200
	}
	if s.ProfileStepDeg <= 0 {
		s.ProfileStepDeg = 2
		if nAngles == 2 || planar {
			s.ProfileStepDeg = 4
		}
	}
	if s.Tolerance <= 0 {
		s.Tolerance = 1e-10
	}
	return s
}

// Estimate is one fitted quantity with its uncertainty.
type Estimate struct {
	// Name identifies it, e.g. "weight[i1-lin]", "angle", "stiffening[fib-expsq@f1]".
	Name string
	// Kind is "weight", "angle", "dispersion" or "shape".
	Kind string
	// Term is the index into Structure.Terms for weights and shape
	// parameters, −1 otherwise.
	Term int
	// Value is the estimate in Unit ("deg" for angles, the stress unit for
	// weights, "" when dimensionless).
	Value float64
	Unit  string
	// StdErr and the 95 % interval [Lo, Hi] come from the Gauss–Newton
	// covariance scaled by the residual variance, the interval kept inside
	// the quantity's domain (weights ≥ 0, parameters within their bounds,
	// |α| and half angles within [0°, 90°]); they are NaN unless Status is
	// StatusEstimated or StatusCorrelated.
	StdErr, Lo, Hi float64
	// Status is one of StatusEstimated, StatusCorrelated,
	// StatusDegenerate, StatusInactive, StatusAtBound and
	// StatusNotDetermined (see StatusMeaning).
	Status string
}

// Metric is the fit quality of one protocol and stress component.
type Metric struct {
	Protocol  string
	Component string
	Points    int
	// R2 is 1 − SS_res/SS_tot; R2Defined is false when the measured
	// stress is constant (SS_tot = 0).
	R2        float64
	R2Defined bool
	// RMSE in the stress unit; NRMSE = RMSE / measured range (0 range: NaN
	// and NRMSEDefined false).
	RMSE, NRMSE  float64
	NRMSEDefined bool
	// Range is max − min of the measured stress.
	Range float64
}

// AngleProfile is the loss over one angle parameter, minimised over all
// other non-linear parameters and the weights at every grid angle: each
// angle is re-optimised from both neighbouring grid angles, and the loss is
// never above the best loss of the form without the family the angle moves
// (zero weights for that family are admissible at any angle). When a
// profile meets a lower loss than the fit, Fit refits from there and
// profiles again (at most maxProfileRefits times), so the fitted loss is
// the profile's minimum and its value at OptimumDeg.
type AngleProfile struct {
	// Name is the parameter's name ("angle", "angle_1", "mean_angle", ...).
	Name string
	// AnglesDeg and Loss are the grid and the profiled loss.
	AnglesDeg, Loss []float64
	// OptimumDeg is the fitted value; Threshold the loss level that bounds
	// the 95 % profile-likelihood interval [LoDeg, HiDeg]. Angles are modulo
	// 180°, so an interval may reach beyond ±90° (e.g. [80°, 97°] passes
	// through 90°); AnglesDeg itself is wrapped into (−90°, 90°].
	OptimumDeg, Threshold float64
	LoDeg, HiDeg          float64
	// Closed is false when the loss stays below the threshold to an end of
	// the range: the data do not bound the angle there.
	Closed bool
	// NotDetermined is true when the loss stays below the threshold over
	// the whole range (a full 180° period, or [0°, 90°] for |α| and for a
	// half angle): the data exclude no angle, LoDeg and HiDeg are NaN, and
	// the angle's Estimate has StatusNotDetermined.
	NotDetermined bool
	// Mirrored is true when only |α| was profiled (no shear information)
	// and the curve was mirrored to negative angles.
	Mirrored bool

	// minLoss and minTheta are the lowest point off the optimum and its
	// parameters, to refit from when it lies below the fit.
	minLoss  float64
	minTheta []float64
}

// Result is a fitted model form with its evidence.
type Result struct {
	Structure Structure
	// Model is the fitted model (mirror terms expanded to both families).
	Model *Model
	// Weights are the fitted weights per Structure.Terms, stress unit.
	Weights []float64
	// Estimates lists weights, angles, dispersions and shape parameters.
	Estimates []Estimate
	// Correlation between the fitted quantities (every Estimate whose
	// Status is estimated, correlated or degenerate, and those the data
	// turned out not to determine), named by CorrelationNames; Flags name
	// pairs with |r| > CorrelationFlagLevel, degenerate terms and angles
	// the data do not determine.
	Correlation      [][]float64
	CorrelationNames []string
	Flags            []string
	// Combinations state, per block of correlated estimates, the
	// combination the data do determine.
	Combinations []Combination
	// Loss is the weighted residual sum of squares; Rows the number of
	// residuals; FreeParams the number of estimated quantities (active
	// weights and non-linear parameters not held at a bound).
	Loss       float64
	Rows       int
	FreeParams int
	// Complexity counts the active terms and every non-linear parameter
	// they and the layout bring, whether or not it sits at a bound: the
	// size of the model form, used to prefer the simpler of two forms.
	Complexity int
	// AICc and BIC from the weighted residual sum of squares.
	AICc, BIC float64
	// Metrics per protocol and measured component.
	Metrics []Metric
	// Iterations and Evaluations of the local refinements; Elapsed wall
	// time of the fit (without profiles); ProfileElapsed of the profiles.
	Iterations, Evaluations int
	Elapsed, ProfileElapsed time.Duration
	// SignKnown is true when shear information identifies the angles' sign.
	SignKnown bool
	// Notes state what the data can and cannot determine.
	Notes []string
	// Profiles over every angle parameter (when Settings.Profile).
	Profiles []AngleProfile

	e     *engine
	theta []float64
	// alternates are the refined θ of the other starts with their losses,
	// best first (other local minima, used as anchors by discovery).
	alternates [][]float64
	// held are the shape parameters held at 0 for want of shear strain
	// (see heldShear).
	held []heldParam
}

// canonical orders a structure's terms as the catalogue lists them,
// isotropic terms first and then each family's, so that the same form gives
// the same card however it was assembled.
func canonical(st Structure) Structure {
	rank := map[*terms.Shape]int{}
	for i, sh := range terms.Catalogue() {
		rank[sh] = i
	}
	out := st
	out.Terms = append([]TermSpec(nil), st.Terms...)
	sort.SliceStable(out.Terms, func(a, b int) bool {
		ta, tb := out.Terms[a], out.Terms[b]
		if ta.Family != tb.Family {
			return ta.Family < tb.Family
		}
		return rank[ta.Shape] < rank[tb.Shape]
	})
	return out
}

// build makes the model and the parameter list of a structure.
func build(st Structure) (*Model, [][]int, []int, []param) {
	nf := st.Layout.Families()
	m := &Model{}
	famOf := make([]int, nf)
	for f := 0; f < nf; f++ {
		m.Families = append(m.Families, Family{Name: fmt.Sprintf("f%d", f+1), Planar: st.Planar, Concentration: planarStartConcentration})
		famOf[f] = f
	}
	var groups [][]int
	for _, t := range st.Terms {
		var g []int
		if t.Family < 0 {
			g = append(g, len(m.Terms))
			m.Terms = append(m.Terms, Term{Shape: t.Shape, Family: -1, Params: t.Shape.DefaultParams()})
		} else if st.Layout == LayoutMirror {
			for f := 0; f < 2; f++ {
				g = append(g, len(m.Terms))
				m.Terms = append(m.Terms, Term{Shape: t.Shape, Family: f, Params: t.Shape.DefaultParams()})
			}
		} else {
			g = append(g, len(m.Terms))
			m.Terms = append(m.Terms, Term{Shape: t.Shape, Family: t.Family, Params: t.Shape.DefaultParams()})
		}
		groups = append(groups, g)
	}
	var ps []param
	switch st.Layout {
	case LayoutSingle:
		ps = append(ps, param{Kind: kindAngle, Name: "angle", Angle: 0, Periodic: true})
	case LayoutMirror:
		// A held pair axis has no mean-angle parameter: θ stays 0 in
		// engine.apply.
		if !st.HoldPairAxis {
			ps = append(ps, param{Kind: kindAngle, Name: "mean_angle", Angle: 0, Periodic: true})
		}
		ps = append(ps, param{Kind: kindAngle, Name: "half_angle", Angle: 1, Lo: 0, Hi: math.Pi / 2})
	case LayoutFree:
		ps = append(ps, param{Kind: kindAngle, Name: "angle_1", Angle: 0, Periodic: true},
			param{Kind: kindAngle, Name: "angle_2", Angle: 1, Periodic: true})
	}
	if st.Planar {
		switch st.Layout {
		case LayoutSingle:
			ps = append(ps, param{Kind: kindConcentration, Name: "concentration", Families: []int{0}, Hi: FitMaxConcentration})
		case LayoutMirror:
			ps = append(ps, param{Kind: kindConcentration, Name: "concentration", Families: []int{0, 1}, Hi: FitMaxConcentration})
		case LayoutFree:
			ps = append(ps, param{Kind: kindConcentration, Name: "concentration_1", Families: []int{0}, Hi: FitMaxConcentration},
				param{Kind: kindConcentration, Name: "concentration_2", Families: []int{1}, Hi: FitMaxConcentration})
		}
	}
	if st.Dispersion {
		switch st.Layout {
		case LayoutSingle:
			ps = append(ps, param{Kind: kindKappa, Name: "dispersion", Families: []int{0}, Hi: MaxDispersion})
		case LayoutMirror:
			ps = append(ps, param{Kind: kindKappa, Name: "dispersion", Families: []int{0, 1}, Hi: MaxDispersion})
		case LayoutFree:
			ps = append(ps, param{Kind: kindKappa, Name: "dispersion_1", Families: []int{0}, Hi: MaxDispersion},
				param{Kind: kindKappa, Name: "dispersion_2", Families: []int{1}, Hi: MaxDispersion})
		}
	}
	for g, t := range st.Terms {
		for j, q := range t.Shape.Params {
			ps = append(ps, param{Kind: kindShape, Name: fmt.Sprintf("%s[%s]", q.Name, t.Label(st.Layout)), Group: g, Index: j, Lo: q.Min, Hi: q.Max})
		}
	}
	return m, groups, famOf, ps
}

// kappaGrid is the dictionary grid of the dispersion κ over its range;
// shape parameters take theirs from terms.Param.Grid. Used only to find
// starting points.
var kappaGrid = []float64{0, 0.15, 0.3}

// concentrationGrid spans wide (standard deviation of the density about
// 23°) and narrow (10°) in-plane spreads.
var concentrationGrid = []float64{1.5, 8}

// dictEntry says which structure term, shape parameter values and κ a
// dictionary column stands for.
type dictEntry struct {
	spec   int
	params [terms.MaxParams]float64
	hasP   bool
	kappa  int // index into kappaGrid (or concentrationGrid), or −1
}

// paramGrid returns every combination of a shape's scan-grid values that
// lie within the parameters' bounds (the first parameter varying
// slowest); a parameter without a grid stays at its default.
func paramGrid(sh *terms.Shape) [][terms.MaxParams]float64 {
	out := [][terms.MaxParams]float64{{}}
	for j, q := range sh.Params {
		values := []float64{q.Default}
		if len(q.Grid) > 0 {
			values = values[:0]
			for _, v := range q.Grid {
				if v >= q.Min && v <= q.Max {
					values = append(values, v)
				}
			}
		}
		var next [][terms.MaxParams]float64
		for _, c := range out {
			for _, v := range values {
				c[j] = v
				next = append(next, c)
			}
		}
		out = next
	}
	return out
}

// dictionary builds the stiffening- and dispersion-agnostic model used by the
// coarse angle scan: every shape parameter and κ replaced by copies on a
// grid, all in one non-negative least-squares problem, so that a scan over
// angles alone finds good starting points for everything.
func dictionary(st Structure) (*Model, [][]int, []int, []dictEntry) {
	nf := st.Layout.Families()
	kap := []float64{0}
	switch {
	case st.Dispersion:
		kap = kappaGrid
	case st.Planar:
		kap = concentrationGrid
	}
	m := &Model{}
	var famOf []int
	famIndex := map[[2]int]int{}
	for f := 0; f < nf; f++ {
		for ki, k := range kap {
			famIndex[[2]int{f, ki}] = len(m.Families)
			if st.Planar {
				m.Families = append(m.Families, Family{Planar: true, Concentration: k})
			} else {
				m.Families = append(m.Families, Family{Dispersion: k})
			}
			famOf = append(famOf, f)
		}
	}
	var groups [][]int
	var entries []dictEntry
	for s, t := range st.Terms {
		values := paramGrid(t.Shape)
		hasP := len(t.Shape.Params) > 0
		kis := []int{-1}
		if t.Family >= 0 {
			kis = kis[:0]
			for ki := range kap {
				kis = append(kis, ki)
			}
		}
		for _, v := range values {
			for _, ki := range kis {
				params := append([]float64(nil), v[:len(t.Shape.Params)]...)
				var g []int
				fams := []int{t.Family}
				if t.Family < 0 {
					fams = []int{-1}
				} else if st.Layout == LayoutMirror {
					fams = []int{0, 1}
				}
				for _, sf := range fams {
					fam := -1
					if sf >= 0 {
						fam = famIndex[[2]int{sf, ki}]
					}
					g = append(g, len(m.Terms))
					m.Terms = append(m.Terms, Term{Shape: t.Shape, Family: fam, Params: append([]float64(nil), params...)})
				}
				groups = append(groups, g)
				entries = append(entries, dictEntry{spec: s, params: v, hasP: hasP, kappa: ki})
			}
		}
	}
	return m, groups, famOf, entries
}

// scanPoint is one coarse-scan evaluation.
type scanPoint struct {
	angles [2]float64
	loss   float64
	i, j   int
}

// Fit learns the weights, fibre angles, dispersion and shape parameters of
// a model form from a Problem: a coarse scan of the angles over their whole
// period with a stiffening- and dispersion-agnostic dictionary, then bounded
// Levenberg–Marquardt refinement of the variable-projection objective from
// the best scan minima. The same input gives the same result, bit for bit.
func Fit(p *Problem, st Structure, set Settings) (*Result, error) {
	if err := st.Validate(); err != nil {
		return nil, err
	}
	st = canonical(st)
	start := time.Now()
	m, groups, famOf, params := build(st)
	params, held := heldShear(p, m, groups, params)
	nAngles := 0
	for _, q := range params {
		if q.Kind == kindAngle {
			nAngles++
		}
	}
	set = set.withDefaults(nAngles, st.Planar)
	res := &Result{Structure: st, Rows: p.Rows(), SignKnown: p.HasShear, held: held}

	var starts [][]float64
	if set.Init != nil {
		th := make([]float64, len(params))
		for i, q := range params {
			switch q.Kind {
			case kindShape:
				th[i] = st.Terms[q.Group].Shape.Params[q.Index].Default
			case kindConcentration:
				th[i] = planarStartConcentration
			}
			if v, ok := set.Init[q.Name]; ok {
				th[i] = q.project(v)
			}
			if q.Periodic && !p.HasShear {
				th[i] = offSymmetry(th[i])
			}
		}
		starts = append(starts, th)
	}
	if set.Init == nil || !set.NoScan {
		starts = append(starts, coarseStarts(p, st, set, nAngles, params)...)
	}
	e := newEngine(p, m, groups, famOf, st.Layout, params)
	e.tol = set.Tolerance
	e.cols.Search = set.SearchQuadrature
	best := math.Inf(1)
	var bestTheta []float64
	type local struct {
		theta []float64
		loss  float64
	}
	var locals []local
	for _, th := range starts {
		lr := e.minimize(th, nil, set.MaxIterations)
		res.Iterations += lr.Iterations
		res.Evaluations += lr.Evals
		if !math.IsInf(lr.Loss, 1) {
			locals = append(locals, local{append(make([]float64, 0, len(th)), th...), lr.Loss})
		}
		if lr.Loss < best {
			best = lr.Loss
			bestTheta = append(make([]float64, 0, len(th)), th...)
		}
	}
	sort.SliceStable(locals, func(a, b int) bool { return locals[a].loss < locals[b].loss })
	for _, l := range locals {
		res.alternates = append(res.alternates, l.theta)
	}
	if bestTheta == nil || math.IsInf(best, 1) {
		return nil, errors.New("every starting point overflows: an exponential or limiting term cannot follow these stretches; try a smaller model, a preset without exponential terms, or check the stress unit")
	}
	res.settle(p, e, bestTheta)
	res.Elapsed = time.Since(start)
	if set.Profile && nAngles > 0 {
		t0 := time.Now()
		res.profiles(p, set)
		// A profile that meets a lower loss than the local refinements
		// reached: refit from there, so that the fit is the profile's
		// minimum, and profile again.
		for round := 0; round < maxProfileRefits; round++ {
			th, l := res.profileMinimum()
			if !(l < res.Loss*(1-1e-9)) {
				break
			}
			lr := e.minimize(th, nil, set.MaxIterations)
			res.Iterations += lr.Iterations
			res.Evaluations += lr.Evals
			if !(lr.Loss < res.Loss) {
				break
			}
			res.settle(p, e, th)
			res.profiles(p, set)
		}
		res.ProfileElapsed = time.Since(t0)
	}
	return res, nil
}

// maxProfileRefits bounds the refits from lower points met by profiles;
// each round lowers the loss, and one round is the rule.
const maxProfileRefits = 3

// settle fills the result from the engine's optimum θ: weights, model,
// estimates, metrics and notes, replacing whatever an earlier optimum
// left.
func (r *Result) settle(p *Problem, e *engine, theta []float64) {
	e.eval(theta, true)
	r.e, r.theta = e, theta
	r.Loss = e.loss
	r.Model = cloneModelDeep(e.model)
	r.Weights = make([]float64, len(r.Structure.Terms))
	for g, members := range e.groups {
		r.Weights[g] = e.w[g]
		for _, k := range members {
			r.Model.Terms[k].Weight = e.w[g]
		}
	}
	for f := range r.Model.Families {
		a := wrapAngle(r.Model.Families[f].Angle)
		if !p.HasShear {
			// Only |α| is identified without shear information. Write the
			// first family at +|α| and the second at −|α|, so that a
			// mirror pair reads as the usual ±β.
			a = math.Abs(a)
			if f == 1 && a != math.Pi/2 {
				a = -a
			}
		}
		r.Model.Families[f].Angle = a
	}
	r.Estimates, r.Correlation, r.CorrelationNames, r.Flags, r.Combinations = nil, nil, nil, nil, nil
	r.FreeParams, r.Complexity, r.Metrics, r.Notes, r.Profiles = 0, 0, nil, nil, nil
	r.uncertainty(p)
	r.metrics(p)
	r.notes(p)
	r.greenNotes(p, r.held)
}

// offSymmetry moves an angle that sits on 0 or 90° (stationary points of
// the loss by mirror symmetry when the data have no shear) by half a degree.
func offSymmetry(a float64) float64 {
	const nudge = 0.5 * math.Pi / 180
	w := wrapAngle(a)
	switch {
	case math.Abs(w) < nudge/2:
		return nudge
	case math.Pi/2-math.Abs(w) < nudge/2:
		return math.Pi/2 - nudge
	}
	return a
}

// coarseStarts scans the angle parameters with the dictionary model and
// returns starting θ vectors for the best local minima.
func coarseStarts(p *Problem, st Structure, set Settings, nAngles int, params []param) [][]float64 {
	dm, dg, dfam, entries := dictionary(st)
	var dparams []param
	for _, q := range params {
		if q.Kind == kindAngle {
			dparams = append(dparams, q)
		}
	}
	de := newEngine(p, dm, dg, dfam, st.Layout, dparams)
	de.skipOverflow = true
	if st.Planar {
		de.cols.scan = &planarScan{}
	}
	step := Rad(set.ScanStepDeg)
	grid := func(q param) []float64 {
		// Periodic grids are offset by half a step: without shear, α = 0
		// and α = 90° are stationary points of the loss by symmetry, where a
		// local refinement would never move.
		lo, hi := -math.Pi/2+step/2, math.Pi/2
		if !q.Periodic {
			lo, hi = q.Lo, q.Hi
		} else if !p.HasShear {
			// Without shear only |α| matters (package documentation, Mirror symmetry).
			lo = step / 2
		}
		var g []float64
		for x := lo; x <= hi+1e-12; x += step {
			g = append(g, x)
		}
		return g
	}
	var pts []scanPoint
	var g0, g1 []float64
	switch nAngles {
	case 0:
		pts = append(pts, scanPoint{loss: de.eval(nil, false)})
	case 1:
		g0 = grid(dparams[0])
		for i, a := range g0 {
			pts = append(pts, scanPoint{angles: [2]float64{a}, loss: de.eval([]float64{a}, false), i: i})
		}
	case 2:
		g0, g1 = grid(dparams[0]), grid(dparams[1])
		for i, a := range g0 {
			for j, b := range g1 {
				// Free families are interchangeable: scan α1 ≤ α2 only.
				if st.Layout == LayoutFree && b < a {
					pts = append(pts, scanPoint{angles: [2]float64{a, b}, loss: math.NaN(), i: i, j: j})
					continue
				}
				pts = append(pts, scanPoint{angles: [2]float64{a, b}, loss: de.eval([]float64{a, b}, false), i: i, j: j})
			}
		}
	}
	// Local minima of the scan (periodic in a periodic angle), best first.
	var cands []scanPoint
	for k, pt := range pts {
		if math.IsNaN(pt.loss) || math.IsInf(pt.loss, 1) {
			continue
		}
		if nAngles >= 1 && !isLocalMin(pts, k, len(g0), len(g1), nAngles, dparams, p.HasShear) {
			continue
		}
		cands = append(cands, pt)
	}
	sort.SliceStable(cands, func(a, b int) bool { return cands[a].loss < cands[b].loss })
	if len(cands) > set.Starts {
		cands = cands[:set.Starts]
	}
	var starts [][]float64
	for _, c := range cands {
		th := make([]float64, len(params))
		var ang []float64
		if nAngles > 0 {
			ang = c.angles[:nAngles]
		}
		de.eval(ang, false)
		k := 0
		for i, q := range params {
			switch q.Kind {
			case kindAngle:
				th[i] = c.angles[k]
				k++
			case kindKappa:
				th[i] = dominantSpread(de, entries, st, q.Families, kappaGrid)
			case kindConcentration:
				th[i] = dominantSpread(de, entries, st, q.Families, concentrationGrid)
			case kindShape:
				th[i] = dominantParam(de, entries, q, st.Terms[q.Group].Shape.Params[q.Index])
			}
		}
		starts = append(starts, th)
	}
	return starts
}

func isLocalMin(pts []scanPoint, k, n0, n1, nAngles int, dparams []param, shear bool) bool {
	l := pts[k].loss
	at := func(i, j int) float64 {
		if nAngles == 1 {
			return pts[i].loss
		}
		return pts[i*n1+j].loss
	}
	wrap := func(i, n int, q param) (int, bool) {
		if i >= 0 && i < n {
			return i, true
		}
		if q.Periodic && shear {
			return (i + n) % n, true
		}
		return 0, false
	}
	i, j := pts[k].i, pts[k].j
	for di := -1; di <= 1; di++ {
		for dj := -1; dj <= 1; dj++ {
			if di == 0 && dj == 0 || (nAngles == 1 && dj != 0) {
				continue
			}
			ii, ok := wrap(i+di, n0, dparams[0])
			if !ok {
				continue
			}
			jj := 0
			if nAngles == 2 {
				jj, ok = wrap(j+dj, n1, dparams[1])
				if !ok {
					continue
				}
			}
			v := at(ii, jj)
			if !math.IsNaN(v) && v < l {
				return false
			}
		}
	}
	return true
}

// dominantParam returns the grid value of a structure term's shape
// parameter sp (fit parameter q) in the dictionary column that carries
// the largest share of stress.
func dominantParam(de *engine, entries []dictEntry, q param, sp terms.Param) float64 {
	best, v := 0.0, math.NaN()
	for g, en := range entries {
		if en.spec != q.Group || !en.hasP {
			continue
		}
		if c := de.w[g] * de.norm[g]; c > best {
			best, v = c, en.params[q.Index]
		}
	}
	if math.IsNaN(v) {
		// The term takes no stress in the scan: start it where it is
		// gentlest, which cannot overflow where a steeper start might.
		v = sp.IdleStart
	}
	return math.Min(q.Hi, math.Max(q.Lo, v))
}

// dominantSpread returns the spread (κ or concentration, from grid) of the
// dictionary fibre column with the largest share of stress in the given
// structural families.
func dominantSpread(de *engine, entries []dictEntry, st Structure, fams []int, grid []float64) float64 {
	best, v := 0.0, grid[0]
	for g, en := range entries {
		if en.kappa < 0 {
			continue
		}
		t := st.Terms[en.spec]
		if !containsInt(fams, t.Family) {
			continue
		}
		if c := de.w[g] * de.norm[g]; c > best {
			best, v = c, grid[en.kappa]
		}
	}
	return v
}

func cloneModelDeep(m *Model) *Model {
	c := &Model{Families: append([]Family(nil), m.Families...)}
	for _, t := range m.Terms {
		t.Params = append([]float64(nil), t.Params...)
		c.Terms = append(c.Terms, t)
	}
	return c
}

// notes writes what the data can and cannot determine (package
// documentation, Mirror symmetry).
func (r *Result) notes(p *Problem) {
	nf := r.Structure.Layout.Families()
	if nf > 0 {
		if p.HasShear {
			r.Notes = append(r.Notes, "The data carry shear information (F12/F21 or a shear stress), so the sign of each fibre angle is identified.")
		} else {
			r.Notes = append(r.Notes, "The data carry no shear information (pure biaxial stretch, no shear stress measured): the sign of a fibre angle cannot be determined, so angles are reported as ±|α|, and one family at α cannot be told from a mirror pair at ±α with half the weight each. Shear from markers or an off-axis protocol would decide it.")
		}
	}
	switch {
	case r.Structure.Layout == LayoutMirror && r.Structure.HoldPairAxis:
		r.Notes = append(r.Notes, "The pair's axis is held on axis 1, as in the published form (Holzapfel, Gasser & Ogden 2000): the families sit at ±β, symmetric about axis 1 (a pair symmetric about axis 2 is the same form with β' = 90° − β). A pair whose axis is turned away from the loading axes is not part of this form; learn the axis to test for one.")
	case r.Structure.Layout == LayoutMirror && !p.HasShear:
		r.Notes = append(r.Notes, "Without shear information a mirror pair at θ ± β has the same normal stresses as θ' = θ − 90°, β' = 90° − β (and as −θ ± β): the pair's mean and half angle are reported as fitted, and the families' angles ±|α| in the model card are what the data determine.")
	}
	if r.Structure.Dispersion {
		for _, t := range r.Structure.Terms {
			if t.Shape.Arg == terms.I1 && len(t.Shape.Params) > 0 {
				r.Notes = append(r.Notes, "A dispersed fibre family acts partly like an isotropic I1 term; dispersion and "+t.Shape.ID+" compete, see the correlation flags.")
				break
			}
		}
	}
	for _, t := range r.Model.Terms {
		if t.Weight > 0 && (t.Shape.Arg == terms.Fifth || t.Shape.Arg == terms.Cofactor) {
			r.Notes = append(r.Notes, "Planar biaxial data constrain the in-plane response only; the out-of-plane and I5 response is not fully determined by them (Holzapfel & Ogden 2009).")
			break
		}
	}
	for _, c := range r.Combinations {
		r.Notes = append(r.Notes, c.Text)
	}
	for _, est := range r.Estimates {
		if est.Status == StatusAtBound {
			r.Notes = append(r.Notes, fmt.Sprintf("%s sits at a bound of its range (%g); the data push it there, so treat it as a limit, not an estimate.", est.Name, est.Value))
		}
	}
}

// Params returns the fitted non-linear parameters by name (angles in
// radians), for warm starts of related fits.
func (r *Result) Params() map[string]float64 {
	out := map[string]float64{}
	for i, q := range r.e.params {
		out[q.Name] = r.theta[i]
	}
	return out
}

// Summary is a one-line description of the fitted form.
func (r *Result) Summary() string {
	var ids []string
	for i, t := range r.Structure.Terms {
		if r.Weights[i] > 0 {
			ids = append(ids, t.Label(r.Structure.Layout))
		}
	}
	return fmt.Sprintf("%s, %s layout, loss %.4g", strings.Join(ids, " + "), r.Structure.Layout, r.Loss)
}
