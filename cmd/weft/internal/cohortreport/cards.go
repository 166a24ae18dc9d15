package cohortreport

import (
	"fmt"
	"math"
	"path/filepath"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// Member is one file of a cohort as it was read and fitted.
type Member struct {
	// File is the path as given (cleaned, '/' separated); Group its group
	// ("" when it has none); Folder its output folder inside the
	// cohort's.
	File, Group, Folder string
	// Spec is the file's specimen and Problem its data; nil when the file
	// could not be read.
	Spec    *biaxial.Specimen
	Problem *aniso.Problem
	// At is its index among the problems given to aniso.FitCohort, or −1
	// when it was refused before the fit.
	At int
	// Err says why it failed; nil when it did not.
	Err error
	// Unweighted are the protocol labels given a relative weight that its
	// file has no protocol of; nil when none.
	Unweighted []string
}

// Cards builds the summary's input and the cards of the cohort c fitted
// to ms: each fitted specimen's card, keyed by its Folder, the
// population's (PopulationCard) and the mean-parameter one (MeanCard).
// groupBy says how groups were assigned; unit and kind are the cohort's
// stress unit and measure.
func Cards(ms []Member, c *aniso.Cohort, groupBy, unit, kind string) (*Input, map[string]*card.Card, error) {
	in := &Input{Cohort: c, GroupBy: groupBy, StressUnit: unit, StressKind: kind}
	cards := map[string]*card.Card{}
	var fits []*aniso.Result
	var averaged []*aniso.Problem // the data of fits, in order
	pooled := 0                   // the specimens whose held-out errors the discovered form pools: one fold each
	if d := c.Discovery; d != nil && d.Best().CV != nil {
		pooled = len(d.Best().CV.Folds)
	}
	for i := range ms {
		m := &ms[i]
		name := strings.TrimSuffix(filepath.Base(m.File), filepath.Ext(m.File))
		var warnings []string
		if m.Spec != nil {
			name = m.Spec.Name
			for _, w := range m.Spec.Warnings {
				warnings = append(warnings, w.String())
			}
		}
		sp := Specimen{File: m.File, Name: name, Group: m.Group, Problem: m.Problem, Warnings: warnings, Unweighted: m.Unweighted, DirectionGap: math.NaN(), MisfitRatio: math.NaN()}
		if m.At >= 0 {
			cs := c.Specimens[m.At]
			sp.Verdict, sp.Form, sp.DirectionGap = cs.Verdict, cs.Form, cs.DirectionGap
			if cs.Err == nil && m.Err == nil {
				// As weft fit does, on the points fitted; a ratio that
				// cannot be computed leaves the specimen unflagged.
				if ratio, err := aniso.FlagMisfit(m.Problem, cs.Result); err == nil && ratio > 0 {
					sp.MisfitRatio = ratio
				}
				sp.Result, sp.CV, sp.Folder = cs.Result, cs.CV, m.Folder
				cd := card.FromFit(m.Problem, cs.Result, nil)
				if ev := c.SpecimenEvidence(m.At); ev != nil && m.Spec != nil {
					// The band is the forms the pooled held-out protocols
					// could not tell from the cohort's, each as fitted to
					// this specimen; the card read with that selection
					// lends its near-equivalents and is not written. Its
					// words say the evidence is pooled (until 2026-12-05
					// they read as the specimen's own held-out protocols).
					var err error
					if cd.UntestedStrips, err = card.NewCohortUntestedStrips(m.Spec.Deformations(), m.Spec.Kind == biaxial.Nominal, card.FromFit(m.Problem, cs.Result, ev), cs.Result.Model, pooled); err != nil {
						return nil, nil, fmt.Errorf("%s: the untested strips: %w", m.File, err)
					}
				} else if m.Spec != nil {
					// A chosen form, or (should the cohort's own form have
					// no fit on this specimen's search subset) no band:
					// the strips are listed all the same.
					why := card.ChosenFormWhy
					if c.Discovery != nil {
						why = func(string) string {
							return "the cohort's candidate forms could not be compared on this specimen"
						}
					}
					var err error
					if cd.UntestedStrips, err = card.NewUnmeasuredStrips(m.Spec.Deformations(), m.Spec.Kind == biaxial.Nominal, cd, cs.Result.Model, why); err != nil {
						return nil, nil, fmt.Errorf("%s: the untested strips: %w", m.File, err)
					}
				}
				cards[m.Folder] = cd
				sp.UntestedStrips = cd.UntestedStrips
				fits = append(fits, cs.Result)
				averaged = append(averaged, m.Problem)
			}
		}
		if m.Err != nil {
			sp.Err = m.Err.Error()
		}
		in.Specimens = append(in.Specimens, sp)
	}
	noteCohortMisfit(c, in.Specimens)
	if c.Population != nil {
		in.Population = c.Population.Model
		pc := card.FromFit(c.Pooled, c.Population, nil)
		pc.Specimen = c.Pooled.Specimen.Name
		// The pooled data do not carry the specimens' labels: the
		// cohort's cards say synthetic when any specimen does.
		pc.Cautions = card.CautionsFor(pc.Synthetic() || in.Synthetic())
		if err := populationStrips(pc, c, in.Specimens); err != nil {
			return nil, nil, err
		}
		cards[PopulationCard] = pc
		if mm, err := aniso.MeanModel(fits, c.Population.Model); err == nil {
			in.MeanParameters = mm
			signs := make([]bool, len(mm.Families))
			for i := range signs {
				signs[i] = c.Population.SignKnown
			}
			mc := card.FromModel(mm, unit, signs)
			mc.Specimen = fmt.Sprintf("mean parameters of %d specimens", len(fits))
			mc.Cautions = card.CautionsFor(in.Synthetic())
			// The span the averaged specimens were tested over, with the
			// fibre stretch along the mean model's own families: without
			// it, check and evaluate could not say where the mean model
			// extrapolates.
			mc.DataRange = spanOf(averaged, mm, kind)
			// The mean model has the shared form's layout (the population
			// card's); a mirror pair's θ and β are its mean families'.
			if pc.Layout != nil {
				l := *pc.Layout
				if l.Kind == "mirror" && len(mm.Families) == 2 {
					a0, a1 := mm.Families[0].Angle, mm.Families[1].Angle
					mean, half := aniso.Deg((a0+a1)/2), aniso.Deg(math.Abs(a0-a1)/2)
					l.MeanDeg, l.HalfAngleDeg = &mean, &half
				}
				mc.Layout = &l
			}
			cards[MeanCard] = mc
		}
	}
	return in, cards, nil
}

// populationStrips gives the population card pc of a discovered cohort
// its untested strips, unmeasured: fitting the near-equivalent forms to
// the pooled data, as the population model was, doubled a cohort's CPU
// time (50 synthetic specimens: 25 → 47 s without angle scans, 72 s with
// them), so each strip's summary points at the specimens' own strips
// (their widest spread over specimens, sps) instead. The mean-parameter
// card gets none: it is no fit.
func populationStrips(pc *card.Card, c *aniso.Cohort, sps []Specimen) error {
	if c.Population == nil || c.Pooled == nil {
		return nil
	}
	sp := c.Pooled.Specimen
	why := func(label string) string {
		if c.Discovery == nil {
			return card.ChosenFormWhy(label)
		}
		w := WidestStrip(sps, label)
		if w.Specimen == "" {
			return "no band of candidate forms was fitted to the pooled data, and no specimen's card measures this strip either"
		}
		return fmt.Sprintf("no band of candidate forms was fitted to the pooled data; on the specimens' own cards the forms the pooled held-out protocols could not tell from the cohort's part along this strip by up to %s %% of the largest normal stress (%s)", card.PercentText(w.Percent), w.Specimen)
	}
	var err error
	if pc.UntestedStrips, err = card.NewUnmeasuredStrips(sp.Deformations(), sp.Kind == biaxial.Nominal, pc, c.Population.Model, why); err != nil {
		return fmt.Errorf("the population model's untested strips: %w", err)
	}
	return nil
}

// noteCohortMisfit adds to a discovered cohort's verdict the caution of
// a shared form that misfits most of its specimens.
func noteCohortMisfit(c *aniso.Cohort, sps []Specimen) {
	if c.Discovery == nil {
		return
	}
	var ratios []float64
	for _, sp := range sps {
		ratios = append(ratios, sp.MisfitRatio)
	}
	c.Discovery.NoteCohortMisfit(ratios)
}

// spanOf is the span of the data of ps together, with the fibre stretch
// along m's families, under the stress measure kind. The mean-parameter
// model averages every fitted specimen, also those the population fit left
// out (another stress measure or unit), so its range is theirs too, not
// the population's pooled data alone.
func spanOf(ps []*aniso.Problem, m *aniso.Model, kind string) *card.DataRange {
	var dr *card.DataRange
	for _, p := range ps {
		d := card.NewDataRange(p, m)
		if dr == nil {
			dr = d
			continue
		}
		dr.Include(d)
	}
	if dr != nil {
		dr.StressKind = kind
	}
	return dr
}
