package report

import (
	"fmt"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// The record as measured: every cycle of every protocol, the kept branch
// and the preload, from raw.csv.

// preloadGlyph marks the first row of a protocol's record.
func preloadGlyph() draw.GlyphStyle {
	return draw.GlyphStyle{Color: okabeBlack, Radius: vg.Points(3.2), Shape: filledMark{n: 4}}
}

// rawFigure draws every protocol's record: all rows as a thin line in test
// order (so every cycle, loading and unloading, shows), the rows the fit
// kept as a heavy line, and the first row, the preload, as a black
// diamond; nil without raw.csv.
func (in *Input) rawFigure() *figure {
	t := in.table
	rt := in.raw
	if rt == nil || !t.hasNormal() {
		return nil
	}
	var labels []string
	for _, pr := range t.protocols {
		if rt.protos[pr.label] != nil {
			labels = append(labels, pr.label)
		}
	}
	n := len(labels)
	if n == 0 {
		return nil
	}
	var legend []legendEntry
	for _, ci := range t.componentsOf(false) {
		c := t.comps[ci]
		sym := compSymbol(t.kind, c)
		legend = append(legend, legendEntry{sym + ", every cycle", lineSample(lineStyle(tint(componentColor(c), 0.5), 0.6))},
			legendEntry{sym + ", kept branch (fitted)", lineSample(lineStyle(componentColor(c), 1.6))})
	}
	legend = append(legend, legendEntry{"preload (first row)", glyphSample(preloadGlyph())})
	panel := func(i int) *plot.Plot {
		rr := rt.protos[labels[i]]
		cycles := 0
		for _, c := range rr.cycle {
			cycles = max(cycles, c)
		}
		p := newPanel(rawTitle(labels[i], cycles), abscissaLabel(false, false)+t.heldNote(rr.F, false), stressAxis(t.kind, t.unit), 5, 6)
		for _, ci := range t.componentsOf(false) {
			c := t.comps[ci]
			xs := xsOf(rr.F, c, false)
			addCurve(p, xs, rr.stress[ci], lineStyle(tint(componentColor(c), 0.5), 0.6))
			// The kept rows, run by run (a kept branch of every cycle has
			// one run per cycle).
			var kx, ky []float64
			for k := range xs {
				if rr.kept[k] {
					kx, ky = append(kx, xs[k]), append(ky, rr.stress[ci][k])
				} else if len(kx) > 0 {
					addCurve(p, kx, ky, lineStyle(componentColor(c), 1.6))
					kx, ky = nil, nil
				}
			}
			addCurve(p, kx, ky, lineStyle(componentColor(c), 1.6))
		}
		for _, ci := range t.componentsOf(false) {
			if len(rr.F) > 0 {
				addPoints(p, []float64{axisCoordinate(rr.F[0], abscissaComp(rr.F, t.comps[ci]), false)}, []float64{rr.stress[ci][0]}, preloadGlyph())
			}
		}
		includeZero(p)
		return p
	}
	caption := "The test file as measured, before any re-referencing: every row in test order as a thin line (each cycle's loading and unloading), the rows the fit used as a heavy line, the first row — the preload — as a black diamond. " +
		fmt.Sprintf("Records longer than %d rows per protocol are thinned evenly in raw.csv, and a line of more than %d rows is drawn by the first and the extreme rows of each run of consecutive rows.", maxRawRows, maxDrawnPoints)
	return tiledFigure("raw", "The record: every cycle, the kept branch and the preload", caption, n, shortTileHeight(n), panel, legend)
}

// rawTitle is a record tile's title: the protocol and its number of cycles
// (none when raw.csv gives none), "1 cycle" in the singular.
func rawTitle(label string, cycles int) string {
	switch {
	case cycles == 1:
		return label + " · 1 cycle"
	case cycles > 1:
		return fmt.Sprintf("%s · %d cycles", label, cycles)
	}
	return label
}
