package aniso

import (
	"crypto/sha256"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"github.com/weft-tools/weft/terms"
)

const deg = math.Pi / 180

// refCase mirrors one entry of testdata/stress-cases.json, in that file's
// own words: "rate" is its name for the exponential shapes' coefficient,
// which the catalogue calls stiffening. The file is kept byte for byte as
// the shared reference set gave it (TestReferenceCasesUnchanged).
type refCase struct {
	Name  string `json:"name"`
	Note  string `json:"note"`
	Terms []struct {
		Inv    string   `json:"inv"`
		Form   string   `json:"form"`
		W      float64  `json:"w"`
		Rate   *float64 `json:"rate"`
		Limit  *float64 `json:"limit"`
		Family *int     `json:"family"`
	} `json:"terms"`
	Families []struct {
		AngleDeg float64 `json:"angle_deg"`
		Kappa    float64 `json:"kappa"`
	} `json:"families"`
	F       map[string]float64 `json:"F"`
	Cauchy  map[string]float64 `json:"cauchy_kPa"`
	Nominal map[string]float64 `json:"nominal_kPa"`
}

// refShape maps the reference file's (argument, form) names to catalogue ids.
var refShape = map[[2]string]string{
	{"I1", "lin"}: "i1-lin", {"I2", "lin"}: "i2-lin", {"I1", "exp"}: "i1-exp",
	{"I1", "gentlog"}: "i1-gent", {"I4", "expsq"}: "fib-expsq", {"I5", "quad"}: "i5-quad",
}

