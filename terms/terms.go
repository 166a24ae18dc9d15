// Package terms is weft's catalogue of strain-energy shapes.
//
// A strain energy is a sum of terms Ψ = Σ w_k f_k(x_k; θ_k), each a weight w_k
// (a stiffness in the stress unit, w_k ≥ 0) times a shape f_k of one shifted
// invariant x_k with a few non-linear parameters θ_k (stiffening coefficients, limits). This
// package knows the shapes only: their arguments, closed-form values and
// derivatives, parameter bounds, what the weight means and whether the shape
// keeps the energy polyconvex, and the classical presets (named published
// forms with example parameters, presets.go). It knows nothing about data
// or fibre kinematics; package aniso turns shapes into stress.
//
// Arguments (zero in the undeformed reference state, except the principal
// stretches, which are 1 there):
//
//	I1 − 3, I2 − 3                      isotropic (matrix) terms
//	E_f = κ(I1 − 3) + (1 − 3κ)(I4 − 1)   fibre terms, Gasser, Ogden & Holzapfel 2006
//	K − 1, K = I5 − I1 I4 + I2          cofactor-fibre terms, Schröder & Neff 2003
//	I5 − 1                              raw fifth-invariant terms (not polyconvex,
//	                                    discontinuous at the I4 > 1 switch under shear)
//	Q(E) = b1 E11² + b2 E22² + 2 b3 E11 E22 + b4 (E12² + E21²)
//	                                    Tong & Fung 1976, Green strain in the
//	                                    tester's axes (not polyconvex)
//
// The last argument is not an invariant: E = (C − 1)/2 is the Green strain of
// the in-plane C in the tester's axes 1, 2, so a term in Q(E) is anisotropic
// with its axes fixed to the specimen's loading axes, and its non-linear
// parameters b1…b4 enter through the argument Q, not through the shape.
//
//	λ1, λ2, λ3                          principal-stretch terms, Ogden 1972
//
// A principal-stretch shape is different in kind: its argument is a
// stretch, not a shifted invariant, and it is summed over the three
// principal stretches. Eval(λ, θ) returns a per-stretch function g(λ) with
// g(1) = 0 and its derivatives g′(λ), g″(λ) with respect to λ; the term's
// energy is w·(g(λ1) + g(λ2) + g(λ3)), with λ1, λ2 the principal stretches
// of the in-plane C (square roots of its eigenvalues, shear included) and
// λ3 = 1/(λ1 λ2) from incompressibility. Its reference value is therefore
// λ = 1 (Argument.Reference). Such a shape also gives the divided
// differences a stress needs where two principal stretches meet (Divided).
//
// Evaluation is overflow-safe: an exponential shape at a large argument
// returns ±Inf, never NaN, and a limiting-extensibility shape beyond its
// limit returns +Inf.
//
// The catalogue's entries are made in catalogue.go, with the
// principal-stretch shapes in principal.go, the recruitment shape in
// recruit.go and the Green-strain shapes in fung.go; Catalogue and Lookup
// (terms.go) list them. A new shape is one entry there (DEVELOPERS.md, How
// to add an energy term), and two texts outside this package name every
// shape by its id and must learn it too: its normalisation in the
// conventions every model card carries (card.StandardConventions,
// aniso/card/card.go), and its UFL form for the FEniCS export (uflShape,
// cmd/weft/internal/fe/ufl.go), which otherwise fails on a card that uses
// the shape; TestEveryShapeIsExported (cmd/weft/internal/fe) checks both.
package terms

import (
	"fmt"
	"math"
	"sort"
)

// Argument is the shifted invariant a shape acts on.
type Argument int

