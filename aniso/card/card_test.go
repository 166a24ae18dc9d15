package card

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/terms"
)

func sampleModel() *aniso.Model {
	return &aniso.Model{
		Families: []aniso.Family{{Name: "f1", Angle: 40 * math.Pi / 180, Dispersion: 0.1}, {Name: "f2", Angle: -75 * math.Pi / 180}},
		Terms: []aniso.Term{
			{Shape: terms.Lookup("i1-exp"), Family: -1, Weight: 2.5, Params: []float64{3}},
			{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 12, Params: []float64{4.5}},
			{Shape: terms.Lookup("cof-quad"), Family: 1, Weight: 0.7},
		},
	}
}

// A card written by weft reads back to the same model, keeps unknown keys,
// and writes the same bytes again (determinism).
func TestRoundTrip(t *testing.T) {
	m := sampleModel()
	c := FromModel(m, "kPa", []bool{false, true})
	c.Extra = map[string]json.RawMessage{"zz_future": json.RawMessage(`{"a":1}`)}
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	c2, m2, err := Parse(bytes.NewReader(b), "card.json")
	if err != nil {
		t.Fatal(err)
	}
	for i := range m.Families {
		if math.Abs(m.Families[i].Angle-m2.Families[i].Angle) > 1e-15 || m.Families[i].Dispersion != m2.Families[i].Dispersion {
			t.Errorf("family %d: %+v vs %+v", i, m.Families[i], m2.Families[i])
		}
	}
	for i := range m.Terms {
		a, b := m.Terms[i], m2.Terms[i]
		if a.Shape != b.Shape || a.Weight != b.Weight || a.Family != b.Family || len(a.Params) != len(b.Params) || (len(a.Params) > 0 && a.Params[0] != b.Params[0]) {
			t.Errorf("term %d: %+v vs %+v", i, a, b)
		}
	}
	if _, ok := c2.Extra["zz_future"]; !ok {
		t.Error("unknown key lost on read")
	}
	b2, _ := c2.Marshal()
	if !bytes.Equal(b, b2) {
		t.Errorf("rewriting a card changed it:\n%s\n%s", b, b2)
	}
	if !strings.Contains(c.Energy, "E_f1") || !strings.Contains(c.Energy, "2.5*(exp(3*(I1-3))-1)/3") {
		t.Errorf("energy text %q", c.Energy)
	}
}

func TestWrapDeg(t *testing.T) {
	for _, c := range [][2]float64{{0, 0}, {90, 90}, {-90, 90}, {100, -80}, {-100, 80}, {270, 90}, {179, -1}, {-179, 1}} {
		if got := aniso.WrapDeg(c[0]); math.Abs(got-c[1]) > 1e-12 {
			t.Errorf("WrapDeg(%g) = %g, want %g", c[0], got, c[1])
		}
	}
}

// The LaTeX energy keeps a product of a number and a parameter readable:
// the fib-expsq template w/(2b) with w = 2.3632 and b = 0.8393 must read
// 2.3632/(2·0.8393), not 2.3632/20.8393.
func TestEnergyLaTeXProducts(t *testing.T) {
	m := &aniso.Model{Families: []aniso.Family{{Name: "f1"}}, Terms: []aniso.Term{
		{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 2.3632, Params: []float64{0.8393}}}}
	_, l := EnergyText(m, FromModel(m, "kPa", nil))
	if !strings.Contains(l, `\frac{2.3632}{2\cdot 0.8393}`) || strings.Contains(l, "20.8393") {
		t.Errorf("LaTeX energy %s", l)
	}
}

