package aniso

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/weft-tools/weft/biaxial"
)

// Materials written here from their defining formulas, by code that shares
// nothing with the catalogue's evaluation (no terms shapes, no planar
// quadrature, no Model.Evaluate): the data that test discovery and fitting
// on specimens the catalogue did not produce.

// material returns the in-plane Cauchy stress (σ11, σ22, σ12) of a thin
// incompressible specimen in plane stress at F = (F11, F12, F21, F22).
type material func(F [4]float64) [3]float64

// fibreLaw is the nominal stress along one fibre at fibre stretch λ
// (force per reference area of fibre), zero while λ ≤ 1.
type fibreLaw func(lambda float64) float64

// expSqFibre is the fibre of Holzapfel, Gasser & Ogden 2000 with energy
// k1/(2k2)(exp(k2(λ² − 1)²) − 1): its nominal fibre stress is
// dψ/dλ = 2λ k1 (λ² − 1) exp(k2(λ² − 1)²).
func expSqFibre(k1, k2 float64) fibreLaw {
	return func(l float64) float64 {
		if l <= 1 {
			return 0
		}
		e := l*l - 1
		return 2 * l * k1 * e * math.Exp(k2*e*e)
	}
}

// recruitedFibre is a bundle whose fibres straighten at stretches spread
// uniformly over [onset, onset + spread], each linear once straight with
// nominal stress E(λ/λs − 1) (Lanir 1983, J Biomech 16:1–12), integrated
// over λs by the midpoint rule with 200 points. The k straightening
// stretches below λ contribute E(λ Σ 1/λs − k)/200; the sums of 1/λs are
// formed once.
func recruitedFibre(E, onset, spread float64) fibreLaw {
	const n = 200
	var inv [n + 1]float64 // inv[k] = Σ_{i<k} 1/λs_i
	for i := 0; i < n; i++ {
		inv[i+1] = inv[i] + 1/(onset+spread*(float64(i)+0.5)/n)
	}
	return func(l float64) float64 {
		if spread == 0 {
			return math.Max(0, E*(l/onset-1))
		}
		// λs_i < λ ⟺ i < (λ − onset)·n/spread − 0.5; then confirm at the edge.
		k := int(math.Ceil((l-onset)*n/spread - 0.5))
		k = max(0, min(n, k))
		for k > 0 && !(l > onset+spread*(float64(k-1)+0.5)/n) {
			k--
		}
		for k < n && l > onset+spread*(float64(k)+0.5)/n {
			k++
		}
		return E * (l*inv[k] - float64(k)) / n
	}
}

// spreadFamily is a fibre family spread in the plane with a von Mises
// density in 2θ of concentration b about alpha (radians); b < 0 means an
// ideal family. Its stress is integrated over θ by the midpoint rule with
// 1440 directions (relative error about 1e-6, far below the data's noise),
// the density normalised by the same sum.
type spreadFamily struct {
	alpha, b float64
	law      fibreLaw
}

func (f spreadFamily) cauchy(F [4]float64) [3]float64 {
	return f.directions().cauchy(F)
}

// spreadDirections are a family's quadrature directions (cos θ, sin θ) and
// normalised weights, which do not depend on the deformation.
type spreadDirections struct {
	cs, sn, wts []float64
	law         fibreLaw
}

func (f spreadFamily) directions() spreadDirections {
	d := spreadDirections{law: f.law}
	if f.b < 0 {
		sn, cs := math.Sincos(f.alpha)
		d.cs, d.sn, d.wts = []float64{cs}, []float64{sn}, []float64{1}
		return d
	}
	const n = 1440
	d.cs, d.sn, d.wts = make([]float64, n), make([]float64, n), make([]float64, n)
	z := 0.0
	for i := range d.wts {
		th := f.alpha - math.Pi/2 + math.Pi*(float64(i)+0.5)/n
		d.sn[i], d.cs[i] = math.Sincos(th)
		d.wts[i] = math.Exp(f.b * (math.Cos(2*(th-f.alpha)) - 1))
		z += d.wts[i]
	}
	for i := range d.wts {
		d.wts[i] /= z
	}
	return d
}

