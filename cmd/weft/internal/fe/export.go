package fe

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"path/filepath"
	"sort"
	"strings"
	"text/tabwriter"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// exportFormat is the version of export's JSON document.
const exportFormat = "weft.export/1"

// verificationLead are the first columns of the verification table; the
// stress columns follow, named as predict names them.
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
	Polyconvex    bool               `json:"polyconvex"`
}

// ExportPoint is one row of the verification table.
type ExportPoint struct {
	Case           string   `json:"case"`
	DirectionDeg   float64  `json:"direction_deg"`
	StretchOrShear float64  `json:"stretch_or_shear"`
	LateralStretch float64  `json:"lateral_stretch"`
	F11            float64  `json:"F11"`
	F12            float64  `json:"F12"`
	F21            float64  `json:"F21"`
	F22            float64  `json:"F22"`
	Cauchy11       float64  `json:"cauchy_11"`
	Cauchy22       float64  `json:"cauchy_22"`
	Cauchy12       float64  `json:"cauchy_12"`
	Nominal11      float64  `json:"nominal_11"`
	Nominal22      float64  `json:"nominal_22"`
	Nominal12      float64  `json:"nominal_12"`
	Nominal21      float64  `json:"nominal_21"`
	OutsideData    []string `json:"outside_data_range,omitempty"`
}

// ExportDoc is everything export writes, in every format.
type ExportDoc struct {
	Format       string           `json:"format"`
	Model        string           `json:"model"`
	Specimen     string           `json:"specimen,omitempty"`
	StressUnit   string           `json:"stress_unit"`
	Cautions     []string         `json:"cautions"`
	Energy       string           `json:"energy"`
	EnergyLaTeX  string           `json:"energy_latex"`
	Conventions  card.Conventions `json:"conventions"`
	Parameters   []ExportParam    `json:"parameters"`
	Notes        []string         `json:"verification_notes"`
	Columns      []string         `json:"verification_columns"`
	Verification []ExportPoint    `json:"verification"`
	DataRange    *card.DataRange  `json:"data_range,omitempty"`
	Warnings     []string         `json:"warnings"`
	Notices      []string         `json:"notices"`
}

// stressColumns returns predict's stress column names with the unit.
func stressColumns(unit string) []string {
	out := make([]string, len(StressColumnNames))
	for i, n := range StressColumnNames {
		out[i] = fmt.Sprintf("%s [%s]", n, unit)
	}
	return out
}

// BuildExport computes the parameter and verification tables.
func BuildExport(file string, c *card.Card, m *aniso.Model, dr *card.DataRange) (*ExportDoc, error) {
	fc := card.FromModel(m, c.StressUnit, nil)
	doc := &ExportDoc{Format: exportFormat, Model: filepath.Base(file), Specimen: c.Specimen, StressUnit: c.StressUnit,
		Cautions: card.Cautions, Energy: fc.Energy, EnergyLaTeX: fc.EnergyLaTeX, Conventions: card.StandardConventions,
		Warnings: []string{}, Notices: []string{}}
	names := familyNames(m)
	for i, t := range m.Terms {
		p := ExportParam{Term: i + 1, ID: t.Shape.ID, Argument: t.Shape.Arg.String(), Weight: t.Weight, WeightUnit: c.StressUnit,
			Params: map[string]float64{}, Formula: t.Shape.Formula, Polyconvex: t.Shape.Polyconvex}
		for j, q := range t.Shape.Params {
			p.Params[q.Name] = t.Params[j]
		}
		if t.Family >= 0 {
			// The card's family: its angle in (−90°, 90°] and its spread.
			f := fc.Families[t.Family]
			p.Family, p.AngleDeg, p.Concentration, p.Dispersion = names[t.Family], f.AngleDeg, f.Concentration, f.Dispersion
		}
		doc.Parameters = append(doc.Parameters, p)
	}
	pts, err := aniso.VerificationCases(m, aniso.VerificationSettings{})
	if err != nil {
		return nil, cardErrorf("%s: verification table: %v", file, err)
	}
	doc.DataRange = dr
	doc.Columns = append(append([]string(nil), verificationLead...), stressColumns(c.StressUnit)...)
	outside := 0
	var skipped []string
	for _, p := range pts {
		if p.Err != "" {
			skipped = append(skipped, p.Err)
			continue
		}
		e := ExportPoint{Case: p.Case.String(), DirectionDeg: p.DirectionDeg, StretchOrShear: p.Amount, LateralStretch: p.LateralStretch,
			F11: p.F[0], F12: p.F[1], F21: p.F[2], F22: p.F[3],
			Cauchy11: p.Cauchy[0], Cauchy22: p.Cauchy[1], Cauchy12: p.Cauchy[2],
			Nominal11: p.Nominal[0], Nominal22: p.Nominal[1], Nominal12: p.Nominal[2], Nominal21: p.Nominal[3],
			OutsideData: outsideRange(dr, m, p.F)}
		if len(e.OutsideData) > 0 {
			outside++
		}
		doc.Verification = append(doc.Verification, e)
	}
	doc.Notes = verificationNotes(c.StressUnit)
	if len(skipped) > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d of %d verification rows were left out because the model cannot be evaluated there (first: %s)", len(skipped), len(pts), skipped[0]))
	}
	if len(doc.Verification) == 0 {
		return nil, cardErrorf("%s: the model cannot be evaluated at any verification point (%s)", file, skipped[0])
	}
	if dr == nil {
		doc.Notices = append(doc.Notices, noRangeNotice)
	} else if outside > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d of %d verification rows lie outside the fitted data range (data_range); there the model extrapolates and the rows verify an implementation, not the tissue", outside, len(pts)))
	}
	return doc, nil
}

