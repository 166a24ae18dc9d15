package aniso

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
)

// Planning the next test: which single additional test — a stretch ratio
// not yet run, the same specimen mounted off-axis, or a protocol on sutures
// with marker-tracked shear — would help most, scored with the fitted
// model's own predictions. Two scores per planned test:
//
//   - information: the D-optimal gain log det(JᵀJ + J_cᵀJ_c) − log det(JᵀJ)
//     (Atkinson & Donev 1992, Optimum Experimental Designs), J the Jacobian
//     of the weighted stresses of the fitted data with respect to the
//     estimated quantities at the optimum (the Gauss–Newton Jacobian of the
//     fit's covariance) and J_c that of the planned test's rows, weighted as
//     package biaxial weights a protocol; and the predicted narrowing of
//     each quantity's 95 % interval. The planned test is assumed measured
//     as precisely, relative to its own stress range, as the tests fitted,
//     so that its weighted residuals share the fit's noise level and the
//     level cancels from the gain.
//   - discrimination: for each Question, the summed squared difference of
//     the predicted weighted stresses of two explanations over the planned
//     test's rows in units of the noise level estimated from the fit's
//     residuals, D = Σ ((ŷ_A − ŷ_B)/σ)² (the criterion of Hunter & Reiner
//     1965, Technometrics 7:307–323, for Gaussian noise), for the weakest
//     pair of explanations. A question counts as settled when D ≥
//     SettleLevel.
//
// Both rest on the current model: they hold if its family of models is
// right, and say nothing about what a model outside it would do.

const (
	// SettleLevel is the discrimination D (squared noise units) at which a
	// planned test settles a question: a separation of √25 = 5 noise
	// standard deviations between the weakest pair of explanations, an
	// expected log-likelihood ratio of D/2 = 12.5 in favour of the true one.
	SettleLevel = 25.0
	// InformationMargin is how much larger (in nats of log det) the
	// information gain of a planned test that settles no verdict question
	// must be than that of one that does for it to rank above it: ln 10, a
	// joint confidence region √10 ≈ 3.2 times smaller in volume.
	InformationMargin = math.Ln10
	// ExtrapolationMargin is the tolerance, as a fraction of the largest
	// strain tested (λ − 1), beyond the tested range of the principal
	// stretches and of each family's fibre stretch before a planned test is
	// flagged as extrapolating.
	ExtrapolationMargin = 0.05
	// sameDirectionDeg: a planned ratio whose strain direction lies within
	// this angle of a fitted protocol's is already run (the angle package
	// biaxial uses to tell protocols apart).
	sameDirectionDeg = 5
)

// DesignRatios are the stretch ratios offered by default: the target
// strains (λ1 − 1):(λ2 − 1) of the tester's axes, from strip-biaxial along
// axis 1 (1:0, axis 2 held at stretch 1) through equibiaxial to
// strip-biaxial along axis 2 (0:1).
var DesignRatios = [][2]float64{{1, 0}, {1, 0.25}, {1, 0.5}, {1, 0.75}, {1, 1}, {0.75, 1}, {0.5, 1}, {0.25, 1}, {0, 1}}

// DesignMountingsDeg are the off-axis mountings ψ offered by default, in
// degrees from the current axis 1 towards axis 2.
var DesignMountingsDeg = []float64{15, 30, 45, 60, 75}

// DesignSettings tune PlanTests. The zero value gives the defaults.
type DesignSettings struct {
	// Ratios are the target strain ratios offered (default DesignRatios).
	Ratios [][2]float64
	// MountingsDeg are the off-axis mountings offered in degrees; nil
	// means DesignMountingsDeg, an empty non-nil slice none.
	MountingsDeg []float64
	// Points is the number of points of a planned test; default the median
	// number of points of the fitted protocols.
	Points int
	// NoSutured leaves out the tests on sutures with marker-tracked shear.
	NoSutured bool
}

// PlannedTest is one candidate next test.
type PlannedTest struct {
	// Label names its strain ratio, e.g. "1:0.5"; Ratio is the same as
	// the target strains (λ1 − 1, λ2 − 1) of the tester's axes relative to
	// the larger, which is 1.
	Label string
	Ratio [2]float64
	// MountingDeg is ψ: the specimen cut or mounted with the tester's axis
	// 1 at ψ degrees from the current axis 1 (towards axis 2); 0 for the
	// current mounting.
	MountingDeg float64
	// Sutured is true for a specimen whose edges are free to shear
	// (sutures or rakes passing normal loads only), its shear F12, F21
	// tracked by markers and its shear tractions, zero, part of the data.
	Sutured bool
	// ShearMeasured is true when shear stress components are part of the
	// planned data (Sutured, or the fitted data had them).
	ShearMeasured bool
	// Path is the target deformation along the loading branch in the
	// tester's axes of the mounting (a pure stretch; on sutures with the
	// shear the fitted model predicts); SpecimenPath is the same
	// deformation in the fit's axes, R(ψ) F R(ψ)ᵀ.
	Path, SpecimenPath [][4]float64
}