// wrappedNormalFamily is a fibre family whose in-plane directions follow a
// wrapped normal density of standard deviation sd (radians) about alpha,
// wrapped with the period π of an axial direction (Mardia & Jupp 2000,
// §3.5; from memory), integrated as directions does, by the midpoint rule
// with 1440 directions and the density normalised by the same sum. Unlike
// the von Mises density of the catalogue's spread families it is not of
// the form exp(b cos 2(θ − α)).
func wrappedNormalFamily(alpha, sd float64, law fibreLaw) spreadDirections {
	const n = 1440
	d := spreadDirections{law: law, cs: make([]float64, n), sn: make([]float64, n), wts: make([]float64, n)}
	z := 0.0
	for i := range d.wts {
		off := -math.Pi/2 + math.Pi*(float64(i)+0.5)/n
		d.sn[i], d.cs[i] = math.Sincos(alpha + off)
		for k := -3; k <= 3; k++ {
			x := off + float64(k)*math.Pi
			d.wts[i] += math.Exp(-x * x / (2 * sd * sd))
		}
		z += d.wts[i]
	}
	for i := range d.wts {
		d.wts[i] /= z
	}
	return d
}

func (d spreadDirections) cauchy(F [4]float64) [3]float64 {
	var s [3]float64
	for i, w := range d.wts {
		cs, sn := d.cs[i], d.sn[i]
		a := [2]float64{F[0]*cs + F[1]*sn, F[2]*cs + F[3]*sn}
		l := math.Hypot(a[0], a[1])
		if l <= 1 {
			continue
		}
		// σ = λ ψ′(λ) n⊗n with n = a/λ (J = 1).
		c := w * d.law(l) / l
		s[0] += c * a[0] * a[0]
		s[1] += c * a[1] * a[1]
		s[2] += c * a[0] * a[1]
	}
	return s
}

// planeStressB returns the left Cauchy–Green tensor B = F Fᵀ of an
// incompressible membrane at the in-plane F: B11, B22, B12 and B33 =
// 1/det(F)², written out here without the package's kinematics.
func planeStressB(F [4]float64) (b11, b22, b12, b33 float64) {
	j := F[0]*F[3] - F[1]*F[2]
	return F[0]*F[0] + F[1]*F[1], F[2]*F[2] + F[3]*F[3], F[0]*F[2] + F[1]*F[3], 1 / (j * j)
}

// neoHookeanMatrix is σ = 2 C10 (B − B33 1) in plane stress (Treloar 1943;
// common practice).
func neoHookeanMatrix(c10 float64, F [4]float64) [3]float64 {
	b11, b22, b12, b33 := planeStressB(F)
	return [3]float64{2 * c10 * (b11 - b33), 2 * c10 * (b22 - b33), 2 * c10 * b12}
}

// fibreMaterial is a neo-Hookean matrix with spread fibre families.
func fibreMaterial(c10 float64, fams ...spreadFamily) material {
	dirs := make([]spreadDirections, len(fams))
	for i, f := range fams {
		dirs[i] = f.directions()
	}
	return func(F [4]float64) [3]float64 {
		s := neoHookeanMatrix(c10, F)
		for _, f := range dirs {
			c := f.cauchy(F)
			for j := range s {
				s[j] += c[j]
			}
		}
		return s
	}
}

// ogdenMaterial is the one-term incompressible solid of Ogden 1972 with
// energy μ(2/α²)(λ1^α + λ2^α + λ3^α − 3), its principal stretches taken
// from a full 3×3 eigen-decomposition of B by gonum (a general-purpose
// library): σ = Σ (2μ/α)(λi^α − λ3^α) ni⊗ni over the in-plane directions,
// the pressure fixed by σ33 = 0.
func ogdenMaterial(mu, alpha float64) material {
	return func(F [4]float64) [3]float64 {
		j := F[0]*F[3] - F[1]*F[2]
		vals, vecs := eigenB(F)
		p := 2 * mu / alpha * math.Pow(1/(j*j), alpha/2)
		var s [3]float64
		for i, v := range vals {
			n := [3]float64{vecs.At(0, i), vecs.At(1, i), vecs.At(2, i)}
			if math.Abs(n[2]) > 0.5 {
				continue // the thickness direction
			}
			c := 2*mu/alpha*math.Pow(v, alpha/2) - p
			s[0] += c * n[0] * n[0]
			s[1] += c * n[1] * n[1]
			s[2] += c * n[0] * n[1]
		}
		return s
	}
}

