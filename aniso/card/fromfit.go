package card

import (
	"math"
	"path/filepath"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/biaxial"
)

// HeldoutMetric says what the held-out error of the selection evidence
// measures.
const HeldoutMetric = "held-out normalised RMSE: sqrt(weighted SSE / components) of the left-out protocol, rows weighted by 1/(range*sqrt(points)) of their protocol and axis"

// FromFit writes a fitted model and its evidence as a card: the model
// (FromModel) with its specimen and fibre layout, and the sections Fit,
// Data, DataRange, Alternatives when the data leave the layout
// undetermined and, when the split can be computed, Split. d is the
// discovery that chose r (nil for a chosen form); with it the card also
// holds the Verdict and the Selection evidence.
func FromFit(p *aniso.Problem, r *aniso.Result, d *aniso.Discovery) *Card {
	s := p.Specimen
	signs := make([]bool, len(r.Model.Families))
	for i := range signs {
		signs[i] = r.SignKnown
	}
	c := FromModel(r.Model, s.StressUnit, signs)
	c.Specimen = s.Name
	c.Layout = fitLayout(r)
	c.Fit = NewFitSection(r, s.Kind.String(), s.StressUnit)
	c.DataRange = NewDataRange(p, r.Model)
	c.Alternatives = NewAlternativesSection(r.Model, s.StressUnit, signs)
	if c.Alternatives != nil && s.ShearWithinScatter && !s.HasShear {
		c.Alternatives.Reason = AlternativesReasonScatter
	}
	c.Data = NewDataSection(s)
	c.Setup = NewSetup(s)
	if sp, err := aniso.Split(p, r.Model); err == nil {
		c.Split = NewSplitSection(sp, "share of the magnitude of modelled "+s.Kind.Words()+" stress, summed over each protocol's points")
	}
	if d != nil {
		v := NewVerdictSection(d.Verdict, aniso.FormKey(d.Best().Result.Structure))
		c.Verdict = &v
		c.Selection = newSelectionSection(p, d)
	}
	c.Cautions = CautionsOf(c)
	return c
}

// fitLayout describes how r parameterised its families; nil without
// fibres. A mirror pair's families sit at θ ± β: θ is their mean angle and
// β half their difference, as the fit estimated them (mean_angle, wrapped
// into (−90°, 90°], and half_angle; θ = 0 on a held axis). Worked out from
// the families' wrapped angles instead, the same pair could read as
// θ − 90° ± (90° − β) beside estimates of θ ± β (−7.88° ± 47.08° beside
// 82.12° ± 42.92°).
func fitLayout(r *aniso.Result) *Layout {
	switch r.Structure.Layout {
	case aniso.LayoutMirror:
		ps := r.Params()
		mean := aniso.WrapDeg(aniso.Deg(ps["mean_angle"])) // absent on a held axis: 0
		half := aniso.Deg(ps["half_angle"])
		if _, ok := ps["half_angle"]; !ok {
			// Not a fit's result: from the families' angles.
			a0, a1 := r.Model.Families[0].Angle, r.Model.Families[1].Angle
			mean, half = aniso.Deg((a0+a1)/2), aniso.Deg(math.Abs(a0-a1)/2)
		}
		axis := "free"
		if r.Structure.HoldPairAxis {
			axis = "axis-1"
		}
		return &Layout{Kind: "mirror", MeanDeg: &mean, HalfAngleDeg: &half, PairAxis: axis}
	case aniso.LayoutFree:
		return &Layout{Kind: "free"}
	case aniso.LayoutSingle:
		return &Layout{Kind: "single"}
	}
	return nil
}

// newSelectionSection is the evidence of discovery d on p.
func newSelectionSection(p *aniso.Problem, d *aniso.Discovery) *SelectionSection {
	sel := &SelectionSection{Rule: d.Rule, Chosen: d.Best().Name, Search: d.Search, HeldoutMetric: HeldoutMetric,
		Points: d.Points, SearchPoints: d.SearchPoints}
	for i := range d.Pareto {
		sel.Pareto = append(sel.Pareto, NewCandidateCard(&d.Pareto[i], i == d.Chosen))
	}
	for i := range d.Presets {
		sel.Presets = append(sel.Presets, NewCandidateCard(&d.Presets[i], false))
	}
	for _, pi := range p.Protocols {
		sel.Protocols = append(sel.Protocols, p.Specimen.Protocols[pi].Label)
	}
	for _, row := range d.CrossR2 {
		var nr []Num // nil for an empty row, as earlier cards wrote it
		for _, x := range row {
			nr = append(nr, Num(x))
		}
		sel.CrossR2 = append(sel.CrossR2, nr)
	}
	return sel
}

// NewDataSection describes the data of s. Warnings and notices name the
// input by its base name only, so that the card does not depend on how its
// path was typed (or reveal where it lives).
func NewDataSection(s *biaxial.Specimen) *DataSection {
	d := &DataSection{Specimen: s.Name, Source: filepath.Base(s.Source), Sheet: s.Sheet, Tissue: s.Meta["tissue"], Notes: s.Meta["notes"],
		Axis1: s.Meta["axis_1"], StressKind: s.Kind.String(), StressUnit: s.StressUnit, Reference: s.Reference,
		HasShear: s.HasShear, ShearWithinScatter: s.ShearWithinScatter, Warnings: []string{}, Notices: append([]string{}, s.Notices...)}
	d.StressMeasure, d.StressMeasureNote = stressMeasure(s)
	if g := s.Geometry; g != nil {
		d.Geometry = &GeometryCard{ThicknessMM: g.Thickness, Size1MM: g.Size1, Size2MM: g.Size2}
	}
	for _, pr := range s.Protocols {
		d.Protocols = append(d.Protocols, DataProtocolCard{Label: pr.Label, Points: len(pr.Points), Kept: pr.Kept, Cycles: pr.Cycles, Weight: pr.UserWeight})
	}
	base := filepath.Base(s.Source)
	for _, w := range s.Warnings {
		w.File = base
		d.Warnings = append(d.Warnings, w.String())
	}
	for i, n := range d.Notices {
		d.Notices[i] = strings.ReplaceAll(n, s.Source, base)
	}
	return d
}

// stressMeasure says what stress the file of s gave, as a key and in
// words.
func stressMeasure(s *biaxial.Specimen) (key, note string) {
	switch {
	case s.FromLoads:
		return "loads", "edge loads converted to nominal (first Piola-Kirchhoff) stress with the reference geometry: P11 = load_1/(W2 H), P22 = load_2/(W1 H)"
	case s.Kind == biaxial.Nominal:
		return "nominal", "nominal (first Piola-Kirchhoff) stress P = sigma F^-T, force per reference area"
	}
	return "cauchy", "Cauchy stress, force per current area"
}
