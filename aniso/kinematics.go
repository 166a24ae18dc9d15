package aniso

import (
	"fmt"
	"math"
)

// Sym is a symmetric in-plane tensor stored as (11, 22, 12).
type Sym [3]float64

// Kinematics holds everything about one in-plane deformation that does not
// depend on fibre angles. The Cauchy stress of a term in I1 is ψ1·G1 and of a
// term in I2 is ψ2·G2, with the plane-stress pressure already removed.
type Kinematics struct {
	// F is the in-plane deformation gradient (F11, F12, F21, F22).
	F [4]float64
	// J2 is det of the in-plane F; F33 = 1/J2.
	J2 float64
	// FinvT is the in-plane F⁻ᵀ as (11, 12, 21, 22).
	FinvT [4]float64
	// B is the in-plane left Cauchy–Green tensor F Fᵀ; B33 = F33².
	B   Sym
	B33 float64
	// I1 and I2 are the first two invariants of C (I3 = 1).
	I1, I2 float64
	// G1 = 2(B − B33 1), G2 = 2(I1 B − B² − (I1 B33 − B33²) 1).
	G1, G2 Sym
}

// NewKinematics computes the kinematics of F = (F11, F12, F21, F22). It fails
// when an entry is not finite or det F ≤ 0 (the material would be inverted).
func NewKinematics(F [4]float64) (Kinematics, error) {
	var k Kinematics
	for _, v := range F {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return k, fmt.Errorf("deformation gradient %v has a non-finite entry", F)
		}
	}
	k.F = F
	k.J2 = F[0]*F[3] - F[1]*F[2]
	if !(k.J2 > 0) {
		return k, fmt.Errorf("deformation gradient %v has det F11·F22 − F12·F21 = %g ≤ 0", F, k.J2)
	}
	inv := 1 / k.J2
	k.FinvT = [4]float64{F[3] * inv, -F[2] * inv, -F[1] * inv, F[0] * inv}
	k.B = Sym{F[0]*F[0] + F[1]*F[1], F[2]*F[2] + F[3]*F[3], F[0]*F[2] + F[1]*F[3]}
	k.B33 = inv * inv
	b := k.B
	k.I1 = b[0] + b[1] + k.B33
	trB2 := b[0]*b[0] + b[1]*b[1] + 2*b[2]*b[2] + k.B33*k.B33
	k.I2 = 0.5 * (k.I1*k.I1 - trB2)
	k.G1 = Sym{2 * (b[0] - k.B33), 2 * (b[1] - k.B33), 2 * b[2]}
	bb := Sym{b[0]*b[0] + b[2]*b[2], b[1]*b[1] + b[2]*b[2], b[2] * (b[0] + b[1])}
	p := k.I1*k.B33 - k.B33*k.B33
	k.G2 = Sym{2 * (k.I1*b[0] - bb[0] - p), 2 * (k.I1*b[1] - bb[1] - p), 2 * (k.I1*b[2] - bb[2])}
	return k, nil
}

// Nominal converts an in-plane Cauchy stress to nominal stress P = σ F⁻ᵀ,
// returned as (P11, P22, P12, P21).
func (k *Kinematics) Nominal(s Sym) [4]float64 {
	t := &k.FinvT // (11, 12, 21, 22)
	return [4]float64{
		mul0(s[0], t[0]) + mul0(s[2], t[2]),
		mul0(s[2], t[1]) + mul0(s[1], t[3]),
		mul0(s[0], t[1]) + mul0(s[2], t[3]),
		mul0(s[2], t[0]) + mul0(s[1], t[2]),
	}
}

// mul0 is a·b with 0·(±Inf) = 0, so an overflowing stress component does not
// turn the components it does not reach into NaN.
func mul0(a, b float64) float64 {
	if a == 0 || b == 0 {
		return 0
	}
	return a * b
}

// FibreKinematics holds the fibre quantities of one family at one
// deformation, and their derivatives with respect to the fibre angle α.
type FibreKinematics struct {
	// A is the pushed-forward fibre a = F a0 (not normalised); BA = B a.
	A, BA [2]float64
	// I4 = a0·C a0 (squared fibre stretch), I5 = a0·C² a0 = a·B a,
	// K = I5 − I1 I4 + I2 (cofactor-fibre invariant).
	I4, I5, K float64
	// G4 = 2 a⊗a and G5 = 2(a⊗Ba + Ba⊗a): Cauchy stress per unit ψ4, ψ5.
	G4, G5 Sym
	// Derivatives with respect to α (per radian).
	DI4, DI5, DK float64
	DG4, DG5     Sym
}

