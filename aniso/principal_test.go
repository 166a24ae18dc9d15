package aniso

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/weft-tools/weft/terms"
)

// ogden is a one-term principal-stretch model with shear modulus mu and
// exponent alpha.
func ogden(mu, alpha float64) *Model {
	id := "ps-pos"
	if alpha < 0 {
		id = "ps-neg"
	}
	return &Model{Terms: []Term{{Shape: terms.Lookup(id), Family: -1, Weight: mu, Params: []float64{alpha}}}}
}

var ogdenExponents = []float64{1, 1.3, 2, 5, 9, 30, -1, -2, -4.5, -9, -30}

// Closed forms of the incompressible one-term Ogden solid (Ogden 1984,
// Non-linear Elastic Deformations, §4.3; Ψ = (2μ/α²)(Σ λi^α − 3)), derived
// here: the principal Cauchy stresses are σi = (2μ/α) λi^α − p.
//   - Uniaxial tension λ1 = λ, λ2 = λ3 = λ^(−1/2), σ2 = σ3 = 0:
//     σ = (2μ/α)(λ^α − λ^(−α/2)).
//   - Equibiaxial tension λ1 = λ2 = λ, λ3 = λ^(−2), σ3 = 0:
//     σ = (2μ/α)(λ^α − λ^(−2α)).
//   - Simple shear γ (principal stretches λ, 1/λ, 1 with γ = λ − 1/λ; the
//     Eulerian axes make sin 2φ = 2/(λ + 1/λ)):
//     σ12 = (σ1 − σ2)/(λ + 1/λ) = (2μ/α)(λ^α − λ^(−α))/(λ + 1/λ).
//
// Checked through the verification table, which solves the uniaxial
// lateral stretch with the analytic tangent, so the equal stretches
// λ2 = λ3 and λ1 = λ2 of these states are exercised in stress and tangent.
func TestOgdenClosedForms(t *testing.T) {
	const mu = 3.5
	for _, al := range ogdenExponents {
		m := ogden(mu, al)
		s := DefaultVerificationSettings(m)
		s.DirectionsDeg = []float64{0, 37}
		s.Stretches = []float64{0.8, 1, 1.1, 1.3, 1.6}
		s.Shears = []float64{0.1, 0.4}
		pts, err := VerificationCases(m, s)
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range pts {
			if p.Err != "" {
				t.Fatalf("α=%g %s: %s", al, p.Case, p.Err)
			}
			l := p.Amount
			var want Sym // load frame (nn, tt, nt)
			var lat float64
			switch p.Case {
			case Uniaxial:
				want, lat = Sym{2 * mu / al * (math.Pow(l, al) - math.Pow(l, -al/2)), 0, 0}, 1/math.Sqrt(l)
			case Equibiaxial:
				v := 2 * mu / al * (math.Pow(l, al) - math.Pow(l, -2*al))
				want, lat = Sym{v, v, 0}, l
			case SimpleShear:
				lp := l/2 + math.Sqrt(1+l*l/4)
				lat = 1
				want = Sym{p.LoadFrame[0], p.LoadFrame[1], 2 * mu / al * (math.Pow(lp, al) - math.Pow(lp, -al)) / (lp + 1/lp)}
			default:
				continue
			}
			// The lateral stress is a small difference of large principal
			// terms at |α| = 30 (λ^±30 spans decades), and off the axes it
			// is the projection of a load-frame stress σ_nn that is larger
			// by decades, so its root is determined only to the round-off
			// of σ_tt (a few ulps of σ_nn) over the lateral stiffness
			// dσ_tt/dλt = 2μ(λt^(α−1) + λ^(−α) λt^(−α−1)) (Ogden 1984,
			// §4.3, from memory), which the continuation from λ = 1 does
			// not beat by starting from the closed form.
			tol := 1e-14 * math.Max(10, math.Abs(al)*math.Abs(al))
			if p.Case == Uniaxial {
				stiff := 2 * mu * (math.Pow(lat, al-1) + math.Pow(l, -al)*math.Pow(lat, -al-1))
				tol += 4 * 0x1p-52 * math.Abs(want[0]) / stiff
			}
			if !near(p.LateralStretch, lat, tol) {
				t.Errorf("α=%g %s θ=%g λ=%g: lateral stretch %.16g, closed form %.16g", al, p.Case, p.DirectionDeg, l, p.LateralStretch, lat)
			}
			scale := mu * math.Max(1, math.Abs(want[0])+math.Abs(want[2]))
			for j := range want {
				if math.Abs(p.LoadFrame[j]-want[j]) > 1e-12*scale {
					t.Errorf("α=%g %s θ=%g λ=%g: σ[%d] = %.15g, closed form %.15g", al, p.Case, p.DirectionDeg, l, j, p.LoadFrame[j], want[j])
				}
			}
		}
	}
}

