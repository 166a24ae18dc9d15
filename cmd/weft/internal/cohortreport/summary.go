package cohortreport

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// Format is the format of cohort.json.
const Format = "weft.cohort/1"

// Statuses of a specimen's row.
const (
	StatusOK     = "ok"
	StatusFailed = "failed"
)

// Specimen is one input file of a cohort and what became of it.
type Specimen struct {
	// File is the path as given (cleaned, '/' separated); Name the
	// specimen's name; Group its group ("" when it has none); Folder its
	// output folder inside the cohort's, "" when it failed.
	File, Name, Group, Folder string
	// Problem is the specimen's data (nil when the file could not be
	// read); Result its fit of the shared form and CV its held-out score
	// (nil when it failed or has one protocol).
	Problem *aniso.Problem
	Result  *aniso.Result
	CV      *aniso.CVScore
	// Verdict and Form are what its own evidence says (see
	// aniso.CohortSpecimen); empty when the form was given.
	Verdict, Form string
	// DirectionGap is aniso.CohortSpecimen.DirectionGap (degrees; NaN when
	// not compared).
	DirectionGap float64
	// MisfitRatio is the ratio of its fit's residuals to its data's own
	// point-to-point scatter (aniso.MisfitScatterRatio); NaN when it could
	// not be estimated or the specimen failed.
	MisfitRatio float64
	// Err says why it failed; empty when it did not.
	Err string
	// Unweighted are the labels given a relative weight
	// (--protocol-weight) that its file has no protocol of: the weights
	// applied to the files that have them; nil when none.
	Unweighted []string
	// UntestedStrips are its card's strips the tests left out, each with
	// the band of the forms the pooled held-out protocols could not tell
	// from the cohort's (card.NewUntestedStrips); nil when the form was
	// given.
	UntestedStrips []card.UntestedStrip
	// Warnings are what reading its test file warned about (a repeated
	// block, a held load, a slip of the stretch, an untared preload, shear
	// within its scatter, …), as its card's data.warnings and weft inspect
	// give them; nil when there were none or the file could not be read.
	Warnings []string
}

// Input is everything the summary of a cohort is built from.
type Input struct {
	// Specimens in the cohort's order (sorted by file), failed ones too.
	Specimens []Specimen
	// Cohort is the fit; GroupBy says how groups were assigned ("" for
	// none).
	Cohort  *aniso.Cohort
	GroupBy string
	// Population and MeanParameters are the population model and the
	// mean-parameter model (nil when they could not be made);
	// StressUnit and StressKind those of the cohort.
	Population, MeanParameters *aniso.Model
	StressUnit, StressKind     string
	// Provenance says what made the cohort: the program and its version,
	// the options that decide the result and every file read; nil when
	// not recorded.
	Provenance *card.Provenance
}

// Summary is cohort.json.
type Summary struct {
	Format      string          `json:"format"`
	Cautions    []string        `json:"cautions"`
	StressUnit  string          `json:"stress_unit"`
	StressKind  string          `json:"stress_kind"`
	Form        FormInfo        `json:"form"`
	Verdict     *VerdictInfo    `json:"verdict"`
	GroupBy     string          `json:"group_by,omitempty"`
	Parameters  []ParamInfo     `json:"parameters"`
	Specimens   []SpecimenRow   `json:"specimens"`
	Stats       []StatRow       `json:"stats"`
	Comparisons []Comparison    `json:"comparisons"`
	Population  *PopulationInfo `json:"population"`
	Notes       []string        `json:"notes"`
	// Provenance is Input.Provenance.
	Provenance *card.Provenance `json:"provenance"`
}

// FormInfo is the shared model form.
type FormInfo struct {
	// How is "discovered" or "given".
	How string `json:"how"`
	// Key is the form key (aniso.FormKey), Layout the fibre layout, Terms
	// the terms as labelled in the cards.
	Key        string   `json:"key"`
	Layout     string   `json:"layout"`
	Terms      []string `json:"terms"`
	InPlane    bool     `json:"in_plane_dispersion"`
	Dispersion bool     `json:"dispersion"`
}

