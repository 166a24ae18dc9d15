package aniso

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"time"
)

// A cohort is a set of specimens of one tissue that a study describes by one
// model form with parameters per specimen. FitCohort finds that form once
// for all of them (or takes it as given), fits it to every specimen with
// the specimen's own parameters and angles, and fits it to all specimens'
// data at once for a population model:
//
//  1. Candidate forms come from discovery's search (its stages up to the
//     Pareto front, see Discover, without the classical presets,
//     cross-validation and polish) on a few scout
//     specimens spread over the cohort; every form within ΔBIC 10 of its
//     layout's best on a scout is a candidate.
//  2. Every candidate is fitted to every specimen (its search subset): per
//     fibre layout the candidate that was best on its scout with an angle
//     scan, the others warm-started from that fit's angles.
//  3. Candidates are pooled per form: the summed loss and BIC (the
//     specimens are independent, each with its own parameters) make the
//     Pareto front of each form, and those within ΔBIC 10 of their form's
//     best are cross-validated on every specimen (leave one protocol out).
//     The pooled held-out error is the mean over specimens of each
//     specimen's mean fold error, so every specimen counts the same; its
//     standard error is taken over specimens.
//  4. The verdict walk and the one-standard-error rule of single-specimen
//     discovery (select.go) pick the form from the pooled evidence; the
//     same walk on each specimen's own evidence says how many specimens
//     support the cohort's verdict.
//  5. The form is fitted to all specimens at once (pooledProblem: each
//     specimen weighted equally), and then to each specimen on all its
//     points, warm-started from that population fit, with angle profiles
//     and a leave-one-protocol-out score.

// CohortSettings tune FitCohort. The zero value discovers the shared form
// with discovery's defaults.
type CohortSettings struct {
	// Form, when non-nil, is the shared model form: nothing is discovered.
	Form *Structure
	// Discover tunes the search for candidate forms on the scouts
	// (MaxTerms, Layouts, NoPlanar, Dispersion, Shapes, SearchPoints, ...);
	// its Workers and Progress are replaced by the cohort's.
	Discover DiscoverSettings
	// Scouts is how many specimens candidate forms are searched on
	// (default 3; every specimen when the cohort is smaller).
	Scouts int
	// Workers run independent fits in parallel (default: all cores).
	Workers int
	// Progress, when set, is called after each finished job with the
	// number done and the total known so far.
	Progress func(done, total int)
}

func (s CohortSettings) withDefaults() CohortSettings {
	if s.Scouts <= 0 {
		s.Scouts = 3
	}
	if s.Workers <= 0 {
		s.Workers = runtime.NumCPU()
	}
	s.Discover.Workers, s.Discover.Progress = s.Workers, nil
	s.Discover = s.Discover.withDefaults()
	return s
}

// CohortSpecimen is one specimen's part of a cohort.
type CohortSpecimen struct {
	// Result is the specimen's fit of the shared form on all its points,
	// with angle profiles; nil when Err is set.
	Result *Result
	// CV is the specimen's leave-one-protocol-out score of the shared
	// form (nil with a single protocol).
	CV *CVScore
	// Verdict and Form are what the verdict walk concludes from this
	// specimen's own evidence on the cohort's candidate forms (the family
	// verdict and the form key); empty when the form was given.
	Verdict, Form string
	// DirectionGap is, when Verdict is the cohort's, the largest distance
	// (degrees, modulo 180°) between a fibre direction of the specimen's
	// own chosen model and the matched one of the cohort's chosen model
	// (0 when neither has fibres, +Inf when one has); NaN otherwise.
	DirectionGap float64
	// Err says why the specimen could not be used.
	Err error
	// candidateFits[k] is this specimen's fit (on its search subset) of
	// the form of the cohort's Discovery.Pareto[k], presetFits[k] of
	// Discovery.Presets[k]; empty when the form was given or the
	// specimen could not be used. SpecimenEvidence reads them.
	candidateFits, presetFits []*Result
}

// CohortSupport counts the specimens that support the cohort's verdict.
type CohortSupport struct {
	// Specimens is the number of specimens with evidence of their own;
	// SameVerdict how many reach the cohort's family verdict on it,
	// SameForm how many the cohort's form as well, and SameDirection how
	// many of SameVerdict put their own chosen model's fibres within
	// DirectionToleranceDeg of the cohort's (CohortSpecimen.DirectionGap).
	Specimens, SameVerdict, SameForm, SameDirection int
}

// DirectionToleranceDeg is how far (degrees) a specimen's own fibre
// direction may lie from the cohort's for CohortSupport.SameDirection.
const DirectionToleranceDeg = directionToleranceDeg

