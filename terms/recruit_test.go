package terms

import (
	"math"
	"strings"
	"testing"

	gquad "gonum.org/v1/gonum/integrate/quad"
)

// recruitRef integrates the bundle energy and its λ-derivative over the
// straightening stretches numerically, with Gauss–Legendre quadrature from
// gonum (a general-purpose library): each fibre straight at λs carries
// energy (λ − λs)²/(2λs) and nominal stress λ/λs − 1 per unit modulus
// (Lanir 1983, J Biomech 16:1–12), λs uniform on [λa, λa + Δ]. Returns
// f and f′(x) = f_λ/(2λ).
func recruitRef(lam, a, d float64) (f, d1 float64) {
	hi := math.Min(lam, a+d)
	if hi <= a {
		return 0, 0
	}
	energy := func(s float64) float64 { return (lam - s) * (lam - s) / (2 * s) }
	stress := func(s float64) float64 { return lam/s - 1 }
	// The integrands are smooth on [λa, hi]: 40 nodes are exact to
	// round-off for these polynomial-over-s integrands.
	f = gquad.Fixed(energy, a, hi, 40, nil, 0) / d
	fl := gquad.Fixed(stress, a, hi, 40, nil, 0) / d
	return f, fl / (2 * lam)
}

var recruitCases = [][2]float64{{1, 0.1}, {1, 0.5}, {1.04, 0.03}, {1.2, 0.25}, {1.5, 0.5}, {1.1, 1e-3}}

// The closed form against numerical integration over the straightening
// stretches (gonum quad), to 1e-9 relative, in the toe and beyond.
func TestRecruitAgainstQuadrature(t *testing.T) {
	sh := Lookup("fib-recruit")
	for _, c := range recruitCases {
		a, d := c[0], c[1]
		for _, r := range []float64{0.02, 0.3, 0.5, 0.97, 1, 1.01, 1.7, 4} {
			lam := a + r*d
			if r >= 1.7 {
				lam = (a + d) * (1 + 0.1*r)
			}
			x := lam*lam - 1
			v := sh.Eval(x, []float64{a, d})
			f, d1 := recruitRef(math.Sqrt(1+x), a, d)
			if math.Abs(v.F-f) > 1e-9*math.Abs(f) || math.Abs(v.D1-d1) > 1e-9*math.Abs(d1) {
				t.Errorf("λa=%g Δ=%g λ=%g: f=%.15g f′=%.15g, quadrature %.15g %.15g", a, d, lam, v.F, v.D1, f, d1)
			}
			if f <= 0 {
				t.Errorf("λa=%g Δ=%g λ=%g: reference energy %g should be > 0", a, d, lam, f)
			}
		}
		// Slack below the onset: no energy, no stress.
		if v := sh.Eval((a-0.01)*(a-0.01)-1, []float64{a, d}); v != (Value{}) {
			t.Errorf("λa=%g: %v below the onset", a, v)
		}
	}
}

// Δ → 0: a linear fibre that starts at λa, f = (λ − λa)²/(2λa), nominal
// stress (λ − λa)/λa (Hooke's law on the straight fibre; common practice),
// reached continuously, with no division by zero; the derivatives and the
// parameter gradient stay finite and converge too.
func TestRecruitZeroSpreadLimit(t *testing.T) {
	sh := Lookup("fib-recruit")
	for _, a := range []float64{1, 1.07, 1.5} {
		for _, lam := range []float64{a + 1e-6, a + 0.01, a + 0.3} {
			x := lam*lam - 1
			fl := (lam - a) / a
			want := Value{(lam - a) * (lam - a) / (2 * a), fl / (2 * lam), 1 / (4 * lam * lam * lam)}
			// x = λ² − 1 is rounded, which moves λ − λa by ~1e-16: relative
			// 1e-10 at λ − λa = 1e-6.
			tol := math.Max(1e-13, 1e-16/(lam-a))
			got0 := sh.Eval(x, []float64{a, 0})
			if !closeRel(got0.F, want.F, tol) || !closeRel(got0.D1, want.D1, tol) || !closeRel(got0.D2, want.D2, 1e-12) {
				t.Errorf("λa=%g λ=%g Δ=0: %v, linear fibre %v", a, lam, got0, want)
			}
			g0 := sh.D1ParamGrad(x, []float64{a, 0})
			// ∂f′/∂λa of the linear fibre is −λ/λa²/(2λ); a spread Δ acts
			// at first like a shift of the onset by Δ/2.
			if !closeRel(g0[0], -1/(2*a*a), 1e-12) || !closeRel(g0[1], -1/(4*a*a), 1e-12) {
				t.Errorf("λa=%g λ=%g Δ=0: ∂f′/∂θ = %v", a, lam, g0)
			}
			for _, d := range []float64{1e-3, 1e-6, 1e-9, 1e-300} {
				v := sh.Eval(x, []float64{a, d})
				g := sh.D1ParamGrad(x, []float64{a, d})
				for _, q := range []float64{v.F, v.D1, v.D2, g[0], g[1], sh.Slope(x, []float64{a, d})} {
					if math.IsNaN(q) || math.IsInf(q, 0) {
						t.Fatalf("λa=%g λ=%g Δ=%g: not finite: %v %v", a, lam, d, v, g)
					}
				}
				// Beyond the spread the difference is first order in Δ.
				if lam > a+d && math.Abs(v.D1-want.D1) > 2*d+tol*want.D1 {
					t.Errorf("λa=%g λ=%g Δ=%g: f′ = %.15g, limit %.15g", a, lam, d, v.D1, want.D1)
				}
			}
		}
	}
	if plain, _ := sh.Written([]float64{1.05, 0}); plain == sh.Formula || !containsAll(plain, "2*λa", "<λ_f-λa>") {
		t.Errorf("Δ = 0 formula %q", plain)
	}
}

