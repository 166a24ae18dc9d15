package report

import (
	"image/color"
	"math"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/weft-tools/weft/aniso"
)

// Who carries the load: at every point of a protocol, the fraction of the
// modelled stress of each axis that the matrix and each fibre family carry,
// and the stretch at which the fibres take over half of it.

// termGroup is the split group of a fit.csv term label: "matrix" for an
// isotropic term, the family name after "@" for a fibre term.
func termGroup(label string) string {
	if i := strings.LastIndex(label, "@"); i >= 0 {
		return label[i+1:]
	}
	return "matrix"
}

// groupsOf lists the split groups of fit.csv's terms: the matrix first,
// then the families by name.
func (t *fitTable) groupsOf() []string {
	seen := map[string]bool{}
	var fams []string
	hasMatrix := false
	for _, l := range t.terms {
		g := termGroup(l)
		if g == "matrix" {
			hasMatrix = true
		} else if !seen[g] {
			seen[g] = true
			fams = append(fams, g)
		}
	}
	sort.Strings(fams)
	if hasMatrix {
		return append([]string{"matrix"}, fams...)
	}
	return fams
}

// groupShares returns, for component ci of a protocol, each group's
// fraction of the modelled stress at every point: the magnitude of the
// group's summed contributions over the sum of the groups' magnitudes
// (equal to its fraction of the net stress where all groups pull the same
// way). Points whose modelled stress is negligible next to the protocol's
// largest modelled normal stress while the groups' stresses cancel
// (aniso.NoLoadToShare) are NaN: there is no load to share. A small
// stress that one group carries alone is kept: in the toe of a curve,
// before the fibres are recruited, the matrix carries it all, and leaving
// such points out hid where the fibres take over.
func (t *fitTable) groupShares(pr *protocolRows, ci int, groups []string) [][]float64 {
	peak := 0.0
	for _, cj := range t.componentsOf(false) {
		for _, v := range pr.model[cj] {
			if !bad(v) {
				peak = math.Max(peak, math.Abs(v))
			}
		}
	}
	index := map[string]int{}
	for g, name := range groups {
		index[name] = g
	}
	n := len(pr.F)
	out := make([][]float64, len(groups))
	for g := range out {
		out[g] = make([]float64, n)
	}
	sums := make([]float64, len(groups))
	for i := 0; i < n; i++ {
		clear(sums)
		for k, l := range t.terms {
			if v := pr.contrib[k][ci][i]; !bad(v) {
				sums[index[termGroup(l)]] += v
			}
		}
		total, net := 0.0, 0.0
		for _, s := range sums {
			total += math.Abs(s)
			net += s
		}
		m := pr.model[ci][i]
		for g := range groups {
			out[g][i] = math.NaN()
			if total > 0 && !bad(m) && !aniso.NoLoadToShare(math.Abs(m), peak, math.Abs(net), total) {
				out[g][i] = math.Abs(sums[g]) / total
			}
		}
	}
	return out
}

// takeover is where the fibres come to carry half of an axis's load.
type takeover struct {
	// at is the stretch (or strain) where the fibres' fraction first
	// reaches 0.5, interpolated between points; NaN when it never does
	// or does from the first point with a load.
	at float64
	// from is true when the fibres carry at least half from the first
	// point with a load; never when they stay below half throughout.
	from, never bool
	// first and last are the abscissae of the first and last points with
	// a load.
	first, last float64
}

// takeoverOf finds where the fibre fraction fib (over abscissa xs) first
// reaches one half.
func takeoverOf(xs, fib []float64) (takeover, bool) {
	to := takeover{at: math.NaN(), first: math.NaN(), last: math.NaN()}
	prev := -1
	for i := range xs {
		if bad(fib[i]) || bad(xs[i]) {
			continue
		}
		if prev < 0 {
			to.first = xs[i]
			if fib[i] >= 0.5 {
				to.from = true
			}
		} else if math.IsNaN(to.at) && !to.from && fib[prev] < 0.5 && fib[i] >= 0.5 {
			f := (0.5 - fib[prev]) / (fib[i] - fib[prev])
			to.at = xs[prev] + f*(xs[i]-xs[prev])
		}
		to.last = xs[i]
		prev = i
	}
	if prev < 0 {
		return to, false
	}
	to.never = !to.from && math.IsNaN(to.at)
	return to, true
}

// fibreFraction sums the fractions of every group but the matrix.
func fibreFraction(groups []string, shares [][]float64) []float64 {
	out := make([]float64, len(shares[0]))
	for g, name := range groups {
		if name == "matrix" {
			continue
		}
		for i, v := range shares[g] {
			out[i] += v
		}
	}
	return out
}

// groupLine is the colour of a split group's line: the matrix dark grey,
// the first family blue, the second vermillion.
func groupLine(group string, groups []string) color.NRGBA {
	if group == "matrix" {
		return tint(okabeBlack, 0.7)
	}
	for _, g := range groups {
		if g != "matrix" {
			if g == group {
				return okabeBlue
			}
			break
		}
	}
	return okabeVermillion
}