// Fibre computes the fibre kinematics of a family at angle alpha (radians).
func (k *Kinematics) Fibre(alpha float64) FibreKinematics {
	s, c := math.Sincos(alpha)
	return k.fibreSC(s, c)
}

// fibreSC4 writes to f what fibreSC gives without the quantities of I5 and
// K (BA, I5, K, G5 and their angle derivatives are zero), for a family
// that has no term in them.
func (k *Kinematics) fibreSC4(f *FibreKinematics, s, c float64) {
	*f = FibreKinematics{}
	k.fibreI4(f, s, c)
}

// fibreI4 writes to f the fibre direction a = F a0, I4, G4 and their
// angle derivatives, and returns the angle derivative da of a: the part of
// fibreSC that every fibre term needs, shared by fibreSC4, so that its
// fields are fibreSC's bit for bit.
func (k *Kinematics) fibreI4(f *FibreKinematics, s, c float64) [2]float64 {
	F := &k.F
	a := [2]float64{F[0]*c + F[1]*s, F[2]*c + F[3]*s}
	da := [2]float64{-F[0]*s + F[1]*c, -F[2]*s + F[3]*c}
	f.A = a
	f.I4 = a[0]*a[0] + a[1]*a[1]
	f.G4 = Sym{2 * a[0] * a[0], 2 * a[1] * a[1], 2 * a[0] * a[1]}
	f.DI4 = 2 * (a[0]*da[0] + a[1]*da[1])
	f.DG4 = Sym{4 * a[0] * da[0], 4 * a[1] * da[1], 2 * (da[0]*a[1] + a[0]*da[1])}
	return da
}

// fibreSC is Fibre with sin α and cos α given, so that a loop over many
// deformations computes them once.
func (k *Kinematics) fibreSC(s, c float64) FibreKinematics {
	var f FibreKinematics
	da := k.fibreI4(&f, s, c)
	b := &k.B
	a := f.A
	ba := [2]float64{b[0]*a[0] + b[2]*a[1], b[2]*a[0] + b[1]*a[1]}
	bda := [2]float64{b[0]*da[0] + b[2]*da[1], b[2]*da[0] + b[1]*da[1]}
	f.BA = ba
	f.I5 = a[0]*ba[0] + a[1]*ba[1]
	f.K = f.I5 - k.I1*f.I4 + k.I2
	f.G5 = Sym{4 * a[0] * ba[0], 4 * a[1] * ba[1], 2 * (a[0]*ba[1] + ba[0]*a[1])}
	f.DI5 = 2 * (da[0]*ba[0] + da[1]*ba[1])
	f.DK = f.DI5 - k.I1*f.DI4
	f.DG5 = Sym{
		4 * (da[0]*ba[0] + a[0]*bda[0]),
		4 * (da[1]*ba[1] + a[1]*bda[1]),
		2 * (da[0]*ba[1] + a[0]*bda[1] + bda[0]*a[1] + ba[0]*da[1]),
	}
	return f
}

// GreenDirection returns the direction, in degrees, of the normal in-plane
// Green strain E = (FᵀF − 1)/2 of F = (F11, F12, F21, F22), shear
// included: atan2(E22, E11), and its size hypot(E11, E22). This is the
// direction of a protocol's ratio: 0° is a strip along axis 1 (axis 2
// held at stretch 1), 45° equibiaxial, 90° a strip along axis 2.
func GreenDirection(F [4]float64) (deg, size float64) {
	e11 := (F[0]*F[0] + F[2]*F[2] - 1) / 2
	e22 := (F[1]*F[1] + F[3]*F[3] - 1) / 2
	return Deg(math.Atan2(e22, e11)), math.Hypot(e11, e22)
}

// PeakGreenDirection returns the GreenDirection of path at its point of
// largest normal Green strain: the direction the protocol tested. ok is
// false when no point of path is strained.
func PeakGreenDirection(path [][4]float64) (deg float64, ok bool) {
	far := 0.0
	for _, F := range path {
		if d, n := GreenDirection(F); n > far {
			far, deg = n, d
		}
	}
	return deg, far > 0
}