// eigenB returns the eigenvalues and eigenvectors (columns) of the full
// 3×3 B = F Fᵀ of an incompressible membrane at the in-plane F, by gonum's
// symmetric eigen-decomposition.
func eigenB(F [4]float64) ([]float64, *mat.Dense) {
	j := F[0]*F[3] - F[1]*F[2]
	B := mat.NewSymDense(3, []float64{
		F[0]*F[0] + F[1]*F[1], F[0]*F[2] + F[1]*F[3], 0,
		F[0]*F[2] + F[1]*F[3], F[2]*F[2] + F[3]*F[3], 0,
		0, 0, 1 / (j * j),
	})
	var eig mat.EigenSym
	if !eig.Factorize(B, true) {
		panic("eigen-decomposition failed")
	}
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	return eig.Values(nil), &vecs
}

// principalMaterial is an isotropic incompressible solid given by its
// Kirchhoff stresses τi = λi ∂Ψ/∂λi in terms of the principal stretches,
// which come from a full 3×3 eigen-decomposition of B by gonum (a
// general-purpose library); σ = Σ (τi − τ3) ni⊗ni over the in-plane
// directions, the pressure fixed by σ33 = 0.
func principalMaterial(tau func(l [3]float64) [3]float64) material {
	return func(F [4]float64) [3]float64 {
		vals, vecs := eigenB(F)
		var l [3]float64
		k3 := -1
		for i, v := range vals {
			l[i] = math.Sqrt(v)
			if math.Abs(vecs.At(2, i)) > 0.5 {
				k3 = i // the thickness direction
			}
		}
		t := tau(l)
		var s [3]float64
		for i := range vals {
			if i == k3 {
				continue
			}
			n := [2]float64{vecs.At(0, i), vecs.At(1, i)}
			c := t[i] - t[k3]
			s[0] += c * n[0] * n[0]
			s[1] += c * n[1] * n[1]
			s[2] += c * n[0] * n[1]
		}
		return s
	}
}

// expHenckyMaterial is the exponentiated Hencky energy of Neff, Ghiba &
// Lankeit 2015 (from memory), incompressible: Ψ = (μ/k) exp(k Σ (ln λi)²),
// so τi = 2μ exp(k Σ (ln λj)²) ln λi. It is isotropic, and none of the
// catalogue's isotropic shapes is of its form.
func expHenckyMaterial(mu, k float64) material {
	return principalMaterial(func(l [3]float64) [3]float64 {
		s := 0.0
		for _, x := range l {
			s += math.Log(x) * math.Log(x)
		}
		e := 2 * mu * math.Exp(k*s)
		return [3]float64{e * math.Log(l[0]), e * math.Log(l[1]), e * math.Log(l[2])}
	})
}

// nominalOf returns (P11, P22, P12, P21) = σ F⁻ᵀ of a material.
func nominalOf(m material, F [4]float64) [4]float64 {
	s := m(F)
	j := F[0]*F[3] - F[1]*F[2]
	// F⁻ᵀ = [[F22, −F21], [−F12, F11]] / J.
	it := [2][2]float64{{F[3] / j, -F[2] / j}, {-F[1] / j, F[0] / j}}
	sg := [2][2]float64{{s[0], s[2]}, {s[2], s[1]}}
	var P [2][2]float64
	for a := 0; a < 2; a++ {
		for b := 0; b < 2; b++ {
			for k := 0; k < 2; k++ {
				P[a][b] += sg[a][k] * it[k][b]
			}
		}
	}
	return [4]float64{P[0][0], P[1][1], P[0][1], P[1][0]}
}

// suturedShear finds F12, F21 with P12 = P21 = 0 at the given normal
// stretches (a specimen on sutures shears freely).
func suturedShear(t testing.TB, m material, l1, l2 float64, start [2]float64) [2]float64 {
	x, ok := newton2(start, func(x [2]float64) [2]float64 {
		P := nominalOf(m, [4]float64{l1, x[0], x[1], l2})
		return [2]float64{P[2], P[3]}
	}, func(x [2]float64) float64 {
		return math.Abs(nominalOf(m, [4]float64{l1, x[0], x[1], l2})[0]) + 1e-12
	})
	if !ok {
		t.Fatalf("sutured shear did not converge at λ = (%g, %g)", l1, l2)
	}
	return x
}

