package terms

import "math"

// Principal-stretch terms (Ogden 1972, Proc R Soc Lond A 326:565–584).
//
// The energy w·(2/α²)(λ1^α + λ2^α + λ3^α − 3) is Ogden's one-term form
// (μp/αp)(Σ λi^αp − 3) with μp = 2w/α; its initial shear modulus is
// μp αp/2 = w, so the weight reads as a shear modulus whatever α is
// (Ogden 1984, Non-linear Elastic Deformations, §4.3). α = 2 is the
// neo-Hookean solid with C10 = w/2, α = −2 the I2 term with C01 = w/2
// (Σ λi^−2 = I2 when λ1 λ2 λ3 = 1). The shape is the per-stretch function
//
//	g(λ) = (2/α²)(λ^α − 1),  g′ = (2/α) λ^(α−1),  g″ = (2/α)(α − 1) λ^(α−2)
//
// and its divided differences in μ = λ² use, with t = (μ1 − μ2)/μ2 and
// φ(c, t) = ((1 + t)^c − 1)/t = expm1(c·log1p t)/t (→ c as t → 0),
//
//	H  = (2/α) μ2^(α/2 − 1) φ(α/2, t)
//	R  = (2/α) μ2^(α/2 − 2) φ(α/2 − 1, t)
//	DH = μ2^(α/2 − 1) [ (ln μ2 φ(α/2, t) + ∂φ/∂c)/α − 2φ(α/2, t)/α² ],  ∂φ/∂c = (1 + t)^c log1p(t)/t
//
// which keep full precision down to t = 0 (every equibiaxial state).

func registerPrincipal() {
	const (
		// λ1, λ2 (principal stretches of the in-plane C) and λ3 = 1/(λ1 λ2)
		// are defined by the argument, as I1 is for the I1 shapes.
		plain = "w*(2/α^2)*(λ1^α + λ2^α + λ3^α - 3)"
		latex = `w\,\frac{2}{\alpha^{2}}\left(\lambda_1^{\alpha}+\lambda_2^{\alpha}+\lambda_3^{\alpha}-3\right)`
		src   = "Ogden 1972, Proc R Soc Lond A 326:565–584"
		doc   = "exponent α of the principal stretches (dimensionless)"
		wt    = "initial shear modulus μ of the term: Ogden's μp/αp with μp = 2w/α, so that μpαp/2 = w (Ogden 1972)"
	)
	register(
		shape("ps-pos", Principal, "principal stretches, positive exponent", plain, latex,
			[]Param{{Name: "exponent", Symbol: "α", TeX: `\alpha`, Default: 2, Min: 1, Max: 30, Doc: doc,
				Grid: []float64{2, 5, 10, 20}, IdleStart: 2}},
			wt+"; α = 2 is neo-Hookean, larger α stiffens in tension", true,
			"for α ≥ 1, Σ λi^α is a symmetric, convex, non-decreasing function of the singular values of F and so convex "+
				"in F; with w ≥ 0 the energy stays polyconvex (Ball 1977; from memory)",
			src, impl{eval: psEval, slope: psSlope, grad: psGrad, divided: psDivided, at: psAt}),
		shape("ps-neg", Principal, "principal stretches, negative exponent", plain, latex,
			[]Param{{Name: "exponent", Symbol: "α", TeX: `\alpha`, Default: -2, Min: -30, Max: -1, Doc: doc,
				Grid: []float64{-20, -10, -5, -2}, IdleStart: -2}},
			wt+"; α = −2 is the I2 (Mooney) term with C01 = w/2", true,
			"for α ≤ −1 and λ1λ2λ3 = 1, λ1^α = (λ2λ3)^|α| and the products λjλk are the singular values of cof F, so "+
				"Σ λi^α is convex in cof F; with w ≥ 0 the energy stays polyconvex (Ball 1977; from memory); g itself "+
				"decreases with λ, so the argument-wise test of the other shapes does not apply",
			src, impl{eval: psEval, slope: psSlope, grad: psGrad, divided: psDivided, at: psAt}),
	)
}

// psEval is g(λ) = (2/α²)(λ^α − 1) with its λ-derivatives; g uses expm1 so
// that it keeps its precision near λ = 1. A stretch ≤ 0 is read as 0.
func psEval(x float64, p []float64) Value {
	al := p[0]
	if !(x > 0) {
		x = 0
	}
	f := 2 / (al * al) * math.Expm1(al*math.Log(x))
	d1 := 2 / al * math.Pow(x, al-1)
	d2 := 0.0
	if al != 1 {
		d2 = 2 * (al - 1) / al * math.Pow(x, al-2)
	}
	return Value{f, d1, d2}
}

func psSlope(x float64, p []float64) float64 {
	if !(x > 0) {
		x = 0
	}
	return 2 / p[0] * math.Pow(x, p[0]-1)
}

