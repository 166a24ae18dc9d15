package report

import (
	"fmt"
	"html"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/terms"
	"gonum.org/v1/plot/vg"
)

// figureInput is an Input with fit.csv read back for the given protocol
// labels and nothing else: each protocol is 21 points of stresses rising
// linearly to about 150 kPa (invented; these tests check what the figures
// draw and label, not the stresses), a label "1:0" a strip with axis 2
// held at stretch 1 rising to about 45 kPa (two-digit ticks, as in
// gent-seven-protocols, leave its tile's label furthest right). kind is
// "nominal" or "cauchy"; the model is a neo-Hookean term.
func figureInput(kind string, labels ...string) *Input {
	t := &fitTable{kind: kind, unit: "kPa", comps: []string{"11", "22"}, terms: []string{"i1-lin"}}
	for _, l := range labels {
		pr := &protocolRows{label: l}
		pr.measured, pr.model, pr.residual = make([][]float64, 2), make([][]float64, 2), make([][]float64, 2)
		pr.contrib = [][][]float64{make([][]float64, 2)}
		for i := 0; i <= 20; i++ {
			e := 0.01 * float64(i)
			F := [4]float64{1 + e, 0, 0, 1 + e}
			scale := 1.0
			if l == "1:0" {
				F[3], scale = 1, 0.3
			}
			pr.F = append(pr.F, F)
			pr.line = append(pr.line, i+2)
			for c := range 2 {
				v := 500 * scale * e * (1 + 0.5*float64(c))
				pr.measured[c] = append(pr.measured[c], v*1.01)
				pr.model[c] = append(pr.model[c], v)
				pr.residual[c] = append(pr.residual[c], -0.01*v)
				pr.contrib[0][c] = append(pr.contrib[0][c], v)
			}
		}
		t.protocols = append(t.protocols, pr)
	}
	m := &aniso.Model{Terms: []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 30}}}
	return &Input{table: t, model: m}
}

// svgText is one horizontal text element of an SVG: its left edge in
// points (as the plotting library writes them, text-anchor start), size
// and content.
type svgText struct {
	x, size float64
	s       string
}

var svgTextRe = regexp.MustCompile(`(<g transform="rotate\([^)]*\)">\s*)?<text x="([-0-9.e]+)" y="[-0-9.e]+"[^>]*font-size:([0-9.]+)px[^>]*>([^<]*)</text>`)

// svgTexts lists the horizontal text elements of an SVG; a rotated one
// (an axis title, inside a rotating group) has its x along the rotated
// axis and is left out.
func svgTexts(svg []byte) []svgText {
	var out []svgText
	for _, m := range svgTextRe.FindAllStringSubmatch(string(svg), -1) {
		if m[1] != "" {
			continue
		}
		m = m[1:]
		x, _ := strconv.ParseFloat(m[1], 64)
		size, _ := strconv.ParseFloat(m[2], 64)
		out = append(out, svgText{x: x, size: size, s: html.UnescapeString(m[3])})
	}
	return out
}

// textsOutside lists the texts of a rendered figure that run past its
// left or right edge by more than a point (a clipped word in the PNG),
// measured with the figure's own font by its advance widths; a tick
// label centred on the frame's last tick reaches half a point past the
// edge by its side bearing, which no pixel shows.
func textsOutside(f renderedFigure) []string {
	var out []string
	w := f.w.Points()
	for _, tx := range svgTexts(f.svg) {
		right := tx.x + textStyle(tx.size).Width(tx.s).Points()
		if tx.x < -1 || right > w+1 {
			out = append(out, fmt.Sprintf("%q from %.1f to %.1f pt of %.1f", tx.s, tx.x, right, w))
		}
	}
	return out
}