// VerdictInfo is the pooled discovery's verdict and evidence.
type VerdictInfo struct {
	Families string `json:"families"`
	Reason   string `json:"reason"`
	Rule     string `json:"rule"`
	Decider  string `json:"decider,omitempty"`
	// InSampleBest names the model that fits better in sample than the
	// verdict's answer when that leaves the verdict undecided (a
	// Fung-type preset, "preset:NAME", under the rule of fibreless
	// orthotropy); empty otherwise.
	InSampleBest string `json:"in_sample_best,omitempty"`
	// Support counts the specimens reaching the verdict on their own.
	Support    SupportInfo    `json:"support"`
	Search     []string       `json:"search"`
	Candidates []CandidateRow `json:"candidates"`
	// Presets are the classical presets without a fibre family and with a
	// Green-strain term, pooled over specimens as the candidates are, that
	// the verdict was compared with; empty when the pooled verdict has no
	// fibre families (nothing is fitted then).
	Presets []CandidateRow `json:"presets"`
}

// SupportInfo is aniso.CohortSupport.
type SupportInfo struct {
	Specimens   int `json:"specimens"`
	SameVerdict int `json:"same_verdict"`
	SameForm    int `json:"same_form"`
	// SameDirection counts the specimens of SameVerdict whose own chosen
	// model's fibre directions lie within ToleranceDeg (degrees) of the
	// cohort's chosen model's (families matched by angle, |α| without
	// shear information).
	SameDirection int     `json:"same_verdict_and_direction"`
	ToleranceDeg  float64 `json:"direction_tolerance_deg"`
}

// CandidateRow is one pooled candidate form: summed BIC over specimens,
// the pooled held-out error (mean over specimens of each one's mean fold
// error) and its standard error over specimens, null when not
// cross-validated.
type CandidateRow struct {
	Name          string   `json:"name"`
	Terms         []string `json:"terms"`
	Parameters    int      `json:"parameters"`
	BIC           card.Num `json:"bic"`
	HeldoutError  card.Num `json:"heldout_error"`
	HeldoutStdErr card.Num `json:"heldout_stderr"`
	Chosen        bool     `json:"chosen"`
}

// ParamInfo is one parameter of the shared form.
type ParamInfo struct {
	Name string `json:"name"`
	Unit string `json:"unit"`
	Kind string `json:"kind"`
	// Absolute is true for a fibre angle summarised as |α| because the
	// data of some specimen cannot tell its sign.
	Absolute bool   `json:"absolute"`
	Note     string `json:"note,omitempty"`
	// signlessPair marks the two angles of a mirror pair with a free axis
	// when some specimen's data cannot tell the sign of an angle: each
	// specimen's θ and β are then read from its families' magnitudes (see
	// signlessPair), not summarised one by one.
	signlessPair bool
}

// SpecimenRow is one specimen in cohort.json and cohort.csv.
type SpecimenRow struct {
	File     string `json:"file"`
	Specimen string `json:"specimen"`
	Group    string `json:"group"`
	Status   string `json:"status"`
	Error    string `json:"error,omitempty"`
	Folder   string `json:"folder,omitempty"`
	// Parameters by name, angles as summarised (see ParamInfo.Absolute).
	Parameters map[string]card.Num `json:"parameters,omitempty"`
	// LowestR2 is the lowest R² over protocols and components; HeldOut the
	// mean leave-one-protocol-out error (see card.HeldoutMetric).
	LowestR2 card.Num `json:"lowest_r2"`
	HeldOut  card.Num `json:"heldout_error"`
	Verdict  string   `json:"own_verdict,omitempty"`
	Form     string   `json:"own_form,omitempty"`
	// DirectionGap is, when the specimen's own verdict is the cohort's,
	// the largest distance (degrees) between its own chosen model's fibre
	// directions and the cohort's (0 when neither has fibres); null when
	// not compared or when only one of the two models has fibres.
	DirectionGap card.Num `json:"own_direction_gap_deg"`
	// MisfitRatio is its fit's residuals over its data's own
	// point-to-point scatter (Specimen.MisfitRatio): about 1 where the
	// shared form follows the specimen to its noise, aniso.MisfitFlagRatio
	// or more where it misses a feature of it; null when not estimated.
	MisfitRatio card.Num `json:"misfit_ratio"`
	// FamiliesRelabelled is true when the specimen's two fibre families
	// match the population fit's in the other order (aniso.FamiliesSwapped):
	// its Parameters are then under the population's labels, its own card's
	// f1 being the population's f2 and the other way round (a mirror pair's
	// θ and β read as θ + 90° and 90° − β, see pairRelabelled).
	FamiliesRelabelled bool `json:"families_relabelled,omitempty"`
	// Flags are the specimen's own fit's flags (aniso.Result.Flags), as
	// its card holds them.
	Flags []string `json:"flags,omitempty"`
	// Warnings are the reading warnings of the specimen's test file
	// (Specimen.Warnings).
	Warnings []string `json:"warnings,omitempty"`
	// Unweighted are the protocol labels given a weight that the
	// specimen's file has no protocol of (Specimen.Unweighted).
	Unweighted []string `json:"weights_not_applied,omitempty"`
	// Inactive are the terms of the shared form whose weight the
	// specimen's fit put at zero (aniso.StatusInactive): a zero, not a
	// flag, yet it enters the statistics as a value.
	Inactive []string `json:"inactive_terms,omitempty"`
}

