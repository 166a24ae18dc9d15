package terms

import "math"

// Gradual recruitment of crimped fibres (Lanir 1983, J Biomech 16:1–12).
//
// A fibre of a bundle is crimped until the fibre stretch λ = √(1 + x)
// reaches its straightening stretch λs; once straight it is linear elastic,
// with nominal fibre stress E(λ/λs − 1) and energy E(λ − λs)²/(2λs). The
// straightening stretches are spread uniformly over [λa, λa + Δ]. The
// bundle energy per unit fibre modulus E is
//
//	f = (1/Δ) ∫ from λa to min(λ, λa + Δ) of (λ − s)²/(2s) ds
//
// which is zero for λ ≤ λa, a smooth toe while fibres are being recruited
// and a quadratic in λ (a straight stress–stretch line) once all are
// straight. Written with u = Δ/λa, v = (λ − λa)/λa and λb = λa + Δ:
//
//	toe (λa < λ < λb):  f = λa v³ S3(v)/u,  ∂f/∂λ = v² S2(v)/u,  ∂²f/∂λ² = v S1(v)/(λa u)
//	beyond (λ ≥ λb):    f = λa u² S3(u) + u S2(u) (λ − λb) + S1(u) (λ − λb)²/(2λa)
//
// with S_k(z) = Σ_{m≥0} (−z)^m / ((m+1)···(m+k)), i.e.
// S1 = ln(1+z)/z, S2 = ((1+z) ln(1+z) − z)/z², S3 = ((1+z)² ln(1+z) − z − 3z²/2)/(2z³).
// Nothing divides by Δ: Δ → 0 gives f = (λ − λa)²/(2λa), a linear fibre
// that starts at λa, continuously. Derivatives with respect to x follow
// from dλ/dx = 1/(2λ):
//
//	f′(x) = f_λ/(2λ),  f″(x) = (λ f_λλ − f_λ)/(4λ³)
//
// and λ f_λλ − f_λ is (λ − λa)/Δ = v/u in the toe and 1 beyond, so f is
// convex and non-decreasing in x.

// Plain and LaTeX formulas of the recruitment shape and of its Δ = 0
// limit. They are written in the family's fibre stretch λ_f = √(1 + E_f),
// which a card names per family (λ_f1), and with u = min(max(λ_f, λa),
// λa + Δ) written out, which makes the energy vanish for λ_f ≤ λa without
// a case distinction.
const (
	recruitU     = "min(max(λ_f,λa),λa+Δ)"
	recruitPlain = "w*[λ_f^2*ln(" + recruitU + "/λa) - 2*λ_f*(" + recruitU + "-λa) + (" + recruitU + "^2-λa^2)/2]/(2*Δ)"
	recruitUTeX  = `\min(\max(\lambda_f,\lambda_a),\lambda_a+\Delta)`
	recruitLaTeX = `\frac{w}{2\Delta}\left[\lambda_f^{2}\ln\frac{` + recruitUTeX + `}{\lambda_a}-2\lambda_f\left(` + recruitUTeX +
		`-\lambda_a\right)+\frac{` + recruitUTeX + `^{2}-\lambda_a^{2}}{2}\right]`
	recruitZeroPlain = "w*<λ_f-λa>^2/(2*λa)"
	recruitZeroLaTeX = `\frac{w}{2\lambda_a}\left\langle\lambda_f-\lambda_a\right\rangle^{2}`
)

func recruitShape() *Shape {
	return shape("fib-recruit", Fibre, "gradually recruited linear fibres", recruitPlain, recruitLaTeX,
		[]Param{
			{Name: "onset", Symbol: "λa", TeX: `\lambda_a`, Default: 1, Min: 1, Max: 1.5,
				Doc:  "fibre stretch λa at which the first fibres become straight (dimensionless)",
				Grid: []float64{1, 1.05, 1.1, 1.2}, IdleStart: 1},
			{Name: "spread", Symbol: "Δ", TeX: `\Delta`, Default: 0.1, Min: 0, Max: 0.5,
				Doc:  "width Δ of the uniform spread of straightening stretches over [λa, λa + Δ] (dimensionless); 0 is a linear fibre that starts at λa",
				Grid: []float64{0.05, 0.15}, IdleStart: 0.15},
		},
		"fibre modulus E: the nominal stress of a straight fibre is E(λ/λs − 1); once all fibres are straight the term's fibre stress rises as E·ln(1 + Δ/λa)/Δ per unit stretch; λ_f = √(1 + E_f) is the family's fibre stretch",
		true,
		"convex and non-decreasing in E_f: f″ = (λ − λa)/(4Δλ³) while fibres are recruited and 1/(4λ³) beyond, f′ ≥ 0; "+
			"I4 = |F a0|² is convex in F, so the term keeps polyconvexity on an aligned family and on a family spread in "+
			"the plane (Ball 1977); zero for I4 ≤ 1; "+dispersedSwitchNote,
		"Lanir 1983 (uniformly distributed straightening stretches)",
		impl{eval: recruit, slope: recruitSlope, grad: recruitGrad, both: recruitBoth, curvGrad: recruitCurvGrad, kinks: recruitKinks})
}

