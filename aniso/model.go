package aniso

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/terms"
)

// MaxDispersion is the largest dispersion κ: a fully dispersed, isotropic
// family (Gasser, Ogden & Holzapfel 2006).
const MaxDispersion = 1.0 / 3

// Family is one fibre family.
type Family struct {
	// Name identifies the family in model cards, e.g. "f1".
	Name string
	// Angle is the mean fibre direction in radians from axis 1 towards axis
	// 2; it is defined modulo π.
	Angle float64
	// Dispersion is κ ∈ [0, 1/3] (Gasser, Ogden & Holzapfel 2006); 0 is a
	// perfectly aligned family.
	Dispersion float64
	// Planar is true when the family's fibres spread over the plane with a
	// von Mises density in 2θ about Angle of concentration Concentration,
	// each direction switched on and off by its own stretch (see planar.go);
	// Dispersion must then be 0.
	Planar bool
	// Concentration is b ∈ [0, MaxConcentration] of a planar family
	// (dimensionless; 0: fibres in every in-plane direction alike).
	Concentration float64
}

// Term is one weighted energy term w·f(x).
type Term struct {
	// Shape is the catalogue shape.
	Shape *terms.Shape
	// Family is the index into Model.Families for fibre, cofactor and
	// fifth-invariant shapes, and -1 for isotropic shapes.
	Family int
	// Weight w ≥ 0 in the model's stress unit.
	Weight float64
	// Params are the shape's non-linear parameters in Shape.Params order.
	Params []float64
}

// Model is a strain energy Ψ = Σ w_k f_k(x_k) with its fibre families.
type Model struct {
	Families []Family
	Terms    []Term
}

// TermPolyconvex reports whether term i of m keeps the energy
// polyconvex on m's own families: the catalogue's claim for its shape
// (terms.Shape.Polyconvex), except that a fibre term on a family with
// dispersion κ > 0 is not, since its I4 > 1 switch makes energy and stress
// jump where I4 crosses 1 while I1 > 3 (terms.Fibre).
func (m *Model) TermPolyconvex(i int) bool {
	t := m.Terms[i]
	if t.Shape == nil || !t.Shape.Polyconvex {
		return false
	}
	return !(t.Shape.Arg == terms.Fibre && t.Family >= 0 && t.Family < len(m.Families) && m.Families[t.Family].Dispersion > 0)
}

// HasGreenTerm reports whether m has a Green-strain (Fung-type) term of
// positive weight. Such a term's axes are the tester's: turning the
// specimen is not a turn of its terms, and a sheared grip meets its
// normal–shear couplings.
func (m *Model) HasGreenTerm() bool {
	for _, t := range m.Terms {
		if t.Shape != nil && t.Shape.Arg == terms.Green && t.Weight > 0 {
			return true
		}
	}
	return false
}

// Validate reports the first inconsistency: a missing shape, a family index
// that does not fit the shape's argument, a negative or non-finite weight,
// parameters out of bounds, a non-finite angle or a dispersion outside
// [0, 1/3].
func (m *Model) Validate() error {
	for i, f := range m.Families {
		if math.IsNaN(f.Angle) || math.IsInf(f.Angle, 0) {
			return fmt.Errorf("family %d (%s): angle is not a finite number", i, f.Name)
		}
		if !(f.Dispersion >= 0 && f.Dispersion <= MaxDispersion) {
			return fmt.Errorf("family %d (%s): dispersion %g is outside [0, 1/3]", i, f.Name, f.Dispersion)
		}
		if f.Planar {
			if f.Dispersion != 0 {
				return fmt.Errorf("family %d (%s): a family spread in the plane takes a concentration, not a dispersion κ", i, f.Name)
			}
			if !(f.Concentration >= 0 && f.Concentration <= MaxConcentration) {
				return fmt.Errorf("family %d (%s): concentration %g is outside [0, %g]", i, f.Name, f.Concentration, float64(MaxConcentration))
			}
		}
	}
	for i, t := range m.Terms {
		if t.Shape == nil {
			return fmt.Errorf("term %d: no shape", i)
		}
		if t.Shape.Arg.NeedsFamily() {
			if t.Family < 0 || t.Family >= len(m.Families) {
				return fmt.Errorf("term %d (%s): needs a fibre family, got index %d of %d", i, t.Shape.ID, t.Family, len(m.Families))
			}
		} else if t.Family != -1 {
			return fmt.Errorf("term %d (%s): isotropic terms take no family", i, t.Shape.ID)
		}
		if t.Family >= 0 && m.Families[t.Family].Planar && t.Shape.Arg != terms.Fibre {
			return fmt.Errorf("term %d (%s): a family spread in the plane takes fibre-stretch terms only (argument E_f), not %s", i, t.Shape.ID, t.Shape.Arg)
		}
		if !(t.Weight >= 0) || math.IsInf(t.Weight, 0) {
			return fmt.Errorf("term %d (%s): weight %g must be a finite number ≥ 0", i, t.Shape.ID, t.Weight)
		}
		if err := t.Shape.CheckParams(t.Params); err != nil {
			return fmt.Errorf("term %d: %w", i, err)
		}
	}
	return nil
}