func loadRefCases(t *testing.T) []refCase {
	t.Helper()
	b, err := os.ReadFile("../testdata/stress-cases.json")
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Cases []refCase `json:"cases"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	return doc.Cases
}

func (c refCase) model(t *testing.T) *Model {
	m := &Model{}
	for _, f := range c.Families {
		m.Families = append(m.Families, Family{Angle: f.AngleDeg * deg, Dispersion: f.Kappa})
	}
	for _, rt := range c.Terms {
		id, ok := refShape[[2]string{rt.Inv, rt.Form}]
		if !ok {
			t.Fatalf("no catalogue shape for %s/%s", rt.Inv, rt.Form)
		}
		sh := terms.Lookup(id)
		term := Term{Shape: sh, Weight: rt.W, Family: -1}
		if rt.Family != nil {
			term.Family = *rt.Family
		}
		switch {
		case rt.Rate != nil:
			term.Params = []float64{*rt.Rate}
		case rt.Limit != nil:
			term.Params = []float64{*rt.Limit}
		}
		m.Terms = append(m.Terms, term)
	}
	if err := m.Validate(); err != nil {
		t.Fatal(err)
	}
	return m
}

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Max(1, math.Abs(want))
}

// TestReferenceCases checks all cases of the independent reference set
// (testdata/stress-cases.json: PyTorch automatic differentiation checked
// against SymPy) to 1e-9 relative.
func TestReferenceCases(t *testing.T) {
	cases := loadRefCases(t)
	if len(cases) != 57 {
		t.Fatalf("expected 57 reference cases, found %d", len(cases))
	}
	for i, c := range cases {
		m := c.model(t)
		F := [4]float64{c.F["F11"], c.F["F12"], c.F["F21"], c.F["F22"]}
		r, err := m.Evaluate(F)
		if err != nil {
			t.Fatalf("case %d %s: %v", i, c.Name, err)
		}
		for j, key := range []string{"11", "22", "12"} {
			if !near(r.Cauchy[j], c.Cauchy[key], 1e-9) {
				t.Errorf("case %d %s F=%v: cauchy_%s = %.15g, reference %.15g", i, c.Name, F, key, r.Cauchy[j], c.Cauchy[key])
			}
		}
		for j, key := range []string{"11", "22", "12", "21"} {
			if !near(r.Nominal[j], c.Nominal[key], 1e-9) {
				t.Errorf("case %d %s F=%v: nominal_%s = %.15g, reference %.15g", i, c.Name, F, key, r.Nominal[j], c.Nominal[key])
			}
		}
	}
}

// Neo-Hookean closed forms (Ogden 1984, Non-linear Elastic Deformations):
// equibiaxial σ = 2w(λ² − λ⁻⁴); strip-biaxial (λ2 = 1) σ11 = 2w(λ² − λ⁻²),
// σ22 = 2w(1 − λ⁻²).
func TestNeoHookeanClosedForms(t *testing.T) {
	w := 7.0
	m := &Model{Terms: []Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: w}}}
	for _, l := range []float64{0.9, 1, 1.05, 1.2, 1.5, 2} {
		r, err := m.Evaluate([4]float64{l, 0, 0, l})
		if err != nil {
			t.Fatal(err)
		}
		want := 2 * w * (l*l - math.Pow(l, -4))
		if !near(r.Cauchy[0], want, 1e-12) || !near(r.Cauchy[1], want, 1e-12) || r.Cauchy[2] != 0 {
			t.Errorf("equibiaxial λ=%g: σ = %v, closed form %g", l, r.Cauchy, want)
		}
		r, err = m.Evaluate([4]float64{l, 0, 0, 1})
		if err != nil {
			t.Fatal(err)
		}
		w11, w22 := 2*w*(l*l-1/(l*l)), 2*w*(1-1/(l*l))
		if !near(r.Cauchy[0], w11, 1e-12) || !near(r.Cauchy[1], w22, 1e-12) {
			t.Errorf("strip λ=%g: σ = %v, closed form (%g, %g)", l, r.Cauchy, w11, w22)
		}
		if !near(r.Nominal[0], w11/l, 1e-12) {
			t.Errorf("strip λ=%g: P11 = %g, closed form σ11/λ = %g", l, r.Nominal[0], w11/l)
		}
	}
}

// allTermsModel has every catalogue shape, with fibre shapes on two families.
func allTermsModel() *Model {
	m := &Model{Families: []Family{{Name: "f1", Angle: 35 * deg, Dispersion: 0.1}, {Name: "f2", Angle: -70 * deg}}}
	for i, sh := range terms.Catalogue() {
		t := Term{Shape: sh, Family: -1, Weight: 1 + 0.1*float64(i), Params: sh.DefaultParams()}
		if sh.Arg.NeedsFamily() {
			t.Family = i % 2
		}
		m.Terms = append(m.Terms, t)
	}
	return m
}

// The reference state is stress-free for every term (common practice; a
// requirement stated in the package documentation, Energy and the fibre
// switch).
func TestStressFreeReference(t *testing.T) {
	m := allTermsModel()
	r, err := m.Evaluate([4]float64{1, 0, 0, 1})
	if err != nil {
		t.Fatal(err)
	}
	for i, c := range r.TermCauchy {
		for _, v := range c {
			if math.Abs(v) > 1e-12 {
				t.Errorf("term %s: stress %v in the reference state", m.Terms[i].Shape.ID, c)
			}
		}
	}
	for _, p := range terms.Presets() {
		pm := presetModel(t, p)
		r, err := pm.Evaluate([4]float64{1, 0, 0, 1})
		if err != nil {
			t.Fatal(err)
		}
		for _, v := range r.Cauchy {
			if math.Abs(v) > 1e-12 {
				t.Errorf("preset %s: stress %v in the reference state", p.Name, r.Cauchy)
			}
		}
	}
}

func presetModel(t *testing.T, p *terms.Preset) *Model {
	t.Helper()
	m := &Model{}
	for i := 0; i < p.Families; i++ {
		m.Families = append(m.Families, Family{Angle: p.AnglesDeg[i] * deg, Dispersion: p.Kappa})
	}
	for _, pt := range p.Terms {
		sh := terms.Lookup(pt.ID)
		params := pt.Params
		if params == nil {
			params = sh.DefaultParams()
		}
		m.Terms = append(m.Terms, Term{Shape: sh, Family: pt.Family - 1, Weight: pt.Weight, Params: params})
	}
	if err := m.Validate(); err != nil {
		t.Fatal(err)
	}
	return m
}

// Objectivity / material frame: rotating the loading frame by φ and the
// fibre angles by φ together leaves the energy unchanged (Holzapfel 2000,
// §6.2; common practice). With F' = R F Rᵀ and a0' = R a0, every invariant
// is the same. The Fung-type term's axes are the tester's, not a family's;
// at its default b1 = b2 = b4, b3 = 0 its Q = b1 tr(E²) is in-plane
// isotropic, so it belongs here too (TestFungObjectivity covers other b).
func TestRotationInvariance(t *testing.T) {
	m := allTermsModel()
	F := [4]float64{1.18, 0.07, -0.04, 1.06}
	r0, err := m.Evaluate(F)
	if err != nil {
		t.Fatal(err)
	}
	for _, phi := range []float64{10, 45, 90, 137} {
		s, c := math.Sincos(phi * deg)
		// F' = R F Rᵀ with R = [[c, −s], [s, c]].
		f11, f12, f21, f22 := F[0], F[1], F[2], F[3]
		a11, a12 := c*f11-s*f21, c*f12-s*f22
		a21, a22 := s*f11+c*f21, s*f12+c*f22
		Fr := [4]float64{a11*c - a12*s, a11*s + a12*c, a21*c - a22*s, a21*s + a22*c}
		mr := *m
		mr.Families = append([]Family(nil), m.Families...)
		for i := range mr.Families {
			mr.Families[i].Angle += phi * deg
		}
		r, err := mr.Evaluate(Fr)
		if err != nil {
			t.Fatal(err)
		}
		if !near(r.Energy, r0.Energy, 1e-11) {
			t.Errorf("rotation %g°: energy %.15g, unrotated %.15g", phi, r.Energy, r0.Energy)
		}
		// The Cauchy stress rotates as σ' = R σ Rᵀ.
		s11, s22, s12 := r0.Cauchy[0], r0.Cauchy[1], r0.Cauchy[2]
		want := Sym{c*c*s11 - 2*c*s*s12 + s*s*s22, s*s*s11 + 2*c*s*s12 + c*c*s22, c*s*(s11-s22) + (c*c-s*s)*s12}
		for j := range want {
			if !near(r.Cauchy[j], want[j], 1e-10) {
				t.Errorf("rotation %g°: σ%d = %g, rotated %g", phi, j, r.Cauchy[j], want[j])
			}
		}
	}
}

// Mirror symmetry (package documentation): under a pure biaxial stretch a family at
// +α and one at −α give equal normal and opposite shear stresses.
func TestMirrorSymmetry(t *testing.T) {
	for _, a := range []float64{5, 29, 45, 62, 80} {
		plus := allTermsModel()
		minus := allTermsModel()
		for i := range plus.Families {
			plus.Families[i].Angle = a * deg
			minus.Families[i].Angle = -a * deg
		}
		for _, F := range [][4]float64{{1.2, 0, 0, 1.1}, {1.05, 0, 0, 1.3}, {0.95, 0, 0, 1.25}} {
			rp, err1 := plus.Evaluate(F)
			rm, err2 := minus.Evaluate(F)
			if err1 != nil || err2 != nil {
				t.Fatal(err1, err2)
			}
			if !near(rp.Cauchy[0], rm.Cauchy[0], 1e-12) || !near(rp.Cauchy[1], rm.Cauchy[1], 1e-12) || !near(rp.Cauchy[2], -rm.Cauchy[2], 1e-12) {
				t.Errorf("α=±%g, F=%v: %v vs %v", a, F, rp.Cauchy, rm.Cauchy)
			}
		}
	}
}

// One family at α with weight w equals a mirror pair at ±α with w/2 each in
// normal stress under pure biaxial stretch (package documentation, Mirror
// symmetry).
func TestOneFamilyEqualsMirrorPairInNormalStress(t *testing.T) {
	sh := terms.Lookup("fib-expsq")
	one := &Model{Families: []Family{{Angle: 33 * deg}}, Terms: []Term{{Shape: sh, Family: 0, Weight: 10, Params: []float64{2}}}}
	pair := &Model{Families: []Family{{Angle: 33 * deg}, {Angle: -33 * deg}}, Terms: []Term{
		{Shape: sh, Family: 0, Weight: 5, Params: []float64{2}}, {Shape: sh, Family: 1, Weight: 5, Params: []float64{2}}}}
	for _, F := range [][4]float64{{1.2, 0, 0, 1.1}, {1.1, 0, 0, 1.3}} {
		r1, _ := one.Evaluate(F)
		r2, _ := pair.Evaluate(F)
		if !near(r1.Cauchy[0], r2.Cauchy[0], 1e-12) || !near(r1.Cauchy[1], r2.Cauchy[1], 1e-12) {
			t.Errorf("F=%v: one family %v, mirror pair %v", F, r1.Cauchy, r2.Cauchy)
		}
		if r2.Cauchy[2] != 0 && math.Abs(r2.Cauchy[2]) > 1e-12 {
			t.Errorf("F=%v: mirror pair shear %g, want 0", F, r2.Cauchy[2])
		}
	}
}

// Overflow: an exponential term at a huge stretch gives ±Inf or an error,
// never NaN (issue requirement; checked on every exponential shape).
func TestOverflowNeverNaN(t *testing.T) {
	m := allTermsModel()
	for i := range m.Terms {
		if len(m.Terms[i].Params) > 0 && m.Terms[i].Shape.Params[0].Name == "stiffening" {
			m.Terms[i].Params[0] = m.Terms[i].Shape.Params[0].Max
		}
	}
	_, err := m.Evaluate([4]float64{40, 0, 0, 1})
	if err == nil {
		t.Fatal("expected an overflow error at stretch 40 with maximal rates")
	}
	d, err := NewDataset([][4]float64{{40, 0, 0, 1}, {1.1, 0, 0, 1}}, Output{Nominal: true, Components: []Component{0, 1, 2, 3}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	var c Columns
	d.Fill(m, &c, true)
	for _, b := range [][]float64{c.A, c.DAngle, c.DKappa, c.DParam[0]} {
		for _, v := range b {
			if math.IsNaN(v) {
				t.Fatal("NaN in columns at overflow")
			}
		}
	}
}

// The reference set is an independent computation: it is used as it was
// copied, and the SHA-256 its provenance gives (testdata/README.md) is the
// file's, so that an edit to the data cannot pass for the reference.
func TestReferenceCasesUnchanged(t *testing.T) {
	b, err := os.ReadFile("../testdata/stress-cases.json")
	if err != nil {
		t.Fatal(err)
	}
	sum := fmt.Sprintf("%x", sha256.Sum256(b))
	prov, err := os.ReadFile("../testdata/README.md")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(prov), "`stress-cases.json`") || !strings.Contains(string(prov), sum) {
		t.Errorf("testdata/stress-cases.json has SHA-256 %s, which its provenance in testdata/README.md does not give: restore the copy of the shared reference set, or record where the new file comes from", sum)
	}
}
