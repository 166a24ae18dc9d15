package aniso

import (
	"fmt"
	"math"
	"sort"

	"github.com/weft-tools/weft/terms"
)

// LoadCase is a homogeneous in-plane loading of a verification table. Each
// is defined in a load frame whose axis 1 is the load direction; the
// deformation gradient in the specimen's axes is F = R(θ)·F_local·R(θ)ᵀ,
// R(θ) the rotation by the load direction θ from axis 1 towards axis 2.
type LoadCase int

const (
	// Uniaxial is tension along the load direction with the lateral edges
	// free: F_local = diag(λ, λt), with the lateral stretch λt solved so that
	// the Cauchy normal stress across the lateral edges, in the load frame,
	// is zero. The load-frame shear stress is not imposed; an anisotropic
	// material at an oblique angle needs one (the grips supply it).
	Uniaxial LoadCase = iota
	// Equibiaxial is F = diag(λ, λ); it is the same in every direction.
	Equibiaxial
	// StripBiaxial is F_local = diag(λ, 1): stretch along the load
	// direction with the lateral stretch held at 1.
	StripBiaxial
	// SimpleShear is F_local = [[1, γ], [0, 1]]: material lines along the
	// load direction slide by γ per unit distance across it.
	SimpleShear
)

// LoadCases lists every load case in table order.
var LoadCases = []LoadCase{Uniaxial, Equibiaxial, StripBiaxial, SimpleShear}

// String returns the case's name as written in tables: "uniaxial",
// "equibiaxial", "strip-biaxial" or "simple-shear".
func (c LoadCase) String() string {
	switch c {
	case Uniaxial:
		return "uniaxial"
	case Equibiaxial:
		return "equibiaxial"
	case StripBiaxial:
		return "strip-biaxial"
	case SimpleShear:
		return "simple-shear"
	}
	return fmt.Sprintf("LoadCase(%d)", int(c))
}

// Kinematics says in words how the case's F is built.
func (c LoadCase) Kinematics() string {
	switch c {
	case Uniaxial:
		return "F_local = diag(λ, λt), λt solved for zero lateral Cauchy stress"
	case Equibiaxial:
		return "F = diag(λ, λ), the same in every direction"
	case StripBiaxial:
		return "F_local = diag(λ, 1)"
	case SimpleShear:
		return "F_local = [[1, γ], [0, 1]]"
	}
	return ""
}

// ZeroByConstruction names the stress components the case makes zero
// (besides σ33 = 0, plane stress, in every case), or "" when none is.
func (c LoadCase) ZeroByConstruction() string {
	if c == Uniaxial {
		return "the load-frame lateral Cauchy stress σ_tt = t·σt (t the in-plane unit vector across the load direction) is zero to round-off"
	}
	return ""
}

// LoadGradient returns F = R(θ)·F_local·R(θ)ᵀ as (F11, F12, F21, F22) for a
// case with load direction theta (radians), amount λ (stretch) or γ (shear)
// and, for Uniaxial, the lateral stretch lateral (ignored otherwise).
func LoadGradient(c LoadCase, theta, amount, lateral float64) [4]float64 {
	var l [4]float64 // F_local as (11, 12, 21, 22)
	switch c {
	case Uniaxial:
		l = [4]float64{amount, 0, 0, lateral}
	case Equibiaxial:
		return [4]float64{amount, 0, 0, amount}
	case StripBiaxial:
		l = [4]float64{amount, 0, 0, 1}
	case SimpleShear:
		l = [4]float64{1, amount, 0, 1}
	}
	return rotateF(l, theta)
}

// Turned returns R(ψ)·L·R(ψ)ᵀ, R = [[cos ψ, −sin ψ], [sin ψ, cos ψ]], for
// an in-plane tensor L = (L11, L12, L21, L22) and ψ in degrees: the
// deformation gradient, in the tester's axes, of a specimen loaded with L
// along axes turned by ψ from axis 1 towards axis 2; with −ψ, a stress or
// deformation in the tester's axes read in the turned ones.
func Turned(L [4]float64, psiDeg float64) [4]float64 { return rotateF(L, Rad(psiDeg)) }

