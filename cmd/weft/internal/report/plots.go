package report

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"hash/crc32"
	"image/color"
	"image/png"
	"math"
	"runtime"
	"slices"
	"sort"
	"strconv"
	"sync"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// plotFont is the typeface of every plot (Liberation Sans, embedded in the
// plotting library, so PNGs look the same everywhere).
var plotFont = font.Font{Typeface: "Liberation", Variant: "Sans"}

// svgFontFamily replaces the plain family name in SVG output with a list
// of metric-compatible local fonts, so a browser without Liberation Sans
// keeps the layout.
const svgFontFamily = "font-family:'Liberation Sans',Arimo,Arial,Helvetica,sans-serif;"

// pngDPI is the resolution of the PNG files, also written into each file
// (its pHYs chunk) so that programs place it at its size.
const pngDPI = 144

// The plots are drawn at the width they print at: figWidth fits the text
// width of an A4 page with 14 mm margins (182 mm), so that no text is
// scaled down in print. Text sizes are in points at that width; the
// smallest, tickSize, stays above 7 pt on paper.
const (
	figWidth   = 7.0 * vg.Inch
	tickSize   = 7.5
	labelSize  = 8.0
	titleSize  = 8.5
	legendSize = 8.0
)

// figure is one plot of the report, drawn as SVG (and, when asked, PNG).
type figure struct {
	// name is the file stem in plots/; title heads it in the report;
	// caption says how to read it.
	name, title, caption string
	w, h                 vg.Length
	draw                 func(dc draw.Canvas) error
}

// renderedFigure holds a figure's files; png is nil unless asked for.
type renderedFigure struct {
	*figure
	svg, png []byte
}

// render draws f as SVG and, with withPNG, as PNG. A panic in the
// plotting library is turned into an error naming the figure.
func (f *figure) render(withPNG bool) (out renderedFigure, err error) {
	out.figure = f
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("plot %s: %v", f.name, r)
		}
	}()
	sc := vgsvg.New(f.w, f.h)
	if err := f.draw(draw.New(sc)); err != nil {
		return out, fmt.Errorf("plot %s: %w", f.name, err)
	}
	var sb bytes.Buffer
	if _, err := sc.WriteTo(&sb); err != nil {
		return out, err
	}
	out.svg = bytes.ReplaceAll(sb.Bytes(), []byte("font-family:Liberation Sans;"), []byte(svgFontFamily))
	if !withPNG {
		return out, nil
	}
	ic := vgimg.NewWith(vgimg.UseWH(f.w, f.h), vgimg.UseDPI(pngDPI))
	if err := f.draw(draw.New(ic)); err != nil {
		return out, fmt.Errorf("plot %s: %w", f.name, err)
	}
	var pb bytes.Buffer
	enc := png.Encoder{CompressionLevel: png.BestSpeed}
	if err := enc.Encode(&pb, ic.Image()); err != nil {
		return out, err
	}
	out.png = withResolution(pb.Bytes(), pngDPI)
	return out, nil
}

// withResolution inserts a pHYs chunk (PNG specification, ISO/IEC
// 15948:2004, §11.3.5.3: pixels per metre on both axes, unit 1 = metre)
// after the IHDR chunk of an encoded PNG, which Go's encoder does not
// write, so that the file states its resolution.
func withResolution(b []byte, dpi float64) []byte {
	const sigLen, ihdrLen = 8, 8 + 13 + 4 // signature; IHDR length, type, data, CRC
	if len(b) < sigLen+ihdrLen {
		return b
	}
	ppm := uint32(math.Round(dpi / 0.0254))
	chunk := make([]byte, 4+4+9+4)
	binary.BigEndian.PutUint32(chunk[0:], 9)
	copy(chunk[4:], "pHYs")
	binary.BigEndian.PutUint32(chunk[8:], ppm)
	binary.BigEndian.PutUint32(chunk[12:], ppm)
	chunk[16] = 1
	binary.BigEndian.PutUint32(chunk[17:], crc32.ChecksumIEEE(chunk[4:17]))
	at := sigLen + ihdrLen
	out := make([]byte, 0, len(b)+len(chunk))
	out = append(out, b[:at]...)
	out = append(out, chunk...)
	return append(out, b[at:]...)
}

