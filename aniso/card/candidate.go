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

// finite reports whether v is a number other than ±Inf (a Num that was
// null in the card reads as NaN).
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