// argState is a term's argument at one deformation and how its Cauchy
// stress combines the stress bases: per unit weight the term's stress is
// f′(x)·H with H = C[0]·G1 + C[1]·G2 + C[2]·G4 + C[3]·G5 (G4, G5 of the term's
// family).
type argState struct {
	Active bool
	X      float64
	C      [4]float64
}

// argSlopes are the derivatives of argState's X and C with respect to the
// family angle (DxA, DCA, per radian) and dispersion κ (DxK, DCK). The angle
// derivative of H also includes C[2]·∂G4/∂α + C[3]·∂G5/∂α.
type argSlopes struct {
	DxA, DxK float64
	DCA, DCK [4]float64
}

// switchRoundOff is how far above 1 I4 (or K, for a cofactor term) must
// lie for a family's terms to switch on: at the reference state F = I,
// I4 = cos²α + sin²α and K come out within a few units in the last place
// of 1 on either side, and a term switched on by that round-off would add
// its full stiffness f″ to the tangent there (a cofactor term's tangent at
// F = I once depended on which side the round-off fell). No measured
// deformation lies that close to the switch but the reference state
// itself.
const switchRoundOff = 1e-14

// argument evaluates the shifted invariant of a term's shape and the chain
// rule into ψ1, ψ2, ψ4, ψ5 (package documentation, Plane stress). fk is nil
// for isotropic shapes.
// Fibre and fifth-invariant terms are inactive while I4 ≤ 1 (the fibre
// switch); the cofactor shapes switch on their own argument instead.
func argument(a terms.Argument, kappa float64, k *Kinematics, fk *FibreKinematics) argState {
	switch a {
	case terms.I1:
		return argState{Active: true, X: k.I1 - 3, C: [4]float64{1, 0, 0, 0}}
	case terms.I2:
		return argState{Active: true, X: k.I2 - 3, C: [4]float64{0, 1, 0, 0}}
	case terms.Fibre:
		if fk.I4 > 1+switchRoundOff {
			c := 1 - 3*kappa
			return argState{Active: true, X: kappa*(k.I1-3) + c*(fk.I4-1), C: [4]float64{kappa, 0, c, 0}}
		}
	case terms.Cofactor:
		// K = I5 − I1 I4 + I2: ψ1 = −I4 f′, ψ2 = f′, ψ4 = −I1 f′, ψ5 = f′.
		if fk.K > 1+switchRoundOff {
			return argState{Active: true, X: fk.K - 1, C: [4]float64{-fk.I4, 1, -k.I1, 1}}
		}
	case terms.Fifth:
		if fk.I4 > 1+switchRoundOff {
			return argState{Active: true, X: fk.I5 - 1, C: [4]float64{0, 0, 0, 1}}
		}
	}
	return argState{}
}

// slopes returns the angle and dispersion derivatives of an active term's
// argument state.
func slopes(a terms.Argument, kappa float64, k *Kinematics, fk *FibreKinematics) argSlopes {
	switch a {
	case terms.Fibre:
		return argSlopes{DxA: (1 - 3*kappa) * fk.DI4, DxK: (k.I1 - 3) - 3*(fk.I4-1), DCK: [4]float64{1, 0, -3, 0}}
	case terms.Cofactor:
		return argSlopes{DxA: fk.DK, DCA: [4]float64{-fk.DI4, 0, 0, 0}}
	case terms.Fifth:
		return argSlopes{DxA: fk.DI5}
	}
	return argSlopes{}
}

// combine returns Σ c_i·basis_i over the four Cauchy bases.
func combine(c *[4]float64, g1, g2, g4, g5 Sym) Sym {
	var h Sym
	for j := range h {
		h[j] = c[0]*g1[j] + c[1]*g2[j] + c[2]*g4[j] + c[3]*g5[j]
	}
	return h
}

// mulSym returns v·H treating ±Inf·0 as 0, so that an overflowing shape
// gives ±Inf only in components it actually drives, never NaN.
func mulSym(v float64, h Sym) Sym {
	return Sym{mul0(v, h[0]), mul0(v, h[1]), mul0(v, h[2])}
}

