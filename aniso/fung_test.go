package aniso

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/mat"

	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/terms"
)

// fungLaw is the Tong & Fung 1976 planar energy (J Biomech 9:649–657; form
// from memory), written out here independently of the package's code path:
// W = c/2 (e^Q − 1), Q = b1 E11² + b2 E22² + 2 b3 E11 E22 + b4 (E12² + E21²),
// E = (FᵀF − 1)/2 of the in-plane F in the tester's axes.
type fungLaw struct {
	c          float64
	b1, b2, b3 float64
	b4         float64
}

func (f fungLaw) green(F []float64) (e11, e22, e12 float64) {
	// F = (F11, F12, F21, F22); C = FᵀF.
	c11 := F[0]*F[0] + F[2]*F[2]
	c22 := F[1]*F[1] + F[3]*F[3]
	c12 := F[0]*F[1] + F[2]*F[3]
	return (c11 - 1) / 2, (c22 - 1) / 2, c12 / 2
}

func (f fungLaw) q(F []float64) float64 {
	e11, e22, e12 := f.green(F)
	return f.b1*e11*e11 + f.b2*e22*e22 + 2*f.b3*e11*e22 + f.b4*(e12*e12+e12*e12)
}

// energy is W per unit reference volume.
func (f fungLaw) energy(F []float64) float64 { return f.c / 2 * (math.Exp(f.q(F)) - 1) }

// pk2 is Tong & Fung's second Piola–Kirchhoff stress,
// S11 = c e^Q (b1 E11 + b3 E22), S22 = c e^Q (b2 E22 + b3 E11),
// S12 = c e^Q b4 E12.
func (f fungLaw) pk2(F []float64) (s11, s22, s12 float64) {
	e11, e22, e12 := f.green(F)
	eq := f.c * math.Exp(f.q(F))
	return eq * (f.b1*e11 + f.b3*e22), eq * (f.b2*e22 + f.b3*e11), eq * f.b4 * e12
}

// nominal is P = F S as (P11, P22, P12, P21), and cauchy σ = F S Fᵀ.
func (f fungLaw) nominal(F []float64) [4]float64 {
	s11, s22, s12 := f.pk2(F)
	return [4]float64{F[0]*s11 + F[1]*s12, F[2]*s12 + F[3]*s22, F[0]*s12 + F[1]*s22, F[2]*s11 + F[3]*s12}
}

func (f fungLaw) cauchy(F []float64) Sym {
	P := f.nominal(F) // σ = P Fᵀ
	return Sym{P[0]*F[0] + P[2]*F[1], P[3]*F[2] + P[1]*F[3], P[0]*F[2] + P[2]*F[3]}
}

func (f fungLaw) model() *Model {
	return &Model{Terms: []Term{{Shape: terms.Lookup("fung"), Family: -1, Weight: f.c, Params: []float64{f.b1, f.b2, f.b3, f.b4}}}}
}

// Parameter sets: anisotropic and convex, a negative coupling, and one
// that is not convex (b3² > b1 b2).
var fungLaws = []fungLaw{
	{c: 0.5, b1: 12, b2: 6, b3: 2, b4: 8},
	{c: 1.3, b1: 4, b2: 20, b3: -3, b4: 15},
	{c: 0.7, b1: 10, b2: 2, b3: 6, b4: 3},
}

// Pure biaxial stretch: Tong & Fung's stresses S11 = c e^Q (b1 E11 + b3 E22),
// S22 = c e^Q (b2 E22 + b3 E11) with E_ii = (λi² − 1)/2, pushed forward as
// σ_ii = λi² S_ii (p = 0: the energy does not depend on C33), nominal
// P_ii = λi S_ii, no shear stress; computed directly here.
func TestFungBiaxialClosedForm(t *testing.T) {
	for _, f := range fungLaws {
		m := f.model()
		for _, l := range [][2]float64{{1.1, 1.05}, {1.25, 1}, {1, 1.2}, {0.95, 1.3}, {1.3, 1.3}} {
			e11, e22 := (l[0]*l[0]-1)/2, (l[1]*l[1]-1)/2
			eq := f.c * math.Exp(f.b1*e11*e11+f.b2*e22*e22+2*f.b3*e11*e22)
			s11, s22 := eq*(f.b1*e11+f.b3*e22), eq*(f.b2*e22+f.b3*e11)
			r, err := m.Evaluate([4]float64{l[0], 0, 0, l[1]})
			if err != nil {
				t.Fatal(err)
			}
			if !near(r.Cauchy[0], l[0]*l[0]*s11, 1e-12) || !near(r.Cauchy[1], l[1]*l[1]*s22, 1e-12) || r.Cauchy[2] != 0 {
				t.Errorf("%+v λ=%v: σ = %v, closed form (%g, %g, 0)", f, l, r.Cauchy, l[0]*l[0]*s11, l[1]*l[1]*s22)
			}
			if !near(r.Nominal[0], l[0]*s11, 1e-12) || !near(r.Nominal[1], l[1]*s22, 1e-12) {
				t.Errorf("%+v λ=%v: P = %v, closed form (%g, %g)", f, l, r.Nominal, l[0]*s11, l[1]*s22)
			}
		}
	}
}

