package terms

import (
	"math"
	"strings"
	"testing"
)

// Continuity of the exponential shapes as the stiffening b → 0: the
// Taylor series of the exponential, e^z = 1 + z + z²/2 + … (Abramowitz &
// Stegun 1964, 4.2.1; from memory), gives (e^{bx} − 1)/b = x(1 + bx/2 + …)
// and (e^{bx²} − 1)/(2b) = (x²/2)(1 + bx²/2 + …), so wherever |b x| (or
// |b x²|) is below 1e-300 the energy equals its b = 0 limit x (or x²/2) to
// every digit. Stiffening values this small (down to the smallest
// subnormal, 5e-324) are inside the bounds [0, max] and must not make the
// product b·x underflow into an energy of 0 (or a factor 2 off).
func TestExponentialEnergyTinyStiffening(t *testing.T) {
	cases := []struct {
		id   string
		half bool // limit x²/2 instead of x
	}{{"i1-exp", false}, {"i2-exp", false}, {"i1-expsq", true}, {"fib-expsq", true}}
	for _, c := range cases {
		s := Lookup(c.id)
		for _, b := range []float64{5e-324, 1e-320, 1e-310, 1e-300} {
			for _, x := range []float64{1e-300, 1e-12, 1e-8, 0.5, 0.9, 1.5, -0.5} {
				arg := x
				if c.half {
					arg = x * x
				}
				if math.Abs(b*arg) > 1e-300 && b*arg != 0 {
					continue // beyond the regime this test pins down
				}
				want := x
				if c.half {
					want = x * x / 2
				}
				got := s.Eval(x, []float64{b}).F
				if math.Abs(got-want) > 1e-15*math.Abs(want) {
					t.Errorf("%s: f(%g) at stiffening %g = %.17g, limit %.17g", c.id, x, b, got, want)
				}
			}
		}
	}
}

// The catalogue's notes state where the I4 > 1 switch breaks continuity
// (and with it polyconvexity, which Ball 1977 defines through a convex,
// hence continuous, function of F, cof F and det F): every fibre shape on
// a κ-dispersed family (Gasser, Ogden & Holzapfel 2006) and the raw I5
// shape on a sheared fibre. The jumps themselves are checked in package
// aniso (TestSwitchJumpsQuoted).
func TestSwitchCaveatsStated(t *testing.T) {
	for _, s := range Catalogue() {
		var want []string
		switch s.Arg {
		case Fibre:
			want = []string{"κ > 0", "jump", "not polyconvex across the switch"}
		case Fifth:
			want = []string{"NOT polyconvex", "jump", "sheared"}
		default:
			continue
		}
		for _, w := range want {
			if !strings.Contains(s.PolyconvexNote, w) {
				t.Errorf("%s: note %q does not say %q", s.ID, s.PolyconvexNote, w)
			}
		}
	}
}
