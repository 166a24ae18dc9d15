package biaxial

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// A synthetic load-controlled record: protocol 1:1 ramps the nominal
// stress to 60 kPa in 20 rows, the stretch following σ = 60 (e^(25 (λ−1)²)
// − 1)/(e − 1) of an invented stiffening membrane (λ to 1.2), then holds
// the load for five rows while the stretch creeps by 0.012 (viscous creep
// at a held load is common practice in load-controlled biaxial testing);
// protocol 1:0.5 has the same ramp without the hold. Only the held rows
// are warned about, with their lines (from the row that reaches the load). A densely sampled stretch-controlled
// ramp with 0.1 % stress noise (2 000 rows), which rises fastest at its end,
// gets no such warning, and neither does a branch other than loading.
func TestHeldLoadWarning(t *testing.T) {
	var b strings.Builder
	b.WriteString("# specimen = HOLD-1 (synthetic)\nprotocol,stretch_1,stretch_2,nominal_11 [kPa],nominal_22 [kPa]\n")
	lam := func(sig float64) float64 { return 1 + math.Sqrt(math.Log1p(sig/60*(math.E-1))/25) }
	for _, label := range []string{"1:1", "1:0.5"} {
		for i := 0; i <= 20; i++ {
			sig := 60 * float64(i) / 20
			fmt.Fprintf(&b, "%s,%.6f,%.6f,%.4f,%.4f\n", label, lam(sig), lam(sig/2), sig, sig/2)
		}
		if label == "1:1" {
			for k := 1; k <= 5; k++ {
				c := 0.0024 * float64(k)
				fmt.Fprintf(&b, "%s,%.6f,%.6f,%.4f,%.4f\n", label, lam(60)+c, lam(30)+c/2, 60+0.05*float64(k%2), 30.0)
			}
		}
	}
	s, err := readString(b.String(), Options{})
	if err != nil {
		t.Fatal(err)
	}
	var held []Warning
	for _, w := range s.Warnings {
		if strings.Contains(w.Message, "hold the stress") {
			held = append(held, w)
		}
	}
	if len(held) != 1 || held[0].Protocol != "1:1" || !strings.Contains(held[0].Message, "last 6 kept rows of cycle 1 (lines 23–28)") {
		t.Fatalf("held-load warnings %+v, want one for protocol 1:1 at lines 23–28 (the row reaching the load and the five held)", held)
	}
	if s, err := readString(b.String(), Options{Branch: BranchAll}); err != nil || hasHeldWarning(s) {
		t.Errorf("both branches kept: %v, warnings %v", err, s.Warnings)
	}

	b.Reset()
	b.WriteString("# specimen = DENSE-1 (synthetic)\nprotocol,stretch_1,stretch_2,nominal_11 [kPa],nominal_22 [kPa]\n")
	rng := rand.New(rand.NewPCG(1, 2))
	for i := 0; i <= 2000; i++ {
		l := 1 + 0.2*float64(i)/2000
		sig := 60 * math.Expm1(25*(l-1)*(l-1)) / (math.E - 1)
		fmt.Fprintf(&b, "1:1,%.6f,%.6f,%.4f,%.4f\n", l, l, sig+0.06*rng.NormFloat64(), sig+0.06*rng.NormFloat64())
	}
	s, err = readString(b.String(), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if hasHeldWarning(s) {
		t.Errorf("a dense stiffening ramp is warned about: %v", s.Warnings)
	}
}

func hasHeldWarning(s *Specimen) bool {
	for _, w := range s.Warnings {
		if strings.Contains(w.Message, "hold the stress") {
			return true
		}
	}
	return false
}
