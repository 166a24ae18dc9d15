package terms

import (
	"fmt"
	"math"
	"strings"
)

// The Fung-type planar model (Tong & Fung 1976, J Biomech 9:649–657):
//
//	W = c/2 (e^Q − 1),  Q = b1 E11² + b2 E22² + 2 b3 E11 E22 + b4 (E12² + E21²)
//
// with E = (C − 1)/2 the Green strain of the in-plane C in the tester's axes.
// In catalogue form the shape acts on x = Q with f(x) = (e^x − 1)/2, so that
// the weight w is c and f′(0) = 1/2: at small strain the second
// Piola–Kirchhoff stress is S11 ≈ c (b1 E11 + b3 E22), S22 ≈ c (b3 E11 + b2 E22),
// S12 ≈ c b4 E12. The model is the classical comparison for planar tissue
// (skin, valve leaflets); it is offered as a preset, not as a candidate of
// model discovery.
//
// The generalised form (fung-general) adds the couplings of the normal
// strains to the shear that Tong & Fung's form leaves out:
//
//	Q += 2 b5 E11 (E12 + E21) + 2 b6 E22 (E12 + E21)
//
// so that Q is any quadratic form of (E11, E22, E12). An orthotropic
// Fung-type law whose axes are turned by θ from the tester's (Fung 1979;
// the planar form of Choi & Vito 1990) is one: its Q is a quadratic form
// of the turned strain Rᵀ E R, which is linear in E. The full form is the
// classical one for planar tissue whose axes are not the tester's (e.g.
// Sun & Sacks 2005; from memory); like fung it is a preset.

// fungExp is (e^x − 1)/2 with f′ = f″ = e^x/2.
func fungExp(x float64, _ []float64) Value {
	e := math.Exp(x)
	if math.IsInf(e, 1) {
		return Value{posInf, posInf, posInf}
	}
	return Value{math.Expm1(x) / 2, e / 2, e / 2}
}

func fungExpSlope(x float64, _ []float64) float64 { return math.Exp(x) / 2 }

// fungCoefficient is one of the b's: the exponent coefficients range over
// three decades (Q reaches a few units at the strains of a biaxial test), and
// the coarse scan tries one value per decade.
func fungCoefficient(name, doc string, def, min float64, scan []float64, shear bool) Param {
	sym := "b_" + strings.TrimPrefix(name, "b")
	return Param{Name: name, Symbol: sym, Default: def, Min: min, Max: 1000, Doc: doc, Grid: scan, IdleStart: def, Shear: shear}
}

// fungConvexity is the condition for W to be convex in E: e^Q is convex when
// Q is a convex quadratic form, i.e. when its matrix over (E11, E22, E12) is
// positive definite (common practice for Fung-type models; the
// composition of a convex non-decreasing function with a convex one is
// convex). Convexity in E is not polyconvexity in F. For the generalised
// form (six coefficients) the matrix is
//
//	M = [[b1, b3, 2 b5], [b3, b2, 2 b6], [2 b5, 2 b6, 2 b4]]
//
// (Q = xᵀ M x with x = (E11, E22, E12) and E21 = E12), positive definite by
// Sylvester's criterion when b1 > 0, b1 b2 > b3² and det M > 0.
func fungConvexity(p []float64, shear bool) Convexity {
	b1, b2, b3, b4 := p[0], p[1], p[2], p[3]
	det := b1*b2 - b3*b3
	general := len(p) == 6
	c := Convexity{Condition: "b1 > 0, b2 > 0 and b1 b2 > b3² (and b4 > 0 where in-plane shear acts): the quadratic form Q is positive definite, so W is convex in the Green strain E"}
	if general {
		c.Condition = "b1 > 0, b2 > 0 and b1 b2 > b3² (and, where in-plane shear acts, det M > 0 for M = [[b1, b3, 2 b5], [b3, b2, 2 b6], [2 b5, 2 b6, 2 b4]]): the quadratic form Q is positive definite, so W is convex in the Green strain E"
	}
	var fails []string
	if !(b1 > 0) {
		fails = append(fails, "b1 ≤ 0")
	}
	if !(b2 > 0) {
		fails = append(fails, "b2 ≤ 0")
	}
	if !(det > 0) {
		fails = append(fails, "b1 b2 ≤ b3²")
	}
	var detM float64
	if general {
		m13, m23, m33 := 2*p[4], 2*p[5], 2*b4
		detM = b1*(b2*m33-m23*m23) - b3*(b3*m33-m23*m13) + m13*(b3*m23-b2*m13)
		if shear && !(detM > 0) {
			fails = append(fails, "det M ≤ 0: the shear couples to the normal strains more strongly than the stiffness allows")
		}
	} else if shear && !(b4 > 0) {
		fails = append(fails, "b4 ≤ 0 (no shear stiffness from this term)")
	}
	c.Holds = len(fails) == 0
	c.Detail = fmt.Sprintf("b1 = %.6g, b2 = %.6g, b3 = %.6g, b1 b2 − b3² = %.6g, b4 = %.6g", b1, b2, b3, det, b4)
	if general {
		c.Detail += fmt.Sprintf(", b5 = %.6g, b6 = %.6g, det M = %.6g", p[4], p[5], detM)
	}
	if c.Holds {
		c.Detail += ": holds"
	} else {
		c.Detail += ": fails (" + strings.Join(fails, "; ") + ")"
	}
	if !shear {
		c.Detail += "; shear not considered"
	}
	return c
}

