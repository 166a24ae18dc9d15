package prediction

import (
	"fmt"
	"math"
	"strings"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/cmd/weft/internal/fe"
)

// alikeBand gathers, row by row, the range of the stresses of the card's
// model and its near-equivalent models (card.AlikeBand), and what
// predict's comment lines say of it.
type alikeBand struct {
	// widest is the largest high − low of each stress column, at row
	// widestLine; largest the largest |stress| of the card's own model
	// over every column and row, the yardstick of the spread (a shear
	// column's own largest value can be near zero).
	widest     [7]float64
	widestLine [7]int
	largest    float64
	// failed counts, per near-equivalent model, the rows where it could
	// not be evaluated and was left out of the band.
	failed map[string]int
}

// add records one row's band.
func (b *alikeBand) add(band card.Band, line int) {
	for _, name := range band.Missing {
		if b.failed == nil {
			b.failed = map[string]int{}
		}
		b.failed[name]++
	}
	for j, x := range band.Own {
		b.largest = max(b.largest, math.Abs(x))
		if w := band.High[j] - band.Low[j]; w > b.widest[j] {
			b.widest[j], b.widestLine[j] = w, line
		}
	}
}

// notes says which models the band holds and where it is widest, and,
// when outside of the rows lie outside the card's fitted data range, that
// the band says nothing there.
func (b *alikeBand) notes(alike []card.AlikeModel, unit string, outside, rows int) []string {
	var names []string
	for _, a := range alike {
		if !a.Reflection {
			names = append(names, a.Name)
		}
	}
	these := "these and the card's own model"
	if len(names) < len(alike) {
		these = "these, the card's own model and their reflections about axis 1 (fibre angles negated: the data carried no shear information, which cannot tell a model from its reflection; the shear stresses of the two are opposite)"
	}
	out := []string{fmt.Sprintf("%d other model(s) of the fit's selection predicted the held-out protocols as well as this one (held-out error within one standard error of the chosen model's): %s. The alike_low_ and alike_high_ columns give, at each row, the lowest and highest stress of %s: where they part, the tested protocols do not settle the prediction, whatever the held-out error says",
		len(names), strings.Join(names, ", "), these)}
	at := 0
	for j := range b.widest {
		if b.widest[j] > b.widest[at] {
			at = j
		}
	}
	if b.largest > 0 {
		out = append(out, fmt.Sprintf("the widest part is in %s: %.4g %s at line %d, %.1f %% of the largest stress of the card's model along this path (%.4g %s)", fe.StressColumnNames[at], b.widest[at], unit, b.widestLine[at], 100*b.widest[at]/b.largest, b.largest, unit))
	}
	if outside > 0 {
		// The near-equivalent models were told apart from the card's only
		// on the tested range; beyond it they extrapolate the same forms
		// alike and can agree with each other far from the material.
		out = append(out, fmt.Sprintf("%d of %d rows lie outside the fitted data range (data_range): there every model of the band extrapolates, and a narrow band does not mean the tests settle the prediction (a sutured specimen whose fibres were stretched to 1.013 in the tests, predicted on a strip: band 1.2 %%, the card's model off by 78 %% of the peak)", outside, rows))
	}
	for _, a := range alike {
		if n := b.failed[a.Name]; n > 0 {
			out = append(out, fmt.Sprintf("%s could not be evaluated at %d row(s) (beyond a limit of its terms) and is left out of the band there", a.Name, n))
		}
	}
	return out
}