// familySwap exchanges the labels of two families in estimate names.
var familySwap = strings.NewReplacer("angle_1", "angle_2", "angle_2", "angle_1",
	"concentration_1", "concentration_2", "concentration_2", "concentration_1",
	"dispersion_1", "dispersion_2", "dispersion_2", "dispersion_1", "@f1", "@f2", "@f2", "@f1")

// StatRow describes one parameter in one group ("all" for every specimen).
type StatRow struct {
	Parameter string      `json:"parameter"`
	Unit      string      `json:"unit"`
	Group     string      `json:"group"`
	N         int         `json:"n"`
	Mean      card.Num    `json:"mean"`
	SD        card.Num    `json:"sd"`
	Median    card.Num    `json:"median"`
	Q1        card.Num    `json:"q1"`
	Q3        card.Num    `json:"q3"`
	CI95      [2]card.Num `json:"ci95"`
	Note      string      `json:"note,omitempty"`
}

// TestResult is one test of a comparison: its statistic, degrees of
// freedom (null where the test has none), p-value and Holm-adjusted
// p-value over every parameter compared by the same test.
type TestResult struct {
	Statistic card.Num `json:"statistic"`
	DF        card.Num `json:"df"`
	P         card.Num `json:"p"`
	PHolm     card.Num `json:"p_holm"`
	// Exact is true for a Mann–Whitney p-value from the exact
	// distribution.
	Exact bool `json:"exact,omitempty"`
}

// Comparison compares the groups on one parameter: two groups by Welch's
// t-test, the Mann–Whitney U test and Hedges' g (first group minus
// second), more by the Kruskal–Wallis test.
type Comparison struct {
	Parameter     string      `json:"parameter"`
	Unit          string      `json:"unit"`
	Groups        []string    `json:"groups"`
	N             []int       `json:"n"`
	Welch         *TestResult `json:"welch,omitempty"`
	MannWhitney   *TestResult `json:"mann_whitney,omitempty"`
	HedgesG       *card.Num   `json:"hedges_g,omitempty"`
	KruskalWallis *TestResult `json:"kruskal_wallis,omitempty"`
	// Note is "|α|" when the values compared are an angle's magnitudes,
	// as the statistics' rows say.
	Note string `json:"note,omitempty"`
}

// Label is the parameter's name as tables show it: with its note, e.g.
// "angle (|α|)".
func (c Comparison) Label() string {
	if c.Note == "" {
		return c.Parameter
	}
	return c.Parameter + " (" + c.Note + ")"
}