// fungPoints are sheared in-plane deformations (both F12 and F21 set).
var fungPoints = [][4]float64{
	{1.2, 0.08, -0.05, 1.1},
	{1.05, -0.12, 0.06, 1.25},
	{0.92, 0.15, 0.1, 1.18},
	{1.3, 0.02, 0.2, 0.97},
}

// The stress against a numerical derivative of W taken by a
// general-purpose library (gonum.org/v1/gonum/diff/fd, central
// differences): P = ∂W/∂F2 of the independently written energy, at sheared
// points; and the Cauchy stress against σ = P F2ᵀ of that derivative, which
// checks p = 0 (plane stress with an energy independent of C33). The
// energy and the closed-form S of Tong & Fung agree with both.
func TestFungStressAgainstNumericalDerivative(t *testing.T) {
	for _, f := range fungLaws {
		m := f.model()
		for _, F := range fungPoints {
			r, err := m.Evaluate(F)
			if err != nil {
				t.Fatal(err)
			}
			if !near(r.Energy, f.energy(F[:]), 1e-13) {
				t.Errorf("%+v F=%v: energy %.15g, published form %.15g", f, F, r.Energy, f.energy(F[:]))
			}
			g := fd.Gradient(nil, f.energy, F[:], &fd.Settings{Formula: fd.Central, Step: 1e-6})
			P := NominalFOrder(r.Nominal)
			scale := math.Max(1, math.Abs(g[0])+math.Abs(g[3]))
			for i := range g {
				if math.Abs(P[i]-g[i]) > 1e-7*scale {
					t.Errorf("%+v F=%v: P[%d] = %.10g, numerical ∂W/∂F %.10g", f, F, i, P[i], g[i])
				}
			}
			// σ = P Fᵀ with P in (11, 12, 21, 22) order.
			sig := Sym{g[0]*F[0] + g[1]*F[1], g[2]*F[2] + g[3]*F[3], g[0]*F[2] + g[1]*F[3]}
			cl := f.cauchy(F[:])
			for j := range sig {
				if math.Abs(r.Cauchy[j]-sig[j]) > 1e-7*scale || !near(r.Cauchy[j], cl[j], 1e-12) {
					t.Errorf("%+v F=%v: σ%d = %.10g, from ∂W/∂F %.10g, closed form %.10g", f, F, j, r.Cauchy[j], sig[j], cl[j])
				}
			}
		}
	}
}

// The analytic tangent A = ∂²W/∂F2² against the Hessian of the
// independently written energy by gonum's diff/fd (central differences
// applied twice), and its gradient P against Evaluate.
func TestFungTangentFiniteDifference(t *testing.T) {
	for _, f := range fungLaws {
		m := f.model()
		for _, F := range fungPoints {
			tg := checkTangentAgainstHessian(t, m, f.energy, F, fmt.Sprintf("%+v", f))
			r, _ := m.Evaluate(F)
			pe := NominalFOrder(r.Nominal)
			for i := range pe {
				if !near(tg.P[i], pe[i], 1e-12) {
					t.Errorf("%+v F=%v: tangent's P[%d] = %.15g, Evaluate %.15g", f, F, i, tg.P[i], pe[i])
				}
			}
		}
	}
}

// checkTangentAgainstHessian compares m's analytic tangent at F with the
// Hessian of energy (an independently written W(F)) by gonum's diff/fd,
// central differences applied twice, within 1e-5 of the largest entry,
// and returns the tangent.
func checkTangentAgainstHessian(t *testing.T, m *Model, energy func([]float64) float64, F [4]float64, label string) Tangent {
	t.Helper()
	tg, err := m.Tangent(F)
	if err != nil {
		t.Fatal(err)
	}
	var H mat.SymDense
	fd.Hessian(&H, energy, F[:], &fd.Settings{Formula: fd.Central, Step: 1e-4})
	amax := largestEntry(tg.A)
	for i := range tg.A {
		for j := range tg.A[i] {
			if math.Abs(tg.A[i][j]-H.At(i, j)) > 1e-5*amax {
				t.Errorf("%s F=%v: A[%d][%d] = %.10g, numerical Hessian %.10g", label, F, i, j, tg.A[i][j], H.At(i, j))
			}
		}
	}
	return tg
}