// renderAll renders the figures on every core; the result keeps their
// order, so the output does not depend on scheduling.
func renderAll(figs []*figure, withPNG bool) ([]renderedFigure, error) {
	out := make([]renderedFigure, len(figs))
	errs := make([]error, len(figs))
	jobs := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < min(runtime.NumCPU(), len(figs)); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				out[i], errs[i] = figs[i].render(withPNG)
			}
		}()
	}
	for i := range figs {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return out, nil
}

// textStyle is a plot text style of the given size in points.
func textStyle(size float64) text.Style {
	return text.Style{Color: color.Black, Font: font.From(plotFont, vg.Points(size)), Handler: plot.DefaultTextHandler}
}

// newPanel returns a plot with weft's fonts, the given labels, a light
// grid and at most xTicks and yTicks labelled ticks.
func newPanel(title, xlabel, ylabel string, xTicks, yTicks int) *plot.Plot {
	p := newBarePanel(title, xlabel, ylabel, xTicks, yTicks)
	g := plotter.NewGrid()
	g.Vertical.Color = color.Gray{0xe6}
	g.Horizontal.Color = color.Gray{0xe6}
	g.Vertical.Width = vg.Points(0.4)
	g.Horizontal.Width = vg.Points(0.4)
	p.Add(g)
	return p
}

// newBarePanel is newPanel without the grid.
func newBarePanel(title, xlabel, ylabel string, xTicks, yTicks int) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font = font.From(plotFont, vg.Points(titleSize))
	p.Title.Padding = vg.Points(3)
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font = font.From(plotFont, vg.Points(labelSize))
		a.Tick.Label.Font = font.From(plotFont, vg.Points(tickSize))
		a.Padding = vg.Points(2)
		a.LineStyle.Width = vg.Points(0.6)
		a.Tick.LineStyle.Width = vg.Points(0.6)
		a.Tick.Length = vg.Points(3)
	}
	p.X.Tick.Marker = niceTicks{maxLabels: xTicks}
	p.Y.Tick.Marker = niceTicks{maxLabels: yTicks}
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	return p
}

// includeZero widens the y axis of p to include 0, so that stresses are
// read from their true origin.
func includeZero(p *plot.Plot) {
	p.Y.Min = math.Min(p.Y.Min, 0)
	p.Y.Max = math.Max(p.Y.Max, 0)
}

// atLeastSpan widens the y axis of p to span at least ±half: a stress that
// is negligible next to the normal stresses then looks negligible.
func atLeastSpan(p *plot.Plot, half float64) {
	if half > 0 {
		p.Y.Min = math.Min(p.Y.Min, -half)
		p.Y.Max = math.Max(p.Y.Max, half)
	}
}

// finitePieces splits a curve at non-finite points into drawable pieces.
func finitePieces(xs, ys []float64) []plotter.XYs {
	var out []plotter.XYs
	var cur plotter.XYs
	for i := range xs {
		if bad(xs[i]) || bad(ys[i]) {
			if len(cur) > 0 {
				out = append(out, cur)
				cur = nil
			}
			continue
		}
		cur = append(cur, plotter.XY{X: xs[i], Y: ys[i]})
	}
	if len(cur) > 0 {
		out = append(out, cur)
	}
	return out
}

// bad reports a value that cannot be drawn.
func bad(x float64) bool { return math.IsNaN(x) || math.IsInf(x, 0) }

// lineStyle is a solid line, or one with the dash pattern given in points.
func lineStyle(c color.Color, width float64, dashes ...float64) draw.LineStyle {
	ls := draw.LineStyle{Color: c, Width: vg.Points(width)}
	for _, d := range dashes {
		ls.Dashes = append(ls.Dashes, vg.Points(d))
	}
	return ls
}