const (
	// I1 is x = I1 − 3, the first invariant of C shifted to zero.
	I1 Argument = iota
	// I2 is x = I2 − 3, the second invariant of C shifted to zero.
	I2
	// Fibre is the fibre strain x = E_f = κ(I1 − 3) + (1 − 3κ)(I4 − 1) of a
	// fibre family with dispersion κ (κ = 0: E_f = I4 − 1). Fibre terms carry
	// energy only while the family is stretched, I4 > 1. With κ > 0 that
	// switch makes the energy jump where I4 crosses 1 while I1 > 3, so a
	// fibre shape's Polyconvex holds for κ = 0 (and for a family spread in
	// the plane, each direction switched by its own stretch) only.
	Fibre
	// Cofactor is x = K − 1 with the cofactor-fibre invariant
	// K = a0·cof(C)a0 = I5 − I1 I4 + I2, the squared area stretch normal to
	// the fibre. Shapes in K keep a convex energy polyconvex.
	Cofactor
	// Fifth is x = I5 − 1 with I5 = a0·C²a0. Terms in I5 carry energy only
	// while I4 > 1 and are not polyconvex; where I4 crosses 1 while I5 > 1
	// (a sheared fibre) their energy and stress jump.
	Fifth
	// Green is x = Q(E) = b1 E11² + b2 E22² + 2 b3 E11 E22 + b4 (E12² + E21²),
	// the quadratic form of the Green strain E = (C − 1)/2 of the in-plane C
	// in the tester's axes 1, 2 (Tong & Fung 1976, J Biomech 9:649–657), with
	// the shape's parameters b1…b4. Q is zero in the reference state. A
	// shape of this argument knows f(Q); the fitter evaluates Q and its
	// derivatives with respect to E and b, so D1ParamGrad is zero for it.
	Green
	// Principal is a principal stretch λ (dimensionless, > 0): the shape is
	// a per-stretch function g(λ) summed over λ1, λ2 and λ3 = 1/(λ1 λ2)
	// (see the package documentation). Principal-stretch terms are
	// isotropic (matrix) terms.
	Principal
)

// String returns the argument as written in formulas, e.g. "I1-3".
func (a Argument) String() string {
	switch a {
	case I1:
		return "I1-3"
	case I2:
		return "I2-3"
	case Fibre:
		return "E_f"
	case Cofactor:
		return "K-1"
	case Fifth:
		return "I5-1"
	case Green:
		return "Q(E)"
	case Principal:
		return "lambda_i"
	}
	return fmt.Sprintf("Argument(%d)", int(a))
}

// Reference returns the argument's value in the undeformed reference
// state: 1 for Principal (a stretch), 0 for the shifted invariants.
func (a Argument) Reference() float64 {
	if a == Principal {
		return 1
	}
	return 0
}

// NeedsFamily reports whether terms of this argument belong to a fibre family.
func (a Argument) NeedsFamily() bool { return a == Fibre || a == Cofactor || a == Fifth }

// InFifth reports whether the argument involves the fifth invariant I5 (the
// fifth invariant itself, or the cofactor invariant K = I5 − I1 I4 + I2),
// which planar biaxial data do not fully determine.
func (a Argument) InFifth() bool { return a == Cofactor || a == Fifth }

// Param describes one non-linear parameter of a shape.
type Param struct {
	// Name is the parameter's key in model cards, e.g. "stiffening" or
	// "limit".
	Name string
	// FormerName is the key older cards used for the parameter ("" when it
	// never had another); card readers accept it.
	FormerName string
	// Symbol is the parameter's symbol in formulas, e.g. "b" or "J".
	Symbol string
	// Default is the value used when a card or a fit does not set it.
	Default float64
	// Min and Max bound the parameter (inclusive).
	Min, Max float64
	// Doc says what the parameter means; it is dimensionless.
	Doc string
	// Shear is true for a parameter that acts only through the in-plane
	// shear strain E12: data without shear strain cannot determine it, and
	// a fitter holds it at 0 instead.
	Shear bool
	// OddInShear is true for a parameter that multiplies a product odd in
	// the shear strain (such as E11 E12): reflecting the material about
	// axis 1, which turns E12 into −E12, turns the parameter into its
	// negative.
	OddInShear bool
	// TeX is the symbol as written in LaTeX formulas, e.g. `\alpha`; empty
	// means Symbol.
	TeX string
	// Grid lists the values a fitter's coarse scan tries for this
	// parameter (one copy of the term per value, or per combination of the
	// values of a shape's parameters), in increasing order; values outside
	// [Min, Max] are skipped.
	Grid []float64
	// IdleStart is the value a fitter starts from when its coarse scan
	// gives the term no stress: the gentlest stress response (smallest
	// stiffening, largest limit), which cannot overflow where a steeper start
	// might.
	IdleStart float64
}