// mustRender renders a figure as SVG.
func mustRender(t *testing.T, f *figure) renderedFigure {
	t.Helper()
	if f == nil {
		t.Fatal("no figure")
	}
	r, err := f.render(false)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// A strip-biaxial protocol says under its stretch axis that the held
// axis's stress is plotted against the other axis's stretch. In the last
// of three columns that note, appended on the label's line, ran past the
// figure's right edge: gent-seven-protocols' record figure read "…(axis 2
// he" in the PNG. On a line of its own it stays inside.
func TestHeldNoteStaysInsideTheFigure(t *testing.T) {
	in := figureInput("nominal", "1:1", "1:0.75", "0.75:1", "1:0.5", "0.5:1", "1:0")
	for _, f := range []*figure{in.fitGridFigure(false), in.residualFigure(false, false), in.fitGridFigure(true)} {
		r := mustRender(t, f)
		if !strings.Contains(string(r.svg), ">P22 against λ1 (axis 2 held)<") && !strings.Contains(string(r.svg), ">P22 against E11 (axis 2 held)<") {
			t.Errorf("%s: the strip's note is not a text of its own", f.name)
		}
		for _, s := range textsOutside(r) {
			t.Errorf("%s: text outside the figure: %s", f.name, s)
		}
	}
}

// Every stress axis names the measure and the unit the input gave, not
// only the symbol: "P [kPa]" said nothing to a reader who does not know
// that P is the nominal stress. Residual axes name it too.
func TestStressAxesNameTheMeasure(t *testing.T) {
	for _, c := range []struct{ kind, axis, residual string }{
		{"nominal", "nominal P [kPa]", "nominal residual [kPa]"},
		{"cauchy", "Cauchy σ [kPa]", "Cauchy residual [kPa]"},
	} {
		in := figureInput(c.kind, "1:1", "1:0.5")
		fit := string(mustRender(t, in.fitGridFigure(false)).svg)
		res := string(mustRender(t, in.residualFigure(false, false)).svg)
		if n := strings.Count(fit, ">"+c.axis+"<"); n != 2 {
			t.Errorf("%s: %d fit tiles labelled %q, want 2", c.kind, n, c.axis)
		}
		if n := strings.Count(res, ">"+c.residual+"<"); n != 2 {
			t.Errorf("%s: %d residual tiles labelled %q, want 2", c.kind, n, c.residual)
		}
	}
}

// The helper that finds clipped text finds it: a label placed past the
// right edge is reported, one inside is not.
func TestTextsOutsideSeesAClippedLabel(t *testing.T) {
	w := 100 * vg.Inch / 72
	mk := func(x float64) renderedFigure {
		return renderedFigure{figure: &figure{w: w}, svg: []byte(fmt.Sprintf(`<text x="%g" y="-10" transform="scale(1, -1)" style="font-size:8px">stretch λ</text>`, x))}
	}
	if got := textsOutside(mk(90)); len(got) != 1 {
		t.Errorf("a label from 90 pt in a 100 pt figure: %v, want reported", got)
	}
	if got := textsOutside(mk(10)); len(got) != 0 {
		t.Errorf("a label from 10 pt: %v, want none", got)
	}
	if math.Abs(w.Points()-100) > 1e-9 {
		t.Fatalf("width %v", w.Points())
	}
}

// The shear figure's caption says what its tiles and legend show: the
// markers of each component, the model line, the 95 % band and the
// held-out prediction. Until 2026-12-05 it named neither the band nor the
// dashed held-out line that the legend lists (demo membrane-M3-sutured).
func TestShearCaptionNamesWhatIsDrawn(t *testing.T) {
	in := figureInput("nominal", "1:1", "1:0.5")
	tb := in.table
	tb.comps = append(tb.comps, "12", "21")
	for _, pr := range tb.protocols {
		for range 2 {
			z := make([]float64, len(pr.F))
			pr.measured, pr.model, pr.residual = append(pr.measured, z), append(pr.model, z), append(pr.residual, z)
			pr.contrib[0] = append(pr.contrib[0], z)
		}
	}
	in.heldout = &heldoutTable{comps: tb.comps, stress: map[string][][]float64{}}
	in.curves = &curveTable{}
	f := in.shearFigure(false)
	for _, want := range []string{"triangles P12, crosses P21", "Solid: the fitted model", "shaded: its 95 % confidence band", "Dashed, on top: the held-out prediction"} {
		if !strings.Contains(f.caption, want) {
			t.Errorf("shear caption lacks %q: %s", want, f.caption)
		}
	}
	svg := string(mustRender(t, f).svg)
	for _, want := range []string{"P12 model, 95 % band", "P12 held-out prediction", "P21 measured"} {
		if !strings.Contains(svg, ">"+want+"<") {
			t.Errorf("shear legend lacks %q", want)
		}
	}
	in.heldout, in.curves = nil, nil
	if c := in.shearFigure(false).caption; strings.Contains(c, "held-out") || strings.Contains(c, "band") {
		t.Errorf("without heldout.csv and curves.csv the caption still names them: %s", c)
	}
}

// The two panels of an angle's profile have frames of one height, and
// both angle axes give their unit. On the plotting library's log scale
// the whole-range panel's frame was a fifth shorter than its neighbour's
// (the library made room above it for the axis title's box, which it
// places at the arithmetic middle of a log range): demo membrane-M1's
// left y axis ran from 73.6 to 129.4 pt, the right one to 151.4 pt. The
// log axis's labels stay: 1, 100, 1e4. Invented profile (a parabola in
// the angle about ±30° rising to 18 000 thresholds, crossing the
// threshold at ±0.45°).
func TestProfilePanelsOfOneHeight(t *testing.T) {
	var angles, loss []card.Num
	for a := -90.0; a <= 90; a += 4 {
		angles = append(angles, card.Num(a))
		d := math.Min(math.Abs(a-30), math.Abs(a+30))
		loss = append(loss, card.Num(1+5*d*d))
	}
	in := &Input{fit: card.FitSection{Loss: 1, Profiles: []card.ProfileCard{{Name: "angle", AnglesDeg: angles, Loss: loss,
		OptimumDeg: 30, Threshold: 2, IntervalDeg: [2]card.Num{29.55, 30.45}, Closed: true, Mirrored: true}}}}
	r := mustRender(t, in.profileFigure())
	svg := string(r.svg)
	re := regexp.MustCompile(`<path d="M([0-9.]+),([0-9.]+)L([0-9.]+),([0-9.]+)" style="fill:none;stroke:#000000;stroke-width:0.6"`)
	var spans [][2]float64
	for _, m := range re.FindAllStringSubmatch(svg, -1) {
		x0, _ := strconv.ParseFloat(m[1], 64)
		y0, _ := strconv.ParseFloat(m[2], 64)
		x1, _ := strconv.ParseFloat(m[3], 64)
		y1, _ := strconv.ParseFloat(m[4], 64)
		if x0 == x1 && y1-y0 > 40 { // a y axis, not a tick
			spans = append(spans, [2]float64{y0, y1})
		}
	}
	if len(spans) != 2 {
		t.Fatalf("%d y axes, want 2", len(spans))
	}
	if math.Abs(spans[0][0]-spans[1][0]) > 0.5 || math.Abs(spans[0][1]-spans[1][1]) > 0.5 {
		t.Errorf("y axes span %.1f–%.1f pt and %.1f–%.1f pt, want one height", spans[0][0], spans[0][1], spans[1][0], spans[1][1])
	}
	for _, want := range []string{">fibre angle [°] from axis 1 towards axis 2, whole range<", ">fibre angle [°], around the fitted angle<", ">1<", ">100<", ">1e4<"} {
		if !strings.Contains(svg, want) {
			t.Errorf("no text %s", want)
		}
	}
}

// The selection figure's axis "held-out error" has no unit; its caption
// says what the number is (the card's selection.heldout_metric, a
// normalised RMSE), which it did not.
func TestParetoCaptionSaysWhatTheErrorIs(t *testing.T) {
	sel := &card.SelectionSection{Chosen: "none-t1-p2", Pareto: []card.CandidateCard{
		{Name: "none-t1-p2", Layout: "none", Parameters: 2, HeldoutError: 0.02, HeldoutStdErr: 0.002, Chosen: true},
		{Name: "single-t2-p4", Layout: "single", Parameters: 4, HeldoutError: 0.019, HeldoutStdErr: 0.002}}}
	in := discoveredInput(false, nil, sel, nil)
	f := in.paretoFigure()
	if f == nil {
		t.Fatal("no selection figure")
	}
	if !strings.Contains(f.caption, "a normalised RMSE without unit") || !strings.Contains(f.caption, "selection.heldout_metric") {
		t.Errorf("caption does not say what the held-out error is: %s", f.caption)
	}
	mustRender(t, f)
}

// A mirror pair's two families carry the same share at every point. The
// load-sharing figure drew the second family's line over the first's at
// the same width, so the first (blue) vanished though the legend listed
// it (demo one-family-0-demiray fitted with the hgo preset); the first
// family's line is now wider and underneath. The legend lists the
// take-over mark only where one is drawn: here the fibres carry 80 % from
// the first point and no protocol has one.
func TestMirrorPairBothFamiliesVisible(t *testing.T) {
	in := figureInput("nominal", "1:1", "1:0.5")
	tb := in.table
	tb.terms = []string{"i1-lin", "fib-expsq@f1", "fib-expsq@f2"}
	for _, pr := range tb.protocols {
		m := pr.contrib[0]
		pr.contrib = [][][]float64{make([][]float64, 2), make([][]float64, 2), make([][]float64, 2)}
		for c := range 2 {
			for _, v := range m[c] {
				pr.contrib[0][c] = append(pr.contrib[0][c], 0.2*v)
				pr.contrib[1][c] = append(pr.contrib[1][c], 0.4*v)
				pr.contrib[2][c] = append(pr.contrib[2][c], 0.4*v)
			}
		}
	}
	f := in.splitFigure(false)
	svg := string(mustRender(t, f).svg)
	if strings.Contains(svg, "fibres take over half the load") {
		t.Error("the legend lists a take-over mark that no tile draws")
	}
	// In every tile, each of the first family's lines is wider than the
	// second family's and drawn before it (underneath).
	re := regexp.MustCompile(`style="fill:none;stroke:#(0072B2|D55E00);stroke-width:([0-9.]+)`)
	var blue, verm []float64
	order := ""
	for _, m := range re.FindAllStringSubmatch(svg, -1) {
		w, _ := strconv.ParseFloat(m[2], 64)
		if m[1] == "0072B2" {
			blue, order = append(blue, w), order+"b"
		} else {
			verm, order = append(verm, w), order+"v"
		}
	}
	// 2 tiles × 2 axes per family, and one legend sample per axis.
	if len(blue) != 6 || len(verm) != 6 {
		t.Fatalf("%d lines of family f1 and %d of f2, want 6 each", len(blue), len(verm))
	}
	for i := range blue {
		if !(blue[i] > verm[i]+0.8) {
			t.Errorf("line %d: family f1 %.1f pt wide, f2 %.1f pt: f2 hides f1 where they coincide", i, blue[i], verm[i])
		}
	}
	if !strings.HasPrefix(order, "bvbvbvbv") {
		t.Errorf("drawing order %s, want each f1 line before (under) its f2 line", order)
	}
}

// The presets figure draws the fitted model first and the presets over
// it: a preset identical to the fitted model (the hgo preset beside a
// discovered one family with fib-expsq, demo membrane-M1) then shows as
// dashes on the black line; drawn last, the heavy black line hid it while
// the legend listed it. Invented curves: the preset equals the model.
func TestPresetOverTheFittedModel(t *testing.T) {
	in := figureInput("nominal", "1:1", "1:0.5")
	in.curves = &curveTable{models: []string{"model", "hgo"}, protos: map[string]*curveRows{}}
	for _, pr := range in.table.protocols {
		nan := make([]float64, len(pr.F))
		for i := range nan {
			nan[i] = math.NaN()
		}
		same := [][]float64{pr.model[0], pr.model[1]}
		in.curves.protos[pr.label] = &curveRows{F: pr.F, stress: [][][]float64{same, same}, half: [][][]float64{{nan, nan}, {nan, nan}}}
	}
	svg := string(mustRender(t, in.presetsFigure(false)).svg)
	tiles := strings.Split(svg, "stroke:#E6E6E6")
	checked := 0
	for _, tile := range tiles {
		black := strings.Index(tile, "stroke:#000000;stroke-width:1.6")
		hgo := strings.Index(tile, "stroke:#E69F00;stroke-width:1.1")
		if black < 0 || hgo < 0 {
			continue
		}
		checked++
		if hgo < black {
			t.Error("a tile draws the hgo preset before (under) the fitted model's heavy black line")
		}
	}
	if checked < 2 {
		t.Fatalf("%d tiles with both lines, want 2", checked)
	}
	if f := in.presetsFigure(false); !strings.Contains(f.caption, "drawn underneath") {
		t.Errorf("caption does not say the model is drawn underneath: %s", f.caption)
	}
}
