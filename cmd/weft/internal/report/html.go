package report

import (
	"bytes"
	_ "embed"
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

// candidateCells formats a model form of the selection evidence.
func candidateCells(cc card.CandidateCard) []string {
	cv := "—"
	if m := float64(cc.HeldoutError); !math.IsNaN(m) {
		cv = fnum(m, 3) + " ± " + fnum(float64(cc.HeldoutStdErr), 2)
	}
	return []string{cc.Name, strings.Join(cc.Terms, " + "), fmt.Sprint(cc.Parameters), fnum(float64(cc.Loss), 4), fnum(float64(cc.BIC), 6), cv, fmtR2(float64(cc.LowestR2))}
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

// reportPage is the page template: the page's layout and style; view
// fills it.
//
//go:embed report.html
var reportPage string

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
