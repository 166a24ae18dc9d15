package card

import (
	"math"

	"github.com/weft-tools/weft/aniso"
)

// Section keys of a fitted card, besides the model itself.
const (
	KeyFit       = "fit"
	KeyDataRange = "data_range"
	KeyData      = "data"
	KeyVerdict   = "verdict"
	KeySelection = "selection"
	KeySplit     = "split"
)

// DataSection records what data the card was fitted to.
type DataSection struct {
	Specimen   string `json:"specimen"`
	Source     string `json:"source"`
	Sheet      string `json:"sheet,omitempty"`
	Tissue     string `json:"tissue,omitempty"`
	Notes      string `json:"notes,omitempty"`
	Axis1      string `json:"axis_1,omitempty"`
	StressKind string `json:"stress_kind"`
	StressUnit string `json:"stress_unit"`
	// StressMeasure is what the file gave: "loads" (edge loads turned
	// into nominal stress with the geometry), "nominal" (first
	// Piola–Kirchhoff stress) or "cauchy"; StressMeasureNote says it in
	// words. Absent in cards written before they were added.
	StressMeasure     string `json:"stress_measure,omitempty"`
	StressMeasureNote string `json:"stress_measure_note,omitempty"`
	// Geometry is the specimen's reference geometry from the file's
	// metadata, nil when the file does not give all of it.
	Geometry *GeometryCard `json:"geometry,omitempty"`
	// Reference states the reference state used (as measured, or
	// re-referenced with the tare removed).
	Reference string `json:"reference"`
	// HasShear is true when the data carry shear information.
	HasShear bool `json:"has_shear"`
	// ShearWithinScatter is true when the data's F12 and F21 are not all
	// zero but lie within their scatter of zero, and no shear stress was
	// given: they carry no shear information and were fitted as zero
	// (biaxial.Specimen.ShearWithinScatter). Absent (false) otherwise and
	// in cards written before it was added.
	ShearWithinScatter bool               `json:"shear_within_scatter,omitempty"`
	Protocols          []DataProtocolCard `json:"protocols"`
	Warnings           []string           `json:"warnings"`
	Notices            []string           `json:"notices"`
}

// GeometryCard is the reference geometry of a specimen, in mm: the
// thickness H and the extents W1, W2 of the loaded region along axis 1 and
// axis 2 (the load on axis 1 acts over W2·H, the load on axis 2 over W1·H).
type GeometryCard struct {
	ThicknessMM float64 `json:"thickness_mm"`
	Size1MM     float64 `json:"size_1_mm"`
	Size2MM     float64 `json:"size_2_mm"`
}

// DataProtocolCard is one protocol as used in the fit.
type DataProtocolCard struct {
	Label  string `json:"label"`
	Points int    `json:"points"`
	// Kept says which cycle and branch were kept.
	Kept   string  `json:"kept"`
	Cycles int     `json:"cycles"`
	Weight float64 `json:"user_weight"`
}

// VerdictSection is the answer on the number of fibre families. Families
// is one of "0", "1", "2", "1-or-mirror-pair", "undecided".
type VerdictSection struct {
	Families string `json:"families"`
	// Form is the key of the model form the verdict rests on (see
	// aniso.FormKey, e.g. "1+dispersed").
	Form   string `json:"form"`
	Reason string `json:"reason"`
	// DeltaBIC and HeldoutError per form ("0", "1", "1+dispersed",
	// "2-mirror", "2-free", ...): its best model's BIC minus the best, and
	// its best held-out error (cards before this name said "cv_error").
	DeltaBIC     map[string]Num `json:"delta_bic"`
	HeldoutError map[string]Num `json:"heldout_error"`
	// Comparisons are the steps from the simplest form to the richest (a
	// form with more families that beat the walk's form is also compared
	// with the best-predicting form with the walk's number of families);
	// RuledOut names richer explanations that were not supported. Both are
	// always written, empty as [] (cards before that may lack them; they
	// read as empty).
	Comparisons []ComparisonCard `json:"comparisons"`
	RuledOut    []string         `json:"ruled_out"`
	// Noise is the noise estimate in held-out-error units; StdErrFloor the
	// smallest standard error a comparison may claim.
	Noise       Num `json:"noise"`
	StdErrFloor Num `json:"stderr_floor"`
	// Decider names the measurement that would settle an undecided case.
	Decider string `json:"decider,omitempty"`
	// InSampleBest names the selection candidate that fits better in
	// sample than every model the held-out errors favour (two fibre
	// directions against one, or fibres against none), or the Fung-type
	// preset without fibres ("preset:fung", "preset:fung-general") that
	// fits better than the chosen model with fibres and predicts no worse,
	// when that is why the verdict is undecided
	// (aniso.Verdict.InSampleBest).
	InSampleBest string `json:"in_sample_best,omitempty"`
	// TiesWith names the selection candidate with two fibre families,
	// placed elsewhere or adding one far from the one-family answer's,
	// that fits and predicts as well as that answer, when that tie is why
	// the verdict is undecided (aniso.Verdict.TiesWith).
	TiesWith string `json:"ties_with,omitempty"`
	// LookAlike names the selection candidate of the look-alike the
	// reason names: fibres placed symmetrically about the 45° line for an
	// isotropic verdict, an isotropic model for a verdict left undecided
	// by that look-alike (aniso.Verdict.LookAlike).
	LookAlike string `json:"look_alike,omitempty"`
}

