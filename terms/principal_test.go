package terms

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// Special cases of the one-term Ogden energy (Ogden 1984, Non-linear
// Elastic Deformations, §4.3; from memory): α = 2 is neo-Hookean,
// (w/2)(I1 − 3), and α = −2 is (w/2)(I2 − 3), since Σ λi^−2 = I2 when
// λ1 λ2 λ3 = 1.
func TestPrincipalSpecialCases(t *testing.T) {
	pos, neg := Lookup("ps-pos"), Lookup("ps-neg")
	for _, l := range [][2]float64{{1.2, 0.9}, {0.7, 1.45}, {1.01, 1.01}, {2.1, 0.6}} {
		l3 := 1 / (l[0] * l[1])
		I1 := l[0]*l[0] + l[1]*l[1] + l3*l3
		I2 := 1/(l[0]*l[0]) + 1/(l[1]*l[1]) + 1/(l3*l3)
		sum := func(s *Shape, a float64) float64 {
			p := []float64{a}
			return s.Eval(l[0], p).F + s.Eval(l[1], p).F + s.Eval(l3, p).F
		}
		// I − 3 in the reference loses digits near λ = 1.
		tol := func(I float64) float64 { return 1e-13 + 4e-16*I/math.Abs(I-3) }
		if got := sum(pos, 2); !closeRel(got, (I1-3)/2, tol(I1)) {
			t.Errorf("λ=%v α=2: Σg = %.15g, (I1−3)/2 = %.15g", l, got, (I1-3)/2)
		}
		if got := sum(neg, -2); !closeRel(got, (I2-3)/2, tol(I2)) {
			t.Errorf("λ=%v α=−2: Σg = %.15g, (I2−3)/2 = %.15g", l, got, (I2-3)/2)
		}
	}
}

// bigPow is x^n in 256-bit arithmetic for an integer n (negative allowed).
func bigPow(x float64, n int) *big.Float {
	b := new(big.Float).SetPrec(256).SetFloat64(x)
	r := new(big.Float).SetPrec(256).SetFloat64(1)
	k := n
	if k < 0 {
		k = -k
	}
	for i := 0; i < k; i++ {
		r.Mul(r, b)
	}
	if n < 0 {
		r.Quo(new(big.Float).SetPrec(256).SetFloat64(1), r)
	}
	return r
}

// dividedRef is (c·x1^n − c·x2^n)/(x1² − x2²) in 256-bit arithmetic (Go's
// math/big): the divided difference from its definition, with no
// cancellation at this precision.
func dividedRef(x1, x2 float64, n int, c float64) float64 {
	num := new(big.Float).SetPrec(256).Sub(bigPow(x1, n), bigPow(x2, n))
	num.Mul(num, new(big.Float).SetPrec(256).SetFloat64(c))
	a := new(big.Float).SetPrec(256).SetFloat64(x1)
	b := new(big.Float).SetPrec(256).SetFloat64(x2)
	den := new(big.Float).SetPrec(256).Mul(a, a)
	den.Sub(den, new(big.Float).SetPrec(256).Mul(b, b))
	v, _ := num.Quo(num, den).Float64()
	return v
}

