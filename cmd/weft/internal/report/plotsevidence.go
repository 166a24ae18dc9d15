package report

import (
	"fmt"
	"image/color"
	"math"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/weft-tools/weft/aniso/card"
)

// Evidence plots: the loss profile over each fibre angle, the Pareto front
// of the model search and the cross-protocol prediction matrix.

// textMarks is a plotter that writes text at data positions, offset by
// (dx, dy) points.
type textMarks struct {
	xs, ys []float64
	texts  []string
	colors []color.Color
	size   float64
	xalign draw.XAlignment
	dx, dy float64
}

// Plot implements plot.Plotter.
func (m *textMarks) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	sty := textStyle(m.size)
	sty.XAlign, sty.YAlign = m.xalign, draw.YCenter
	for i, s := range m.texts {
		sty.Color = color.Black
		if i < len(m.colors) {
			sty.Color = m.colors[i]
		}
		c.FillText(sty, vg.Point{X: trX(m.xs[i]) + vg.Points(m.dx), Y: trY(m.ys[i]) + vg.Points(m.dy)}, s)
	}
}

// degTicks are fixed ticks every 30° over (−90°, 90°].
func degTicks() plot.Ticker {
	var ts []plot.Tick
	for a := -90; a <= 90; a += 30 {
		ts = append(ts, plot.Tick{Value: float64(a), Label: trueMinus(fmt.Sprintf("%d°", a))})
	}
	for a := -75; a <= 75; a += 30 {
		ts = append(ts, plot.Tick{Value: float64(a)})
	}
	return plot.ConstantTicks(ts)
}

// band returns a filled rectangle from x0 to x1 over [y0, y1].
func band(x0, x1, y0, y1 float64, c color.Color) *plotter.Polygon {
	pg, err := plotter.NewPolygon(plotter.XYs{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}})
	if err != nil {
		return nil
	}
	pg.Color = c
	pg.LineStyle.Width = 0
	return pg
}

// profileFigure draws the loss profile over each fibre angle parameter, or
// returns nil when the fit has none (no fibre family).
func (in *Input) profileFigure() *figure {
	profs := in.fit.Profiles
	if len(profs) == 0 {
		return nil
	}
	lw := 2.4 * vg.Inch
	pw := 4.3 * vg.Inch
	if len(profs) > 1 {
		pw = 3.7 * vg.Inch
	}
	f := &figure{name: "angle-profile", w: vg.Length(len(profs))*pw + lw, h: 3.8 * vg.Inch,
		title: "Loss profile over the fibre angle",
		caption: "The fit's loss (weighted residual sum of squares) minimised over every other parameter at each fibre angle from −90° to 90°, on a log scale. " +
			"The vertical line and dot mark the fitted angle and the fitted model's loss; the shaded band is the 95 % profile-likelihood interval stated in model.json, where the loss stays below the dashed threshold. " +
			"The profile is computed on a grid (2° by default) and joined through the fitted point, so a minimum sharper than the grid shows as a narrow notch."}
	mirrored := false
	for _, pc := range profs {
		mirrored = mirrored || pc.Mirrored
	}
	if mirrored {
		f.caption += " Without shear information the sign of the angle is not determined: the profile is mirrored, and the grey band and dotted line mark the equally good mirror image."
	}
	f.draw = func(dc draw.Canvas) error {
		dc = drawTitle(dc, in.card.Specimen+" — loss profile over the fibre angle")
		area, lc := splitColumns(dc, lw)
		var plots []*plot.Plot
		l := newLegend(9)
		for j, pc := range profs {
			plots = append(plots, in.profilePanel(pc, len(profs) > 1, j == 0, &l))
		}
		drawRow(area, lc, plots, l)
		return nil
	}
	return f
}