// loadedStretches finds the stretches λ1, λ2 of a pure biaxial stretch
// (no shear) at which material m carries the nominal stresses P11, P22 of
// target, from start: the protocols of a load-controlled tester, which
// holds the ratio of the two axes' loads (common practice in planar
// biaxial testing of soft tissue).
func loadedStretches(t testing.TB, m material, target, start [2]float64) [2]float64 {
	scale := math.Max(math.Abs(target[0]), math.Abs(target[1])) + 1e-12
	x, ok := newton2(start, func(x [2]float64) [2]float64 {
		P := nominalOf(m, [4]float64{x[0], 0, 0, x[1]})
		return [2]float64{P[0] - target[0], P[1] - target[1]}
	}, func([2]float64) float64 { return scale })
	if !ok {
		t.Fatalf("no stretches carry the loads P11, P22 = %g, %g", target[0], target[1])
	}
	return x
}

// newton2 solves res(x) = 0 for two unknowns by Newton's method with a
// central finite-difference Jacobian (step 1e-7), from x, until |res| <
// 1e-11 scale(x); ok is false after 100 steps or at a singular Jacobian.
func newton2(x [2]float64, res func([2]float64) [2]float64, scale func([2]float64) float64) ([2]float64, bool) {
	for it := 0; it < 100; it++ {
		r := res(x)
		if math.Hypot(r[0], r[1]) < 1e-11*scale(x) {
			return x, true
		}
		const h = 1e-7
		var J [2][2]float64
		for k := 0; k < 2; k++ {
			xp, xm := x, x
			xp[k] += h
			xm[k] -= h
			rp, rm := res(xp), res(xm)
			J[0][k] = (rp[0] - rm[0]) / (2 * h)
			J[1][k] = (rp[1] - rm[1]) / (2 * h)
		}
		det := J[0][0]*J[1][1] - J[0][1]*J[1][0]
		if det == 0 {
			break
		}
		d0 := (J[1][1]*r[0] - J[0][1]*r[1]) / det
		d1 := (-J[1][0]*r[0] + J[0][0]*r[1]) / det
		x[0] -= d0
		x[1] -= d1
	}
	return x, false
}

// synthFrom generates a specimen from an independent material, with the
// protocols, noise and mounting of o (see synthSpecimen).
func synthFrom(t testing.TB, m material, o synthOptions) *biaxial.Specimen {
	t.Helper()
	o = o.withDefaults()
	rng := rand.New(rand.NewPCG(o.seed, 99))
	s := &biaxial.Specimen{Name: "independent", StressUnit: "kPa", Kind: biaxial.Nominal, HasShear: o.sutured}
	s.Measured[biaxial.C11], s.Measured[biaxial.C22] = true, true
	if o.sutured {
		s.Measured[biaxial.C12], s.Measured[biaxial.C21] = true, true
	}
	for _, r := range o.ratios {
		pr := biaxial.Protocol{Label: label(r), UserWeight: 1}
		var shear [2]float64
		stretch := [2]float64{1, 1}
		for i := 1; i <= o.points; i++ {
			e := o.maxStrain * float64(i) / float64(o.points)
			F := [4]float64{1 + r[0]*e, 0, 0, 1 + r[1]*e}
			if o.loadMax > 0 {
				s := o.loadMax * float64(i) / float64(o.points)
				stretch = loadedStretches(t, m, [2]float64{r[0] * s, r[1] * s}, stretch)
				F = [4]float64{stretch[0], 0, 0, stretch[1]}
			}
			if o.sutured {
				shear = suturedShear(t, m, F[0], F[3], shear)
				F[1], F[2] = shear[0], shear[1]
			}
			P := nominalOf(m, F)
			if o.sutured {
				P[2], P[3] = 0, 0 // sutures carry no shear
			}
			pr.Points = append(pr.Points, biaxial.Point{F: F, Stress: P, Line: i + 1, Cycle: 1, Time: math.NaN()})
		}
		addNoiseRand(&pr, o.noise, rng, s.Measured)
		s.Protocols = append(s.Protocols, pr)
	}
	addStretchNoise(s, o)
	return s
}

// addStretchNoise adds o.stretchNoise to every recorded F entry that s
// measures (see synthOptions.stretchNoise).
func addStretchNoise(s *biaxial.Specimen, o synthOptions) {
	if o.stretchNoise <= 0 {
		return
	}
	rng := rand.New(rand.NewPCG(o.seed, 1234))
	entries := []int{0, 3}
	if o.sutured {
		entries = []int{0, 1, 2, 3}
	}
	for p := range s.Protocols {
		for i := range s.Protocols[p].Points {
			for _, e := range entries {
				s.Protocols[p].Points[i].F[e] += o.stretchNoise * rng.NormFloat64()
			}
		}
	}
}

