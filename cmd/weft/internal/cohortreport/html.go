package cohortreport

import (
	"bytes"
	_ "embed"
	"fmt"
	"html/template"
	"math"
	"path"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/report"
)

// The cohort's page: one self-contained HTML file, plots inlined as SVG,
// no scripts, nothing outside itself; its files beside it under plots/.

// File is one file of the cohort's report: Rel is "report.html" or
// "plots/NAME", with '/' as separator.
type File struct {
	Rel  string
	Data []byte
}

type htmlRow struct {
	Cells []string
	Mark  bool
}

type htmlTable struct {
	Head []string
	Rows []htmlRow
}

type htmlFigure struct {
	ID, Title, Caption string
	SVG                template.HTML
	Files              string
}

// pageView is everything the page shows, formatted.
type pageView struct {
	Title                 string
	Files, OK, Failed     int
	Synthetic             bool
	Cautions              []string
	FormText              string
	HasVerdict            bool
	Verdict, Reason, Rule string
	Decider               string
	Search                []string
	Candidates, Specimens htmlTable
	Stats, Comparisons    htmlTable
	ParamNotes, Notes     []string
	GroupText             string
	ParamFigure           *htmlFigure
	PopulationNote        string
	PopulationEnergy      string
	MeanEnergy            string
	Largest               htmlTable
	CurveFigure           *htmlFigure
	FileList              []string
	// Version is weft's version as the cohort records it ("" when not
	// recorded); Trace what made the cohort, as the fit report shows it.
	Version string
	Trace   []report.Fact
}

//go:embed cohort.html
var page string

var pageTemplate = template.Must(template.New("cohort").Funcs(template.FuncMap{"stylesheet": report.Stylesheet}).Parse(page))

// Report draws the cohort's figures and writes report.html; title names
// the cohort (its folder). The files come in a fixed order: report.html,
// then plots/ by figure, SVG before PNG.
func (s *Summary) Report(in *Input, title string, cards map[string]*card.Card) ([]File, error) {
	var figs []report.Figure
	for _, f := range []*report.Figure{s.parameterFigure(in), s.curveFigure(in)} {
		if f != nil {
			figs = append(figs, *f)
		}
	}
	rs, err := report.Render(figs)
	if err != nil {
		return nil, err
	}
	v := s.view(in, title, cards)
	for _, r := range rs {
		hf := &htmlFigure{ID: r.Name, Title: r.Title, Caption: r.Caption, SVG: r.Inline, Files: "plots/" + r.Name + ".svg, plots/" + r.Name + ".png"}
		switch r.Name {
		case "parameters":
			v.ParamFigure = hf
		case "curves":
			v.CurveFigure = hf
		}
	}
	var buf bytes.Buffer
	if err := pageTemplate.Execute(&buf, v); err != nil {
		return nil, err
	}
	files := []File{{Rel: "report.html", Data: buf.Bytes()}}
	for _, r := range rs {
		files = append(files, File{Rel: path.Join("plots", r.Name+".svg"), Data: r.SVG}, File{Rel: path.Join("plots", r.Name+".png"), Data: r.PNG})
	}
	return files, nil
}

// cell formats a number with n significant digits; undefined is a dash.
func cell(x card.Num, n int) string {
	f := float64(x)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return "—"
	}
	return strings.Replace(fmt.Sprintf("%.*g", n, f), "-", "−", 1)
}