// The reference state is stress-free for every parameter set, the
// non-convex one included (Q and ∂Q/∂E vanish at E = 0; common practice).
func TestFungStressFreeReference(t *testing.T) {
	for _, f := range fungLaws {
		m := f.model()
		r, err := m.Evaluate([4]float64{1, 0, 0, 1})
		if err != nil {
			t.Fatal(err)
		}
		tg, _ := m.Tangent([4]float64{1, 0, 0, 1})
		if r.Cauchy != (Sym{}) || r.Energy != 0 || tg.P != [4]float64{} {
			t.Errorf("%+v: σ(I) = %v, W(I) = %g, P(I) = %v", f, r.Cauchy, r.Energy, tg.P)
		}
	}
}

// Objectivity (Holzapfel 2000, §6.2; common practice): a rigid rotation
// superposed on the deformation, F → R F, leaves W unchanged and rotates the
// Cauchy stress, σ → R σ Rᵀ. The term's axes stay with the specimen, so
// turning the loading frame alone (F → R F Rᵀ) is not a symmetry once
// b1 ≠ b2.
func TestFungObjectivity(t *testing.T) {
	f := fungLaws[0]
	m := f.model()
	F := fungPoints[0]
	r0, _ := m.Evaluate(F)
	for _, phi := range []float64{15, 60, 90, 145} {
		s, c := math.Sincos(phi * deg)
		RF := [4]float64{c*F[0] - s*F[2], c*F[1] - s*F[3], s*F[0] + c*F[2], s*F[1] + c*F[3]}
		r, err := m.Evaluate(RF)
		if err != nil {
			t.Fatal(err)
		}
		if !near(r.Energy, r0.Energy, 1e-12) {
			t.Errorf("φ=%g: W(RF) = %.15g, W(F) = %.15g", phi, r.Energy, r0.Energy)
		}
		s11, s22, s12 := r0.Cauchy[0], r0.Cauchy[1], r0.Cauchy[2]
		want := Sym{c*c*s11 - 2*c*s*s12 + s*s*s22, s*s*s11 + 2*c*s*s12 + c*c*s22, c*s*(s11-s22) + (c*c-s*s)*s12}
		for j := range want {
			if !near(r.Cauchy[j], want[j], 1e-11) {
				t.Errorf("φ=%g: σ%d(RF) = %g, R σ Rᵀ gives %g", phi, j, r.Cauchy[j], want[j])
			}
		}
	}
	rot := rotateF([4]float64{1.2, 0, 0, 1.05}, 90*deg)
	a, _ := m.Evaluate([4]float64{1.2, 0, 0, 1.05})
	b, _ := m.Evaluate(rot)
	if near(a.Energy, b.Energy, 1e-3) {
		t.Errorf("the tester's axes are material axes: stretching along axis 2 instead of 1 must change W (%g vs %g)", a.Energy, b.Energy)
	}
}

// Every analytic column derivative with respect to b1…b4 against central
// finite differences of the columns, in Cauchy and nominal output, at
// points with shear.
func TestFungColumnDerivatives(t *testing.T) {
	for _, nominal := range []bool{false, true} {
		d := testDataset(t, nominal)
		for _, f := range fungLaws {
			checkParamColumns(t, d, f.model(), 4, fmt.Sprintf("nominal=%v %+v", nominal, f))
		}
	}
}

// checkParamColumns compares the derivative columns of the first n shape
// parameters of m's one term with central differences of its columns,
// and checks that a term without a family has no angle or dispersion
// derivatives.
func checkParamColumns(t *testing.T, d *Dataset, m *Model, n int, label string) {
	t.Helper()
	var c Columns
	d.Fill(m, &c, true)
	for j := range n {
		var cp, cm Columns
		mp, mm := cloneModel(m), cloneModel(m)
		const h = 1e-6
		mp.Terms[0].Params[j] += h
		mm.Terms[0].Params[j] -= h
		d.Fill(mp, &cp, false)
		d.Fill(mm, &cm, false)
		for r := 0; r < c.Rows; r++ {
			fdv := (cp.A[r] - cm.A[r]) / (2 * h)
			if an := c.DParam[j][r]; math.Abs(fdv-an) > 1e-6*math.Max(1, math.Abs(an)) {
				t.Errorf("%s b%d row %d: analytic %.10g, finite difference %.10g", label, j+1, r, an, fdv)
			}
		}
	}
	for r := 0; r < c.Rows; r++ {
		if c.DAngle[r] != 0 || c.DKappa[r] != 0 {
			t.Fatalf("%s: a term without a family has angle or dispersion derivatives", label)
		}
	}
}