// groupWidth is the width of a split group's line in points: the first
// fibre family's is drawn wider than the others, underneath them, so
// that where two families carry the same share (the two families of a
// mirror pair always do) the first shows as a border around the second;
// at one width the second hid the first, and the legend listed a line
// the figure did not show. The widths also tell the families apart in
// grey print, where blue and vermillion are 8 L* apart.
func groupWidth(group string, groups []string) float64 {
	if group != "matrix" && groupLine(group, groups) == okabeBlue {
		return 2.4
	}
	return 1.3
}

// axisDash is the dash pattern of an axis in the split figure: axis 1
// solid, axis 2 dashed.
func axisDash(comp string) []float64 {
	if comp == "22" {
		return []float64{4, 2.5}
	}
	return nil
}

// groupName names a split group in words.
func groupName(g string) string {
	if g == "matrix" {
		return "matrix"
	}
	return "fibre family " + g
}

// anyTakeover reports whether the fibres come to carry half of some
// protocol's axis load after its first loaded point, where the split
// figure marks it.
func (t *fitTable) anyTakeover(groups []string, strain bool) bool {
	for _, pr := range t.protocols {
		for _, ci := range t.componentsOf(false) {
			xs := xsOf(pr.F, t.comps[ci], strain)
			if to, ok := takeoverOf(xs, fibreFraction(groups, t.groupShares(pr, ci, groups))); ok && !math.IsNaN(to.at) {
				return true
			}
		}
	}
	return false
}

// splitFigure draws, per protocol, the fraction of each axis's modelled
// stress carried by the matrix and by each fibre family against stretch,
// with a mark at the stretch where the fibres take over half of the load;
// nil when the fit has no fibre family or no normal components.
func (in *Input) splitFigure(strain bool) *figure {
	t := in.table
	groups := t.groupsOf()
	if len(groups) < 2 || !t.hasNormal() {
		return nil
	}
	n := len(t.protocols)
	var legend []legendEntry
	for _, ci := range t.componentsOf(false) {
		c := t.comps[ci]
		for _, g := range groups {
			legend = append(legend, legendEntry{groupName(g) + ", axis " + c[:1], lineSample(lineStyle(groupLine(g, groups), groupWidth(g, groups), axisDash(c)...))})
		}
	}
	mark := draw.GlyphStyle{Color: okabeBlack, Radius: vg.Points(3.2), Shape: filledMark{n: 4}}
	if t.anyTakeover(groups, strain) {
		// Only a mark that is drawn somewhere is listed.
		legend = append(legend, legendEntry{"fibres take over half the load", glyphSample(mark)})
	}
	panel := func(i int) *plot.Plot {
		pr := t.protocols[i]
		p := newPanel(pr.label, abscissaLabel(false, strain)+t.heldNote(pr.F, strain), "share of the load [%]", 5, 6)
		lo, hi := math.Inf(1), math.Inf(-1)
		var tx, ty []float64
		for _, ci := range t.componentsOf(false) {
			c := t.comps[ci]
			xs := xsOf(pr.F, c, strain)
			shares := t.groupShares(pr, ci, groups)
			for g, name := range groups {
				ys := make([]float64, len(xs))
				for k, v := range shares[g] {
					ys[k] = 100 * v
				}
				addCurve(p, xs, ys, lineStyle(groupLine(name, groups), groupWidth(name, groups), axisDash(c)...))
			}
			for _, x := range xs {
				lo, hi = math.Min(lo, x), math.Max(hi, x)
			}
			if to, ok := takeoverOf(xs, fibreFraction(groups, shares)); ok && !math.IsNaN(to.at) {
				tx, ty = append(tx, to.at), append(ty, 50)
			}
		}
		if lo < hi {
			addCurve(p, []float64{lo, hi}, []float64{50, 50}, lineStyle(color.Gray{0x80}, 0.6, 1, 2))
		}
		addPoints(p, tx, ty, mark)
		p.Y.Min, p.Y.Max = 0, 100
		p.Y.Tick.Marker = plot.ConstantTicks([]plot.Tick{{Value: 0, Label: "0"}, {Value: 25, Label: "25"}, {Value: 50, Label: "50"}, {Value: 75, Label: "75"}, {Value: 100, Label: "100"}})
		return p
	}
	measure := "stretch"
	if strain {
		measure = "Green strain"
	}
	caption := "For each protocol and axis, the fraction of the modelled stress carried by the matrix (isotropic terms) and by each fibre family at every point (axis 1 solid, axis 2 dashed; the first family's line wider and underneath, so that where two families carry the same share, as a mirror pair's do, both stay visible), from the per-term contributions in fit.csv: " +
		"each group's summed contribution in magnitude over the sum of the groups' magnitudes. The diamond on the 50 % line marks the " + measure + " at which the fibres come to carry half of the load (interpolated between points; listed in the table below). " +
		"Points where the modelled stress is negligible (under 2 % of the protocol's largest normal stress) while the groups' stresses cancel carry no load to share and are left out; a small stress that one group carries alone, as in the toe before the fibres are recruited, is shown."
	return tiledFigure("load-share", "Who carries the load: matrix and fibre families against "+measure, caption, n, tileHeight(n), panel, legend)
}
