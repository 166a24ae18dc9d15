package cohortreport

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/report"
)

// The cohort's figures: the parameters by group, and every specimen's
// measured curves with the population model's.

// tileColumns is how many panels a row of a tiled figure holds.
const tileColumns = 3

// legendColumns is how many columns a figure's legend has: two, so that
// a curve figure's legend reads axis 1 on one line and axis 2 on the next.
const legendColumns = 2

// legendStrip is the height of a legend of n items with the space below
// it.
func legendStrip(n int) vg.Length {
	if n == 0 {
		return 0
	}
	return report.LegendHeight(n, legendColumns) + vg.Points(6)
}

// tiles draws plots in a grid of tileColumns columns below a title and
// the legend (none when legend is empty), which says what the panels'
// lines and markers are: the figures had none, and their pale and heavy
// lines were explained only in the caption.
func tiles(dc draw.Canvas, title string, plots []*plot.Plot, legend []report.LegendItem) {
	dc = report.DrawTitle(dc, title)
	if len(legend) > 0 {
		lh := report.LegendHeight(len(legend), legendColumns)
		report.DrawLegend(draw.Crop(dc, vg.Points(30), 0, dc.Size().Y-lh, 0), legend, legendColumns)
		dc = draw.Crop(dc, 0, 0, 0, -legendStrip(len(legend)))
	}
	rows := (len(plots) + tileColumns - 1) / tileColumns
	grid := make([][]*plot.Plot, rows)
	for r := range grid {
		grid[r] = make([]*plot.Plot, tileColumns)
		for c := range grid[r] {
			if k := r*tileColumns + c; k < len(plots) {
				grid[r][c] = plots[k]
			}
		}
	}
	t := draw.Tiles{Rows: rows, Cols: tileColumns, PadX: vg.Points(16), PadY: vg.Points(14), PadBottom: vg.Points(2), PadRight: vg.Points(6)}
	cs := plot.Align(grid, t, dc)
	for r := range grid {
		for c, p := range grid[r] {
			if p != nil {
				p.Draw(cs[r][c])
			}
		}
	}
}

// groupTicks labels the group positions 1…n of a strip plot.
type groupTicks []string

// Ticks implements plot.Ticker.
func (g groupTicks) Ticks(lo, hi float64) []plot.Tick {
	var ts []plot.Tick
	for i, n := range g {
		ts = append(ts, plot.Tick{Value: float64(i + 1), Label: n})
	}
	return ts
}

// parameterFigure draws one panel per parameter: each specimen's value
// by group (spread sideways so that equal values stay visible), and the
// group's mean with its 95 % Student t interval beside them.
func (s *Summary) parameterFigure(in *Input) *report.Figure {
	if len(s.Parameters) == 0 {
		return nil
	}
	gs := groups(in)
	names := gs
	if len(gs) == 0 {
		names = []string{"all"}
	}
	stat := map[[2]string]StatRow{}
	for _, st := range s.Stats {
		stat[[2]string{st.Parameter, st.Group}] = st
	}
	rows := (len(s.Parameters) + tileColumns - 1) / tileColumns
	dot := report.ComponentGlyph("11", 2)
	dot.Color = report.GroupColor(0)
	legend := []report.LegendItem{
		{Text: "one specimen", Glyph: dot},
		{Text: "group mean (short bar)", Line: report.LineStyle(report.GroupColor(0), 2.2, false)},
		{Text: "95 % interval of the mean (line)", Line: report.LineStyle(report.GroupColor(0), 1.2, false)},
	}
	f := &report.Figure{Name: "parameters", Title: "Parameters by group", Width: 10 * vg.Inch, Height: vg.Length(rows)*2.8*vg.Inch + 0.5*vg.Inch + legendStrip(len(legend)),
		Caption: "Dots: one specimen each, spread sideways within its group. Bar and line beside them: the group's mean and the 95 % interval of the mean (Student t). Angles summarised as |α| are marked so in the panel's title."}
	f.Draw = func(dc draw.Canvas) error {
		var plots []*plot.Plot
		for _, p := range s.Parameters {
			title := p.Name
			if p.Absolute {
				title = "|" + p.Name + "|"
			}
			ylabel := ""
			if p.Unit != "" {
				ylabel = "[" + p.Unit + "]"
			}
			pl := report.NewPlot(title, "", ylabel, true)
			pl.X.Tick.Marker = groupTicks(names)
			pl.X.Min, pl.X.Max = 0.4, float64(len(names))+0.6
			for gi, g := range names {
				var vals []float64
				for i, r := range s.Specimens {
					if v, ok := r.Parameters[p.Name]; ok && (len(gs) == 0 || in.Specimens[i].Group == g) && !math.IsNaN(float64(v)) {
						vals = append(vals, float64(v))
					}
				}
				col := report.GroupColor(gi)
				xs := make([]float64, len(vals))
				for k := range vals {
					xs[k] = float64(gi+1) - 0.3 + 0.4*(float64(k)+0.5)/float64(len(vals))
				}
				gs := report.ComponentGlyph("11", 2)
				gs.Color = col
				report.AddPoints(pl, xs, vals, gs)
				st, ok := stat[[2]string{p.Name, g}]
				if !ok || math.IsNaN(float64(st.Mean)) {
					continue
				}
				x := float64(gi+1) + 0.22
				report.AddCurve(pl, []float64{x - 0.08, x + 0.08}, []float64{float64(st.Mean), float64(st.Mean)}, report.LineStyle(col, 2.2, false))
				report.AddCurve(pl, []float64{x, x}, []float64{float64(st.CI95[0]), float64(st.CI95[1])}, report.LineStyle(col, 1.2, false))
			}
			plots = append(plots, pl)
		}
		tiles(dc, "Parameters of every specimen, by group", plots, legend)
		return nil
	}
	return f
}

