package card_test

import (
	"fmt"
	"math"
	"strings"

	"github.com/weft-tools/weft/aniso/card"
)

// Evaluating a model card: a hand-written card of the two-family model of
// Holzapfel, Gasser & Ogden 2000 (fibres at ±40°, invented parameters) at
// an equibiaxial stretch λ = 1.1, beside the closed form of that model in
// plane stress (Holzapfel 2000, §6.6): with x = I4 − 1 = λ² − 1 for both
// families, ψ4 = k1 x exp(k2 x²) each and
// σ11 = 2 C10 (λ² − λ⁻⁴) + 2·2ψ4 λ² cos²40°. By the mirror symmetry of the
// pair the shear stress is zero.
func Example() {
	const model = `{"format": "weft.model/1", "stress_unit": "kPa",
  "families": [{"name": "f1", "angle_deg": 40}, {"name": "f2", "angle_deg": -40}],
  "terms": [{"id": "i1-lin", "weight": 3},
            {"id": "fib-expsq", "weight": 20, "params": {"stiffening": 5}, "family": "f1"},
            {"id": "fib-expsq", "weight": 20, "params": {"stiffening": 5}, "family": "f2"}]}`
	_, m, err := card.Parse(strings.NewReader(model), "model.json")
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := m.Evaluate([4]float64{1.1, 0, 0, 1.1})
	if err != nil {
		fmt.Println(err)
		return
	}
	const c10, k1, k2, lambda = 3.0, 20.0, 5.0, 1.1
	x := lambda*lambda - 1
	psi4 := k1 * x * math.Exp(k2*x*x)
	cos := math.Cos(40 * math.Pi / 180)
	want := 2*c10*(lambda*lambda-math.Pow(lambda, -4)) + 4*psi4*lambda*lambda*cos*cos
	fmt.Printf("card:        σ11 = %.4f kPa, σ12 = %.4f kPa\n", r.Cauchy[0], math.Abs(r.Cauchy[2]))
	fmt.Printf("closed form: σ11 = %.4f kPa, σ12 = %.4f kPa\n", want, 0.0)
	// Output:
	// card:        σ11 = 18.0338 kPa, σ12 = 0.0000 kPa
	// closed form: σ11 = 18.0338 kPa, σ12 = 0.0000 kPa
}