// Strong ellipticity in compression, derived here for F = λ1: with P = F S,
// P21 = F21 S11 + F22 S12, and at F21 = 0 (E12 = 0) ∂S12/∂F21 =
// c e^Q b4 ∂E12/∂F21 = c e^Q b4 λ/2, so the rank-one increment e2⊗e1 has
// (e2⊗e1):A:(e2⊗e1) = A_{21,21} = S11 + λ² c e^Q b4/2 with
// S11 = c e^Q (b1 + b3) E, E = (λ² − 1)/2, Q = (b1 + b2 + 2 b3) E². Under
// equibiaxial compression S11 < 0 and, the energy not depending on the
// thickness stretch, nothing else resists: below a stretch fixed by b4 the
// membrane loses strong ellipticity. The analytic tangent must give exactly
// this value, and the ellipticity scan must find it.
func TestFungEllipticityInCompression(t *testing.T) {
	f := fungLaws[0]
	m := f.model()
	for _, l := range []float64{0.7, 0.8, 0.9, 1, 1.2} {
		E := (l*l - 1) / 2
		eq := f.c * math.Exp((f.b1+f.b2+2*f.b3)*E*E)
		want := eq*(f.b1+f.b3)*E + l*l*eq*f.b4/2
		F := [4]float64{l, 0, 0, l}
		tg, err := m.Tangent(F)
		if err != nil {
			t.Fatal(err)
		}
		if !near(tg.A[2][2], want, 1e-12) {
			t.Errorf("λ = %g: A_{21,21} = %.15g, closed form %.15g", l, tg.A[2][2], want)
		}
		ps, err := m.StabilityAt(F, 180)
		if err != nil {
			t.Fatal(err)
		}
		if ps.MinEllipticity > want+1e-12 {
			t.Errorf("λ = %g: the scan's smallest (a⊗b):A:(a⊗b) %g exceeds the e2⊗e1 value %g", l, ps.MinEllipticity, want)
		}
		if (want < 0) != (l < 0.8) {
			t.Errorf("λ = %g: A_{21,21} = %g; for these values ellipticity is lost below λ ≈ 0.8 only", l, want)
		}
	}
}

// Small-strain moduli of the linearised Tong & Fung law, derived here: at
// E → 0, S11 = c (b1 E11 + b3 E22), S22 = c (b3 E11 + b2 E22), S12 = c b4 E12
// (a linear orthotropic membrane; the energy does not see the thickness).
// Uniaxial stress along axis 1 (S22 = 0) gives E22 = −(b3/b2) E11 and the
// modulus c (b1 − b3²/b2); along axis 2 c (b2 − b3²/b1); shear τ = c b4 γ/2.
// The Fung-type term is two-sided and adds nothing to the isotropic μ0.
func TestFungSmallStrainModuli(t *testing.T) {
	for _, f := range fungLaws[:2] {
		mod, err := f.model().SmallStrainModuli([]float64{0, 90})
		if err != nil {
			t.Fatal(err)
		}
		e1, e2, g := f.c*(f.b1-f.b3*f.b3/f.b2), f.c*(f.b2-f.b3*f.b3/f.b1), f.c*f.b4/2
		y1, y2 := mod.Young[0], mod.Young[1]
		if !near(y1.Tension, e1, 1e-9) || !near(y1.Compression, e1, 1e-9) || !near(y2.Tension, e2, 1e-9) || !near(y2.Compression, e2, 1e-9) {
			t.Errorf("%+v: moduli %+v %+v, closed forms %g, %g", f, y1, y2, e1, e2)
		}
		if !near(mod.ShearPositive, g, 1e-9) || !near(mod.ShearNegative, g, 1e-9) || mod.InitialShear != 0 || mod.OneSided != 0 {
			t.Errorf("%+v: shear %g/%g, closed form %g; μ0 %g, one-sided %d", f, mod.ShearPositive, mod.ShearNegative, g, mod.InitialShear, mod.OneSided)
		}
	}
}

