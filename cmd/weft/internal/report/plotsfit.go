package report

import (
	"fmt"
	"math"
	"strings"

	"github.com/weft-tools/weft/biaxial"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Stress against stretch: every protocol as a tile of one figure, for the
// normal components (with the model's confidence band and the held-out
// prediction), the shear components, the classical presets and the
// residuals.

// compSymbol is a stress component's symbol, e.g. "P11" or "σ22", for the
// stress kind a card names ("nominal" or "cauchy").
func compSymbol(kind, comp string) string {
	k := biaxial.Cauchy
	if kind == biaxial.Nominal.String() {
		k = biaxial.Nominal
	}
	return k.Symbol(comp)
}

// kindName writes a stress kind as a name: "Cauchy" or "nominal".
func kindName(kind string) string {
	if kind == "cauchy" {
		return "Cauchy"
	}
	return kind
}

// stressAxis labels a tile's stress axis with the measure, the symbol
// and the unit the input gave: "nominal P [kPa]" or "Cauchy σ [kPa]" (the
// symbol alone, "P [kPa]", named no measure to a reader who does not know
// the convention). It stays short: the plotting library shrinks a tile's
// data area until the rotated label fits beside it, and "nominal stress
// P [kPa]" squashed the short tiles of seven protocols to a third.
func stressAxis(kind, unit string) string {
	return kindName(kind) + " " + compSymbol(kind, "") + " [" + unit + "]"
}

// residualAxis labels a residual tile's axis the same way: "nominal
// residual [kPa]" (it held "residual [kPa]", no measure).
func residualAxis(kind, unit string) string {
	return kindName(kind) + " residual [" + unit + "]"
}

// abscissaLabel labels the x axis of normal or shear components.
func abscissaLabel(shear, strain bool) string {
	switch {
	case shear:
		return "Green shear strain E12"
	case strain:
		return "Green strain E"
	}
	return "stretch λ"
}

func isShear(comp string) bool { return comp == "12" || comp == "21" }

// componentsOf lists the indices into t.comps of the normal (shear false)
// or shear components.
func (t *fitTable) componentsOf(shear bool) []int {
	var out []int
	for ci, c := range t.comps {
		if isShear(c) == shear {
			out = append(out, ci)
		}
	}
	return out
}

// hasShear reports whether fit.csv holds shear components.
func (t *fitTable) hasShear() bool { return len(t.componentsOf(true)) > 0 }

// hasNormal reports whether fit.csv holds normal components.
func (t *fitTable) hasNormal() bool { return len(t.componentsOf(false)) > 0 }

// normalPeak is the largest |measured normal stress| of a protocol.
func (t *fitTable) normalPeak(pr *protocolRows) float64 {
	big := 0.0
	for _, ci := range t.componentsOf(false) {
		for _, v := range pr.measured[ci] {
			if !bad(v) {
				big = math.Max(big, math.Abs(v))
			}
		}
	}
	return big
}

// shearSpan is the half-span a shear or residual axis keeps at least: 2 %
// of the protocol's largest normal stress.
const shearSpan = 0.02

// xsOf is the abscissa of every point of a protocol for a component: the
// stretch (or strain) of the component's own axis, or of the other axis
// when its own is held (abscissaComp).
func xsOf(Fs [][4]float64, comp string, strain bool) []float64 {
	a := abscissaComp(Fs, comp)
	xs := make([]float64, len(Fs))
	for i, F := range Fs {
		xs[i] = axisCoordinate(F, a, strain)
	}
	return xs
}

// heldAxisSpan is the largest span of an axis's stretch over a protocol,
// as a fraction of the other axis's span, at which the axis counts as held
// (a strip-biaxial test, common practice, holds one axis at a fixed
// stretch while the other is pulled).
const heldAxisSpan = 0.05

// abscissaComp is the normal component whose stretch a component is
// plotted against over the points Fs: its own, or the other axis's when
// its own axis is held, since against a fixed stretch every point of the
// held axis would stack on one vertical line and its fit could not be
// read (strip 1:0 once drew P22 as a column at λ = 1). Shear components
// keep their own (the shear strain).
func abscissaComp(Fs [][4]float64, comp string) string {
	other := map[string]string{"11": "22", "22": "11"}[comp]
	if other == "" {
		return comp
	}
	span := func(c string) float64 {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, F := range Fs {
			x := axisCoordinate(F, c, false)
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
		return hi - lo
	}
	if own, o := span(comp), span(other); o > 0 && own < heldAxisSpan*o {
		return other
	}
	return comp
}

// heldNote names, for a tile's abscissa label, each normal component
// plotted against the other axis's stretch (abscissaComp), on a line of
// its own below the label (appended to it on one line, it ran past the
// figure's right edge in the last column of three: "…(axis 2 he");
// empty when none is.
func (t *fitTable) heldNote(Fs [][4]float64, strain bool) string {
	var notes []string
	for _, ci := range t.componentsOf(false) {
		c := t.comps[ci]
		if a := abscissaComp(Fs, c); a != c {
			x := "λ" + a[:1]
			if strain {
				x = "E" + a
			}
			notes = append(notes, fmt.Sprintf("%s against %s (axis %s held)", compSymbol(t.kind, c), x, c[:1]))
		}
	}
	if len(notes) == 0 {
		return ""
	}
	return "\n" + strings.Join(notes, ", ")
}

// series is one model's curve over one protocol: x, stress and the
// half-width of its 95 % band per component index of fit.csv (half NaN
// where unknown).
type series struct {
	x, y, half [][]float64
}

// curveOf returns a model's curve over protocol pr: from curves.csv when
// it holds the model, otherwise, for the fitted model ("model"), the card
// evaluated along the protocol (without a band); ok is false when there is
// no such curve.
func (in *Input) curveOf(pr *protocolRows, model string, strain bool) (series, bool) {
	t := in.table
	nc := len(t.comps)
	s := series{x: make([][]float64, nc), y: make([][]float64, nc), half: make([][]float64, nc)}
	if in.curves != nil {
		if cr := in.curves.protos[pr.label]; cr != nil {
			for m, name := range in.curves.models {
				if name != model {
					continue
				}
				for c := 0; c < nc; c++ {
					s.x[c] = xsOf(cr.F, t.comps[c], strain)
					s.y[c], s.half[c] = cr.stress[m][c], cr.half[m][c]
				}
				return s, true
			}
		}
	}
	if model != "model" {
		return s, false
	}
	xs, ys := modelCurve(in.model, pr, t.kind, t.comps, strain)
	for c := 0; c < nc; c++ {
		s.x[c], s.y[c] = xs[c], ys[c]
		s.half[c] = make([]float64, len(xs[c]))
		for i := range s.half[c] {
			s.half[c][i] = math.NaN()
		}
	}
	return s, true
}

// bandEdges returns y ∓ half.
func bandEdges(y, half []float64) (lo, hi []float64) {
	lo, hi = make([]float64, len(y)), make([]float64, len(y))
	for i := range y {
		lo[i], hi[i] = y[i]-half[i], y[i]+half[i]
	}
	return lo, hi
}

// hasBand reports whether any half-width is known.
func hasBand(half [][]float64) bool {
	for _, h := range half {
		for _, v := range h {
			if !bad(v) {
				return true
			}
		}
	}
	return false
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

// heldoutStyle is the dashed line of a component's held-out prediction:
// darker than the model line and drawn over it, so that it stays visible
// where it follows the fit.
func heldoutStyle(comp string) draw.LineStyle {
	return lineStyle(shade(componentColor(comp), 0.5), 1.1, 3.5, 2.5)
}

// modelLine is the line of the fitted model for a component.
func modelLine(comp string) draw.LineStyle { return lineStyle(componentColor(comp), 1.3) }

// bandFill is the fill of a component's confidence band.
func bandFill(comp string) draw.LineStyle {
	return draw.LineStyle{Color: translucent(componentColor(comp), 0.22)}
}

// fitPanel draws one protocol's normal (shear false) or shear components:
// the band, the measured points, the model curve and, on top, the held-out
// prediction.
func (in *Input) fitPanel(pr *protocolRows, shear, strain bool, title string) *plot.Plot {
	t := in.table
	xl := abscissaLabel(shear, strain)
	if !shear {
		xl += t.heldNote(pr.F, strain)
	}
	p := newPanel(title, xl, stressAxis(t.kind, t.unit), 5, 6)
	s, _ := in.curveOf(pr, "model", strain)
	comps := t.componentsOf(shear)
	for _, ci := range comps {
		if hasBand([][]float64{s.half[ci]}) {
			lo, hi := bandEdges(s.y[ci], s.half[ci])
			addBand(p, s.x[ci], lo, hi, bandFill(t.comps[ci]).Color)
		}
	}
	for _, ci := range comps {
		addPoints(p, xsOf(pr.F, t.comps[ci], strain), pr.measured[ci], componentGlyph(t.comps[ci], 1.9))
	}
	for _, ci := range comps {
		addCurve(p, s.x[ci], s.y[ci], modelLine(t.comps[ci]))
	}
	for _, ci := range comps {
		if ho := in.heldoutStress(pr.label, ci); ho != nil {
			addCurve(p, xsOf(pr.F, t.comps[ci], strain), ho, heldoutStyle(t.comps[ci]))
		}
	}
	includeZero(p)
	if shear {
		atLeastSpan(p, shearSpan*t.normalPeak(pr))
	}
	return p
}

// fitLegend names the series of the fit figures.
func (in *Input) fitLegend(shear bool) []legendEntry {
	t := in.table
	var out []legendEntry
	band := in.curves != nil
	for _, ci := range t.componentsOf(shear) {
		c := t.comps[ci]
		sym := compSymbol(t.kind, c)
		out = append(out, legendEntry{sym + " measured", glyphSample(componentGlyph(c, 2.2))})
		if band {
			out = append(out, legendEntry{sym + " model, 95 % band", bandSample(bandFill(c).Color, modelLine(c))})
		} else {
			out = append(out, legendEntry{sym + " model", lineSample(modelLine(c))})
		}
		if in.heldout != nil {
			out = append(out, legendEntry{sym + " held-out prediction", lineSample(heldoutStyle(c))})
		}
	}
	return out
}

// r2Title is a tile title: the protocol and the R² of its components.
func (in *Input) r2Title(pr *protocolRows, shear bool) string {
	t := in.table
	var q []string
	for _, ci := range t.componentsOf(shear) {
		if m, ok := in.metric(pr.label, t.comps[ci]); ok && !math.IsNaN(float64(m.R2)) {
			q = append(q, fmtR2(float64(m.R2)))
		}
	}
	if len(q) == 0 {
		return pr.label
	}
	return pr.label + " · R² " + strings.Join(q, " / ")
}

// tileHeight is the height of a tile of a figure with n tiles.
func tileHeight(n int) vg.Length {
	if _, cols := tileLayout(n); cols == 3 {
		return 1.72 * vg.Inch
	}
	return 2.1 * vg.Inch
}

// shortTileHeight is the height of a tile whose curves stay near zero
// (shear stresses, residuals of shear) and of the record's tiles.
func shortTileHeight(n int) vg.Length { return tileHeight(n) * 0.82 }

// fitGridFigure shows every protocol's normal components with the fitted
// model, its confidence band and the held-out prediction.
func (in *Input) fitGridFigure(strain bool) *figure {
	t := in.table
	n := len(t.protocols)
	what := "stretch"
	if strain {
		what = "Green strain"
	}
	caption := fmt.Sprintf("%s stress of axes 1 and 2 against the %s of each axis, R² per axis in the tile title. Markers: measured points of the kept branch (a protocol of more than %d points shows every k-th point and every outlier among its neighbours; fit.csv has all). Solid: the fitted model", kindName(t.kind), what, maxMarkers)
	if in.curves != nil {
		caption += "; shaded: its 95 % confidence band (delta method, Gauss–Newton covariance; Bates & Watts 1988), where the fitted curve would lie if the test were repeated, not where new measurements fall"
	}
	caption += "."
	if in.heldout != nil {
		caption += " Dashed, on top: the held-out prediction of the model form refitted without this protocol; where it covers the solid line the protocol is predicted as well as it is fitted."
	}
	return tiledFigure("fit-all", fmt.Sprintf("Measured and modelled %s stress, every protocol", kindName(t.kind)), capitalise(caption), n, tileHeight(n),
		func(i int) *plot.Plot {
			return in.fitPanel(t.protocols[i], false, strain, in.r2Title(t.protocols[i], false))
		},
		in.fitLegend(false))
}

// shearFigure shows every protocol's shear components against E12.
func (in *Input) shearFigure(strain bool) *figure {
	t := in.table
	n := len(t.protocols)
	caption := "Shear stresses against the Green shear strain E12 = ½C12, measured and modelled at the measured deformations (an interpolated one would break the test's balance of loads), RMSE per component in the tile title. " +
		"Markers: measured points (" + t.shearMarkerWords() + "). Solid: the fitted model"
	// The caption says what the legend and the tiles show: it named
	// neither the band nor the held-out prediction drawn with them.
	if in.curves != nil {
		caption += "; shaded: its 95 % confidence band"
	}
	caption += "."
	if in.heldout != nil {
		caption += " Dashed, on top: the held-out prediction of the model form refitted without this protocol."
	}
	caption += " Each stress axis spans at least ±2 % of the protocol's largest normal stress, so that negligible shear stresses look negligible."
	title := func(i int) string {
		pr := t.protocols[i]
		var q []string
		for _, ci := range t.componentsOf(true) {
			if m, ok := in.metric(pr.label, t.comps[ci]); ok {
				q = append(q, fmtNum(float64(m.RMSE), 2))
			}
		}
		return pr.label + " · RMSE " + strings.Join(q, " / ") + " " + t.unit
	}
	return tiledFigure("fit-shear", "Measured and modelled shear stress, every protocol", caption, n, shortTileHeight(n),
		func(i int) *plot.Plot { return in.fitPanel(t.protocols[i], true, strain, title(i)) },
		in.fitLegend(true))
}

// shearMarkerWords names the marker of each shear component, as
// componentGlyph draws it: "triangles P12, crosses P21".
func (t *fitTable) shearMarkerWords() string {
	var out []string
	for _, ci := range t.componentsOf(true) {
		shape := "crosses"
		if t.comps[ci] == "12" {
			shape = "triangles"
		}
		out = append(out, shape+" "+compSymbol(t.kind, t.comps[ci]))
	}
	return strings.Join(out, ", ")
}

// residualFigure shows residuals (model − measured) against stretch or
// strain, one tile per protocol, for the normal or the shear components;
// each residual axis spans at least ±2 % of the protocol's largest normal
// stress.
func (in *Input) residualFigure(shear, strain bool) *figure {
	t := in.table
	n := len(t.protocols)
	name, what := "residuals", "normal stresses"
	if shear {
		name, what = "residuals-shear", "shear stresses"
	}
	caption := fmt.Sprintf("Model − measured stress at every kept point (a protocol of more than %d points shows every k-th point and every outlier among its neighbours), RMSE per component in the tile title. A good fit scatters evenly about zero; a trend shows what the model misses. ", maxMarkers) +
		"Each axis spans at least ±2 % of the protocol's largest normal stress, so that a small residual looks small."
	var legend []legendEntry
	for _, ci := range t.componentsOf(shear) {
		legend = append(legend, legendEntry{compSymbol(t.kind, t.comps[ci]) + " residual", glyphSample(componentGlyph(t.comps[ci], 2.2))})
	}
	legend = append(legend, legendEntry{"zero", lineSample(lineStyle(okabeBlack, 0.7))})
	panel := func(i int) *plot.Plot {
		pr := t.protocols[i]
		var q []string
		for _, ci := range t.componentsOf(shear) {
			if m, ok := in.metric(pr.label, t.comps[ci]); ok {
				q = append(q, fmtNum(float64(m.RMSE), 2))
			}
		}
		xl := abscissaLabel(shear, strain)
		if !shear {
			xl += t.heldNote(pr.F, strain)
		}
		p := newPanel(pr.label+" · RMSE "+strings.Join(q, " / ")+" "+t.unit, xl, residualAxis(t.kind, t.unit), 5, 6)
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, ci := range t.componentsOf(shear) {
			xs := xsOf(pr.F, t.comps[ci], strain)
			for _, x := range xs {
				lo, hi = math.Min(lo, x), math.Max(hi, x)
			}
			addPoints(p, xs, pr.residual[ci], componentGlyph(t.comps[ci], 1.7))
		}
		if lo < hi {
			addCurve(p, []float64{lo, hi}, []float64{0, 0}, lineStyle(okabeBlack, 0.7))
		}
		atLeastSpan(p, shearSpan*t.normalPeak(pr))
		return p
	}
	h := tileHeight(n)
	if shear {
		h = shortTileHeight(n)
	}
	return tiledFigure(name, "Residuals of the "+what+", model − measured", caption, n, h, panel, legend)
}

// presetStyle is how a model of the presets figure is drawn: the fitted
// model in black and heavy, each classical preset in its own colour and
// dash pattern (so they also part in grey print).
func presetStyle(name string) draw.LineStyle {
	switch name {
	case "model":
		return lineStyle(okabeBlack, 1.6)
	case "neo-hookean":
		return lineStyle(okabeSkyBlue, 1.1, 1.2, 2)
	case "hgo":
		return lineStyle(okabeOrange, 1.1, 5, 2.5)
	case "goh":
		return lineStyle(okabeReddishPurple, 1.1, 6, 2, 1.2, 2)
	case "fung":
		return lineStyle(okabeBluishGreen, 1.1, 9, 3)
	case "fung-general":
		return lineStyle(okabeBluishGreen, 1.1, 2, 2, 9, 2)
	}
	return lineStyle(okabeVermillion, 1.1, 2, 2)
}

// presetsFigure draws, per protocol, the measured normal stresses with the
// fitted model and every classical preset fitted to the same data, each
// with its 95 % band; nil without curves.csv or presets.
func (in *Input) presetsFigure(strain bool) *figure {
	t := in.table
	if in.curves == nil || len(in.curves.models) < 2 || !t.hasNormal() {
		return nil
	}
	models := in.curves.models
	n := len(t.protocols)
	heldout := map[string]string{}
	if in.sel != nil {
		for _, c := range in.sel.Presets {
			heldout[strings.TrimPrefix(c.Name, "preset:")] = fsig(float64(c.HeldoutError), 2)
		}
		for _, c := range in.sel.Pareto {
			if c.Chosen {
				heldout["model"] = fsig(float64(c.HeldoutError), 2)
			}
		}
	}
	var legend []legendEntry
	for _, ci := range t.componentsOf(false) {
		c := t.comps[ci]
		legend = append(legend, legendEntry{compSymbol(t.kind, c) + " measured", glyphSample(muted(componentGlyph(c, 2.2)))})
	}
	for _, m := range models {
		name := m
		if m == "model" {
			name = "discovered"
		}
		if e := heldout[m]; e != "" && e != "—" {
			name += " · " + e
		}
		ls := presetStyle(m)
		legend = append(legend, legendEntry{name, bandSample(translucent(ls.Color.(colorNRGBA), 0.18), ls)})
	}
	panel := func(i int) *plot.Plot {
		pr := t.protocols[i]
		p := newPanel(pr.label, abscissaLabel(false, strain)+t.heldNote(pr.F, strain), stressAxis(t.kind, t.unit), 5, 6)
		var all []series
		for _, m := range models {
			s, _ := in.curveOf(pr, m, strain)
			all = append(all, s)
			col := presetStyle(m).Color.(colorNRGBA)
			for _, ci := range t.componentsOf(false) {
				if hasBand([][]float64{s.half[ci]}) {
					lo, hi := bandEdges(s.y[ci], s.half[ci])
					addBand(p, s.x[ci], lo, hi, translucent(col, 0.18))
				}
			}
		}
		for _, ci := range t.componentsOf(false) {
			addPoints(p, xsOf(pr.F, t.comps[ci], strain), pr.measured[ci], muted(componentGlyph(t.comps[ci], 1.9)))
		}
		// The fitted model first, heavy, and the presets' dashed lines over
		// it: a preset that is the fitted model (hgo beside a discovered
		// one family with fib-expsq, demo membrane-M1) shows as dashes on
		// the black line. Drawn last, the black line hid it, though the
		// legend listed it.
		for _, k := range presetDrawOrder(models) {
			for _, ci := range t.componentsOf(false) {
				addCurve(p, all[k].x[ci], all[k].y[ci], presetStyle(models[k]))
			}
		}
		includeZero(p)
		clipToData(p, pr, t)
		return p
	}
	caption := "One tile per protocol: the measured normal stresses (circles axis 1, squares axis 2) with the discovered model (black, heavy, drawn underneath, so that a preset that coincides with it shows as coloured dashes on it) and the classical presets fitted to the same data by the same fitter, each with its 95 % confidence band (shaded; often thinner than the line). " +
		"The number beside each model in the legend is its held-out error, the quantity the selection compares."
	if !in.crossValidated() {
		// One protocol: nothing was held out, the legend has no numbers.
		caption = strings.TrimSuffix(caption, "The number beside each model in the legend is its held-out error, the quantity the selection compares.") +
			"Nothing was held out (" + notCrossValidatedWhy(len(in.data.Protocols)) + "), so the legend gives no held-out errors; the table of presets compares the models by BIC."
	}
	if t.hasShear() {
		caption += " Shear components are compared in the tables of the model selection."
	}
	return tiledFigure("presets", "The discovered model beside the classical presets", caption, n, tileHeight(n), panel, legend)
}

// presetDrawOrder is the order in which the presets figure draws the
// models of curves.csv: the fitted model ("model") first, then the
// presets from the last to the first.
func presetDrawOrder(models []string) []int {
	var out []int
	for k, m := range models {
		if m == "model" {
			out = append(out, k)
		}
	}
	for k := len(models) - 1; k >= 0; k-- {
		if models[k] != "model" {
			out = append(out, k)
		}
	}
	return out
}

// clipToData keeps the stress axis of a presets tile near the data: a
// preset that misses the data badly must not squeeze the measured curve
// into a corner. The axis spans the measured stresses (and 0) with 25 %
// room; curves beyond it are cut at the frame.
func clipToData(p *plot.Plot, pr *protocolRows, t *fitTable) {
	lo, hi := 0.0, 0.0
	for _, ci := range t.componentsOf(false) {
		for _, v := range pr.measured[ci] {
			if !bad(v) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if hi > lo {
		room := 0.25 * (hi - lo)
		p.Y.Min, p.Y.Max = math.Max(p.Y.Min, lo-room), math.Min(p.Y.Max, hi+room)
	}
}

// muted is a marker in a light tint of its colour, so that lines drawn
// over it stand out.
func muted(gs draw.GlyphStyle) draw.GlyphStyle {
	if c, ok := gs.Color.(colorNRGBA); ok {
		gs.Color = tint(c, 0.55)
	}
	return gs
}