// Build summarises a cohort.
func Build(in *Input) *Summary {
	s := &Summary{Format: Format, Cautions: cohortCautions(in.Synthetic()), StressUnit: in.StressUnit, StressKind: in.StressKind, GroupBy: in.GroupBy,
		Specimens: []SpecimenRow{}, Stats: []StatRow{}, Comparisons: []Comparison{}, Notes: []string{}}
	s.Form = formInfo(in.Cohort)
	s.Verdict = verdictInfo(in.Cohort)
	s.Parameters = parameters(in)
	values := s.specimenRows(in)
	s.statistics(in, values)
	s.compare(in, values)
	s.Population = populationInfo(in)
	s.Notes = append(s.Notes, statisticsNotes...)
	s.Notes = appendCountNote(s.Notes, s.Specimens, func(r SpecimenRow) int { return len(r.Flags) },
		"specimens whose own fit raised flags (a standard error larger than its value, a correlated pair, a parameter at a bound, …): %s; their values enter the statistics at full weight — see each one's flags in cohort.json and its card")
	// A shared form can miss what one specimen does (another structure,
	// a softening, an artefact): until 2026-12-05 only weft fit measured
	// that, and a cohort gave such a specimen's parameters without a word.
	s.Notes = appendCountNote(s.Notes, s.Specimens, func(r SpecimenRow) int {
		if float64(r.MisfitRatio) >= aniso.MisfitFlagRatio {
			return 1
		}
		return 0
	}, fmt.Sprintf("specimens the shared form misfits, its residuals %g or more times their data's own point-to-point scatter (misfit_ratio; each such fit carries a flag): %%s; the form does not follow what these specimens do, their parameters enter the statistics at full weight, and their own weft fit may find another form", aniso.MisfitFlagRatio))
	// Reading warnings were until 2026-12-05 only in each specimen's own
	// card: the cohort's outputs said nothing of a block written twice or
	// a load held at the peak in one of its files.
	s.Notes = appendCountNote(s.Notes, s.Specimens, func(r SpecimenRow) int { return len(r.Warnings) },
		"specimens whose test file was read with warnings (a repeated block, a held load, a slip of the stretch, an untared preload, shear within its scatter, …): %s; their values enter the statistics at full weight — see each one's warnings in cohort.json and its card")
	// A weight fitted to exactly zero raises no flag (0.002 would be
	// "degenerate"), yet the zero is averaged like any value (audit
	// 2026-12-05: four of ten specimens at 0, unnamed by the notes).
	s.Notes = appendCountNote(s.Notes, s.Specimens, func(r SpecimenRow) int { return len(r.Inactive) },
		"specimens whose fit put a term of the shared form at zero weight (inactive_terms): %s; those zeros enter the statistics at full weight, and the form may be richer than their data need")
	// A weight given to a protocol some files lack applies to the others
	// (until 2026-12-05 such a file failed and its data left the cohort).
	s.Notes = appendCountNote(s.Notes, s.Specimens, func(r SpecimenRow) int { return len(r.Unweighted) },
		"specimens without a protocol given a relative weight, so that weight did not apply to them (weights_not_applied): %s; each of their protocols keeps the weight 1 relative to the others")
	heldOut := in.Cohort != nil && in.Cohort.Discovery != nil && in.Cohort.Discovery.Best().CV != nil
	if note := stripsNote(in.Specimens, in.Cohort != nil && in.Cohort.Discovery == nil, heldOut); note != "" {
		s.Notes = append(s.Notes, note)
	}
	s.Provenance = in.Provenance
	return s
}

// StripSpread is the widest spread of one untested strip over a cohort's
// specimens (card.UntestedStrip.Percent) and whose it is.
type StripSpread struct {
	// Label is the strip's (card.UntestedStrip.Label); Listed how many
	// specimens list it.
	Label  string
	Listed int
	// Percent is the widest spread (per cent of that specimen's largest
	// normal stress along the strip) and Specimen whose it is; NaN and ""
	// when no specimen's card measures the strip. LeavesRangeAt is that
	// specimen's card.UntestedStrip.LeavesRangeAt (NaN when inside).
	Percent, LeavesRangeAt float64
	Specimen               string
}

// WidestStrips returns, for each strip the specimens list in order of
// first appearance, its widest spread over specimens.
func WidestStrips(sps []Specimen) []StripSpread {
	var out []StripSpread
	at := map[string]int{}
	for _, sp := range sps {
		for _, st := range sp.UntestedStrips {
			k, ok := at[st.Label]
			if !ok {
				k = len(out)
				at[st.Label] = k
				out = append(out, StripSpread{Label: st.Label, Percent: math.NaN(), LeavesRangeAt: math.NaN()})
			}
			w := &out[k]
			w.Listed++
			if p := float64(st.Percent); st.Models > 0 && !(p <= w.Percent) {
				w.Percent, w.Specimen, w.LeavesRangeAt = p, sp.Name, float64(st.LeavesRangeAt)
			}
		}
	}
	return out
}

// WidestStrip is WidestStrips' entry for label, or one with Specimen ""
// when no specimen lists it.
func WidestStrip(sps []Specimen, label string) StripSpread {
	for _, w := range WidestStrips(sps) {
		if w.Label == label {
			return w
		}
	}
	return StripSpread{Label: label, Percent: math.NaN(), LeavesRangeAt: math.NaN()}
}

