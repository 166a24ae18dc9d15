package planning

import (
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
)

// planTexts returns the left edge, baseline and content of every
// horizontal text of an SVG the plot wrote (a rotated one sits in a
// rotating group and is left out).
func planTexts(svg string) (xs, ys []float64, ss []string) {
	re := regexp.MustCompile(`(<g transform="rotate\([^)]*\)">\s*)?<text x="([-0-9.e]+)" y="([-0-9.e]+)"[^>]*>([^<]*)</text>`)
	for _, m := range re.FindAllStringSubmatch(svg, -1) {
		if m[1] != "" {
			continue
		}
		x, _ := strconv.ParseFloat(m[2], 64)
		y, _ := strconv.ParseFloat(m[3], 64)
		xs, ys, ss = append(xs, x), append(ys, -y), append(ss, m[4])
	}
	return xs, ys, ss
}

// The plot of the top test: its stress panels name the measure, the
// symbol and the unit ("nominal 11 [kPa]" named neither the quantity nor
// the symbol, and a Cauchy fit read "cauchy 11"); the legend's lines do
// not overlap (the library stacked them 7 points apart in 8-point text,
// one line's descenders into the next one's capitals); no text starts at
// the figure's left edge (the first panel's tick labels stood at x = 0);
// and the SVG names fonts of Liberation Sans's metrics besides it.
func TestPlanPlotReadable(t *testing.T) {
	if got := stressTitle("cauchy", "22", "MPa"); got != "Cauchy stress σ22 [MPa]" {
		t.Errorf("Cauchy title %q", got)
	}
	x := []float64{1, 1.05, 1.1}
	var plots []*plot.Plot
	legend := plot.NewLegend()
	legend.TextStyle.Font = font.From(planFont, vg.Points(8))
	for _, comp := range []string{"11", "22"} {
		p := newPlanPanel(stressTitle("nominal", comp, "kPa"))
		for k, name := range []string{"one family at +30.0°", "one family at −30.0°", "a mirror pair at ±30.0° (half the weight on each)"} {
			l, err := explanationLine(x, k, func(i int) float64 { return 70 * float64(k+1) * (x[i] - 1) })
			if err != nil {
				t.Fatal(err)
			}
			p.Add(l)
			if comp == "11" {
				legend.Add(name, l)
			}
		}
		plots = append(plots, p)
	}
	b, err := renderPlanPlot(plots, &legend, 4, "1:0.75 on sutures", []string{"SYNTHETIC data."}, false)
	if err != nil {
		t.Fatal(err)
	}
	svg := string(b)
	for _, want := range []string{">nominal stress P11 [kPa]<", ">nominal stress P22 [kPa]<"} {
		if !strings.Contains(svg, want) {
			t.Errorf("no panel title %s", want)
		}
	}
	if !strings.Contains(svg, "Arimo,Arial") {
		t.Error("the SVG names no font of Liberation Sans's metrics besides it")
	}
	xs, ys, ss := planTexts(svg)
	var rows []float64
	for i, s := range ss {
		if strings.HasPrefix(s, "one family") || strings.HasPrefix(s, "a mirror pair") {
			rows = append(rows, ys[i])
		}
		if xs[i] < 4 {
			t.Errorf("%q starts %.1f pt from the left edge", s, xs[i])
		}
	}
	if len(rows) != 3 {
		t.Fatalf("%d legend lines, want 3", len(rows))
	}
	sort.Float64s(rows)
	// Liberation Sans: ascent 0.905 em and descent 0.212 em (the font's
	// hhea table, from memory), so lines of 8-point text need 8.94 points.
	const need = 8 * (0.905 + 0.212)
	for i := 1; i < len(rows); i++ {
		if gap := rows[i] - rows[i-1]; gap < need {
			t.Errorf("legend lines %.2f pt apart, need %.2f pt for 8-point text", gap, need)
		}
	}
}