// Verification rows of the Fung-type term against closed forms derived from
// Tong & Fung's stresses: uniaxial tension along axis 1 frees the lateral
// edge, S22 = c e^Q (b2 E22 + b3 E11) = 0, so E22 = −(b3/b2) E11 and the
// lateral stretch is √(1 + 2 E22); then σ11 = λ² c e^Q (b1 − b3²/b2) E11.
// Strip biaxial (λ2 = 1) has σ22 = c e^Q b3 E11 with E22 = 0.
func TestFungVerificationClosedForms(t *testing.T) {
	f := fungLaws[0]
	m := f.model()
	pts, err := VerificationCases(m, VerificationSettings{Cases: []LoadCase{Uniaxial, StripBiaxial}, DirectionsDeg: []float64{0}})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range pts {
		if p.Err != "" {
			t.Fatal(p.Err)
		}
		l := p.Amount
		e11 := (l*l - 1) / 2
		e22 := 0.0
		if p.Case == Uniaxial {
			e22 = -f.b3 / f.b2 * e11
			if lt := math.Sqrt(1 + 2*e22); !near(p.LateralStretch, lt, 1e-12) {
				t.Errorf("uniaxial λ=%g: lateral stretch %.15g, closed form %.15g", l, p.LateralStretch, lt)
			}
		}
		eq := f.c * math.Exp(f.b1*e11*e11+f.b2*e22*e22+2*f.b3*e11*e22)
		s11 := l * l * eq * (f.b1*e11 + f.b3*e22)
		s22 := eq * (f.b2*e22 + f.b3*e11) * (1 + 2*e22)
		if !near(p.Cauchy[0], s11, 1e-10) || math.Abs(p.Cauchy[1]-s22) > 1e-10*math.Abs(s11) {
			t.Errorf("%s λ=%g: σ = %v, closed form (%g, %g)", p.Case, l, p.Cauchy, s11, s22)
		}
	}
}

// fungSpecimen generates a specimen from the closed form above (not the
// package's code path): nominal stress P = F S on the five standard
// stretch-ratio protocols, 40 points each to a leading strain of 0.25, and,
// with shear, an in-plane shear F12 = 0.4 e, F21 = −0.2 e imposed along
// every protocol and the shear stresses measured. Gaussian noise of 1 % of
// each protocol-component range is added (seeded, deterministic).
func fungSpecimen(f fungLaw, shear bool) *biaxial.Specimen {
	return fungSpecimenOf(f.nominal, shear)
}

// fungSpecimenOf is fungSpecimen for any law given by its nominal stress
// (P11, P22, P12, P21) at F = (F11, F12, F21, F22).
func fungSpecimenOf(nominal func([]float64) [4]float64, shear bool) *biaxial.Specimen {
	rng := rand.New(rand.NewPCG(11, 5))
	s := &biaxial.Specimen{Name: "synthetic-fung", StressUnit: "kPa", Kind: biaxial.Nominal, HasShear: shear}
	comps := []biaxial.Component{biaxial.C11, biaxial.C22}
	if shear {
		comps = append(comps, biaxial.C12, biaxial.C21)
	}
	for _, c := range comps {
		s.Measured[c] = true
	}
	for _, r := range standardRatios {
		pr := biaxial.Protocol{Label: label(r), UserWeight: 1}
		const n = 40
		for i := 1; i <= n; i++ {
			e := 0.25 * float64(i) / n
			F := [4]float64{1 + r[0]*e, 0, 0, 1 + r[1]*e}
			if shear {
				F[1], F[2] = 0.4*e, -0.2*e
			}
			pr.Points = append(pr.Points, biaxial.Point{F: F, Stress: nominal(F[:]), Line: i + 1, Cycle: 1, Time: math.NaN()})
		}
		for _, c := range comps {
			lo, hi := math.Inf(1), math.Inf(-1)
			for _, pt := range pr.Points {
				lo, hi = math.Min(lo, pt.Stress[c]), math.Max(hi, pt.Stress[c])
			}
			for i := range pr.Points {
				pr.Points[i].Stress[c] += 0.01 * (hi - lo) * rng.NormFloat64()
			}
			pr.Weight[c] = 1 / ((hi - lo) * math.Sqrt(n))
		}
		s.Protocols = append(s.Protocols, pr)
	}
	return s
}