// verificationNotes explains the verification table.
func verificationNotes(unit string) []string {
	notes := []string{
		"direction_deg is the load direction theta from axis 1 towards axis 2; F = R(theta) F_local R(theta)^T; stretch_or_shear is lambda, or gamma for simple-shear",
	}
	for _, c := range aniso.LoadCases {
		n := c.String() + ": " + c.Kinematics()
		if z := c.ZeroByConstruction(); z != "" {
			n += "; " + z + "; the load-frame shear stress is not imposed (for an anisotropic material at an oblique angle it is what the grips carry)"
		}
		notes = append(notes, n)
	}
	notes = append(notes,
		"sigma33 = 0 (plane stress) in every row; F33 = 1/(F11 F22 - F12 F21)",
		"cauchy_* is the Cauchy stress and nominal_* the first Piola-Kirchhoff stress P = sigma F^-T in "+unit+"; nominal_12 is the force along axis 1 per reference area normal to axis 2",
	)
	return notes
}

// pointValues returns a row's numbers after its case, in column order.
func pointValues(p *ExportPoint) []float64 {
	return []float64{p.DirectionDeg, p.StretchOrShear, p.F11, p.F12, p.F21, p.F22,
		p.Cauchy11, p.Cauchy22, p.Cauchy12, p.Nominal11, p.Nominal22, p.Nominal12, p.Nominal21}
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
	printCautions(w)
	fmt.Fprintln(w)
	fmt.Fprintln(w, "PARAMETERS")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintf(tw, "  #\tterm\targument\tfamily\tangle [deg]\tspread\tweight [%s]\tparameters\tpolyconvex\n", d.StressUnit)
	for _, p := range d.Parameters {
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
	fmt.Fprintln(w)
	fmt.Fprintln(w, "ENERGY")
	fmt.Fprintln(w, "  "+d.Energy)
	fmt.Fprintln(w, "  "+d.EnergyLaTeX)
	fmt.Fprintln(w)
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
	tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', tabwriter.AlignRight)
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
	for _, s := range d.Warnings {
		fmt.Fprintln(w, "\nWARNING: "+s)
	}
	for _, s := range d.Notices {
		fmt.Fprintln(w, "\nNotice: "+s)
	}
}

// WriteExportCSV writes the verification table of d as CSV at full double
// precision, with the parameters and notes as comment lines.
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
	for _, p := range d.Parameters {
		fam := ""
		if p.Family != "" {
			fam = fmt.Sprintf(" family=%s angle_deg=%s spread=%s", p.Family, fullFloat(*p.AngleDeg), spreadText(p, fullFloat))
		}
		comment("term %d: %s weight=%s %s params: %s%s", p.Term, p.ID, fullFloat(p.Weight), p.WeightUnit, paramText(p.Params, fullFloat), fam)
	}
	for _, n := range d.Notes {
		comment("note: %s", n)
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

// latexNum writes a number to 6 significant digits, with a LaTeX minus.
func latexNum(v float64) string {
	s := g6(v)
	if strings.ContainsAny(s, "e") {
		m, e, _ := strings.Cut(s, "e")
		exp := strings.TrimLeft(strings.TrimPrefix(e, "+"), "0")
		if strings.HasPrefix(e, "-") {
			exp = "-" + strings.TrimLeft(e[1:], "0")
		}
		return "$" + m + `\times 10^{` + exp + "}$"
	}
	return "$" + s + "$"
}

// WriteExportLaTeX writes d as a LaTeX fragment: the energy, the parameter
// table and the verification table, rounded to 6 significant digits.
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
	fmt.Fprintln(w, `\begin{tabular}{rllllrl}`)
	fmt.Fprintln(w, `\hline`)
	fmt.Fprintf(w, "\\# & term & family & angle [deg] & spread & weight [%s] & parameters \\\\\n", u)
	fmt.Fprintln(w, `\hline`)
	for _, p := range d.Parameters {
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
	fmt.Fprintln(w)
	fmt.Fprintln(w, `\paragraph{Energy.}`)
	fmt.Fprintln(w, `\[`)
	fmt.Fprintln(w, d.EnergyLaTeX)
	fmt.Fprintln(w, `\]`)
	fmt.Fprintln(w)
	fmt.Fprintln(w, `\paragraph{Verification.}`)
	fmt.Fprintln(w, `\begin{itemize}`)
	for _, n := range d.Notes {
		fmt.Fprintln(w, `  \item `+latexEscape(n))
	}
	for _, s := range d.Warnings {
		fmt.Fprintln(w, `  \item Warning: `+latexEscape(s))
	}
	for _, s := range d.Notices {
		fmt.Fprintln(w, `  \item Notice: `+latexEscape(s))
	}
	fmt.Fprintln(w, `\end{itemize}`)
	fmt.Fprintln(w, `{\scriptsize\setlength{\tabcolsep}{3pt}`)
	fmt.Fprintln(w, `\begin{longtable}{lrrrrrrrrrrrrr}`)
	fmt.Fprintln(w, `\hline`)
	hdr := []string{"case", `$\theta$ [deg]`, `$\lambda$ or $\gamma$`, `$F_{11}$`, `$F_{12}$`, `$F_{21}$`, `$F_{22}$`,
		`$\sigma_{11}$`, `$\sigma_{22}$`, `$\sigma_{12}$`, `$P_{11}$`, `$P_{22}$`, `$P_{12}$`, `$P_{21}$`}
	fmt.Fprintln(w, strings.Join(hdr, " & ")+` \\`)
	fmt.Fprintf(w, "\\multicolumn{14}{r}{stresses in %s} \\\\\n", u)
	fmt.Fprintln(w, `\hline`)
	fmt.Fprintln(w, `\endhead`)
	for i := range d.Verification {
		p := &d.Verification[i]
		cells := []string{latexEscape(p.Case)}
		if len(p.OutsideData) > 0 {
			cells[0] += `$^{*}$`
		}
		for _, v := range pointValues(p) {
			cells = append(cells, latexNum(v))
		}
		fmt.Fprintln(w, strings.Join(cells, " & ")+` \\`)
	}
	fmt.Fprintln(w, `\hline`)
	if d.DataRange != nil {
		fmt.Fprintln(w, `\multicolumn{14}{l}{$^{*}$ outside the fitted data range (extrapolation)} \\`)
	}
	fmt.Fprintln(w, `\end{longtable}`)
	fmt.Fprintln(w, `}`)
}

// StressColumnNames are the stress columns predict appends, in order.
var StressColumnNames = []string{"cauchy_11", "cauchy_22", "cauchy_12", "nominal_11", "nominal_22", "nominal_12", "nominal_21"}