// maxDrawnPoints and maxMarkers are about the most points of one series
// drawn as a curve or a band (drawnIndices), and as markers
// (markerIndices; more markers would merge into a band and make the page
// heavy). They matter only for a record sampled finely: a figure panel is
// a few hundred points wide, so the drawing looks the same, and the
// tables (fit.csv, curves.csv) keep every point.
const (
	maxDrawnPoints = 1200
	maxMarkers     = 250
)

// outlierWindow is the number of consecutive points among which
// markerIndices looks for outliers, and outlierZ the modified z-score
// above which a point is one: |0.6745 (y − median) / MAD| > 3.5, the rule
// of Iglewicz & Hoaglin 1993 (from memory). For Gaussian scatter it flags
// about 5 points in 10 000.
const (
	outlierWindow = 200
	outlierZ      = 3.5
)

// markerIndices returns the indices, in order, of the points of a series
// of n points drawn as markers, or nil when all of them are (n ≤
// maxMarkers): every k-th point with the last, an even sample that shows
// how the points scatter, plus every point that is an outlier among its
// outlierWindow neighbours, so that a single wild point stays in view.
// (Drawing each run's extremes instead, as for curves, would show the
// tails of a scatter as if they were its bulk.)
func markerIndices(n int, ys []float64) []int {
	if n <= maxMarkers {
		return nil
	}
	stride := (n + maxMarkers - 1) / maxMarkers
	keep := make([]int, 0, maxMarkers+8)
	for i := 0; i < n; i += stride {
		keep = append(keep, i)
	}
	keep = append(keep, n-1)
	window := make([]float64, 0, outlierWindow)
	dev := make([]float64, 0, outlierWindow)
	for lo := 0; lo < n; lo += outlierWindow {
		hi := min(lo+outlierWindow, n)
		window = window[:0]
		for _, y := range ys[lo:hi] {
			if !bad(y) {
				window = append(window, y)
			}
		}
		if len(window) < 5 {
			continue
		}
		med := median(window)
		dev = dev[:0]
		for _, y := range window {
			dev = append(dev, math.Abs(y-med))
		}
		mad := median(dev)
		if mad == 0 {
			continue
		}
		for i := lo; i < hi; i++ {
			if !bad(ys[i]) && 0.6745*math.Abs(ys[i]-med)/mad > outlierZ {
				keep = append(keep, i)
			}
		}
	}
	slices.Sort(keep)
	return slices.Compact(keep)
}

// median returns the median of v, which it reorders.
func median(v []float64) float64 {
	sort.Float64s(v)
	m := len(v) / 2
	if len(v)%2 == 1 {
		return v[m]
	}
	return (v[m-1] + v[m]) / 2
}

// drawnIndices returns the indices, in order, of the points of a curve or
// band of n points that are drawn when at most about limit may be, or nil
// when all of them are (n ≤ limit). coords are the series' coordinates (x,
// then the values; a band has two). The points are split into runs of
// consecutive points, and of each run the first and those with the lowest
// and highest value of each coordinate are drawn, plus the series' last
// point: the extremes-per-run idea of M4 aggregation (Jugel, Jerzak,
// Hackenbroich & Markl 2014, Proc VLDB Endowment 7:797–808), so that every
// extreme (an outlier, a peak, the largest stretch) stays in view, which
// drawing every k-th point does not promise. A point that cannot be drawn
// is kept where it starts a gap, so that the gap stays one.
func drawnIndices(n, limit int, coords ...[]float64) []int {
	if n <= limit {
		return nil
	}
	runs := max(limit/(1+2*len(coords)), 1)
	keep := make([]int, 0, limit+8)
	for r := 0; r < runs; r++ {
		lo, hi := r*n/runs, (r+1)*n/runs
		keep = append(keep, lo)
		for _, y := range coords {
			iMin, iMax := -1, -1
			for i := lo; i < hi; i++ {
				if bad(y[i]) {
					if i == 0 || !bad(y[i-1]) {
						keep = append(keep, i)
					}
					continue
				}
				if iMin < 0 || y[i] < y[iMin] {
					iMin = i
				}
				if iMax < 0 || y[i] > y[iMax] {
					iMax = i
				}
			}
			if iMin >= 0 {
				keep = append(keep, iMin, iMax)
			}
		}
	}
	keep = append(keep, n-1)
	slices.Sort(keep)
	return slices.Compact(keep)
}