// rotateF returns R(θ)·L·R(θ)ᵀ with R = [[c, −s], [s, c]].
func rotateF(L [4]float64, theta float64) [4]float64 {
	if theta == 0 {
		return L
	}
	s, c := sincosSnap(theta)
	// M = R L
	m11, m12 := c*L[0]-s*L[2], c*L[1]-s*L[3]
	m21, m22 := s*L[0]+c*L[2], s*L[1]+c*L[3]
	// M Rᵀ, Rᵀ = [[c, s], [−s, c]]
	return [4]float64{m11*c - m12*s, m11*s + m12*c, m21*c - m22*s, m21*s + m22*c}
}

// sincosSnap is math.Sincos with results within 1e-15 of 0 set to 0 (and
// the other to ±1), so that directions at multiples of 90° given in
// radians rotate exactly.
func sincosSnap(theta float64) (s, c float64) {
	s, c = math.Sincos(theta)
	if math.Abs(s) < 1e-15 {
		s, c = 0, math.Copysign(1, c)
	} else if math.Abs(c) < 1e-15 {
		s, c = math.Copysign(1, s), 0
	}
	return s, c
}

// loadFrame returns σ in the load frame, Rᵀσ R, as (nn, tt, nt).
func loadFrame(sig Sym, theta float64) Sym {
	s, c := sincosSnap(theta)
	n := [2]float64{c, s}
	t := [2]float64{-s, c}
	q := func(a, b [2]float64) float64 {
		return a[0]*(sig[0]*b[0]+sig[2]*b[1]) + a[1]*(sig[2]*b[0]+sig[1]*b[1])
	}
	return Sym{q(n, n), q(t, t), q(n, t)}
}

// SolveUniaxial returns the free lateral stretch λt of uniaxial tension (or
// compression) at stretch lambda along direction theta (radians): the root
// of the load-frame lateral Cauchy stress σ_tt(λt) = 0 connected
// continuously to the unloaded state λ = λt = 1 (SolveUniaxialPath). A
// root that is not unique is returned without error; SolveUniaxialPath
// says so.
func SolveUniaxial(m *Model, theta, lambda float64) (float64, error) {
	if !(lambda > 0) || math.IsInf(lambda, 0) {
		return 0, fmt.Errorf("uniaxial stretch %g must be a finite number > 0", lambda)
	}
	r := SolveUniaxialPath(m, theta, []float64{lambda})[0]
	return r.Lateral, r.Err
}

// UniaxialSolution is the free lateral stretch of one uniaxial stretch.
type UniaxialSolution struct {
	// Lateral is the lateral stretch λt (dimensionless).
	Lateral float64
	// NonUnique, when not empty, says why λt is not unique: the lateral
	// stress vanishes on a range of lateral stretches (no lateral
	// stiffness, as in a card whose fibres are slack and that has no
	// matrix term), so any of them frees the lateral edges; Lateral is the
	// one reached by continuation.
	NonUnique string
	// Err says why no lateral stretch could be found; Lateral is then 0.
	Err error
}

// continuationStep is the largest step of ln λ between two solves of a
// uniaxial path: small enough that the root found next is the one
// connected to the previous.
const continuationStep = 0.01