// profilePanel draws the loss profile pc over one fibre angle, with its
// interval, threshold and fitted angle; several shortens the title for
// side-by-side panels, and the first panel adds the legend entries to l.
func (in *Input) profilePanel(pc card.ProfileCard, several, first bool, l *plot.Legend) *plot.Plot {
	opt := float64(pc.OptimumDeg)
	iv := [2]float64{float64(pc.IntervalDeg[0]), float64(pc.IntervalDeg[1])}
	sign := ""
	if pc.Mirrored {
		sign = "±"
	}
	title := fmt.Sprintf("%s = %s%s, 95 %% interval %s to %s", pc.Name, sign, fmtDeg(opt), fmtDeg(iv[0]), fmtDeg(iv[1]))
	if several {
		title = fmt.Sprintf("%s = %s%s (95 %%: %s to %s)", pc.Name, sign, fmtDeg(opt), fmtDeg(iv[0]), fmtDeg(iv[1]))
	}
	switch {
	case pc.NotDetermined:
		title = fmt.Sprintf("%s = %s%s, not determined (no angle excluded)", pc.Name, sign, fmtDeg(opt))
	case !pc.Closed:
		title += " (open)"
	}
	p := newPlot(title, "fibre angle from axis 1 towards axis 2", "loss (log scale)", true)
	p.Y.Scale = plot.LogScale{}
	p.Y.Tick.Marker = plot.LogTicks{Prec: -1}
	p.X.Tick.Marker = degTicks()
	p.X.Min, p.X.Max = -90, 90
	// The profile at the fitted angle is the fit's own loss; the
	// grid can straddle a sharp minimum, so that point joins the
	// curve (and its mirror image when the sign is unknown).
	type pt struct{ a, v float64 }
	var pts []pt
	for k, a := range pc.AnglesDeg {
		pts = append(pts, pt{float64(a), float64(pc.Loss[k])})
	}
	fitLoss := float64(in.fit.Loss)
	if fitLoss > 0 && !math.IsNaN(opt) {
		pts = append(pts, pt{opt, fitLoss})
		if pc.Mirrored && math.Abs(opt) > 1e-9 {
			pts = append(pts, pt{-opt, fitLoss})
		}
	}
	sort.SliceStable(pts, func(a, b int) bool { return pts[a].a < pts[b].a })
	var xs, ys []float64
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, q := range pts {
		if !(q.v > 0) || math.IsInf(q.v, 0) {
			xs, ys = append(xs, q.a), append(ys, math.NaN())
			continue
		}
		xs, ys = append(xs, q.a), append(ys, q.v)
		lo, hi = math.Min(lo, q.v), math.Max(hi, q.v)
	}
	thr := float64(pc.Threshold)
	if thr > 0 {
		lo, hi = math.Min(lo, thr), math.Max(hi, thr)
	}
	if math.IsInf(lo, 1) {
		lo, hi = 1e-6, 1
	}
	y0, y1 := logRange(lo, hi)
	p.Y.Min, p.Y.Max = y0, y1
	if !math.IsNaN(iv[0]) && !math.IsNaN(iv[1]) {
		if pc.Mirrored {
			if b := band(-iv[1], -iv[0], y0, y1, tint(okabeBlack, 0.12)); b != nil {
				p.Add(b)
				if first {
					l.Add("mirror image of the interval", swatch{tint(okabeBlack, 0.12)})
				}
			}
		}
		if b := band(iv[0], iv[1], y0, y1, tint(okabeSkyBlue, 0.45)); b != nil {
			p.Add(b)
			if first {
				l.Add("95 % interval", swatch{tint(okabeSkyBlue, 0.45)})
			}
		}
	}
	th := addCurve(p, xs, ys, lineStyle(okabeBlack, 1.3, false))
	if first && th != nil {
		l.Add("profiled loss", th)
	}
	if thr > 0 {
		ls := lineStyle(okabeVermillion, 1.1, true)
		addCurve(p, []float64{-90, 90}, []float64{thr, thr}, ls)
		if first {
			l.Add("95 % threshold", lineThumb{ls})
		}
	}
	if !math.IsNaN(opt) {
		ls := lineStyle(okabeBlue, 1.4, false)
		addCurve(p, []float64{opt, opt}, []float64{y0, y1}, ls)
		dot := draw.GlyphStyle{Color: okabeBlue, Radius: vg.Points(3), Shape: draw.CircleGlyph{}}
		addPoints(p, []float64{opt}, []float64{fitLoss}, dot)
		if first {
			l.Add("fitted angle", lineThumb{ls})
			l.Add("fitted model's loss", glyphThumb{dot})
		}
		if pc.Mirrored && math.Abs(opt) > 1e-9 {
			ms := lineStyle(okabeBlue, 1.2, false)
			ms.Dashes = []vg.Length{vg.Points(1.5), vg.Points(2.5)}
			addCurve(p, []float64{-opt, -opt}, []float64{y0, y1}, ms)
			if first {
				l.Add("mirror image (sign unknown)", lineThumb{ms})
			}
		}
	}
	return p
}

