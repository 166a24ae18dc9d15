package card

import (
	"errors"
	"math"

	"github.com/weft-tools/weft/aniso"
)

// CandidateModel is a selection candidate's fitted model in the card's own
// form: its fibre families and weighted terms, weights in the card's
// stress unit. It lets a reader recompute the candidate's predictions —
// for instance to compare the forms the selection could not tell apart —
// without the data. Family angles are written as fitted; where the card's
// families say the sign is not known, neither is the sign of these.
type CandidateModel struct {
	Families []Family `json:"families"`
	Terms    []Term   `json:"terms"`
}

// NewCandidateModel writes m as a CandidateModel.
func NewCandidateModel(m *aniso.Model) *CandidateModel {
	c := FromModel(m, "", nil)
	cm := &CandidateModel{Families: c.Families, Terms: c.Terms}
	for i := range cm.Terms {
		cm.Terms[i].Formula = ""
	}
	return cm
}

// CandidateModelOf validates a candidate's model and builds it, in the
// stress unit of card c; the error says why it cannot (a card written
// before candidates carried their model has none).
func (c *Card) CandidateModelOf(cc *CandidateCard) (*aniso.Model, error) {
	if cc.Model == nil {
		return nil, errors.New("the candidate carries no model (the card was written by a weft that did not record it)")
	}
	tmp := Card{Format: Format, StressUnit: c.StressUnit, Families: cc.Model.Families, Terms: cc.Model.Terms}
	return tmp.Model()
}

// NearEquivalents returns the selection's other candidates — discovered
// forms and classical presets — that predicted the held-out protocols as
// well as the chosen one: their mean held-out error is not above the
// chosen candidate's by more than its standard error (the yardstick of
// the one-standard-error rule, Hastie, Tibshirani & Friedman 2009, §7.10),
// and each carries its model. The tested protocols do not tell these
// models from the chosen one, so where their predictions part, a protocol
// that was not tested is not settled by the data. nil when the card has no
// selection or its chosen candidate was not cross-validated.
func (c *Card) NearEquivalents() []*CandidateCard {
	sel := c.Selection
	if sel == nil {
		return nil
	}
	var chosen *CandidateCard
	for i := range sel.Pareto {
		if sel.Pareto[i].Chosen {
			chosen = &sel.Pareto[i]
		}
	}
	if chosen == nil || !finite(float64(chosen.HeldoutError)) {
		return nil
	}
	limit := float64(chosen.HeldoutError)
	if se := float64(chosen.HeldoutStdErr); finite(se) {
		limit += se
	}
	var out []*CandidateCard
	for _, group := range [][]CandidateCard{sel.Pareto, sel.Presets} {
		for i := range group {
			cc := &group[i]
			if cc == chosen || cc.Model == nil || !finite(float64(cc.HeldoutError)) || float64(cc.HeldoutError) > limit {
				continue
			}
			out = append(out, cc)
		}
	}
	return out
}

// finite reports whether v is a number other than ±Inf (a Num that was
// null in the card reads as NaN).
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