// SolveUniaxialPath solves the lateral stretch of uniaxial loading along
// direction theta (radians) at each stretch of lambdas (> 0, any order) by
// continuation from the unloaded state λ = λt = 1: λ moves towards each
// target in steps of at most 0.01 in ln λ, tensile stretches upwards from 1
// and compressive ones downwards, and each solve starts from the previous
// root, so the roots are those connected continuously to the unloaded
// state, not whichever root a search meets first. Each solve brackets the
// nearest sign change of σ_tt in the direction it falls and runs Newton's
// method with the analytic tangent, safeguarded by bisection, until the
// bracket is a few ulps wide or σ_tt is exactly zero. A root whose lateral
// stiffness dσ_tt/dλt is not positive (at most 1e-10 × Σ weights) is
// reported as not unique. Once a solve fails, every later stretch of the
// same branch fails with it: the connected path is broken there.
func SolveUniaxialPath(m *Model, theta float64, lambdas []float64) []UniaxialSolution {
	out := make([]UniaxialSolution, len(lambdas))
	up, down := []int{}, []int{}
	for i, l := range lambdas {
		switch {
		case !(l > 0) || math.IsInf(l, 0):
			out[i].Err = fmt.Errorf("uniaxial stretch %g must be a finite number > 0", l)
		case l >= 1:
			up = append(up, i)
		default:
			down = append(down, i)
		}
	}
	sort.SliceStable(up, func(a, b int) bool { return lambdas[up[a]] < lambdas[up[b]] })
	sort.SliceStable(down, func(a, b int) bool { return lambdas[down[a]] > lambdas[down[b]] })
	stiffTol := 1e-10 * m.StressScale()
	for _, branch := range [][]int{up, down} {
		lam, mu := 1.0, 1.0
		var broken error
		for _, i := range branch {
			target := lambdas[i]
			if broken != nil {
				out[i].Err = pathStopped(target, theta, lam, broken)
				continue
			}
			n := int(math.Ceil(math.Abs(math.Log(target)-math.Log(lam)) / continuationStep))
			l0 := lam
			for s := 1; s <= n; s++ {
				l := l0 * math.Exp((math.Log(target)-math.Log(l0))*float64(s)/float64(n))
				if s == n {
					l = target
				}
				// Predictor: an isotropic material keeps λt ∝ λ^(−1/2).
				pred := mu * math.Sqrt(lam/l)
				next, err := lateralRoot(m, theta, l, pred)
				if err != nil {
					broken = err
					break
				}
				lam, mu = l, next
			}
			if broken != nil {
				out[i].Err = pathStopped(target, theta, lam, broken)
				continue
			}
			out[i].Lateral = mu
			if k, ok := lateralStiffness(m, theta, lam, mu); !ok || !(k > stiffTol) {
				out[i].NonUnique = fmt.Sprintf("the lateral stiffness dσ_tt/dλt is %.3g at the root (not above %.3g): the lateral stress vanishes on a range of lateral stretches, so the row's λt (reached by continuation from λ = 1) is one of many that free the lateral edges", k, stiffTol)
			}
		}
	}
	return out
}

// pathStopped says why the row at stretch target was not reached: the
// continuation from the unloaded state stopped after the last stretch
// reached, reached, at the step whose failure is err. The row's own
// stretch comes first, because err names the intermediate step (a row at
// 1.2 was reported as "uniaxial stretch 1.15983 at 0°: ...", which read
// as a wrong stretch).
func pathStopped(target, theta, reached float64, err error) error {
	return fmt.Errorf("uniaxial stretch %g at %g°: the path from λ = 1 stops after λ = %.6g (%w)", target, Deg(theta), reached, err)
}

// uniaxialLateral returns σ_tt and dσ_tt/dλt of uniaxial loading at
// stretch lambda along theta with lateral stretch mu; ok is false where
// the model cannot be evaluated (overflow).
func uniaxialLateral(m *Model, theta, lambda, mu float64) (val, slope float64, ok bool) {
	st, ct := sincosSnap(theta)
	tv := [2]float64{-st, ct}
	F := LoadGradient(Uniaxial, theta, lambda, mu)
	tg, err := m.Tangent(F)
	if err != nil {
		return 0, 0, false
	}
	// σ = P Fᵀ (J = 1); P and F in (11, 12, 21, 22).
	P, A := tg.P, tg.A
	sig := func(P, F [4]float64) Sym {
		return Sym{P[0]*F[0] + P[1]*F[1], P[2]*F[2] + P[3]*F[3], P[0]*F[2] + P[1]*F[3]}
	}
	val = loadFrame(sig(P, F), theta)[1]
	// dF/dλt = t⊗t; dσ = dP Fᵀ + P dFᵀ with dP = A : dF.
	dF := [4]float64{tv[0] * tv[0], tv[0] * tv[1], tv[1] * tv[0], tv[1] * tv[1]}
	var dP [4]float64
	for i := range dP {
		for j := range dF {
			dP[i] += A[i][j] * dF[j]
		}
	}
	d1, d2 := sig(dP, F), sig(P, dF)
	ds := Sym{d1[0] + d2[0], d1[1] + d2[1], d1[2] + d2[2]}
	// The 12 entry of dP Fᵀ + P dFᵀ is not symmetric in general; only
	// its tt projection is used, which is.
	ds[2] = 0.5 * ((dP[0]*F[2] + dP[1]*F[3] + P[0]*dF[2] + P[1]*dF[3]) + (dP[2]*F[0] + dP[3]*F[1] + P[2]*dF[0] + P[3]*dF[1]))
	slope = loadFrame(ds, theta)[1]
	return val, slope, !math.IsNaN(val) && !math.IsInf(val, 0)
}