// formKey names a candidate's model form: the layout, with "+dispersed"
// for in-plane dispersed families or "+kappa" for a dispersion κ.
func formKey(c card.CandidateCard) string {
	switch {
	case c.InPlane:
		return c.Layout + "+dispersed"
	case c.Dispersion:
		return c.Layout + "+kappa"
	}
	return c.Layout
}

// cutSpread splits a form key into its layout and whether the families
// spread (in the plane or by κ).
func cutSpread(key string) (string, bool) {
	if b, ok := strings.CutSuffix(key, "+dispersed"); ok {
		return b, true
	}
	return strings.CutSuffix(key, "+kappa")
}

// formDisplay describes a model form for a legend.
func formDisplay(key string) string {
	d := map[string]string{"none": "no fibre family", "single": "one fibre family", "mirror": "mirror pair (θ ± β)", "free": "two free families"}
	base, disp := cutSpread(key)
	s := d[base]
	if s == "" {
		s = base
	}
	if strings.HasSuffix(key, "+dispersed") {
		s += ", spread in the plane"
	} else if disp {
		s += ", dispersion κ"
	}
	return s
}

// formGlyph is the marker of a model form in the Pareto plot.
func formGlyph(key string) draw.GlyphStyle {
	base, disp := cutSpread(key)
	gs := draw.GlyphStyle{Color: layoutColor(base), Radius: vg.Points(3)}
	switch base {
	case "none":
		gs.Shape = draw.CircleGlyph{}
	case "single":
		gs.Shape = draw.BoxGlyph{}
	case "mirror":
		gs.Shape = draw.PyramidGlyph{}
	default:
		gs.Shape = draw.CrossGlyph{}
	}
	if disp {
		switch gs.Shape.(type) {
		case draw.CircleGlyph:
			gs.Shape = draw.RingGlyph{}
		case draw.BoxGlyph:
			gs.Shape = draw.SquareGlyph{}
		case draw.PyramidGlyph:
			gs.Shape = draw.TriangleGlyph{}
		default:
			gs.Shape = draw.PlusGlyph{}
		}
	}
	return gs
}

