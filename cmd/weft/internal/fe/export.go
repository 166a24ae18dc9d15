package fe

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"sort"
	"strings"
	"text/tabwriter"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/terms"
)

// exportFormat is the version of export's JSON document.
const exportFormat = "weft.export/2"

// verificationLead are the first columns of the verification table; the
// stress columns follow, named as predict names them, then the energy, the
// second Piola–Kirchhoff stress, the flags and, when the card lists
// alternatives, the alternative of each row.
var verificationLead = []string{"case", "direction_deg", "stretch_or_shear", "F11", "F12", "F21", "F22"}

// ExportParam is one row of the parameter table.
type ExportParam struct {
	Term       int      `json:"term"`
	ID         string   `json:"id"`
	Argument   string   `json:"argument"`
	Family     string   `json:"family,omitempty"`
	AngleDeg   *float64 `json:"angle_deg,omitempty"`
	Dispersion *float64 `json:"dispersion,omitempty"`
	// Concentration is the in-plane concentration b of a planar family.
	Concentration *float64           `json:"concentration,omitempty"`
	Weight        float64            `json:"weight"`
	WeightUnit    string             `json:"weight_unit"`
	Params        map[string]float64 `json:"params"`
	Formula       string             `json:"formula"`
	// Polyconvex is the catalogue's claim for the shape on this term's
	// family: false for a fibre term on a family with dispersion κ > 0
	// (aniso.Model.TermPolyconvex).
	Polyconvex bool `json:"polyconvex"`
}

// ExportPoint is one row of the verification table.
type ExportPoint struct {
	// Alternative names the alternative model of the row; empty for a
	// card without alternatives.
	Alternative    string  `json:"alternative,omitempty"`
	Case           string  `json:"case"`
	DirectionDeg   float64 `json:"direction_deg"`
	StretchOrShear float64 `json:"stretch_or_shear"`
	LateralStretch float64 `json:"lateral_stretch"`
	F11            float64 `json:"F11"`
	F12            float64 `json:"F12"`
	F21            float64 `json:"F21"`
	F22            float64 `json:"F22"`
	Cauchy11       float64 `json:"cauchy_11"`
	Cauchy22       float64 `json:"cauchy_22"`
	Cauchy12       float64 `json:"cauchy_12"`
	Nominal11      float64 `json:"nominal_11"`
	Nominal22      float64 `json:"nominal_22"`
	Nominal12      float64 `json:"nominal_12"`
	Nominal21      float64 `json:"nominal_21"`
	// Energy is W per unit reference volume; PK2 the in-plane second
	// Piola–Kirchhoff stress S = F⁻¹σF⁻ᵀ (stress unit).
	Energy float64 `json:"energy"`
	PK211  float64 `json:"pk2_11"`
	PK222  float64 `json:"pk2_22"`
	PK212  float64 `json:"pk2_12"`
	// Flags are short codes ("switch:f1:I4", "non-unique-lateral") of a
	// row an independent implementation may reproduce differently;
	// FlagNotes say why in words.
	Flags       []string `json:"flags,omitempty"`
	FlagNotes   []string `json:"flag_notes,omitempty"`
	OutsideData []string `json:"outside_data_range,omitempty"`
}

// ExportAbsent is a row of the table that has no values: the model
// cannot be evaluated there.
type ExportAbsent struct {
	Alternative    string  `json:"alternative,omitempty"`
	Case           string  `json:"case"`
	DirectionDeg   float64 `json:"direction_deg"`
	StretchOrShear float64 `json:"stretch_or_shear"`
	Reason         string  `json:"reason"`
}

// ExportModel is one alternative model of a card whose fibre layout the
// data leave undetermined.
type ExportModel struct {
	Name        string        `json:"name"`
	Title       string        `json:"title"`
	AsCard      bool          `json:"as_card"`
	Energy      string        `json:"energy"`
	EnergyLaTeX string        `json:"energy_latex"`
	Parameters  []ExportParam `json:"parameters"`
	// Shown is true when the verification table holds its rows.
	Shown bool `json:"shown"`
	model *aniso.Model
}

// ExportAlternatives is what export says about the alternatives.
type ExportAlternatives struct {
	Reason   string        `json:"reason"`
	Decider  string        `json:"decider"`
	Choosing string        `json:"choosing"`
	Models   []ExportModel `json:"models"`
}

// ExportDoc is everything export writes, in every format.
type ExportDoc struct {
	Format      string           `json:"format"`
	Model       string           `json:"model"`
	Specimen    string           `json:"specimen,omitempty"`
	StressUnit  string           `json:"stress_unit"`
	Cautions    []string         `json:"cautions"`
	Energy      string           `json:"energy"`
	EnergyLaTeX string           `json:"energy_latex"`
	Conventions card.Conventions `json:"conventions"`
	Parameters  []ExportParam    `json:"parameters"`
	// Alternatives is set when the card's fibre layout is undetermined.
	Alternatives *ExportAlternatives `json:"alternatives,omitempty"`
	Notes        []string            `json:"verification_notes"`
	Columns      []string            `json:"verification_columns"`
	Verification []ExportPoint       `json:"verification"`
	// Absent lists the rows the model cannot be evaluated at.
	Absent []ExportAbsent `json:"verification_absent"`
	// ThreeD is the block on three-dimensional, nearly incompressible use.
	ThreeD    ThreeDBlock     `json:"three_dimensional"`
	DataRange *card.DataRange `json:"data_range,omitempty"`
	Warnings  []string        `json:"warnings"`
	Notices   []string        `json:"notices"`
}