// lateralStiffness returns dσ_tt/dλt at a root.
func lateralStiffness(m *Model, theta, lambda, mu float64) (float64, bool) {
	_, k, ok := uniaxialLateral(m, theta, lambda, mu)
	return k, ok
}

// lateralRoot returns the root of σ_tt(λt) at stretch lambda nearest to
// the predictor mu0 in the direction σ_tt falls: σ_tt grows with λt for a
// stable material, so the search goes down from a positive value and up
// from a negative one. Steps grow geometrically from 0.1 %; a step into a
// region where the energy is not finite (beyond a limiting extensibility)
// is halved instead, since the lateral stress diverges before such a
// limit.
func lateralRoot(m *Model, theta, lambda, mu0 float64) (float64, error) {
	g := func(mu float64) (float64, float64, bool) { return uniaxialLateral(m, theta, lambda, mu) }
	v0, _, ok := g(mu0)
	if !ok {
		return 0, fmt.Errorf("uniaxial stretch %g at %g°: the model cannot be evaluated (overflow)", lambda, Deg(theta))
	}
	if v0 == 0 {
		return mu0, nil
	}
	lo, hi := mu0, mu0
	dir := -1.0 // search downwards when σ_tt(μ0) > 0
	if v0 < 0 {
		dir = 1
	}
	step, last := 0.001, mu0
	found := false
	for i := 0; i < 400 && step > 1e-15; i++ {
		cand := last * math.Exp(dir*step)
		if cand < minLateralStretch {
			break // only round-off changes sign down there
		}
		v, _, ok := g(cand)
		if !ok {
			step /= 2
			continue
		}
		if v == 0 {
			return cand, nil
		}
		if (v < 0) == (dir < 0) {
			if dir < 0 {
				lo, hi = cand, last
			} else {
				lo, hi = last, cand
			}
			found = true
			break
		}
		last = cand
		step = math.Min(2*step, 0.5)
	}
	if !found {
		return 0, fmt.Errorf("uniaxial stretch %g at %g°: no lateral stretch connected to the unloaded state gives zero lateral stress where the energy is finite", lambda, Deg(theta))
	}
	mu := 0.5 * (lo + hi)
	for iter := 0; iter < 200; iter++ {
		v, d, ok := g(mu)
		if !ok {
			return 0, fmt.Errorf("uniaxial stretch %g at %g°: the model cannot be evaluated at lateral stretch %g", lambda, Deg(theta), mu)
		}
		if v == 0 {
			return mu, nil
		}
		if v < 0 {
			lo = mu
		} else {
			hi = mu
		}
		if hi-lo <= 4*(math.Nextafter(hi, math.Inf(1))-hi) { // four ulps
			break
		}
		next := mu - v/d
		if !(d > 0) || !(next > lo && next < hi) {
			next = 0.5 * (lo + hi)
		}
		if next == mu {
			break
		}
		mu = next
	}
	if mu < minLateralStretch {
		return 0, fmt.Errorf("uniaxial stretch %g at %g°: the lateral stress vanishes only as the lateral stretch goes to zero (%.3g), which no specimen reaches", lambda, Deg(theta), mu)
	}
	return mu, nil
}

// minLateralStretch is the smallest lateral stretch a uniaxial row may
// have (a thickness stretch of 1/(λ·1e-3) at most): a lateral stress that
// falls to zero only below it does so by round-off, as for a card whose
// matrix weight is zero (a κ-dispersed fit found "roots" at 4e-9, with
// F33 ≈ 2e8 and a second Piola–Kirchhoff stress of round-off).
const minLateralStretch = 1e-3