// The independent materials agree with the catalogue's evaluation where
// both describe the same material: an ideal exponential fibre family, a
// planar family evaluated by the quadrature of planar.go, and the
// exponential matrix.
func TestIndependentMaterialsAgree(t *testing.T) {
	F := [4]float64{1.2, 0.04, -0.03, 1.1}
	m := &Model{Families: []Family{{Angle: 0.5, Planar: true, Concentration: 3}, {Angle: -0.7}},
		Terms: []Term{
			{Shape: lookup("i1-lin"), Family: -1, Weight: 5},
			{Shape: lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{3}},
			{Shape: lookup("fib-expsq"), Family: 1, Weight: 7, Params: []float64{1.5}},
		}}
	r, err := m.Evaluate(F)
	if err != nil {
		t.Fatal(err)
	}
	ind := fibreMaterial(5, spreadFamily{0.5, 3, expSqFibre(20, 3)}, spreadFamily{-0.7, -1, expSqFibre(7, 1.5)})(F)
	for j := range ind {
		if !near(ind[j], r.Cauchy[j], 1e-6) {
			t.Errorf("σ[%d]: independent %.10g, catalogue %.10g", j, ind[j], r.Cauchy[j])
		}
	}
	// The exponential matrix of Demiray 1972 and the catalogue's i1-exp.
	dm := &Model{Terms: []Term{{Shape: lookup("i1-exp"), Family: -1, Weight: 5, Params: []float64{3}}}}
	rd, err := dm.Evaluate(F)
	if err != nil {
		t.Fatal(err)
	}
	for j, v := range demirayMatrix(5, 3)(F) {
		if !near(v, rd.Cauchy[j], 1e-12) {
			t.Errorf("Demiray σ[%d]: independent %.15g, catalogue %.15g", j, v, rd.Cauchy[j])
		}
	}
}

// demirayMatrix is the exponential matrix of Demiray 1972, energy
// a/(2b)(exp(b(I1 − 3)) − 1) with a = 2 halfA: σ = 2 (a/2) exp(b(I1 − 3))
// (B − B33 1) in plane stress, written out here without the package's
// kinematics.
func demirayMatrix(halfA, b float64) material {
	return func(F [4]float64) [3]float64 {
		b11, b22, b12, b33 := planeStressB(F)
		g := 2 * halfA * math.Exp(b*(b11+b22+b33-3))
		return [3]float64{g * (b11 - b33), g * (b22 - b33), g * b12}
	}
}

// mooneyRivlinMatrix is σ = 2C10 (B − B33 1) + 2C01 (I1 B − B² − (I1 B33 −
// B33²) 1) in plane stress (Mooney 1940, Rivlin 1948; Holzapfel 2000 §6.5),
// written out here without the package's kinematics.
func mooneyRivlinMatrix(c10, c01 float64) material {
	return func(F [4]float64) [3]float64 {
		b11, b22, b12, b33 := planeStressB(F)
		i1 := b11 + b22 + b33
		bb11 := b11*b11 + b12*b12
		bb22 := b22*b22 + b12*b12
		bb12 := b12 * (b11 + b22)
		q := i1*b33 - b33*b33
		return [3]float64{
			2*c10*(b11-b33) + 2*c01*(i1*b11-bb11-q),
			2*c10*(b22-b33) + 2*c01*(i1*b22-bb22-q),
			2*c10*b12 + 2*c01*(i1*b12-bb12),
		}
	}
}

// plus adds materials.
func plus(ms ...material) material {
	return func(F [4]float64) [3]float64 {
		var s [3]float64
		for _, m := range ms {
			c := m(F)
			for j := range s {
				s[j] += c[j]
			}
		}
		return s
	}
}