// stripsNote names, for each strip the specimens' tests left out, the
// widest band over specimens and whose it is; "" when no specimen has
// strips. A cohort's parameters, like one fit's, do not settle a loading
// none of its tests came near (until 2026-12-05 a cohort said nothing of
// it). chosen says the form was given, not discovered: then no strip is
// measured, and the note only names them. heldOut says the discovered
// form has a pooled held-out error: without one (every specimen tested
// with one protocol) no form was cross-validated, and a strip nothing
// measures is not one that no form came near.
func stripsNote(sps []Specimen, chosen, heldOut bool) string {
	order := WidestStrips(sps)
	if len(order) == 0 {
		return ""
	}
	if chosen {
		var labels []string
		for _, w := range order {
			labels = append(labels, fmt.Sprintf("%s (%s)", w.Label, specimensText(w.Listed)))
		}
		return "untested strips, the loadings the specimens' tests left out: " + strings.Join(labels, "; ") +
			"; the form was chosen, not discovered, so no other candidate form measures how far the tests settle them; the parameters do not settle these loadings — see each specimen's card (untested_strips)"
	}
	var parts []string
	measured := false
	for _, w := range order {
		if w.Specimen == "" {
			// Until 2026-12-05 a cohort of one-protocol specimens, with
			// nothing held out, read that no form came near on the
			// pooled held-out protocols.
			why := "no form came near the cohort's on the pooled held-out protocols"
			if !heldOut {
				why = "no form was cross-validated (no specimen has a second protocol to hold one out)"
			}
			parts = append(parts, fmt.Sprintf("%s (%s): %s, nothing measures it", w.Label, specimensText(w.Listed), why))
			continue
		}
		measured = true
		part := fmt.Sprintf("%s (%s): up to %s %% (%s", w.Label, specimensText(w.Listed), card.PercentText(w.Percent), w.Specimen)
		if w.LeavesRangeAt > 0 {
			// A runaway beyond the tested range is extrapolation, not
			// a spread the tests left open within it.
			part += fmt.Sprintf(", whose strip leaves its fitted data range from stretch %.3g on", w.LeavesRangeAt)
		}
		parts = append(parts, part+")")
	}
	intro := "untested strips, the loadings the specimens' tests left out, with the widest spread over specimens of the forms the pooled held-out protocols could not tell from the cohort's, each fitted to that specimen, in per cent of its largest normal stress there: "
	if !measured {
		// No spread to give: the strips are named with why.
		intro = "untested strips, the loadings the specimens' tests left out: "
	}
	return intro + strings.Join(parts, "; ") + "; the parameters do not settle these loadings — see each specimen's card (untested_strips)"
}

// statisticsNotes say how to read the statistics.
var statisticsNotes = []string{
	"ci95 is the 95 % interval of the mean over specimens, mean ± t(0.975, n − 1)·SD/√n (Student 1908), exact for normally distributed values at any n; q1, median and q3 interpolate between order statistics (Hyndman & Fan 1996, type 7).",
	"Specimens are independent; the statistics describe the specimens fitted, not tissue in general, and each parameter holds only within the stretch range and protocols tested.",
	"Comparing many parameters inflates false positives: read p_holm (Holm 1979, over every parameter compared by the same test), not p.",
}

// Synthetic reports whether any specimen's data say they are synthetic
// (notes, tissue or name; card.SaysSynthetic).
func (in *Input) Synthetic() bool {
	for _, sp := range in.Specimens {
		if p := sp.Problem; p != nil && card.SaysSynthetic(p.Specimen.Meta["notes"], p.Specimen.Meta["tissue"], p.Specimen.Name) {
			return true
		}
	}
	return false
}

// cohortCautions are the cards' cautions with the cohort's own.
func cohortCautions(synthetic bool) []string {
	return append(append([]string(nil), card.CautionsFor(synthetic)...),
		"Group statistics describe the specimens tested; they are not a population reference, and the population model is not an average tissue for clinical use.")
}

func formInfo(c *aniso.Cohort) FormInfo {
	f := FormInfo{How: "given", Key: aniso.FormKey(c.Form), Layout: c.Form.Layout.String(), InPlane: c.Form.Planar, Dispersion: c.Form.Dispersion, Terms: []string{}}
	if c.Discovery != nil {
		f.How = "discovered"
	}
	for _, t := range c.Form.Terms {
		f.Terms = append(f.Terms, t.Label(c.Form.Layout))
	}
	return f
}

func verdictInfo(c *aniso.Cohort) *VerdictInfo {
	d := c.Discovery
	if d == nil {
		return nil
	}
	su := c.Support
	v := &VerdictInfo{Families: d.Verdict.Families, Reason: d.Verdict.Reason, Rule: d.Rule, Decider: d.Verdict.Decider, InSampleBest: d.Verdict.InSampleBest,
		Support: SupportInfo{Specimens: su.Specimens, SameVerdict: su.SameVerdict, SameForm: su.SameForm, SameDirection: su.SameDirection, ToleranceDeg: aniso.DirectionToleranceDeg},
		Search:  d.Search, Candidates: []CandidateRow{}, Presets: []CandidateRow{}}
	for i, pc := range d.Pareto {
		v.Candidates = append(v.Candidates, candidateRow(pc, i == d.Chosen))
	}
	for _, pc := range d.Presets {
		v.Presets = append(v.Presets, candidateRow(pc, false))
	}
	return v
}

