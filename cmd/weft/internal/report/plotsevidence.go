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

// Evidence plots: the loss profile over each fibre angle and the model
// forms' held-out errors.

// degTicks are ticks every 45° over [−90°, 90°], minor ones every 15°.
func degTicks() plot.Ticker {
	var ts []plot.Tick
	for a := -90; a <= 90; a += 15 {
		t := plot.Tick{Value: float64(a)}
		if a%45 == 0 {
			t.Label = trueMinus(fmt.Sprintf("%d°", a))
		}
		ts = append(ts, t)
	}
	return plot.ConstantTicks(ts)
}

// vband returns a filled rectangle from x0 to x1 over [y0, y1].
func vband(x0, x1, y0, y1 float64, c color.Color) *plotter.Polygon {
	pg, err := plotter.NewPolygon(plotter.XYs{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}})
	if err != nil {
		return nil
	}
	pg.Color = c
	pg.LineStyle.Width = 0
	return pg
}

// Styles of the profile plots.
var (
	profileLine   = lineStyle(okabeBlack, 1.2)
	thresholdLine = lineStyle(okabeVermillion, 1.1, 4, 2.5)
	fittedLine    = lineStyle(okabeBlue, 1.1)
	mirrorLine    = lineStyle(okabeBlue, 1, 1.2, 2.2)
	intervalFill  = translucent(okabeSkyBlue, 0.35)
	mirrorFill    = translucent(okabeBlack, 0.1)
	computedMark  = draw.GlyphStyle{Color: okabeBlack, Radius: vg.Points(2.2), Shape: filledMark{}}
	quadraticLine = lineStyle(tint(okabeBlack, 0.6), 0.9, 1.5, 2)
)

// profileFloor is the lowest rise drawn on the log axis of the whole-range
// panel, in units of the threshold's rise: the fitted angle itself (rise
// 0) sits there.
const profileFloor = 0.1

// profileFigure draws each fibre angle's loss profile, one row per angle
// parameter: over the whole range, and around the fitted angle; nil when
// the fit has no fibre family.
func (in *Input) profileFigure() *figure {
	profs := in.fit.Profiles
	if len(profs) == 0 {
		return nil
	}
	mirrored := false
	for _, pc := range profs {
		mirrored = mirrored || pc.Mirrored
	}
	legend := []legendEntry{
		{"profiled loss (grid points joined)", lineSample(profileLine)},
		{"95 % threshold", lineSample(thresholdLine)},
		{"95 % profile interval", bandSample(intervalFill, draw.LineStyle{})},
		{"fitted angle", lineSample(fittedLine)},
		{"computed points near the minimum", glyphSample(computedMark)},
		{"where the grid is coarser: a parabola", lineSample(quadraticLine)},
	}
	if mirrored {
		legend = append(legend, legendEntry{"mirror image (sign unknown)", bandSample(mirrorFill, mirrorLine)})
	}
	rowH := 1.95 * vg.Inch
	lh := legendHeight(len(legend), 3)
	f := &figure{name: "angle-profile", w: figWidth, h: vg.Length(len(profs))*rowH + lh + vg.Points(6),
		title: "Loss profile over each fibre angle",
		caption: "One row per angle parameter. Left: the rise of the fit's loss above its minimum when the angle is held and every other parameter refitted, in units of the rise the 95 % profile-likelihood threshold allows (log scale; the fitted angle, rise 0, sits at the bottom edge); angles under the dashed threshold (1) are not excluded by the data. " +
			"Right: the same around the fitted angle, linear, so that interval and threshold can be read; the profile is computed on a 2° or 4° grid, so near a minimum sharper than the grid the computed points are the fitted angle and the interval's ends (bisection), joined by a parabola on each side; otherwise the computed points are joined by straight lines."}
	if mirrored {
		f.caption += " Without shear information the sign of the angle is not determined: the profile is mirrored, and the grey band marks the equally good mirror image."
	}
	f.draw = func(dc draw.Canvas) error {
		drawLegend(draw.Crop(dc, vg.Points(30), 0, 0, -(dc.Size().Y-lh)), legend, 3)
		area := draw.Crop(dc, 0, 0, lh+vg.Points(6), 0)
		sty := textStyle(titleSize)
		sty.YAlign = draw.YTop
		rh := area.Size().Y / vg.Length(len(profs))
		for r, pc := range profs {
			row := draw.Crop(area, 0, 0, area.Size().Y-rh*vg.Length(r+1), -rh*vg.Length(r))
			row.FillText(sty, vg.Point{X: row.Min.X + vg.Points(4), Y: row.Max.Y}, profileTitle(pc))
			panels := draw.Crop(row, 0, 0, 0, -vg.Points(titleSize*1.6))
			grid := [][]*plot.Plot{{in.profileWhole(pc), in.profileZoom(pc)}}
			tiles := draw.Tiles{Rows: 1, Cols: 2, PadX: vg.Points(14), PadY: vg.Points(4), PadTop: vg.Points(2), PadRight: vg.Points(6), PadBottom: vg.Points(4)}
			cs := plot.Align(grid, tiles, panels)
			for c, p := range grid[0] {
				p.Draw(cs[0][c])
			}
		}
		return nil
	}
	return f
}