// Cohort is the outcome of FitCohort.
type Cohort struct {
	// Form is the shared model form.
	Form Structure
	// Discovery is the pooled evidence behind Form: the candidates scored
	// over every specimen, the verdict and the rule; nil when the form was
	// given.
	Discovery *Discovery
	// Support counts the specimens that reach the verdict on their own.
	Support CohortSupport
	// Specimens parallel the problems given to FitCohort.
	Specimens []CohortSpecimen
	// Population is Form fitted to all specimens at once on Pooled (see
	// pooledProblem); nil when PopulationErr is set. InPopulation indexes
	// the specimens pooled and LeftOut those in another stress measure or
	// unit than the cohort's.
	Population            *Result
	Pooled                *Problem
	PopulationErr         error
	InPopulation, LeftOut []int
	// Scouts index the specimens candidate forms were searched on.
	Scouts []int
	// Elapsed wall time.
	Elapsed time.Duration
}

// SpecimenEvidence returns the cohort's pooled evidence as specimen i
// meets it: a copy of Discovery whose candidates and presets carry the
// specimen's own fits of their forms (on its search subset, as the pooled
// evidence fitted them) while their held-out scores, the choice and the
// verdict stay the pooled ones. The forms the pooled held-out protocols
// could not tell from the chosen one, each as fitted to this specimen,
// make the band of its untested loadings. A candidate whose form could
// not be fitted to this specimen (its fit failed there, not on the others)
// is left out of the copy: it has no model of this specimen to lend the
// band. nil when the form was given, specimen i could not be used or the
// chosen form has no fit of it.
func (c *Cohort) SpecimenEvidence(i int) *Discovery {
	if c.Discovery == nil || i < 0 || i >= len(c.Specimens) {
		return nil
	}
	sp := &c.Specimens[i]
	if sp.Err != nil || len(sp.candidateFits) != len(c.Discovery.Pareto) || len(sp.presetFits) != len(c.Discovery.Presets) {
		return nil
	}
	d := *c.Discovery
	d.Pareto = nil
	for k, r := range sp.candidateFits {
		if r == nil {
			// Until 2026-12-05 one such candidate left the specimen's
			// card without any untested strips, measured or not.
			if k == c.Discovery.Chosen {
				return nil
			}
			continue
		}
		if k == c.Discovery.Chosen {
			d.Chosen = len(d.Pareto)
		}
		pc := c.Discovery.Pareto[k]
		pc.Result, pc.Searched = r, nil
		d.Pareto = append(d.Pareto, pc)
	}
	d.Presets = nil
	for k, r := range sp.presetFits {
		if r != nil {
			pc := c.Discovery.Presets[k]
			pc.Result, pc.Searched = r, nil
			d.Presets = append(d.Presets, pc)
		}
	}
	return &d
}

// ErrNoSpecimen says that no specimen of a cohort could be used.
var ErrNoSpecimen = errors.New("no specimen of the cohort could be fitted")

// cohortRun is the state of one FitCohort.
type cohortRun struct {
	ps  []*Problem
	set CohortSettings
	pl  *pool
	out *Cohort
	// sub are the specimens' search subsets (searchpoints.go).
	sub []*Problem
	// cands are the candidate forms, fits[c][i] candidate c fitted to
	// specimen i's subset, cv[c][i] its score there.
	cands []*cohortCandidate
	// paretoCand maps Discovery.Pareto to cands.
	paretoCand []int
	// init starts the population fit (the chosen candidate's parameters).
	init map[string]float64
	// screened counts the candidates fitted to every specimen; skipped
	// names the forms not cross-validated for the verdict (they could not
	// change it), and bandScored counts their candidates cross-validated
	// after it for the untested strips' band (scoreForBand).
	screened   int
	skipped    []string
	bandScored int
	// scoutPresets[i][name] is scout i's fit of the classical preset
	// name, made beside its search (fitFullForms).
	scoutPresets map[int]map[string]*Result
}

// usable lists the specimens not failed so far.
func (c *cohortRun) usable() []int {
	var out []int
	for i := range c.ps {
		if c.out.Specimens[i].Err == nil {
			out = append(out, i)
		}
	}
	return out
}