// recruitSeriesBelow is the argument below which S1, S2, S3 are summed as
// series; above it the closed forms lose at most a factor 75 to
// cancellation (S3 at z = 0.2), i.e. stay near 1e-14 relative.
const recruitSeriesBelow = 0.2

// recruitCoef[k][m] = 1/((m+1)···(m+k+1)), the series coefficients of
// S1, S2, S3; 24 terms reach 0.2^24 < 2e-17.
var recruitCoef = func() (c [3][24]float64) {
	for m := range c[0] {
		fm := float64(m)
		c[0][m] = 1 / (fm + 1)
		c[1][m] = c[0][m] / (fm + 2)
		c[2][m] = c[1][m] / (fm + 3)
	}
	return c
}()

// recruitSums returns S1(z), S2(z), S3(z) for 0 ≤ z ≤ 0.5 (z = Δ/λa or
// (λ − λa)/λa; see the comment at the top of the file).
func recruitSums(z float64) (s1, s2, s3 float64) {
	if z >= recruitSeriesBelow {
		L := math.Log1p(z)
		z2 := z * z
		return L / z, ((1+z)*L - z) / z2, ((1+z)*(1+z)*L - z - 1.5*z2) / (2 * z2 * z)
	}
	n := len(recruitCoef[0])
	if z < 0.02 {
		n = 10 // 0.02^10 ≈ 1e-17
	}
	c := &recruitCoef
	for m := n - 1; m >= 0; m-- { // Horner in −z
		s1 = s1*-z + c[0][m]
		s2 = s2*-z + c[1][m]
		s3 = s3*-z + c[2][m]
	}
	return s1, s2, s3
}

// recruitSums2 is recruitSums's S1 and S2, bit for bit (the same branches
// and series lengths), without S3: f″ does not need it.
func recruitSums2(z float64) (s1, s2 float64) {
	return recruitS1S2(z, recruitSeriesBelow, len(recruitCoef[0]))
}

// recruitSums12 is recruitSums without S3, for f′ and its gradient. S2's
// closed form loses only a factor 2/z to cancellation (40 at z = 0.05), so
// the series is needed below 0.05 only, where 13 terms reach 0.05^13 ≈ 1e-17.
func recruitSums12(z float64) (s1, s2 float64) {
	return recruitS1S2(z, 0.05, 13)
}

// recruitS1S2 is S1 and S2 in closed form from z = below on, else by their
// series of n terms (10 below z = 0.02).
func recruitS1S2(z, below float64, n int) (s1, s2 float64) {
	if z >= below {
		L := math.Log1p(z)
		return L / z, ((1+z)*L - z) / (z * z)
	}
	if z < 0.02 {
		n = 10
	}
	c := &recruitCoef
	for m := n - 1; m >= 0; m-- {
		s1 = s1*-z + c[0][m]
		s2 = s2*-z + c[1][m]
	}
	return s1, s2
}

// recruitState locates λ = √(1 + x) on the recruitment curve. diff = λ − λa
// is formed as (x − (λa² − 1))/(λ + λa) so that it keeps its precision
// near the onset.
type recruitState struct {
	lam, a, d, diff float64
	zone            int // 0 slack, 1 toe, 2 beyond
}

func locate(x float64, p []float64) recruitState {
	a, d := p[0], p[1]
	lam := math.Sqrt(1 + x)
	s := recruitState{lam: lam, a: a, d: d}
	if !(x > 0) || math.IsNaN(lam) {
		return s
	}
	if math.IsInf(lam, 1) {
		s.diff, s.zone = math.Inf(1), 2
		return s
	}
	s.diff = (x - (a-1)*(a+1)) / (lam + a)
	switch {
	case s.diff <= 0:
	case s.diff < d:
		s.zone = 1
	default:
		s.zone = 2
	}
	return s
}

// lambdaDerivs returns f, f_λ and λ f_λλ − f_λ per unit modulus.
func (s recruitState) lambdaDerivs() (f, fl, curv float64) {
	a := s.a
	u := s.d / a
	switch s.zone {
	case 1:
		v := s.diff / a
		_, s2, s3 := recruitSums(v)
		return a * v * v * v * s3 / u, v * v * s2 / u, v / u
	case 2:
		s1, s2, s3 := recruitSums(u)
		w := s.diff - s.d
		if math.IsInf(w, 1) {
			return w, w, 1
		}
		return a*u*u*s3 + u*s2*w + s1*w*w/(2*a), u*s2 + s1*w/a, 1
	}
	return 0, 0, 0
}