// pick returns the values of v at the indices idx, or v itself when idx
// is nil (every point drawn).
func pick(v []float64, idx []int) []float64 {
	if idx == nil {
		return v
	}
	out := make([]float64, len(idx))
	for j, i := range idx {
		out[j] = v[i]
	}
	return out
}

// addCurve adds a curve (split at gaps).
func addCurve(p *plot.Plot, xs, ys []float64, ls draw.LineStyle) {
	idx := drawnIndices(len(xs), maxDrawnPoints, xs, ys)
	xs, ys = pick(xs, idx), pick(ys, idx)
	for _, pc := range finitePieces(xs, ys) {
		l, err := plotter.NewLine(pc)
		if err != nil {
			continue
		}
		l.LineStyle = ls
		p.Add(l)
	}
}

// addBand adds the filled band between lo and hi over xs (split at gaps).
func addBand(p *plot.Plot, xs, lo, hi []float64, c color.Color) {
	idx := drawnIndices(len(xs), maxDrawnPoints, xs, lo, hi)
	xs, lo, hi = pick(xs, idx), pick(lo, idx), pick(hi, idx)
	var cur plotter.XYs
	var back []plotter.XY
	flush := func() {
		if len(cur) > 1 {
			poly := append(cur, reverse(back)...)
			if pg, err := plotter.NewPolygon(poly); err == nil {
				pg.Color = c
				pg.LineStyle.Width = 0
				p.Add(pg)
			}
		}
		cur, back = nil, nil
	}
	for i := range xs {
		if bad(xs[i]) || bad(lo[i]) || bad(hi[i]) {
			flush()
			continue
		}
		cur = append(cur, plotter.XY{X: xs[i], Y: hi[i]})
		back = append(back, plotter.XY{X: xs[i], Y: lo[i]})
	}
	flush()
}

func reverse(s []plotter.XY) []plotter.XY {
	out := make([]plotter.XY, len(s))
	for i, v := range s {
		out[len(s)-1-i] = v
	}
	return out
}

// addPoints adds markers.
func addPoints(p *plot.Plot, xs, ys []float64, gs draw.GlyphStyle) {
	idx := markerIndices(len(xs), ys)
	xs, ys = pick(xs, idx), pick(ys, idx)
	var xy plotter.XYs
	for _, pc := range finitePieces(xs, ys) {
		xy = append(xy, pc...)
	}
	if len(xy) == 0 {
		return
	}
	s, err := plotter.NewScatter(xy)
	if err != nil {
		return
	}
	s.GlyphStyle = gs
	p.Add(s)
}

// Markers with a stroke of markerStroke points: heavy enough to read in
// print at the plots' small radii.
const markerStroke = 0.8

// ringMark is an open circle.
type ringMark struct{}

// DrawGlyph implements draw.GlyphDrawer.
func (ringMark) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: vg.Points(markerStroke)})
	var p vg.Path
	p.Move(vg.Point{X: pt.X + sty.Radius, Y: pt.Y})
	p.Arc(pt, sty.Radius, 0, 2*math.Pi)
	p.Close()
	c.Stroke(p)
}

// polyMark is an open regular polygon of n corners, the first at angle
// start (radians from the x axis); n = 4 with start π/4 is a square.
type polyMark struct {
	n     int
	start float64
}

// DrawGlyph implements draw.GlyphDrawer.
func (m polyMark) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: vg.Points(markerStroke)})
	r := sty.Radius
	if m.n == 4 {
		r *= 1.2 // a square of the same radius looks smaller than a circle
	}
	var p vg.Path
	for k := 0; k < m.n; k++ {
		a := m.start + 2*math.Pi*float64(k)/float64(m.n)
		q := vg.Point{X: pt.X + r*vg.Length(math.Cos(a)), Y: pt.Y + r*vg.Length(math.Sin(a))}
		if k == 0 {
			p.Move(q)
		} else {
			p.Line(q)
		}
	}
	p.Close()
	c.Stroke(p)
}