// ExportOptions choose what export shows.
type ExportOptions struct {
	// Alternative names (or numbers, from 1) the one alternative whose
	// verification rows are shown; empty shows every alternative.
	Alternative string
}

// stressColumns returns predict's stress column names with the unit.
func stressColumns(unit string) []string {
	out := make([]string, len(StressColumnNames))
	for i, n := range StressColumnNames {
		out[i] = fmt.Sprintf("%s [%s]", n, unit)
	}
	return out
}

// parameters is the parameter table of m with weights in unit.
func parameters(m *aniso.Model, unit string) ([]ExportParam, *card.Card) {
	fc := card.FromModel(m, unit, nil)
	names := familyNames(m)
	var out []ExportParam
	for i, t := range m.Terms {
		p := ExportParam{Term: i + 1, ID: t.Shape.ID, Argument: t.Shape.Arg.String(), Weight: t.Weight, WeightUnit: unit,
			Params: map[string]float64{}, Formula: t.Shape.Formula, Polyconvex: m.TermPolyconvex(i)}
		for j, q := range t.Shape.Params {
			p.Params[q.Name] = t.Params[j]
		}
		if t.Family >= 0 {
			// The card's family: its angle in (−90°, 90°] and its spread.
			f := fc.Families[t.Family]
			p.Family, p.AngleDeg, p.Concentration, p.Dispersion = names[t.Family], f.AngleDeg, f.Concentration, f.Dispersion
		}
		out = append(out, p)
	}
	return out, fc
}

// BuildExport computes the parameter and verification tables of the card
// (and of each alternative it lists, or the one opt chooses) and the block
// on three-dimensional use.
func BuildExport(file string, c *card.Card, m *aniso.Model, dr *card.DataRange, opt ExportOptions) (*ExportDoc, error) {
	params, fc := parameters(m, c.StressUnit)
	doc := &ExportDoc{Format: exportFormat, Model: filepath.Base(file), Specimen: c.Specimen, StressUnit: c.StressUnit,
		Cautions: card.CautionsOf(c), Energy: fc.Energy, EnergyLaTeX: fc.EnergyLaTeX, Conventions: card.StandardConventions,
		Parameters: params, DataRange: dr, Absent: []ExportAbsent{}, Warnings: []string{}, Notices: []string{}}
	shown, err := exportAlternatives(doc, file, c, m, opt)
	if err != nil {
		return nil, err
	}
	doc.Columns = append(append([]string(nil), verificationLead...), stressColumns(c.StressUnit)...)
	doc.Columns = append(doc.Columns, fmt.Sprintf("energy [%s]", c.StressUnit), fmt.Sprintf("pk2_11 [%s]", c.StressUnit),
		fmt.Sprintf("pk2_22 [%s]", c.StressUnit), fmt.Sprintf("pk2_12 [%s]", c.StressUnit), "flags")
	if doc.Alternatives != nil {
		doc.Columns = append(doc.Columns, "alternative")
	}
	// Every model shares the directions of all of them, so that the rows
	// of alternatives can be compared line by line.
	union := &aniso.Model{}
	for _, sm := range shown {
		union.Families = append(union.Families, sm.model.Families...)
	}
	if doc.Alternatives != nil {
		union.Families = nil
		for _, am := range doc.Alternatives.Models {
			union.Families = append(union.Families, am.model.Families...)
		}
	}
	settings := aniso.DefaultVerificationSettings(union)
	total, outside, flagged := 0, 0, 0
	stiffest := 0.0 // largest |∂P_i/∂F_j| of the thickness-coupled terms over the rows, for the bulk modulus
	for _, sm := range shown {
		coupled := thicknessCoupled(sm.model)
		pts, err := aniso.VerificationCases(sm.model, settings)
		if err != nil {
			return nil, cardErrorf("%s: verification table: %v", file, err)
		}
		total += len(pts)
		for i := range pts {
			e, ok := exportPoint(doc, &pts[i], sm, dr)
			if !ok {
				continue
			}
			if len(e.OutsideData) > 0 {
				outside++
			}
			if len(e.Flags) > 0 {
				flagged++
			}
			if tg, err := coupled.Tangent(pts[i].F); err == nil {
				for _, row := range tg.A {
					for _, a := range row {
						if a = math.Abs(a); a > stiffest && !math.IsInf(a, 0) {
							stiffest = a
						}
					}
				}
			}
			doc.Verification = append(doc.Verification, e)
		}
	}
	doc.Notes = verificationNotes(c.StressUnit)
	if len(doc.Verification) == 0 {
		return nil, cardErrorf("%s: the model cannot be evaluated at any verification point (%s)", file, doc.Absent[0].Reason)
	}
	exportWarnings(doc, m, total, outside, flagged)
	doc.ThreeD = threeDBlock(m, c.StressUnit, stiffest)
	return doc, nil
}