// paretoFigure plots number of parameters against loss for every Pareto
// candidate, one series per model form, with the presets and the chosen
// model marked; nil without a selection section.
func (in *Input) paretoFigure() *figure {
	sel := in.sel
	if sel == nil || len(sel.Pareto) == 0 {
		return nil
	}
	lw := 2.6 * vg.Inch
	f := &figure{name: "pareto", w: 5.6*vg.Inch + lw, h: 4.2 * vg.Inch,
		title: "Pareto front: model size against loss",
		caption: "Every model form kept by the search: its number of parameters (weights and non-linear parameters) against its loss, on a log scale, " +
			"one series per fibre layout. Plus signs are the classical presets fitted to the same data; the ring marks the chosen model (" + sel.Chosen + "), " +
			"picked by the selection rule stated in the report and in model.json, not by the lowest loss."}
	f.draw = func(dc draw.Canvas) error {
		dc = drawTitle(dc, in.card.Specimen+" — model search")
		area, lc := splitColumns(dc, lw)
		p := newPlot("", "number of parameters", "loss (log scale)", false)
		p.Y.Scale = plot.LogScale{}
		p.Y.Tick.Marker = plot.LogTicks{Prec: -1}
		var keys []string
		series := map[string][]card.CandidateCard{}
		for _, c := range sel.Pareto {
			k := formKey(c)
			if _, ok := series[k]; !ok {
				keys = append(keys, k)
			}
			series[k] = append(series[k], c)
		}
		order := map[string]int{"none": 0, "single": 1, "mirror": 2, "free": 3}
		sort.SliceStable(keys, func(a, b int) bool {
			ba, da := cutSpread(keys[a])
			bb, db := cutSpread(keys[b])
			if order[ba] != order[bb] {
				return order[ba] < order[bb]
			}
			return !da && db
		})
		l := newLegend(9)
		xmax := 1.0
		for _, k := range keys {
			cs := series[k]
			sort.SliceStable(cs, func(a, b int) bool { return cs[a].Parameters < cs[b].Parameters })
			var xs, ys []float64
			for _, c := range cs {
				if v := float64(c.Loss); v > 0 && !math.IsInf(v, 0) {
					xs, ys = append(xs, float64(c.Parameters)), append(ys, v)
					xmax = math.Max(xmax, float64(c.Parameters))
				}
			}
			base, disp := cutSpread(k)
			addCurve(p, xs, ys, lineStyle(tint(layoutColor(base), 0.55), 0.9, disp))
			if th := addPoints(p, xs, ys, formGlyph(k)); th != nil {
				l.Add(formDisplay(k), th)
			}
		}
		var pre textMarks
		pre.size, pre.xalign, pre.dx = 8, draw.XLeft, 6
		var pxs, pys []float64
		for _, c := range sel.Presets {
			if v := float64(c.Loss); v > 0 && !math.IsInf(v, 0) {
				pxs, pys = append(pxs, float64(c.Parameters)), append(pys, v)
				xmax = math.Max(xmax, float64(c.Parameters))
				pre.xs, pre.ys = append(pre.xs, float64(c.Parameters)), append(pre.ys, v)
				pre.texts = append(pre.texts, strings.TrimPrefix(c.Name, "preset:"))
				pre.colors = append(pre.colors, okabeReddishPurple)
			}
		}
		if th := addPoints(p, pxs, pys, draw.GlyphStyle{Color: okabeReddishPurple, Radius: vg.Points(4.5), Shape: draw.PlusGlyph{}}); th != nil {
			l.Add("classical preset", th)
			p.Add(&pre)
		}
		for _, c := range sel.Pareto {
			if c.Chosen && float64(c.Loss) > 0 {
				ring := draw.GlyphStyle{Color: okabeBlack, Radius: vg.Points(8), Shape: draw.RingGlyph{}}
				if th := addPoints(p, []float64{float64(c.Parameters)}, []float64{float64(c.Loss)}, ring); th != nil {
					l.Add("chosen: "+c.Name, th)
				}
				p.Add(&textMarks{xs: []float64{float64(c.Parameters)}, ys: []float64{float64(c.Loss)}, texts: []string{"chosen"},
					size: 8.5, xalign: draw.XCenter, dy: -15})
			}
		}
		if lo, hi := lossRange(sel); lo > 0 {
			p.Y.Min, p.Y.Max = logRange(lo, hi)
		}
		p.X.Min, p.X.Max = 0.5, xmax+1.5
		var ts []plot.Tick
		for k := 1; k <= int(xmax)+1; k++ {
			ts = append(ts, plot.Tick{Value: float64(k), Label: fmt.Sprint(k)})
		}
		p.X.Tick.Marker = plot.ConstantTicks(ts)
		p.Draw(area)
		l.Draw(draw.Crop(lc, 0, 0, 0, -vg.Points(24)))
		return nil
	}
	return f
}

// lossRange is the smallest and largest positive finite loss of the
// selection's model forms and presets (0, 0 when there is none).
func lossRange(sel *card.SelectionSection) (float64, float64) {
	lo, hi := math.Inf(1), 0.0
	for _, cs := range [][]card.CandidateCard{sel.Pareto, sel.Presets} {
		for _, c := range cs {
			if v := float64(c.Loss); v > 0 && !math.IsInf(v, 0) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if hi == 0 {
		return 0, 0
	}
	return lo, hi
}

// r2Scale maps R² to [0, 1] for the heat map: the number of nines,
// −log10(1 − R²), over 0 … 4, so that 0.9, 0.99, 0.999 and 0.9999 are
// evenly spaced; R² ≤ 0 maps to 0.
func r2Scale(r float64) float64 {
	if math.IsNaN(r) {
		return 0
	}
	if r >= 1 {
		return 1
	}
	return max(0, min(1, -math.Log10(1-r)/4))
}

// heatCells draws an n×n matrix of R² values as coloured cells with their
// values written in.
type heatCells struct {
	vals [][]float64
}

// Plot implements plot.Plotter.
func (h *heatCells) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	n := len(h.vals)
	sty := textStyle(8.5)
	sty.XAlign, sty.YAlign = draw.XCenter, draw.YCenter
	for i, row := range h.vals {
		for j, v := range row {
			y := float64(n - 1 - i)
			x := float64(j)
			x0, x1, y0, y1 := trX(x-0.5), trX(x+0.5), trY(y-0.5), trY(y+0.5)
			cell := []vg.Point{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}}
			t := r2Scale(v)
			fill := heatColor(t)
			if math.IsNaN(v) {
				fill = color.NRGBA{0xf2, 0xf2, 0xf2, 0xff}
			}
			c.FillPolygon(fill, cell)
			c.StrokeLines(lineStyle(color.White, 1, false), append(cell, cell[0]))
			sty.Color = color.Black
			if luminance(fill) < 0.5 {
				sty.Color = color.White
			}
			c.FillText(sty, vg.Point{X: (x0 + x1) / 2, Y: (y0 + y1) / 2}, fmtR2(v))
			if i == j {
				in := vg.Points(2)
				box := []vg.Point{{X: x0 + in, Y: y0 + in}, {X: x1 - in, Y: y0 + in}, {X: x1 - in, Y: y1 - in}, {X: x0 + in, Y: y1 - in}, {X: x0 + in, Y: y0 + in}}
				c.StrokeLines(lineStyle(okabeVermillion, 1.4, true), box)
			}
		}
	}
}

