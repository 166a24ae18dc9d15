package terms

import (
	"math"
	"strings"
)

// The catalogue. Normalisations follow the published forms where one exists,
// so that a weight reads as the usual constant: i1-lin w = C10 = μ/2
// (neo-Hookean), i1-exp w = a/2 with stiffening b (Demiray 1972), i1-gent w = μ/2
// with limit J (Gent 1996), fib-expsq w = k1 with stiffening k2 (Holzapfel, Gasser &
// Ogden 2000), ps-pos and ps-neg w = μ with exponent α (Ogden 1972;
// principal.go), fib-recruit w = E, the fibre modulus (Lanir 1983;
// recruit.go).

// stiffeningParam is the coefficient b in the exponent of the exponential
// shapes: how fast they stiffen with their argument (a strain measure, so b
// has nothing to do with time). Cards before it was named "stiffening" called
// it "rate". Its scan grid spreads over decades, since the values of soft
// tissue span them.
func stiffeningParam(def, max float64) Param {
	return Param{Name: "stiffening", FormerName: "rate", Symbol: "b", Default: def, Min: 0, Max: max,
		Doc:  "stiffening coefficient in the exponent (dimensionless): how fast the term stiffens as its argument grows; 0 reduces the shape to its polynomial limit",
		Grid: []float64{0.3, 3, 30, 300}, IdleStart: 0.3}
}

var limitParam = Param{Name: "limit", Symbol: "J", Default: 2, Min: 0.01, Max: 1000,
	Doc:  "limiting value of the argument (dimensionless); the energy grows without bound as the argument approaches it",
	Grid: []float64{0.3, 1, 3, 10, 100}, IdleStart: 100}

func lin(x float64, _ []float64) Value  { return Value{x, 1, 0} }
func quad(x float64, _ []float64) Value { return Value{x * x, 2 * x, 2} }
func cube(x float64, _ []float64) Value { return Value{x * x * x, 3 * x * x, 6 * x} }

// macQuad is ⟨x⟩², zero for x ≤ 0: convex, non-decreasing, zero slope at 0.
func macQuad(x float64, _ []float64) Value {
	if x <= 0 {
		return Value{}
	}
	return Value{x * x, 2 * x, 2}
}

var posInf = math.Inf(1)

// tinyExponent is the size of b·x (or b·x²) below which an exponential
// shape's energy is its b = 0 limit to every digit: the next term of the
// series, b·x/2 relative, is below 1e-300. Dividing expm1(b·x) by b there
// would not be: once b·x underflows to a subnormal or to 0 (b itself may be
// subnormal, inside the bounds [0, max]), the quotient loses its digits
// and gives 0 or a multiple of the smallest subnormal over b.
const tinyExponent = 1e-300

// expShape is (exp(b x) − 1)/b: f′(0) = 1, and b → 0 gives x.
func expShape(x float64, p []float64) Value {
	b := p[0]
	e := math.Exp(b * x)
	if math.IsInf(e, 1) {
		return Value{posInf, posInf, posInf}
	}
	if b == 0 {
		return Value{x, 1, 0}
	}
	if math.Abs(b*x) < tinyExponent {
		return Value{x, e, b * e}
	}
	return Value{math.Expm1(b*x) / b, e, b * e}
}

func expShapeSlope(x float64, p []float64) float64 { return math.Exp(p[0] * x) }

func expShapeGrad(x float64, p []float64) (g [MaxParams]float64) {
	g[0] = x * math.Exp(p[0]*x)
	return
}

// expShapeBoth is expShapeSlope and expShapeGrad with one exponential.
func expShapeBoth(x float64, p []float64) (float64, [MaxParams]float64) {
	var g [MaxParams]float64
	e := math.Exp(p[0] * x)
	g[0] = x * e
	return e, g
}

// expShapeCurvGrad is expShape's f′ and f″ and expShapeGrad with one
// exponential (f, with its expm1, is not formed).
func expShapeCurvGrad(x float64, p []float64) (float64, float64, [MaxParams]float64) {
	b := p[0]
	e := math.Exp(b * x)
	var g [MaxParams]float64
	g[0] = x * e
	switch {
	case math.IsInf(e, 1):
		return posInf, posInf, g
	case b == 0:
		return 1, 0, g
	}
	return e, b * e, g
}