// profileTitle heads a profile panel.
func profileTitle(pc card.ProfileCard) string {
	opt := float64(pc.OptimumDeg)
	sign := ""
	if pc.Mirrored {
		sign = "±"
	}
	iv := [2]float64{float64(pc.IntervalDeg[0]), float64(pc.IntervalDeg[1])}
	switch {
	case pc.NotDetermined:
		return fmt.Sprintf("%s = %s%s: not determined", pc.Name, sign, fmtDeg(math.Abs(opt)))
	case !pc.Closed:
		return fmt.Sprintf("%s = %s%s, 95 %%: %s to %s (open)", pc.Name, sign, fmtDeg(opt), fmtDeg(iv[0]), fmtDeg(iv[1]))
	}
	return fmt.Sprintf("%s = %s%s, 95 %%: %s to %s", pc.Name, sign, fmtDeg(opt), fmtDeg(iv[0]), fmtDeg(iv[1]))
}

// rise converts a profiled loss into the rise above the fit's loss in
// units of the threshold's rise.
func (in *Input) rise(pc card.ProfileCard, loss float64) float64 {
	min, thr := float64(in.fit.Loss), float64(pc.Threshold)
	if !(thr > min) {
		return math.NaN()
	}
	return (loss - min) / (thr - min)
}

// profilePoints returns the profile's grid angles and rises, with the
// fitted angle (rise 0) joined in, sorted by angle.
func (in *Input) profilePoints(pc card.ProfileCard) (xs, ys []float64) {
	type pt struct{ a, v float64 }
	var pts []pt
	for k, a := range pc.AnglesDeg {
		pts = append(pts, pt{float64(a), in.rise(pc, float64(pc.Loss[k]))})
	}
	opt := float64(pc.OptimumDeg)
	if !math.IsNaN(opt) {
		pts = append(pts, pt{opt, 0})
		if pc.Mirrored && math.Abs(opt) > 1e-9 {
			pts = append(pts, pt{-opt, 0})
		}
	}
	sort.SliceStable(pts, func(a, b int) bool { return pts[a].a < pts[b].a })
	for _, q := range pts {
		xs, ys = append(xs, q.a), append(ys, q.v)
	}
	return xs, ys
}

// profileWhole is the panel over the whole range, log scale. The axis
// holds log10 of the rise on a linear scale, its ticks labelled with the
// rise itself (log10Ticks): on the plotting library's log scale the panel
// lost a fifth of its height, as the library places the axis title's box
// at the arithmetic middle of the range (near the top of a log axis) and
// made room above the frame for it.
func (in *Input) profileWhole(pc card.ProfileCard) *plot.Plot {
	p := newPanel("", "fibre angle [°] from axis 1 towards axis 2, whole range", "loss rise ÷ threshold rise", 5, 6)
	p.X.Tick.Marker = degTicks()
	p.X.Min, p.X.Max = -90, 90
	xs, ys := in.profilePoints(pc)
	top := 10.0
	for k, v := range ys {
		if !bad(v) {
			top = math.Max(top, v)
		}
		if v < profileFloor {
			ys[k] = profileFloor
		}
		ys[k] = math.Log10(ys[k])
	}
	y0, y1 := math.Log10(profileFloor), math.Log10(top*2)
	p.Y.Min, p.Y.Max = y0, y1
	p.Y.Tick.Marker = log10Ticks{logTicks{maxLabels: 6}}
	opt := float64(pc.OptimumDeg)
	iv := [2]float64{float64(pc.IntervalDeg[0]), float64(pc.IntervalDeg[1])}
	if !bad(iv[0]) && !bad(iv[1]) {
		if pc.Mirrored {
			if b := vband(-iv[1], -iv[0], y0, y1, mirrorFill); b != nil {
				p.Add(b)
			}
		}
		if b := vband(iv[0], iv[1], y0, y1, intervalFill); b != nil {
			p.Add(b)
		}
	}
	addCurve(p, xs, ys, profileLine)
	addCurve(p, []float64{-90, 90}, []float64{0, 0}, thresholdLine) // a rise of 1
	if !bad(opt) {
		addCurve(p, []float64{opt, opt}, []float64{y0, y1}, fittedLine)
		if pc.Mirrored && math.Abs(opt) > 1e-9 {
			addCurve(p, []float64{-opt, -opt}, []float64{y0, y1}, mirrorLine)
		}
	}
	return p
}