// crossMark is an upright cross (+) of two strokes.
type crossMark struct{}

// DrawGlyph implements draw.GlyphDrawer.
func (crossMark) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	ls := draw.LineStyle{Color: sty.Color, Width: vg.Points(markerStroke)}
	r := sty.Radius * 1.2
	c.StrokeLine2(ls, pt.X-r, pt.Y, pt.X+r, pt.Y)
	c.StrokeLine2(ls, pt.X, pt.Y-r, pt.X, pt.Y+r)
}

// filledMark is a filled regular polygon (n corners) or, for n = 0, a
// filled circle.
type filledMark struct {
	n     int
	start float64
}

// DrawGlyph implements draw.GlyphDrawer.
func (m filledMark) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetColor(sty.Color)
	var p vg.Path
	if m.n == 0 {
		p.Move(vg.Point{X: pt.X + sty.Radius, Y: pt.Y})
		p.Arc(pt, sty.Radius, 0, 2*math.Pi)
	} else {
		for k := 0; k < m.n; k++ {
			a := m.start + 2*math.Pi*float64(k)/float64(m.n)
			q := vg.Point{X: pt.X + sty.Radius*vg.Length(math.Cos(a)), Y: pt.Y + sty.Radius*vg.Length(math.Sin(a))}
			if k == 0 {
				p.Move(q)
			} else {
				p.Line(q)
			}
		}
	}
	p.Close()
	c.Fill(p)
}

// componentGlyph is the marker of a stress component's measured points:
// axis 1 open circles, axis 2 open squares, shear 12 open triangles,
// shear 21 crosses.
func componentGlyph(comp string, radius float64) draw.GlyphStyle {
	gs := draw.GlyphStyle{Color: componentColor(comp), Radius: vg.Points(radius)}
	switch comp {
	case "11":
		gs.Shape = ringMark{}
	case "22":
		gs.Shape = polyMark{n: 4, start: math.Pi / 4}
	case "12":
		gs.Shape = polyMark{n: 3, start: math.Pi / 2}
	default:
		gs.Shape = crossMark{}
	}
	return gs
}

// legendEntry is one line of a figure's legend: a sample and its text.
type legendEntry struct {
	text   string
	sample func(c draw.Canvas)
}

// glyphSample draws a marker as a legend sample.
func glyphSample(gs draw.GlyphStyle) func(c draw.Canvas) {
	return func(c draw.Canvas) { c.DrawGlyph(gs, c.Center()) }
}

// lineSample draws a line as a legend sample.
func lineSample(ls draw.LineStyle) func(c draw.Canvas) {
	return func(c draw.Canvas) {
		y := c.Center().Y
		c.StrokeLine2(ls, c.Min.X, y, c.Max.X, y)
	}
}

// bandSample draws a filled band with its centre line as a legend sample.
func bandSample(fill color.Color, ls draw.LineStyle) func(c draw.Canvas) {
	return func(c draw.Canvas) {
		y := c.Center().Y
		h := vg.Points(3)
		c.FillPolygon(fill, []vg.Point{{X: c.Min.X, Y: y - h}, {X: c.Max.X, Y: y - h}, {X: c.Max.X, Y: y + h}, {X: c.Min.X, Y: y + h}})
		if ls.Width > 0 {
			c.StrokeLine2(ls, c.Min.X, y, c.Max.X, y)
		}
	}
}

// legendRowHeight is the height of one legend line.
var legendRowHeight = vg.Points(legendSize * 1.45)

// legendSampleWidth is the width of a legend sample.
var legendSampleWidth = vg.Points(20)

