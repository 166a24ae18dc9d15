package card

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/terms"
)

// oneFamily is a card model with one fibre family at −25°.
func oneFamily() *aniso.Model {
	return &aniso.Model{Families: []aniso.Family{{Name: "f1", Angle: aniso.Rad(-25)}}, Terms: []aniso.Term{
		{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 4},
		{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 60, Params: []float64{8}},
	}}
}

// A card whose angle sign is unknown lists the equivalent layouts as
// complete models, the card's own among them; they read back through the
// card's own validation and give the card's normal stresses under a pure
// biaxial stretch (mirror symmetry, common practice). A card without the
// section derives the same list from angle_sign_known = false.
func TestAlternativesSection(t *testing.T) {
	m := oneFamily()
	c := FromModel(m, "kPa", []bool{false})
	c.Alternatives = NewAlternativesSection(m, "kPa", []bool{false})
	if c.Alternatives == nil || len(c.Alternatives.Models) != 3 {
		t.Fatalf("alternatives: %+v", c.Alternatives)
	}
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	if err := validate(t, compileSchema(t), b); err != nil {
		t.Errorf("schema: %v\n%s", err, b)
	}
	c2, m2, err := Parse(bytes.NewReader(b), "card.json")
	if err != nil {
		t.Fatal(err)
	}
	alts, err := c2.AlternativeModels(m2)
	if err != nil {
		t.Fatal(err)
	}
	derived, err := FromModel(m, "kPa", []bool{false}).AlternativeModels(m)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"single-plus", "single-minus", "mirror-pair"}
	if len(alts) != 3 || len(derived) != 3 {
		t.Fatalf("%d alternatives read, %d derived", len(alts), len(derived))
	}
	for i, a := range alts {
		if a.Name != want[i] || derived[i].Name != want[i] || a.AsCard != (a.Name == "single-minus") || a.AsCard != derived[i].AsCard {
			t.Errorf("alternative %d: %s (as card %v), derived %s", i, a.Name, a.AsCard, derived[i].Name)
		}
		for _, F := range [][4]float64{{1.2, 0, 0, 1.1}, {0.95, 0, 0, 1.25}} {
			r0, _ := m.Evaluate(F)
			r, err := a.Model.Evaluate(F)
			if err != nil || math.Abs(r.Cauchy[0]-r0.Cauchy[0]) > 1e-12*math.Abs(r0.Cauchy[0]) || math.Abs(r.Cauchy[1]-r0.Cauchy[1]) > 1e-12*math.Abs(r0.Cauchy[1]) {
				t.Errorf("%s at %v: σ = %v, the card %v (%v)", a.Name, F, r.Cauchy, r0.Cauchy, err)
			}
		}
	}
	pair := alts[2].Model
	if len(pair.Families) != 2 || pair.Terms[1].Weight != 30 || pair.Terms[2].Weight != 30 {
		t.Errorf("mirror pair: %+v", pair)
	}
	// Known signs: nothing listed or derived.
	if s := NewAlternativesSection(m, "kPa", []bool{true}); s != nil {
		t.Error("known sign: alternatives listed")
	}
	if a, _ := FromModel(m, "kPa", nil).AlternativeModels(m); a != nil {
		t.Error("a card that does not state the sign: alternatives derived")
	}
	// A broken alternative is named by its JSON path.
	bad := strings.Replace(string(b), `"weight": 30`, `"weight": -30`, 1)
	c3, m3, err := Parse(strings.NewReader(bad), "card.json")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := c3.AlternativeModels(m3); err == nil || !strings.Contains(err.Error(), "$.alternatives.models[2].terms[1].weight") {
		t.Errorf("broken alternative: %v", err)
	}
}

// data_range keeps F12 and F21 apart, and a pure stretch is inside exactly
// when the data hold an unsheared point: on a sutured specimen sheared at
// every point (F12 and F21 of one sign) it is outside, on one that also has
// unsheared points it is inside. Cards without the per-component ranges
// fall back to the pooled one.
func TestDataRangeShearComponents(t *testing.T) {
	s12, s21 := Interval{0.006, 0.2}, Interval{0.005, 0.12}
	sutured := &DataRange{Stretch1: Interval{1, 1.3}, Stretch2: Interval{1, 1.3}, Shear: Interval{0.005, 0.2}, Shear12: &s12, Shear21: &s21}
	m := &aniso.Model{}
	if out := sutured.Outside(m, [4]float64{1.1, 0.1, 0.1, 1.1}); len(out) != 0 {
		t.Errorf("inside point flagged: %v", out)
	}
	if out := sutured.Outside(m, [4]float64{1.1, 0.15, 0.15, 1.1}); len(out) != 1 || !strings.HasPrefix(out[0], "F21") {
		t.Errorf("F21 = 0.15 beyond its own range but within the pooled one: %v", out)
	}
	if out := sutured.Outside(m, [4]float64{1.1, 0, 0, 1.1}); len(out) != 2 {
		t.Errorf("pure stretch on a specimen sheared everywhere: %v", out)
	}
	z12, z21 := Interval{0, 0.2}, Interval{0, 0.12}
	mixed := &DataRange{Stretch1: Interval{1, 1.3}, Stretch2: Interval{1, 1.3}, Shear: Interval{0, 0.2}, Shear12: &z12, Shear21: &z21}
	if out := mixed.Outside(m, [4]float64{1.1, 0, 0, 1.1}); len(out) != 0 {
		t.Errorf("pure stretch with unsheared points fitted: %v", out)
	}
	old := &DataRange{Stretch1: Interval{1, 1.3}, Stretch2: Interval{1, 1.3}, Shear: Interval{0.005, 0.2}}
	if out := old.Outside(m, [4]float64{1.1, 0.15, 0.15, 1.1}); len(out) != 0 {
		t.Errorf("a card without per-component ranges: %v", out)
	}
	bad := &DataRange{Stretch1: Interval{1, 1.3}, Stretch2: Interval{1, 1.3}, Shear: Interval{0, 0.2}, Shear12: &Interval{0.3, 0.1}}
	if err := bad.Validate(); err == nil || !strings.Contains(err.Error(), "shear_12") {
		t.Errorf("a reversed shear_12: %v", err)
	}
}