// Describe says in words what the test is.
func (t *PlannedTest) Describe() string {
	s := t.Label
	if t.MountingDeg != 0 {
		s += fmt.Sprintf(" mounted at %g°", t.MountingDeg)
	}
	if t.Sutured {
		s += " on sutures, shear from markers"
	}
	return s
}

// QuestionScore is how well a planned test tells a question's explanations
// apart.
type QuestionScore struct {
	// Discrimination is D of the weakest pair of explanations (squared
	// noise units); Weakest indexes that pair in Question.Explanations.
	Discrimination float64
	Weakest        [2]int
	// Settled is true when Discrimination ≥ SettleLevel.
	Settled bool

	// verdict copies the question's Verdict, for ranking.
	verdict bool
}

// Shrink is the predicted narrowing of one quantity's 95 % interval:
// 1 − (interval width with the planned test) / (current width).
type Shrink struct {
	Name     string
	Fraction float64
}

// TestScore is a planned test with its scores.
type TestScore struct {
	Test PlannedTest
	// InformationGain is the D-optimal gain in nats; without shear
	// information the smallest over the sign variants of the fitted
	// angles (the sign the data cannot tell). Shrink lists, per estimated
	// quantity in Design.Parameters order, the narrowing of its interval
	// under the same variant.
	InformationGain float64
	Shrink          []Shrink
	// Questions scores each of Design.Questions.
	Questions []QuestionScore
	// SettlesVerdict is true when it settles a question the verdict left
	// open (Question.Verdict).
	SettlesVerdict bool
	// Extrapolates is true when a state of the test lies outside the tested
	// range of the principal stretches or of a family's fibre stretch by
	// more than ExtrapolationMargin; Outside says where.
	Extrapolates bool
	Outside      []string
}

// Design is the ranked list of planned tests of a fit.
type Design struct {
	// Noise is the noise level σ̂ of the weighted residuals,
	// √(loss / (rows − p)), p every free parameter of the fit whatever
	// its status (Result.FreeParams), not only the estimated quantities.
	Noise float64
	// Parameters are the estimated quantities whose information counts
	// (status estimated or correlated), by Estimate name.
	Parameters []string
	// Questions are the choices scored.
	Questions []Question
	// Tests are ranked (see rank): those that settle a verdict question
	// first, then the others, each by information gain, tests within the
	// tested range before those that extrapolate; one of the others ranks
	// above one that settles only when its gain is larger by more than
	// InformationMargin.
	Tests []TestScore
	// PeakStretch is the largest principal stretch tested, where every
	// planned test peaks; Points the points per planned test.
	PeakStretch float64
	Points      int
	// Notes say what was left out and why.
	Notes []string

	// d scores further predictions along the planned tests (Along).
	d *designer
}

// designer holds what every planned test is scored against.
type designer struct {
	p     *Problem
	r     *Result
	qs    []Question
	sigma float64
	// est are the Estimate indices of the quantities whose information
	// counts; info the models of r under the sign variants scored for
	// information, and base the information of the fitted data under each.
	est  []int
	info []*Model
	base []infoBase
	// tested ranges: principal stretches and each family's fibre stretch
	// (r.Model's families).
	lamLo, lamHi float64
	fibre        [][2]float64
	margin       float64
	// points is the number of points of a planned test.
	points int
}

// PlanTests scores and ranks candidate next tests for a fit r of problem p
// (r must come from Fit or Discover on p) and the open questions qs (see
// LayoutQuestion and Question).
func PlanTests(p *Problem, r *Result, qs []Question, set DesignSettings) (*Design, error) {
	if r == nil || r.e == nil || r.e.p != p {
		return nil, errors.New("the fit was not made on this problem; plan tests from the Result of Fit or Discover on it")
	}
	d := &designer{p: p, r: r, qs: qs}
	for i := range qs {
		if len(qs[i].Explanations) < 2 {
			return nil, fmt.Errorf("question %q has fewer than two explanations", qs[i].Text)
		}
	}
	for j, e := range r.Estimates {
		if (e.Status == StatusEstimated || e.Status == StatusCorrelated) && j < len(r.Structure.Terms)+len(r.e.params) {
			d.est = append(d.est, j)
		}
	}
	if len(d.est) == 0 {
		return nil, errors.New("the fit estimates no quantity, so no test can add information")
	}
	if r.Rows <= r.FreeParams || !(r.Loss > 0) {
		return nil, errors.New("the fit has no residual degrees of freedom, so its noise level is unknown")
	}
	d.sigma = math.Sqrt(r.Loss / float64(r.Rows-r.FreeParams))
	d.testedRanges()
	out := &Design{Noise: d.sigma, Questions: qs, PeakStretch: d.lamHi, d: d}
	for _, j := range d.est {
		out.Parameters = append(out.Parameters, r.Estimates[j].Name)
	}
	d.info = infoVariants(r)
	for _, m := range d.info {
		b, err := d.baseInformation(m)
		if err != nil {
			return nil, err
		}
		d.base = append(d.base, b)
	}
	set = d.settings(set)
	d.points, out.Points = set.Points, set.Points
	tests, notes := d.candidates(set)
	for _, e := range r.Estimates {
		if e.onMirrorLine {
			// Its slope is zero on the line: a linearised information
			// count has nothing to say about it.
			notes = append(notes, fmt.Sprintf("%s lies on a symmetry line (%g°) without shear information: the stresses have no slope in it there, so it is left out of the information gain and the interval shrinks (its interval is its profile's)", e.Name, e.Value))
		}
	}
	out.Notes = notes
	skipped := map[string]int{}
	var skipOrder []string
	for _, t := range tests {
		sc, err := d.score(t)
		if err != nil {
			if skipped[err.Error()] == 0 {
				skipOrder = append(skipOrder, err.Error())
			}
			skipped[err.Error()]++
			continue
		}
		out.Tests = append(out.Tests, sc)
	}
	for _, why := range skipOrder {
		out.Notes = append(out.Notes, fmt.Sprintf("%d planned test(s) could not be scored: %s", skipped[why], why))
	}
	if len(out.Tests) == 0 {
		return nil, errors.New("no planned test could be scored")
	}
	out.Tests = rank(out.Tests)
	return out, nil
}

