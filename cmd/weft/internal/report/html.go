package report

import (
	"bytes"
	"fmt"
	"html/template"
	"math"
	"regexp"
	"sort"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// The report page: one self-contained HTML file. Plots are inlined as SVG;
// the page has no scripts and refers to nothing outside itself.

// htmlRow is a table row of preformatted cells.
type htmlRow struct {
	Cells []string
	// Mark highlights the row (the chosen model).
	Mark bool
}

// htmlTable is a table with a header row.
type htmlTable struct {
	Head []string
	Rows []htmlRow
}

// htmlFigure is an inlined plot.
type htmlFigure struct {
	ID, Title, Caption string
	SVG                template.HTML
	Files              string
}

// htmlFact is one line of a definition list.
type htmlFact struct{ Name, Value string }

// reportView is everything the page template shows, already formatted.
type reportView struct {
	Specimen, Tissue, DataNotes string
	Synthetic                   bool
	Cautions                    []string
	Limits                      string
	Summary                     []htmlFact
	Data                        []htmlFact
	Protocols                   htmlTable
	Warnings, Notices           []string
	Range                       []htmlFact

	HowFound     string
	Energy       string
	EnergyLaTeX  string
	Terms        htmlTable
	Families     htmlTable
	Params       htmlTable
	Statuses     []string
	Profiles     []string
	Flags, Notes []string
	Metrics      htmlTable

	FitFigures, ResidualFigures, SplitFigures []htmlFigure
	ShareFigure                               *htmlFigure
	SplitTable                                htmlTable
	SplitMeasure                              string

	HasVerdict                bool
	Verdict, Reason, Decider  string
	VerdictTable              htmlTable
	ProfileFigure             *htmlFigure
	HasSelection              bool
	Rule, CVMetric            string
	Search                    []string
	Pareto, Presets           htmlTable
	ParetoFigure, CrossFigure *htmlFigure
	Abscissa                  string

	Conventions []htmlFact
	Files       []string
}

// fnum formats a number with n significant digits and a true minus sign;
// NaN is a dash.
func fnum(x float64, n int) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "—"
	}
	return strings.Replace(fmt.Sprintf("%.*g", n, x), "-", "−", 1)
}

// pct formats a share as a percentage.
func pct(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "—"
	}
	return fmt.Sprintf("%.0f %%", 100*x)
}

var (
	svgProlog = regexp.MustCompile(`(?s)^.*?<svg `)
	svgNS     = regexp.MustCompile(`\s*xmlns(:xlink)?="[^"]*"`)
)

// inlineSVG prepares an SVG file for inlining into HTML: no XML prolog or
// comment, no namespace declarations (HTML does not need them), and an
// accessible name.
func inlineSVG(svg []byte, title string) template.HTML {
	s := svgProlog.ReplaceAllString(string(svg), "<svg ")
	if i := strings.Index(s, ">"); i >= 0 {
		head := svgNS.ReplaceAllString(s[:i], "")
		s = head + ` role="img" aria-label="` + template.HTMLEscapeString(title) + `"` + s[i:]
	}
	return template.HTML(s)
}

func toHTMLFigure(f renderedFigure) htmlFigure {
	return htmlFigure{ID: f.name, Title: f.title, Caption: f.caption, SVG: inlineSVG(f.svg, f.title),
		Files: "plots/" + f.name + ".svg, plots/" + f.name + ".png"}
}

// isSynthetic reports whether the data say they are synthetic.
func (in *Input) isSynthetic() bool {
	d := in.data
	text := strings.ToUpper(strings.Join(append([]string{d.Tissue, d.Notes, d.Source, d.Specimen}, d.Notices...), " "))
	return strings.Contains(text, "SYNTHETIC")
}

// signUnknown reports whether the fit could not determine angle signs.
func (in *Input) signUnknown() bool { return !in.fit.AngleSignKnown && len(in.card.Families) > 0 }

