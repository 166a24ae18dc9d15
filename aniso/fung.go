package aniso

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/terms"
)

// The Fung-type planar term (Tong & Fung 1976, J Biomech 9:649–657).
//
// Its energy is a function of the Green strain E = (C2 − 1)/2 of the in-plane
// C2 = F2ᵀF2 in the tester's axes, W = w f(Q) with f(Q) = (e^Q − 1)/2 and
//
//	Q = b1 E11² + b2 E22² + 2 b3 E11 E22 + b4 (E12² + E21²),  E21 = E12.
//
// Plane stress. As a three-dimensional incompressible energy Ψ(C) = W, it
// does not depend on C33, so σ = −p 1 + 2 F (∂Ψ/∂C) Fᵀ (Holzapfel 2000,
// §6.6) gives σ33 = −p + 2 F33² ∂Ψ/∂C33 = −p, and σ33 = 0 fixes p = 0. The
// in-plane Cauchy stress is σ = F2 S F2ᵀ with S = ∂W/∂E (second
// Piola–Kirchhoff, E12 and E21 counted as separate components), and the
// nominal stress is P = σ F2⁻ᵀ = F2 S. The membrane energy W(F2) depends on
// F2 only through C2, so ∂W/∂F2 = F2 S as well: the tangent's route and the
// stress route agree (the tests check both against numerical derivatives of
// W). With G = ∂Q/∂E = 2 (b1 E11 + b3 E22, b2 E22 + b3 E11, b4 E12),
//
//	S = w f′(Q) G = w e^Q (b1 E11 + b3 E22, b2 E22 + b3 E11, b4 E12),
//
// Tong & Fung's S11 = c e^Q (b1 E11 + b3 E22) with c = w. The stress is
// linear in w, and its derivatives with respect to b follow in closed form:
// ∂σ/∂b_j = w F2 [f″(Q) (∂Q/∂b_j) G + f′(Q) ∂G/∂b_j] F2ᵀ.
//
// The term's axes are the tester's axes 1, 2, fixed in the specimen: it is
// anisotropic without a fibre family, and turning the loading frame turns the
// specimen under it. b4 acts only through E12; data without in-plane shear
// strain cannot determine it, and Fit holds it at 0 (see heldShear).

// greenStrain returns E = (C2 − 1)/2 of F = (F11, F12, F21, F22) as
// (E11, E22, E12).
func greenStrain(F [4]float64) Sym {
	return Sym{(F[0]*F[0] + F[2]*F[2] - 1) / 2, (F[1]*F[1] + F[3]*F[3] - 1) / 2, (F[0]*F[1] + F[2]*F[3]) / 2}
}

// fungQ returns Q and G = ∂Q/∂E for E = (E11, E22, E12) and b = (b1…b4),
// or b1…b6 for the generalised form, whose couplings add
// 2 b5 E11 (E12 + E21) + 2 b6 E22 (E12 + E21) to Q (terms/fung.go).
func fungQ(E Sym, b []float64) (float64, Sym) {
	q := b[0]*E[0]*E[0] + b[1]*E[1]*E[1] + 2*b[2]*E[0]*E[1] + 2*b[3]*E[2]*E[2]
	g := Sym{2 * (b[0]*E[0] + b[2]*E[1]), 2 * (b[1]*E[1] + b[2]*E[0]), 2 * b[3] * E[2]}
	if len(b) == 6 {
		q += 4 * E[2] * (b[4]*E[0] + b[5]*E[1])
		g[0] += 4 * b[4] * E[2]
		g[1] += 4 * b[5] * E[2]
		g[2] += 2 * (b[4]*E[0] + b[5]*E[1])
	}
	return q, g
}

// fungDQ returns ∂Q/∂b_j and ∂G/∂b_j for j = 0…5 (the last two are the
// generalised form's couplings; a four-coefficient term reads only the
// first four).
func fungDQ(E Sym) ([6]float64, [6]Sym) {
	return [6]float64{E[0] * E[0], E[1] * E[1], 2 * E[0] * E[1], 2 * E[2] * E[2], 4 * E[0] * E[2], 4 * E[1] * E[2]},
		[6]Sym{{2 * E[0], 0, 0}, {0, 2 * E[1], 0}, {2 * E[1], 2 * E[0], 0}, {0, 0, 2 * E[2]}, {4 * E[2], 0, 2 * E[0]}, {0, 4 * E[2], 2 * E[1]}}
}

// pushForward returns F S Fᵀ of a symmetric in-plane S (a second
// Piola–Kirchhoff stress) as a Cauchy stress (J = 1).
func pushForward(F [4]float64, S Sym) Sym {
	f11, f12, f21, f22 := F[0], F[1], F[2], F[3]
	return Sym{
		f11*f11*S[0] + 2*f11*f12*S[2] + f12*f12*S[1],
		f21*f21*S[0] + 2*f21*f22*S[2] + f22*f22*S[1],
		f11*f21*S[0] + (f11*f22+f12*f21)*S[2] + f12*f22*S[1],
	}
}

