package aniso

import (
	"math"
	"testing"

	"github.com/weft-tools/weft/terms"
)

// The fibre switch I4 > 1 (Holzapfel, Gasser & Ogden 2000) is continuous
// for an aligned fibre term, whose shape starts with f(0) = f′(0) = 0, but
// not for a fibre term of a κ-dispersed family (Gasser, Ogden &
// Holzapfel 2006: E_f = κ(I1 − 3) + (1 − 3κ)(I4 − 1) is κ(I1 − 3) > 0 at
// I4 = 1) nor for an I5 term on a sheared fibre (I5 = a0·C²a0 ≥ I4², equal
// only when a0 is an eigenvector of C; Spencer 1971). The energies on
// either side of the switch are checked against closed forms written here
// from those definitions (not weft's kinematics), and the stress jump of
// the I5 term against a central difference of that closed-form energy
// (P = ∂W/∂F, σ = P Fᵀ; the I5 energy does not involve F33, so plane
// stress adds no pressure). The numbers are the ones README's Conventions
// and the catalogue's notes quote.
func TestSwitchJumpsQuoted(t *testing.T) {
	// i5-quad at 0°, F = [[F11, 0.2], [0, 1]]: C11 = F11², C12 = 0.2 F11,
	// I4 = C11, I5 = C11² + C12².
	i5 := Model{Families: []Family{{Name: "f1"}},
		Terms: []Term{{Shape: terms.Lookup("i5-quad"), Family: 0, Weight: 1}}}
	// on is the energy of the switched-on side, off the switch applied.
	on := func(f11, f12 float64) float64 {
		c11, c12 := f11*f11, f11*f12
		x := c11*c11 + c12*c12 - 1
		return x * x
	}
	w5 := func(f11, f12 float64) float64 {
		if f11*f11 <= 1 {
			return 0
		}
		return on(f11, f12)
	}
	for _, side := range []float64{-1, 1} {
		f11 := 1 + side*1e-9
		r, err := i5.Evaluate([4]float64{f11, 0.2, 0, 1})
		if err != nil {
			t.Fatal(err)
		}
		want := w5(f11, 0.2)
		h := 1e-7
		// The stress of each side is the gradient of that side's energy.
		p11 := (on(f11+h, 0.2) - on(f11-h, 0.2)) / (2 * h)
		p12 := (on(f11, 0.2+h) - on(f11, 0.2-h)) / (2 * h)
		if side < 0 {
			p11, p12 = 0, 0
		}
		s11 := p11*f11 + p12*0.2
		if math.Abs(r.Energy-want) > 1e-12 || math.Abs(r.Cauchy[0]-s11) > 1e-6 {
			t.Errorf("i5-quad at F11 = %v: energy %.9g (closed form %.9g), σ11 %.9g (from the energy %.9g)", f11, r.Energy, want, r.Cauchy[0], s11)
		}
		if side > 0 && (math.Abs(r.Energy-0.0016) > 1e-8 || math.Abs(r.Cauchy[0]-0.3328) > 1e-6) {
			t.Errorf("i5-quad just past the switch: energy %.9g, σ11 %.9g; README quotes 0.0016 and 0.333", r.Energy, r.Cauchy[0])
		}
	}

	// fib-expsq (b = 1) on a family at 40° with κ = 0.226, F = diag(1.1, λ2),
	// λ2 chosen so that I4 = cos²α·1.1² + sin²α·λ2² crosses 1.
	const kappa = 0.226
	al := 40 * math.Pi / 180
	c, s := math.Cos(al), math.Sin(al)
	l2 := math.Sqrt((1 - c*c*1.21) / (s * s))
	goh := Model{Families: []Family{{Name: "f1", Angle: al, Dispersion: kappa}},
		Terms: []Term{{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 1, Params: []float64{1}}}}
	for _, side := range []float64{-1, 1} {
		lam2 := l2 * (1 + side*1e-9)
		r, err := goh.Evaluate([4]float64{1.1, 0, 0, lam2})
		if err != nil {
			t.Fatal(err)
		}
		I4 := c*c*1.21 + s*s*lam2*lam2
		I1 := 1.21 + lam2*lam2 + 1/(1.21*lam2*lam2)
		want := 0.0
		if I4 > 1 {
			e := kappa*(I1-3) + (1-3*kappa)*(I4-1)
			want = math.Expm1(e*e) / 2
		}
		if math.Abs(r.Energy-want) > 1e-12 {
			t.Errorf("κ-dispersed fib-expsq at I4 = %.12f: energy %.9g, closed form %.9g", I4, r.Energy, want)
		}
		if side > 0 && math.Abs(r.Energy-2.04e-4) > 0.005e-4 {
			t.Errorf("κ-dispersed fib-expsq just past the switch: energy %.9g; README quotes 2.04e-4", r.Energy)
		}
	}
}
