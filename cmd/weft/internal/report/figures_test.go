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