// Kinks sit where the first and the last fibres straighten; x = 0 (the
// fibre switch) is not listed, and the other shapes have none.
func TestKinks(t *testing.T) {
	sh := Lookup("fib-recruit")
	for _, c := range []struct {
		p    []float64
		want []float64
	}{
		{[]float64{1, 0.1}, []float64{1.1*1.1 - 1}},
		{[]float64{1.05, 0.1}, []float64{1.05*1.05 - 1, 1.15*1.15 - 1}},
		{[]float64{1.2, 0}, []float64{1.2*1.2 - 1}},
		{[]float64{1, 0}, nil},
	} {
		k, n := sh.Kinks(c.p)
		if n != len(c.want) {
			t.Errorf("%v: %d kinks %v, want %v", c.p, n, k[:n], c.want)
			continue
		}
		for i := range c.want {
			if math.Abs(k[i]-c.want[i]) > 1e-15 {
				t.Errorf("%v: kink %g, want %g", c.p, k[i], c.want[i])
			}
		}
		// f″ is continuous there (C²) while Δ > 0; f‴ jumps.
		if c.p[1] > 0 {
			for _, x := range k[:n] {
				lo, hi := sh.Eval(x*(1-1e-12), c.p), sh.Eval(x*(1+1e-12), c.p)
				if math.Abs(lo.D2-hi.D2) > 1e-9*math.Max(1e-3, hi.D2) {
					t.Errorf("%v: f″ jumps at kink x=%g: %g → %g", c.p, x, lo.D2, hi.D2)
				}
			}
		}
	}
	for _, s := range Catalogue() {
		if _, n := s.Kinks(s.DefaultParams()); n != 0 && s.ID != "fib-recruit" {
			t.Errorf("%s: %d kinks", s.ID, n)
		}
	}
}

// Convex and non-decreasing in x (the polyconvexity claim): checked from
// f itself by midpoint convexity, not through the closed-form f″.
func TestRecruitConvex(t *testing.T) {
	sh := Lookup("fib-recruit")
	for _, c := range append(recruitCases, [2]float64{1.3, 0}) {
		p := []float64{c[0], c[1]}
		prev := 0.0
		for x := 0.0; x < 3; x += 0.013 {
			f, fa, fb := sh.Eval(x, p).F, sh.Eval(x-0.05, p).F, sh.Eval(x+0.05, p).F
			if f < prev || 2*f > fa+fb+1e-15 {
				t.Errorf("%v at x=%g: f=%g not convex non-decreasing (neighbours %g, %g, previous %g)", p, x, f, fa, fb, prev)
			}
			prev = f
		}
	}
}

// Parameter derivatives near Δ = 0 and across the zones, against central
// differences (the catalogue-wide test covers the defaults only).
func TestRecruitParamGradient(t *testing.T) {
	sh := Lookup("fib-recruit")
	for _, c := range recruitCases {
		for _, lam := range []float64{c[0] + 0.4*c[1], c[0] + 1.3*c[1] + 0.01, 1.6} {
			x := lam*lam - 1
			p := []float64{c[0] + 0.01, c[1]}
			g := sh.D1ParamGrad(x, p)
			for j := range p {
				h := 1e-7
				pp := append([]float64(nil), p...)
				pm := append([]float64(nil), p...)
				pp[j] += h
				pm[j] -= h
				if pm[j] < 0 {
					continue
				}
				fd := (sh.Slope(x, pp) - sh.Slope(x, pm)) / (2 * h)
				if math.Abs(fd-g[j]) > 1e-6*math.Max(1, math.Abs(g[j])) {
					t.Errorf("%v λ=%g: ∂f′/∂%s = %.10g, finite difference %.10g", p, lam, sh.Params[j].Name, g[j], fd)
				}
			}
		}
	}
}

func closeRel(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), 1e-300)
}

func containsAll(s string, subs ...string) bool {
	for _, q := range subs {
		if !strings.Contains(s, q) {
			return false
		}
	}
	return true
}

// The formula written in cards, with u = min(max(λ_f, λa), λa + Δ) and no
// case distinction, evaluated as written equals the shape below the onset
// (where it is zero by u = λa), in the toe and beyond.
func TestRecruitWrittenFormula(t *testing.T) {
	sh := Lookup("fib-recruit")
	if !strings.Contains(sh.Formula, "min(max(λ_f,λa),λa+Δ)") {
		t.Fatalf("formula %q", sh.Formula)
	}
	for _, c := range recruitCases {
		a, d := c[0], c[1]
		for _, lam := range []float64{1, a - 0.01, a + 0.3*d, a + 0.9*d, a + d + 0.2} {
			if lam < 1 {
				continue
			}
			u := math.Min(math.Max(lam, a), a+d)
			written := (lam*lam*math.Log(u/a) - 2*lam*(u-a) + (u*u-a*a)/2) / (2 * d)
			got := sh.Eval(lam*lam-1, c[:]).F
			// The written form cancels for small Δ; the shape does not.
			if math.Abs(got-written) > 1e-12/d*math.Max(1, lam*lam) {
				t.Errorf("λa=%g Δ=%g λ=%g: shape %.15g, written formula %.15g", a, d, lam, got, written)
			}
		}
	}
}
