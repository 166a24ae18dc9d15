package report

import (
	"fmt"
	"html/template"
	"image/color"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/weft-tools/weft/aniso/card"
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

// Render draws the figures on every core, in order, as SVG and PNG.
func Render(figs []Figure) ([]Rendered, error) {
	fs := make([]*figure, len(figs))
	for i, f := range figs {
		fs[i] = &figure{name: f.Name, title: f.Title, caption: f.Caption, w: f.Width, h: f.Height, draw: f.Draw}
	}
	rs, err := renderAll(fs, true)
	if err != nil {
		return nil, err
	}
	out := make([]Rendered, len(rs))
	for i, r := range rs {
		out[i] = Rendered{Name: r.name, Title: r.title, Caption: r.caption, SVG: r.svg, PNG: r.png, Inline: inlineSVG(r.svg, r.title)}
	}
	return out, nil
}

// NewPlot returns a plot with the report's fonts, grid and at most six
// labelled ticks per axis; small is kept for callers that tile panels and
// draws the same panel.
func NewPlot(title, xlabel, ylabel string, small bool) *plot.Plot {
	return newPanel(title, xlabel, ylabel, 6, 6)
}

// DrawTitle writes a figure title centred at the top of dc and returns
// the canvas below it.
func DrawTitle(dc draw.Canvas, title string) draw.Canvas {
	sty := textStyle(12)
	sty.XAlign = draw.XCenter
	sty.YAlign = draw.YTop
	dc.FillText(sty, vg.Point{X: (dc.Min.X + dc.Max.X) / 2, Y: dc.Max.Y - vg.Points(4)}, title)
	return draw.Crop(dc, 0, 0, 0, -sty.Rectangle(title).Size().Y-vg.Points(10))
}

// AddCurve adds a line, split at non-finite points.
func AddCurve(p *plot.Plot, xs, ys []float64, ls draw.LineStyle) { addCurve(p, xs, ys, ls) }

// AddPoints adds markers.
func AddPoints(p *plot.Plot, xs, ys []float64, gs draw.GlyphStyle) { addPoints(p, xs, ys, gs) }

// LineStyle is a solid or dashed line of colour c and width in points.
func LineStyle(c color.Color, width float64, dash bool) draw.LineStyle {
	if dash {
		return lineStyle(c, width, 4, 2.5)
	}
	return lineStyle(c, width)
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
func StressLabel(kind, unit string) string { return stressAxis(kind, unit) }

// Fact is one line of a page's definition list; Mono sets the value in a
// fixed-width face (hashes, command lines).
type Fact struct {
	Name, Value string
	Mono        bool
}

// TraceFacts lists what made a card, as the fit report shows it under
// "Traceability": the program and its version, the command with its
// options, and each input by name, SHA-256 and size. p nil says the card
// predates provenance; drawnBy, when not empty, is the version of the
// program drawing the page.
func TraceFacts(p *card.Provenance, drawnBy string) []Fact {
	var out []Fact
	if p == nil {
		out = append(out, Fact{Name: "Fitted by", Value: "not recorded (a card written before weft recorded its provenance)"})
	} else {
		out = append(out, Fact{Name: "Fitted by", Value: p.Software + " " + p.VersionText()},
			Fact{Name: "Command", Value: p.Command + " " + strings.Join(p.Options, " "), Mono: true})
		for _, f := range p.Inputs {
			name := f.File
			if f.Sheet != "" {
				name += ", sheet " + f.Sheet
			}
			out = append(out, Fact{Name: "Input " + name, Value: fmt.Sprintf("SHA-256 %s, %d bytes", f.SHA256, f.Bytes), Mono: true})
		}
	}
	if drawnBy != "" {
		out = append(out, Fact{Name: "Report drawn by", Value: "weft " + drawnBy})
	}
	return out
}

// LegendItem is one line of a legend drawn by another page of weft: its
// text beside a line sample (Line, when its width is above zero) or a
// marker (Glyph, when it has a shape).
type LegendItem struct {
	Text  string
	Line  draw.LineStyle
	Glyph draw.GlyphStyle
}

// LegendHeight is the height n legend items take in cols columns.
func LegendHeight(n, cols int) vg.Length { return legendHeight(n, cols) }

// DrawLegend writes the items in cols columns filling dc from its top
// left, row by row, in the fit report's legend style.
func DrawLegend(dc draw.Canvas, items []LegendItem, cols int) {
	entries := make([]legendEntry, len(items))
	for i, it := range items {
		entries[i] = legendEntry{text: it.Text, sample: lineSample(it.Line)}
		if it.Glyph.Shape != nil {
			entries[i].sample = glyphSample(it.Glyph)
		}
	}
	drawLegend(dc, entries, cols)
}