// A planar family's concentration survives a round trip, the energy text
// writes its terms as averages over the family's directions, and a card
// holding both a concentration and a κ is refused.
func TestPlanarRoundTrip(t *testing.T) {
	m := &aniso.Model{
		Families: []aniso.Family{{Name: "f1", Angle: 30 * math.Pi / 180, Planar: true, Concentration: 2.5}},
		Terms: []aniso.Term{
			{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 4},
			{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 12, Params: []float64{4.5}},
		},
	}
	c := FromModel(m, "kPa", nil)
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(string(b), `"dispersion": 0`) || !strings.Contains(string(b), `"concentration": 2.5`) {
		t.Errorf("planar family written as\n%s", b)
	}
	_, m2, err := Parse(bytes.NewReader(b), "card.json")
	if err != nil {
		t.Fatal(err)
	}
	if f := m2.Families[0]; !f.Planar || f.Concentration != 2.5 {
		t.Errorf("family read back as %+v", f)
	}
	if !strings.Contains(c.Energy, "<12*(exp(4.5*E^2)-1)/(2*4.5)>_f1") || !strings.Contains(c.EnergyLaTeX, `\left\langle`) {
		t.Errorf("energy %q / %q", c.Energy, c.EnergyLaTeX)
	}
	bad := strings.Replace(string(b), `"concentration": 2.5`, `"concentration": 2.5, "dispersion": 0.1`, 1)
	if _, _, err := Parse(strings.NewReader(bad), "card.json"); err == nil || !strings.Contains(err.Error(), "concentration") {
		t.Errorf("both spreads accepted: %v", err)
	}
}

// Cards with principal-stretch and recruitment terms: the energy is
// written with the numbers substituted (a negative exponent in brackets,
// so 2/(-7.5)^2 is not read as −(7.5²); LaTeX symbols \alpha, \lambda_a,
// \Delta replaced), the Δ = 0 limit form where the spread is 0, and the
// card reads back to the same model, with every parameter.
func TestEnergyTextNewShapes(t *testing.T) {
	m := &aniso.Model{Families: []aniso.Family{{Name: "f1", Angle: 0.3}}, Terms: []aniso.Term{
		{Shape: terms.Lookup("ps-pos"), Family: -1, Weight: 1.5, Params: []float64{9}},
		{Shape: terms.Lookup("ps-neg"), Family: -1, Weight: 0.25, Params: []float64{-7.5}},
		{Shape: terms.Lookup("fib-recruit"), Family: 0, Weight: 800, Params: []float64{1.04, 0.1}},
	}}
	c := FromModel(m, "kPa", nil)
	for _, want := range []string{"1.5*(2/9^2)*(λ1^9 + λ2^9 + λ3^9 - 3) + 0.25*(2/(-7.5)^2)*(λ1^(-7.5)", "800*[λ_f1^2*ln(min(max(λ_f1,1.04),1.04+0.1)/1.04)",
		"/(2*0.1)"} {
		if !strings.Contains(c.Energy, want) {
			t.Errorf("energy %q lacks %q", c.Energy, want)
		}
	}
	for _, want := range []string{`\frac{2}{(-7.5)^{2}}`, `\lambda_1^{(-7.5)}`, `\frac{800}{2\cdot 0.1}`, `\ln\frac{\min(\max(\lambda_{f1},1.04),1.04+0.1)}{1.04}`} {
		if !strings.Contains(c.EnergyLaTeX, want) {
			t.Errorf("LaTeX energy %q lacks %q", c.EnergyLaTeX, want)
		}
	}
	for _, bad := range []string{`\alpha`, `\lambda_a`, `\Delta`, `\lambda_f`, "α", "λa", "Δ", "λ_f "} {
		if strings.Contains(c.Energy+c.EnergyLaTeX, bad) {
			t.Errorf("symbol %q left unsubstituted: %s | %s", bad, c.Energy, c.EnergyLaTeX)
		}
	}
	m.Terms[2].Params[1] = 0
	if e, _ := EnergyText(m, c); !strings.Contains(e, "800*<λ_f1-1.04>^2/(2*1.04)") {
		t.Errorf("Δ = 0 energy %q", e)
	}
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	_, m2, err := Parse(bytes.NewReader(b), "card.json")
	if err != nil {
		t.Fatal(err)
	}
	for i := range m.Terms {
		a, b := m.Terms[i], m2.Terms[i]
		if i == 2 {
			a.Params = []float64{1.04, 0.1}
		}
		if a.Shape != b.Shape || a.Weight != b.Weight || a.Family != b.Family || len(a.Params) != len(b.Params) {
			t.Fatalf("term %d: %+v vs %+v", i, a, b)
		}
		for j := range a.Params {
			if a.Params[j] != b.Params[j] {
				t.Errorf("term %d parameter %d: %g vs %g", i, j, a.Params[j], b.Params[j])
			}
		}
	}
}