// curveFigure draws, per protocol label, every pooled specimen's measured
// normal stresses (thin, pale) and the population model along the
// deformation of the specimen that reached the largest stretch (solid).
func (s *Summary) curveFigure(in *Input) *report.Figure {
	if in.Population == nil || len(in.Cohort.InPopulation) == 0 {
		return nil
	}
	type path struct {
		F   [][4]float64
		lam float64
	}
	var labels []string
	widest := map[string]*path{}
	for _, i := range in.Cohort.InPopulation {
		for _, pr := range in.Specimens[specimenIndex(in, i)].Problem.Specimen.Protocols {
			if _, ok := widest[pr.Label]; !ok {
				labels = append(labels, pr.Label)
				widest[pr.Label] = &path{lam: math.Inf(-1)}
			}
			for _, pt := range pr.Points {
				if l := math.Max(pt.F[0], pt.F[3]); l > widest[pr.Label].lam {
					widest[pr.Label].lam = l
					widest[pr.Label].F = nil
					for _, q := range pr.Points {
						widest[pr.Label].F = append(widest[pr.Label].F, q.F)
					}
				}
			}
		}
	}
	rows := (len(labels) + tileColumns - 1) / tileColumns
	legend := curveLegend(in.StressKind)
	f := &report.Figure{Name: "curves", Title: "Every specimen's curves and the population model", Width: 10 * vg.Inch,
		Height:  vg.Length(rows)*2.9*vg.Inch + 0.5*vg.Inch + legendStrip(len(legend)),
		Caption: "Pale lines: each pooled specimen's measured normal stress against the stretch of its axis (axis 1 blue, axis 2 vermillion). Dark lines: the population model (population.json) along the deformation of the specimen that reached the largest stretch in that protocol." + pooledNote(in)}
	f.Draw = func(dc draw.Canvas) error {
		var plots []*plot.Plot
		for _, l := range labels {
			pl := report.NewPlot("protocol "+l, "stretch λ", report.StressLabel(in.StressKind, in.StressUnit), true)
			for _, i := range in.Cohort.InPopulation {
				for _, pr := range in.Specimens[specimenIndex(in, i)].Problem.Specimen.Protocols {
					if pr.Label != l {
						continue
					}
					for c, comp := range []string{"11", "22"} {
						xs, ys := make([]float64, len(pr.Points)), make([]float64, len(pr.Points))
						for k, pt := range pr.Points {
							xs[k], ys[k] = axisStretch(pt.F, c), pt.Stress[c]
						}
						report.AddCurve(pl, xs, ys, report.LineStyle(report.Tint(report.ComponentColor(comp), 0.35), 0.6, false))
					}
				}
			}
			for c, comp := range []string{"11", "22"} {
				var xs, ys []float64
				for _, F := range widest[l].F {
					r, err := in.Population.Evaluate(F)
					if err != nil {
						continue
					}
					xs = append(xs, axisStretch(F, c))
					ys = append(ys, stressOf(&r, in.StressKind, c))
				}
				report.AddCurve(pl, xs, ys, report.LineStyle(report.ComponentColor(comp), 2, false))
			}
			plots = append(plots, pl)
		}
		tiles(dc, fmt.Sprintf("Measured curves of %d specimens and the population model", len(in.Cohort.InPopulation)), plots, legend)
		return nil
	}
	return f
}

// curveLegend names the lines of the curves figure, with the symbols of
// the cohort's stress measure ("cauchy" or "nominal").
func curveLegend(kind string) []report.LegendItem {
	k := biaxial.Cauchy
	if kind == biaxial.Nominal.String() {
		k = biaxial.Nominal
	}
	var out []report.LegendItem
	for _, comp := range []string{"11", "22"} {
		out = append(out,
			report.LegendItem{Text: k.Symbol(comp) + " measured, each pooled specimen", Line: report.LineStyle(report.Tint(report.ComponentColor(comp), 0.35), 0.6, false)},
			report.LegendItem{Text: k.Symbol(comp) + " population model", Line: report.LineStyle(report.ComponentColor(comp), 2, false)})
	}
	return out
}

// pooledNote names, for the curves figure's caption, the specimens drawn
// and those left out of the population fit, whose curves are not drawn:
// the figure's count ("2 specimens") otherwise disagreed unexplained with
// the cohort's.
func pooledNote(in *Input) string {
	var drawn, left []string
	name := func(i int) string {
		if j := specimenIndex(in, i); j >= 0 {
			return in.Specimens[j].Name
		}
		return fmt.Sprintf("specimen %d", i+1)
	}
	for _, i := range in.Cohort.InPopulation {
		drawn = append(drawn, name(i))
	}
	for _, i := range in.Cohort.LeftOut {
		left = append(left, name(i))
	}
	note := " Drawn: " + strings.Join(drawn, ", ") + "."
	if len(left) > 0 {
		note += " Not drawn, left out of the population fit (another stress measure or unit): " + strings.Join(left, ", ") + "."
	}
	return note
}

// axisStretch is the stretch of a material line along axis c+1,
// λ = √C_cc: √(F11² + F21²) for axis 1, √(F12² + F22²) for axis 2.
func axisStretch(F [4]float64, c int) float64 {
	if c == 0 {
		return math.Hypot(F[0], F[2])
	}
	return math.Hypot(F[1], F[3])
}