// LaTeXSymbol returns TeX, or Symbol when TeX is empty.
func (q *Param) LaTeXSymbol() string {
	if q.TeX != "" {
		return q.TeX
	}
	return q.Symbol
}

// Value is a shape and its first two derivatives at one argument.
type Value struct {
	F, D1, D2 float64 // f(x), f′(x), f″(x)
}

// Shape is one catalogue entry.
type Shape struct {
	// ID is the stable identifier used in model cards, e.g. "i1-exp".
	ID string
	// Arg is the shifted invariant the shape acts on.
	Arg Argument
	// Title is a short human name.
	Title string
	// Formula is the term w·f(x) in plain text with x written out.
	Formula string
	// LaTeX is the same term in LaTeX.
	LaTeX string
	// Params are the non-linear parameters, in the order Eval expects them.
	Params []Param
	// Weight says what the weight w means as a stiffness; it always carries
	// the stress unit.
	Weight string
	// Polyconvex reports whether w·f keeps the energy polyconvex for w ≥ 0;
	// PolyconvexNote says why or why not.
	Polyconvex     bool
	PolyconvexNote string
	// Source cites the published form the shape follows, if any.
	Source string

	// zeroForm holds the plain and LaTeX formulas of the shape's limit
	// where parameter zeroParam is exactly 0 (e.g. w·x²/2 for an
	// exponential of a square at stiffening b = 0), when the general formula
	// divides by that parameter.
	zeroForm  [2]string
	zeroParam string

	// convexity, when set, checks a parameter-dependent convexity
	// condition (see ConvexityCondition).
	convexity func(p []float64, shear bool) Convexity

	eval func(x float64, p []float64) Value
	// slope returns f′ alone, cheaper than eval; nil means eval().D1.
	slope func(x float64, p []float64) float64
	// dD1 returns ∂f′/∂p_j.
	dD1 func(x float64, p []float64) [MaxParams]float64
	// slopeGrad returns f′ and ∂f′/∂p_j together, sharing their work;
	// nil means Slope and D1ParamGrad.
	slopeGrad func(x float64, p []float64) (float64, [MaxParams]float64)
	// curvGrad returns f′, f″ and ∂f′/∂p_j together, sharing their work;
	// nil means Eval and D1ParamGrad.
	curvGrad func(x float64, p []float64) (float64, float64, [MaxParams]float64)
	// kinks returns the arguments where f′ or f″ is not smooth; nil means
	// none.
	kinks func(p []float64) ([2]float64, int)
	// divided returns the divided differences of a principal-stretch
	// shape, and at its values at precomputed stretches; nil for other
	// arguments.
	divided func(x1, x2 float64, p []float64) Divided
	at      func(st *Stretches, p []float64, grad bool) StretchValues
}

// Eval returns f, f′ and f″ at x with parameters p (len(p) == len(s.Params)).
// Results are +Inf, never NaN, where the shape overflows or exceeds a limit.
func (s *Shape) Eval(x float64, p []float64) Value { return s.eval(x, p) }

// Written returns the term's plain and LaTeX formulas (with w and the
// parameter symbols not yet substituted) for these parameter values: the
// limit form where a stiffening b is exactly 0, so that no formula divides by zero.
func (s *Shape) Written(p []float64) (plain, latex string) {
	for j, q := range s.Params {
		if q.Name == s.zeroParam && j < len(p) && p[j] == 0 && s.zeroForm[0] != "" {
			return s.zeroForm[0], s.zeroForm[1]
		}
	}
	return s.Formula, s.LaTeX
}

// Kinks returns the arguments x > 0, in increasing order, at which the
// shape's f′ or f″ is not smooth (k[:n]), so that a quadrature over x can
// split its panels there. Only the recruitment shape has any: where the
// first fibres become straight and where the last do.
func (s *Shape) Kinks(p []float64) (k [2]float64, n int) {
	if s.kinks == nil {
		return k, 0
	}
	return s.kinks(p)
}

