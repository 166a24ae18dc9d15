package aniso

import (
	"fmt"
	"math"
	"testing"

	"github.com/weft-tools/weft/terms"
)

func testDataset(t testing.TB, nominal bool) *Dataset {
	F := [][4]float64{
		{1.15, 0, 0, 1.08}, {1.25, 0.06, -0.03, 1.12}, {1.05, -0.08, 0.05, 1.22},
		{1.3, 0.02, 0.1, 0.97}, {0.98, 0, 0, 1.18},
	}
	out := Output{Nominal: nominal, Components: []Component{0, 1, 2}}
	if nominal {
		out.Components = append(out.Components, 3)
	}
	w := make([]float64, len(F)*len(out.Components))
	for i := range w {
		w[i] = 0.5 + 0.1*float64(i%5)
	}
	d, err := NewDataset(F, out, w)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// Every analytic column derivative (fibre angle, dispersion, shape
// parameters) against central finite differences of the columns.
func TestColumnDerivativesFiniteDifference(t *testing.T) {
	for _, nominal := range []bool{false, true} {
		d := testDataset(t, nominal)
		m := allTermsModel()
		for i := range m.Terms {
			for j, p := range m.Terms[i].Shape.Params {
				switch p.Name {
				case "stiffening":
					m.Terms[i].Params[j] = 1.7
				case "onset":
					m.Terms[i].Params[j] = 1.03 // inside its bounds on both sides
				case "exponent":
					m.Terms[i].Params[j] *= 3.5
				}
			}
		}
		var c Columns
		d.Fill(m, &c, true)
		check := func(name string, analytic []float64, perturb func(m *Model, h float64), h float64) {
			checkColumnsFD(t, d, m, &c, fmt.Sprintf("nominal=%v", nominal), name, analytic, perturb, h)
		}
		for f := range m.Families {
			f := f
			check("angle", maskFamily(m, &c, c.DAngle, f), func(m *Model, h float64) { m.Families[f].Angle += h }, 1e-6)
			check("kappa", maskFamily(m, &c, c.DKappa, f), func(m *Model, h float64) { m.Families[f].Dispersion += h }, 1e-6)
		}
		for k := range m.Terms {
			for j := range m.Terms[k].Params {
				k, j := k, j
				only := make([]float64, len(c.A))
				copy(only[k*c.Rows:(k+1)*c.Rows], c.DParam[j][k*c.Rows:(k+1)*c.Rows])
				check("param "+m.Terms[k].Shape.Params[j].Name, only, func(m *Model, h float64) { m.Terms[k].Params[j] += h }, 1e-6)
			}
		}
	}
}

// maskFamily keeps the derivative columns of family f's terms only, since a
// perturbation of one family's angle moves only those columns.
func maskFamily(m *Model, c *Columns, d []float64, f int) []float64 {
	out := make([]float64, len(d))
	for k, t := range m.Terms {
		if t.Family == f {
			copy(out[k*c.Rows:(k+1)*c.Rows], d[k*c.Rows:(k+1)*c.Rows])
		}
	}
	return out
}

func cloneModel(m *Model) *Model {
	c := &Model{Families: append([]Family(nil), m.Families...)}
	for _, t := range m.Terms {
		t.Params = append([]float64(nil), t.Params...)
		c.Terms = append(c.Terms, t)
	}
	return c
}

// Columns times weights reproduce Evaluate (stress is linear in the weights;
// package documentation, Plane stress).
func TestColumnsLinearInWeights(t *testing.T) {
	w := testDataset(t, true)
	F := make([][4]float64, w.Points())
	for i := range F {
		F[i] = w.kin[i].F
	}
	d, err := NewDataset(F, w.out, nil)
	if err != nil {
		t.Fatal(err)
	}
	m := allTermsModel()
	var c Columns
	d.Fill(m, &c, false)
	for i := 0; i < d.Points(); i++ {
		r, err := m.Evaluate(d.kin[i].F)
		if err != nil {
			t.Fatal(err)
		}
		for j := 0; j < 4; j++ {
			s := 0.0
			for k, term := range m.Terms {
				s += term.Weight * c.A[k*c.Rows+i*4+j]
			}
			if !near(s, r.Nominal[j], 1e-12) {
				t.Errorf("point %d component %d: Σ w·column = %g, Evaluate %g", i, j, s, r.Nominal[j])
			}
		}
	}
}

// benchSpecimen is 5 protocols × 100 points of pure biaxial stretch.
func benchSpecimen(b testing.TB) *Dataset {
	ratios := [][2]float64{{1, 1}, {1, 0.75}, {0.75, 1}, {1, 0.5}, {0.5, 1}}
	var F [][4]float64
	for _, r := range ratios {
		for i := 0; i < 100; i++ {
			e := 0.25 * float64(i+1) / 100
			F = append(F, [4]float64{1 + r[0]*e, 0, 0, 1 + r[1]*e})
		}
	}
	d, err := NewDataset(F, Output{Nominal: true, Components: []Component{0, 1}}, nil)
	if err != nil {
		b.Fatal(err)
	}
	return d
}

// catalogueModel is the whole catalogue (20 shapes) with one fibre family.
func catalogueModel() *Model {
	m := &Model{Families: []Family{{Name: "f1", Angle: 40 * deg}}}
	for _, sh := range terms.Catalogue() {
		t := Term{Shape: sh, Family: -1, Weight: 1, Params: sh.DefaultParams()}
		if sh.Arg.NeedsFamily() {
			t.Family = 0
		}
		m.Terms = append(m.Terms, t)
	}
	return m
}

// BenchmarkFillColumns fills all stress columns of a 5-protocol × 100-point
// specimen for the 20-term catalogue (the Fung-type term included) with one fibre family.
func BenchmarkFillColumns(b *testing.B) {
	d := benchSpecimen(b)
	m := catalogueModel()
	if len(m.Terms) != 20 {
		b.Fatalf("catalogue has %d shapes, the benchmark expects 20", len(m.Terms))
	}
	var c Columns
	d.Fill(m, &c, false)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		d.Fill(m, &c, false)
	}
}