// VerificationSettings chooses the points of a verification table.
type VerificationSettings struct {
	// Cases are the load cases, in table order; default LoadCases.
	Cases []LoadCase
	// Stretches are the stretches λ of the uniaxial, equibiaxial and
	// strip-biaxial cases; default 0.90 and 0.95 (compression) and 1.05 to
	// 1.30 in steps of 0.05.
	Stretches []float64
	// Shears are the amounts of shear γ of the simple-shear case; default
	// 0.05 to 0.30 in steps of 0.05.
	Shears []float64
	// DirectionsDeg are the load directions θ in degrees from axis 1
	// towards axis 2 of the uniaxial and strip-biaxial cases; default axis
	// 1 (0), axis 2 (90) and each fibre family's angle, without repeats.
	// Equibiaxial is listed once, at 0.
	DirectionsDeg []float64
	// ShearDirectionsDeg are the load directions of the simple-shear case.
	// Default: DirectionsDeg when the caller gave those, else axis 1, axis
	// 2 and each family's angle α − 45° (the shear that stretches the
	// family most) and α + 45° (the one that shortens it), without repeats
	// and without any direction along a family: simple shear along a
	// fibre leaves its length unchanged (I4 = 1 exactly, on the fibre
	// switch, for every γ), so such rows cannot verify anything about the
	// fibre and may differ between implementations.
	ShearDirectionsDeg []float64
}

// DefaultVerificationSettings returns the default table for m.
func DefaultVerificationSettings(m *Model) VerificationSettings {
	s := VerificationSettings{Cases: LoadCases, Stretches: []float64{0.90, 0.95}}
	for i := 1; i <= 6; i++ {
		s.Stretches = append(s.Stretches, float64(100+5*i)/100)
		s.Shears = append(s.Shears, float64(5*i)/100)
	}
	dirs := []float64{0, 90}
	shear := []float64{0, 90}
	for _, f := range m.Families {
		a := WrapDeg(Deg(f.Angle))
		dirs = append(dirs, a)
		shear = append(shear, WrapDeg(a-45), WrapDeg(a+45))
	}
	s.DirectionsDeg = uniqueDirections(dirs)
	for _, d := range uniqueDirections(shear) {
		along := false
		for _, f := range m.Families {
			if math.Abs(WrapDeg(d-Deg(f.Angle))) < 1e-9 {
				along = true
			}
		}
		if !along {
			s.ShearDirectionsDeg = append(s.ShearDirectionsDeg, d)
		}
	}
	return s
}

// uniqueDirections drops directions equal modulo 180° (within 1e-9°) to an
// earlier one, keeping the order.
func uniqueDirections(dirs []float64) []float64 {
	var out []float64
	for _, d := range dirs {
		dup := false
		for _, e := range out {
			if math.Abs(WrapDeg(d-e)) < 1e-9 {
				dup = true
				break
			}
		}
		if !dup {
			out = append(out, d)
		}
	}
	return out
}

// SwitchTolerance is the distance from a switch below which a verification
// row is flagged (dimensionless): a family's |I4 − 1| for its fibre and I5
// terms, |K − 1| for its cofactor terms. Closer than that, round-off in
// an independent implementation can put the term on the other side.
const SwitchTolerance = 1e-6

// SwitchNote names a family that sits on a switch at a verification row.
type SwitchNote struct {
	// Family indexes Model.Families.
	Family int
	// Invariant is "I4" (fibre and I5 terms), "K" (cofactor terms) or
	// "I4(θ)" (every direction of an in-plane dispersed family at once).
	Invariant string
	// Value is the invariant there (for "I4(θ)", 1 + the largest
	// |I4(θ) − 1| over the directions).
	Value float64
}