// log10Ticks labels a linear axis that holds log10 of a quantity as
// logTicks labels the quantity on a log axis.
type log10Ticks struct{ logTicks }

// Ticks implements plot.Ticker.
func (lt log10Ticks) Ticks(lo, hi float64) []plot.Tick {
	ts := lt.logTicks.Ticks(math.Pow(10, lo), math.Pow(10, hi))
	for i := range ts {
		ts[i].Value = math.Log10(ts[i].Value)
	}
	return ts
}

// profileZoom is the panel around the fitted angle, linear scale: the
// computed points (grid points in the window, the fitted angle, the
// interval's ends at the threshold) and a half-parabola on each side
// through the fitted angle and that side's end.
func (in *Input) profileZoom(pc card.ProfileCard) *plot.Plot {
	opt := float64(pc.OptimumDeg)
	iv := [2]float64{float64(pc.IntervalDeg[0]), float64(pc.IntervalDeg[1])}
	p := newPanel("", "fibre angle [°], around the fitted angle", "loss rise ÷ threshold rise", 5, 6)
	p.Y.Min, p.Y.Max = 0, 4
	if pc.NotDetermined || !pc.Closed || bad(opt) || bad(iv[0]) || bad(iv[1]) || bad(in.rise(pc, float64(pc.Threshold))) {
		// Nothing narrow to zoom into: the whole range on a linear scale.
		p.X.Label.Text = "fibre angle [°], whole range, linear scale"
		xs, ys := in.profilePoints(pc)
		p.X.Tick.Marker = degTicks()
		p.X.Min, p.X.Max = -90, 90
		addCurve(p, xs, ys, profileLine)
		addCurve(p, []float64{-90, 90}, []float64{1, 1}, thresholdLine)
		clampY(p, ys)
		return p
	}
	// An interval end that meets the fitted angle is a bound of the
	// angle's domain (|α| ≥ 0 without shear information), not a crossing
	// of the threshold: it gets no computed point and no parabola.
	const tiny = 1e-6
	left, right := opt-iv[0] > tiny, iv[1]-opt > tiny
	hl, hr := opt-iv[0], iv[1]-opt
	if !left {
		hl = hr
	}
	if !right {
		hr = hl
	}
	hl, hr = math.Max(hl, 0.01), math.Max(hr, 0.01)
	x0, x1 := opt-2.5*hl, opt+2.5*hr
	p.X.Min, p.X.Max = x0, x1
	if b := vband(iv[0], iv[1], 0, 4, intervalFill); b != nil {
		p.Add(b)
	}
	type pt struct{ x, y float64 }
	pts := []pt{{opt, 0}}
	if left {
		pts = append(pts, pt{iv[0], 1})
	}
	if right {
		pts = append(pts, pt{iv[1], 1})
	}
	grid := 0
	for k, a := range pc.AnglesDeg {
		if x := float64(a); x > x0 && x < x1 && math.Abs(x-opt) > tiny {
			if r := in.rise(pc, float64(pc.Loss[k])); !bad(r) {
				pts = append(pts, pt{x, r})
				grid++
			}
		}
	}
	sort.Slice(pts, func(a, b int) bool { return pts[a].x < pts[b].x })
	var cx, cy []float64
	for _, q := range pts {
		cx, cy = append(cx, q.x), append(cy, q.y)
	}
	if grid >= 2 {
		// The grid resolves the minimum: the computed points joined.
		addCurve(p, cx, cy, profileLine)
	} else {
		// A minimum sharper than the grid: a parabola on each side
		// through the fitted angle and that side's end.
		var qx, qy []float64
		for k := 0; k <= 80; k++ {
			x := x0 + (x1-x0)*float64(k)/80
			if x < opt && !left || x > opt && !right {
				continue
			}
			h := hr
			if x < opt {
				h = hl
			}
			qx, qy = append(qx, x), append(qy, math.Min(((x-opt)/h)*((x-opt)/h), 4.2))
		}
		addCurve(p, qx, qy, quadraticLine)
	}
	addCurve(p, []float64{x0, x1}, []float64{1, 1}, thresholdLine)
	addCurve(p, []float64{opt, opt}, []float64{0, 4}, fittedLine)
	var mx, my []float64
	for k := range cx {
		if cy[k] <= 4 {
			mx, my = append(mx, cx[k]), append(my, cy[k])
		}
	}
	addPoints(p, mx, my, computedMark)
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = x0, x1, 0, 4
	return p
}