func init() {
	s := &Shape{ID: "fung", Arg: Green, Title: "Tong & Fung exponential of the Green strain in the tester's axes",
		Formula: "w*(exp(b_1*E11^2 + b_2*E22^2 + 2*b_3*E11*E22 + b_4*(E12^2 + E21^2)) - 1)/2",
		LaTeX:   `\frac{w}{2}\left(e^{b_1 E_{11}^{2} + b_2 E_{22}^{2} + 2b_3 E_{11} E_{22} + b_4 \left(E_{12}^{2} + E_{21}^{2}\right)} - 1\right)`,
		Params: []Param{
			fungCoefficient("b1", "coefficient of E11² in Q (dimensionless): stiffening along axis 1", 10, 0, []float64{1, 10, 100}, false),
			fungCoefficient("b2", "coefficient of E22² in Q (dimensionless): stiffening along axis 2", 10, 0, []float64{1, 10, 100}, false),
			fungCoefficient("b3", "coupling 2 b3 E11 E22 in Q (dimensionless, may be negative); convexity needs b3² < b1 b2", 0, -1000, []float64{0}, false),
			fungCoefficient("b4", "coefficient of E12² + E21² in Q (dimensionless): the shear term; data without in-plane shear strain cannot determine it", 10, 0, nil, true),
		},
		Weight: "w = c of Tong & Fung 1976 (f′(0) = 1/2): at small strain S11 = c (b1 E11 + b3 E22), S22 = c (b3 E11 + b2 E22), S12 = c b4 E12",
		PolyconvexNote: "NOT polyconvex in general: an exponential of a quadratic form of the Green strain in the tester's axes; " +
			"it is convex in E when the form is positive definite (b1 > 0, b2 > 0, b1 b2 > b3², and b4 > 0 where shear acts), " +
			"which is checked and reported for each parameter set",
		Source:    "Tong & Fung 1976, J Biomech 9:649–657",
		convexity: fungConvexity,
		eval:      fungExp, slope: fungExpSlope,
	}
	register(s)
	// b5 and b6 multiply E11 (E12 + E21) and E22 (E12 + E21).
	b5 := fungCoefficient("b5", "coupling 2 b5 E11 (E12 + E21) in Q (dimensionless, may be negative): normal strain along axis 1 against shear; data without in-plane shear strain cannot determine it", 0, -1000, nil, true)
	b6 := fungCoefficient("b6", "coupling 2 b6 E22 (E12 + E21) in Q (dimensionless, may be negative): normal strain along axis 2 against shear; data without in-plane shear strain cannot determine it", 0, -1000, nil, true)
	b5.OddInShear, b6.OddInShear = true, true
	general := &Shape{ID: "fung-general", Arg: Green, Title: "generalised Fung-type exponential of the Green strain: a full quadratic form, shear coupled to the normal strains",
		Formula: "w*(exp(b_1*E11^2 + b_2*E22^2 + 2*b_3*E11*E22 + b_4*(E12^2 + E21^2) + 2*b_5*E11*(E12 + E21) + 2*b_6*E22*(E12 + E21)) - 1)/2",
		LaTeX:   `\frac{w}{2}\left(e^{b_1 E_{11}^{2} + b_2 E_{22}^{2} + 2b_3 E_{11} E_{22} + b_4 \left(E_{12}^{2} + E_{21}^{2}\right) + 2b_5 E_{11}\left(E_{12} + E_{21}\right) + 2b_6 E_{22}\left(E_{12} + E_{21}\right)} - 1\right)`,
		Params:  append(append([]Param(nil), s.Params...), b5, b6),
		Weight:  "w = c of Tong & Fung 1976 (f′(0) = 1/2): at small strain S11 = c (b1 E11 + b3 E22 + 2 b5 E12), S22 = c (b3 E11 + b2 E22 + 2 b6 E12), S12 = c (b4 E12 + b5 E11 + b6 E22)",
		PolyconvexNote: "NOT polyconvex in general: an exponential of a quadratic form of the Green strain in the tester's axes; " +
			"it is convex in E when the form is positive definite (b1 > 0, b2 > 0, b1 b2 > b3², and det M > 0 where shear acts), " +
			"which is checked and reported for each parameter set",
		Source:    "the full quadratic form of the planar Fung-type law, e.g. Sun & Sacks 2005, Biomech Model Mechanobiol 4:190–199 (from memory)",
		convexity: fungConvexity,
		eval:      fungExp, slope: fungExpSlope,
	}
	register(general)
}