// candidateRow is one pooled candidate or preset.
func candidateRow(pc aniso.Candidate, chosen bool) CandidateRow {
	r := pc.Result
	row := CandidateRow{Name: pc.Name, Parameters: r.Complexity, BIC: card.Num(r.BIC), HeldoutError: card.Num(math.NaN()),
		HeldoutStdErr: card.Num(math.NaN()), Chosen: chosen, Terms: []string{}}
	for _, t := range r.Structure.Terms {
		row.Terms = append(row.Terms, t.Label(r.Structure.Layout))
	}
	if pc.CV != nil {
		row.HeldoutError, row.HeldoutStdErr = card.Num(pc.CV.Mean), card.Num(pc.CV.StdErr)
	}
	return row
}

// isPeriodicAngle reports whether an estimate is a fibre angle defined
// modulo 180° (a mirror pair's half angle is not).
func isPeriodicAngle(e aniso.Estimate) bool { return e.Kind == "angle" && e.Name != "half_angle" }

// parameters lists the shared form's estimates; angles become |α| when
// any specimen's data cannot tell their sign.
func parameters(in *Input) []ParamInfo {
	out := []ParamInfo{}
	signKnown := true
	var first *aniso.Result
	for _, sp := range in.Specimens {
		if sp.Result != nil {
			signKnown = signKnown && sp.Result.SignKnown
			if first == nil {
				first = sp.Result
			}
		}
	}
	if first == nil {
		return out
	}
	freePair := first.Structure.Layout == aniso.LayoutMirror && !first.Structure.HoldPairAxis
	for _, e := range first.Estimates {
		p := ParamInfo{Name: e.Name, Unit: e.Unit, Kind: e.Kind}
		if !signKnown && freePair && (e.Name == "mean_angle" || e.Name == "half_angle") {
			p.signlessPair = true
			p.Note = signlessPairNote
			out = append(out, p)
			continue
		}
		if isPeriodicAngle(e) {
			if signKnown {
				p.Note = "signed angle, each specimen's taken on the branch (modulo 180°) nearest the population's"
			} else {
				p.Absolute = true
				p.Note = "|α|: the data of at least one specimen carry no shear information, so the sign of the angle is not determined and its magnitude is summarised"
			}
		}
		out = append(out, p)
	}
	return out
}

// specimenRows writes the specimens' rows and returns each parameter's
// values per specimen (NaN where missing).
func (s *Summary) specimenRows(in *Input) [][]float64 {
	ref := map[string]float64{}
	if pop := in.Cohort.Population; pop != nil {
		for _, e := range pop.Estimates {
			ref[e.Name] = e.Value
		}
	}
	signKnown := true
	for _, sp := range in.Specimens {
		if sp.Result != nil {
			signKnown = signKnown && sp.Result.SignKnown
		}
	}
	values := make([][]float64, len(s.Parameters))
	for _, sp := range in.Specimens {
		row := SpecimenRow{File: sp.File, Specimen: sp.Name, Group: sp.Group, Status: StatusOK, Folder: sp.Folder,
			LowestR2: card.Num(math.NaN()), HeldOut: card.Num(math.NaN()), Verdict: sp.Verdict, Form: sp.Form, DirectionGap: card.Num(sp.DirectionGap), MisfitRatio: card.Num(sp.MisfitRatio),
			Warnings: append([]string(nil), sp.Warnings...), Unweighted: append([]string(nil), sp.Unweighted...)}
		byName := map[string]aniso.Estimate{}
		if sp.Result == nil {
			row.Status, row.Error, row.Folder = StatusFailed, sp.Err, ""
		} else {
			row.Parameters = map[string]card.Num{}
			// Two families whose labels the fit swapped against the
			// population's are read under the population's labels.
			rename := func(e aniso.Estimate) aniso.Estimate { return e }
			if pop := in.Cohort.Population; pop != nil && aniso.FamiliesSwapped(sp.Result.Model, pop.Model, signKnown) {
				row.FamiliesRelabelled = true
				rename = func(e aniso.Estimate) aniso.Estimate {
					e.Name = familySwap.Replace(e.Name)
					if sp.Result.Structure.Layout == aniso.LayoutMirror && !sp.Result.Structure.HoldPairAxis {
						e = pairRelabelled(e)
					}
					return e
				}
			}
			for _, e := range sp.Result.Estimates {
				e = rename(e)
				byName[e.Name] = e
			}
			if !signKnown {
				signlessPairAngles(byName, sp.Result, row.FamiliesRelabelled)
			}
			if r2 := card.LowestR2(sp.Result.Metrics); !math.IsInf(r2, 1) {
				row.LowestR2 = card.Num(r2)
			}
			if sp.CV != nil {
				row.HeldOut = card.Num(sp.CV.Mean)
			}
			row.Flags = append([]string(nil), sp.Result.Flags...)
			for _, e := range sp.Result.Estimates {
				if e.Status == aniso.StatusInactive && strings.HasPrefix(e.Name, "weight[") {
					row.Inactive = append(row.Inactive, strings.TrimSuffix(strings.TrimPrefix(e.Name, "weight["), "]"))
				}
			}
		}
		for k, p := range s.Parameters {
			v := math.NaN()
			if e, ok := byName[p.Name]; ok {
				v = summarisedValue(p, e.Value, ref)
				row.Parameters[p.Name] = card.Num(v)
			}
			values[k] = append(values[k], v)
		}
		s.Specimens = append(s.Specimens, row)
	}
	return values
}