// expSq is (exp(b x²) − 1)/(2b): f′(0) = 0, f″(0) = 1, b → 0 gives x²/2.
func expSq(x float64, p []float64) Value {
	b := p[0]
	x2 := x * x
	e := math.Exp(b * x2)
	if math.IsInf(e, 1) {
		return Value{posInf, math.Copysign(posInf, x), posInf}
	}
	f := x2 / 2
	if math.Abs(b*x2) >= tinyExponent {
		f = math.Expm1(b*x2) / (2 * b)
	}
	return Value{f, x * e, (1 + 2*b*x2) * e}
}

// expSqSlope is expSq's f′ alone. It forms b·(x·x) as expSq and expSqBoth
// do, so that the three agree bit for bit (b·x·x parts from it in the
// last bit for about a quarter of parameter sets).
func expSqSlope(x float64, p []float64) float64 {
	if x == 0 {
		return 0
	}
	return x * math.Exp(p[0]*(x*x))
}

// expSqBoth is expSqSlope and expSqGrad with one exponential.
func expSqBoth(x float64, p []float64) (float64, [MaxParams]float64) {
	var g [MaxParams]float64
	if x == 0 {
		return 0, g
	}
	x2 := x * x
	e := math.Exp(p[0] * x2)
	g[0] = x * x2 * e
	return x * e, g
}

// expSqCurvGrad is expSq's f′ and f″ and expSqGrad with one exponential.
func expSqCurvGrad(x float64, p []float64) (float64, float64, [MaxParams]float64) {
	b := p[0]
	x2 := x * x
	e := math.Exp(b * x2)
	if math.IsInf(e, 1) {
		return math.Copysign(posInf, x), posInf, expSqGrad(x, p)
	}
	var g [MaxParams]float64
	g[0] = x * x2 * e
	return x * e, (1 + 2*b*x2) * e, g
}

func expSqGrad(x float64, p []float64) (g [MaxParams]float64) {
	x2 := x * x
	g[0] = x * x2 * math.Exp(p[0]*x2)
	return
}

// expZero is (exp(b x) − 1 − b x)/b²: f′(0) = 0, f″(0) = 1, b → 0 gives x²/2.
// The small-b·x branch uses the series to avoid cancellation.
func expZero(x float64, p []float64) Value {
	b := p[0]
	bx := b * x
	e := math.Exp(bx)
	if math.IsInf(e, 1) {
		return Value{posInf, posInf, posInf}
	}
	if math.Abs(bx) < 1e-4 {
		x2 := x * x
		return Value{x2/2 + b*x2*x/6 + b*b*x2*x2/24, x + b*x2/2 + b*b*x2*x/6, e}
	}
	em := math.Expm1(bx)
	return Value{(em - bx) / (b * b), em / b, e}
}

func expZeroSlope(x float64, p []float64) float64 {
	b := p[0]
	bx := b * x
	if math.Abs(bx) < 1e-4 {
		return x + b*x*x/2 + b*b*x*x*x/6
	}
	return math.Expm1(bx) / b
}

// expZeroBoth is expZeroSlope and expZeroGrad sharing their exponential.
func expZeroBoth(x float64, p []float64) (float64, [MaxParams]float64) {
	b := p[0]
	bx := b * x
	if math.Abs(bx) < 1e-4 {
		return expZeroSlope(x, p), expZeroGrad(x, p)
	}
	var g [MaxParams]float64
	e := math.Exp(bx)
	em := math.Expm1(bx)
	if math.IsInf(e, 1) {
		g[0] = posInf
		return posInf, g
	}
	g[0] = (bx*e - em) / (b * b)
	return em / b, g
}

// expZeroCurvGrad is expZero's f′ and f″ and expZeroGrad sharing their
// exponentials.
func expZeroCurvGrad(x float64, p []float64) (float64, float64, [MaxParams]float64) {
	b := p[0]
	bx := b * x
	e := math.Exp(bx)
	if math.IsInf(e, 1) || math.Abs(bx) < 1e-4 {
		v := expZero(x, p)
		return v.D1, v.D2, expZeroGrad(x, p)
	}
	em := math.Expm1(bx)
	var g [MaxParams]float64
	g[0] = (bx*e - em) / (b * b)
	return em / b, e, g
}