// The in-plane Cauchy stress against an independent computation: the full
// 3×3 B = diag(B2, F33²) decomposed by gonum's symmetric eigensolver (a
// general-purpose library), σ = Σ (2μ/α) λi^α ni⊗ni − p 1 with p from
// σ33 = 0 (Ogden 1984, §4.3), at sheared states and at equibiaxial ones
// (where the eigenvectors are arbitrary but the stress is not).
func TestOgdenStressAgainstEigen(t *testing.T) {
	Fs := [][4]float64{{1.2, 0.15, -0.05, 0.95}, {0.9, 0.3, 0.1, 1.25}, {1.3, 0, 0, 1.3}, {1.1, 0.2, -0.2, 1.1},
		{1, 0.4, 0, 1}, {0.85, 0, 0.12, 1.4}, {1.15, 1e-9, 0, 1.15}}
	for _, al := range ogdenExponents {
		m := ogden(2, al)
		for _, F := range Fs {
			r, err := m.Evaluate(F)
			if err != nil {
				t.Fatal(err)
			}
			j2 := F[0]*F[3] - F[1]*F[2]
			b := mat.NewSymDense(3, []float64{
				F[0]*F[0] + F[1]*F[1], F[0]*F[2] + F[1]*F[3], 0,
				F[0]*F[2] + F[1]*F[3], F[2]*F[2] + F[3]*F[3], 0,
				0, 0, 1 / (j2 * j2)})
			var es mat.EigenSym
			if !es.Factorize(b, true) {
				t.Fatal("eigen-decomposition failed")
			}
			ev := es.Values(nil)
			var vec mat.Dense
			es.VectorsTo(&vec)
			var sig [3][3]float64
			energy := 0.0
			for i, e := range ev {
				l := math.Sqrt(e)
				h := 2 * 2 / al * math.Pow(l, al)
				energy += 2 * 2 / (al * al) * (math.Pow(l, al) - 1)
				for a := 0; a < 3; a++ {
					for c := 0; c < 3; c++ {
						sig[a][c] += h * vec.At(a, i) * vec.At(c, i)
					}
				}
			}
			p := sig[2][2]
			want := Sym{sig[0][0] - p, sig[1][1] - p, sig[0][1]}
			scale := math.Abs(want[0]) + math.Abs(want[1]) + math.Abs(want[2]) + 1
			for j := range want {
				if math.Abs(r.Cauchy[j]-want[j]) > 1e-12*scale {
					t.Errorf("α=%g F=%v: σ[%d] = %.15g, eigen-decomposition %.15g", al, F, j, r.Cauchy[j], want[j])
				}
			}
			if math.Abs(r.Energy-energy) > 1e-12*math.Max(1, energy) {
				t.Errorf("α=%g F=%v: energy %.15g, eigen-decomposition %.15g", al, F, r.Energy, energy)
			}
		}
	}
}

