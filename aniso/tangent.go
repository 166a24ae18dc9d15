package aniso

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/terms"
)

// The in-plane tangent of the plane-stress membrane.
//
// With F33 = 1/det F2 eliminated, the membrane energy is a function of the
// four in-plane components alone, W(F2) = Ψ(F(F2)), and the in-plane nominal
// stress is its gradient, P = ∂W/∂F2: differentiating through F33 supplies
// exactly the Lagrange pressure that makes σ33 = 0. The tangent is therefore
// the Hessian A = ∂²W/∂F2², a symmetric 4×4 matrix. For W = Σ w f(x):
//
//	A = Σ w [ f″(x) ∇x ⊗ ∇x + f′(x) ∇²x ]
//
// with ∇ and ∇² taken over u = (F11, F12, F21, F22). The invariants are
// written so that their derivatives are closed forms (J = det F2, I3 = 1):
//
//	I1 = |F2|² + J⁻²,  I2 = tr C⁻¹ = |F2|² J⁻² + J²,
//	I4 = |F2 a0|²,  I5 = |C2 a0|² = |F2ᵀ F2 a0|²,  K = I5 − I1 I4 + I2.

// Tangent is the response of a model at one in-plane deformation, with the
// derivative of the nominal stress. Every 4-vector and both indices of A
// use the component order (11, 12, 21, 22) of F — note that this differs
// from Response.Nominal, which is ordered (11, 22, 12, 21).
type Tangent struct {
	// F is the in-plane deformation gradient (F11, F12, F21, F22).
	F [4]float64
	// Energy is W = Ψ per unit reference volume, in the stress unit.
	Energy float64
	// P is the in-plane nominal stress ∂W/∂F2 as (P11, P12, P21, P22), in
	// the stress unit; it equals Response.Nominal reordered.
	P [4]float64
	// A is the tangent A[i][j] = ∂P_i/∂F_j = ∂²W/∂F_i∂F_j in the stress
	// unit (per unit of F). It is symmetric.
	A [4][4]float64
}

// jet is a scalar function of u = (F11, F12, F21, F22) with its gradient
// and Hessian.
type jet struct {
	v float64
	g [4]float64
	h [4][4]float64
}

// addScaled returns a + c·b.
func (a jet) addScaled(c float64, b *jet) jet {
	a.v += c * b.v
	for i := range a.g {
		a.g[i] += c * b.g[i]
		for j := range a.h[i] {
			a.h[i][j] += c * b.h[i][j]
		}
	}
	return a
}

// mul returns the product a·b.
func (a *jet) mul(b *jet) jet {
	var r jet
	r.v = a.v * b.v
	for i := range r.g {
		r.g[i] = a.v*b.g[i] + b.v*a.g[i]
		for j := range r.h[i] {
			r.h[i][j] = a.v*b.h[i][j] + b.v*a.h[i][j] + a.g[i]*b.g[j] + b.g[i]*a.g[j]
		}
	}
	return r
}

// pow returns a^p via the chain rule (a.v > 0).
func (a *jet) pow(p float64) jet {
	var r jet
	r.v = math.Pow(a.v, p)
	d1 := p * math.Pow(a.v, p-1)
	d2 := p * (p - 1) * math.Pow(a.v, p-2)
	for i := range r.g {
		r.g[i] = d1 * a.g[i]
		for j := range r.h[i] {
			r.h[i][j] = d1*a.h[i][j] + d2*a.g[i]*a.g[j]
		}
	}
	return r
}

// invariantJets holds the isotropic invariants and their derivatives at one F.
type invariantJets struct {
	u      [4]float64
	J, Jm2 jet
	I1, I2 jet
}

