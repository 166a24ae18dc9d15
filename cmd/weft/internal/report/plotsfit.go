package report

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Stress–stretch figures: one per protocol and a grid of all protocols.

// compSymbol is a stress component's symbol, e.g. "P11" or "σ22".
func compSymbol(kind, comp string) string {
	if kind == "nominal" {
		return "P" + comp
	}
	return "σ" + comp
}

// kindName writes a stress kind as a name: "Cauchy" or "nominal".
func kindName(kind string) string {
	if kind == "cauchy" {
		return "Cauchy"
	}
	return kind
}

// stressLabel is the stress axis label with its kind and unit.
func stressLabel(kind, unit string) string {
	if kind == "nominal" {
		return "nominal stress P [" + unit + "]"
	}
	return "Cauchy stress σ [" + unit + "]"
}

// abscissaLabel labels the x axis of normal (axis) or shear components.
func abscissaLabel(shear, strain, short bool) string {
	switch {
	case shear:
		return "Green shear strain E12"
	case strain && short:
		return "Green strain E"
	case strain:
		return "Green strain E = ½(λ² − 1)  (E11 for axis 1, E22 for axis 2)"
	case short:
		return "stretch λ"
	default:
		return "stretch λ  (λ1 for axis 1, λ2 for axis 2)"
	}
}

func isShear(comp string) bool { return comp == "12" || comp == "21" }

// protocolFileName makes a protocol label safe for a file name; the index
// keeps names unique.
func protocolFileName(prefix string, i int, label string) string {
	safe := SafeName(strings.ReplaceAll(label, ":", "_"))
	return fmt.Sprintf("%s-%02d-%s", prefix, i+1, safe)
}

// fitQuality is the legend text of a component's model curve: R², or the
// RMSE when R² is undefined (constant measured stress).
func (in *Input) fitQuality(protocol, comp string) string {
	m, ok := in.metric(protocol, comp)
	if !ok {
		return ""
	}
	if !math.IsNaN(float64(m.R2)) {
		return "R² " + fmtR2(float64(m.R2))
	}
	return "RMSE " + fmtNum(float64(m.RMSE), 3) + " " + in.table.unit
}

// heldoutQuality is the legend text of a held-out curve: R², or the RMSE
// when R² is undefined.
func heldoutQuality(meas, pred []float64, unit string) string {
	if r := rSquared(meas, pred); !math.IsNaN(r) {
		return "R² " + fmtR2(r)
	}
	return "RMSE " + fmtNum(rmse(meas, pred), 3) + " " + unit
}

// heldoutStress returns the held-out prediction of a protocol's component,
// or nil.
func (in *Input) heldoutStress(label string, ci int) []float64 {
	if in.heldout == nil {
		return nil
	}
	st, ok := in.heldout.stress[label]
	if !ok {
		return nil
	}
	return st[ci]
}

// addProtocolCurves draws one protocol's components (normal or shear) into
// p and adds their legend entries to l (when non-nil).
func (in *Input) addProtocolCurves(p *plot.Plot, l *plot.Legend, pr *protocolRows, shear, strain, small bool) {
	t := in.table
	var comps []string
	var idx []int
	for ci, c := range t.comps {
		if isShear(c) == shear {
			comps = append(comps, c)
			idx = append(idx, ci)
		}
	}
	cx, cy := modelCurve(in.model, pr, t.kind, comps, strain)
	radius, width := 2.4, 1.5
	if small {
		radius, width = 1.7, 1.2
	}
	for k, comp := range comps {
		ci := idx[k]
		xs := make([]float64, len(pr.F))
		for i, F := range pr.F {
			xs[i] = axisCoordinate(F, comp, strain)
		}
		sym := compSymbol(t.kind, comp)
		col := componentColor(comp)
		mth := addPoints(p, xs, pr.measured[ci], componentGlyph(comp, radius))
		lth := addCurve(p, cx[k], cy[k], lineStyle(col, width, false))
		var hth plot.Thumbnailer
		var hq string
		if ho := in.heldoutStress(pr.label, ci); ho != nil {
			hth = addCurve(p, xs, ho, heldoutStyle(comp, width))
			hq = heldoutQuality(pr.measured[ci], ho, t.unit)
		}
		if l == nil {
			continue
		}
		if mth != nil {
			l.Add(sym+" measured", mth)
		}
		if lth != nil {
			l.Add(sym+" model, "+in.fitQuality(pr.label, comp), lth)
		}
		if hth != nil {
			l.Add(sym+" held-out, "+hq, hth)
		}
	}
	if shear {
		// Keep tiny shear stresses in proportion: the axis spans at least
		// ±2 % of the protocol's largest normal stress.
		big := 0.0
		for ci, c := range t.comps {
			if !isShear(c) {
				for _, v := range pr.measured[ci] {
					if !math.IsNaN(v) {
						big = math.Max(big, math.Abs(v))
					}
				}
			}
		}
		if big > 0 {
			p.Y.Min = math.Min(p.Y.Min, -0.02*big)
			p.Y.Max = math.Max(p.Y.Max, 0.02*big)
		}
	}
}

