package report

import (
	"html/template"
	"image/color"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// The drawing of the fit report, for other pages of weft (the cohort
// report): the same fonts, axes, palette, and SVG and PNG files.

// Figure is a plot to draw as SVG and PNG: Name is the file stem under
// plots/, Title and Caption head and explain it, Width and Height its
// size, Draw draws it.
type Figure struct {
	Name, Title, Caption string
	Width, Height        vg.Length
	Draw                 func(dc draw.Canvas) error
}

// Rendered is a drawn figure: its files and an inlinable SVG.
type Rendered struct {
	Name, Title, Caption string
	SVG, PNG             []byte
	// Inline is the SVG prepared for an HTML page (see inlineSVG).
	Inline template.HTML
}

// Render draws the figures on every core, in order.
func Render(figs []Figure) ([]Rendered, error) {
	fs := make([]*figure, len(figs))
	for i, f := range figs {
		fs[i] = &figure{name: f.Name, title: f.Title, caption: f.Caption, w: f.Width, h: f.Height, draw: f.Draw}
	}
	rs, err := renderAll(fs)
	if err != nil {
		return nil, err
	}
	out := make([]Rendered, len(rs))
	for i, r := range rs {
		out[i] = Rendered{Name: r.name, Title: r.title, Caption: r.caption, SVG: r.svg, PNG: r.png, Inline: inlineSVG(r.svg, r.title)}
	}
	return out, nil
}

// NewPlot returns a plot with the report's fonts, ticks and grid; small
// selects the sizes of tiled figures.
func NewPlot(title, xlabel, ylabel string, small bool) *plot.Plot {
	return newPlot(title, xlabel, ylabel, small)
}

// NewLegend returns an empty legend in the report's font of size points.
func NewLegend(size float64) plot.Legend { return newLegend(size) }

// DrawTitle writes a figure title at the top of dc and returns the canvas
// below it.
func DrawTitle(dc draw.Canvas, title string) draw.Canvas { return drawTitle(dc, title) }

// SplitColumns divides dc into a plot area and a legend column of width
// lw on the right.
func SplitColumns(dc draw.Canvas, lw vg.Length) (draw.Canvas, draw.Canvas) {
	return splitColumns(dc, lw)
}

// AddCurve adds a line (split at non-finite points) and returns its legend
// thumbnail, or nil.
func AddCurve(p *plot.Plot, xs, ys []float64, ls draw.LineStyle) plot.Thumbnailer {
	return addCurve(p, xs, ys, ls)
}

// AddPoints adds markers and returns their legend thumbnail, or nil.
func AddPoints(p *plot.Plot, xs, ys []float64, gs draw.GlyphStyle) plot.Thumbnailer {
	return addPoints(p, xs, ys, gs)
}

// LineStyle is a solid or dashed line of colour c and width in points.
func LineStyle(c color.Color, width float64, dash bool) draw.LineStyle {
	return lineStyle(c, width, dash)
}

// ComponentColor is the colour of a stress component ("11", "22", "12",
// "21") in every plot.
func ComponentColor(comp string) color.NRGBA { return componentColor(comp) }

// ComponentGlyph is the marker of a stress component's measured points.
func ComponentGlyph(comp string, radius float64) draw.GlyphStyle {
	return componentGlyph(comp, radius)
}

// Tint mixes c with white: f = 1 keeps c, f = 0 gives white.
func Tint(c color.NRGBA, f float64) color.NRGBA { return tint(c, f) }

// GroupColor is the colour of the i-th group of a comparison, from the
// report's colour-blind-safe palette (Okabe & Ito 2008).
func GroupColor(i int) color.NRGBA {
	cs := []color.NRGBA{okabeBlue, okabeVermillion, okabeBluishGreen, okabeReddishPurple, okabeOrange, okabeSkyBlue, okabeBlack}
	return cs[i%len(cs)]
}

// StressLabel is the stress axis label of a measure ("cauchy" or
// "nominal") and unit.
func StressLabel(kind, unit string) string { return stressLabel(kind, unit) }