func newInvariantJets(F [4]float64) invariantJets {
	var q invariantJets
	q.u = F
	// J = F11 F22 − F12 F21.
	q.J.v = F[0]*F[3] - F[1]*F[2]
	q.J.g = [4]float64{F[3], -F[2], -F[1], F[0]}
	q.J.h[0][3], q.J.h[3][0] = 1, 1
	q.J.h[1][2], q.J.h[2][1] = -1, -1
	// s = |F2|².
	var s jet
	for i, v := range F {
		s.v += v * v
		s.g[i] = 2 * v
		s.h[i][i] = 2
	}
	q.Jm2 = q.J.pow(-2)
	q.I1 = s.addScaled(1, &q.Jm2)
	sj := s.mul(&q.Jm2)
	j2 := q.J.mul(&q.J)
	q.I2 = sj.addScaled(1, &j2)
	return q
}

// fibreJets returns I4, I5 and K of a family at angle alpha with their
// derivatives.
func (q *invariantJets) fibreJets(alpha float64) (I4, I5, K jet) {
	s, c := math.Sincos(alpha)
	a0 := [2]float64{c, s}
	F := &q.u
	// a = F2 a0; component i of a depends on row i of F2: u[2i], u[2i+1].
	a := [2]float64{F[0]*c + F[1]*s, F[2]*c + F[3]*s}
	I4.v = a[0]*a[0] + a[1]*a[1]
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			I4.g[2*i+j] = 2 * a[i] * a0[j]
			for l := 0; l < 2; l++ {
				I4.h[2*i+j][2*i+l] = 2 * a0[j] * a0[l]
			}
		}
	}
	// g = F2ᵀ a, g_j = Σ_i F_ij a_i; ∂g_j/∂F_kl = δ_jl a_k + F_kj a0_l;
	// ∂²g_j/∂F_kl ∂F_mn = δ_km (δ_jl a0_n + δ_jn a0_l).
	var g [2]float64
	var dg [2][4]float64
	for j := 0; j < 2; j++ {
		g[j] = F[j]*a[0] + F[2+j]*a[1]
		for k := 0; k < 2; k++ {
			for l := 0; l < 2; l++ {
				v := F[2*k+j] * a0[l]
				if j == l {
					v += a[k]
				}
				dg[j][2*k+l] = v
			}
		}
	}
	I5.v = g[0]*g[0] + g[1]*g[1]
	for p := 0; p < 4; p++ {
		I5.g[p] = 2 * (g[0]*dg[0][p] + g[1]*dg[1][p])
	}
	for k := 0; k < 2; k++ {
		for l := 0; l < 2; l++ {
			for m := 0; m < 2; m++ {
				for n := 0; n < 2; n++ {
					p, r := 2*k+l, 2*m+n
					v := 2 * (dg[0][p]*dg[0][r] + dg[1][p]*dg[1][r])
					if k == m {
						// 2 Σ_j g_j (δ_jl a0_n + δ_jn a0_l)
						v += 2 * (g[l]*a0[n] + g[n]*a0[l])
					}
					I5.h[p][r] = v
				}
			}
		}
	}
	prod := q.I1.mul(&I4)
	K = I5.addScaled(-1, &prod)
	K = K.addScaled(1, &q.I2)
	return I4, I5, K
}

// argJet returns a term's shifted argument x with its derivatives, and
// whether the term is active (the fibre switch: E_f and I5 terms only while
// I4 > 1). It mirrors argument() in model.go.
func argJet(a terms.Argument, kappa float64, q *invariantJets, I4, I5, K *jet) (jet, bool) {
	var x jet
	switch a {
	case terms.I1:
		x = q.I1
		x.v -= 3
	case terms.I2:
		x = q.I2
		x.v -= 3
	case terms.Fibre:
		if !(I4.v > 1+switchRoundOff) {
			return x, false
		}
		x = x.addScaled(kappa, &q.I1)
		x = x.addScaled(1-3*kappa, I4)
		x.v = kappa*(q.I1.v-3) + (1-3*kappa)*(I4.v-1)
	case terms.Cofactor:
		if !(K.v > 1+switchRoundOff) {
			return x, false
		}
		x = *K
		x.v -= 1
	case terms.Fifth:
		if !(I4.v > 1+switchRoundOff) {
			return x, false
		}
		x = *I5
		x.v -= 1
	default:
		return x, false
	}
	return x, true
}