func (s *Summary) view(in *Input, title string, cards map[string]*card.Card) *pageView {
	v := &pageView{Title: title, Files: len(s.Specimens), Synthetic: in.Synthetic(), Cautions: s.Cautions, Notes: s.Notes, Trace: report.TraceFacts(s.Provenance, "")}
	if p := s.Provenance; p != nil {
		v.Version = p.VersionText()
	}
	for _, r := range s.Specimens {
		if r.Status == StatusOK {
			v.OK++
		} else {
			v.Failed++
		}
	}
	v.FormText = fmt.Sprintf("%s form %s: %s.", strings.ToUpper(s.Form.How[:1])+s.Form.How[1:], s.Form.Key, strings.Join(s.Form.Terms, " + "))
	if vd := s.Verdict; vd != nil {
		v.HasVerdict, v.Verdict, v.Reason, v.Rule, v.Decider, v.Search = true, vd.Families, vd.Reason, vd.Rule, vd.Decider, vd.Search
		v.Candidates.Head = []string{"candidate", "terms", "parameters", "BIC (summed)", "held-out error (pooled)"}
		for _, c := range vd.Candidates {
			cv := "not cross-validated"
			if !math.IsNaN(float64(c.HeldoutError)) {
				cv = cell(c.HeldoutError, 3) + " ± " + cell(c.HeldoutStdErr, 2)
			}
			v.Candidates.Rows = append(v.Candidates.Rows, htmlRow{Cells: []string{c.Name, strings.Join(c.Terms, " + "), fmt.Sprint(c.Parameters), cell(c.BIC, 7), cv}, Mark: c.Chosen})
		}
		// The Fung-type presets the verdict was compared with, below the
		// candidates (they are not candidates of the shared form).
		for _, c := range vd.Presets {
			cv := "not cross-validated"
			if !math.IsNaN(float64(c.HeldoutError)) {
				cv = cell(c.HeldoutError, 3) + " ± " + cell(c.HeldoutStdErr, 2)
			}
			v.Candidates.Rows = append(v.Candidates.Rows, htmlRow{Cells: []string{c.Name + " (compared, not a candidate)", strings.Join(c.Terms, " + "), fmt.Sprint(c.Parameters), cell(c.BIC, 7), cv}})
		}
	}
	v.Specimens.Head = []string{"file", "specimen", "group", "status"}
	for _, p := range s.Parameters {
		v.Specimens.Head = append(v.Specimens.Head, paramHeader(p))
	}
	v.Specimens.Head = append(v.Specimens.Head, "min R²", "held-out error", "own verdict")
	for _, r := range s.Specimens {
		status := r.Status
		if r.Error != "" {
			status += ": " + r.Error
		}
		cells := []string{r.File, r.Specimen, r.Group, status}
		for _, p := range s.Parameters {
			x, ok := r.Parameters[p.Name]
			if !ok {
				x = card.Num(math.NaN())
			}
			cells = append(cells, cell(x, 4))
		}
		own := r.Verdict
		if r.Form != "" {
			own += " (" + r.Form + ")"
		}
		if g := float64(r.DirectionGap); g > 0 && !math.IsNaN(g) {
			// Same verdict word; say whether its fibres lie where the
			// cohort's do.
			if g <= aniso.DirectionToleranceDeg {
				own += fmt.Sprintf(", fibres within %.1f° of the cohort's", g)
			} else if !math.IsInf(g, 0) {
				own += fmt.Sprintf(", fibres %.1f° from the cohort's", g)
			} else {
				own += ", fibre families where the cohort's model has none, or none where it has"
			}
		}
		v.Specimens.Rows = append(v.Specimens.Rows, htmlRow{Cells: append(cells, cell(r.LowestR2, 4), cell(r.HeldOut, 3), own)})
	}
	for _, p := range s.Parameters {
		if p.Note != "" {
			v.ParamNotes = append(v.ParamNotes, p.Name+": "+p.Note+".")
		}
	}
	v.Stats.Head = []string{"parameter", "group", "n", "mean", "SD", "median", "Q1", "Q3", "95 % interval of the mean", "unit"}
	for _, st := range s.Stats {
		name := st.Parameter
		if st.Note != "" {
			name = st.Note + " (" + st.Parameter + ")"
		}
		v.Stats.Rows = append(v.Stats.Rows, htmlRow{Cells: []string{name, st.Group, fmt.Sprint(st.N), cell(st.Mean, 4), cell(st.SD, 3), cell(st.Median, 4),
			cell(st.Q1, 4), cell(st.Q3, 4), "[" + cell(st.CI95[0], 4) + ", " + cell(st.CI95[1], 4) + "]", st.Unit}})
	}
	s.comparisonTable(v)
	s.populationView(v, cards)
	v.FileList = []string{csvFileLine,
		"cohort.json: the form, verdict, specimens, statistics and group comparisons as data",
		PopulationCard + ": the population model card", MeanCard + ": the mean-parameter model card",
		"<specimen>.weft/: each fitted specimen's folder as 'weft fit' writes it", "report.html and plots/: this report and its figures as SVG and PNG"}
	return v
}