// colourBar draws the heat map's colour scale over y ∈ [0, 4] nines.
type colourBar struct{}

// Plot implements plot.Plotter.
func (colourBar) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	const steps = 64
	for k := 0; k < steps; k++ {
		a, b := 4*float64(k)/steps, 4*float64(k+1)/steps
		fill := heatColor((a + b) / 8)
		// Overlap the next step so that no seam shows between steps.
		top := trY(b) + vg.Points(0.6)
		if k == steps-1 {
			top = trY(b)
		}
		c.FillPolygon(fill, []vg.Point{{X: trX(0), Y: trY(a)}, {X: trX(1), Y: trY(a)}, {X: trX(1), Y: top}, {X: trX(0), Y: top}})
	}
}

// crossFigure is the heat map of selection.cross_r2: the chosen form fitted
// to one protocol alone (rows) predicting every protocol (columns); nil
// without it.
func (in *Input) crossFigure() *figure {
	sel := in.sel
	if sel == nil || len(sel.CrossR2) == 0 || len(sel.CrossR2) != len(sel.Protocols) {
		return nil
	}
	n := len(sel.Protocols)
	f := &figure{name: "cross-r2", w: vg.Length(n)*0.95*vg.Inch + 2.9*vg.Inch, h: vg.Length(n)*0.55*vg.Inch + 1.7*vg.Inch,
		title: "Cross-protocol prediction: fit on one protocol, predict each other",
		caption: "Row: the chosen model form fitted to that protocol alone; column: the protocol it predicts; cell: the mean R² over the measured components. " +
			"Dashed outlines mark the diagonal, where the protocol predicts itself. Colour scales with the number of nines of R² (0.9, 0.99, 0.999, …); " +
			"a pale row means that protocol alone does not determine the model."}
	f.draw = func(dc draw.Canvas) error {
		dc = drawTitle(dc, in.card.Specimen+" — fit on one protocol, predict each other")
		area, bar := splitColumns(dc, 1.2*vg.Inch)
		p := newBarePlot("", "predicted protocol", "fitted to this protocol alone", false)
		p.Add(&heatCells{vals: numRows(sel.CrossR2)})
		p.NominalX(sel.Protocols...)
		rev := make([]string, n)
		for i, s := range sel.Protocols {
			rev[n-1-i] = s
		}
		p.NominalY(rev...)
		p.X.Min, p.X.Max = -0.5, float64(n)-0.5
		p.Y.Min, p.Y.Max = -0.5, float64(n)-0.5
		p.X.Padding, p.Y.Padding = 0, 0
		p.Draw(area)
		cb := newBarePlot("R²", "", "", true)
		cb.Add(colourBar{})
		cb.X.Min, cb.X.Max = 0, 1
		cb.Y.Min, cb.Y.Max = 0, 4
		cb.HideX()
		cb.X.Padding, cb.Y.Padding = 0, 0
		cb.Y.Tick.Marker = plot.ConstantTicks([]plot.Tick{{Value: 0, Label: "≤ 0"}, {Value: 1, Label: "0.9"}, {Value: 2, Label: "0.99"},
			{Value: 3, Label: "0.999"}, {Value: 4, Label: "≥ 0.9999"}})
		cb.Draw(draw.Crop(bar, 0, -vg.Points(30), vg.Points(40), -vg.Points(10)))
		return nil
	}
	return f
}

// numRows converts a card matrix to floats.
func numRows(m [][]card.Num) [][]float64 {
	out := make([][]float64, len(m))
	for i, r := range m {
		out[i] = make([]float64, len(r))
		for j, v := range r {
			out[i][j] = float64(v)
		}
	}
	return out
}