// Divided is what a principal-stretch shape g(λ) contributes where two
// principal stretches λ1, λ2 are close: divided differences with respect
// to μ = λ², continuous (and accurate) as λ1 → λ2. With h(λ) = λ g′(λ):
//
//	H  = (h(λ1) − h(λ2)) / (λ1² − λ2²)             → h′(λ)/(2λ) at λ1 = λ2
//	R  = (g′(λ1)/λ1 − g′(λ2)/λ2) / (λ1² − λ2²)     → (λ g″ − g′)/(2λ³)
//	DH = ∂H/∂θ_j for each non-linear parameter θ_j
//
// H gives the plane-stress Cauchy stress of the term, R its tangent.
type Divided struct {
	H, R float64
	DH   [MaxParams]float64
}

// Divided returns the divided differences of a principal-stretch shape at
// stretches x1, x2 > 0 (in either order). It returns the zero value for
// shapes of other arguments. Results are ±Inf, never NaN, where the power
// of a stretch overflows.
func (s *Shape) Divided(x1, x2 float64, p []float64) Divided {
	if s.divided == nil {
		return Divided{}
	}
	return s.divided(x1, x2, p)
}

// Stretches are the three principal stretches of one deformation with the
// logarithms a principal-stretch shape evaluates with, so that a loop over
// many terms and parameter values computes them once (NewStretches).
type Stretches struct {
	// L1 ≥ L2 are the in-plane principal stretches λ1, λ2 and L3 the third.
	L1, L2, L3    float64
	ln1, ln2, ln3 float64
	// t = (λ1² − λ2²)/λ2², log1pT = log1p(t), dmu = λ1² − λ2².
	t, log1pT, dmu float64
	// unit reports λ1 λ2 λ3 = 1 to round-off, so that powers of λ3 follow
	// from those of λ1 and λ2.
	unit bool
}

// NewStretches prepares principal stretches l1, l2 (in either order; both
// > 0) and l3 for AtStretches.
func NewStretches(l1, l2, l3 float64) Stretches {
	if l1 < l2 {
		l1, l2 = l2, l1
	}
	st := Stretches{L1: l1, L2: l2, L3: l3, ln1: math.Log(l1), ln2: math.Log(l2), ln3: math.Log(l3)}
	st.dmu = (l1 - l2) * (l1 + l2)
	st.t = st.dmu / (l2 * l2)
	st.log1pT = math.Log1p(st.t)
	st.unit = math.Abs(l1*l2*l3-1) < 1e-14
	return st
}

// StretchValues are what a principal-stretch term needs at one
// deformation, with h(λ) = λ g′(λ): h(λ2), h(λ3), the divided difference
// H = (h(λ1) − h(λ2))/(λ1² − λ2²) (as in Divided) and, when asked, the
// derivatives of all three with respect to each non-linear parameter.
type StretchValues struct {
	H2, H3, H    float64
	DH2, DH3, DH [MaxParams]float64
}

// AtStretches evaluates a principal-stretch shape at precomputed
// stretches; grad asks for the parameter derivatives too. It returns the
// zero value for shapes of other arguments. Results are ±Inf, never NaN,
// where a power of a stretch overflows.
func (s *Shape) AtStretches(st *Stretches, p []float64, grad bool) StretchValues {
	if s.at == nil {
		return StretchValues{}
	}
	return s.at(st, p, grad)
}

// Slope returns f′(x) alone; it equals Eval(x, p).D1 bit for bit (the
// recruitment shape's to rounding: it sums a shorter series) and is
// cheaper, for hot loops that need only stress.
func (s *Shape) Slope(x float64, p []float64) float64 {
	if s.slope != nil {
		return s.slope(x, p)
	}
	return s.eval(x, p).D1
}

// D1ParamGrad returns ∂f′(x)/∂p_j for every parameter j (entries beyond
// len(s.Params) are zero). Fitters need it: a term's stress is proportional
// to f′.
func (s *Shape) D1ParamGrad(x float64, p []float64) [MaxParams]float64 {
	if s.dD1 == nil {
		return [MaxParams]float64{}
	}
	return s.dD1(x, p)
}