// Tangent returns the energy, the in-plane nominal stress and the analytic
// tangent A = ∂P/∂F2 at F = (F11, F12, F21, F22) (see the Tangent type for
// the component order). The tangent includes every term's f″ (from the
// shape's closed form), the fibre switch (a fibre or I5 term with I4 ≤ 1
// contributes nothing; at I4 = 1 exactly the tangent is the compression-side
// one), dispersion and the cofactor and I5 terms. It fails for det F ≤ 0, a
// non-finite F, or an overflowing term.
func (m *Model) Tangent(F [4]float64) (Tangent, error) {
	if _, err := NewKinematics(F); err != nil {
		return Tangent{}, err
	}
	q := newInvariantJets(F)
	type fam struct{ I4, I5, K jet }
	var buf [4]fam // no allocation for up to four families
	fams := buf[:0]
	if len(m.Families) > len(buf) {
		fams = make([]fam, 0, len(m.Families))
	}
	fams = fams[:len(m.Families)]
	for i, f := range m.Families {
		fams[i].I4, fams[i].I5, fams[i].K = q.fibreJets(f.Angle)
	}
	t := Tangent{F: F}
	var rules []*planarRule
	for i := range m.Terms {
		term := &m.Terms[i]
		if term.Weight == 0 {
			continue
		}
		if term.Family >= 0 && m.Families[term.Family].Planar {
			if rules == nil {
				rules = make([]*planarRule, len(m.Families))
			}
			r := rules[term.Family]
			if r == nil {
				fm := &m.Families[term.Family]
				g := newPlanarGeom(&F)
				r = &planarRule{}
				r.build(pointRule, &g, fm.Angle, fm.Concentration, familyKinks(m, term.Family, nil), familySteepness(m, term.Family, &g))
				rules[term.Family] = r
			}
			if err := t.addPlanar(r, term, &q); err != nil {
				return t, fmt.Errorf("term #%d (%s, counting from 1): %w", i+1, term.Shape.ID, err)
			}
			continue
		}
		if term.Shape.Arg == terms.Principal {
			if err := principalTangent(term, &q, &t); err != nil {
				return t, fmt.Errorf("term #%d (counting from 1): %w", i+1, err)
			}
			continue
		}
		kappa := 0.0
		var I4, I5, K *jet
		if term.Family >= 0 {
			fm := &fams[term.Family]
			I4, I5, K = &fm.I4, &fm.I5, &fm.K
			kappa = m.Families[term.Family].Dispersion
		}
		x, on := argJet(term.Shape.Arg, kappa, &q, I4, I5, K)
		if term.Shape.Arg == terms.Green {
			x, on = greenJet(F, term.Params), true
		}
		if !on {
			continue
		}
		v := term.Shape.Eval(x.v, term.Params)
		if math.IsInf(v.F, 0) || math.IsInf(v.D1, 0) || math.IsInf(v.D2, 0) || math.IsNaN(v.D2) {
			return t, fmt.Errorf("term #%d (%s, counting from 1) is not finite at F = %v: beyond its limit or overflowing far beyond the fitted range", i+1, term.Shape.ID, F)
		}
		w := term.Weight
		t.Energy += w * v.F
		for a := range t.P {
			t.P[a] += w * v.D1 * x.g[a]
			for b := range t.A[a] {
				t.A[a][b] += w * (v.D2*x.g[a]*x.g[b] + v.D1*x.h[a][b])
			}
		}
	}
	return t, nil
}

// NominalFOrder converts Response.Nominal's (P11, P22, P12, P21) into the
// F component order (P11, P12, P21, P22) used by Tangent.
func NominalFOrder(p [4]float64) [4]float64 { return [4]float64{p[0], p[2], p[3], p[1]} }
