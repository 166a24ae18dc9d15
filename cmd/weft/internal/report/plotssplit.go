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
)

// The matrix/fibre split: stacked term contributions per protocol and the
// share of each group per protocol and axis.

// termGroup is the split group of a fit.csv term label: "matrix" for an
// isotropic term, the family name after "@" for a fibre term.
func termGroup(label string) string {
	if i := strings.LastIndex(label, "@"); i >= 0 {
		return label[i+1:]
	}
	return "matrix"
}

// termDisplay writes a term label for a legend: "matrix · i1-lin",
// "fibre f1 · fib-expsq".
func termDisplay(label string) string {
	g := termGroup(label)
	id := label
	if i := strings.LastIndex(label, "@"); i >= 0 {
		id = label[:i]
	}
	if g == "matrix" {
		return "matrix · " + id
	}
	return "fibre " + g + " · " + id
}

// splitTerm is an active term of the split with its colour.
type splitTerm struct {
	index int // into fitTable.terms
	label string
	color color.NRGBA
}

// activeTerms lists the terms that contribute anywhere, matrix first, then
// each family, each group's terms in the card's order, with their colours.
func (t *fitTable) activeTerms() []splitTerm {
	var groups []string
	byGroup := map[string][]int{}
	for k, label := range t.terms {
		active := false
		for _, pr := range t.protocols {
			for _, col := range pr.contrib[k] {
				for _, v := range col {
					if v != 0 && !math.IsNaN(v) {
						active = true
					}
				}
			}
		}
		if !active {
			continue
		}
		g := termGroup(label)
		if _, ok := byGroup[g]; !ok {
			groups = append(groups, g)
		}
		byGroup[g] = append(byGroup[g], k)
	}
	// The matrix at the bottom of the stack, then the families by name.
	ordered := []string{}
	if _, ok := byGroup["matrix"]; ok {
		ordered = append(ordered, "matrix")
	}
	var fams []string
	for _, g := range groups {
		if g != "matrix" {
			fams = append(fams, g)
		}
	}
	sort.Strings(fams)
	ordered = append(ordered, fams...)
	var out []splitTerm
	for _, g := range ordered {
		cols := groupColors(g)
		for j, k := range byGroup[g] {
			out = append(out, splitTerm{index: k, label: t.terms[k], color: cols[j%len(cols)]})
		}
	}
	return out
}

// addStack draws the terms' contributions to one component as stacked
// bands: positive contributions stacked upwards from zero, negative ones
// downwards, in the order of terms.
func addStack(p *plot.Plot, xs []float64, contrib [][]float64, terms []splitTerm) {
	n := len(xs)
	pos := make([]float64, n)
	neg := make([]float64, n)
	for _, st := range terms {
		c := contrib[st.index]
		lo := make([]float64, n)
		hi := make([]float64, n)
		for i := 0; i < n; i++ {
			v := c[i]
			if math.IsNaN(v) {
				v = 0
			}
			if v >= 0 {
				lo[i], hi[i] = pos[i], pos[i]+v
				pos[i] += v
			} else {
				lo[i], hi[i] = neg[i]+v, neg[i]
				neg[i] += v
			}
		}
		var poly plotter.XYs
		for i := 0; i < n; i++ {
			poly = append(poly, plotter.XY{X: xs[i], Y: hi[i]})
		}
		for i := n - 1; i >= 0; i-- {
			poly = append(poly, plotter.XY{X: xs[i], Y: lo[i]})
		}
		pg, err := plotter.NewPolygon(poly)
		if err != nil {
			continue
		}
		pg.Color = st.color
		pg.LineStyle = lineStyle(color.White, 0.6, false)
		p.Add(pg)
	}
}

// splitFigure is the stacked split of protocol i.
func (in *Input) splitFigure(i int, strain bool, terms []splitTerm) *figure {
	t := in.table
	pr := t.protocols[i]
	// Two panels side by side; four (with shear) in two rows.
	cols := min(len(t.comps), 2)
	rows := (len(t.comps) + cols - 1) / cols
	lw := 2.5 * vg.Inch
	f := &figure{name: protocolFileName("split", i, pr.label), w: vg.Length(cols)*3.4*vg.Inch + lw, h: vg.Length(rows)*3.1*vg.Inch + 0.5*vg.Inch,
		title: fmt.Sprintf("Protocol %s: stress carried by each term", pr.label),
		caption: "The modelled stress of each component divided into the contribution of every active energy term, stacked " +
			"(contributions that pull the other way, such as the plane-stress pressure on a matrix term, stack below zero). " +
			"Matrix terms in greys, the first fibre family in blues, the second in warm colours; the black line is the model total, dots the measured stress."}
	f.draw = func(dc draw.Canvas) error {
		dc = drawTitle(dc, fmt.Sprintf("Protocol %s — %s: stress split by term", pr.label, in.card.Specimen))
		area, lc := splitColumns(dc, lw)
		grid := make([][]*plot.Plot, rows)
		for r := range grid {
			grid[r] = make([]*plot.Plot, cols)
		}
		for ci, c := range t.comps {
			p := newPlot(compSymbol(t.kind, c), abscissaLabel(isShear(c), strain, true), stressLabel(t.kind, t.unit), true)
			xs := make([]float64, len(pr.F))
			for k, F := range pr.F {
				xs[k] = axisCoordinate(F, c, strain)
			}
			col := make([][]float64, len(t.terms))
			for k := range t.terms {
				col[k] = pr.contrib[k][ci]
			}
			addStack(p, xs, col, terms)
			addCurve(p, xs, pr.model[ci], lineStyle(okabeBlack, 1.1, false))
			addPoints(p, xs, pr.measured[ci], draw.GlyphStyle{Color: okabeBlack, Radius: vg.Points(1.1), Shape: draw.CircleGlyph{}})
			grid[ci/cols][ci%cols] = p
		}
		tiles := draw.Tiles{Rows: rows, Cols: cols, PadX: vg.Points(12), PadY: vg.Points(12), PadBottom: vg.Points(2), PadRight: vg.Points(4)}
		cs := plot.Align(grid, tiles, area)
		for r, row := range grid {
			for c, p := range row {
				if p != nil {
					p.Draw(cs[r][c])
				}
			}
		}
		l := newLegend(9)
		for _, st := range terms {
			l.Add(termDisplay(st.label), swatch{st.color})
		}
		l.Add("model total", lineThumb{lineStyle(okabeBlack, 1.1, false)})
		l.Add("measured", glyphThumb{draw.GlyphStyle{Color: okabeBlack, Radius: vg.Points(1.6), Shape: draw.CircleGlyph{}}})
		l.Draw(draw.Crop(lc, 0, 0, 0, -vg.Points(24)))
		return nil
	}
	return f
}

