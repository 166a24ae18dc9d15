package main

import (
	"fmt"
	"math"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/cmd/weft/internal/fe"
)

// namedModel is a selection candidate's model with its name.
type namedModel struct {
	name  string
	model *aniso.Model
}

// nearEquivalentModels builds the models of the card's near-equivalent
// candidates (card.Card.NearEquivalents): the ones the held-out protocols
// could not tell from the chosen model.
func nearEquivalentModels(c *card.Card) ([]namedModel, error) {
	var out []namedModel
	for _, cc := range c.NearEquivalents() {
		m, err := c.CandidateModelOf(cc)
		if err != nil {
			return nil, fmt.Errorf("selection candidate %s: %v", cc.Name, err)
		}
		out = append(out, namedModel{cc.Name, m})
	}
	return out, nil
}

// stressValues lists a response's stresses in fe.StressColumnNames order.
func stressValues(r aniso.Response) [7]float64 {
	return [7]float64{r.Cauchy[0], r.Cauchy[1], r.Cauchy[2], r.Nominal[0], r.Nominal[1], r.Nominal[2], r.Nominal[3]}
}

// alikeBand gathers, row by row, the range of the stresses of the card's
// model and its near-equivalent models, and what predict's comment lines
// say of it.
type alikeBand struct {
	// widest is the largest high − low of each stress column, at row
	// widestLine; largest the largest |stress| of the card's own model
	// over every column and row, the yardstick of the spread (a shear
	// column's own largest value can be near zero).
	widest     [7]float64
	widestLine [7]int
	largest    float64
	// failed counts, per near-equivalent model, the rows where it could
	// not be evaluated (beyond a limit of its terms) and was left out of
	// the band.
	failed map[string]int
}

// add returns the band at one row: the lowest and highest of own (the
// card's model) and of every near-equivalent model evaluated at F.
func (b *alikeBand) add(own [7]float64, F [4]float64, alike []namedModel, line int) (lo, hi [7]float64) {
	lo, hi = own, own
	for _, a := range alike {
		r, err := a.model.Evaluate(F)
		if err != nil {
			if b.failed == nil {
				b.failed = map[string]int{}
			}
			b.failed[a.name]++
			continue
		}
		for j, x := range stressValues(r) {
			lo[j], hi[j] = math.Min(lo[j], x), math.Max(hi[j], x)
		}
	}
	for j := range own {
		b.largest = math.Max(b.largest, math.Abs(own[j]))
		if w := hi[j] - lo[j]; w > b.widest[j] {
			b.widest[j], b.widestLine[j] = w, line
		}
	}
	return lo, hi
}

// notes says which models the band holds and where it is widest.
func (b *alikeBand) notes(alike []namedModel, unit string) []string {
	var names []string
	for _, a := range alike {
		names = append(names, a.name)
	}
	out := []string{fmt.Sprintf("%d other model(s) of the fit's selection predicted the held-out protocols as well as this one (held-out error within one standard error of the chosen model's): %s. The alike_low_ and alike_high_ columns give, at each row, the lowest and highest stress of these and the card's own model: where they part, the tested protocols do not settle the prediction, whatever the held-out error says",
		len(alike), strings.Join(names, ", "))}
	at := 0
	for j := range b.widest {
		if b.widest[j] > b.widest[at] {
			at = j
		}
	}
	if b.largest > 0 {
		out = append(out, fmt.Sprintf("the widest part is in %s: %.4g %s at line %d, %.1f %% of the largest stress of the card's model along this path (%.4g %s)", fe.StressColumnNames[at], b.widest[at], unit, b.widestLine[at], 100*b.widest[at]/b.largest, b.largest, unit))
	}
	for _, a := range alike {
		if n := b.failed[a.name]; n > 0 {
			out = append(out, fmt.Sprintf("%s could not be evaluated at %d row(s) (beyond a limit of its terms) and is left out of the band there", a.name, n))
		}
	}
	return out
}