// slopeCurv is lambdaDerivs's f_λ and λ f_λλ − f_λ, bit for bit, without
// f (and so without S3).
func (s recruitState) slopeCurv() (fl, curv float64) {
	a := s.a
	u := s.d / a
	switch s.zone {
	case 1:
		v := s.diff / a
		_, s2 := recruitSums2(v)
		return v * v * s2 / u, v / u
	case 2:
		s1, s2 := recruitSums2(u)
		w := s.diff - s.d
		if math.IsInf(w, 1) {
			return w, 1
		}
		return u*s2 + s1*w/a, 1
	}
	return 0, 0
}

func recruit(x float64, p []float64) Value {
	s := locate(x, p)
	if s.zone == 0 {
		return Value{}
	}
	f, fl, curv := s.lambdaDerivs()
	l := s.lam
	if math.IsInf(l, 1) {
		return Value{posInf, posInf, 0}
	}
	return Value{f, fl / (2 * l), curv / (4 * l * l * l)}
}

func recruitSlope(x float64, p []float64) float64 {
	s := locate(x, p)
	if s.zone == 0 {
		return 0
	}
	if math.IsInf(s.lam, 1) {
		return posInf
	}
	a := s.a
	if s.zone == 1 {
		v := s.diff / a
		_, s2 := recruitSums12(v)
		return v * v * s2 / (s.d / a) / (2 * s.lam)
	}
	u := s.d / a
	s1, s2 := recruitSums12(u)
	return (u*s2 + s1*(s.diff-s.d)/a) / (2 * s.lam)
}

// recruitGrad returns ∂f′/∂λa and ∂f′/∂Δ at fixed x. With f′ = f_λ/(2λ):
// in the toe ∂f_λ/∂λa = −v/(λa u) and ∂f_λ/∂Δ = −f_λ/Δ; beyond
// ∂f_λ/∂λa = −λ/(λa λb) and ∂f_λ/∂Δ = −λ S2(u)/(λa λb) (Leibniz's rule on
// the integral over the straightening stretches; no division by Δ).
func recruitGrad(x float64, p []float64) [MaxParams]float64 {
	_, g := recruitBoth(x, p)
	return g
}

// recruitBoth is recruitSlope and recruitGrad from one location and one
// series evaluation (the gradient is zero where the slope is +Inf).
func recruitBoth(x float64, p []float64) (float64, [MaxParams]float64) {
	return locate(x, p).slopeGrad()
}

// slopeGrad is recruitBoth at a located argument.
func (s recruitState) slopeGrad() (float64, [MaxParams]float64) {
	var g [MaxParams]float64
	if s.zone == 0 {
		return 0, g
	}
	if math.IsInf(s.lam, 1) {
		return posInf, g
	}
	a, l := s.a, s.lam
	u := s.d / a
	if s.zone == 1 {
		v := s.diff / a
		_, s2 := recruitSums12(v)
		g[0] = -v / (a * u) / (2 * l)
		g[1] = -v * v * s2 / (a * u * u) / (2 * l)
		return v * v * s2 / u / (2 * l), g
	}
	s1, s2 := recruitSums12(u)
	ab2 := 2 * a * (a + s.d)
	g[0] = -1 / ab2
	g[1] = -s2 / ab2
	return (u*s2 + s1*(s.diff-s.d)/a) / (2 * l), g
}

// recruitCurvGrad is recruit's f′ and f″ and recruitGrad from one
// location (f itself is not formed).
func recruitCurvGrad(x float64, p []float64) (float64, float64, [MaxParams]float64) {
	s := locate(x, p)
	_, g := s.slopeGrad()
	if s.zone == 0 {
		return 0, 0, g
	}
	fl, curv := s.slopeCurv()
	l := s.lam
	if math.IsInf(l, 1) {
		return posInf, 0, g
	}
	return fl / (2 * l), curv / (4 * l * l * l), g
}

// recruitKinks returns x = λ² − 1 at λ = λa and λ = λa + Δ, where f‴
// jumps (f″ too when Δ = 0); x = 0 is left out, as it is the fibre
// switch.
func recruitKinks(p []float64) (k [2]float64, n int) {
	a, d := p[0], p[1]
	for _, l := range []float64{a, a + d} {
		x := (l - 1) * (l + 1)
		if x > 0 && (n == 0 || x > k[n-1]) {
			k[n] = x
			n++
		}
	}
	return k, n
}