// The analytic tangent of principal-stretch terms against central finite
// differences of Evaluate's nominal stress (common practice), at sheared
// states, at equibiaxial ones, at F = I (three equal stretches) and next
// to them; and its continuity across λ1 = λ2: A at diag(λ(1 + ε), λ)
// approaches A at diag(λ, λ) linearly in ε, with no round-off blow-up.
func TestOgdenTangent(t *testing.T) {
	Fs := [][4]float64{{1.2, 0.15, -0.05, 0.95}, {1, 0, 0, 1}, {1.3, 0, 0, 1.3}, {1.1, 0.2, -0.2, 1.1},
		{0.9, 0, 0, 0.9}, {1.2, 1e-7, 0, 1.2}, {1.25 * (1 + 1e-9), 0, 0, 1.25}}
	for _, al := range ogdenExponents {
		m := ogden(1.7, al)
		for _, F := range Fs {
			tg, err := m.Tangent(F)
			if err != nil {
				t.Fatal(err)
			}
			r, _ := m.Evaluate(F)
			pe := NominalFOrder(r.Nominal)
			amax := 0.0
			for i := range tg.A {
				amax = math.Max(amax, math.Abs(pe[i]))
				for j := range tg.A[i] {
					amax = math.Max(amax, math.Abs(tg.A[i][j]))
					if math.Abs(tg.A[i][j]-tg.A[j][i]) > 1e-13*amax {
						t.Errorf("α=%g F=%v: tangent not symmetric", al, F)
					}
				}
				if math.Abs(tg.P[i]-pe[i]) > 1e-12*amax {
					t.Errorf("α=%g F=%v: P[%d] = %.15g from ∂W/∂F, Evaluate %.15g", al, F, i, tg.P[i], pe[i])
				}
			}
			fdA := fdTangent(t, m, F, 1e-6)
			for j := 0; j < 4; j++ {
				for i := 0; i < 4; i++ {
					fd := fdA[i][j]
					// h² times the third derivative, which grows like α³.
					tol := 1e-7 * math.Max(1, amax) * math.Max(1, math.Abs(al*al*al)/100)
					if math.Abs(fd-tg.A[i][j]) > tol {
						t.Errorf("α=%g F=%v: A[%d][%d] = %.10g, finite difference %.10g", al, F, i, j, tg.A[i][j], fd)
					}
				}
			}
		}
		for _, l := range []float64{0.9, 1, 1.25} {
			a0, err := m.Tangent([4]float64{l, 0, 0, l})
			if err != nil {
				t.Fatal(err)
			}
			amax := largestEntry(a0.A)
			for _, eps := range []float64{1e-3, 1e-6, 1e-9, 1e-12, 1e-15} {
				for _, F := range [][4]float64{{l * (1 + eps), 0, 0, l}, {l, eps, 0, l}} {
					a, _ := m.Tangent(F)
					for i := range a.A {
						for j := range a.A[i] {
							d := math.Abs(a.A[i][j] - a0.A[i][j])
							// A changes at the rate of W's third derivative,
							// which grows like |α| times A.
							if d > (10*eps*math.Max(1, math.Abs(al))+1e-12)*amax {
								t.Errorf("α=%g at %v: A[%d][%d] = %.15g, equibiaxial %.15g", al, F, i, j, a.A[i][j], a0.A[i][j])
							}
						}
					}
				}
			}
		}
	}
}