// thicknessCoupled returns a copy of m that keeps only the terms whose
// energy depends on C33, the ones whose stiffness the bulk modulus must
// dominate in a volumetric–isochoric split: I1, I2 and principal-stretch
// terms, cofactor terms (K = I5 − I1 I4 + I2), and fibre terms of a
// family with dispersion κ > 0 (E_f holds κ I1). The others (κ = 0 and
// in-plane dispersed fibres, I5 and Fung-type terms) see only the
// in-plane C, so plane stress decouples them from J: on the bundled demo
// membrane M1 their stiffness at the table's largest stretches is a
// thousand times its weights and moves the nearly incompressible form by
// 2e-5 only.
func thicknessCoupled(m *aniso.Model) *aniso.Model {
	c := &aniso.Model{Families: m.Families, Terms: append([]aniso.Term(nil), m.Terms...)}
	for i, t := range c.Terms {
		coupled := false
		switch t.Shape.Arg {
		case terms.I1, terms.I2, terms.Principal, terms.Cofactor:
			coupled = true
		case terms.Fibre:
			coupled = t.Family >= 0 && t.Family < len(m.Families) && m.Families[t.Family].Dispersion > 0
		}
		if !coupled {
			c.Terms[i].Weight = 0
		}
	}
	return c
}

// exportPoint turns a verification point of model sm into a row; a point
// that could not be evaluated goes to doc.Absent instead (ok false).
func exportPoint(doc *ExportDoc, p *aniso.VerificationPoint, sm shownModel, dr *card.DataRange) (ExportPoint, bool) {
	if p.Err != "" {
		doc.Absent = append(doc.Absent, ExportAbsent{Alternative: sm.name, Case: p.Case.String(), DirectionDeg: p.DirectionDeg, StretchOrShear: p.Amount, Reason: p.Err})
		return ExportPoint{}, false
	}
	e := ExportPoint{Alternative: sm.name, Case: p.Case.String(), DirectionDeg: p.DirectionDeg, StretchOrShear: p.Amount, LateralStretch: p.LateralStretch,
		F11: p.F[0], F12: p.F[1], F21: p.F[2], F22: p.F[3],
		Cauchy11: p.Cauchy[0], Cauchy22: p.Cauchy[1], Cauchy12: p.Cauchy[2],
		Nominal11: p.Nominal[0], Nominal22: p.Nominal[1], Nominal12: p.Nominal[2], Nominal21: p.Nominal[3],
		Energy: p.Energy, PK211: p.SecondPiola[0], PK222: p.SecondPiola[1], PK212: p.SecondPiola[2],
		OutsideData: outsideRange(dr, sm.model, p.F)}
	names := familyNames(sm.model)
	for _, sw := range p.Switches {
		e.Flags = append(e.Flags, fmt.Sprintf("switch:%s:%s", names[sw.Family], sw.Invariant))
		e.FlagNotes = append(e.FlagNotes, fmt.Sprintf("family %s sits on its switch here (%s = %.17g, within %g of 1): another implementation may take its terms as on where weft takes them as off, or the other way round; the stress of a dispersed family and every tangent can differ", names[sw.Family], sw.Invariant, sw.Value, aniso.SwitchTolerance))
	}
	if p.NonUnique != "" {
		e.Flags = append(e.Flags, "non-unique-lateral")
		e.FlagNotes = append(e.FlagNotes, p.NonUnique)
	}
	return e, true
}

// shownModel is a model whose verification rows export shows.
type shownModel struct {
	name  string
	model *aniso.Model
}

// exportAlternatives fills doc.Alternatives from the card and returns the
// models to show: the card's own model when it has no alternatives, else
// every alternative or the one opt names.
func exportAlternatives(doc *ExportDoc, file string, c *card.Card, m *aniso.Model, opt ExportOptions) ([]shownModel, error) {
	alts, err := c.AlternativeModels(m)
	if err != nil {
		return nil, cardErrorf("%s: %v", file, err)
	}
	if len(alts) == 0 {
		if opt.Alternative != "" {
			return nil, cardErrorf("%s: the card's fibre layout is determined; it lists no alternatives (asked for %q)", file, opt.Alternative)
		}
		return []shownModel{{model: m}}, nil
	}
	ea := &ExportAlternatives{Reason: card.AlternativesReason, Decider: card.AlternativesDecider, Choosing: card.AlternativesChoosing}
	if s := c.Alternatives; s != nil {
		ea.Reason, ea.Decider, ea.Choosing = s.Reason, s.Decider, s.Choosing
	}
	var names []string
	pick := -1
	for i, a := range alts {
		names = append(names, a.Name)
		if opt.Alternative == a.Name || opt.Alternative == fmt.Sprint(i+1) {
			pick = i
		}
	}
	if opt.Alternative != "" && pick < 0 {
		return nil, cardErrorf("%s: the card has no alternative %q; its alternatives are %s (or their numbers, 1 to %d)", file, opt.Alternative, strings.Join(names, ", "), len(alts))
	}
	var shown []shownModel
	for i, a := range alts {
		params, fc := parameters(a.Model, c.StressUnit)
		em := ExportModel{Name: a.Name, Title: a.Title, AsCard: a.AsCard, Energy: fc.Energy, EnergyLaTeX: fc.EnergyLaTeX,
			Parameters: params, Shown: pick < 0 || pick == i, model: a.Model}
		if em.Shown {
			shown = append(shown, shownModel{name: a.Name, model: a.Model})
		}
		ea.Models = append(ea.Models, em)
	}
	doc.Alternatives = ea
	return shown, nil
}