// pairRelabelled is a mirror pair's estimate read with its two families'
// labels exchanged. The pair's families lie at θ + β and θ − β (modulo
// 180°); the same two families under the other labels are θ' ± β' with
// θ' = θ + 90° and β' = 90° − β (θ' + β' = θ − β + 180°, θ' − β' = θ + β).
// A fit can end in either parameterisation; averaged as fitted, a pair
// near 0° ± 47° read as 82° ± 43° pulled a cohort's mean axis 11° off.
func pairRelabelled(e aniso.Estimate) aniso.Estimate {
	switch e.Name {
	case "mean_angle":
		e.Value, e.Lo, e.Hi = e.Value+90, e.Lo+90, e.Hi+90
	case "half_angle":
		e.Value, e.Lo, e.Hi = 90-e.Value, 90-e.Hi, 90-e.Lo
	}
	return e
}

// signlessPairNote is the note of a free mirror pair's angles when some
// specimen's data cannot tell the sign of an angle.
const signlessPairNote = "a mirror pair whose angles' signs the data of at least one specimen do not determine: each specimen's families are read as the mean-parameter card reads them, the first at +|α1| and the second at −|α2|, so mean_angle = (|α1| − |α2|)/2 and half_angle = (|α1| + |α2|)/2"

// signlessPairAngles replaces a free mirror pair's mean_angle and
// half_angle in byName by those of its families' magnitudes, the first
// family at +|α1| and the second at −|α2| (swapped says its labels were
// exchanged to match the population's). Without shear information a
// family at α and one at −α give the same normal stresses, I4 =
// λ1²cos²α + λ2²sin²α being even in α (Holzapfel, Gasser & Ogden 2000),
// so one pair has many (θ, β): SYNTHETIC pairs near ±35° and ±50°
// about axis 1 were fitted as (34°, 0°), (55°, 90°) and (0.4°, 51.4°),
// and averaged as fitted their half angles came out 22.5° and 35.1°
// where the mean-parameter card, which reads families this way, had one
// pair at 0.2° ± 42.0°.
func signlessPairAngles(byName map[string]aniso.Estimate, r *aniso.Result, swapped bool) {
	if r.Structure.Layout != aniso.LayoutMirror || r.Structure.HoldPairAxis || len(r.Model.Families) != 2 {
		return
	}
	a0, a1 := r.Model.Families[0].Angle, r.Model.Families[1].Angle
	if swapped {
		a0, a1 = a1, a0
	}
	m0, m1 := math.Abs(aniso.WrapDeg(aniso.Deg(a0))), math.Abs(aniso.WrapDeg(aniso.Deg(a1)))
	for name, v := range map[string]float64{"mean_angle": (m0 - m1) / 2, "half_angle": (m0 + m1) / 2} {
		if e, ok := byName[name]; ok {
			e.Value = v
			byName[name] = e
		}
	}
}

// summarisedValue is an estimate as the statistics take it: a periodic
// angle as |α| or on the branch nearest the population's value.
func summarisedValue(p ParamInfo, v float64, ref map[string]float64) float64 {
	if p.Kind != "angle" || p.Name == "half_angle" || p.signlessPair {
		return v
	}
	v = aniso.WrapDeg(v)
	if p.Absolute {
		return math.Abs(v)
	}
	if r, ok := ref[p.Name]; ok {
		return r + aniso.WrapDeg(v-r)
	}
	return v
}