func expZeroGrad(x float64, p []float64) (g [MaxParams]float64) {
	b := p[0]
	bx := b * x
	if math.Abs(bx) < 1e-4 {
		x2 := x * x
		g[0] = x2/2 + b*x2*x/3 + b*b*x2*x2/8
		return
	}
	e := math.Exp(bx)
	if math.IsInf(e, 1) {
		g[0] = posInf
		return
	}
	g[0] = (bx*e - math.Expm1(bx)) / (b * b)
	return
}

// gentLog is −J ln(1 − x/J) (Gent 1996): f′(0) = 1, infinite at x ≥ J.
func gentLog(x float64, p []float64) Value {
	J := p[0]
	if x >= J {
		return Value{posInf, posInf, posInf}
	}
	d := J - x
	return Value{-J * math.Log1p(-x/J), J / d, J / (d * d)}
}

func gentLogSlope(x float64, p []float64) float64 {
	J := p[0]
	if x >= J {
		return posInf
	}
	return J / (J - x)
}

func gentLogGrad(x float64, p []float64) (g [MaxParams]float64) {
	J := p[0]
	if x >= J {
		g[0] = math.Inf(-1)
		return
	}
	d := J - x
	g[0] = -x / (d * d)
	return
}

// gentLogBoth is gentLogSlope and gentLogGrad in one call.
func gentLogBoth(x float64, p []float64) (float64, [MaxParams]float64) {
	return gentLogSlope(x, p), gentLogGrad(x, p)
}

// gentLogCurvGrad is gentLog's f′ and f″ and gentLogGrad (f, with its
// logarithm, is not formed).
func gentLogCurvGrad(x float64, p []float64) (float64, float64, [MaxParams]float64) {
	J := p[0]
	g := gentLogGrad(x, p)
	if x >= J {
		return posInf, posInf, g
	}
	d := J - x
	return J / d, J / (d * d), g
}

// Notes on the switch I4 > 1 that fibre and fifth-invariant terms share
// (package aniso applies it). An aligned fibre term switches with f(0) =
// f′(0) = 0, so energy and stress stay continuous. With κ > 0 the
// argument at I4 = 1 is κ(I1 − 3), positive wherever I1 > 3, and I5 − 1 at
// I4 = 1 is positive wherever the fibre is sheared (I5 ≥ I4², equal only
// when a0 is an eigenvector of C), so both jump there: an energy that is
// not continuous is not polyconvex (Ball 1977 needs a convex, hence
// continuous, function of F, cof F, det F). The numbers are reproduced by
// aniso's tests.
const (
	dispersedSwitchNote = "with dispersion κ > 0 the I4 > 1 switch (common practice, Gasser, Ogden & Holzapfel 2006) makes energy and " +
		"stress jump where I4 crosses 1 while I1 > 3 (E_f = κ(I1 − 3) > 0 there; κ = 0.226 at 40° with fib-expsq, b = 1, λ1 = 1.1: " +
		"energy 0 → 2.04e-4 w), so the energy is not polyconvex across the switch"
	fifthSwitchNote = "its I4 > 1 switch makes energy and stress jump where I4 crosses 1 while I5 > 1, i.e. wherever the fibre is " +
		"sheared (at 0° with F12 = 0.2: energy 0 → 0.0016 w, σ11 0 → 0.333 w)"
)

// argText returns the argument as it appears inside a formula.
func argText(a Argument) (plain, latex string) {
	switch a {
	case I1:
		return "(I1-3)", `(I_1-3)`
	case I2:
		return "(I2-3)", `(I_2-3)`
	case Fibre:
		return "E_f", `E_f`
	case Cofactor:
		return "(K-1)", `(K-1)`
	case Fifth:
		return "(I5-1)", `(I_5-1)`
	}
	return "x", "x"
}

// formula substitutes the argument into plain and LaTeX templates written
// with the placeholder {x}.
func formula(a Argument, plain, latex string) (string, string) {
	p, l := argText(a)
	return strings.ReplaceAll(plain, "{x}", p), strings.ReplaceAll(latex, "{x}", l)
}