// The divided differences H and R at close and distant stretches against
// their definition in 256-bit arithmetic (integer exponents, so powers
// are exact products), and at equal stretches against the derivative
// limits h′/(2λ) and (λg″ − g′)/(2λ³) from Eval.
func TestPrincipalDivided(t *testing.T) {
	for _, al := range []float64{1, 3, 9, 30, -1, -2, -7, -30} {
		sh := Lookup("ps-pos")
		if al < 0 {
			sh = Lookup("ps-neg")
		}
		p := []float64{al}
		n := int(al)
		for _, x2 := range []float64{0.8, 1, 1.3} {
			for _, rel := range []float64{1e-13, 1e-9, 1e-5, 0.01, 0.3, 0.41, 0.5, 2} {
				x1 := x2 * (1 + rel)
				d := sh.Divided(x1, x2, p)
				hRef := dividedRef(x1, x2, n, 2/al)
				rRef := dividedRef(x1, x2, n-2, 2/al)
				if !closeRel(d.H, hRef, 1e-13) {
					t.Errorf("α=%g λ=%g,%g: H = %.16g, definition %.16g", al, x1, x2, d.H, hRef)
				}
				if !(math.Abs(d.R-rRef) <= 1e-13*math.Abs(rRef)+1e-300) {
					t.Errorf("α=%g λ=%g,%g: R = %.16g, definition %.16g", al, x1, x2, d.R, rRef)
				}
				if e := sh.Divided(x2, x1, p); e != d {
					t.Errorf("α=%g: Divided is not symmetric in its stretches", al)
				}
			}
			v := sh.Eval(x2, p)
			d := sh.Divided(x2, x2, p)
			if hl := (v.D1 + x2*v.D2) / (2 * x2); !closeRel(d.H, hl, 1e-14) {
				t.Errorf("α=%g λ=%g: H at equal stretches %.16g, h′/(2λ) = %.16g", al, x2, d.H, hl)
			}
			if rl := (x2*v.D2 - v.D1) / (2 * x2 * x2 * x2); math.Abs(d.R-rl) > 1e-14*math.Abs(rl) {
				t.Errorf("α=%g λ=%g: R at equal stretches %.16g, limit %.16g", al, x2, d.R, rl)
			}
		}
	}
}

// ∂H/∂α against central differences in α, at equal, close and distant
// stretches (common practice).
func TestPrincipalDividedParam(t *testing.T) {
	for _, al := range []float64{1.5, 4, 9, 25, -1.5, -4, -9, -25} {
		sh := Lookup("ps-pos")
		if al < 0 {
			sh = Lookup("ps-neg")
		}
		for _, x := range [][2]float64{{1.1, 1.1}, {1.1 + 1e-9, 1.1}, {0.9, 0.88}, {1.3, 0.8}, {1, 1}, {1.6, 0.7}} {
			h := 1e-6 * math.Abs(al)
			d := sh.Divided(x[0], x[1], []float64{al})
			fd := (sh.Divided(x[0], x[1], []float64{al + h}).H - sh.Divided(x[0], x[1], []float64{al - h}).H) / (2 * h)
			if math.Abs(fd-d.DH[0]) > 1e-7*math.Max(math.Abs(d.H), math.Abs(d.DH[0])) {
				t.Errorf("α=%g λ=%v: ∂H/∂α = %.12g, finite difference %.12g", al, x, d.DH[0], fd)
			}
		}
	}
}

// Extreme stretches give ±Inf or finite values, never NaN.
func TestPrincipalNeverNaN(t *testing.T) {
	for _, id := range []string{"ps-pos", "ps-neg"} {
		sh := Lookup(id)
		for _, al := range []float64{sh.Params[0].Min, sh.Params[0].Max} {
			for _, x := range []float64{0, 1e-200, 1e-20, 1, 1e20, 1e200, math.Inf(1)} {
				for _, y := range []float64{0, 1e-20, 1, 1e20, math.Inf(1)} {
					d := sh.Divided(x, y, []float64{al})
					v := sh.Eval(x, []float64{al})
					g := sh.D1ParamGrad(x, []float64{al})
					for _, q := range []float64{d.H, d.R, d.DH[0], v.F, v.D1, v.D2, g[0]} {
						if math.IsNaN(q) {
							t.Errorf("%s α=%g at λ=%g,%g: NaN in %v %v %v", id, al, x, y, d, v, g)
						}
					}
				}
			}
		}
	}
}