// groups lists the group names in sorted order.
func groups(in *Input) []string {
	seen := map[string]bool{}
	var out []string
	for _, sp := range in.Specimens {
		if sp.Group != "" && sp.Result != nil && !seen[sp.Group] {
			seen[sp.Group] = true
			out = append(out, sp.Group)
		}
	}
	sort.Strings(out)
	return out
}

// valuesOf picks the non-NaN values of the specimens in group g ("" for
// every specimen).
func valuesOf(in *Input, vals []float64, g string) []float64 {
	var out []float64
	for i, sp := range in.Specimens {
		if (g == "" || sp.Group == g) && !math.IsNaN(vals[i]) {
			out = append(out, vals[i])
		}
	}
	return out
}

// statistics describes every parameter over all specimens and per group.
func (s *Summary) statistics(in *Input, values [][]float64) {
	gs := groups(in)
	for k, p := range s.Parameters {
		note := ""
		if p.Absolute {
			note = "|α|"
		}
		for _, g := range append([]string{""}, gs...) {
			name := g
			if g == "" {
				name = "all"
			}
			d := Describe(valuesOf(in, values[k], g))
			s.Stats = append(s.Stats, StatRow{Parameter: p.Name, Unit: p.Unit, Group: name, N: d.N, Mean: card.Num(d.Mean), SD: card.Num(d.SD),
				Median: card.Num(d.Median), Q1: card.Num(d.Q1), Q3: card.Num(d.Q3), CI95: [2]card.Num{card.Num(d.CI95[0]), card.Num(d.CI95[1])}, Note: note})
		}
	}
}

// compare tests the groups on every parameter and adjusts each test's
// p-values over the parameters (Holm 1979).
func (s *Summary) compare(in *Input, values [][]float64) {
	gs := groups(in)
	if len(gs) < 2 {
		return
	}
	var pw, pm, pk []float64
	for k, p := range s.Parameters {
		c := Comparison{Parameter: p.Name, Unit: p.Unit, Groups: gs}
		if p.Absolute {
			c.Note = "|α|"
		}
		var samples [][]float64
		for _, g := range gs {
			x := valuesOf(in, values[k], g)
			samples = append(samples, x)
			c.N = append(c.N, len(x))
		}
		if len(gs) == 2 {
			t, df, pv := Welch(samples[0], samples[1])
			c.Welch = &TestResult{Statistic: card.Num(t), DF: card.Num(df), P: card.Num(pv)}
			u, pu, exact := MannWhitney(samples[0], samples[1])
			c.MannWhitney = &TestResult{Statistic: card.Num(u), DF: card.Num(math.NaN()), P: card.Num(pu), Exact: exact}
			g := card.Num(HedgesG(samples[0], samples[1]))
			c.HedgesG = &g
			pw, pm = append(pw, pv), append(pm, pu)
		} else {
			h, df, pv := KruskalWallis(samples...)
			c.KruskalWallis = &TestResult{Statistic: card.Num(h), DF: card.Num(df), P: card.Num(pv)}
			pk = append(pk, pv)
		}
		s.Comparisons = append(s.Comparisons, c)
	}
	hw, hm, hk := Holm(pw), Holm(pm), Holm(pk)
	for i := range s.Comparisons {
		c := &s.Comparisons[i]
		if c.Welch != nil {
			c.Welch.PHolm, c.MannWhitney.PHolm = card.Num(hw[i]), card.Num(hm[i])
		}
		if c.KruskalWallis != nil {
			c.KruskalWallis.PHolm = card.Num(hk[i])
		}
	}
}

// appendCountNote appends to notes, when some specimens have a positive
// count, the note format with their list ("S-1 (2), S-4 (1)") put in.
func appendCountNote(notes []string, rows []SpecimenRow, count func(SpecimenRow) int, format string) []string {
	var named []string
	for _, r := range rows {
		if n := count(r); n > 0 {
			named = append(named, fmt.Sprintf("%s (%d)", r.Specimen, n))
		}
	}
	if len(named) == 0 {
		return notes
	}
	return append(notes, fmt.Sprintf(format, strings.Join(named, ", ")))
}

// specimensText is "1 specimen" or "n specimens".
func specimensText(n int) string {
	if n == 1 {
		return "1 specimen"
	}
	return fmt.Sprintf("%d specimens", n)
}