// drawLegend writes the entries in cols columns filling dc from its top
// left, row by row.
func drawLegend(dc draw.Canvas, entries []legendEntry, cols int) {
	sty := textStyle(legendSize)
	sty.YAlign = draw.YCenter
	colW := (dc.Max.X - dc.Min.X) / vg.Length(cols)
	for i, e := range entries {
		x := dc.Min.X + colW*vg.Length(i%cols)
		y := dc.Max.Y - legendRowHeight*vg.Length(i/cols) - legendRowHeight/2
		sc := draw.Canvas{Canvas: dc.Canvas, Rectangle: vg.Rectangle{Min: vg.Point{X: x, Y: y - legendRowHeight/2}, Max: vg.Point{X: x + legendSampleWidth, Y: y + legendRowHeight/2}}}
		e.sample(sc)
		dc.FillText(sty, vg.Point{X: x + legendSampleWidth + vg.Points(4), Y: y}, e.text)
	}
}

// legendHeight is the height the entries take in cols columns.
func legendHeight(n, cols int) vg.Length {
	return legendRowHeight*vg.Length((n+cols-1)/cols) + vg.Points(4)
}

// tileLayout arranges n tiles in rows of 3 (2 when there are at most 4;
// 1 for a single tile) across the figure's width.
func tileLayout(n int) (rows, cols int) {
	switch {
	case n <= 1:
		cols = 1
	case n <= 4:
		cols = 2
	default:
		cols = 3
	}
	return (n + cols - 1) / cols, cols
}

// tiledFigure is a figure of one tile (a panel) per protocol, drawn by
// panel(i), with the legend in the first free cell of the grid or, when
// the grid is full, in a strip below it. tileH is the height of a tile.
func tiledFigure(name, title, caption string, n int, tileH vg.Length, panel func(i int) *plot.Plot, legend []legendEntry) *figure {
	rows, cols := tileLayout(n)
	free := rows*cols > n
	legendCols := min(3, cols+1)
	if cols == 1 {
		legendCols = 2
	}
	h := vg.Length(rows) * tileH
	if !free && len(legend) > 0 {
		h += legendHeight(len(legend), legendCols) + vg.Points(6)
	}
	f := &figure{name: name, title: title, caption: caption, w: figWidth, h: h}
	f.draw = func(dc draw.Canvas) error {
		area := dc
		if !free && len(legend) > 0 {
			lh := legendHeight(len(legend), legendCols)
			drawLegend(draw.Crop(dc, vg.Points(30), 0, 0, -(dc.Size().Y-lh)), legend, legendCols)
			area = draw.Crop(dc, 0, 0, lh+vg.Points(6), 0)
		}
		grid := make([][]*plot.Plot, rows)
		for r := range grid {
			grid[r] = make([]*plot.Plot, cols)
		}
		for i := 0; i < n; i++ {
			grid[i/cols][i%cols] = panel(i)
		}
		tiles := draw.Tiles{Rows: rows, Cols: cols, PadX: vg.Points(10), PadY: vg.Points(8), PadTop: vg.Points(2), PadRight: vg.Points(6)}
		cs := plot.Align(grid, tiles, area)
		for i := 0; i < n; i++ {
			grid[i/cols][i%cols].Draw(cs[i/cols][i%cols])
		}
		if free && len(legend) > 0 {
			cell := tiles.At(area, n%cols, n/cols)
			drawLegend(draw.Crop(cell, vg.Points(16), 0, 0, -vg.Points(8)), legend, 1)
		}
		return nil
	}
	return f
}

// niceTicks places at most maxLabels labelled ticks at 1, 2, 2.5 or 5
// times a power of ten, labelled with just enough decimals to tell them
// apart, and unlabelled minor ticks between them.
type niceTicks struct{ maxLabels int }