// BenchmarkFillColumnsDerivs is the same fill with all derivative columns.
func BenchmarkFillColumnsDerivs(b *testing.B) {
	d := benchSpecimen(b)
	m := catalogueModel()
	var c Columns
	d.Fill(m, &c, true)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		d.Fill(m, &c, true)
	}
}

// checkColumnsFD compares analytic column derivatives (analytic, laid out
// like c.A) with central finite differences of the columns of m filled on
// d, the model moved by perturb(±h).
func checkColumnsFD(t *testing.T, d *Dataset, m *Model, c *Columns, label, name string, analytic []float64, perturb func(m *Model, h float64), h float64) {
	t.Helper()
	var cp, cm Columns
	mp, mm := cloneModel(m), cloneModel(m)
	perturb(mp, h)
	perturb(mm, -h)
	d.Fill(mp, &cp, false)
	d.Fill(mm, &cm, false)
	for k := 0; k < c.Cols; k++ {
		for r := 0; r < c.Rows; r++ {
			fd := (cp.A[k*c.Rows+r] - cm.A[k*c.Rows+r]) / (2 * h)
			an := analytic[k*c.Rows+r]
			if math.Abs(fd-an) > 1e-6*math.Max(1, math.Abs(an)) {
				t.Errorf("%s %s, term %s row %d: analytic %.10g, finite difference %.10g", label, name, m.Terms[k].Shape.ID, r, an, fd)
				return
			}
		}
	}
}

// A family without a term in I5 or K gets its fibre kinematics without
// them (fibreSC4), each field it fills equal to fibreSC's bit for bit; and
// columns kept from a fill that skipped the I5 and K terms are brought up
// to date when those terms are filled again at the same angle, equal bit
// for bit to a fresh fill's.
func TestFillBasesWithoutFifthTerms(t *testing.T) {
	d := testDataset(t, true)
	for i := range d.kin {
		k := &d.kin[i]
		for _, a := range []float64{0, 0.3, -1.1, math.Pi / 2} {
			s, c := math.Sincos(a)
			full := k.fibreSC(s, c)
			four := FibreKinematics{I5: 7, G5: Sym{7, 7, 7}} // fibreSC4 must clear them
			k.fibreSC4(&four, s, c)
			if four.I5 != 0 || four.G5 != (Sym{}) {
				t.Fatalf("point %d, α %g: fibreSC4 left I5 %v, G5 %v", i, a, four.I5, four.G5)
			}
			got := []float64{four.A[0], four.A[1], four.I4, four.DI4, four.G4[0], four.G4[1], four.G4[2], four.DG4[0], four.DG4[1], four.DG4[2]}
			want := []float64{full.A[0], full.A[1], full.I4, full.DI4, full.G4[0], full.G4[1], full.G4[2], full.DG4[0], full.DG4[1], full.DG4[2]}
			for j := range got {
				if math.Float64bits(got[j]) != math.Float64bits(want[j]) {
					t.Fatalf("point %d, α %g: field %d is %v without I5, %v with", i, a, j, got[j], want[j])
				}
			}
		}
	}
	m := &Model{Families: []Family{{Name: "f1", Angle: 35 * deg}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 1},
		{Shape: lookup("fib-expsq"), Family: 0, Weight: 1, Params: []float64{2}},
		{Shape: lookup("i5-quad"), Family: 0, Weight: 1},
		{Shape: lookup("cof-quad"), Family: 0, Weight: 1},
	}}
	var fresh Columns
	d.Fill(m, &fresh, true)
	c := Columns{Skip: []bool{false, false, true, true}}
	d.Fill(m, &c, true)
	c.Skip = nil
	d.Fill(m, &c, true)
	for _, v := range []struct {
		name      string
		got, want []float64
	}{{"A", c.A, fresh.A}, {"DAngle", c.DAngle, fresh.DAngle}, {"DKappa", c.DKappa, fresh.DKappa}, {"DParam[0]", c.DParam[0], fresh.DParam[0]}} {
		for i := range v.want {
			if math.Float64bits(v.got[i]) != math.Float64bits(v.want[i]) {
				t.Fatalf("%s[%d] = %v after a fill without the I5 and K terms, %v fresh", v.name, i, v.got[i], v.want[i])
			}
		}
	}
}