func shape(id string, a Argument, title, plainT, latexT string, params []Param,
	weight string, poly bool, note, src string,
	fn impl) *Shape {
	p, l := formula(a, plainT, latexT)
	return &Shape{ID: id, Arg: a, Title: title, Formula: p, LaTeX: l, Params: params,
		Weight: weight, Polyconvex: poly, PolyconvexNote: note, Source: src,
		eval: fn.eval, slope: fn.slope, dD1: fn.grad, slopeGrad: fn.both, curvGrad: fn.curvGrad, kinks: fn.kinks, divided: fn.divided, at: fn.at}
}

// impl bundles a shape's closed forms: f, f′, f″ (eval), f′ alone (slope,
// optional), ∂f′/∂θ (grad, for shapes with parameters), the arguments
// where f′ or f″ is not smooth (kinks, optional) and, for principal-stretch
// shapes, the divided differences (divided) and the values at precomputed
// stretches (at).
type impl struct {
	eval  func(float64, []float64) Value
	slope func(float64, []float64) float64
	grad  func(float64, []float64) [MaxParams]float64
	// both is slope and grad in one call (optional).
	both func(float64, []float64) (float64, [MaxParams]float64)
	// curvGrad is f′, f″ and grad in one call (optional).
	curvGrad func(float64, []float64) (float64, float64, [MaxParams]float64)
	kinks    func([]float64) ([2]float64, int)
	divided  func(float64, float64, []float64) Divided
	at       func(*Stretches, []float64, bool) StretchValues
}

var (
	implLin     = impl{eval: lin}
	implQuad    = impl{eval: quad}
	implCube    = impl{eval: cube}
	implMacQuad = impl{eval: macQuad}
	implExp     = impl{eval: expShape, slope: expShapeSlope, grad: expShapeGrad, both: expShapeBoth, curvGrad: expShapeCurvGrad}
	implExpSq   = impl{eval: expSq, slope: expSqSlope, grad: expSqGrad, both: expSqBoth, curvGrad: expSqCurvGrad}
	implExpZero = impl{eval: expZero, slope: expZeroSlope, grad: expZeroGrad, both: expZeroBoth, curvGrad: expZeroCurvGrad}
	implGent    = impl{eval: gentLog, slope: gentLogSlope, grad: gentLogGrad, both: gentLogBoth, curvGrad: gentLogCurvGrad}
)

// setZeroForm records the limit form of a shape where parameter param is
// exactly 0.
func setZeroForm(id, param, plain, latex string) {
	s := byID[id]
	s.zeroParam = param
	s.zeroForm[0], s.zeroForm[1] = formula(s.Arg, plain, latex)
}

