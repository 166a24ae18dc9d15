package cohortreport

import (
	"math"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// Names of the population's files in the cohort's folder.
const (
	PopulationCard = "population.json"
	MeanCard       = "mean-parameters.json"
)

// PopulationInfo describes the population model and how it differs from
// the mean-parameter model.
type PopulationInfo struct {
	// Card and MeanCard name the two cards; Specimens were pooled, LeftOut
	// were not (another stress measure or unit).
	Card      string   `json:"card,omitempty"`
	MeanCard  string   `json:"mean_parameter_card,omitempty"`
	Specimens []string `json:"specimens"`
	LeftOut   []string `json:"left_out,omitempty"`
	Weighting string   `json:"weighting"`
	Note      string   `json:"note"`
	Error     string   `json:"error,omitempty"`
	// AtLargestStretch compares the two models per protocol and axis at
	// the largest stretch tested in that protocol.
	AtLargestStretch []StressComparison `json:"at_largest_stretch"`
}

// StressComparison is the stress of both models at one deformation.
type StressComparison struct {
	// Protocol is the label shared by the specimens' protocols; Specimen
	// the one whose point had the largest stretch; F that point's
	// deformation gradient (F11, F12, F21, F22).
	Protocol  string     `json:"protocol"`
	Specimen  string     `json:"specimen"`
	F         [4]float64 `json:"F"`
	Component string     `json:"component"`
	// Population and MeanParameters are the stresses in the cohort's
	// measure and unit; Difference is mean-parameter minus population,
	// Relative that over |population|.
	Population     card.Num `json:"population"`
	MeanParameters card.Num `json:"mean_parameters"`
	Difference     card.Num `json:"difference"`
	Relative       card.Num `json:"relative"`
}

// populationNote says why both population models are given.
const populationNote = "population.json is the shared form fitted to every pooled specimen's data at once, each specimen weighted equally; mean-parameters.json averages the specimens' parameters. The model is non-linear, so the model of mean parameters is not the mean response: the table gives how far apart the two are at the largest stretch tested. Neither describes any one specimen; both hold only within the tested range."

func populationInfo(in *Input) *PopulationInfo {
	c := in.Cohort
	p := &PopulationInfo{Weighting: "every specimen counts the same: each protocol and axis is weighted by 1/(range·√points), and each specimen's weights by √(mean series / its series), a series being one protocol and stress component; at most 60 points per protocol, spaced evenly in stretch",
		Note: populationNote, Specimens: []string{}, AtLargestStretch: []StressComparison{}}
	name := func(i int) string { return in.Specimens[specimenIndex(in, i)].Name }
	for _, i := range c.InPopulation {
		p.Specimens = append(p.Specimens, name(i))
	}
	for _, i := range c.LeftOut {
		p.LeftOut = append(p.LeftOut, name(i))
	}
	if c.PopulationErr != nil {
		p.Error = c.PopulationErr.Error()
		return p
	}
	p.Card = PopulationCard
	if in.MeanParameters != nil {
		p.MeanCard = MeanCard
		p.AtLargestStretch = compareAtLargest(in)
	}
	return p
}

// specimenIndex maps an index into the cohort's problems to one into
// in.Specimens (the specimens that were read, in order).
func specimenIndex(in *Input, i int) int {
	k := -1
	for j, sp := range in.Specimens {
		if sp.Problem != nil {
			k++
			if k == i {
				return j
			}
		}
	}
	return -1
}

// compareAtLargest evaluates both models, per protocol label (in order of
// first appearance) and normal axis, at the pooled point with the largest
// principal stretch of that protocol.
func compareAtLargest(in *Input) []StressComparison {
	type pick struct {
		spec string
		F    [4]float64
		lam  float64
	}
	best := map[string]*pick{}
	var labels []string
	for _, i := range in.Cohort.InPopulation {
		sp := in.Specimens[specimenIndex(in, i)]
		s := sp.Problem.Specimen
		for _, pr := range s.Protocols {
			for _, pt := range pr.Points {
				F := pt.F
				lam := math.Max(math.Hypot(F[0], F[2]), math.Hypot(F[1], F[3]))
				b, ok := best[pr.Label]
				if !ok {
					labels = append(labels, pr.Label)
					b = &pick{lam: math.Inf(-1)}
					best[pr.Label] = b
				}
				if lam > b.lam {
					*b = pick{sp.Name, F, lam}
				}
			}
		}
	}
	var out []StressComparison
	for _, l := range labels {
		b := best[l]
		rp, e1 := in.Population.Evaluate(b.F)
		rm, e2 := in.MeanParameters.Evaluate(b.F)
		for ci, comp := range []string{"11", "22"} {
			sc := StressComparison{Protocol: l, Specimen: b.spec, F: b.F, Component: comp,
				Population: card.Num(math.NaN()), MeanParameters: card.Num(math.NaN()), Difference: card.Num(math.NaN()), Relative: card.Num(math.NaN())}
			if e1 == nil && e2 == nil {
				a, m := stressOf(&rp, in.StressKind, ci), stressOf(&rm, in.StressKind, ci)
				sc.Population, sc.MeanParameters, sc.Difference = card.Num(a), card.Num(m), card.Num(m-a)
				if a != 0 {
					sc.Relative = card.Num((m - a) / math.Abs(a))
				}
			}
			out = append(out, sc)
		}
	}
	return out
}

// stressOf is the normal stress on axis ci+1 in the cohort's measure.
func stressOf(r *aniso.Response, kind string, ci int) float64 {
	if kind == "cauchy" {
		return r.Cauchy[ci]
	}
	return r.Nominal[ci] // (P11, P22, P12, P21)
}