// ComparisonCard is one step of the verdict's walk over forms.
type ComparisonCard struct {
	Simpler      string `json:"simpler"`
	Richer       string `json:"richer"`
	Gain         Num    `json:"gain"`
	StdErr       Num    `json:"stderr"`
	RelativeGain Num    `json:"relative_gain"`
	DeltaBIC     Num    `json:"delta_bic"`
	Decisive     bool   `json:"decisive"`
	Suggestive   bool   `json:"suggestive"`
}

// NewVerdictSection describes discovery's verdict; form is the key of the
// chosen model's form.
func NewVerdictSection(v aniso.Verdict, form string) VerdictSection {
	s := VerdictSection{Families: v.Families, Form: form, Reason: v.Reason, Decider: v.Decider, InSampleBest: v.InSampleBest, TiesWith: v.TiesWith, LookAlike: v.LookAlike,
		DeltaBIC: map[string]Num{}, HeldoutError: map[string]Num{}, RuledOut: append([]string{}, v.RuledOut...), Comparisons: []ComparisonCard{},
		Noise: Num(v.Noise), StdErrFloor: Num(v.StdErrFloor)}
	for k, x := range v.DeltaBIC {
		s.DeltaBIC[k] = Num(x)
	}
	for k, x := range v.HeldoutError {
		s.HeldoutError[k] = Num(x)
	}
	for _, c := range v.Comparisons {
		s.Comparisons = append(s.Comparisons, ComparisonCard{Simpler: c.Simpler, Richer: c.Richer, Gain: Num(c.Gain), StdErr: Num(c.StdErr),
			RelativeGain: Num(c.RelativeGain), DeltaBIC: Num(c.DeltaBIC), Decisive: c.Decisive, Suggestive: c.Suggestive})
	}
	return s
}

// CandidateCard is one fitted model form in the selection evidence.
type CandidateCard struct {
	Name       string   `json:"name"`
	Layout     string   `json:"layout"`
	Dispersion bool     `json:"dispersion"`
	InPlane    bool     `json:"in_plane_dispersion"`
	Terms      []string `json:"terms"`
	Size       int      `json:"size"`
	// Parameters counts weights and non-linear parameters (the size used by
	// the selection rule).
	Parameters int   `json:"parameters"`
	Loss       Num   `json:"loss"`
	AICc       Num   `json:"aicc"`
	BIC        Num   `json:"bic"`
	AnglesDeg  []Num `json:"angles_deg"`
	// LowestR2 is the lowest R² over protocols and components.
	LowestR2 Num `json:"lowest_r2"`
	// HeldoutError is the mean leave-one-protocol-out error (see
	// HeldoutMetric), HeldoutStdErr its standard error and HeldoutFolds
	// the folds; null without cross-validation. Cards before these names
	// said "min_r2", "cv_error", "cv_stderr" and "cv_folds".
	HeldoutError  Num         `json:"heldout_error"`
	HeldoutStdErr Num         `json:"heldout_stderr"`
	HeldoutFolds  []FoldCard  `json:"heldout_folds,omitempty"`
	Chosen        bool        `json:"chosen"`
	Weights       []WeightOut `json:"weights"`
	// Model is the candidate's fitted model in the card's own form
	// (CandidateModel), present for every candidate that was
	// cross-validated: the ones the selection rule compares.
	Model *CandidateModel `json:"model,omitempty"`
	// NotCrossValidated says why a candidate was not cross-validated
	// (aniso.Candidate.NotCrossValidated: "bic-window",
	// "concentration-bound" or "coincident"); absent when it was, and in
	// cards written before 2026-12-04.
	NotCrossValidated string `json:"not_cross_validated,omitempty"`
}

// WeightOut is a term's fitted weight in a candidate.
type WeightOut struct {
	Term   string `json:"term"`
	Weight Num    `json:"weight"`
}

// FoldCard is one held-out protocol.
type FoldCard struct {
	Protocol string `json:"protocol"`
	Error    Num    `json:"error"`
	// R2 is the mean held-out R² over components.
	R2 Num `json:"r2"`
}

// SelectionSection is the evidence behind the discovered model.
type SelectionSection struct {
	Rule   string   `json:"rule"`
	Chosen string   `json:"chosen"`
	Search []string `json:"search"`
	// Points is the number of points the chosen model was fitted to, and
	// SearchPoints how many of them the search, the cross-validation and
	// the comparison of candidates used (a protocol with more points keeps
	// an even subset in its driving stretch; see aniso.DiscoverSettings).
	// Both are 0 in cards written before they were recorded.
	Points       int             `json:"points"`
	SearchPoints int             `json:"search_points"`
	Pareto       []CandidateCard `json:"pareto"`
	Presets      []CandidateCard `json:"presets"`
	// HeldoutMetric says what the held-out error measures (cards before
	// this name said "cv_metric").
	HeldoutMetric string `json:"heldout_metric"`
	// CrossR2[i][j]: mean R² of protocol j predicted by the chosen form
	// fitted to protocol i alone; Protocols labels the rows and columns.
	Protocols []string `json:"protocols"`
	CrossR2   [][]Num  `json:"cross_r2"`
}