// clampY limits a linear rise axis to [0, 4] or the data's top, whichever
// is lower, so that the threshold at 1 stays readable.
func clampY(p *plot.Plot, ys []float64) {
	top := 0.0
	for _, v := range ys {
		if !bad(v) {
			top = math.Max(top, v)
		}
	}
	p.Y.Min, p.Y.Max = 0, math.Max(math.Min(top*1.1, 4), 1.5)
}

// verdictKey is a candidate's form as the verdict keys it ("0", "1",
// "2-mirror", "2-free", with "+dispersed" or "+kappa").
func verdictKey(c card.CandidateCard) string {
	k := map[string]string{"none": "0", "single": "1", "mirror": "2-mirror", "free": "2-free"}[c.Layout]
	if k == "" {
		k = c.Layout
	}
	switch {
	case c.InPlane:
		k += "+dispersed"
	case c.Dispersion:
		k += "+kappa"
	}
	return k
}

// formOrder ranks verdict keys from the simplest form to the richest.
func formOrder(k string) int {
	base, spread, _ := strings.Cut(k, "+")
	r := map[string]int{"0": 0, "1": 10, "2-mirror": 20, "2-free": 30}[base]
	return r + map[string]int{"": 0, "dispersed": 1, "kappa": 2}[spread]
}

// formColor is the colour of a form's layout in the selection plot.
func formColor(k string) color.NRGBA {
	base, _, _ := strings.Cut(k, "+")
	switch base {
	case "0":
		return okabeBlack
	case "1":
		return okabeBlue
	case "2-mirror":
		return okabeBluishGreen
	}
	return okabeVermillion
}

// formGlyph is the marker of a form: open for ideal families, filled for
// spread ones; circle, square, triangle and cross by layout.
func formGlyph(k string) draw.GlyphStyle {
	base, spread, _ := strings.Cut(k, "+")
	gs := draw.GlyphStyle{Color: formColor(k), Radius: vg.Points(2.6)}
	filled := spread != ""
	switch base {
	case "0":
		gs.Shape = ringMark{}
		if filled {
			gs.Shape = filledMark{}
		}
	case "1":
		gs.Shape = polyMark{n: 4, start: math.Pi / 4}
		if filled {
			gs.Shape = filledMark{n: 4, start: math.Pi / 4}
		}
	case "2-mirror":
		gs.Shape = polyMark{n: 3, start: math.Pi / 2}
		if filled {
			gs.Shape = filledMark{n: 3, start: math.Pi / 2}
		}
	default:
		gs.Shape = crossMark{}
		if filled {
			gs.Shape = filledMark{n: 6}
		}
	}
	return gs
}

// presetGlyph is the marker of a classical preset in the selection plot:
// a filled shape of its own in the preset's colour.
func presetGlyph(name string) draw.GlyphStyle {
	col := presetStyle(name).Color.(colorNRGBA)
	gs := draw.GlyphStyle{Color: col, Radius: vg.Points(3.4)}
	switch name {
	case "neo-hookean":
		gs.Shape = filledMark{n: 5, start: math.Pi / 2}
	case "hgo":
		gs.Shape = filledMark{n: 3, start: -math.Pi / 2}
	case "goh":
		gs.Shape = filledMark{n: 4}
	default:
		gs.Shape = filledMark{n: 6}
	}
	return gs
}

// errorBars draws vertical bars from lo to hi at xs with short caps.
type errorBars struct {
	xs, lo, hi []float64
	ls         draw.LineStyle
}

