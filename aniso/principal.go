package aniso

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/terms"
)

// Principal-stretch (Ogden-type) terms: Ψ = w Σ_i g(λ_i), the λ_i the
// principal stretches, λ1 ≥ λ2 those of the in-plane C (eigenvalues
// μ_i = λ_i², shear included) and λ3 = 1/(λ1 λ2) = F33.
//
// Cauchy stress (Ogden 1984, Non-linear Elastic Deformations, §4.3): with
// h(λ) = λ g′(λ), σ = Σ_i h(λ_i) n_i⊗n_i − p 1, and plane stress σ33 = 0
// gives p = h(λ3). In the plane, n1⊗n1 = (B − μ2 1)/(μ1 − μ2), so
//
//	σ = (h(λ2) − h(λ3)) 1 + H (B − μ2 1),   H = (h(λ1) − h(λ2))/(μ1 − μ2),
//
// which needs no eigenvectors and is continuous where μ1 = μ2 (every
// equibiaxial state): H is the shape's divided difference
// (terms.Shape.Divided), accurate there, and B − μ2 1 is formed from
// (B11 − B22)/2 and the eigenvalue gap without cancellation.
//
// Tangent. The membrane energy is W(F2) = w [G(C2) + g(1/J)] with
// G(C2) = γ(μ1) + γ(μ2), γ(μ) = g(√μ), J = det F2. G is a spectral
// function of the 2×2 C2, so (with eigenvectors m_i of C2)
//
//	∂G/∂C   = γ′(μ2) 1 + (R/2)(C2 − μ2 1)
//	d²G     = Σ_i γ″(μ_i) (m_i·dC m_i)² + R (m_1·dC m_2)²
//
// where R/2 = (γ′(μ1) − γ′(μ2))/(μ1 − μ2) is again a divided difference
// (terms.Divided.R). At μ1 = μ2 every eigenbasis gives the same d²G, and
// near it the eigenvector's round-off (of order ε/(μ1 − μ2)) meets
// coefficients that differ by O(μ1 − μ2), so the tangent stays accurate.
// With dC = dFᵀF + FᵀdF and d²C = 2 dFᵀdF the Hessian of W follows; the
// g(1/J) part uses the jet of J.

// principalPoint is the model-independent principal-stretch data of one
// deformation: the stretches and the two in-plane stress bases, 1 and
// B − μ2 1, in a Dataset's output measure and row weights.
type principalPoint struct {
	st       terms.Stretches
	iso, dev [4]float64
}

// principalStretches returns λ1 ≥ λ2 of the in-plane tensor s (B or C,
// which share eigenvalues), λ3 = 1/J, and s − μ2 1 as (11, 22, 12). J is
// det F2, so λ2 = J/λ1 keeps λ1 λ2 λ3 = 1 to round-off.
func principalStretches(s Sym, J float64) (l1, l2, l3 float64, dev Sym) {
	m := (s[0] + s[1]) / 2
	dd := (s[0] - s[1]) / 2
	r := math.Hypot(dd, s[2])
	l1 = math.Sqrt(m + r)
	l2 = J / l1
	l3 = 1 / J
	switch {
	case r == 0:
	case dd >= 0:
		dev = Sym{dd + r, s[2] * s[2] / (r + dd), s[2]}
	default:
		dev = Sym{s[2] * s[2] / (r - dd), r - dd, s[2]}
	}
	return l1, l2, l3, dev
}

// principalStress returns the Cauchy stress and energy of a principal-
// stretch term per unit weight.
func principalStress(sh *terms.Shape, params []float64, k *Kinematics) (Sym, float64) {
	l1, l2, l3, dev := principalStretches(k.B, k.J2)
	v1, v2, v3 := sh.Eval(l1, params), sh.Eval(l2, params), sh.Eval(l3, params)
	iso := addInf(mul0(l2, v2.D1), -mul0(l3, v3.D1))
	H := sh.Divided(l1, l2, params).H
	return Sym{addInf(iso, mul0(H, dev[0])), addInf(iso, mul0(H, dev[1])), mul0(H, dev[2])}, v1.F + v2.F + v3.F
}

// addInf is a + b with ∞ − ∞ read as +∞: two overflowing parts of one
// stress never give NaN.
func addInf(a, b float64) float64 {
	if s := a + b; !math.IsNaN(s) {
		return s
	}
	return math.Inf(1)
}

// principalPoints precomputes the principal-stretch data of every point.
func (d *Dataset) principalPoints() []principalPoint {
	nc := len(d.out.Components)
	out := make([]principalPoint, len(d.kin))
	for i := range d.kin {
		k := &d.kin[i]
		p := &out[i]
		l1, l2, l3, dev := principalStretches(k.B, k.J2)
		p.st = terms.NewStretches(l1, l2, l3)
		p.iso = d.convert(k, Sym{1, 1, 0}, i*nc)
		p.dev = d.convert(k, dev, i*nc)
	}
	return out
}