// greenPoint is what a Green-strain term's columns need of one point and
// is the same for every model: the Green strain E and, because the output
// components of F X Fᵀ are linear in X, the images u[e] of the unit
// tensors on components 11, 22 and 12 (in the output measure, weighted).
type greenPoint struct {
	E Sym
	u [3][4]float64
}

// greenPoints precomputes every point's greenPoint.
func (d *Dataset) greenPoints() []greenPoint {
	nc := len(d.out.Components)
	out := make([]greenPoint, len(d.kin))
	for i := range d.kin {
		k := &d.kin[i]
		out[i].E = greenStrain(k.F)
		for e := range out[i].u {
			var x Sym
			x[e] = 1
			out[i].u[e] = d.convert(k, pushForward(k.F, x), i*nc)
		}
	}
	return out
}

// greenStress returns a Green-strain term's Cauchy stress and energy per
// unit weight at one deformation.
func greenStress(sh *terms.Shape, b []float64, k *Kinematics) (Sym, float64) {
	q, g := fungQ(greenStrain(k.F), b)
	v := sh.Eval(q, b)
	return mulSym(v.D1, pushForward(k.F, g)), v.F
}

// fillGreen fills the column of a Green-strain term and, with derivs, its
// derivative columns with respect to b1…b4 (angle and dispersion
// derivatives are zero).
func (d *Dataset) fillGreen(term *Term, col []float64, c *Columns, off int, derivs bool) {
	nc := len(d.out.Components)
	b := term.Params
	if derivs {
		clear(c.DAngle[off : off+len(col)])
		clear(c.DKappa[off : off+len(col)])
	}
	green := d.greenData()
	for i := range d.kin {
		r0 := i * nc
		gp := &green[i]
		E, u := gp.E, &gp.u
		q, g := fungQ(E, b)
		a := col[r0 : r0+nc]
		var h [4]float64
		for j := range a {
			h[j] = g[0]*u[0][j] + g[1]*u[1][j] + g[2]*u[2][j]
		}
		if !derivs {
			d1 := term.Shape.Slope(q, b)
			for j := range a {
				a[j] = mul0(d1, h[j])
			}
			continue
		}
		v := term.Shape.Eval(q, b)
		for j := range a {
			a[j] = mul0(v.D1, h[j])
		}
		if math.IsInf(v.D1, 0) || math.IsInf(v.D2, 0) {
			for p := range term.Params {
				clear(c.DParam[p][off+r0 : off+r0+nc])
			}
			continue
		}
		dq, dg := fungDQ(E)
		for p := range term.Params {
			dst := c.DParam[p][off+r0 : off+r0+nc]
			for j := range dst {
				dst[j] = v.D2*dq[p]*h[j] + v.D1*(dg[p][0]*u[0][j]+dg[p][1]*u[1][j]+dg[p][2]*u[2][j])
			}
		}
	}
}

// greenJet returns Q as a function of u = (F11, F12, F21, F22) with its
// gradient and Hessian, for the tangent.
func greenJet(F [4]float64, b []float64) jet {
	var e11, e22, e12 jet
	e11.v = (F[0]*F[0] + F[2]*F[2] - 1) / 2
	e11.g[0], e11.g[2] = F[0], F[2]
	e11.h[0][0], e11.h[2][2] = 1, 1
	e22.v = (F[1]*F[1] + F[3]*F[3] - 1) / 2
	e22.g[1], e22.g[3] = F[1], F[3]
	e22.h[1][1], e22.h[3][3] = 1, 1
	e12.v = (F[0]*F[1] + F[2]*F[3]) / 2
	e12.g = [4]float64{F[1] / 2, F[0] / 2, F[3] / 2, F[2] / 2}
	e12.h[0][1], e12.h[1][0], e12.h[2][3], e12.h[3][2] = 0.5, 0.5, 0.5, 0.5
	var q jet
	s11, s22, s1122, s12 := e11.mul(&e11), e22.mul(&e22), e11.mul(&e22), e12.mul(&e12)
	q = q.addScaled(b[0], &s11)
	q = q.addScaled(b[1], &s22)
	q = q.addScaled(2*b[2], &s1122)
	q = q.addScaled(2*b[3], &s12)
	if len(b) == 6 {
		s1112, s2212 := e11.mul(&e12), e22.mul(&e12)
		q = q.addScaled(4*b[4], &s1112)
		q = q.addScaled(4*b[5], &s2212)
	}
	return q
}

// shearStrainTolerance is the largest |E12| treated as no shear strain:
// far below what optical markers resolve (about 1e-4), so only data that
// are pure biaxial stretch, up to round-off, count as shear-free.
const shearStrainTolerance = 1e-6