// exportWarnings adds the warnings and notices of the export: the
// alternatives, rows left out, flagged or outside the data, and a model
// without a matrix term.
func exportWarnings(doc *ExportDoc, m *aniso.Model, total, outside, flagged int) {
	if a := doc.Alternatives; a != nil {
		doc.Warnings = append(doc.Warnings, alternativesWarning(a.Models))
	}
	if n := len(doc.Absent); n > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d of %d verification rows are absent because the model cannot be evaluated there (first: %s)", n, total, doc.Absent[0].Reason))
	}
	if flagged > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d verification rows are flagged (column flags): a family sits on its switch there, or the uniaxial lateral stretch is not unique; an independent implementation may reproduce them differently, so verify with the other rows", flagged))
	}
	if m.MatrixWeight() == 0 {
		doc.Warnings = append(doc.Warnings, noMatrixWarning)
	}
	if doc.DataRange == nil {
		doc.Notices = append(doc.Notices, noRangeNotice)
	} else if outside > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d of %d verification rows lie outside the fitted data range (data_range); there the model extrapolates and the rows verify an implementation, not the tissue", outside, total))
	}
}

// noMatrixWarning is said wherever a card without a matrix term leaves
// weft.
const noMatrixWarning = "the model has no matrix term with a positive weight (no isotropic I1, I2 or principal-stretch term, no Fung-type term): only fibre terms carry load, and they switch off wherever their family is not stretched, so the material has no stiffness at rest or in compression and an FE model of it is singular there"

// LayoutWarning returns, for a card whose data did not determine the
// fibre layout, the warning that names its alternatives ("" otherwise):
// every command that evaluates the card's own model gives it.
func LayoutWarning(c *card.Card, m *aniso.Model) (string, error) {
	alts, err := c.AlternativeModels(m)
	if err != nil || len(alts) == 0 {
		return "", err
	}
	var models []ExportModel
	for _, a := range alts {
		models = append(models, ExportModel{Name: a.Name, Title: a.Title, AsCard: a.AsCard})
	}
	return alternativesWarning(models), nil
}

// alternativesWarning names the alternatives of a card.
func alternativesWarning(models []ExportModel) string {
	var parts []string
	for _, a := range models {
		t := a.Name + " (" + a.Title
		if a.AsCard {
			t += ", as the card"
		}
		parts = append(parts, t+")")
	}
	return "the data do not determine the fibre layout; these models fit them equally and differ wherever the sheet shears: " + strings.Join(parts, "; ") + ". Choose by independent knowledge of the fibre directions, or run every one (see the card's alternatives section)"
}

// verificationNotes explains the verification table.
func verificationNotes(unit string) []string {
	notes := []string{
		"direction_deg is the load direction theta from axis 1 towards axis 2; F = R(theta) F_local R(theta)^T; stretch_or_shear is lambda, or gamma for simple-shear; stretches 0.90 and 0.95 are compression",
	}
	for _, c := range aniso.LoadCases {
		n := c.String() + ": " + c.Kinematics()
		if z := c.ZeroByConstruction(); z != "" {
			n += "; " + z + "; the load-frame shear stress is not imposed (for an anisotropic material at an oblique angle it is what the grips carry); the lateral stretch is the one connected continuously to the unloaded state (continuation from lambda = 1)"
		}
		if c == aniso.SimpleShear {
			n += "; along the axes and at 45 deg either side of each fibre direction, never along a fibre (simple shear leaves a fibre along the load direction at I4 = 1, on its switch)"
		}
		notes = append(notes, n)
	}
	notes = append(notes,
		"sigma33 = 0 (plane stress) in every row; F33 = 1/(F11 F22 - F12 F21)",
		"cauchy_* is the Cauchy stress and nominal_* the first Piola-Kirchhoff stress P = sigma F^-T in "+unit+"; nominal_12 is the force along axis 1 per reference area normal to axis 2",
		"energy is the strain energy W per unit reference volume in "+unit+" (= kJ/m^3 for kPa); pk2_* the in-plane second Piola-Kirchhoff stress S = F^-1 sigma F^-T (S33 = 0), symmetric",
		fmt.Sprintf("flags: switch:FAMILY:I4 (or K) where a family's |I4 - 1| (|K - 1| for its cofactor terms) is below %g, so its terms may be on in one implementation and off in another; non-unique-lateral where the uniaxial lateral stretch is not unique (no lateral stiffness); an in-plane dispersed family switches direction by direction with f'(0) = 0, so its stress and tangent are continuous and it is never on a switch at a row", aniso.SwitchTolerance),
	)
	return notes
}