// termStress returns the Cauchy stress of one term per unit weight and its
// energy per unit weight at one deformation (fk nil for isotropic terms).
func termStress(sh *terms.Shape, params []float64, kappa float64, k *Kinematics, fk *FibreKinematics) (Sym, float64) {
	if sh.Arg == terms.Green {
		return greenStress(sh, params, k)
	}
	if sh.Arg == terms.Principal {
		return principalStress(sh, params, k)
	}
	s := argument(sh.Arg, kappa, k, fk)
	if !s.Active {
		return Sym{}, 0
	}
	var g4, g5 Sym
	if fk != nil {
		g4, g5 = fk.G4, fk.G5
	}
	v := sh.Eval(s.X, params)
	return mulSym(v.D1, combine(&s.C, k.G1, k.G2, g4, g5)), v.F
}

// Response is a model's response at one in-plane deformation.
type Response struct {
	// Cauchy is the in-plane Cauchy stress (σ11, σ22, σ12), stress unit.
	Cauchy Sym
	// Nominal is (P11, P22, P12, P21), P = σ F⁻ᵀ, stress unit.
	Nominal [4]float64
	// Energy is Ψ per unit reference volume (stress unit).
	Energy float64
	// TermCauchy and TermEnergy are each term's weighted contribution, in
	// Model.Terms order; they sum to Cauchy and Energy.
	TermCauchy []Sym
	TermEnergy []float64
	// I4 is the squared fibre stretch of each family.
	I4 []float64
}

// Evaluate returns the stress and energy at F = (F11, F12, F21, F22). It fails
// for det F ≤ 0, a non-finite F, or a stress that is not finite (an
// exponential term far beyond the range it was fitted in, or a limiting
// term at its limit); the error names the term.
func (m *Model) Evaluate(F [4]float64) (Response, error) {
	k, err := NewKinematics(F)
	if err != nil {
		return Response{}, err
	}
	fks := make([]FibreKinematics, len(m.Families))
	rules := make([]*planarRule, len(m.Families))
	r := Response{TermCauchy: make([]Sym, len(m.Terms)), TermEnergy: make([]float64, len(m.Terms)), I4: make([]float64, len(m.Families))}
	for i, f := range m.Families {
		fks[i] = k.Fibre(f.Angle)
		r.I4[i] = fks[i].I4
		if f.Planar {
			g := newPlanarGeom(&k.F)
			rules[i] = &planarRule{}
			rules[i].build(pointRule, &g, f.Angle, f.Concentration, familyKinks(m, i, nil), familySteepness(m, i, &g))
		}
	}
	for i, t := range m.Terms {
		var fk *FibreKinematics
		kappa := 0.0
		if t.Family >= 0 {
			fk = &fks[t.Family]
			kappa = m.Families[t.Family].Dispersion
		}
		var col Sym
		var psi float64
		if t.Family >= 0 && rules[t.Family] != nil {
			col, psi = planarStress(rules[t.Family], &t, &k)
		} else {
			col, psi = termStress(t.Shape, t.Params, kappa, &k, fk)
		}
		c := mulSym(t.Weight, col)
		r.TermCauchy[i] = c
		if t.Weight != 0 {
			r.TermEnergy[i] = t.Weight * psi
		}
		r.Cauchy[0] += c[0]
		r.Cauchy[1] += c[1]
		r.Cauchy[2] += c[2]
		r.Energy += r.TermEnergy[i]
	}
	for i, v := range r.Cauchy {
		if math.IsInf(v, 0) || math.IsNaN(v) {
			return r, fmt.Errorf("stress component %d is not finite at F = %v: %s", []int{11, 22, 12}[i], F, m.overflowCause(&r, &k, fks))
		}
	}
	r.Nominal = k.Nominal(r.Cauchy)
	return r, nil
}

// overflowCause names the first term whose stress is not finite and why:
// a limiting term (a parameter named "limit") whose argument has reached
// its limit, or an exponential that overflows.
func (m *Model) overflowCause(r *Response, k *Kinematics, fks []FibreKinematics) string {
	for i, t := range m.Terms {
		c := r.TermCauchy[i]
		if !(math.IsInf(c[0], 0) || math.IsNaN(c[0]) || math.IsInf(c[1], 0) || math.IsNaN(c[1]) || math.IsInf(c[2], 0) || math.IsNaN(c[2])) {
			continue
		}
		var fk *FibreKinematics
		kappa := 0.0
		if t.Family >= 0 {
			fk, kappa = &fks[t.Family], m.Families[t.Family].Dispersion
		}
		x := argument(t.Shape.Arg, kappa, k, fk).X
		for j, q := range t.Shape.Params {
			if q.Name == "limit" && x >= t.Params[j] {
				return fmt.Sprintf("term %d (%s) is at or beyond its limiting extensibility (argument %.4g, limit %.4g)", i+1, t.Shape.ID, x, t.Params[j])
			}
		}
		return fmt.Sprintf("term %d (%s) overflows (argument %.4g), far beyond the range it was fitted in", i+1, t.Shape.ID, x)
	}
	return "the terms' stresses cancel to an undefined value"
}
