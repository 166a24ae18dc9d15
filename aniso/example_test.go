package aniso_test

import (
	"fmt"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/biaxial"
)

// Fitting a chosen model form: an invented, SYNTHETIC specimen of an
// incompressible neo-Hookean membrane with C10 = 5 kPa, tested
// equibiaxially and at 1:0.5, whose Cauchy stresses follow the closed form
// σ_ii = 2 C10 (λ_i² − 1/(λ1 λ2)²) (Holzapfel 2000, §6.6 with σ33 = 0). The
// neo-Hookean preset recovers the weight C10.
func ExampleFit() {
	var csv strings.Builder
	csv.WriteString("# specimen = example\n# notes = SYNTHETIC\nprotocol,stretch_1,stretch_2,cauchy_11,cauchy_22\n")
	for _, r := range []float64{1, 0.5} {
		for i := 0; i < 8; i++ {
			l1, l2 := 1+0.025*float64(i), 1+0.025*float64(i)*r
			s3 := 1 / (l1 * l1 * l2 * l2)
			fmt.Fprintf(&csv, "1:%g,%g,%g,%.10g,%.10g\n", r, l1, l2, 10*(l1*l1-s3), 10*(l2*l2-s3))
		}
	}
	spec, err := biaxial.Read(strings.NewReader(csv.String()), "example.csv", biaxial.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	p, err := aniso.NewProblem(spec, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	form, err := aniso.PresetStructure("neo-hookean")
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := aniso.Fit(p, form, aniso.Settings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	t := r.Model.Terms[0]
	fmt.Printf("%s weight %.4f %s\n", t.Shape.ID, t.Weight, spec.StressUnit)
	// Output:
	// i1-lin weight 5.0000 kPa
}