// fitFungTerm fits the Fung-type term alone to fungSpecimenOf(nominal,
// shear).
func fitFungTerm(t *testing.T, nominal func([]float64) [4]float64, shear bool) *Result {
	t.Helper()
	p, err := NewProblem(fungSpecimenOf(nominal, shear), nil)
	if err != nil {
		t.Fatal(err)
	}
	r, err := Fit(p, Structure{Terms: []TermSpec{{Shape: terms.Lookup("fung"), Family: -1}}}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func estimate(r *Result, name string) Estimate {
	for _, e := range r.Estimates {
		if e.Name == name {
			return e
		}
	}
	return Estimate{Status: "missing"}
}

// Recovery of known parameters (invented) by a fit of the Fung-type form
// from data generated with the closed form and 1 % noise on five protocols: c within 3 % and each b
// within 3 % of max(b1, b2) — the parameters of an exponential law trade
// against each other, so the tolerance is on the scale of the exponent. In
// pure biaxial stretch b4 has no effect: it is held at 0, reported as not
// determined, with a note that says why; with shear it is recovered too.
// The convexity condition is reported in the notes.
func TestFungPresetRecovery(t *testing.T) {
	truth := fungLaws[0]
	for _, shear := range []bool{false, true} {
		r := fitFungTerm(t, truth.nominal, shear)
		got := r.Model.Terms[0]
		t.Logf("shear %v: c = %.6g, b = %.6g; R² min %.4f", shear, got.Weight, got.Params, minR2(r))
		if math.Abs(got.Weight-truth.c) > 0.03*truth.c {
			t.Errorf("shear %v: c = %g, true %g", shear, got.Weight, truth.c)
		}
		want := []float64{truth.b1, truth.b2, truth.b3, truth.b4}
		n := 3
		if shear {
			n = 4
		}
		for j := 0; j < n; j++ {
			if math.Abs(got.Params[j]-want[j]) > 0.03*12 {
				t.Errorf("shear %v: b%d = %g, true %g", shear, j+1, got.Params[j], want[j])
			}
		}
		b4 := estimate(r, "b4[fung]")
		notes := strings.Join(r.Notes, "\n")
		if !shear {
			if got.Params[3] != 0 || b4.Status != "not-determined" || !math.IsNaN(b4.StdErr) || !strings.Contains(notes, "no in-plane shear strain") {
				t.Errorf("no shear: b4 = %g, estimate %+v, notes %s", got.Params[3], b4, notes)
			}
		} else if b4.Status != "estimated" {
			t.Errorf("with shear: b4 estimate %+v", b4)
		}
		if !strings.Contains(notes, "Convexity of fung") || !strings.Contains(notes, "holds") || strings.Contains(notes, "NOT hold") {
			t.Errorf("shear %v: convexity not reported as holding: %s", shear, notes)
		}
	}
}

func minR2(r *Result) float64 {
	m := math.Inf(1)
	for _, x := range r.Metrics {
		if x.R2Defined {
			m = math.Min(m, x.R2)
		}
	}
	return m
}

// Data from a non-convex parameter set (b3² > b1 b2, invented) fitted with
// the Fung-type form: the fit reproduces it and the notes say the condition does
// not hold, with the numbers.
func TestFungNonConvexReported(t *testing.T) {
	truth := fungLaws[2]
	st := Structure{Terms: []TermSpec{{Shape: terms.Lookup("fung"), Family: -1}}}
	p, err := NewProblem(fungSpecimen(truth, false), nil)
	if err != nil {
		t.Fatal(err)
	}
	r, err := Fit(p, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	b := r.Model.Terms[0].Params
	notes := strings.Join(r.Notes, "\n")
	if b[2]*b[2] <= b[0]*b[1] || !strings.Contains(notes, "does NOT hold") || !strings.Contains(notes, "b1 b2 ≤ b3²") {
		t.Errorf("fitted b = %v; notes %s", b, notes)
	}
}

// Discovery leaves the Fung-type shape out of its candidates and fits the
// fung preset beside the discovered model, cross-validated like the others.
func TestDiscoverComparesFungPreset(t *testing.T) {
	t.Parallel()
	set := DiscoverSettings{}.withDefaults()
	for _, sh := range set.Shapes {
		if sh.Arg == terms.Green {
			t.Errorf("%s is a default discovery candidate", sh.ID)
		}
	}
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 30, Params: []float64{4}}, 38)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.01, points: 20})
	p, _ := NewProblem(spec, nil)
	d, err := Discover(p, DiscoverSettings{MaxTerms: 2})
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, c := range d.Presets {
		if c.Name == "preset:fung" {
			found = c.CV != nil && len(c.CV.Folds) == len(standardRatios) && len(c.Result.Metrics) > 0
		}
	}
	if !found {
		t.Errorf("preset:fung missing or not cross-validated among %d presets", len(d.Presets))
	}
	for _, c := range d.Pareto {
		for _, tm := range c.Result.Structure.Terms {
			if tm.Shape.Arg == terms.Green {
				t.Errorf("candidate %s uses %s", c.Name, tm.Shape.ID)
			}
		}
	}
}

