package biaxial

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// WithStressScaled gives what reading the file with axis 1's stress
// scaled gives: the same points with P11 × f, weighted as Prepare weighs
// (compared with an actual read of the scaled file), and leaves the
// original alone.
func TestWithStressScaled(t *testing.T) {
	file := func(f float64) string {
		var b strings.Builder
		b.WriteString("protocol,stretch_1,stretch_2,nominal_11 [kPa],nominal_22 [kPa]\n")
		for _, r := range []float64{1, 0.5} {
			for i := 1; i <= 12; i++ {
				l := 1 + 0.02*float64(i)
				fmt.Fprintf(&b, "1:%g,%.17g,%.17g,%.17g,%.17g\n", r, l, 1+0.02*float64(i)*r, f*10*(l*l-1), 8*(l-1))
			}
		}
		return b.String()
	}
	s, err := readString(file(1), Options{})
	if err != nil {
		t.Fatal(err)
	}
	want, err := readString(file(1.05), Options{})
	if err != nil {
		t.Fatal(err)
	}
	s.Protocols[0].Preload[C11] = 2
	got := s.WithStressScaled(C11, 1.05)
	if got.Protocols[0].Preload[C11] != 2*1.05 || s.Protocols[0].Preload[C11] != 2 {
		t.Errorf("preload %g of the copy, %g of the original; want 2.1 and 2", got.Protocols[0].Preload[C11], s.Protocols[0].Preload[C11])
	}
	s.Protocols[0].Preload[C11] = 0
	for i := range want.Protocols {
		g, w := &got.Protocols[i], &want.Protocols[i]
		for c := range w.Weight {
			if math.Abs(g.Weight[c]-w.Weight[c]) > 1e-12*w.Weight[c] {
				t.Errorf("protocol %s, component %d: weight %.15g, the scaled file's %.15g", w.Label, c, g.Weight[c], w.Weight[c])
			}
		}
		for k := range w.Points {
			if math.Abs(g.Points[k].Stress[C11]-w.Points[k].Stress[C11]) > 1e-12*math.Abs(w.Points[k].Stress[C11]) || g.Points[k].Stress[C22] != w.Points[k].Stress[C22] {
				t.Fatalf("protocol %s, point %d: stress %v, the scaled file's %v", w.Label, k, g.Points[k].Stress, w.Points[k].Stress)
			}
		}
	}
	orig, err := readString(file(1), Options{})
	if err != nil {
		t.Fatal(err)
	}
	for i := range orig.Protocols {
		if s.Protocols[i].Weight != orig.Protocols[i].Weight {
			t.Errorf("protocol %s: the original's weights changed", orig.Protocols[i].Label)
		}
		for k := range orig.Protocols[i].Points {
			if s.Protocols[i].Points[k].Stress != orig.Protocols[i].Points[k].Stress {
				t.Fatalf("protocol %s, point %d: the original's stress changed", orig.Protocols[i].Label, k)
			}
		}
	}
}