// pointValues returns a row's numbers after its case, in column order
// (up to the flags).
func pointValues(p *ExportPoint) []float64 {
	return []float64{p.DirectionDeg, p.StretchOrShear, p.F11, p.F12, p.F21, p.F22,
		p.Cauchy11, p.Cauchy22, p.Cauchy12, p.Nominal11, p.Nominal22, p.Nominal12, p.Nominal21,
		p.Energy, p.PK211, p.PK222, p.PK212}
}

// paramText writes a term's parameters as name=value, sorted by name.
func paramText(p map[string]float64, format func(float64) string) string {
	if len(p) == 0 {
		return "-"
	}
	keys := make([]string, 0, len(p))
	for k := range p {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	var parts []string
	for _, k := range keys {
		parts = append(parts, k+"="+format(p[k]))
	}
	return strings.Join(parts, " ")
}

func g6(v float64) string { return fmt.Sprintf("%.6g", v) }

func optG6(v *float64) string {
	if v == nil {
		return "-"
	}
	return g6(*v)
}

// spreadText writes a family's spread: "κ=…" for a three-dimensional
// dispersion, "b=…" for an in-plane concentration, "-" for none.
func spreadText(p ExportParam, num func(float64) string) string {
	switch {
	case p.Concentration != nil:
		return "b=" + num(*p.Concentration)
	case p.Dispersion != nil:
		return "κ=" + num(*p.Dispersion)
	}
	return "-"
}

// latexSpread is spreadText in LaTeX math.
func latexSpread(p ExportParam) string {
	switch {
	case p.Concentration != nil:
		return "$b=" + strings.Trim(latexNum(*p.Concentration), "$") + "$"
	case p.Dispersion != nil:
		return `$\kappa=` + strings.Trim(latexNum(*p.Dispersion), "$") + "$"
	}
	return "--"
}

// WriteExportTable writes the export document d as a text table, numbers
// rounded to 6 significant digits.
func WriteExportTable(w io.Writer, d *ExportDoc) {
	fmt.Fprintf(w, "weft export of %s\n", d.Model)
	if d.Specimen != "" {
		fmt.Fprintf(w, "specimen: %s\n", d.Specimen)
	}
	fmt.Fprintf(w, "stress unit: %s (every weight and stress below)\n\n", d.StressUnit)
	printCautions(w, d.Cautions)
	fmt.Fprintln(w)
	fmt.Fprintln(w, "PARAMETERS")
	writeParamTable(w, d.Parameters, d.StressUnit)
	fmt.Fprintln(w)
	fmt.Fprintln(w, "ENERGY")
	fmt.Fprintln(w, "  "+d.Energy)
	fmt.Fprintln(w, "  "+d.EnergyLaTeX)
	fmt.Fprintln(w)
	if a := d.Alternatives; a != nil {
		fmt.Fprintln(w, "ALTERNATIVES: THE DATA DO NOT DETERMINE THE FIBRE LAYOUT")
		for _, t := range []string{a.Reason, a.Decider, a.Choosing} {
			fmt.Fprintln(w, "  "+t)
		}
		for i, am := range a.Models {
			mark := ""
			if am.AsCard {
				mark = " (the card's own model)"
			}
			fmt.Fprintf(w, "\n  %d. %s: %s%s\n", i+1, am.Name, am.Title, mark)
			fmt.Fprintln(w, "     "+am.Energy)
			writeParamTable(w, am.Parameters, d.StressUnit)
		}
		fmt.Fprintln(w)
	}
	fmt.Fprintln(w, "CONVENTIONS")
	cv := d.Conventions
	for _, s := range []string{cv.Angle, cv.Kinematics, cv.Invariants, cv.Energy, cv.FibreSwitch, cv.Dispersion, cv.InPlane, cv.Stress, cv.Normalisations, cv.GreenStrain} {
		fmt.Fprintln(w, "  - "+s)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "VERIFICATION TABLE (6 significant digits here; --format csv or json for full precision)")
	for _, n := range d.Notes {
		fmt.Fprintln(w, "  - "+n)
	}
	fmt.Fprintln(w)
	writeVerificationRows(w, d)
	for _, a := range d.Absent {
		fmt.Fprintf(w, "  absent: %s%s at %g deg, %g: %s\n", altPrefix(a.Alternative), a.Case, a.DirectionDeg, a.StretchOrShear, a.Reason)
	}
	fmt.Fprintln(w)
	writeThreeD(w, &d.ThreeD, "")
	for _, s := range d.Warnings {
		fmt.Fprintln(w, "\nWARNING: "+s)
	}
	for _, s := range d.Notices {
		fmt.Fprintln(w, "\nNotice: "+s)
	}
}

// altPrefix is "NAME: " for a row of an alternative, else "".
func altPrefix(name string) string {
	if name == "" {
		return ""
	}
	return name + ": "
}

// writeParamTable writes a parameter table, indented.
func writeParamTable(w io.Writer, params []ExportParam, unit string) {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintf(tw, "  #\tterm\targument\tfamily\tangle [deg]\tspread\tweight [%s]\tparameters\tpolyconvex\n", unit)
	for _, p := range params {
		fam := p.Family
		if fam == "" {
			fam = "-"
		}
		poly := "yes"
		if !p.Polyconvex {
			poly = "NO"
		}
		fmt.Fprintf(tw, "  %d\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n", p.Term, p.ID, p.Argument, fam, optG6(p.AngleDeg), spreadText(p, g6), g6(p.Weight), paramText(p.Params, g6), poly)
	}
	tw.Flush()
}

// writeVerificationRows writes the verification rows as an aligned table.
func writeVerificationRows(w io.Writer, d *ExportDoc) {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', tabwriter.AlignRight)
	hdr := append([]string(nil), d.Columns...)
	if d.DataRange != nil {
		hdr = append(hdr, "data")
	}
	fmt.Fprintln(tw, strings.Join(hdr, "\t")+"\t")
	for i := range d.Verification {
		p := &d.Verification[i]
		cells := []string{p.Case}
		for _, v := range pointValues(p) {
			cells = append(cells, g6(v))
		}
		cells = append(cells, flagText(p.Flags))
		if d.Alternatives != nil {
			cells = append(cells, p.Alternative)
		}
		if d.DataRange != nil {
			if len(p.OutsideData) > 0 {
				cells = append(cells, "outside")
			} else {
				cells = append(cells, "inside")
			}
		}
		fmt.Fprintln(tw, strings.Join(cells, "\t")+"\t")
	}
	tw.Flush()
}

// flagText joins a row's flags, or "-" when it has none.
func flagText(flags []string) string {
	if len(flags) == 0 {
		return "-"
	}
	return strings.Join(flags, ";")
}

// WriteExportCSV writes the verification table of d as CSV at full double
// precision, with the parameters, notes, alternatives, absent rows and the
// three-dimensional block as comment lines.
func WriteExportCSV(w io.Writer, d *ExportDoc) error {
	var b bytes.Buffer
	comment := func(format string, args ...any) {
		for _, line := range strings.Split(fmt.Sprintf(format, args...), "\n") {
			b.WriteString("# " + line + "\n")
		}
	}
	comment("weft export of %s (%s); lines starting with # are comments", d.Model, d.Format)
	for _, c := range d.Cautions {
		comment("CAUTION: %s", c)
	}
	comment("stress unit: %s", d.StressUnit)
	comment("energy: %s", d.Energy)
	comment("energy_latex: %s", d.EnergyLaTeX)
	csvParams := func(prefix string, params []ExportParam) {
		for _, p := range params {
			fam := ""
			if p.Family != "" {
				fam = fmt.Sprintf(" family=%s angle_deg=%s spread=%s", p.Family, fullFloat(*p.AngleDeg), spreadText(p, fullFloat))
			}
			comment("%sterm %d: %s weight=%s %s params: %s%s", prefix, p.Term, p.ID, fullFloat(p.Weight), p.WeightUnit, paramText(p.Params, fullFloat), fam)
		}
	}
	csvParams("", d.Parameters)
	if a := d.Alternatives; a != nil {
		comment("ALTERNATIVES: %s", a.Reason)
		comment("decider: %s", a.Decider)
		comment("choosing: %s", a.Choosing)
		for _, am := range a.Models {
			comment("alternative %s: %s (as the card: %v; rows shown: %v); energy: %s", am.Name, am.Title, am.AsCard, am.Shown, am.Energy)
			csvParams("alternative "+am.Name+" ", am.Parameters)
		}
	}
	for _, n := range d.Notes {
		comment("note: %s", n)
	}
	for _, a := range d.Absent {
		comment("absent row: %s%s at %s deg, %s: %s", altPrefix(a.Alternative), a.Case, fullFloat(a.DirectionDeg), fullFloat(a.StretchOrShear), a.Reason)
	}
	for _, l := range d.ThreeD.Lines {
		comment("three-dimensional use: %s", l)
	}
	for _, s := range d.Warnings {
		comment("WARNING: %s", s)
	}
	for _, s := range d.Notices {
		comment("notice: %s", s)
	}
	cw := csv.NewWriter(&b)
	cw.Write(d.Columns)
	for i := range d.Verification {
		p := &d.Verification[i]
		row := []string{p.Case}
		for _, v := range pointValues(p) {
			row = append(row, fullFloat(v))
		}
		row = append(row, strings.Join(p.Flags, ";"))
		if d.Alternatives != nil {
			row = append(row, p.Alternative)
		}
		cw.Write(row)
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return err
	}
	_, err := w.Write(b.Bytes())
	return err
}

// latexEscape escapes text for LaTeX and writes the Greek letters and
// symbols weft's notes use as math, so that the output compiles with a
// plain LaTeX setup.
func latexEscape(s string) string {
	r := strings.NewReplacer(`\`, `\textbackslash{}`, `&`, `\&`, `%`, `\%`, `$`, `\$`, `#`, `\#`, `_`, `\_`,
		`{`, `\{`, `}`, `\}`, `~`, `\textasciitilde{}`, `^`, `\textasciicircum{}`,
		"λ", `$\lambda$`, "σ", `$\sigma$`, "γ", `$\gamma$`, "θ", `$\theta$`, "κ", `$\kappa$`, "α", `$\alpha$`,
		"β", `$\beta$`, "μ", `$\mu$`, "ψ", `$\psi$`, "Ψ", `$\Psi$`, "·", `$\cdot$`, "≤", `$\le$`, "≥", `$\ge$`,
		"−", `$-$`, "×", `$\times$`, "⊗", `$\otimes$`, "²", `$^2$`, "√", `$\surd$`)
	return r.Replace(s)
}

// latexNum writes a number to 6 significant digits in math mode, a power
// of ten where Go would write e-notation (card.LaTeXNumber, which the
// card's LaTeX energy uses too).
func latexNum(v float64) string {
	return "$" + card.LaTeXNumber(v) + "$"
}

// WriteExportLaTeX writes d as a LaTeX fragment: the cautions, the
// parameter tables, the energy, the alternatives, the verification tables
// and the three-dimensional block, rounded to 6 significant digits.
func WriteExportLaTeX(w io.Writer, d *ExportDoc) {
	u := latexEscape(d.StressUnit)
	fmt.Fprintf(w, "%% weft export of %s; needs \\usepackage{longtable}\n", strings.ReplaceAll(d.Model, "\n", " "))
	fmt.Fprintln(w, `\paragraph{Cautions.}`)
	fmt.Fprintln(w, `\begin{itemize}`)
	for _, c := range d.Cautions {
		fmt.Fprintln(w, `  \item `+latexEscape(c))
	}
	fmt.Fprintln(w, `\end{itemize}`)
	fmt.Fprintln(w)
	fmt.Fprintf(w, "\\paragraph{Parameters.} Weights in %s; angles in degrees from axis 1 towards axis 2.\n\n", u)
	latexParams(w, d.Parameters, u)
	fmt.Fprintln(w)
	fmt.Fprintln(w, `\paragraph{Energy.}`)
	fmt.Fprintln(w, `\[`)
	fmt.Fprintln(w, d.EnergyLaTeX)
	fmt.Fprintln(w, `\]`)
	fmt.Fprintln(w)
	if a := d.Alternatives; a != nil {
		fmt.Fprintln(w, `\paragraph{Alternatives: the data do not determine the fibre layout.} `+latexEscape(a.Reason+" "+a.Decider+" "+a.Choosing))
		fmt.Fprintln(w)
		for i, am := range a.Models {
			mark := ""
			if am.AsCard {
				mark = " (the card's own model)"
			}
			fmt.Fprintf(w, "\\subparagraph{%d. \\texttt{%s}: %s%s.}\n\\[\n%s\n\\]\n", i+1, latexEscape(am.Name), latexEscape(am.Title), latexEscape(mark), am.EnergyLaTeX)
			latexParams(w, am.Parameters, u)
			fmt.Fprintln(w)
		}
	}
	fmt.Fprintln(w, `\paragraph{Verification.}`)
	fmt.Fprintln(w, `\begin{itemize}`)
	for _, n := range d.Notes {
		fmt.Fprintln(w, `  \item `+latexEscape(n))
	}
	for _, a := range d.Absent {
		fmt.Fprintf(w, "  \\item Absent: %s\n", latexEscape(fmt.Sprintf("%s%s at %g deg, %g: %s", altPrefix(a.Alternative), a.Case, a.DirectionDeg, a.StretchOrShear, a.Reason)))
	}
	for _, s := range d.Warnings {
		fmt.Fprintln(w, `  \item Warning: `+latexEscape(s))
	}
	for _, s := range d.Notices {
		fmt.Fprintln(w, `  \item Notice: `+latexEscape(s))
	}
	fmt.Fprintln(w, `\end{itemize}`)
	latexVerification(w, d, u)
	fmt.Fprintln(w)
	fmt.Fprintln(w, `\paragraph{Three-dimensional and nearly incompressible use.}`)
	fmt.Fprintln(w, `\begin{itemize}`)
	for _, l := range d.ThreeD.Lines {
		fmt.Fprintln(w, `  \item `+latexEscape(l))
	}
	fmt.Fprintln(w, `\end{itemize}`)
}

// latexParams writes a parameter table.
func latexParams(w io.Writer, params []ExportParam, u string) {
	fmt.Fprintln(w, `\begin{tabular}{rllllrl}`)
	fmt.Fprintln(w, `\hline`)
	fmt.Fprintf(w, "\\# & term & family & angle [deg] & spread & weight [%s] & parameters \\\\\n", u)
	fmt.Fprintln(w, `\hline`)
	for _, p := range params {
		fam, ang, kap := "--", "--", "--"
		if p.Family != "" {
			fam, ang, kap = `\texttt{`+latexEscape(p.Family)+`}`, latexNum(*p.AngleDeg), latexSpread(p)
		}
		params := "--"
		if len(p.Params) > 0 {
			params = latexEscape(paramText(p.Params, g6))
		}
		poly := ""
		if !p.Polyconvex {
			poly = ` (not polyconvex)`
		}
		fmt.Fprintf(w, "%d & \\texttt{%s}%s & %s & %s & %s & %s & %s \\\\\n", p.Term, latexEscape(p.ID), poly, fam, ang, kap, latexNum(p.Weight), params)
	}
	fmt.Fprintln(w, `\hline`)
	fmt.Fprintln(w, `\end{tabular}`)
}

// latexVerification writes the verification rows as two long tables:
// deformation, energy, Cauchy and nominal stress, then the second
// Piola–Kirchhoff stress. A row outside the data range is marked *, one on
// a switch †, one with a lateral stretch that is not unique ‡; with
// alternatives, a first column numbers the row's alternative.
func latexVerification(w io.Writer, d *ExportDoc, u string) {
	alt := map[string]int{}
	lead, leadHdr := "", ""
	if a := d.Alternatives; a != nil {
		for i, am := range a.Models {
			alt[am.Name] = i + 1
		}
		lead, leadHdr = "r", "alt. & "
	}
	first := func(p *ExportPoint) string {
		c := latexEscape(p.Case)
		marks := ""
		if len(p.OutsideData) > 0 {
			marks += "*"
		}
		for _, f := range p.Flags {
			if strings.HasPrefix(f, "switch:") && !strings.Contains(marks, `\dagger`) {
				marks += `\dagger`
			}
			if f == "non-unique-lateral" {
				marks += `\ddagger`
			}
		}
		if marks != "" {
			c += "$^{" + marks + "}$"
		}
		if d.Alternatives != nil {
			c = fmt.Sprintf("%d & %s", alt[p.Alternative], c)
		}
		return c
	}
	legend := func(cols int) {
		fmt.Fprintln(w, `\hline`)
		fmt.Fprintf(w, "\\multicolumn{%d}{l}{$^{*}$ outside the fitted data range (extrapolation); $^{\\dagger}$ a family on its switch; $^{\\ddagger}$ lateral stretch not unique} \\\\\n", cols)
		fmt.Fprintln(w, `\end{longtable}`)
	}
	n := len(alt)
	if n > 0 {
		n = 1
	}
	fmt.Fprintln(w, `{\scriptsize\setlength{\tabcolsep}{3pt}`)
	fmt.Fprintln(w, `\begin{longtable}{`+lead+`lrrrrrrrrrrrrrr}`)
	fmt.Fprintln(w, `\hline`)
	hdr := []string{leadHdr + "case", `$\theta$ [deg]`, `$\lambda$ or $\gamma$`, `$F_{11}$`, `$F_{12}$`, `$F_{21}$`, `$F_{22}$`, `$W$`,
		`$\sigma_{11}$`, `$\sigma_{22}$`, `$\sigma_{12}$`, `$P_{11}$`, `$P_{22}$`, `$P_{12}$`, `$P_{21}$`}
	fmt.Fprintln(w, strings.Join(hdr, " & ")+` \\`)
	fmt.Fprintf(w, "\\multicolumn{%d}{r}{energy and stresses in %s} \\\\\n", 15+n, u)
	fmt.Fprintln(w, `\hline`)
	fmt.Fprintln(w, `\endhead`)
	for i := range d.Verification {
		p := &d.Verification[i]
		cells := []string{first(p)}
		for _, v := range []float64{p.DirectionDeg, p.StretchOrShear, p.F11, p.F12, p.F21, p.F22, p.Energy,
			p.Cauchy11, p.Cauchy22, p.Cauchy12, p.Nominal11, p.Nominal22, p.Nominal12, p.Nominal21} {
			cells = append(cells, latexNum(v))
		}
		fmt.Fprintln(w, strings.Join(cells, " & ")+` \\`)
	}
	legend(15 + n)
	fmt.Fprintln(w, `\begin{longtable}{`+lead+`lrrrrr}`)
	fmt.Fprintln(w, `\hline`)
	fmt.Fprintln(w, leadHdr+`case & $\theta$ [deg] & $\lambda$ or $\gamma$ & $S_{11}$ & $S_{22}$ & $S_{12}$ \\`)
	fmt.Fprintf(w, "\\multicolumn{%d}{r}{second Piola--Kirchhoff stress in %s} \\\\\n", 6+n, u)
	fmt.Fprintln(w, `\hline`)
	fmt.Fprintln(w, `\endhead`)
	for i := range d.Verification {
		p := &d.Verification[i]
		cells := []string{first(p)}
		for _, v := range []float64{p.DirectionDeg, p.StretchOrShear, p.PK211, p.PK222, p.PK212} {
			cells = append(cells, latexNum(v))
		}
		fmt.Fprintln(w, strings.Join(cells, " & ")+` \\`)
	}
	legend(6 + n)
	fmt.Fprintln(w, `}`)
}

// StressColumnNames are the stress columns predict appends, in order.
var StressColumnNames = []string{"cauchy_11", "cauchy_22", "cauchy_12", "nominal_11", "nominal_22", "nominal_12", "nominal_21"}
