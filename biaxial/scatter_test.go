package biaxial

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// shearFile is one protocol of 60 points on sutures: equal stretches
// 1 + 0.004 i, a smooth curved shear F12 = 0.02 e + 0.3 e² (e = λ − 1),
// F21 = −F12/2, and the shear stresses given as zero (sutures), with
// Gaussian noise of standard deviation noise added to F12 and F21. With
// shearStress false the file has no shear-stress columns.
func shearFile(noise float64, shearStress bool, seed uint64) string {
	rng := rand.New(rand.NewPCG(seed, 5))
	var b strings.Builder
	b.WriteString("protocol,F11,F12,F21,F22,nominal_11 [kPa],nominal_22 [kPa]")
	if shearStress {
		b.WriteString(",nominal_12 [kPa],nominal_21 [kPa]")
	}
	b.WriteString("\n")
	for i := 1; i <= 60; i++ {
		e := 0.004 * float64(i)
		f12 := 0.02*e + 0.3*e*e + noise*rng.NormFloat64()
		f21 := -0.5*(0.02*e+0.3*e*e) + noise*rng.NormFloat64()
		fmt.Fprintf(&b, "1:1,%.17g,%.17g,%.17g,%.17g,%.17g,%.17g", 1+e, f12, f21, 1+e, 100*e*e, 80*e*e)
		if shearStress {
			b.WriteString(",0,0")
		}
		b.WriteString("\n")
	}
	return b.String()
}

// The point-to-point scatter of the shear is the noise added to it: the
// third differences of independent noise of standard deviation s have
// variance 20 s² (the squares of 1, −3, 3, −1; a textbook identity), a
// quadratic path has none, and the normal-consistent median absolute
// value (factor 1.4826, common practice) estimates s without bias: over
// 40 noisy files (80 estimates of 57 differences each, each within about
// ±45 % of s at 95 %, so their mean within about ±5 %) the mean is s
// within 8 %. The warning names the scatter only where the shear
// stresses are given and the scatter is above ShearScatterLimit.
func TestStrainScatter(t *testing.T) {
	scatterOf := func(in string) (*Specimen, [4]float64, []string) {
		t.Helper()
		s, err := readString(in, Options{})
		if err != nil {
			t.Fatal(err)
		}
		var ws []string
		for _, w := range s.Warnings {
			if strings.Contains(w.Message, "tracking noise of the markers?") {
				ws = append(ws, w.Message)
			}
		}
		return s, s.Protocols[0].StrainScatter, ws
	}
	sum := 0.0
	for seed := uint64(1); seed <= 40; seed++ {
		_, sc, _ := scatterOf(shearFile(0.001, true, seed))
		sum += sc[1] + sc[2]
	}
	if mean := sum / 80; math.Abs(mean-0.001) > 0.08*0.001 {
		t.Errorf("mean scatter of F12 and F21 over 40 files %.4g, want 0.001 within 8 %%", mean)
	}
	s, sc, ws := scatterOf(shearFile(0.001, true, 3))
	if sc[0] > 1e-12 || sc[3] > 1e-12 {
		t.Errorf("stretches without noise: scatter %.3g and %.3g, want 0 up to rounding", sc[0], sc[3])
	}
	if !s.HasShear || len(ws) != 1 || !strings.Contains(ws[0], "protocol 1:1") {
		t.Fatalf("noise 0.001 with shear stresses given: warnings %q, want one naming protocol 1:1", ws)
	}
	if _, sc, ws := scatterOf(shearFile(0, true, 3)); sc[1] > 1e-12 || sc[2] > 1e-12 || len(ws) != 0 {
		t.Errorf("smooth curved shear: scatter %.3g, warnings %q, want none", sc, ws)
	}
	if _, _, ws := scatterOf(shearFile(0.0002, true, 3)); len(ws) != 0 {
		t.Errorf("noise 0.0002, below the limit: warnings %q", ws)
	}
	if _, sc, ws := scatterOf(shearFile(0.001, false, 3)); len(ws) != 0 || sc[1] == 0 {
		t.Errorf("no shear stresses given: scatter %.3g, warnings %q, want the scatter recorded and no warning", sc, ws)
	}
}