func reportHTML(in *Input, figs []renderedFigure, strain bool) ([]byte, error) {
	v := in.view(figs, strain)
	var buf bytes.Buffer
	if err := reportTemplate.Execute(&buf, v); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// view formats the input for the template.
func (in *Input) view(figs []renderedFigure, strain bool) *reportView {
	c, d, fs := in.card, in.data, in.fit
	v := &reportView{Specimen: c.Specimen, Tissue: d.Tissue, DataNotes: sentence(d.Notes), Synthetic: in.isSynthetic(), Cautions: card.Cautions,
		Limits: "Planar biaxial data constrain the in-plane response only; the out-of-plane response and the response to I5 are not fully determined by them (Holzapfel & Ogden 2009, Math Mech Solids 14:474–489)."}
	if v.Specimen == "" {
		v.Specimen = d.Specimen
	}
	v.Abscissa = "stretch λ"
	if strain {
		v.Abscissa = "Green strain E = ½(λ² − 1)"
	}
	// angle writes a family angle; without shear information its sign is
	// unknown and it is written ±|α|.
	angle := func(a float64) string {
		if in.signUnknown() {
			return "±" + fmtDeg(math.Abs(a))
		}
		return fmtDeg(a)
	}

	// At a glance.
	how := "chosen form: " + strings.Join(fs.Terms, " + ") + ", " + fs.Layout + " fibre layout (fitted as asked, not discovered)"
	if in.sel != nil {
		how = "discovered: " + in.sel.Chosen
	}
	v.HowFound = how
	minR2 := math.Inf(1)
	for _, m := range fs.Metrics {
		if r := float64(m.R2); !math.IsNaN(r) {
			minR2 = math.Min(minR2, r)
		}
	}
	var angles []string
	for _, f := range c.Families {
		if f.AngleDeg != nil {
			angles = append(angles, f.Name+" at "+angle(*f.AngleDeg))
		}
	}
	fams := "none (isotropic)"
	if len(angles) > 0 {
		fams = strings.Join(angles, ", ")
	}
	if pair := PairText(c.Layout); pair != "" {
		fams += "; " + pair
	}
	v.Summary = []htmlFact{{"Model", how}, {"Energy", strings.TrimPrefix(c.Energy, "Psi = ")}, {"Fibre families", fams}}
	if in.verdict != nil {
		v.Summary = append(v.Summary, htmlFact{"Family verdict", verdictText(in.verdict.Families)})
	}
	if !math.IsInf(minR2, 1) {
		v.Summary = append(v.Summary, htmlFact{"Lowest R² (any protocol and axis)", fmtR2(minR2)})
	}
	v.Summary = append(v.Summary, htmlFact{"Data", fmt.Sprintf("%d protocols, %s stress in %s", len(in.table.protocols), d.StressKind, d.StressUnit)})

	// Data.
	shear := "none: pure biaxial stretch; the sign of a fibre angle cannot be determined"
	if d.HasShear {
		shear = "present (F12, F21 or shear stress measured)"
	}
	v.Data = []htmlFact{{"Specimen", d.Specimen}, {"Source file", d.Source}}
	if d.Sheet != "" {
		v.Data = append(v.Data, htmlFact{"Sheet", d.Sheet})
	}
	if d.Tissue != "" {
		v.Data = append(v.Data, htmlFact{"Tissue", d.Tissue})
	}
	if d.Notes != "" {
		v.Data = append(v.Data, htmlFact{"Notes", d.Notes})
	}
	if d.Axis1 != "" {
		v.Data = append(v.Data, htmlFact{"Axis 1", d.Axis1})
	}
	v.Data = append(v.Data, htmlFact{"Stress", d.StressKind + " stress in " + d.StressUnit}, htmlFact{"Reference state", d.Reference},
		htmlFact{"Shear information", shear})
	v.Protocols.Head = []string{"protocol", "points fitted", "kept branch", "cycles", "weight"}
	for _, p := range d.Protocols {
		v.Protocols.Rows = append(v.Protocols.Rows, htmlRow{Cells: []string{p.Label, fmt.Sprint(p.Points), p.Kept, fmt.Sprint(p.Cycles), fnum(p.Weight, 4)}})
	}
	v.Warnings, v.Notices = d.Warnings, d.Notices
	if dr := in.dataRange; dr != nil {
		rng := func(r [2]float64) string { return fnum(r[0], 5) + " to " + fnum(r[1], 5) }
		v.Range = []htmlFact{{"Stretch λ1 (F11)", rng(dr.Stretch1)}, {"Stretch λ2 (F22)", rng(dr.Stretch2)}, {"Shear F12, F21", rng(dr.Shear)}}
		for i, r := range dr.FibreStretch {
			name := fmt.Sprintf("family %d", i+1)
			if i < len(c.Families) {
				name = c.Families[i].Name
			}
			v.Range = append(v.Range, htmlFact{"Fibre stretch √I4 of " + name, rng(r)})
		}
	}

	// Model.
	v.Energy = c.Energy
	v.EnergyLaTeX = c.EnergyLaTeX
	v.Terms.Head = []string{"term", "family", "weight [" + c.StressUnit + "]", "parameters", "term w·f(x)"}
	for _, t := range c.Terms {
		w := math.NaN()
		if t.Weight != nil {
			w = *t.Weight
		}
		var ps []string
		var names []string
		for k := range t.Params {
			names = append(names, k)
		}
		sort.Strings(names)
		for _, k := range names {
			ps = append(ps, k+" = "+fnum(t.Params[k], 6))
		}
		fam := t.Family
		if fam == "" {
			fam = "matrix"
		}
		v.Terms.Rows = append(v.Terms.Rows, htmlRow{Cells: []string{t.ID, fam, fnum(w, 6), strings.Join(ps, ", "), t.Formula}})
	}
	v.Families.Head = []string{"family", "angle α", "sign known", "spread"}
	for _, f := range c.Families {
		a, k := math.NaN(), "ideal (aligned)"
		if f.AngleDeg != nil {
			a = *f.AngleDeg
		}
		switch {
		case f.Concentration != nil:
			k = "in the plane, concentration b = " + fnum(*f.Concentration, 4)
		case f.Dispersion != nil && *f.Dispersion != 0:
			k = "dispersion κ = " + fnum(*f.Dispersion, 4)
		}
		known := "not stated"
		if f.AngleSignKnown != nil {
			known = map[bool]string{true: "yes", false: "no: ±α"}[*f.AngleSignKnown]
		}
		v.Families.Rows = append(v.Families.Rows, htmlRow{Cells: []string{f.Name, angle(a), known, k}})
	}
	v.Params.Head = []string{"parameter", "value", "95 % interval", "std. error", "unit", "status"}
	var statuses []string
	for _, e := range fs.Estimates {
		if e.Status == "inactive" && e.Kind != "weight" {
			continue
		}
		val := fnum(float64(e.Value), 5)
		if e.Kind == "angle" && in.signUnknown() && (e.Name == "angle" || strings.HasPrefix(e.Name, "angle_")) {
			val = "±" + fnum(math.Abs(float64(e.Value)), 5)
		}
		iv := "—"
		if lo, hi := float64(e.CI95[0]), float64(e.CI95[1]); !math.IsNaN(lo) && !math.IsNaN(hi) {
			iv = "[" + fnum(lo, 4) + ", " + fnum(hi, 4) + "]"
		}
		unit := e.Unit
		if unit == "" {
			unit = "–"
		}
		v.Params.Rows = append(v.Params.Rows, htmlRow{Cells: []string{e.Name, val, iv, fnum(float64(e.StdErr), 3), unit, e.Status}})
		statuses = append(statuses, e.Status)
	}
	v.Statuses = StatusLegend(statuses)
	for _, p := range fs.Profiles {
		s := fmt.Sprintf("%s: profile-likelihood 95 %% interval %s to %s", p.Name, fmtDeg(float64(p.IntervalDeg[0])), fmtDeg(float64(p.IntervalDeg[1])))
		if p.NotDetermined {
			s = fmt.Sprintf("%s: not determined: the loss profile stays below the 95 %% threshold over the angle's whole range", p.Name)
		} else if !p.Closed {
			s += " (not bounded by the data at one end)"
		}
		if p.Mirrored && !p.NotDetermined {
			s += "; sign not determined, the mirror image is equally good"
		}
		v.Profiles = append(v.Profiles, s)
	}
	v.Flags, v.Notes = fs.Flags, fs.Notes
	v.Metrics.Head = []string{"protocol", "component", "points", "R²", "RMSE [" + fs.StressUnit + "]", "NRMSE"}
	if in.heldout != nil {
		v.Metrics.Head = append(v.Metrics.Head, "held-out R²")
	}
	for _, m := range fs.Metrics {
		nr := "—"
		if x := float64(m.NRMSE); !math.IsNaN(x) {
			nr = fmt.Sprintf("%.2f %%", 100*x)
		}
		row := []string{m.Protocol, compSymbol(fs.StressKind, m.Component), fmt.Sprint(m.Points), fmtR2(float64(m.R2)), fnum(float64(m.RMSE), 3), nr}
		if in.heldout != nil {
			row = append(row, in.heldoutR2(m.Protocol, m.Component))
		}
		v.Metrics.Rows = append(v.Metrics.Rows, htmlRow{Cells: row})
	}

	// Figures by kind.
	for _, f := range figs {
		hf := toHTMLFigure(f)
		switch {
		case f.name == "fit-all" || strings.HasPrefix(f.name, "fit-"):
			v.FitFigures = append(v.FitFigures, hf)
		case strings.HasPrefix(f.name, "residuals"):
			v.ResidualFigures = append(v.ResidualFigures, hf)
		case f.name == "split-shares":
			v.ShareFigure = &hf
		case strings.HasPrefix(f.name, "split-"):
			v.SplitFigures = append(v.SplitFigures, hf)
		case f.name == "angle-profile":
			v.ProfileFigure = &hf
		case f.name == "pareto":
			v.ParetoFigure = &hf
		case f.name == "cross-r2":
			v.CrossFigure = &hf
		}
	}

	// Split.
	if sp := in.split; sp != nil {
		v.SplitMeasure = sp.Measure
		v.SplitTable.Head = []string{"protocol", "component"}
		for _, g := range sp.Groups {
			v.SplitTable.Head = append(v.SplitTable.Head, g)
		}
		v.SplitTable.Head = append(v.SplitTable.Head, "energy at the largest deformation")
		for _, pp := range sp.Protocols {
			for ci, cc := range pp.Components {
				row := []string{pp.Protocol, compSymbol(fs.StressKind, cc.Component)}
				for _, g := range sp.Groups {
					row = append(row, pct(float64(cc.GroupShare[g])))
				}
				e := ""
				if ci == 0 {
					var es []string
					for _, g := range sp.Groups {
						es = append(es, g+" "+pct(float64(pp.GroupEnergyShare[g])))
					}
					e = strings.Join(es, ", ")
				}
				v.SplitTable.Rows = append(v.SplitTable.Rows, htmlRow{Cells: append(row, e)})
			}
		}
	}

	// Verdict.
	if vd := in.verdict; vd != nil {
		v.HasVerdict = true
		v.Verdict, v.Reason, v.Decider = verdictText(vd.Families), vd.Reason, vd.Decider
		v.VerdictTable.Head = []string{"fibre layout (best model of each)", "ΔBIC", "held-out error"}
		for _, k := range formKeysInOrder(vd.DeltaBIC) {
			b, okb := vd.DeltaBIC[k]
			e, oke := vd.CVError[k]
			if !okb && !oke {
				continue
			}
			bs, es := "—", "—"
			if okb {
				bs = fnum(float64(b), 4)
			}
			if oke {
				es = fnum(float64(e), 4)
			}
			v.VerdictTable.Rows = append(v.VerdictTable.Rows, htmlRow{Cells: []string{layoutKeyText(k), bs, es}, Mark: k == vd.Form})
		}
	}

	// Selection.
	if sel := in.sel; sel != nil {
		v.HasSelection = true
		v.Rule, v.CVMetric, v.Search = sel.Rule, sel.CVMetric, sel.Search
		head := []string{"model form", "terms", "parameters", "loss", "BIC", "held-out error", "lowest R²"}
		v.Pareto.Head = append(head, "")
		chosenBIC := math.NaN()
		for _, cc := range sel.Pareto {
			if cc.Chosen {
				chosenBIC = float64(cc.BIC)
			}
		}
		for _, cc := range sel.Pareto {
			mark := ""
			if cc.Chosen {
				mark = "chosen"
			}
			v.Pareto.Rows = append(v.Pareto.Rows, htmlRow{Cells: append(candidateCells(cc), mark), Mark: cc.Chosen})
		}
		v.Presets.Head = append(head, "ΔBIC vs chosen")
		for _, cc := range sel.Presets {
			v.Presets.Rows = append(v.Presets.Rows, htmlRow{Cells: append(candidateCells(cc), fnum(float64(cc.BIC)-chosenBIC, 4))})
		}
	}

	// Conventions.
	if cv := c.Conventions; cv != nil {
		v.Conventions = []htmlFact{{"Angle", cv.Angle}, {"Kinematics", cv.Kinematics}, {"Invariants", cv.Invariants}, {"Energy", cv.Energy},
			{"Fibre switch", cv.FibreSwitch}, {"Dispersion", cv.Dispersion}, {"Stress", cv.Stress}, {"Normalisations", cv.Normalisations}}
		if cv.InPlane != "" { // cards written before in-plane dispersion lack it
			v.Conventions = append(v.Conventions, htmlFact{"In-plane dispersion", cv.InPlane})
		}
		if cv.GreenStrain != "" { // cards written before the Fung-type term lack it
			v.Conventions = append(v.Conventions, htmlFact{"Green strain (fung)", cv.GreenStrain})
		}
	}
	v.Files = in.folderFiles(len(figs))
	return v
}

// candidateCells formats a model form of the selection evidence.
func candidateCells(cc card.CandidateCard) []string {
	cv := "—"
	if m := float64(cc.CVMean); !math.IsNaN(m) {
		cv = fnum(m, 3) + " ± " + fnum(float64(cc.CVStdErr), 2)
	}
	return []string{cc.Name, strings.Join(cc.Terms, " + "), fmt.Sprint(cc.Parameters), fnum(float64(cc.Loss), 4), fnum(float64(cc.BIC), 6), cv, fmtR2(float64(cc.MinR2))}
}

// verdictText explains a family verdict.
func verdictText(f string) string {
	switch f {
	case "0":
		return "no fibre family (isotropic)"
	case "1":
		return "one fibre family"
	case "2":
		return "two fibre families"
	case "1-or-mirror-pair":
		return "one family or a mirror pair: the data cannot tell them apart"
	case "undecided":
		return "undecided: the data do not settle the number of fibre families"
	}
	return f
}

// formKeysInOrder returns the verdict's form keys from the simplest form to
// the richest: fewer families first, an ideal family before a spread one.
func formKeysInOrder(m map[string]card.Num) []string {
	rank := func(k string) int {
		base, spread, _ := strings.Cut(k, "+")
		r := map[string]int{"0": 0, "1": 10, "2-mirror": 20, "2-free": 30}[base]
		return r + map[string]int{"": 0, "dispersed": 1, "kappa": 2}[spread]
	}
	var ks []string
	for k := range m {
		ks = append(ks, k)
	}
	sort.Slice(ks, func(a, b int) bool { return rank(ks[a]) < rank(ks[b]) })
	return ks
}

// layoutKeyText names a form key of the verdict.
func layoutKeyText(k string) string {
	if base, ok := strings.CutSuffix(k, "+dispersed"); ok {
		return layoutKeyText(base) + ", spread in the plane"
	}
	if base, ok := strings.CutSuffix(k, "+kappa"); ok {
		return layoutKeyText(base) + ", dispersion κ"
	}
	switch k {
	case "0":
		return "no fibre family"
	case "1":
		return "one family"
	case "2-mirror":
		return "two families, mirror pair θ ± β"
	case "2-free":
		return "two families, free angles"
	}
	return k
}

// heldoutR2 is the held-out R² of one protocol and component, from
// heldout.csv and fit.csv.
func (in *Input) heldoutR2(protocol, comp string) string {
	ci := componentIndex(in.table.comps, comp)
	for _, pr := range in.table.protocols {
		if pr.label == protocol && ci >= 0 {
			if ho := in.heldoutStress(protocol, ci); ho != nil {
				return fmtR2(rSquared(pr.measured[ci], ho))
			}
		}
	}
	return "—"
}

// folderFiles lists the files of the output folder that the report
// describes, in a fixed order.
func (in *Input) folderFiles(nfig int) []string {
	desc := map[string]string{
		"model.json":    "model.json: the model card with every section shown here",
		"fit.csv":       "fit.csv: every kept point with measured and modelled stress, residuals and each term's contribution",
		"selection.csv": "selection.csv: the model forms compared, with per-protocol held-out errors",
		"heldout.csv":   "heldout.csv: each protocol predicted by the model form refitted without it (the dashed curves)",
	}
	var out []string
	for _, f := range []string{"model.json", "fit.csv", "selection.csv", "heldout.csv"} {
		for _, g := range in.files {
			if g == f {
				out = append(out, desc[f])
			}
		}
	}
	return append(out, "report.html: this report", fmt.Sprintf("plots/: the %d figures of this report, each as SVG and PNG", nfig))
}

var reportTemplate = template.Must(template.New("report").Parse(reportPage))

const reportPage = `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>weft fit report: {{.Specimen}}</title>
<style>
:root { --ink: #1a1a1a; --muted: #555; --rule: #d0d0d0; --band: #f4f6f8; --accent: #0072b2; --warn: #d55e00; }
* { box-sizing: border-box; }
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, Helvetica, sans-serif; color: var(--ink); line-height: 1.45; margin: 0 auto; max-width: 1120px; padding: 24px 28px 48px; font-size: 15px; }
h1 { font-size: 1.7em; margin: 0 0 .2em; }
h2 { font-size: 1.3em; border-bottom: 2px solid var(--accent); padding-bottom: .15em; margin-top: 2em; }
h3 { font-size: 1.08em; margin: 1.5em 0 .4em; }
.sub { color: var(--muted); margin: 0 0 1em; }
table { border-collapse: collapse; margin: .5em 0 1em; font-size: .9em; }
th, td { border-bottom: 1px solid var(--rule); padding: .28em .7em .28em 0; text-align: left; vertical-align: top; }
th { border-bottom: 2px solid #999; }
td.n, th.n { text-align: right; }
tr.mark td { background: #e8f1f8; font-weight: bold; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: .25em 1.2em; margin: .5em 0 1em; }
dl.facts dt { font-weight: bold; }
dl.facts dd { margin: 0; }
code, pre { font-family: "DejaVu Sans Mono", "Liberation Mono", Consolas, monospace; font-size: .88em; }
pre { background: var(--band); padding: .6em .8em; white-space: pre-wrap; word-break: break-word; border-left: 3px solid var(--accent); }
.cautions { border: 2px solid var(--warn); background: #fdf3ec; padding: .6em 1.1em; margin: 1em 0; }
.cautions h2 { border: 0; margin: .2em 0 .3em; color: #8a3b00; font-size: 1.15em; }
.synthetic { border: 3px solid var(--ink); background: repeating-linear-gradient(135deg, #fff, #fff 10px, #f0f0f0 10px, #f0f0f0 20px); padding: .7em 1.1em; margin: 1em 0; font-size: 1.05em; }
.synthetic strong { letter-spacing: .08em; }
nav ol { columns: 2; margin: .3em 0; }
figure { margin: 1.2em 0 2em; break-inside: avoid; page-break-inside: avoid; }
figure svg { display: block; max-width: 100%; height: auto; }
figcaption { color: var(--muted); font-size: .88em; margin-top: .4em; }
figcaption b { color: var(--ink); }
.note { color: var(--muted); }
ul.plain { padding-left: 1.2em; }
@media print {
  body { max-width: none; padding: 0; font-size: 10.5pt; }
  nav { display: none; }
  h2 { break-after: avoid; page-break-after: avoid; }
  a { color: inherit; text-decoration: none; }
}
@page { size: A4; margin: 14mm; }
</style>
</head>
<body>
<header>
<h1>Fit report: {{.Specimen}}</h1>
<p class="sub">{{if .Tissue}}{{.Tissue}} · {{end}}written by weft from the model card and fit table in this folder</p>
</header>
{{if .Synthetic}}<div class="synthetic" id="synthetic"><strong>SYNTHETIC DATA.</strong> The test data of this specimen were generated, not measured{{if .Tissue}} ({{.Tissue}}){{end}}.{{if .DataNotes}} {{.DataNotes}}{{end}} Its numbers demonstrate the tool and describe no real tissue.</div>
{{end}}<section class="cautions" id="cautions">
<h2>Cautions</h2>
<ul>{{range .Cautions}}
<li>{{.}}</li>{{end}}
<li>{{.Limits}}</li>
</ul>
</section>

<nav><strong>Contents</strong>
<ol>
<li><a href="#glance">At a glance</a></li>
<li><a href="#data">Specimen and data</a></li>
<li><a href="#model">Model and parameters</a></li>
<li><a href="#fit">Measured and modelled stress</a></li>
<li><a href="#split">Matrix and fibre split</a></li>
{{if .HasVerdict}}<li><a href="#families">Fibre families</a></li>{{else}}{{if .ProfileFigure}}<li><a href="#families">Fibre angle</a></li>{{end}}{{end}}
{{if .HasSelection}}<li><a href="#selection">Model selection and classical presets</a></li>{{end}}
<li><a href="#conventions">Conventions</a></li>
<li><a href="#files">Files</a></li>
</ol>
</nav>

<section id="glance">
<h2>At a glance</h2>
<dl class="facts">{{range .Summary}}
<dt>{{.Name}}</dt><dd>{{.Value}}</dd>{{end}}
</dl>
</section>

<section id="data">
<h2>Specimen and data</h2>
<dl class="facts">{{range .Data}}
<dt>{{.Name}}</dt><dd>{{.Value}}</dd>{{end}}
</dl>
<h3>Protocols fitted</h3>
{{template "table" .Protocols}}
<h3>Warnings</h3>
{{if .Warnings}}<ul class="plain">{{range .Warnings}}<li>{{.}}</li>{{end}}</ul>{{else}}<p class="note">None.</p>{{end}}
{{if .Notices}}<h3>Notices</h3>
<ul class="plain">{{range .Notices}}<li>{{.}}</li>{{end}}</ul>{{end}}
{{if .Range}}<h3>Range of the fitted data</h3>
<p class="note">The model is valid only within this range; queries outside it extrapolate.</p>
<dl class="facts">{{range .Range}}
<dt>{{.Name}}</dt><dd>{{.Value}}</dd>{{end}}
</dl>{{end}}
</section>

<section id="model">
<h2>Model and parameters</h2>
<p><strong>{{.HowFound}}</strong></p>
<h3>Strain energy</h3>
<pre>{{.Energy}}</pre>
{{if .EnergyLaTeX}}<p class="note">LaTeX:</p>
<pre>{{.EnergyLaTeX}}</pre>{{end}}
{{template "table" .Terms}}
{{if .Families.Rows}}<h3>Fibre families</h3>
{{template "table" .Families}}{{end}}
<h3>Parameters</h3>
{{template "table" .Params}}
{{if .Statuses}}<ul class="plain note">{{range .Statuses}}<li>{{.}}</li>{{end}}</ul>{{end}}
{{if .Profiles}}<ul class="plain">{{range .Profiles}}<li>{{.}}</li>{{end}}</ul>{{end}}
{{if .Flags}}<h3>Flags</h3><ul class="plain">{{range .Flags}}<li>{{.}}</li>{{end}}</ul>{{end}}
{{if .Notes}}<h3>What the data can and cannot determine</h3><ul class="plain">{{range .Notes}}<li>{{.}}</li>{{end}}</ul>{{end}}
<h3>Fit quality</h3>
{{template "table" .Metrics}}
</section>

<section id="fit">
<h2>Measured and modelled stress</h2>
<p class="note">Plotted against {{.Abscissa}}.</p>
{{range .FitFigures}}{{template "figure" .}}{{end}}
{{range .ResidualFigures}}{{template "figure" .}}{{end}}
</section>

<section id="split">
<h2>Matrix and fibre split</h2>
{{if .SplitTable.Rows}}<p class="note">Share: {{.SplitMeasure}}.</p>
{{template "table" .SplitTable}}{{else}}<p class="note">The card has no split section.</p>{{end}}
{{with .ShareFigure}}{{template "figure" .}}{{end}}
{{range .SplitFigures}}{{template "figure" .}}{{end}}
</section>

{{if .HasVerdict}}<section id="families">
<h2>Fibre families</h2>
<p><strong>Verdict: {{.Verdict}}.</strong> {{.Reason}}</p>
{{if .Decider}}<p>To decide: {{.Decider}}</p>{{end}}
{{template "table" .VerdictTable}}
{{with .ProfileFigure}}{{template "figure" .}}{{end}}
</section>
{{else}}{{with .ProfileFigure}}<section id="families">
<h2>Fibre angle</h2>
{{template "figure" .}}
</section>
{{end}}{{end}}
{{if .HasSelection}}<section id="selection">
<h2>Model selection and classical presets</h2>
<p><strong>Rule:</strong> {{.Rule}}</p>
<p class="note">Held-out error: {{.CVMetric}}.</p>
<h3>Search</h3>
<ul class="plain">{{range .Search}}<li>{{.}}</li>{{end}}</ul>
<h3>Model forms kept by the search</h3>
{{template "table" .Pareto}}
{{with .ParetoFigure}}{{template "figure" .}}{{end}}
<h3>Classical presets fitted to the same data</h3>
{{template "table" .Presets}}
{{with .CrossFigure}}{{template "figure" .}}{{end}}
</section>
{{end}}
<section id="conventions">
<h2>Conventions</h2>
<dl class="facts">{{range .Conventions}}
<dt>{{.Name}}</dt><dd>{{.Value}}</dd>{{end}}
</dl>
<p class="note">Plot colours come from the colour-blind-safe palette of Okabe &amp; Ito 2008 (Color Universal Design); stress components also differ by marker shape.</p>
</section>

<section id="files">
<h2>Files</h2>
<ul class="plain">{{range .Files}}<li>{{.}}</li>{{end}}</ul>
<p class="note">Rebuild this report without refitting: <code>weft report FOLDER --force</code> (add <code>--strain</code> to plot against Green strain).</p>
</section>

<section class="cautions">
<h2>Cautions</h2>
<ul>{{range .Cautions}}
<li>{{.}}</li>{{end}}
</ul>
</section>
</body>
</html>
{{define "table"}}<table>
<thead><tr>{{range .Head}}<th>{{.}}</th>{{end}}</tr></thead>
<tbody>{{range .Rows}}
<tr{{if .Mark}} class="mark"{{end}}>{{range .Cells}}<td>{{.}}</td>{{end}}</tr>{{end}}
</tbody>
</table>{{end}}
{{define "figure"}}<figure id="{{.ID}}">
<h3>{{.Title}}</h3>
{{.SVG}}
<figcaption>{{.Caption}} <span class="files">Files: {{.Files}}.</span></figcaption>
</figure>
{{end}}`

// sentence ends free text with a full stop, so that the next sentence of the
// report does not run into it.
func sentence(s string) string {
	s = strings.TrimSpace(s)
	if s == "" || strings.HasSuffix(s, ".") || strings.HasSuffix(s, "!") || strings.HasSuffix(s, "?") {
		return s
	}
	return s + "."
}

// PairText describes a mirror pair's geometry, or is empty for other
// layouts.
func PairText(l *card.Layout) string {
	if l == nil || l.Kind != "mirror" || l.HalfAngleDeg == nil {
		return ""
	}
	if l.PairAxis == "axis-1" {
		return fmt.Sprintf("mirror pair at ±%.2f°, symmetric about axis 1 (the pair's axis held on axis 1, as published)", *l.HalfAngleDeg)
	}
	mean := "-"
	if l.MeanDeg != nil && !math.IsNaN(*l.MeanDeg) && !math.IsInf(*l.MeanDeg, 0) {
		mean = fmt.Sprintf("%.2f", *l.MeanDeg)
	}
	return fmt.Sprintf("mirror pair at θ ± β with θ = %s°, β = %.2f° (the pair's axis learned)", mean, *l.HalfAngleDeg)
}

// StatusLegend explains, once each and in a fixed order, the parameter
// statuses other than "estimated" that appear in a table.
func StatusLegend(shown []string) []string {
	var out []string
	for _, st := range []string{aniso.StatusCorrelated, aniso.StatusDegenerate, aniso.StatusNotDetermined, aniso.StatusAtBound, aniso.StatusInactive} {
		for _, s := range shown {
			if s == st {
				out = append(out, st+": "+aniso.StatusMeaning(st))
				break
			}
		}
	}
	return out
}