// hasShearStrain reports whether any point of the dataset has an in-plane
// shear strain |E12| above shearStrainTolerance.
func (d *Dataset) hasShearStrain() bool {
	for i := range d.kin {
		if math.Abs(greenStrain(d.kin[i].F)[2]) > shearStrainTolerance {
			return true
		}
	}
	return false
}

// heldParam is a shape parameter a fit held at 0 because the data cannot
// determine it.
type heldParam struct {
	name  string
	group int
}

// heldShear removes from the fitted parameters every shape parameter that
// acts only through in-plane shear strain when the data have none, and holds
// it at 0 in the model: it has no effect on such data, so fitting it would
// report noise.
func heldShear(p *Problem, m *Model, groups [][]int, params []param) ([]param, []heldParam) {
	var held []heldParam
	var keep []param
	shear := -1 // unknown until a shear-only parameter asks
	for _, q := range params {
		if q.Kind == kindShape {
			t := &m.Terms[groups[q.Group][0]]
			if t.Shape.Params[q.Index].Shear {
				if shear < 0 {
					shear = 0
					if p.Data.hasShearStrain() {
						shear = 1
					}
				}
				if shear == 0 {
					for _, k := range groups[q.Group] {
						m.Terms[k].Params[q.Index] = 0
					}
					held = append(held, heldParam{q.Name, q.Group})
					continue
				}
			}
		}
		keep = append(keep, q)
	}
	return keep, held
}

// greenNotes adds the held parameters to the estimates (value 0, not
// determined) and states, for every active Green-strain term, why a held
// parameter is not determined and whether the convexity condition holds.
func (r *Result) greenNotes(p *Problem, held []heldParam) {
	for _, h := range held {
		r.Estimates = append(r.Estimates, Estimate{Name: h.name, Kind: "shape", Term: h.group, Value: 0,
			StdErr: math.NaN(), Lo: math.NaN(), Hi: math.NaN(), Status: "not-determined"})
		if r.Weights[h.group] > 0 {
			through := "E12² + E21². The fitted model has no shear stiffness from this term"
			if h.name != "b4" {
				through = "E12 + E21. The fitted model couples no shear to the normal strains through it"
			}
			r.Notes = append(r.Notes, fmt.Sprintf("%s is held at 0 and not determined: the data have no in-plane shear strain (|E12| ≤ %g at every point) and the Fung-type exponent depends on it only through %s; where the tissue shears, take it from tests with shear (markers giving F12 and F21, or an off-axis protocol).", h.name, shearStrainTolerance, through))
		}
	}
	shear := p.Data.hasShearStrain()
	for g, t := range r.Structure.Terms {
		if t.Shape.Arg != terms.Green || r.Weights[g] <= 0 {
			continue
		}
		b := r.Model.Terms[g].Params
		if members := r.e.groups[g]; len(members) > 0 {
			b = r.Model.Terms[members[0]].Params
		}
		label := t.Label(r.Structure.Layout)
		if c, ok := t.Shape.ConvexityCondition(b, shear); ok {
			verdict := "holds for the fitted values"
			if !c.Holds {
				verdict = "does NOT hold for the fitted values, so the energy is not convex in E and may predict unstable or non-unique responses outside the data"
			}
			r.Notes = append(r.Notes, fmt.Sprintf("Convexity of %s (Tong & Fung 1976; not polyconvex in general): condition %s. It %s (%s).", label, c.Condition, verdict, c.Detail))
		}
		if q := maxQ(p.Data, b); q < linearLimitQ {
			w := r.Weights[g]
			products := fmt.Sprintf("c·b1 = %.4g, c·b2 = %.4g, c·b3 = %.4g, c·b4 = %.4g", w*b[0], w*b[1], w*b[2], w*b[3])
			if len(b) == 6 {
				products += fmt.Sprintf(", c·b5 = %.4g, c·b6 = %.4g", w*b[4], w*b[5])
			}
			r.Notes = append(r.Notes, fmt.Sprintf("The exponent Q of %s stays below %g over the data (largest %.3g): the fit has gone to the linear limit W ≈ c Q/2, where only the products c·b are determined (%s in the stress unit). These data do not support the exponential stiffening of this form in the tester's axes.", label, linearLimitQ, q, products))
		}
	}
}

// linearLimitQ is the largest exponent Q over the data below which a
// Green-strain term is practically linear in Q (e^Q − 1 within 0.05 % of Q).
const linearLimitQ = 1e-3

// maxQ is the largest Tong & Fung exponent Q over the dataset's points.
func maxQ(d *Dataset, b []float64) float64 {
	m := 0.0
	for i := range d.kin {
		q, _ := fungQ(greenStrain(d.kin[i].F), b)
		m = math.Max(m, q)
	}
	return m
}
