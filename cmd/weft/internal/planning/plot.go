package planning

import (
	"bytes"
	"errors"
	"fmt"
	"image/color"
	"image/png"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// planColours and planDashes tell the explanations apart in the plot of
// the top test, by colour and, for print in grey, by dash pattern.
var (
	planColours = []color.RGBA{{0x1b, 0x3f, 0x8b, 0xff}, {0xc0, 0x50, 0x10, 0xff}, {0x2e, 0x7d, 0x32, 0xff},
		{0x7b, 0x1f, 0xa2, 0xff}, {0x5d, 0x40, 0x37, 0xff}, {0x00, 0x83, 0x8f, 0xff}}
	planDashes = [][]vg.Length{nil, {vg.Points(6), vg.Points(3)}, {vg.Points(2), vg.Points(2)},
		{vg.Points(8), vg.Points(2), vg.Points(2), vg.Points(2)}, {vg.Points(4), vg.Points(4)}, {vg.Points(1), vg.Points(3)}}
)

// planFont is the plot's typeface (embedded in the plotting library).
var planFont = font.Font{Typeface: "Liberation", Variant: "Sans"}

// plotQuestion picks the question whose explanations the plot shows: the
// first the top test settles, else the first; -1 without questions.
func plotQuestion(d *aniso.Design) int {
	for i, qs := range d.Tests[0].Questions {
		if qs.Settled {
			return i
		}
	}
	if len(d.Questions) > 0 {
		return 0
	}
	return -1
}

// Plot draws, as SVG (PNG when name ends in .png), for the top
// test, the stress every explanation of the plotted question predicts
// along it, one panel per measured component, against the stretch of the
// leading tester axis: all at the deformation the specimen takes under the
// first explanation, with the noise band (±2 noise standard deviations)
// about its stress — what a test run under it would measure, and what the
// others would have predicted there. On sutures a last panel shows the
// shear F12 the markers would track under each explanation.
func Plot(f *Folder, d *aniso.Design, name string) ([]byte, error) {
	ts := &d.Tests[0]
	exps := []aniso.Explanation{{Name: "fitted model", Model: f.Result.Model}}
	title := ts.Test.Describe()
	if qi := plotQuestion(d); qi >= 0 {
		exps = d.Questions[qi].Explanations
		title += " — " + d.Questions[qi].Topic + "; stresses at the deformation under " + exps[0].Name
	}
	var at, own []*aniso.Along
	for _, e := range exps {
		a, err := d.Along(&ts.Test, e.Model, exps[0].Model)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", e.Name, err)
		}
		at = append(at, a)
		if ts.Test.Sutured {
			if a, err = d.Along(&ts.Test, e.Model, nil); err != nil {
				return nil, fmt.Errorf("%s: %w", e.Name, err)
			}
			own = append(own, a)
		}
	}
	x := make([]float64, len(ts.Test.Path))
	for i, F := range ts.Test.Path {
		x[i] = math.Max(F[0], F[3])
	}
	if len(at[0].Components) == 0 {
		return nil, errors.New("the planned test measures no stress")
	}
	legend := plot.NewLegend()
	legend.TextStyle.Font = font.From(planFont, vg.Points(8))
	var plots []*plot.Plot
	for j, comp := range at[0].Components {
		p := newPlanPanel(stressTitle(f.card.Data.StressKind, comp, f.card.Data.StressUnit))
		lo, hi := make(plotter.XYs, len(x)), make(plotter.XYs, len(x))
		for i := range x {
			s, n := at[0].Stress[i][j], 2*at[0].Noise[i][j]
			lo[i], hi[i] = plotter.XY{X: x[i], Y: s - n}, plotter.XY{X: x[i], Y: s + n}
		}
		for b, band := range []plotter.XYs{lo, hi} {
			l, err := plotter.NewLine(band)
			if err != nil {
				return nil, err
			}
			l.LineStyle.Color, l.LineStyle.Width = color.Gray{Y: 0xb0}, vg.Points(0.6)
			p.Add(l)
			if j == 0 && b == 0 {
				legend.Add("±2 noise standard deviations about "+exps[0].Name, l)
			}
		}
		for k, a := range at {
			l, err := explanationLine(x, k, func(i int) float64 { return a.Stress[i][j] })
			if err != nil {
				return nil, err
			}
			p.Add(l)
			if j == 0 {
				legend.Add(exps[k].Name, l)
			}
		}
		plots = append(plots, p)
	}
	if ts.Test.Sutured {
		p := newPlanPanel("shear F12 the markers track (own path)")
		for k, a := range own {
			l, err := explanationLine(x, k, func(i int) float64 { return a.Path[i][1] })
			if err != nil {
				return nil, err
			}
			p.Add(l)
		}
		plots = append(plots, p)
	}
	return renderPlanPlot(plots, &legend, len(exps)+1, title, card.CautionsOf(f.card), strings.HasSuffix(strings.ToLower(name), ".png"))
}