// heldoutStyle is the dashed line of a component's held-out prediction.
func heldoutStyle(comp string, width float64) draw.LineStyle {
	ls := lineStyle(shade(componentColor(comp), 0.55), width*0.8, true)
	ls.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
	return ls
}

// hasShear reports whether fit.csv holds shear components.
func (t *fitTable) hasShear() bool {
	for _, c := range t.comps {
		if isShear(c) {
			return true
		}
	}
	return false
}

// hasNormal reports whether fit.csv holds normal components.
func (t *fitTable) hasNormal() bool {
	for _, c := range t.comps {
		if !isShear(c) {
			return true
		}
	}
	return false
}

// fitFigure is the stress–stretch (or stress–strain) figure of protocol i.
func (in *Input) fitFigure(i int, strain bool) *figure {
	t := in.table
	pr := t.protocols[i]
	shear, normal := t.hasShear(), t.hasNormal()
	panels := 0
	if normal {
		panels++
	}
	if shear {
		panels++
	}
	lw := 2.3 * vg.Inch
	if shear {
		lw = 2.9 * vg.Inch // longer entries: RMSE with unit
	}
	pw := 4.6 * vg.Inch
	if panels > 1 {
		pw = 4 * vg.Inch
	}
	w := vg.Length(panels)*pw + lw
	what := "stretch"
	if strain {
		what = "Green strain"
	}
	f := &figure{name: protocolFileName("fit", i, pr.label), w: w, h: 4.2 * vg.Inch,
		title: fmt.Sprintf("Protocol %s: %s stress against %s", pr.label, kindName(t.kind), what)}
	f.caption = "Markers: measured points of the kept branch. Solid line: the fitted model evaluated along the protocol's measured deformation (between the points too when the deformation is pure biaxial stretch). "
	if in.heldout != nil {
		f.caption += "Dashed line: held-out prediction, the same model form refitted to every other protocol and used to predict this one. "
	}
	if shear {
		f.caption += "Right panel: shear stresses against the Green shear strain E12 = ½ C12; its stress axis spans at least ±2 % of the protocol's largest normal stress, so that stresses that are negligible next to the normal ones look negligible. "
	}
	f.draw = func(dc draw.Canvas) error {
		dc = drawTitle(dc, fmt.Sprintf("Protocol %s — %s", pr.label, in.card.Specimen))
		area, lc := splitColumns(dc, lw)
		l := newLegend(9)
		var plots []*plot.Plot
		if normal {
			sub := ""
			if shear {
				sub = "axes 1 and 2"
			}
			p := newPlot(sub, abscissaLabel(false, strain, false), stressLabel(t.kind, t.unit), false)
			in.addProtocolCurves(p, &l, pr, false, strain, false)
			plots = append(plots, p)
		}
		if shear {
			p := newPlot("shear", abscissaLabel(true, strain, false), stressLabel(t.kind, t.unit), false)
			in.addProtocolCurves(p, &l, pr, true, strain, false)
			plots = append(plots, p)
		}
		drawRow(area, lc, plots, l)
		return nil
	}
	return f
}

// gridShape returns rows and columns for n tiles plus one legend tile.
func gridShape(n int) (rows, cols int) {
	cells := n + 1
	cols = 3
	if cells <= 4 {
		cols = 2
	}
	rows = (cells + cols - 1) / cols
	return rows, cols
}

// drawGrid lays tiles out row by row and draws the legend in the cell after
// the last tile.
func drawGrid(dc draw.Canvas, plots []*plot.Plot, l plot.Legend) {
	rows, cols := gridShape(len(plots))
	grid := make([][]*plot.Plot, rows)
	for r := range grid {
		grid[r] = make([]*plot.Plot, cols)
	}
	for i, p := range plots {
		grid[i/cols][i%cols] = p
	}
	tiles := draw.Tiles{Rows: rows, Cols: cols, PadX: vg.Points(14), PadY: vg.Points(12), PadBottom: vg.Points(2), PadRight: vg.Points(12)}
	cs := plot.Align(grid, tiles, dc)
	for i, p := range plots {
		p.Draw(cs[i/cols][i%cols])
	}
	n := len(plots)
	lc := tiles.At(dc, n%cols, n/cols)
	l.Draw(draw.Crop(lc, vg.Points(18), 0, 0, -vg.Points(14)))
}