// A card whose verdict claims fibre families carries FamiliesCaution
// after the standard cautions; one without fibres, undecided, or without a
// verdict does not.
func TestFamiliesCautionFollowsTheVerdict(t *testing.T) {
	for families, want := range map[string]bool{"1": true, "2": true, "1-or-mirror-pair": true, "0": false, "undecided": false, "": false} {
		c := &Card{}
		if families != "" {
			c.Verdict = &VerdictSection{Families: families}
		}
		got := CautionsOf(c)
		has := len(got) > 0 && got[len(got)-1] == FamiliesCaution
		if has != want || len(got) != len(Cautions)+map[bool]int{true: 1}[want] {
			t.Errorf("verdict %q: cautions %q", families, got)
		}
	}
}

// A number Go writes in e-notation is typeset as a power of ten in the
// LaTeX energy: "7.80914e-08" inside $...$ reads as 7.80914e − 08 (a
// product with e), not as 7.80914 × 10⁻⁸ (TeX's math mode sets the
// letters as variables; common practice). The plain text keeps
// e-notation, which every program reads (audit 2026-12-05, a weight of
// 7.8e-8 kPa on testdata/i8-coupled-10-70-sutured.csv).
func TestEnergyLaTeXPowersOfTen(t *testing.T) {
	m := &aniso.Model{Families: []aniso.Family{{Name: "f1", Angle: aniso.Rad(30)}}, Terms: []aniso.Term{
		{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 7.80914e-08},
		{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 12, Params: []float64{2.5e-7}},
	}}
	c := FromModel(m, "kPa", nil)
	for _, want := range []string{`7.80914 \times 10^{-8}`, `2.5 \times 10^{-7}`} {
		if !strings.Contains(c.EnergyLaTeX, want) {
			t.Errorf("LaTeX energy %q lacks %q", c.EnergyLaTeX, want)
		}
	}
	if strings.Contains(c.EnergyLaTeX, "e-0") || !strings.Contains(c.Energy, "7.80914e-08") {
		t.Errorf("energy %q / %q", c.Energy, c.EnergyLaTeX)
	}
}

// A cofactor-fibre term names its family in the LaTeX energy as in the
// plain text (K_f1): with two families an unnamed K does not say whose
// cofactor stretch it is (K = |cof(F) a0|², each family's own a0;
// Schröder & Neff 2003). Until 2026-12-05 the LaTeX of cof-quad read
// \langle K-1\rangle on testdata/i8-coupled-10-70-sutured.csv's fit.
func TestEnergyLaTeXNamesTheCofactorFamily(t *testing.T) {
	m := &aniso.Model{Families: []aniso.Family{{Name: "f1", Angle: aniso.Rad(10)}, {Name: "f2", Angle: aniso.Rad(70)}}, Terms: []aniso.Term{
		{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 5},
		{Shape: terms.Lookup("cof-quad"), Family: 1, Weight: 13},
	}}
	c := FromModel(m, "kPa", nil)
	if !strings.Contains(c.Energy, "K_f2-1") || !strings.Contains(c.EnergyLaTeX, `\langle K_{f2}-1\rangle`) {
		t.Errorf("energy %q / %q", c.Energy, c.EnergyLaTeX)
	}
}