// outOfPlaneDirections is a fibre family spread in three dimensions: its
// reference directions A = (cos φ cos θ, cos φ sin θ, sin φ) follow the
// product of a von Mises density in 2θ about alpha (concentration bip, in
// the plane) and one in 2φ about the plane (concentration bop, out of it),
// times cos φ for the area of the sphere — the kind of non-symmetric
// dispersion of Holzapfel, Niestrawska, Ogden, Reinisch & Schriefl 2015
// (J R Soc Interface 12:20150188; from memory), not a density the
// catalogue has. It is integrated by the midpoint rule on 360 × 90
// directions, the density normalised by the same sum; directions whose
// weight is below 1e-14 of the peak's are dropped.
type outOfPlaneDirections struct {
	a   [][3]float64
	wts []float64
	law fibreLaw
}

func outOfPlaneFamily(alpha, bip, bop float64, law fibreLaw) outOfPlaneDirections {
	const nt, np = 360, 90
	d := outOfPlaneDirections{law: law}
	z := 0.0
	for i := 0; i < nt; i++ {
		th := alpha - math.Pi/2 + math.Pi*(float64(i)+0.5)/nt
		for j := 0; j < np; j++ {
			ph := -math.Pi/2 + math.Pi*(float64(j)+0.5)/np
			w := math.Exp(bip*(math.Cos(2*(th-alpha))-1)+bop*(math.Cos(2*ph)-1)) * math.Cos(ph)
			if w < 1e-14 {
				continue
			}
			d.a = append(d.a, [3]float64{math.Cos(ph) * math.Cos(th), math.Cos(ph) * math.Sin(th), math.Sin(ph)})
			d.wts = append(d.wts, w)
			z += w
		}
	}
	for i := range d.wts {
		d.wts[i] /= z
	}
	return d
}

// cauchy is the family's in-plane Cauchy stress in plane stress: each
// fibre's σ = λψ′(λ) n⊗n (J = 1), with F33 = 1/det F in the out-of-plane
// direction, and the pressure that makes σ33 = 0 taken from the normal
// components (fibres that leave the plane load σ33 too).
func (d outOfPlaneDirections) cauchy(F [4]float64) [3]float64 {
	f33 := 1 / (F[0]*F[3] - F[1]*F[2])
	var s [4]float64
	for i, w := range d.wts {
		A := d.a[i]
		a := [3]float64{F[0]*A[0] + F[1]*A[1], F[2]*A[0] + F[3]*A[1], f33 * A[2]}
		l := math.Sqrt(a[0]*a[0] + a[1]*a[1] + a[2]*a[2])
		if l <= 1 {
			continue
		}
		c := w * d.law(l) / l
		s[0] += c * a[0] * a[0]
		s[1] += c * a[1] * a[1]
		s[2] += c * a[0] * a[1]
		s[3] += c * a[2] * a[2]
	}
	return [3]float64{s[0] - s[3], s[1] - s[3], s[2]}
}

// outOfPlaneMaterial is a neo-Hookean matrix (c10 in kPa) with families
// spread in three dimensions.
func outOfPlaneMaterial(c10 float64, fams ...outOfPlaneDirections) material {
	ms := []material{func(F [4]float64) [3]float64 { return neoHookeanMatrix(c10, F) }}
	for _, f := range fams {
		ms = append(ms, f.cauchy)
	}
	return plus(ms...)
}

// Concentrated out of the plane, the three-dimensional family tends to
// the in-plane spread family of the same concentration: the out-of-plane
// components enter at second order in φ, whose variance is about 1/(4 bop),
// so the difference falls about fourfold from bop = 100 to 400 (measured
// 1.4 % and 0.35 % of the stress at F = diag(1.2, 1.1)).
func TestOutOfPlaneFamilyNearThePlane(t *testing.T) {
	law := expSqFibre(30, 3)
	ip := spreadFamily{0.4, 3, law}
	for _, F := range [][4]float64{{1.2, 0, 0, 1.1}, {1.15, 0.05, -0.02, 1.18}} {
		b := ip.cauchy(F)
		var rel [2]float64
		for k, bop := range []float64{100, 400} {
			a := outOfPlaneFamily(0.4, 3, bop, law).cauchy(F)
			for j := range a {
				rel[k] = math.Max(rel[k], math.Abs(a[j]-b[j])/math.Max(math.Abs(b[0]), math.Abs(b[1])))
			}
		}
		if r := rel[0] / rel[1]; rel[1] > 5e-3 || r < 3.5 || r > 4.5 {
			t.Errorf("F %v: differences from the in-plane family %.3g (bop 100) and %.3g (bop 400), ratio %.2f; want under 0.5 %% and a ratio near 4", F, rel[0], rel[1], r)
		}
	}
}