// Ticks implements plot.Ticker.
func (nt niceTicks) Ticks(lo, hi float64) []plot.Tick {
	most := nt.maxLabels
	if most < 2 {
		most = 6
	}
	if !(hi > lo) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		return []plot.Tick{{Value: lo, Label: fmtNum(lo, 4)}}
	}
	span := hi - lo
	if span <= 1e-9*math.Max(math.Abs(lo), math.Abs(hi)) {
		// A range within round-off of one value (a quantity equal in
		// every specimen of a cohort, say): a step that small cannot
		// move the value it is added to.
		return []plot.Tick{{Value: lo, Label: fmtNum(lo, 4)}}
	}
	mag := math.Pow(10, math.Floor(math.Log10(span)))
	var step float64
	for _, m := range []float64{0.1, 0.2, 0.25, 0.5, 1, 2, 2.5, 5, 10, 20} {
		step = m * mag
		if math.Floor(hi/step+1e-9)-math.Ceil(lo/step-1e-9)+1 <= float64(most) {
			break
		}
	}
	dec := max(0, -int(math.Floor(math.Log10(step)+1e-9)))
	if r := step / math.Pow(10, -float64(dec)); math.Abs(r-math.Round(r)) > 1e-6 {
		dec++ // 2.5 × 10^k needs one more decimal
	}
	minor := 5
	if r := step / math.Pow(10, math.Floor(math.Log10(step)+1e-9)); math.Abs(r-2.5) < 1e-6 || math.Abs(r-2) < 1e-6 {
		minor = 4
	}
	var ts []plot.Tick
	first := math.Ceil(lo/step-1e-9) * step
	// Counted, not accumulated: a step below the values' resolution must
	// not loop for ever.
	for i := 0; i <= most+1; i++ {
		v := first + float64(i)*step
		if v > hi+step*1e-9 {
			break
		}
		x := math.Round(v/step) * step
		if math.Abs(x) < step*1e-9 {
			x = 0
		}
		ts = append(ts, plot.Tick{Value: x, Label: trueMinus(strconv.FormatFloat(x, 'f', dec, 64))})
		for k := 1; k < minor; k++ {
			if m := x + float64(k)*step/float64(minor); m <= hi {
				ts = append(ts, plot.Tick{Value: m})
			}
		}
	}
	for k := 1; k < minor; k++ {
		if m := first - float64(k)*step/float64(minor); m >= lo {
			ts = append(ts, plot.Tick{Value: m})
		}
	}
	return ts
}

// logTicks labels the powers of ten of a log axis (every other one, or
// sparser, when there would be more than maxLabels) with 2 and 5 times
// them as unlabelled minor ticks.
type logTicks struct{ maxLabels int }

// Ticks implements plot.Ticker.
func (lt logTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo > 0 && hi > lo) {
		return nil
	}
	a, b := int(math.Floor(math.Log10(lo))), int(math.Ceil(math.Log10(hi)))
	every := 1
	for (b-a)/every+1 > max(lt.maxLabels, 2) {
		every++
	}
	var ts []plot.Tick
	for e := a; e <= b; e++ {
		v := math.Pow(10, float64(e))
		if v >= lo*(1-1e-9) && v <= hi*(1+1e-9) {
			t := plot.Tick{Value: v}
			if e%every == 0 {
				t.Label = powerLabel(e)
			}
			ts = append(ts, t)
		}
		for _, m := range []float64{2, 5} {
			if x := m * v; x >= lo && x <= hi {
				ts = append(ts, plot.Tick{Value: x})
			}
		}
	}
	return ts
}

// powerLabel writes 10^e as a plain decimal for small e and as "1e−5"
// otherwise.
func powerLabel(e int) string {
	if e >= -3 && e <= 3 {
		return trueMinus(strconv.FormatFloat(math.Pow(10, float64(e)), 'f', max(0, -e), 64))
	}
	return trueMinus(fmt.Sprintf("1e%d", e))
}

// shade mixes c with black: f = 1 keeps c, f = 0 gives black.
func shade(c color.NRGBA, f float64) color.NRGBA {
	mix := func(v uint8) uint8 { return uint8(float64(v)*f + 0.5) }
	return color.NRGBA{mix(c.R), mix(c.G), mix(c.B), 0xff}
}

// translucent is c with the given opacity.
func translucent(c color.NRGBA, alpha float64) color.NRGBA {
	c.A = uint8(math.Round(alpha * 255))
	return c
}
