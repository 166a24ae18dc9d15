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

	"github.com/weft-tools/weft/aniso/card"
)

// The report page: one self-contained HTML file. Plots are inlined as SVG
// and the energy as MathML; the page has no scripts and refers to nothing
// outside itself.

// htmlRow is a table row of preformatted cells.
type htmlRow struct {
	Cells []string
	// Mark highlights the row (the chosen model, the verdict's layout);
	// Strong sets single cells in bold by index.
	Mark   bool
	Strong map[int]bool
}

// htmlTable is a table with a header row; Num marks the columns of
// numbers, which are right-aligned, and Wide the column of long text that
// must not be squeezed (lists of terms); Class is the table's class.
type htmlTable struct {
	Head  []string
	Num   []bool
	Wide  int
	Class string
	Rows  []htmlRow
}

// htmlCell is a cell as the template writes it.
type htmlCell struct {
	Text              string
	Num, Strong, Wide bool
}

// HeadCells returns the header cells with their alignment.
func (t htmlTable) HeadCells() []htmlCell {
	out := make([]htmlCell, len(t.Head))
	for i, h := range t.Head {
		out[i] = htmlCell{Text: h, Num: i < len(t.Num) && t.Num[i], Wide: t.Wide > 0 && i == t.Wide}
	}
	return out
}

// RowCells returns a row's cells with their alignment and emphasis.
func (t htmlTable) RowCells(r htmlRow) []htmlCell {
	out := make([]htmlCell, len(r.Cells))
	for i, c := range r.Cells {
		out[i] = htmlCell{Text: c, Num: i < len(t.Num) && t.Num[i], Strong: r.Strong[i], Wide: t.Wide > 0 && i == t.Wide}
	}
	return out
}

// htmlFigure is an inlined plot.
type htmlFigure struct {
	ID, Title, Caption string
	SVG                template.HTML
	Files              string
}

// reportView is everything the page template shows, already formatted.
type reportView struct {
	Specimen, Tissue, DataNotes string
	Synthetic                   bool
	Cautions                    []string
	Limits                      string

	HowFound     string
	Summary      []Fact
	GlanceFigure *htmlFigure
	GlanceEnergy template.HTML

	Data              []Fact
	Protocols         htmlTable
	Warnings, Notices []string
	Range             []Fact
	RawFigure         *htmlFigure

	EnergyPlain  string
	EnergyMath   template.HTML
	Terms        htmlTable
	Families     htmlTable
	Params       htmlTable
	ParamNote    string
	Statuses     []string
	Combinations []string
	Flags, Notes []string
	Metrics      htmlTable
	MetricsNote  string

	FitFigures []htmlFigure
	Abscissa   string

	Admissible     htmlTable
	AdmissibleNote []string

	SplitFigure              *htmlFigure
	Takeover, Shares         htmlTable
	SplitMeasure, SharesNote string
	// TakeoverTitle heads the take-over table: where the fibres take over
	// half of the load, or, for a model without fibres, only the energy.
	TakeoverTitle template.HTML

	HasVerdict               bool
	Verdict, Reason, Decider string
	// PlanNext is set for an undecided verdict: weft plan ranks the tests
	// that would settle it.
	PlanNext bool
	// Calibration is the calibration check's summary, when the card has one.
	Calibration   string
	RuledOut      []string
	VerdictTable  htmlTable
	ProfileFigure *htmlFigure

	HasSelection           bool
	Rule, Metric           string
	Search                 []string
	Pareto, Presets, Cross htmlTable
	ParetoNote             string
	ParetoFigure           *htmlFigure

	Methods    template.HTML
	References []string
	Trace      []Fact

	Conventions []Fact
	Files       []string

	figs map[string]*htmlFigure
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

// isSynthetic reports whether the data say they are synthetic.
func (in *Input) isSynthetic() bool {
	d := in.data
	return card.SaysSynthetic(append([]string{d.Tissue, d.Notes, d.Source, d.Specimen}, d.Notices...)...)
}

// signUnknown reports whether the data leave the angles' signs unknown:
// without shear information (data.has_shear, fit.angle_sign_known) a family
// at α and one at −α give the same normal stresses. It is a property of the
// data, not of the chosen model: an isotropic pick leaves the sign of every
// other candidate's angles as unknown as a fibred one does.
func (in *Input) signUnknown() bool { return !in.fit.AngleSignKnown || !in.data.HasShear }

func reportHTML(in *Input, figs []renderedFigure, o Options) ([]byte, error) {
	v := in.view(figs, o)
	var buf bytes.Buffer
	if err := reportTemplate.Execute(&buf, v); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// candidateCells formats a model form of the selection evidence.
func candidateCells(cc card.CandidateCard) []string {
	return []string{cc.Name, strings.Join(cc.Terms, " + "), fmt.Sprint(cc.Parameters), fixed(float64(cc.BIC), 1), heldoutText(cc), fmtR2(float64(cc.LowestR2))}
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
	var ks []string
	for k := range m {
		ks = append(ks, k)
	}
	sort.Slice(ks, func(a, b int) bool {
		if ra, rb := formOrder(ks[a]), formOrder(ks[b]); ra != rb {
			return ra < rb
		}
		return ks[a] < ks[b]
	})
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
		return "mirror pair θ ± β"
	case "2-free":
		return "two free families"
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
func (in *Input) folderFiles(nfig int, withPNG bool) []string {
	desc := map[string]string{
		"model.json":    "model.json: the model card with every section shown here, and its provenance",
		"fit.csv":       "fit.csv: every kept point with measured and modelled stress, residuals and each term's contribution",
		"selection.csv": "selection.csv: the model forms compared, with per-protocol held-out errors",
		"heldout.csv":   "heldout.csv: each protocol predicted by the model form refitted without it (the dashed curves)",
		"curves.csv":    "curves.csv: the model curves with the half-width of their 95 % confidence band, and the presets'",
		"raw.csv":       "raw.csv: every cycle of the test file as measured (thinned for long records), the kept points marked",
	}
	var out []string
	for _, f := range []string{"model.json", "fit.csv", "selection.csv", "heldout.csv", "curves.csv", "raw.csv"} {
		for _, g := range in.files {
			if g == f {
				out = append(out, desc[f])
			}
		}
	}
	plots := fmt.Sprintf("plots/: the %d figures of this report as SVG", nfig)
	if withPNG {
		plots += " and PNG (144 dpi)"
	}
	return append(out, "report.html: this report", plots)
}

var reportTemplate = template.Must(template.New("report").Funcs(template.FuncMap{"stylesheet": Stylesheet}).Parse(reportPage))

// stylesheet is the style of weft's HTML reports: screen and A4 print.
//
//go:embed report.css
var stylesheet string

// Stylesheet returns the style sheet of the fit report (screen and A4
// print rules), for other reports to share its look.
func Stylesheet() template.CSS { return template.CSS(stylesheet) }

// reportPage is the page template: the page's layout (its style is
// report.css); view fills it.
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
		return fmt.Sprintf("mirror pair at ±%s°, symmetric about axis 1 (the pair's axis held on axis 1, as published)", fixed(*l.HalfAngleDeg, 2))
	}
	mean := "-"
	if l.MeanDeg != nil && !math.IsNaN(*l.MeanDeg) && !math.IsInf(*l.MeanDeg, 0) {
		mean = fixed(*l.MeanDeg, 2)
	}
	return fmt.Sprintf("mirror pair at θ ± β with θ = %s°, β = %s° (the pair's axis learned)", mean, fixed(*l.HalfAngleDeg, 2))
}