// luminance is the relative luminance of c (ITU-R BT.709 weights, common
// practice), used to pick black or white text on a fill.
func luminance(c color.NRGBA) float64 {
	return (0.2126*float64(c.R) + 0.7152*float64(c.G) + 0.0722*float64(c.B)) / 255
}

// shareFigure is the bar chart of each group's share per protocol and
// component, and of the strain energy at the largest stretch.
func (in *Input) shareFigure() *figure {
	sp := in.split
	nb := 0
	if len(sp.Protocols) > 0 {
		nb = len(sp.Protocols[0].Components) + 1
	}
	w := vg.Length(len(sp.Protocols)*(nb+1))*0.3*vg.Inch + 2.9*vg.Inch
	f := &figure{name: "split-shares", w: max(w, 7*vg.Inch), h: 4 * vg.Inch,
		title: "Share of the matrix and each fibre family, per protocol",
		caption: "For each protocol, the share of each group (matrix, each fibre family) in the modelled stress of every component — " +
			"the sum of the magnitudes of its terms' contributions over the protocol's points — and in the strain energy Ψ at the protocol's largest deformation."}
	f.draw = func(dc draw.Canvas) error {
		dc = drawTitle(dc, in.card.Specimen+" — matrix and fibre shares")
		area, lc := splitColumns(dc, 2.2*vg.Inch)
		p := newBarePlot("", "", "share [%]", false)
		var ticks []plot.Tick
		lab := &textMarks{size: 7.5, xalign: draw.XCenter}
		groupLab := &textMarks{size: 9, xalign: draw.XCenter}
		const bw = 0.72
		for pi, pp := range sp.Protocols {
			x0 := float64(pi * (nb + 1))
			type bar struct {
				name   string
				shares map[string]float64
			}
			var bars []bar
			for _, c := range pp.Components {
				m := map[string]float64{}
				for g, v := range c.GroupShare {
					m[g] = float64(v)
				}
				bars = append(bars, bar{compSymbol(in.table.kind, c.Component), m})
			}
			m := map[string]float64{}
			for g, v := range pp.GroupEnergyShare {
				m[g] = float64(v)
			}
			bars = append(bars, bar{"Ψ", m})
			for j, b := range bars {
				x := x0 + float64(j)
				ticks = append(ticks, plot.Tick{Value: x, Label: b.name})
				base := 0.0
				for _, g := range sp.Groups {
					v := 100 * b.shares[g]
					if math.IsNaN(v) || v <= 0 {
						continue
					}
					col := groupColors(g)[0]
					pg, err := plotter.NewPolygon(plotter.XYs{{X: x - bw/2, Y: base}, {X: x + bw/2, Y: base}, {X: x + bw/2, Y: base + v}, {X: x - bw/2, Y: base + v}})
					if err != nil {
						return err
					}
					pg.Color = col
					pg.LineStyle = lineStyle(color.White, 0.6, false)
					p.Add(pg)
					if v >= 9 {
						tc := color.Color(color.Black)
						if luminance(col) < 0.5 {
							tc = color.White
						}
						lab.xs = append(lab.xs, x)
						lab.ys = append(lab.ys, base+v/2)
						lab.texts = append(lab.texts, fmt.Sprintf("%.0f", v))
						lab.colors = append(lab.colors, tc)
					}
					base += v
				}
			}
			groupLab.xs = append(groupLab.xs, x0+float64(nb-1)/2)
			groupLab.ys = append(groupLab.ys, 106)
			groupLab.texts = append(groupLab.texts, pp.Protocol)
			groupLab.colors = append(groupLab.colors, color.Black)
		}
		p.Add(lab, groupLab)
		p.X.Tick.Marker = plot.ConstantTicks(ticks)
		p.X.Min, p.X.Max = -0.6, float64(len(sp.Protocols)*(nb+1)-1)-0.4
		p.Y.Min, p.Y.Max = 0, 111
		p.Y.Tick.Marker = plot.ConstantTicks([]plot.Tick{{Value: 0, Label: "0"}, {Value: 25, Label: "25"}, {Value: 50, Label: "50"}, {Value: 75, Label: "75"}, {Value: 100, Label: "100"}})
		p.Draw(area)
		l := newLegend(9)
		for _, g := range sp.Groups {
			name := "matrix (isotropic terms)"
			if g != "matrix" {
				name = "fibre family " + g
			}
			l.Add(name, swatch{groupColors(g)[0]})
		}
		l.Draw(draw.Crop(lc, 0, 0, 0, -vg.Points(24)))
		return nil
	}
	return f
}