// FitCohort finds one model form for the specimens ps (or takes
// set.Form), fits it to every specimen and to all of them at once. A
// specimen that cannot be used gets its Err and the others go on; the
// result is deterministic for the same problems in the same order (the
// caller fixes the order).
func FitCohort(ps []*Problem, set CohortSettings) (*Cohort, error) {
	start := time.Now()
	if len(ps) == 0 {
		return nil, ErrNoSpecimen
	}
	set = set.withDefaults()
	c := &cohortRun{ps: ps, set: set, pl: &pool{n: set.Workers, progress: set.Progress},
		out: &Cohort{Specimens: make([]CohortSpecimen, len(ps))}}
	for i := range c.out.Specimens {
		c.out.Specimens[i].DirectionGap = math.NaN()
	}
	c.prepare()
	if len(c.usable()) == 0 {
		return c.out, ErrNoSpecimen
	}
	if set.Form != nil {
		if err := set.Form.Validate(); err != nil {
			return nil, err
		}
		c.out.Form = canonical(*set.Form)
	} else {
		st, err := c.discoverForm()
		if err != nil {
			return c.out, err
		}
		c.out.Form = st
	}
	c.fitPopulation()
	c.fitSpecimens()
	c.out.Elapsed = time.Since(start)
	if len(c.usable()) == 0 {
		return c.out, ErrNoSpecimen
	}
	return c.out, nil
}

// prepare takes each specimen's search subset; a specimen without
// usable stress fails here.
func (c *cohortRun) prepare() {
	c.sub = make([]*Problem, len(c.ps))
	for i, p := range c.ps {
		sub, err := searchSubset(p, c.set.Discover.SearchPoints)
		if err == nil && allZero(sub.Target) {
			err = ErrAllZero
		}
		c.sub[i] = sub
		c.out.Specimens[i].Err = err
	}
}

func allZero(v []float64) bool {
	for _, y := range v {
		if y != 0 {
			return false
		}
	}
	return true
}

// fitPopulation fits the shared form to every usable specimen at once,
// from the chosen candidate's parameters and an angle scan.
func (c *cohortRun) fitPopulation() {
	use := c.usable()
	ps := make([]*Problem, len(use))
	for k, i := range use {
		ps[k] = c.ps[i]
	}
	pooled, in, out, err := pooledProblem(ps, c.set.Discover.SearchPoints)
	if err != nil {
		c.out.PopulationErr = err
		return
	}
	for _, k := range in {
		c.out.InPopulation = append(c.out.InPopulation, use[k])
	}
	for _, k := range out {
		c.out.LeftOut = append(c.out.LeftOut, use[k])
	}
	c.out.Pooled = pooled
	var r *Result
	c.pl.run([]func(){func() { r, err = Fit(pooled, c.out.Form, Settings{Init: c.init}) }})
	c.out.Population, c.out.PopulationErr = r, err
}

// fitSpecimens fits the shared form to every usable specimen on all its
// points, warm-started from the population fit (with an angle scan
// besides, so that a specimen far from the population still finds its own
// optimum), with angle profiles, and scores it leaving one protocol out.
func (c *cohortRun) fitSpecimens() {
	var init map[string]float64
	if c.out.Population != nil {
		init = c.out.Population.Params()
	}
	var jobs []func()
	for _, i := range c.usable() {
		jobs = append(jobs, func() {
			sp := &c.out.Specimens[i]
			r, err := Fit(c.ps[i], c.out.Form, Settings{Profile: true, Init: init})
			if err != nil {
				sp.Err = err
				return
			}
			sp.Result = r
			if n := len(c.ps[i].Protocols); n > 1 {
				sp.CV = scoreFolds(c.ps[i], r, Settings{})
			}
		})
	}
	c.pl.run(jobs)
}

// scoreFolds cross-validates r's form on p, one protocol left out at a
// time, in order.
func scoreFolds(p *Problem, r *Result, set Settings) *CVScore {
	sc := &CVScore{}
	for f := range p.Protocols {
		sc.Folds = append(sc.Folds, cvFold(p, r, f, set))
	}
	sc.summarise()
	return sc
}

// summarise sets Mean and StdErr (standard deviation / √folds) from the
// folds.
func (sc *CVScore) summarise() {
	n := float64(len(sc.Folds))
	sc.Mean, sc.StdErr = 0, 0
	if n == 0 {
		return
	}
	for _, f := range sc.Folds {
		sc.Mean += f.Error
	}
	sc.Mean /= n
	if n > 1 {
		v := 0.0
		for _, f := range sc.Folds {
			v += (f.Error - sc.Mean) * (f.Error - sc.Mean)
		}
		sc.StdErr = math.Sqrt(v/(n-1)) / math.Sqrt(n)
	}
}