// stressTitle heads the panel of a stress component: the measure in
// words, its symbol and the unit the data gave, "nominal stress P11
// [kPa]" or "Cauchy stress σ11 [kPa]" (it read "nominal 11 [kPa]", and
// "cauchy 11 [kPa]" for a Cauchy fit).
func stressTitle(kind, comp, unit string) string {
	k := biaxial.Cauchy
	if kind == biaxial.Nominal.String() {
		k = biaxial.Nominal
	}
	return k.Words() + " stress " + k.Symbol(comp) + " [" + unit + "]"
}

// newPlanPanel is one panel with its title and readable ticks.
func newPlanPanel(title string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = "stretch of the leading tester axis"
	p.X.Tick.Marker = decimalTicks{}
	p.Y.Tick.Marker = decimalTicks{}
	styleAxes(p)
	return p
}

// explanationLine is explanation k's curve y(i) over x, in its colour and
// dash pattern.
func explanationLine(x []float64, k int, y func(i int) float64) (*plotter.Line, error) {
	xy := make(plotter.XYs, len(x))
	for i := range x {
		xy[i] = plotter.XY{X: x[i], Y: y(i)}
	}
	l, err := plotter.NewLine(xy)
	if err != nil {
		return nil, err
	}
	l.LineStyle.Color = planColours[k%len(planColours)]
	l.LineStyle.Dashes = planDashes[k%len(planDashes)]
	l.LineStyle.Width = vg.Points(1.4)
	return l, nil
}

// decimalTicks are the plotting library's default ticks labelled with as
// many decimals as their spacing needs, so that close stretches such as
// 1.02 and 1.04 do not both read "1".
type decimalTicks struct{}

// Ticks returns the ticks between lo and hi.
func (decimalTicks) Ticks(lo, hi float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(lo, hi)
	step := math.Inf(1)
	var prev float64
	first := true
	for _, t := range ts {
		if t.Label == "" {
			continue
		}
		if !first {
			step = math.Min(step, math.Abs(t.Value-prev))
		}
		prev, first = t.Value, false
	}
	dec := 0
	if step > 0 && !math.IsInf(step, 1) {
		dec = max(0, int(math.Ceil(-math.Log10(step)-1e-9)))
	}
	for i := range ts {
		if ts[i].Label != "" {
			ts[i].Label = strconv.FormatFloat(ts[i].Value, 'f', dec, 64)
		}
	}
	return ts
}

// styleAxes sets the plot's fonts.
func styleAxes(p *plot.Plot) {
	p.Title.TextStyle.Font = font.From(planFont, vg.Points(10))
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font = font.From(planFont, vg.Points(9))
		a.Tick.Label.Font = font.From(planFont, vg.Points(8))
	}
	p.Legend.TextStyle.Font = font.From(planFont, vg.Points(8))
}

// planDPI is the resolution of a PNG plot.
const planDPI = 144