func init() {
	defer func() {
		for _, id := range []string{"i1-exp", "i2-exp"} {
			setZeroForm(id, "stiffening", "w*{x}", `w\,{x}`)
		}
		for _, id := range []string{"i1-expsq", "fib-expsq", "fib-exp"} {
			setZeroForm(id, "stiffening", "w*{x}^2/2", `\frac{w}{2}\,{x}^{2}`)
		}
		setZeroForm("fib-recruit", "spread", recruitZeroPlain, recruitZeroLaTeX)
	}()
	const (
		convexI1 = "convex and non-decreasing in I1 (Ball 1977)"
		convexI2 = "convex and non-decreasing in I2 (Ball 1977)"
	)
	for _, a := range []Argument{I1, I2} {
		n := "I1"
		note := convexI1
		if a == I2 {
			n = "I2"
			note = convexI2
		}
		lo := strings.ToLower(n)
		mu := map[Argument]string{I1: "w = C10; alone it gives the initial shear modulus μ = 2w",
			I2: "w = C01; with an I1 term the initial shear modulus is μ = 2(C10 + C01)"}[a]
		register(
			shape(lo+"-lin", a, "linear in "+n, "w*{x}", `w\,{x}`, nil,
				mu, true, note, map[Argument]string{I1: "neo-Hookean; Mooney 1940, Rivlin 1948", I2: "Mooney 1940, Rivlin 1948"}[a],
				implLin),
			shape(lo+"-quad", a, "quadratic in "+n, "w*{x}^2", `w\,{x}^{2}`, nil,
				"stiffening of the quadratic growth in "+n+"−3; nothing at small strain", true, note, "Yeoh 1993 (second term)",
				implQuad),
			shape(lo+"-cube", a, "cubic in "+n, "w*{x}^3", `w\,{x}^{3}`, nil,
				"stiffening of the cubic growth in "+n+"−3; nothing at small strain", true, note, "Yeoh 1993 (third term)",
				implCube),
			shape(lo+"-exp", a, "exponential in "+n, "w*(exp(b*{x})-1)/b", `\frac{w}{b}\left(e^{b\,{x}}-1\right)`,
				[]Param{stiffeningParam(1, 100)},
				mu+" at small strain; b sets the stiffening", true, note, "Demiray 1972",
				implExp),
		)
		if a == I1 {
			register(shape(lo+"-expsq", a, "exponential of square in I1", "w*(exp(b*{x}^2)-1)/(2*b)",
				`\frac{w}{2b}\left(e^{b\,{x}^{2}}-1\right)`, []Param{stiffeningParam(1, 200)},
				"stiffness of the exponential-of-square growth in I1−3 (f″(0) = 1); nothing at small strain", true, note,
				"exponential-of-square form as in Holzapfel, Gasser & Ogden 2000, applied to I1",
				implExpSq))
		}
		register(shape(lo+"-gent", a, "limiting extensibility in "+n, "-w*J*ln(1-{x}/J)",
			`-w\,J\ln\left(1-\frac{{x}}{J}\right)`, []Param{limitParam},
			mu+" at small strain; the energy diverges as "+n+"−3 approaches J", true,
			note+" below the limit J", "Gent 1996", implGent))
	}

	registerPrincipal()

	const fibreNote = "convex and non-decreasing in E_f, zero for I4 ≤ 1 (Holzapfel, Gasser & Ogden 2000; " +
		"Schröder & Neff 2003): polyconvex on an aligned family (κ = 0) and on a family spread in the plane; " +
		dispersedSwitchNote
	register(
		shape("fib-quad", Fibre, "quadratic fibre", "w*{x}^2", `w\,E_f^{2}`, nil,
			"fibre stiffness: the term's fibre stress grows as 4w·E_f (f″ = 2)", true, fibreNote, "",
			implQuad),
		shape("fib-expsq", Fibre, "exponential-of-square fibre", "w*(exp(b*{x}^2)-1)/(2*b)",
			`\frac{w}{2b}\left(e^{b\,E_f^{2}}-1\right)`, []Param{stiffeningParam(1, 1000)},
			"w = k1 and b = k2 of Holzapfel, Gasser & Ogden 2000 (f″(0) = 1)", true, fibreNote,
			"Holzapfel, Gasser & Ogden 2000",
			implExpSq),
		shape("fib-exp", Fibre, "exponential fibre with zero initial slope", "w*(exp(b*{x})-1-b*{x})/b^2",
			`\frac{w}{b^{2}}\left(e^{b\,E_f}-1-b\,E_f\right)`, []Param{stiffeningParam(1, 100)},
			"fibre stiffness at onset (f″(0) = 1); b sets the gradual stiffening", true, fibreNote, "",
			implExpZero),
		recruitShape(),
		shape("cof-quad", Cofactor, "quadratic cofactor-fibre", "w*<{x}>^2", `w\,\langle K-1\rangle^{2}`, nil,
			"stiffness against growth of the area normal to the fibre (K > 1); zero while K ≤ 1", true,
			"K = |cof(F) a0|² is convex in cof F and ⟨x⟩² is convex and non-decreasing (Schröder & Neff 2003)",
			"Schröder & Neff 2003", implMacQuad),
		shape("i5-quad", Fifth, "quadratic fifth invariant", "w*{x}^2", `w\,(I_5-1)^{2}`, nil,
			"stiffness of the fifth-invariant response (f″ = 2); zero for I4 ≤ 1", false,
			"NOT polyconvex: I5 is not a convex function of F, cof F, det F (Schröder & Neff 2003); "+
				"planar biaxial data do not fully determine it (Holzapfel & Ogden 2009); "+fifthSwitchNote,
			"", implQuad),
	)
}