// Plot implements plot.Plotter.
func (e *errorBars) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	cap := vg.Points(2)
	for i := range e.xs {
		if bad(e.lo[i]) || bad(e.hi[i]) {
			continue
		}
		lo := math.Max(e.lo[i], p.Y.Min)
		hi := math.Min(e.hi[i], p.Y.Max)
		x, y0, y1 := trX(e.xs[i]), trY(lo), trY(hi)
		c.StrokeLine2(e.ls, x, y0, x, y1)
		if e.lo[i] >= p.Y.Min {
			c.StrokeLine2(e.ls, x-cap, y0, x+cap, y0)
		}
		if e.hi[i] <= p.Y.Max {
			c.StrokeLine2(e.ls, x-cap, y1, x+cap, y1)
		}
	}
}

// selectionThreshold is the held-out error under which the rule picks the
// smallest model: the best of the verdict's form plus its standard error
// (at least the verdict's floor); NaN when it cannot be read.
func (in *Input) selectionThreshold() float64 {
	if in.sel == nil || in.verdict == nil {
		return math.NaN()
	}
	best := -1
	for i, c := range in.sel.Pareto {
		if verdictKey(c) != in.verdict.Form || bad(float64(c.HeldoutError)) {
			continue
		}
		if best < 0 || c.HeldoutError < in.sel.Pareto[best].HeldoutError {
			best = i
		}
	}
	if best < 0 {
		return math.NaN()
	}
	b := in.sel.Pareto[best]
	se := float64(b.HeldoutStdErr)
	if f := float64(in.verdict.StdErrFloor); f > se {
		se = f
	}
	return float64(b.HeldoutError) + se
}