// renderPlanPlot lays the panels side by side under the title, with the
// cautions below them (a figure is often shown without the table or the
// card), and writes them as SVG, or as PNG. A panic in the plotting
// library becomes an error.
func renderPlanPlot(plots []*plot.Plot, legend *plot.Legend, entries int, title string, cautions []string, asPNG bool) (out []byte, err error) {
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("plot: %v", r)
		}
	}()
	w := vg.Inch * 3.4 * vg.Length(len(plots))
	fs := text.Style{Color: color.Black, Font: font.From(planFont, vg.Points(7)), Handler: plot.DefaultTextHandler}
	var foot []string
	for _, c := range cautions {
		foot = append(foot, wrapToWidth(fs, c, w-vg.Points(16))...)
	}
	lineH := vg.Points(9)
	footH := lineH*vg.Length(len(foot)) + vg.Points(4)
	h := vg.Inch*4.2 + footH
	var c vg.CanvasSizer
	var img *vgimg.Canvas
	if asPNG {
		img = vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(planDPI))
		c = img
	} else {
		c = vgsvg.New(w, h)
	}
	dc := draw.New(c)
	lh := vg.Points(11) * vg.Length(entries)
	head := vg.Points(24) + lh
	ts := text.Style{Color: color.Black, Font: font.From(planFont, vg.Points(11)), Handler: plot.DefaultTextHandler}
	dc.FillText(ts, vg.Point{X: vg.Points(8), Y: h - vg.Points(16)}, title)
	legend.Top, legend.Left = true, true
	// The library stacks the entries one text height apart, so that one
	// line's descenders touched the next line's capitals; a gap keeps
	// them apart and the head's 11 points per entry still hold them.
	legend.Padding = legendGap
	legend.Draw(draw.Crop(dc, vg.Points(8), 0, h-head, -vg.Points(22)))
	for i, l := range foot {
		dc.FillText(fs, vg.Point{X: vg.Points(8), Y: footH - lineH*vg.Length(i+1)}, l)
	}
	body := draw.Crop(dc, 0, 0, footH, -head)
	// PadLeft keeps the first panel's tick labels off the figure's edge
	// (they started at x = 0), in line with the title and the legend.
	tiles := draw.Tiles{Rows: 1, Cols: len(plots), PadX: vg.Points(14), PadBottom: vg.Points(2), PadRight: vg.Points(6), PadLeft: vg.Points(8)}
	cs := plot.Align([][]*plot.Plot{plots}, tiles, body)
	for i, p := range plots {
		p.Draw(cs[0][i])
	}
	var b bytes.Buffer
	if img != nil {
		err = png.Encode(&b, img.Image())
	} else {
		_, err = c.(*vgsvg.Canvas).WriteTo(&b)
	}
	if err != nil {
		return nil, err
	}
	if img == nil {
		// As in the fit report: a browser without Liberation Sans takes
		// a metric-compatible face instead of its default (often a serif
		// of other widths, which moved the text off its place).
		return bytes.ReplaceAll(b.Bytes(), []byte("font-family:Liberation Sans;"), []byte(svgFontFamily)), nil
	}
	return b.Bytes(), nil
}

// svgFontFamily is the font list of the plot's SVG text: Liberation Sans
// and faces with its metrics.
const svgFontFamily = "font-family:'Liberation Sans',Arimo,Arial,Helvetica,sans-serif;"

// legendGap is the space between two legend entries.
var legendGap = vg.Points(2.5)

// wrapToWidth breaks s at spaces into lines no wider than width in style
// st; a word wider than width stands on its own line.
func wrapToWidth(st text.Style, s string, width vg.Length) []string {
	var lines []string
	line := ""
	for _, w := range strings.Fields(s) {
		if line != "" && st.Width(line+" "+w) > width {
			lines = append(lines, line)
			line = ""
		}
		if line != "" {
			line += " "
		}
		line += w
	}
	if line != "" {
		lines = append(lines, line)
	}
	return lines
}
