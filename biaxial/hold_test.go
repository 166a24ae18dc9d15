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
	if len(held) != 1 || held[0].Protocol != "1:1" || !strings.Contains(held[0].Message, "protocol 1:1: the last 6 kept rows of cycle 1 (lines 23–28)") {
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

// neoHookeanRamp writes a synthetic gradient file (Cauchy stress, kPa) of
// protocol 1:1: one loading ramp of n rows to stretches 1.2 × 1.2 of an
// incompressible neo-Hookean membrane in plane stress, σ = μ (F Fᵀ − J⁻² I)
// in plane with μ = 20 kPa (the closed form of Rivlin 1948, as in
// Holzapfel 2000, Nonlinear Solid Mechanics, §6.5), evaluated at the true
// F; then every entry of the written F gets Gaussian scatter sdF (tracking
// noise) and each stress Gaussian noise of relS times the peak stress. With
// hold > 0, hold more rows follow at the peak stress while the true
// stretches creep on by creep (a load held under load control).
func neoHookeanRamp(seed uint64, n int, sdF, relS float64, hold int, creep float64) string {
	rng := rand.New(rand.NewPCG(seed, 7))
	var b strings.Builder
	b.WriteString("# specimen = SYN-nh (synthetic)\nprotocol,F11,F12,F21,F22,cauchy_11 [kPa],cauchy_22 [kPa]\n")
	sig := func(l float64) float64 { return 20 * (l*l - 1/(l*l*l*l)) }
	peak := sig(1.2)
	row := func(l, s float64) {
		fmt.Fprintf(&b, "1:1,%.6f,%.6f,%.6f,%.6f,%.5f,%.5f\n", l+sdF*rng.NormFloat64(), sdF*rng.NormFloat64(), sdF*rng.NormFloat64(), l+sdF*rng.NormFloat64(),
			s+relS*peak*rng.NormFloat64(), s+relS*peak*rng.NormFloat64())
	}
	for i := 0; i < n; i++ {
		l := 1 + 0.2*float64(i)/float64(n-1)
		row(l, sig(l))
	}
	for k := 1; k <= hold; k++ {
		row(1.2+creep*float64(k)/float64(hold), peak)
	}
	return b.String()
}

// A noisy ramp holds no load. The loading branch ends at its highest row,
// the one the tracking noise lifted most, and on a ramp of 500 rows the
// last few rows' stresses agree within 1 % of the range while that noise
// makes the stretch seem to creep: before the creep was compared with the
// stretch's scatter, synthetic neo-Hookean ramps with a scatter of 0.002
// to 0.006 in F and 0.5 % stress noise were told of a held load in 20 of
// 180 files (creep up to 3.7 times the scatter). A held load that creeps
// by much more than the scatter is still warned about.
func TestNoisyRampHoldsNoLoad(t *testing.T) {
	falsely := 0
	for seed := uint64(1); seed <= 12; seed++ {
		s, err := readString(neoHookeanRamp(seed, 500, 0.004, 0.005, 0, 0), Options{})
		if err != nil {
			t.Fatal(err)
		}
		if hasHeldWarning(s) {
			falsely++
		}
	}
	if falsely > 0 {
		t.Errorf("%d of 12 noisy ramps (scatter 0.004, 500 rows) are warned of a held load they do not have", falsely)
	}
	// Ten rows held at the peak stress (noise-free) while the stretch
	// creeps by 0.06, fifteen times the scatter of 0.004.
	s, err := readString(neoHookeanRamp(1, 500, 0.004, 0, 10, 0.06), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !hasHeldWarning(s) {
		t.Errorf("a held load creeping by 0.06 at a scatter of 0.004 is not warned about: %v", s.Warnings)
	}
}