// SplitSection is the matrix/fibre split of the fitted model.
type SplitSection struct {
	Terms     []string            `json:"terms"`
	TermGroup []string            `json:"term_group"`
	Groups    []string            `json:"groups"`
	Measure   string              `json:"measure"`
	Protocols []SplitProtocolCard `json:"protocols"`
}

// SplitProtocolCard is the split of one protocol.
type SplitProtocolCard struct {
	Protocol         string          `json:"protocol"`
	Components       []SplitCompCard `json:"components"`
	EnergyShare      []Num           `json:"energy_share"`
	GroupEnergyShare map[string]Num  `json:"group_energy_share"`
	AtF              [4]float64      `json:"at_F"`
}

// SplitCompCard is the split of one stress component in one protocol.
type SplitCompCard struct {
	Component  string         `json:"component"`
	TermShare  []Num          `json:"term_share"`
	GroupShare map[string]Num `json:"group_share"`
	// NoShare says why the shares are null: the component's modelled
	// stress is negligible while its terms' contributions cancel, or no
	// term carries any (aniso.NoLoadToShare).
	NoShare string `json:"no_share,omitempty"`
}

// NewCandidateCard describes a discovery candidate.
func NewCandidateCard(c *aniso.Candidate, chosen bool) CandidateCard {
	r := c.Compared()
	cc := CandidateCard{Name: c.Name, Layout: c.Layout.String(), Dispersion: r.Structure.Dispersion, InPlane: r.Structure.Planar, Size: c.Terms,
		Parameters: r.Complexity, Loss: Num(r.Loss), AICc: Num(r.AICc), BIC: Num(r.BIC),
		HeldoutError: Num(math.NaN()), HeldoutStdErr: Num(math.NaN()), Chosen: chosen, LowestR2: Num(math.NaN()),
		NotCrossValidated: c.NotCrossValidated}
	for i, t := range r.Structure.Terms {
		if r.Weights[i] > 0 {
			cc.Terms = append(cc.Terms, t.Label(r.Structure.Layout))
		}
		cc.Weights = append(cc.Weights, WeightOut{Term: t.Label(r.Structure.Layout), Weight: Num(r.Weights[i])})
	}
	for _, f := range r.Model.Families {
		cc.AnglesDeg = append(cc.AnglesDeg, Num(aniso.Deg(f.Angle)))
	}
	if minR2 := LowestR2(r.Metrics); !math.IsInf(minR2, 1) {
		cc.LowestR2 = Num(minR2)
	}
	if c.CV != nil {
		cc.Model = NewCandidateModel(r.Model)
		cc.HeldoutError, cc.HeldoutStdErr = Num(c.CV.Mean), Num(c.CV.StdErr)
		for _, f := range c.CV.Folds {
			s, n := 0.0, 0
			for _, m := range f.Metrics {
				if m.R2Defined {
					s += m.R2
					n++
				}
			}
			r2 := math.NaN()
			if n > 0 {
				r2 = s / float64(n)
			}
			cc.HeldoutFolds = append(cc.HeldoutFolds, FoldCard{Protocol: f.Protocol, Error: Num(f.Error), R2: Num(r2)})
		}
	}
	return cc
}

// NewSplitSection describes a stress split.
func NewSplitSection(s *aniso.StressSplit, measure string) *SplitSection {
	out := &SplitSection{Terms: s.Terms, Groups: s.Groups, Measure: measure}
	for _, g := range s.TermGroup {
		out.TermGroup = append(out.TermGroup, s.Groups[g])
	}
	for _, ps := range s.Protocols {
		pc := SplitProtocolCard{Protocol: ps.Protocol, EnergyShare: nums(ps.EnergyShare), GroupEnergyShare: map[string]Num{}, AtF: ps.AtF}
		for g, v := range ps.GroupEnergyShare {
			pc.GroupEnergyShare[s.Groups[g]] = Num(v)
		}
		for _, cs := range ps.Components {
			cc := SplitCompCard{Component: cs.Component, TermShare: nums(cs.TermShare), GroupShare: map[string]Num{}, NoShare: cs.NoShare}
			for g, v := range cs.GroupShare {
				cc.GroupShare[s.Groups[g]] = Num(v)
			}
			pc.Components = append(pc.Components, cc)
		}
		out.Protocols = append(out.Protocols, pc)
	}
	return out
}

// LowestR2 is the lowest R² of ms over the protocols and components where
// it is defined, or +Inf when it is defined nowhere.
func LowestR2(ms []aniso.Metric) float64 {
	low := math.Inf(1)
	for _, m := range ms {
		if m.R2Defined {
			low = math.Min(low, m.R2)
		}
	}
	return low
}