// csvFileLine is what the report's file list says of cohort.csv: one
// row per file, a failed one too, with the columns Summary.CSV writes.
const csvFileLine = "cohort.csv: one row per file, a failed one with its error: its parameters, lowest R², held-out error and misfit ratio"

// comparisonTable fills the group comparison.
func (s *Summary) comparisonTable(v *pageView) {
	if len(s.Comparisons) == 0 {
		return
	}
	c0 := s.Comparisons[0]
	v.GroupText = fmt.Sprintf("Groups by %s: %s.", s.GroupBy, strings.Join(c0.Groups, ", "))
	v.Comparisons.Head = []string{"parameter", "test", "n", "statistic", "df", "p", "p (Holm)", "Hedges' g"}
	for _, c := range s.Comparisons {
		n := strings.Trim(strings.Join(strings.Fields(fmt.Sprint(c.N)), ", "), "[]")
		add := func(name string, t *TestResult, g string) {
			v.Comparisons.Rows = append(v.Comparisons.Rows, htmlRow{Cells: []string{c.Label(), name, n, cell(t.Statistic, 4), cell(t.DF, 3), cell(t.P, 3), cell(t.PHolm, 3), g},
				Mark: float64(t.PHolm) < 0.05})
		}
		if c.Welch != nil {
			add("Welch t", c.Welch, cell(*c.HedgesG, 3))
			mw := "Mann–Whitney U"
			if c.MannWhitney.Exact {
				mw += " (exact)"
			}
			add(mw, c.MannWhitney, "")
		}
		if c.KruskalWallis != nil {
			add("Kruskal–Wallis H", c.KruskalWallis, "")
		}
	}
}

// populationView fills the population section.
func (s *Summary) populationView(v *pageView, cards map[string]*card.Card) {
	p := s.Population
	if p == nil {
		return
	}
	v.PopulationNote = p.Note + " " + p.Weighting + "."
	if p.Error != "" {
		v.PopulationNote = "The population model could not be fitted: " + p.Error
	}
	if len(p.LeftOut) > 0 {
		v.PopulationNote += " Left out of the population fit (another stress measure or unit): " + strings.Join(p.LeftOut, ", ") + "."
	}
	if c := cards[PopulationCard]; c != nil {
		v.PopulationEnergy = c.Energy
	}
	if c := cards[MeanCard]; c != nil {
		v.MeanEnergy = c.Energy
	}
	// The stresses are in the cohort's measure, which may be nominal: the
	// column names it by its symbol (σ11 or P11), as every other table and
	// plot of weft does, so that a nominal stress is not read as Cauchy.
	kind := biaxial.Cauchy
	if s.StressKind == biaxial.Nominal.String() {
		kind = biaxial.Nominal
	}
	v.Largest.Head = []string{"protocol", kind.Words() + " stress", "at F (specimen)", "population", "mean parameters", "difference", "relative"}
	for _, sc := range p.AtLargestStretch {
		v.Largest.Rows = append(v.Largest.Rows, htmlRow{Cells: []string{sc.Protocol, kind.Symbol(sc.Component),
			fmt.Sprintf("%.4g, %.4g, %.4g, %.4g (%s)", sc.F[0], sc.F[1], sc.F[2], sc.F[3], sc.Specimen),
			cell(sc.Population, 4) + " " + s.StressUnit, cell(sc.MeanParameters, 4) + " " + s.StressUnit, cell(sc.Difference, 3) + " " + s.StressUnit,
			pctCell(sc.Relative)}})
	}
}

func pctCell(x card.Num) string {
	if math.IsNaN(float64(x)) {
		return "—"
	}
	return strings.Replace(fmt.Sprintf("%.1f %%", 100*float64(x)), "-", "−", 1)
}
