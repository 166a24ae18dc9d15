package report

import (
	"math"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/terms"
)

// The abscissa of the strain plots is the Green–Lagrange strain
// E = ½(FᵀF − 1) (Holzapfel 2000, Nonlinear Solid Mechanics, §2.5): for a
// pure stretch E11 = ½(λ² − 1); with shear F21, C11 = F11² + F21².
func TestAxisCoordinate(t *testing.T) {
	for _, tc := range []struct {
		F       [4]float64
		comp    string
		stretch float64
		strain  float64
	}{
		{[4]float64{1.1, 0, 0, 1.2}, "11", 1.1, 0.105},
		{[4]float64{1.1, 0, 0, 1.2}, "22", 1.2, 0.22},
		{[4]float64{1.2, 0, 0.5, 1}, "11", 1.3, 0.345},               // C11 = 1.44 + 0.25
		{[4]float64{1, 0.3, 0, 1}, "12", 0.15, 0.15},                 // E12 = ½(F11 F12 + F21 F22)
		{[4]float64{1.1, 0.2, 0.1, 0.9}, "21", 0.155, 0.155},         // ½(0.22 + 0.09)
		{[4]float64{0.9, 0, 0, 1}, "11", 0.9, 0.5 * (0.81 - 1)},      // compression
		{[4]float64{1, 0, 0, math.Sqrt(2)}, "22", math.Sqrt(2), 0.5}, // λ² = 2
	} {
		if got := axisCoordinate(tc.F, tc.comp, false); math.Abs(got-tc.stretch) > 1e-12 {
			t.Errorf("stretch of %s at F=%v: %g, want %g", tc.comp, tc.F, got, tc.stretch)
		}
		if got := axisCoordinate(tc.F, tc.comp, true); math.Abs(got-tc.strain) > 1e-12 {
			t.Errorf("strain of %s at F=%v: %g, want %g", tc.comp, tc.F, got, tc.strain)
		}
	}
}

// The model curve of the report is the card's stress of the right kind:
// for an incompressible neo-Hookean membrane Ψ = C10 (I1 − 3) under
// equibiaxial stretch λ in plane stress, σ11 = 2 C10 (λ² − λ⁻⁴) and the
// nominal stress P11 = σ11/λ (Holzapfel 2000, §6.6 with σ33 = 0; Ogden
// 1984, Non-linear Elastic Deformations, §4.3). Between the points the
// curve interpolates the deformation, not the stress.
func TestModelCurveNeoHookean(t *testing.T) {
	const c10 = 5.0
	m := &aniso.Model{Terms: []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: c10}}}
	pr := &protocolRows{label: "1:1"}
	for _, l := range []float64{1.0, 1.1, 1.2, 1.3} {
		pr.F = append(pr.F, [4]float64{l, 0, 0, l})
	}
	for _, kind := range []string{"cauchy", "nominal"} {
		xs, ys := modelCurve(m, pr, kind, []string{"11", "22"}, false)
		if want := (len(pr.F)-1)*curveSubsteps + 1; len(xs[0]) != want {
			t.Fatalf("%s: %d curve points, want %d", kind, len(xs[0]), want)
		}
		for c := range xs {
			for i, l := range xs[c] {
				sigma := 2 * c10 * (l*l - math.Pow(l, -4))
				want := sigma
				if kind == "nominal" {
					want = sigma / l
				}
				if math.Abs(ys[c][i]-want) > 1e-9*math.Max(1, math.Abs(want)) {
					t.Errorf("%s, component %d, λ = %g: %g, want %g", kind, c, l, ys[c][i], want)
				}
			}
		}
	}
	// Strain abscissa: the same curve over E = ½(λ² − 1).
	xs, _ := modelCurve(m, pr, "cauchy", []string{"11"}, true)
	if last := xs[0][len(xs[0])-1]; math.Abs(last-0.5*(1.69-1)) > 1e-12 {
		t.Errorf("strain abscissa at λ = 1.3: %g, want 0.345", last)
	}
}

// R² on the report is the coefficient of determination 1 − SS_res/SS_tot
// (common practice); checked on a hand-computed case: measurements
// 1, 2, 3, 4 (mean 2.5, SS_tot = 5), predictions 1.1, 1.9, 3.2, 3.8
// (SS_res = 0.01 + 0.01 + 0.04 + 0.04 = 0.1), R² = 0.98.
func TestRSquared(t *testing.T) {
	if got := rSquared([]float64{1, 2, 3, 4}, []float64{1.1, 1.9, 3.2, 3.8}); math.Abs(got-0.98) > 1e-12 {
		t.Errorf("R² = %g, want 0.98", got)
	}
	if got := rSquared([]float64{2, 2}, []float64{2, 2}); !math.IsNaN(got) {
		t.Errorf("R² of a constant measurement = %g, want undefined (NaN)", got)
	}
}