// A Fung-type card with b4 = 0, as a fit without shear data holds it: the
// shear modulus is genuinely zero, but the uniaxial moduli along the axes
// are not. Derived here from the linearised law of Tong & Fung 1976
// (S11 = c (b1 E11 + b3 E22), S22 = c (b3 E11 + b2 E22), S12 = c b4 E12):
// a uniaxial stress along axis 1 has no shear component, so it needs no
// shear stiffness, and condensing out the free lateral stress (S22 = 0)
// gives E1 = c (b1 − b3²/b2), E2 = c (b2 − b3²/b1). A uniaxial stress at 30°
// has a shear component that nothing resists: modulus 0. With an
// incompressible neo-Hookean matrix (i1-lin weight w, μ = 2w) added, whose
// plane-stress stiffness at F = I is μ [[4, 2, 0], [2, 4, 0], [0, 0, 1]]
// (common practice), the same condensation of the summed stiffness gives
// the axis moduli and the shear modulus is μ. The numbers of the first law
// are those of the demo fit of membrane-M1 with the fung preset.
func TestFungSmallStrainModuliWithoutShear(t *testing.T) {
	laws := []fungLaw{{c: 13.4651, b1: 12.506, b2: 2.46133, b3: 4.32406}, fungLaws[0], fungLaws[1]}
	for _, f := range laws {
		f.b4 = 0
		mod, err := f.model().SmallStrainModuli([]float64{0, 90, 30})
		if err != nil {
			t.Fatal(err)
		}
		e1, e2 := f.c*(f.b1-f.b3*f.b3/f.b2), f.c*(f.b2-f.b3*f.b3/f.b1)
		y1, y2, y30 := mod.Young[0], mod.Young[1], mod.Young[2]
		if !near(y1.Tension, e1, 1e-9) || !near(y1.Compression, e1, 1e-9) || !near(y2.Tension, e2, 1e-9) || !near(y2.Compression, e2, 1e-9) {
			t.Errorf("%+v: moduli along the axes %+v %+v, closed forms %g, %g", f, y1, y2, e1, e2)
		}
		if mod.ShearPositive != 0 || mod.ShearNegative != 0 || y30.Tension != 0 || y30.Compression != 0 {
			t.Errorf("%+v: shear %g/%g, at 30° %+v; want 0 (no shear stiffness)", f, mod.ShearPositive, mod.ShearNegative, y30)
		}
		const w = 0.8
		mu := 2 * w
		m := f.model()
		m.Terms = append(m.Terms, Term{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: w})
		mod, err = m.SmallStrainModuli([]float64{0, 90})
		if err != nil {
			t.Fatal(err)
		}
		a11, a22, a12 := 4*mu+f.c*f.b1, 4*mu+f.c*f.b2, 2*mu+f.c*f.b3
		e1, e2 = a11-a12*a12/a22, a22-a12*a12/a11
		if !near(mod.Young[0].Tension, e1, 1e-9) || !near(mod.Young[1].Compression, e2, 1e-9) || !near(mod.ShearPositive, mu, 1e-9) {
			t.Errorf("%+v with i1-lin %g: E1 %g, E2 %g, G %g; condensed %g, %g, %g", f, w, mod.Young[0].Tension, mod.Young[1].Compression, mod.ShearPositive, e1, e2, mu)
		}
	}
}

// rotatedFung is the orthotropic Fung-type law with its material axes
// turned by theta from the tester's axes (Fung 1979; the planar form
// Q = c1 E11² + c2 E22² + 2 c3 E11 E22 of Choi & Vito 1990, plus Fung's
// shear term 2 c4 E12², all in the material axes; forms from memory),
// written out independently: E' = Rᵀ E R, W = c/2 (e^Q − 1), P = F S with
// S = c/2 e^Q ∂Q/∂E.
type rotatedFung struct {
	c, c1, c2, c3, c4 float64
	theta             float64 // rad
}

func (f rotatedFung) nominal(F []float64) [4]float64 {
	c11 := F[0]*F[0] + F[2]*F[2]
	c22 := F[1]*F[1] + F[3]*F[3]
	c12 := F[0]*F[1] + F[2]*F[3]
	E := [2][2]float64{{(c11 - 1) / 2, c12 / 2}, {c12 / 2, (c22 - 1) / 2}}
	a := [2][2]float64{{math.Cos(f.theta), math.Sin(f.theta)}, {-math.Sin(f.theta), math.Cos(f.theta)}}
	proj := func(u, v [2]float64) float64 {
		return u[0]*(E[0][0]*v[0]+E[0][1]*v[1]) + u[1]*(E[1][0]*v[0]+E[1][1]*v[1])
	}
	e11, e22, e12 := proj(a[0], a[0]), proj(a[1], a[1]), proj(a[0], a[1])
	q := f.c1*e11*e11 + f.c2*e22*e22 + 2*f.c3*e11*e22 + 2*f.c4*e12*e12
	k := f.c / 2 * math.Exp(q)
	g1, g2, g12 := 2*f.c1*e11+2*f.c3*e22, 2*f.c2*e22+2*f.c3*e11, 2*f.c4*e12
	var S [2][2]float64
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			S[i][j] = k * (g1*a[0][i]*a[0][j] + g2*a[1][i]*a[1][j] + g12*(a[0][i]*a[1][j]+a[1][i]*a[0][j]))
		}
	}
	// P = F S as (P11, P22, P12, P21), F = (F11, F12, F21, F22).
	return [4]float64{F[0]*S[0][0] + F[1]*S[1][0], F[2]*S[0][1] + F[3]*S[1][1], F[0]*S[0][1] + F[1]*S[1][1], F[2]*S[0][0] + F[3]*S[1][0]}
}