// infoVariants are the models under which information is scored: the
// fitted model, and without shear information its sign variants that keep
// every quantity's meaning (all of them for one family or two free
// families; for a mirror pair only the mirror image of the whole pair, as
// flipping one member would exchange the meaning of its mean and half
// angle).
func infoVariants(r *Result) []*Model {
	if r.SignKnown || len(r.Model.Families) == 0 {
		return []*Model{r.Model}
	}
	if r.Structure.Layout == LayoutMirror {
		all := cloneModelDeep(r.Model)
		for f := range all.Families {
			all.Families[f].Angle = -all.Families[f].Angle
		}
		if sameDirections(all, r.Model) {
			return []*Model{r.Model}
		}
		return []*Model{r.Model, all}
	}
	return SignVariants(r.Model)
}

// settings fills the defaults.
func (d *designer) settings(set DesignSettings) DesignSettings {
	if set.Ratios == nil {
		set.Ratios = DesignRatios
	}
	if set.MountingsDeg == nil {
		set.MountingsDeg = DesignMountingsDeg
	}
	if set.Points <= 0 {
		var n []int
		for _, pi := range d.p.Protocols {
			n = append(n, len(d.p.Specimen.Protocols[pi].Points))
		}
		sort.Ints(n)
		set.Points = max(n[len(n)/2], 5)
	}
	return set
}

// ratioLabel writes a ratio as protocols are labelled, e.g. "1:0.5".
func ratioLabel(r [2]float64) string {
	return strconv.FormatFloat(r[0], 'g', -1, 64) + ":" + strconv.FormatFloat(r[1], 'g', -1, 64)
}

// rank orders scored tests. Those that settle a verdict question come
// first: settling is what matters, so they are ordered by the number of
// verdict questions they settle, then those that stay within the tested
// range before those that extrapolate (their predictions, on which the
// settling rests, are less sure), then by information gain. The others
// follow in the same way by information gain. Merging the two lists, one
// of the others goes first only when its gain exceeds the next settling
// test's by more than InformationMargin. Ties keep the order the tests
// were generated in.
func rank(ts []TestScore) []TestScore {
	var settle, rest []TestScore
	for _, t := range ts {
		if t.SettlesVerdict {
			settle = append(settle, t)
		} else {
			rest = append(rest, t)
		}
	}
	byGain := func(l []TestScore) func(a, b int) bool {
		return func(a, b int) bool {
			na, nb := settledVerdicts(l[a]), settledVerdicts(l[b])
			if na != nb {
				return na > nb
			}
			if l[a].Extrapolates != l[b].Extrapolates {
				return !l[a].Extrapolates
			}
			return less(l[b].InformationGain, l[a].InformationGain)
		}
	}
	sort.SliceStable(settle, byGain(settle))
	sort.SliceStable(rest, byGain(rest))
	out := make([]TestScore, 0, len(ts))
	for len(settle) > 0 && len(rest) > 0 {
		if rest[0].InformationGain > settle[0].InformationGain+InformationMargin {
			out, rest = append(out, rest[0]), rest[1:]
		} else {
			out, settle = append(out, settle[0]), settle[1:]
		}
	}
	out = append(out, settle...)
	return append(out, rest...)
}

// settledVerdicts returns how many verdict questions t settles.
func settledVerdicts(t TestScore) int {
	n := 0
	for _, q := range t.Questions {
		if q.Settled && q.verdict {
			n++
		}
	}
	return n
}