// Switches returns the families of m that sit within SwitchTolerance of a
// switch at F, in family order: a family whose fibre or I5 terms (with a
// positive weight) meet |I4 − 1| < SwitchTolerance, or whose cofactor
// terms meet |K − 1| < SwitchTolerance. There the energy of a dispersed
// family (κ > 0) jumps, because E_f = κ(I1 − 3) > 0 at I4 = 1, and the
// tangent of every family jumps (f″(0⁺) ≠ 0), so which side an
// implementation takes is decided by round-off.
//
// An in-plane dispersed family is different: every direction θ switches
// on its own, at I4(θ) = 1, and the ends of the stretched arc move
// continuously with F. The energy is w ∫ ρ f(I4(θ) − 1) over the arc;
// differentiating it moves the arc's ends, but the integrand there is
// ρ f(0) = 0 and its derivative ρ f′(0) ∂I4/∂F = 0 (fibre shapes start with
// f′(0) = 0), so neither the stress nor the tangent gains a boundary term:
// both are continuous, and a single direction at its switch has measure
// zero. The family is on a switch only where a set of directions of
// positive measure sits at I4(θ) = 1 at once, i.e. where I4(θ) − 1 =
// A0 + R cos(2θ − φ) vanishes identically: |A0| + R < SwitchTolerance, the
// in-plane C within SwitchTolerance of the identity (the reference state
// and rigid rotations), which no verification row reaches.
func (m *Model) Switches(F [4]float64) []SwitchNote {
	k, err := NewKinematics(F)
	if err != nil {
		return nil
	}
	var out []SwitchNote
	for f, fam := range m.Families {
		var fibre, cofactor bool
		for _, t := range m.Terms {
			if t.Family != f || !(t.Weight > 0) {
				continue
			}
			switch t.Shape.Arg {
			case terms.Fibre, terms.Fifth:
				fibre = true
			case terms.Cofactor:
				cofactor = true
			}
		}
		if fam.Planar {
			g := newPlanarGeom(&k.F)
			if fibre && math.Abs(g.A0)+g.R < SwitchTolerance {
				out = append(out, SwitchNote{Family: f, Invariant: "I4(θ)", Value: 1 + math.Abs(g.A0) + g.R})
			}
			continue
		}
		fk := k.Fibre(fam.Angle)
		if fibre && math.Abs(fk.I4-1) < SwitchTolerance {
			out = append(out, SwitchNote{Family: f, Invariant: "I4", Value: fk.I4})
		}
		if cofactor && math.Abs(fk.K-1) < SwitchTolerance {
			out = append(out, SwitchNote{Family: f, Invariant: "K", Value: fk.K})
		}
	}
	return out
}

// VerificationPoint is one row of a verification table.
type VerificationPoint struct {
	// Case is the load case.
	Case LoadCase
	// DirectionDeg is the load direction θ in degrees from axis 1 towards
	// axis 2.
	DirectionDeg float64
	// Amount is the stretch λ or, for SimpleShear, the shear γ
	// (dimensionless).
	Amount float64
	// LateralStretch is the stretch across the load direction: solved for
	// Uniaxial, λ for Equibiaxial, 1 for StripBiaxial and SimpleShear.
	LateralStretch float64
	// F is the in-plane deformation gradient (F11, F12, F21, F22) in the
	// specimen's axes.
	F [4]float64
	// Energy is the strain energy W per unit reference volume, stress unit.
	Energy float64
	// Cauchy is (σ11, σ22, σ12) in the specimen's axes, stress unit.
	Cauchy Sym
	// Nominal is (P11, P22, P12, P21), P = σ F⁻ᵀ, stress unit.
	Nominal [4]float64
	// SecondPiola is the in-plane second Piola–Kirchhoff stress
	// S = F⁻¹ σ F⁻ᵀ as (S11, S22, S12), stress unit (S33 = 0 with σ33).
	SecondPiola Sym
	// LoadFrame is the Cauchy stress in the load frame as (nn, tt, nt), n the
	// load direction and t across it; for Uniaxial tt is zero.
	LoadFrame Sym
	// Switches lists the families that sit on a switch here (see
	// Model.Switches): the row's stress or tangent may differ between
	// implementations, and it is flagged.
	Switches []SwitchNote
	// NonUnique, for a uniaxial row, says why its lateral stretch is not
	// unique (see UniaxialSolution); the row is flagged.
	NonUnique string
	// Err says why the point could not be evaluated (the energy is not
	// finite there, or no lateral stretch frees the lateral edges); the
	// stresses are then zero and must not be used. Empty for a good point.
	Err string
}