// fitGridFigure shows every protocol's normal components in one figure.
func (in *Input) fitGridFigure(strain bool) *figure {
	t := in.table
	rows, cols := gridShape(len(t.protocols))
	what := "stretch"
	if strain {
		what = "Green strain"
	}
	f := &figure{name: "fit-all", w: vg.Length(cols) * 3.1 * vg.Inch, h: vg.Length(rows)*2.6*vg.Inch + 0.4*vg.Inch,
		title: fmt.Sprintf("All protocols: %s stress against %s", kindName(t.kind), what)}
	f.caption = "One tile per protocol with its R² per axis in the tile title; markers measured, solid lines the fitted model"
	if in.heldout != nil {
		f.caption += ", dashed lines the held-out prediction (model form refitted without that protocol)"
	}
	f.caption += "."
	if t.hasShear() {
		f.caption += " Shear components are shown in each protocol's own figure."
	}
	f.draw = func(dc draw.Canvas) error {
		dc = drawTitle(dc, fmt.Sprintf("%s — all protocols", in.card.Specimen))
		var plots []*plot.Plot
		for _, pr := range t.protocols {
			var q []string
			for _, c := range t.comps {
				if !isShear(c) {
					if m, ok := in.metric(pr.label, c); ok && !math.IsNaN(float64(m.R2)) {
						q = append(q, fmtR2(float64(m.R2)))
					}
				}
			}
			title := pr.label
			if len(q) > 0 {
				title += " · R² " + strings.Join(q, " / ")
			}
			p := newPlot(title, abscissaLabel(false, strain, true), kindName(t.kind)+" "+compSymbol(t.kind, "")+" ["+t.unit+"]", true)
			in.addProtocolCurves(p, nil, pr, false, strain, true)
			plots = append(plots, p)
		}
		drawGrid(dc, plots, genericLegend(in))
		return nil
	}
	return f
}

// genericLegend names the series of the tiled fit figure without numbers.
func genericLegend(in *Input) plot.Legend {
	t := in.table
	l := newLegend(9)
	for _, c := range t.comps {
		if isShear(c) {
			continue
		}
		sym := compSymbol(t.kind, c)
		l.Add(sym+" measured", glyphThumb{componentGlyph(c, 2.4)})
		l.Add(sym+" model", lineThumb{lineStyle(componentColor(c), 1.5, false)})
		if in.heldout != nil {
			l.Add(sym+" held-out", lineThumb{heldoutStyle(c, 1.5)})
		}
	}
	return l
}

// residualFigure shows residuals (model − measured) against stretch or
// strain, one tile per protocol, for the normal (shear false) or shear
// components.
func (in *Input) residualFigure(shear, strain bool) *figure {
	t := in.table
	rows, cols := gridShape(len(t.protocols))
	name, what := "residuals", "normal stresses"
	if shear {
		name, what = "residuals-shear", "shear stresses"
	}
	f := &figure{name: name, w: vg.Length(cols) * 3.1 * vg.Inch, h: vg.Length(rows)*2.6*vg.Inch + 0.4*vg.Inch,
		title:   "Residuals of the " + what + ", model − measured",
		caption: "Residual = model − measured stress at every kept point, one tile per protocol with the RMSE per component in the tile title. A good fit scatters evenly about zero; a trend shows what the model misses."}
	f.draw = func(dc draw.Canvas) error {
		dc = drawTitle(dc, fmt.Sprintf("%s — residuals of the %s", in.card.Specimen, what))
		var plots []*plot.Plot
		l := newLegend(9)
		for i, pr := range t.protocols {
			var q []string
			for _, c := range t.comps {
				if isShear(c) == shear {
					if m, ok := in.metric(pr.label, c); ok {
						q = append(q, fmtNum(float64(m.RMSE), 2))
					}
				}
			}
			title := pr.label + " · RMSE " + strings.Join(q, " / ") + " " + t.unit
			p := newPlot(title, abscissaLabel(shear, strain, true), "residual ["+t.unit+"]", true)
			zero := lineStyle(okabeBlack, 0.7, false)
			var lo, hi = math.Inf(1), math.Inf(-1)
			for ci, c := range t.comps {
				if isShear(c) != shear {
					continue
				}
				xs := make([]float64, len(pr.F))
				for k, F := range pr.F {
					xs[k] = axisCoordinate(F, c, strain)
					lo, hi = math.Min(lo, xs[k]), math.Max(hi, xs[k])
				}
				th := addPoints(p, xs, pr.residual[ci], componentGlyph(c, 1.8))
				if i == 0 && th != nil {
					l.Add(compSymbol(t.kind, c)+" residual", glyphThumb{componentGlyph(c, 2.4)})
				}
			}
			if lo < hi {
				addCurve(p, []float64{lo, hi}, []float64{0, 0}, zero)
			}
			plots = append(plots, p)
		}
		l.Add("zero", lineThumb{lineStyle(okabeBlack, 0.7, false)})
		drawGrid(dc, plots, l)
		return nil
	}
	return f
}