// Under a pure biaxial stretch (no shear strain) an orthotropic Fung-type
// law whose axes are turned by θ from the tester's is exactly a Fung-type
// law in the tester's axes: with E12 = 0 the material-axis strains are
// E'11 = c²E11 + s²E22, E'22 = s²E11 + c²E22, E'12 = cs(E22 − E11)
// (c = cos θ, s = sin θ), so Q is again a quadratic form in E11 and E22,
// with b1 = c1c⁴ + c2s⁴ + 2(c3 + c4)c²s², b2 = c1s⁴ + c2c⁴ + 2(c3 + c4)c²s²,
// b3 = (c1 + c2)c²s² + c3(c⁴ + s⁴) − 2c4c²s² (derived here). A fit of
// the preset to such data therefore shows nothing of the rotation; only
// shear information can. The audit material (invented c = 4 kPa, c1 = 30,
// c2 = 10, c3 = 4, c4 = 8, axes at 25°) has, without shear, the normal
// stresses of the tester's-axes law with those b (they agree to 1e-12 at
// every point, a check of the derivation; the rotated law also needs a
// shear stress to stay unsheared, about a quarter of P11 here, which a
// test without shear information does not record), and the preset
// recovers those b within the tolerance of TestFungPresetRecovery (1 %
// noise) with R² at the noise's level. With the shear strain of
// fungSpecimen imposed, the same law is fitted visibly worse (lowest R²
// 0.982 against 0.998), since a law in the tester's axes has no coupling
// of normal and shear strain.
func TestFungRotatedAxesWithoutShearIsTesterAxesFung(t *testing.T) {
	law := rotatedFung{c: 4, c1: 30, c2: 10, c3: 4, c4: 8, theta: 25 * math.Pi / 180}
	cs, sn := math.Cos(law.theta), math.Sin(law.theta)
	c2s2 := cs * cs * sn * sn
	want := []float64{
		law.c1*math.Pow(cs, 4) + law.c2*math.Pow(sn, 4) + 2*(law.c3+law.c4)*c2s2,
		law.c1*math.Pow(sn, 4) + law.c2*math.Pow(cs, 4) + 2*(law.c3+law.c4)*c2s2,
		(law.c1+law.c2)*c2s2 + law.c3*(math.Pow(cs, 4)+math.Pow(sn, 4)) - 2*law.c4*c2s2,
	}
	mapped := fungLaw{c: law.c, b1: want[0], b2: want[1], b3: want[2]}
	for _, pr := range fungSpecimenOf(law.nominal, false).Protocols {
		for _, pt := range pr.Points {
			a, b := law.nominal(pt.F[:]), mapped.nominal(pt.F[:])
			for j := 0; j < 2; j++ { // P11, P22: the shear stresses differ (below)
				if math.Abs(a[j]-b[j]) > 1e-12*(1+math.Abs(b[j])) {
					t.Fatalf("F = %v: the rotated law gives %v, the mapped tester's-axes law %v", pt.F, a, b)
				}
			}
		}
	}
	var r2 [2]float64
	for k, shear := range []bool{false, true} {
		r := fitFungTerm(t, law.nominal, shear)
		got := r.Model.Terms[0]
		r2[k] = minR2(r)
		t.Logf("shear %v: c = %.6g, b = %.6g (mapped %.6g); lowest R² %.6f", shear, got.Weight, got.Params, want, r2[k])
		if shear {
			continue
		}
		if math.Abs(got.Weight-law.c) > 0.03*law.c {
			t.Errorf("no shear: c = %g, true %g", got.Weight, law.c)
		}
		for j := range want {
			if math.Abs(got.Params[j]-want[j]) > 0.03*12 {
				t.Errorf("no shear: b%d = %g, the rotated law's %g", j+1, got.Params[j], want[j])
			}
		}
	}
	if r2[0] < 0.995 || r2[1] > 0.99 {
		t.Errorf("lowest R² %.6f without shear (want the noise's, ≥ 0.995: the rotation is invisible), %.6f with shear (want a visible misfit, ≤ 0.99)", r2[0], r2[1])
	}
}