// Flagged reports whether the row sits on a switch or has a lateral
// stretch that is not unique.
func (p *VerificationPoint) Flagged() bool { return len(p.Switches) > 0 || p.NonUnique != "" }

// secondPiola returns S = F⁻¹ σ F⁻ᵀ (J = 1) of an in-plane Cauchy stress.
func secondPiola(k *Kinematics, sig Sym) Sym {
	// F⁻¹ = (F⁻ᵀ)ᵀ; k.FinvT is (11, 12, 21, 22) of F⁻ᵀ, so
	// (F⁻¹)_ij = FinvT_ji.
	t := &k.FinvT
	inv := [4]float64{t[0], t[2], t[1], t[3]} // F⁻¹ as (11, 12, 21, 22)
	return pushForward(inv, sig)
}

// VerificationCases evaluates m on every point of the table s describes,
// in the order case, direction, amount. Settings left empty take the
// defaults of DefaultVerificationSettings. A point the model cannot be
// evaluated at is returned with Err set; the error is for settings that
// cannot be used (a stretch ≤ 0 or not finite).
func VerificationCases(m *Model, s VerificationSettings) ([]VerificationPoint, error) {
	if err := m.Validate(); err != nil {
		return nil, err
	}
	def := DefaultVerificationSettings(m)
	if len(s.Cases) == 0 {
		s.Cases = def.Cases
	}
	if len(s.Stretches) == 0 {
		s.Stretches = def.Stretches
	}
	if len(s.Shears) == 0 {
		s.Shears = def.Shears
	}
	if len(s.ShearDirectionsDeg) == 0 {
		s.ShearDirectionsDeg = def.ShearDirectionsDeg
		if len(s.DirectionsDeg) > 0 {
			s.ShearDirectionsDeg = s.DirectionsDeg
		}
	}
	if len(s.DirectionsDeg) == 0 {
		s.DirectionsDeg = def.DirectionsDeg
	}
	var out []VerificationPoint
	for _, c := range s.Cases {
		dirs, amounts := s.DirectionsDeg, s.Stretches
		switch c {
		case Equibiaxial:
			dirs = []float64{0}
		case SimpleShear:
			dirs, amounts = s.ShearDirectionsDeg, s.Shears
		}
		for _, a := range amounts {
			if math.IsNaN(a) || math.IsInf(a, 0) || (c != SimpleShear && !(a > 0)) {
				return nil, fmt.Errorf("%s: amount %g must be a finite number (> 0 for a stretch)", c, a)
			}
		}
		for _, d := range dirs {
			if math.IsNaN(d) || math.IsInf(d, 0) {
				return nil, fmt.Errorf("direction %g is not a finite number", d)
			}
			theta := Rad(d)
			var lateral []UniaxialSolution
			if c == Uniaxial {
				lateral = SolveUniaxialPath(m, theta, amounts)
			}
			for i, a := range amounts {
				p := VerificationPoint{Case: c, DirectionDeg: d, Amount: a}
				switch c {
				case Uniaxial:
					if err := lateral[i].Err; err != nil {
						p.Err = err.Error()
						out = append(out, p)
						continue
					}
					p.LateralStretch, p.NonUnique = lateral[i].Lateral, lateral[i].NonUnique
				case Equibiaxial:
					p.LateralStretch = a
				default:
					p.LateralStretch = 1
				}
				p.F = LoadGradient(c, theta, a, p.LateralStretch)
				r, err := m.Evaluate(p.F)
				if err == nil && (math.IsInf(r.Energy, 0) || math.IsNaN(r.Energy)) {
					err = fmt.Errorf("the energy is not finite (%g)", r.Energy)
				}
				if err != nil {
					p.Err = fmt.Sprintf("%s at %g° and %g: %v", c, d, a, err)
					out = append(out, p)
					continue
				}
				k, _ := NewKinematics(p.F)
				p.Energy, p.Cauchy, p.Nominal = r.Energy, r.Cauchy, r.Nominal
				p.SecondPiola = secondPiola(&k, r.Cauchy)
				p.LoadFrame = loadFrame(r.Cauchy, theta)
				p.Switches = m.Switches(p.F)
				out = append(out, p)
			}
		}
	}
	return out, nil
}
