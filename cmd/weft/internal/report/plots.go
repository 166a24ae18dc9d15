package report

import (
	"bytes"
	"fmt"
	"image/color"
	"image/png"
	"math"
	"runtime"
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

// pngDPI is the resolution of the PNG files.
const pngDPI = 144

// figure is one plot of the report, drawn once as SVG and once as PNG.
type figure struct {
	// name is the file stem in plots/; title heads it in the report;
	// caption says how to read it.
	name, title, caption string
	w, h                 vg.Length
	draw                 func(dc draw.Canvas) error
}

// renderedFigure holds a figure's files.
type renderedFigure struct {
	*figure
	svg, png []byte
}

// render draws f as SVG and PNG. A panic in the plotting library is
// turned into an error naming the figure.
func (f *figure) render() (out renderedFigure, err error) {
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
	ic := vgimg.NewWith(vgimg.UseWH(f.w, f.h), vgimg.UseDPI(pngDPI))
	if err := f.draw(draw.New(ic)); err != nil {
		return out, fmt.Errorf("plot %s: %w", f.name, err)
	}
	var pb bytes.Buffer
	if err := png.Encode(&pb, ic.Image()); err != nil {
		return out, err
	}
	out.png = pb.Bytes()
	return out, nil
}

// renderAll renders the figures on every core; the result keeps their
// order, so the output does not depend on scheduling.
func renderAll(figs []*figure) ([]renderedFigure, error) {
	out := make([]renderedFigure, len(figs))
	errs := make([]error, len(figs))
	jobs := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < min(runtime.NumCPU(), len(figs)); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				out[i], errs[i] = figs[i].render()
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

// newBarePlot returns a plot with weft's fonts and the given labels and no
// grid; small selects the sizes used in tiled figures.
func newBarePlot(title, xlabel, ylabel string, small bool) *plot.Plot {
	p := plot.New()
	ts, ls, ks := 11.0, 10.0, 9.0
	if small {
		ts, ls, ks = 9.5, 8.5, 8.0
	}
	// Keep the library's alignments; change only the fonts.
	p.Title.Text = title
	p.Title.TextStyle.Font = font.From(plotFont, vg.Points(ts))
	p.Title.Padding = vg.Points(4)
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font = font.From(plotFont, vg.Points(ls))
		a.Tick.Label.Font = font.From(plotFont, vg.Points(ks))
		a.Tick.Marker = niceTicks{}
		a.Padding = vg.Points(2)
	}
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	p.Legend = plot.NewLegend()
	p.Legend.TextStyle = textStyle(ks)
	return p
}

// newPlot returns a bare plot (see newBarePlot) with a light grid.
func newPlot(title, xlabel, ylabel string, small bool) *plot.Plot {
	p := newBarePlot(title, xlabel, ylabel, small)
	g := plotter.NewGrid()
	g.Vertical.Color = color.Gray{0xe4}
	g.Horizontal.Color = color.Gray{0xe4}
	g.Vertical.Width = vg.Points(0.5)
	g.Horizontal.Width = vg.Points(0.5)
	p.Add(g)
	return p
}

// newLegend returns an empty legend with weft's fonts, drawn top-left of
// its canvas.
func newLegend(size float64) plot.Legend {
	l := plot.NewLegend()
	l.TextStyle = textStyle(size)
	l.Top, l.Left = true, true
	l.Padding = vg.Points(3)
	l.ThumbnailWidth = vg.Points(22)
	return l
}

// drawTitle writes a figure title centred at the top of dc and returns the
// canvas below it.
func drawTitle(dc draw.Canvas, title string) draw.Canvas {
	sty := textStyle(12)
	sty.XAlign = draw.XCenter
	sty.YAlign = draw.YTop
	dc.FillText(sty, vg.Point{X: (dc.Min.X + dc.Max.X) / 2, Y: dc.Max.Y - vg.Points(4)}, title)
	return draw.Crop(dc, 0, 0, 0, -sty.Rectangle(title).Size().Y-vg.Points(10))
}

// finitePieces splits a curve at non-finite points into drawable pieces.
func finitePieces(xs, ys []float64) []plotter.XYs {
	var out []plotter.XYs
	var cur plotter.XYs
	for i := range xs {
		if math.IsNaN(xs[i]) || math.IsInf(xs[i], 0) || math.IsNaN(ys[i]) || math.IsInf(ys[i], 0) {
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

// lineStyle is a solid (dash = false) or dashed line.
func lineStyle(c color.Color, width float64, dash bool) draw.LineStyle {
	ls := draw.LineStyle{Color: c, Width: vg.Points(width)}
	if dash {
		ls.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
	}
	return ls
}

// addCurve adds a curve (split at gaps) and returns a thumbnail for the
// legend, or nil when nothing could be drawn.
func addCurve(p *plot.Plot, xs, ys []float64, ls draw.LineStyle) plot.Thumbnailer {
	var th plot.Thumbnailer
	for _, pc := range finitePieces(xs, ys) {
		l, err := plotter.NewLine(pc)
		if err != nil {
			continue
		}
		l.LineStyle = ls
		p.Add(l)
		th = l
	}
	return th
}

// addPoints adds markers and returns a thumbnail for the legend.
func addPoints(p *plot.Plot, xs, ys []float64, gs draw.GlyphStyle) plot.Thumbnailer {
	var xy plotter.XYs
	for _, pc := range finitePieces(xs, ys) {
		xy = append(xy, pc...)
	}
	if len(xy) == 0 {
		return nil
	}
	s, err := plotter.NewScatter(xy)
	if err != nil {
		return nil
	}
	s.GlyphStyle = gs
	p.Add(s)
	return s
}

// componentGlyph is the marker of a stress component's measured points.
func componentGlyph(comp string, radius float64) draw.GlyphStyle {
	gs := draw.GlyphStyle{Color: componentColor(comp), Radius: vg.Points(radius)}
	switch comp {
	case "11":
		gs.Shape = draw.RingGlyph{}
	case "22":
		gs.Shape = draw.SquareGlyph{}
	case "12":
		gs.Shape = draw.TriangleGlyph{}
	default:
		gs.Shape = draw.CrossGlyph{}
	}
	return gs
}

// glyphThumb draws only a glyph in a legend.
type glyphThumb struct{ gs draw.GlyphStyle }

// Thumbnail implements plot.Thumbnailer.
func (g glyphThumb) Thumbnail(c *draw.Canvas) { c.DrawGlyph(g.gs, c.Center()) }

// swatch draws a filled box in a legend.
type swatch struct{ c color.Color }

// Thumbnail implements plot.Thumbnailer.
func (s swatch) Thumbnail(c *draw.Canvas) {
	r := c.Rectangle
	in := vg.Points(1.5)
	c.FillPolygon(s.c, []vg.Point{{X: r.Min.X + in, Y: r.Min.Y + in}, {X: r.Max.X - in, Y: r.Min.Y + in},
		{X: r.Max.X - in, Y: r.Max.Y - in}, {X: r.Min.X + in, Y: r.Max.Y - in}})
}

// lineThumb draws a line in a legend.
type lineThumb struct{ ls draw.LineStyle }

// Thumbnail implements plot.Thumbnailer.
func (l lineThumb) Thumbnail(c *draw.Canvas) {
	y := c.Center().Y
	c.StrokeLine2(l.ls, c.Min.X, y, c.Max.X, y)
}

// splitColumns divides dc into a plot area and a legend column of width lw
// on the right.
func splitColumns(dc draw.Canvas, lw vg.Length) (draw.Canvas, draw.Canvas) {
	left := draw.Crop(dc, 0, -lw, 0, 0)
	right := draw.Crop(dc, dc.Size().X-lw+vg.Points(6), 0, 0, 0)
	return left, right
}

// niceTicks places 4 to 9 major ticks at 1, 2, 2.5 or 5 times a power of
// ten, labelled with just enough decimals to tell them apart, and minor
// ticks between them.
type niceTicks struct{}

// Ticks implements plot.Ticker.
func (niceTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(hi > lo) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		return []plot.Tick{{Value: lo, Label: fmtNum(lo, 4)}}
	}
	span := hi - lo
	mag := math.Pow(10, math.Floor(math.Log10(span)))
	var step float64
	for _, m := range []float64{0.1, 0.2, 0.25, 0.5, 1, 2, 2.5, 5, 10} {
		step = m * mag
		if span/step <= 8 {
			break
		}
	}
	dec := max(0, -int(math.Floor(math.Log10(step)+1e-9)))
	if r := step / math.Pow(10, -float64(dec)); math.Abs(r-math.Round(r)) > 1e-6 {
		dec++ // 2.5 × 10^k needs one more decimal
	}
	var ts []plot.Tick
	first := math.Ceil(lo/step-1e-9) * step
	for v := first; v <= hi+step*1e-9; v += step {
		x := math.Round(v/step) * step
		if math.Abs(x) < step*1e-9 {
			x = 0
		}
		ts = append(ts, plot.Tick{Value: x, Label: trueMinus(strconv.FormatFloat(x, 'f', dec, 64))})
		for k := 1; k < 5; k++ {
			if m := x + float64(k)*step/5; m <= hi {
				ts = append(ts, plot.Tick{Value: m})
			}
		}
	}
	for k := 1; k < 5; k++ {
		if m := first - float64(k)*step/5; m >= lo {
			ts = append(ts, plot.Tick{Value: m})
		}
	}
	return ts
}

// shade mixes c with black: f = 1 keeps c, f = 0 gives black.
func shade(c color.NRGBA, f float64) color.NRGBA {
	mix := func(v uint8) uint8 { return uint8(float64(v)*f + 0.5) }
	return color.NRGBA{mix(c.R), mix(c.G), mix(c.B), 0xff}
}

// logRange pads [lo, hi] (both > 0) for a log axis: a factor of 2 each
// way, widened to whole powers of ten when that would leave fewer than
// two labelled decades.
func logRange(lo, hi float64) (float64, float64) {
	a, b := lo/2, hi*2
	if math.Floor(math.Log10(b))-math.Ceil(math.Log10(a)) < 1 {
		a, b = math.Pow(10, math.Floor(math.Log10(lo))), math.Pow(10, math.Ceil(math.Log10(hi)))
	}
	return a, b
}

// drawRow draws plots side by side in area, aligned, and the legend l at
// the top of the legend column lc.
func drawRow(area, lc draw.Canvas, plots []*plot.Plot, l plot.Legend) {
	tiles := draw.Tiles{Rows: 1, Cols: len(plots), PadX: vg.Points(14), PadBottom: vg.Points(2), PadRight: vg.Points(4)}
	cs := plot.Align([][]*plot.Plot{plots}, tiles, area)
	for j, p := range plots {
		p.Draw(cs[0][j])
	}
	l.Draw(draw.Crop(lc, 0, 0, 0, -vg.Points(24)))
}