// Convexity is the outcome of a shape's parameter-dependent convexity
// condition for one set of parameter values.
type Convexity struct {
	// Condition states the condition in words.
	Condition string
	// Holds is true when the values meet it.
	Holds bool
	// Detail gives the numbers and, when it fails, which part fails.
	Detail string
}

// ConvexityCondition checks the convexity condition of a shape that is not
// polyconvex in general but is convex in its own strain measure for part
// of its parameter range (the Tong & Fung 1976 exponential: convex in the
// Green strain when its quadratic form is positive definite). shear says
// whether in-plane shear acts, so that a shear coefficient must be
// positive too. ok is false for shapes without such a condition.
func (s *Shape) ConvexityCondition(p []float64, shear bool) (c Convexity, ok bool) {
	if s.convexity == nil || len(p) != len(s.Params) {
		return Convexity{}, false
	}
	return s.convexity(p, shear), true
}

// SlopeGrad returns f′(x) and ∂f′(x)/∂p_j together (Slope and
// D1ParamGrad in one call), for hot loops that need both.
func (s *Shape) SlopeGrad(x float64, p []float64) (float64, [MaxParams]float64) {
	if s.slopeGrad != nil {
		return s.slopeGrad(x, p)
	}
	return s.Slope(x, p), s.D1ParamGrad(x, p)
}

// SlopeCurvGrad returns f′(x), f″(x) and ∂f′(x)/∂p_j together, bit for
// bit Eval's D1 and D2 and D1ParamGrad, for fitters that need a column's
// derivatives with respect to both its argument and its parameters
// (f″ moves the column with the fibre angle). f itself is not formed.
func (s *Shape) SlopeCurvGrad(x float64, p []float64) (d1, d2 float64, g [MaxParams]float64) {
	if s.curvGrad != nil {
		return s.curvGrad(x, p)
	}
	v := s.eval(x, p)
	return v.D1, v.D2, s.D1ParamGrad(x, p)
}

// DefaultParams returns a new slice with every parameter at its default.
func (s *Shape) DefaultParams() []float64 {
	p := make([]float64, len(s.Params))
	for i, q := range s.Params {
		p[i] = q.Default
	}
	return p
}

// CheckParams returns an error naming the first parameter that is missing,
// not a number or out of bounds.
func (s *Shape) CheckParams(p []float64) error {
	if len(p) != len(s.Params) {
		return fmt.Errorf("term %s takes %d parameter(s), got %d", s.ID, len(s.Params), len(p))
	}
	for i, q := range s.Params {
		v := p[i]
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("term %s: parameter %q is %v; give a finite number in [%g, %g]", s.ID, q.Name, v, q.Min, q.Max)
		}
		if v < q.Min || v > q.Max {
			return fmt.Errorf("term %s: parameter %q = %g is outside [%g, %g]", s.ID, q.Name, v, q.Min, q.Max)
		}
	}
	return nil
}

// MaxParams is the largest number of non-linear parameters of any shape.
const MaxParams = 6

var byID = map[string]*Shape{}

// Lookup returns the catalogue shape with the given id, or nil.
func Lookup(id string) *Shape { return byID[id] }

// Catalogue returns every shape in a fixed order (isotropic I1, I2, then
// fibre, cofactor and fifth-invariant shapes, then the Green-strain shape).
// The slice is a copy; the shapes are shared and must not be modified.
func Catalogue() []*Shape { return append([]*Shape(nil), catalogue...) }

// IDs returns all shape ids, sorted.
func IDs() []string {
	ids := make([]string, 0, len(byID))
	for id := range byID {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	return ids
}

func register(s ...*Shape) {
	for _, e := range s {
		if _, dup := byID[e.ID]; dup || len(e.Params) > MaxParams {
			panic("terms: duplicate id or too many parameters: " + e.ID)
		}
		byID[e.ID] = e
		catalogue = append(catalogue, e)
	}
}

var catalogue []*Shape
