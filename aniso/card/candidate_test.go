package card

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/terms"
)

// A selection candidate's model survives the card: written into a
// candidate, marshalled with the card, parsed strictly and rebuilt, it
// gives the same stress at a sheared F as the model it came from (a round
// trip: what is checked is that no number is lost on the way).
func TestCandidateModelRoundTrip(t *testing.T) {
	m := &aniso.Model{
		Families: []aniso.Family{{Name: "f1", Angle: aniso.Rad(-27.5)}, {Name: "f2", Angle: aniso.Rad(61), Planar: true, Concentration: 3.25}},
		Terms: []aniso.Term{
			{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 3.75},
			{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 41.5, Params: []float64{6.125}},
			{Shape: terms.Lookup("fib-expsq"), Family: 1, Weight: 0, Params: []float64{2}},
		},
	}
	c := FromModel(m, "kPa", nil)
	c.Selection = &SelectionSection{Rule: "r", Pareto: []CandidateCard{{Name: "x", Model: NewCandidateModel(m)}}}
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Count(string(b), `"formula"`) != len(m.Terms) {
		t.Error("a candidate's terms carry their formula; only the card's own terms do")
	}
	c2, _, err := ParseLimits(bytes.NewReader(b), "model.json", Limits{})
	if err != nil {
		t.Fatal(err)
	}
	got, err := c2.CandidateModelOf(&c2.Selection.Pareto[0])
	if err != nil {
		t.Fatal(err)
	}
	F := [4]float64{1.12, 0.04, -0.03, 1.05}
	a, err := m.Evaluate(F)
	if err != nil {
		t.Fatal(err)
	}
	g, err := got.Evaluate(F)
	if err != nil {
		t.Fatal(err)
	}
	for i := range a.Cauchy {
		if math.Abs(a.Cauchy[i]-g.Cauchy[i]) > 1e-12*math.Abs(a.Cauchy[i]) {
			t.Errorf("σ[%d]: rebuilt %.15g, original %.15g", i, g.Cauchy[i], a.Cauchy[i])
		}
	}
	if _, err := c2.CandidateModelOf(&CandidateCard{Name: "old"}); err == nil {
		t.Error("a candidate without a model must say so")
	}
}