// paretoFigure plots the held-out error (± its standard error) of every
// cross-validated model form and preset against its number of parameters;
// nil without a selection section.
func (in *Input) paretoFigure() *figure {
	sel := in.sel
	// Without held-out errors (one protocol) the figure would be empty
	// axes under a caption describing a cross-validation that did not
	// happen; the table of model forms lists the forms with their BIC.
	if sel == nil || len(sel.Pareto) == 0 || !in.crossValidated() {
		return nil
	}
	type pt struct{ x, y, se float64 }
	byForm := map[string][]pt{}
	var forms []string
	lo, hi, xmax := math.Inf(1), 0.0, 1.0
	// zero counts cross-validated forms whose held-out error of zero a
	// log scale cannot show.
	zero := 0
	add := func(c card.CandidateCard) (pt, bool) {
		y, se := float64(c.HeldoutError), float64(c.HeldoutStdErr)
		if bad(y) || !(y > 0) {
			return pt{}, false
		}
		if bad(se) {
			se = 0
		}
		lo, hi = math.Min(lo, math.Max(y-se, y/3)), math.Max(hi, y+se)
		xmax = math.Max(xmax, float64(c.Parameters))
		return pt{float64(c.Parameters), y, se}, true
	}
	for _, c := range sel.Pareto {
		q, ok := add(c)
		if !ok {
			if !bad(float64(c.HeldoutError)) {
				zero++
			}
			continue
		}
		k := verdictKey(c)
		if _, seen := byForm[k]; !seen {
			forms = append(forms, k)
		}
		byForm[k] = append(byForm[k], q)
	}
	sort.SliceStable(forms, func(a, b int) bool { return formOrder(forms[a]) < formOrder(forms[b]) })
	var legend []legendEntry
	for _, k := range forms {
		legend = append(legend, legendEntry{layoutKeyText(k), glyphSample(formGlyph(k))})
	}
	type preset struct {
		name string
		q    pt
	}
	var presets []preset
	for _, c := range sel.Presets {
		if q, ok := add(c); ok {
			name := strings.TrimPrefix(c.Name, "preset:")
			presets = append(presets, preset{name, q})
			legend = append(legend, legendEntry{"preset " + name, glyphSample(presetGlyph(name))})
		}
	}
	ring := draw.GlyphStyle{Color: okabeBlack, Radius: vg.Points(6.5), Shape: ringMark{}}
	legend = append(legend, legendEntry{"chosen: " + sel.Chosen, glyphSample(draw.GlyphStyle{Color: okabeBlack, Radius: vg.Points(5), Shape: ringMark{}})})
	thr := in.selectionThreshold()
	if !bad(thr) {
		legend = append(legend, legendEntry{"selection threshold", lineSample(lineStyle(okabeBlack, 0.8, 1.5, 2))})
	}
	lh := legendHeight(len(legend), 3)
	h := 2.6*vg.Inch + lh + vg.Points(6)
	caption := "Every model form of the search that was cross-validated and the classical presets: the held-out error — the leave-one-protocol-out criterion the selection used, a normalised RMSE without unit (the residuals of each protocol and axis weighted by 1/(range·√points); model.json, selection.heldout_metric) — against the number of parameters, with ± one standard error over the folds (log scale). " +
		"Open markers: ideal fibre families; filled: families spread in the plane or by κ. The ring marks the chosen model (" + sel.Chosen + "): the smallest model of the verdict's form whose held-out error lies under the dotted threshold (that form's best plus one standard error)."
	if lo := leftOutOf(sel); lo.total() > 0 {
		caption += fmt.Sprintf(" %d forms were not cross-validated and are not shown (selection.csv and model.json list them): %s.", lo.total(), strings.Join(lo.reasons(false), "; "))
	}
	if zero > 0 {
		caption += fmt.Sprintf(" %d cross-validated forms with a held-out error of zero are not shown on the log scale.", zero)
	}
	f := &figure{name: "pareto", w: figWidth, h: h, title: "Model size against held-out error", caption: caption}
	f.draw = func(dc draw.Canvas) error {
		drawLegend(draw.Crop(dc, vg.Points(30), 0, 0, -(dc.Size().Y-lh)), legend, 3)
		area := draw.Crop(dc, 0, -vg.Points(6), lh+vg.Points(6), -vg.Points(6))
		p := newPanel("", "number of parameters (markers offset sideways so that forms of one size stay apart)", "held-out error", 6, 6)
		selectionAxes(p, lo, hi, xmax)
		if !bad(thr) {
			addCurve(p, []float64{p.X.Min, p.X.Max}, []float64{thr, thr}, lineStyle(okabeBlack, 0.8, 1.5, 2))
		}
		// Offset the forms sideways a little, so that forms of the same
		// size do not hide each other.
		for j, k := range forms {
			off := (float64(j) - float64(len(forms)-1)/2) * 0.07
			var xs, ys, l, u []float64
			for _, q := range byForm[k] {
				xs, ys = append(xs, q.x+off), append(ys, q.y)
				l, u = append(l, q.y-q.se), append(u, q.y+q.se)
			}
			p.Add(&errorBars{xs: xs, lo: l, hi: u, ls: lineStyle(tint(formColor(k), 0.7), 0.7)})
			addPoints(p, xs, ys, formGlyph(k))
		}
		for _, pr := range presets {
			p.Add(&errorBars{xs: []float64{pr.q.x + 0.3}, lo: []float64{pr.q.y - pr.q.se}, hi: []float64{pr.q.y + pr.q.se}, ls: lineStyle(presetStyle(pr.name).Color, 0.7)})
			addPoints(p, []float64{pr.q.x + 0.3}, []float64{pr.q.y}, presetGlyph(pr.name))
		}
		for j, k := range forms {
			off := (float64(j) - float64(len(forms)-1)/2) * 0.07
			for _, c := range sel.Pareto {
				if c.Chosen && verdictKey(c) == k && !bad(float64(c.HeldoutError)) {
					addPoints(p, []float64{float64(c.Parameters) + off}, []float64{float64(c.HeldoutError)}, ring)
				}
			}
		}
		p.Draw(area)
		return nil
	}
	return f
}

// selectionAxes sets the selection plot's axes: the held-out errors from
// lo to hi on a log scale of at least a decade, the number of parameters
// up to xmax with at most six labels.
func selectionAxes(p *plot.Plot, lo, hi, xmax float64) {
	p.Y.Scale = plot.LogScale{}
	if !(lo > 0) {
		lo, hi = 1e-3, 1
	}
	p.Y.Min, p.Y.Max = lo/1.3, hi*1.3
	if p.Y.Max/p.Y.Min < 10 {
		c := math.Sqrt(p.Y.Max * p.Y.Min)
		p.Y.Min, p.Y.Max = c/3.2, c*3.2
	}
	p.Y.Tick.Marker = logTicks{maxLabels: 6}
	p.X.Min, p.X.Max = 0.4, xmax+0.6
	var ts []plot.Tick
	step := 1
	for int(xmax)/step > 6 {
		step++
	}
	for k := 1; k <= int(xmax); k++ {
		t := plot.Tick{Value: float64(k)}
		if k%step == 0 || step == 1 {
			t.Label = fmt.Sprint(k)
		}
		ts = append(ts, t)
	}
	p.X.Tick.Marker = plot.ConstantTicks(ts)
}