// fillPrincipal fills the column of a principal-stretch term and, with
// derivs, its exponent derivative; it has no angle or dispersion
// derivatives.
func (d *Dataset) fillPrincipal(term *Term, col []float64, c *Columns, off int, derivs bool) {
	nc := len(d.out.Components)
	sh, p := term.Shape, term.Params
	if derivs {
		clear(c.DAngle[off : off+len(col)])
		clear(c.DKappa[off : off+len(col)])
	}
	pp := d.principalData()
	for i := range pp {
		pt := &pp[i]
		r0 := i * nc
		a := col[r0 : r0+nc]
		v := sh.AtStretches(&pt.st, p, derivs)
		iso := addInf(v.H2, -v.H3)
		for j := range a {
			a[j] = addInf(mul0(iso, pt.iso[j]), mul0(v.H, pt.dev[j]))
		}
		if !derivs {
			continue
		}
		base := off + r0
		if math.IsInf(iso, 0) || math.IsInf(v.H, 0) {
			c.clearDerivs(base, nc, len(p))
			continue
		}
		for q := range p {
			ds := addInf(v.DH2[q], -v.DH3[q])
			for j := range a {
				c.DParam[q][base+j] = addInf(mul0(ds, pt.iso[j]), mul0(v.DH[q], pt.dev[j]))
			}
		}
	}
}

// principalTangent adds a principal-stretch term's energy, nominal stress
// and tangent at the jets q to t (see the comment at the top of the file).
func principalTangent(term *Term, q *invariantJets, t *Tangent) error {
	sh, p, w := term.Shape, term.Params, term.Weight
	u := &q.u // (F11, F12, F21, F22); F_ka is u[2k+a]
	C := Sym{u[0]*u[0] + u[2]*u[2], u[1]*u[1] + u[3]*u[3], u[0]*u[1] + u[2]*u[3]}
	l1, l2, _, dev := principalStretches(C, q.J.v)
	th := math.Atan2(C[2], (C[0]-C[1])/2) / 2
	s, c := math.Sincos(th)
	m := [2][2]float64{{c, s}, {-s, c}} // eigenvectors of C2 for μ1, μ2
	v1, v2 := sh.Eval(l1, p), sh.Eval(l2, p)
	dv := sh.Divided(l1, l2, p)
	// γ′ = g′/(2λ), γ″ = (λg″ − g′)/(4λ³).
	dg2 := v2.D1 / (2 * l2)
	ddg := [2]float64{(l1*v1.D2 - v1.D1) / (4 * l1 * l1 * l1), (l2*v2.D2 - v2.D1) / (4 * l2 * l2 * l2)}
	G := Sym{dg2 + dv.R/2*dev[0], dg2 + dv.R/2*dev[1], dv.R / 2 * dev[2]}
	Gm := [2][2]float64{{G[0], G[2]}, {G[2], G[1]}}
	// Fm[i] = F m_i.
	var Fm [2][2]float64
	for i := range Fm {
		for k := 0; k < 2; k++ {
			Fm[i][k] = u[2*k]*m[i][0] + u[2*k+1]*m[i][1]
		}
	}
	vec := func(i, j int) (v [4]float64) {
		for k := 0; k < 2; k++ {
			for a := 0; a < 2; a++ {
				v[2*k+a] = m[i][a]*Fm[j][k] + Fm[i][k]*m[j][a]
			}
		}
		return v
	}
	v11, v22, v12 := vec(0, 0), vec(1, 1), vec(0, 1)
	l3 := q.J.pow(-1)
	v3 := sh.Eval(l3.v, p)
	energy := v1.F + v2.F + v3.F
	var P [4]float64
	var A [4][4]float64
	for k := 0; k < 2; k++ {
		for a := 0; a < 2; a++ {
			i := 2*k + a
			P[i] = 2*(u[2*k]*Gm[0][a]+u[2*k+1]*Gm[1][a]) + v3.D1*l3.g[i]
			for l := 0; l < 2; l++ {
				for b := 0; b < 2; b++ {
					j := 2*l + b
					x := ddg[0]*v11[i]*v11[j] + ddg[1]*v22[i]*v22[j] + dv.R*v12[i]*v12[j] +
						v3.D2*l3.g[i]*l3.g[j] + v3.D1*l3.h[i][j]
					if k == l {
						x += 2 * Gm[a][b]
					}
					A[i][j] = x
				}
			}
		}
	}
	if bad(energy) || bad(P[0]) || bad(P[1]) || bad(P[2]) || bad(P[3]) || bad(dv.R) || bad(ddg[0]) || bad(ddg[1]) || bad(v3.D2) {
		return fmt.Errorf("%s is not finite at F = %v: a power of a principal stretch overflows far beyond the fitted range", sh.ID, q.u)
	}
	t.Energy += w * energy
	for i := range P {
		t.P[i] += w * P[i]
		for j := range A[i] {
			t.A[i][j] += w * A[i][j]
		}
	}
	return nil
}

func bad(v float64) bool { return math.IsInf(v, 0) || math.IsNaN(v) }

// principalShear is the small-strain shear modulus of Σ_i g(λ_i) per unit
// weight: with λ_i = 1 + ε_i and Σ ln λ_i = 0, Σ g(λ_i) ≈ ½(g′(1) + g″(1)) Σ ε_i²,
// which is μ Σ ε_i² for μ = (g′(1) + g″(1))/2 (1 for the catalogue's
// normalisation).
func principalShear(sh *terms.Shape, params []float64) float64 {
	v := sh.Eval(1, params)
	return (v.D1 + v.D2) / 2
}