// Stress columns of principal-stretch terms (and their exponent
// derivative) at and next to equibiaxial points: finite, equal to
// Evaluate, and the derivative equal to central differences in α.
func TestOgdenColumns(t *testing.T) {
	F := [][4]float64{{1.2, 0, 0, 1.2}, {1.2 + 1e-10, 0, 0, 1.2}, {1, 0, 0, 1}, {1.1, 0.05, 0.05, 1.1}, {1.3, 0.1, -0.02, 0.9}}
	d, err := NewDataset(F, Output{Nominal: true, Components: []Component{0, 1, 2, 3}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, al := range ogdenExponents {
		m := ogden(1, al)
		var c Columns
		d.Fill(m, &c, true)
		for i, f := range F {
			r, _ := m.Evaluate(f)
			for j := 0; j < 4; j++ {
				if v := c.A[i*4+j]; math.IsNaN(v) || math.Abs(v-r.Nominal[j]) > 1e-12*math.Max(1, math.Abs(r.Nominal[j])) {
					t.Errorf("α=%g F=%v: column %g, Evaluate %g", al, f, v, r.Nominal[j])
				}
			}
		}
		h := 1e-6 * math.Max(1, math.Abs(al))
		if al == 1 || al == -1 || al == 30 || al == -30 {
			continue // at a bound: no central difference
		}
		var cp, cm Columns
		d.Fill(ogden(1, al+h), &cp, false)
		d.Fill(ogden(1, al-h), &cm, false)
		for r := range c.A {
			fd := (cp.A[r] - cm.A[r]) / (2 * h)
			if math.Abs(fd-c.DParam[0][r]) > 1e-6*math.Max(1, math.Abs(fd)) {
				t.Errorf("α=%g row %d: ∂column/∂α = %.10g, finite difference %.10g", al, r, c.DParam[0][r], fd)
			}
		}
	}
}

// Objectivity with principal-stretch terms of large |α| (the catalogue-wide
// rotation test uses the default exponents): rotating the frame rotates
// the stress and leaves the energy (Holzapfel 2000, §6.2; common
// practice).
func TestOgdenRotationInvariance(t *testing.T) {
	m := &Model{Terms: []Term{
		{Shape: terms.Lookup("ps-pos"), Family: -1, Weight: 1.5, Params: []float64{9}},
		{Shape: terms.Lookup("ps-neg"), Family: -1, Weight: 0.7, Params: []float64{-7}}}}
	for _, F := range [][4]float64{{1.18, 0.07, -0.04, 1.06}, {1.1, 0, 0, 1.1}} {
		r0, err := m.Evaluate(F)
		if err != nil {
			t.Fatal(err)
		}
		for _, phi := range []float64{10, 45, 137} {
			s, c := math.Sincos(phi * deg)
			f11, f12, f21, f22 := F[0], F[1], F[2], F[3]
			a11, a12 := c*f11-s*f21, c*f12-s*f22
			a21, a22 := s*f11+c*f21, s*f12+c*f22
			Fr := [4]float64{a11*c - a12*s, a11*s + a12*c, a21*c - a22*s, a21*s + a22*c}
			r, err := m.Evaluate(Fr)
			if err != nil {
				t.Fatal(err)
			}
			s11, s22, s12 := r0.Cauchy[0], r0.Cauchy[1], r0.Cauchy[2]
			want := Sym{c*c*s11 - 2*c*s*s12 + s*s*s22, s*s*s11 + 2*c*s*s12 + c*c*s22, c*s*(s11-s22) + (c*c-s*s)*s12}
			for j := range want {
				if math.Abs(r.Cauchy[j]-want[j]) > 1e-11*(1+math.Abs(s11)+math.Abs(s22)) {
					t.Errorf("F=%v rotation %g°: σ%d = %.15g, rotated %.15g", F, phi, j, r.Cauchy[j], want[j])
				}
			}
			if !near(r.Energy, r0.Energy, 1e-12) {
				t.Errorf("F=%v rotation %g°: energy %.15g, unrotated %.15g", F, phi, r.Energy, r0.Energy)
			}
		}
	}
}

// Small-strain moduli: w is the initial shear modulus of a principal-
// stretch term whatever α (Ogden 1972's normalisation), and an
// incompressible isotropic solid has Young's modulus 3μ (common practice).
func TestOgdenSmallStrainModuli(t *testing.T) {
	for _, al := range ogdenExponents {
		m := ogden(2.5, al)
		mod, err := m.SmallStrainModuli([]float64{0, 33})
		if err != nil {
			t.Fatal(err)
		}
		if !near(mod.InitialShear, 2.5, 1e-13) {
			t.Errorf("α=%g: μ0 = %.15g, want 2.5", al, mod.InitialShear)
		}
		for _, y := range mod.Young {
			if !near(y.Tension, 7.5, 1e-9) || !near(y.Compression, 7.5, 1e-9) {
				t.Errorf("α=%g at %g°: E = %g / %g, want 3μ = 7.5", al, y.AngleDeg, y.Tension, y.Compression)
			}
		}
		if !near(mod.ShearPositive, 2.5, 1e-9) {
			t.Errorf("α=%g: G12 = %g, want μ = 2.5", al, mod.ShearPositive)
		}
	}
}

// ogdenEigenNominal is the nominal stress (P11, P22, P12, P21) of a
// one-term Ogden solid computed independently of the catalogue code path:
// gonum's 3×3 symmetric eigen-decomposition of B, principal Cauchy
// stresses (2μ/α) λi^α − p with σ33 = 0 (Ogden 1984, §4.3), P = σ F⁻ᵀ.
func ogdenEigenNominal(t testing.TB, mu, al float64, F [4]float64) [4]float64 {
	j2 := F[0]*F[3] - F[1]*F[2]
	b := mat.NewSymDense(3, []float64{
		F[0]*F[0] + F[1]*F[1], F[0]*F[2] + F[1]*F[3], 0,
		F[0]*F[2] + F[1]*F[3], F[2]*F[2] + F[3]*F[3], 0,
		0, 0, 1 / (j2 * j2)})
	var es mat.EigenSym
	if !es.Factorize(b, true) {
		t.Fatal("eigen-decomposition failed")
	}
	var vec mat.Dense
	es.VectorsTo(&vec)
	var sig [3][3]float64
	for i, e := range es.Values(nil) {
		h := 2 * mu / al * math.Pow(math.Sqrt(e), al)
		for a := 0; a < 3; a++ {
			for c := 0; c < 3; c++ {
				sig[a][c] += h * vec.At(a, i) * vec.At(c, i)
			}
		}
	}
	p := sig[2][2]
	s11, s22, s12 := sig[0][0]-p, sig[1][1]-p, sig[0][1]
	// F⁻ᵀ = [[F22, −F21], [−F12, F11]]/J.
	it := [4]float64{F[3] / j2, -F[2] / j2, -F[1] / j2, F[0] / j2} // (11, 12, 21, 22)
	return [4]float64{s11*it[0] + s12*it[2], s12*it[1] + s22*it[3], s11*it[1] + s12*it[3], s12*it[0] + s22*it[2]}
}

// Recovery of a principal-stretch isotropic material (μ = 3 kPa, α = 9;
// invented) whose data are generated by ogdenEigenNominal with 1 % noise:
// fitted on the five standard ratios with ps-pos alone, μ and α come back
// within 3 %, and the extreme protocols 1:0.25 and 0.25:1, never fitted,
// are predicted within 3 % (RMSE per protocol and axis over that axis's
// largest stress).
func TestRecoverPrincipalStretchMaterial(t *testing.T) {
	const mu, al = 3.0, 9.0
	gen := func(ratios [][2]float64, noise float64) *Problem {
		spec := synthSpecimen(t, ogden(1, 2), synthOptions{ratios: ratios, maxStrain: 0.2})
		for pi := range spec.Protocols {
			pr := &spec.Protocols[pi]
			for i := range pr.Points {
				pr.Points[i].Stress = ogdenEigenNominal(t, mu, al, pr.Points[i].F)
			}
			addNoise(pr, noise, 21+uint64(pi))
		}
		p, err := NewProblem(spec, nil)
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	fitP := gen(standardRatios, 0.01)
	st := Structure{Layout: LayoutNone, Terms: []TermSpec{{Shape: terms.Lookup("ps-pos"), Family: -1}}}
	r, err := Fit(fitP, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	got := r.Model.Terms[0]
	t.Logf("recovered μ = %.5g, α = %.5g, loss %.3g", got.Weight, got.Params[0], r.Loss)
	if math.Abs(got.Weight/mu-1) > 0.03 || math.Abs(got.Params[0]/al-1) > 0.03 {
		t.Errorf("recovered μ = %.4g, α = %.4g; true %g, %g", got.Weight, got.Params[0], mu, al)
	}
	checkPredicted(t, r.Model, gen([][2]float64{{1, 0.25}, {0.25, 1}}, 0).Specimen, 0.03)
}

// The matrix/fibre split counts principal-stretch terms as matrix and the
// recruitment term as its family, and both share the energy.
func TestSplitWithNewShapes(t *testing.T) {
	m := &Model{Families: []Family{{Name: "f1", Angle: 25 * deg}}, Terms: []Term{
		{Shape: terms.Lookup("ps-pos"), Family: -1, Weight: 2, Params: []float64{7}},
		{Shape: terms.Lookup("ps-neg"), Family: -1, Weight: 0.3, Params: []float64{-3}},
		{Shape: terms.Lookup("fib-recruit"), Family: 0, Weight: 300, Params: []float64{1.02, 0.08}}}}
	p, err := NewProblem(synthSpecimen(t, m, synthOptions{}), nil)
	if err != nil {
		t.Fatal(err)
	}
	s, err := Split(p, m)
	if err != nil {
		t.Fatal(err)
	}
	if s.Groups[s.TermGroup[0]] != "matrix" || s.Groups[s.TermGroup[1]] != "matrix" || s.Groups[s.TermGroup[2]] != "f1" {
		t.Errorf("groups %v of terms %v", s.TermGroup, s.Terms)
	}
	if g := s.Protocols[0].GroupEnergyShare; len(g) != 2 || math.Abs(g[0]+g[1]-1) > 1e-12 || g[0] <= 0 || g[1] <= 0 {
		t.Errorf("energy shares %v", g)
	}
}