// The polyconvexity claim (Ball 1977; from memory), numerically with gonum
// singular values: for α ≥ 1, Φ(A) = Σ σi(A)^α is midpoint convex over
// random 3×3 matrices; and for det F = 1 the energy with exponent α ≤ −1
// equals Φ(cof F) with exponent |α|, hence is convex in cof F.
func TestPrincipalPolyconvexityNumerically(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	sv := func(a *mat.Dense) []float64 {
		var s mat.SVD
		if !s.Factorize(a, mat.SVDNone) {
			t.Fatal("SVD failed")
		}
		return s.Values(nil)
	}
	phi := func(a *mat.Dense, p float64) float64 {
		sum := 0.0
		for _, v := range sv(a) {
			sum += math.Pow(v, p)
		}
		return sum
	}
	random := func() *mat.Dense {
		d := make([]float64, 9)
		for i := range d {
			d[i] = rng.NormFloat64()
		}
		return mat.NewDense(3, 3, d)
	}
	for _, p := range []float64{1, 1.5, 2, 9, 30} {
		for k := 0; k < 200; k++ {
			a, b := random(), random()
			var m mat.Dense
			m.Add(a, b)
			m.Scale(0.5, &m)
			l, r := phi(&m, p), (phi(a, p)+phi(b, p))/2
			if l > r*(1+1e-12) {
				t.Errorf("α=%g: Φ(midpoint) = %g > mean %g", p, l, r)
			}
		}
	}
	for k := 0; k < 50; k++ {
		F := random()
		det := mat.Det(F)
		if math.Abs(det) < 0.1 {
			continue
		}
		F.Scale(1/math.Cbrt(det), F) // det F = 1
		var inv mat.Dense
		if err := inv.Inverse(F); err != nil {
			t.Fatal(err)
		}
		var cof mat.Dense
		cof.CloneFrom(inv.T()) // cof F = det F · F⁻ᵀ
		for _, al := range []float64{-1, -3, -9} {
			if a, b := phi(F, al), phi(&cof, -al); !closeRel(a, b, 1e-10) {
				t.Errorf("α=%g: Σ λi^α = %.12g, Σ νi^|α| of cof F = %.12g", al, a, b)
			}
		}
	}
}

// AtStretches (the hot-loop form with precomputed logarithms) agrees with
// Eval, D1ParamGrad and Divided: h(λ) = λ g′(λ) and ∂h/∂α = λ ∂g′/∂α.
func TestAtStretchesAgrees(t *testing.T) {
	for _, al := range []float64{1, 2, 7.5, 30, -1, -2, -7.5, -30} {
		sh := Lookup("ps-pos")
		if al < 0 {
			sh = Lookup("ps-neg")
		}
		p := []float64{al}
		for _, l := range [][2]float64{{1.2, 0.9}, {1.05, 1.05}, {0.8, 0.8 + 1e-10}, {2, 0.5}} {
			l3 := 1 / (l[0] * l[1])
			st := NewStretches(l[0], l[1], l3)
			v := sh.AtStretches(&st, p, true)
			lo := math.Min(l[0], l[1])
			d := sh.Divided(l[0], l[1], p)
			g2, g3 := sh.D1ParamGrad(lo, p), sh.D1ParamGrad(l3, p)
			for _, c := range [][2]float64{
				{v.H2, lo * sh.Eval(lo, p).D1}, {v.H3, l3 * sh.Eval(l3, p).D1}, {v.H, d.H},
				{v.DH2[0], lo * g2[0]}, {v.DH3[0], l3 * g3[0]}, {v.DH[0], d.DH[0]},
			} {
				if math.Abs(c[0]-c[1]) > 1e-13*math.Max(1, math.Abs(c[1])) {
					t.Errorf("α=%g λ=%v: %.16g vs %.16g", al, l, c[0], c[1])
				}
			}
			if w := sh.AtStretches(&st, p, false); w.H != v.H || w.H2 != v.H2 || w.DH != ([MaxParams]float64{}) {
				t.Errorf("α=%g λ=%v: without grad %+v, with %+v", al, l, w, v)
			}
		}
	}
}