// MeanModel is the mean-parameter model of a cohort: ref's form with
// every weight, shape parameter, concentration and dispersion replaced by
// its arithmetic mean over rs, and each family's angle by the mean of the
// specimens' angles taken on the branch nearest ref's (angles are modulo
// 180°). When any result cannot tell the sign of an angle, the angles are
// averaged as |α| with the first family at +|α| and the second at −|α|, the
// convention of fits without shear information. Every result must share
// ref's form.
func MeanModel(rs []*Result, ref *Model) (*Model, error) {
	if len(rs) == 0 {
		return nil, errors.New("no results to average")
	}
	signKnown := true
	for _, r := range rs {
		if len(r.Model.Terms) != len(ref.Terms) || len(r.Model.Families) != len(ref.Families) {
			return nil, fmt.Errorf("the results do not share one model form")
		}
		signKnown = signKnown && r.SignKnown
	}
	models := make([]*Model, len(rs))
	for i, r := range rs {
		models[i] = alignedFamilies(r.Model, ref, signKnown)
	}
	m := cloneModelDeep(ref)
	n := float64(len(rs))
	for k := range m.Terms {
		m.Terms[k].Weight = 0
		for j := range m.Terms[k].Params {
			m.Terms[k].Params[j] = 0
		}
		for _, rm := range models {
			t := rm.Terms[k]
			m.Terms[k].Weight += t.Weight / n
			for j := range t.Params {
				m.Terms[k].Params[j] += t.Params[j] / n
			}
		}
	}
	for f := range m.Families {
		a0 := familyAngle(ref.Families[f].Angle, f, signKnown)
		sum, conc, disp := 0.0, 0.0, 0.0
		for _, rm := range models {
			fa := rm.Families[f]
			sum += a0 + wrapAngle(familyAngle(fa.Angle, f, signKnown)-a0)
			conc += fa.Concentration / n
			disp += fa.Dispersion / n
		}
		m.Families[f].Angle = wrapAngle(sum / n)
		m.Families[f].Concentration, m.Families[f].Dispersion = conc, disp
	}
	return m, m.Validate()
}

// FamiliesSwapped reports whether m's two fibre families match ref's in
// the other order: both carry the same term shapes (so that swapping their
// labels is a relabelling, not another model) and the angular distance of
// each to ref's family of the other label is smaller in sum (as |α| when
// signKnown is false). Fits of one two-family form, warm-started alike,
// can converge with their labels swapped; a cohort's statistics and mean
// model compare family with family, not label with label.
func FamiliesSwapped(m, ref *Model, signKnown bool) bool {
	if len(m.Families) != 2 || len(ref.Families) != 2 || len(m.Terms) != len(ref.Terms) {
		return false
	}
	var shapes [2][]string
	for _, t := range m.Terms {
		if t.Family == 0 || t.Family == 1 {
			shapes[t.Family] = append(shapes[t.Family], t.Shape.ID)
		}
	}
	if !slices.Equal(shapes[0], shapes[1]) {
		return false
	}
	dist := func(a, b float64) float64 {
		return math.Abs(wrapAngle(familyAngle(a, 0, signKnown) - familyAngle(b, 0, signKnown)))
	}
	a0, a1 := m.Families[0].Angle, m.Families[1].Angle
	r0, r1 := ref.Families[0].Angle, ref.Families[1].Angle
	return dist(a1, r0)+dist(a0, r1) < dist(a0, r0)+dist(a1, r1)
}

// alignedFamilies returns m, or a copy with its two families' labels
// swapped (families, and each fibre term moved to the other family in
// ref's term order) when FamiliesSwapped says so.
func alignedFamilies(m, ref *Model, signKnown bool) *Model {
	if !FamiliesSwapped(m, ref, signKnown) {
		return m
	}
	s := cloneModelDeep(m)
	s.Families[0], s.Families[1] = s.Families[1], s.Families[0]
	used := make([]bool, len(m.Terms))
	for k, rt := range ref.Terms {
		want := rt.Family
		if want == 0 || want == 1 {
			want = 1 - want
		}
		for j, t := range m.Terms {
			if !used[j] && t.Family == want && t.Shape.ID == rt.Shape.ID {
				used[j] = true
				s.Terms[k] = m.Terms[j]
				s.Terms[k].Params = append([]float64(nil), m.Terms[j].Params...)
				s.Terms[k].Family = rt.Family
				break
			}
		}
	}
	return s
}

// familyAngle is a family's angle as compared across a cohort: as fitted
// when signs are known, else ±|α| as in fits without shear information.
func familyAngle(a float64, family int, signKnown bool) float64 {
	if signKnown {
		return a
	}
	a = math.Abs(wrapAngle(a))
	if family == 1 && a != math.Pi/2 {
		a = -a
	}
	return a
}