// psGrad is ∂g′/∂α = (2/α) λ^(α−1) (ln λ − 1/α), with 0 where λ^(α−1) is 0
// (so that 0·ln 0 does not give NaN).
func psGrad(x float64, p []float64) (g [MaxParams]float64) {
	al := p[0]
	if !(x > 0) {
		x = 0
	}
	q := math.Pow(x, al-1)
	if q == 0 {
		return g
	}
	g[0] = 2 / al * q * (math.Log(x) - 1/al)
	return g
}

// powers returns E = (1 + t)^c − 1 = expm1(c·L) and P = (1 + t)^c from
// L = log1p(t); P is computed apart where 1 + E would cancel.
func powers(c, L float64) (E, P float64) {
	E = math.Expm1(c * L)
	if E > -0.5 {
		return E, 1 + E
	}
	return E, math.Exp(c * L)
}

// phi is ((1 + t)^c − 1)/t from L = log1p(t), E and P (powers), and its
// c-derivative (1 + t)^c L/t.
func phi(c, t, L, E, P float64) (v, dc float64) {
	if t == 0 {
		return c, 1
	}
	return E / t, P * L / t
}

// psCore evaluates the power law's plane-stress quantities at precomputed
// stretches: h(λ2), h(λ3), H, with grad their α-derivatives, and with
// wantR the divided difference R.
// Close stretches (t < 1, μ1 < 2μ2) use the expm1/log1p forms of the file
// comment; distant ones the plain differences, which lose nothing there.
func psCore(st *Stretches, al float64, grad, wantR bool) (v StretchValues, R float64) {
	a := al / 2
	// λ2^α, then λ1^α = λ2^α (1 + t)^(α/2) and λ3^α = 1/(λ1^α λ2^α): two
	// transcendental calls per deformation instead of four.
	e2 := math.Exp(al * st.ln2)
	mu2 := st.L2 * st.L2
	var pa, dpa, e1 float64
	if st.t < 1 {
		E, P := powers(a, st.log1pT)
		pa, dpa = phi(a, st.t, st.log1pT, E, P)
		e1 = e2 * P
		v.H = 2 / al * (e2 / mu2) * pa
	} else {
		e1 = math.Exp(al * st.ln1)
		v.H = 2 / al * (e1 - e2) / st.dmu
	}
	e3 := 1 / (e1 * e2)
	if !st.unit || math.IsInf(e3, 0) || e3 == 0 {
		e3 = math.Exp(al * st.ln3) // λ3 given apart, or the product over/underflows
	}
	v.H2, v.H3 = 2/al*e2, 2/al*e3
	if grad {
		k := func(e, ln float64) float64 {
			if e == 0 {
				return 0
			}
			return 2 / al * e * (ln - 1/al)
		}
		v.DH2[0], v.DH3[0] = k(e2, st.ln2), k(e3, st.ln3)
		if st.t < 1 {
			v.DH[0] = (e2 / mu2) * ((2*st.ln2*pa+dpa)/al - 2*pa/(al*al))
		} else {
			v.DH[0] = (k(e1, st.ln1) - v.DH2[0]) / st.dmu
		}
	}
	if wantR {
		if st.t < 1 {
			E, P := powers(a-1, st.log1pT)
			pb, _ := phi(a-1, st.t, st.log1pT, E, P)
			R = 2 / al * (e2 / (mu2 * mu2)) * pb
		} else {
			R = 2 / al * (e1/(st.L1*st.L1) - e2/mu2) / st.dmu
		}
	}
	return sanitize(v, R, al)
}

// psDivided is Divided for the power law.
func psDivided(x1, x2 float64, p []float64) Divided {
	if x1 < x2 {
		x1, x2 = x2, x1
	}
	st := NewStretches(x1, x2, 1)
	v, R := psCore(&st, p[0], true, true)
	return Divided{H: v.H, R: R, DH: v.DH}
}

func psAt(st *Stretches, p []float64, grad bool) StretchValues {
	v, _ := psCore(st, p[0], grad, false)
	return v
}

// sanitize replaces NaN (∞ − ∞ or ∞/∞ where powers overflow, or a stretch
// of 0 or ∞) by the infinity of the quantity's sign there: h(λ) has the
// sign of α and H > 0 always (h = λg′ increases), R has the sign of
// (α − 2)/α (g′/λ = (2/α)λ^(α−2)), and the α-derivatives, which overflow
// only at extreme stretches (large for α > 0, small for α < 0), the sign
// of α.
func sanitize(v StretchValues, R, al float64) (StretchValues, float64) {
	fix := func(x *float64, sign float64) {
		if math.IsNaN(*x) {
			*x = math.Copysign(posInf, sign)
		}
	}
	fix(&v.H2, al)
	fix(&v.H3, al)
	fix(&v.H, 1)
	fix(&v.DH2[0], al)
	fix(&v.DH3[0], al)
	fix(&v.DH[0], al)
	if math.IsNaN(R) {
		R = math.Copysign(posInf, (al-2)/al)
		if al == 2 {
			R = 0
		}
	}
	return v, R
}
