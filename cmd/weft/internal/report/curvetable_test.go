package report

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/terms"
)

// curves.csv draws each model along the deformations the fit used: where
// F12 and F21 stay within their scatter of zero the fit takes them as
// zero (aniso.Problem.ShearTakenAsZero), and so must the curve's path.
// Under a pure stretch a fibre family at +α and one at −α give the same
// normal stresses, since I4 = λ1² cos²α + λ2² sin²α is even in α
// (Holzapfel, Gasser & Ogden 2000; aniso's package documentation, Mirror
// symmetry), so the two curves must agree. Until 2026-12-05 the path kept
// the noisy F12, F21 as read: the curves of ±30° differed, by the noise,
// for a sign the data cannot tell. SYNTHETIC specimen: a neo-Hookean
// membrane in plane stress, σ = 2 c10 (B − λ3² I), c10 = 10 kPa (Rivlin
// 1948, as in Holzapfel 2000, Nonlinear Solid Mechanics, §6.5), with a
// scatter of 0.004 in every entry of F and no shear stress.
func TestCurveTableAtTheFittedDeformation(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 9))
	var b strings.Builder
	b.WriteString("# specimen = SYN-tracked (synthetic)\nprotocol,F11,F12,F21,F22,cauchy_11 [kPa],cauchy_22 [kPa]\n")
	for _, r := range [][2]float64{{1, 1}, {1, 0.5}, {0.5, 1}} {
		for i := 1; i <= 40; i++ {
			e := 0.15 * float64(i) / 40
			l1, l2 := 1+r[0]*e, 1+r[1]*e
			s3 := 1 / (l1 * l1 * l2 * l2)
			n := func() float64 { return 0.004 * rng.NormFloat64() }
			fmt.Fprintf(&b, "%g:%g,%.6f,%.6f,%.6f,%.6f,%.6g,%.6g\n", r[0], r[1], l1+n(), n(), n(), l2+n(), 20*(l1*l1-s3), 20*(l2*l2-s3))
		}
	}
	s, err := biaxial.Read(strings.NewReader(b.String()), "tracked.csv", biaxial.Options{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := aniso.NewProblem(s, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !p.ShearTakenAsZero {
		t.Fatalf("F12 and F21 not taken as zero (shear within scatter %v)", s.ShearWithinScatter)
	}
	family := func(deg float64) *aniso.Result {
		return &aniso.Result{Model: &aniso.Model{
			Families: []aniso.Family{{Name: "f1", Angle: deg * math.Pi / 180}},
			Terms: []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 3},
				{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{3}}}}}
	}
	var out bytes.Buffer
	if err := WriteCurveTable(&out, p, []CurveModel{{Name: "plus", Result: family(30)}, {Name: "minus", Result: family(-30)}}); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&out).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	// protocol, F11, F12, F21, F22, then per model and component the
	// stress and its band: plus 11, 22 at columns 5, 7; minus at 9, 11.
	num := func(r []string, c int) float64 {
		x, _ := strconv.ParseFloat(r[c], 64)
		return x
	}
	bad := 0
	for _, r := range rows[1:] {
		if num(r, 2) != 0 || num(r, 3) != 0 {
			bad++
			continue
		}
		for c := 5; c <= 7; c += 2 {
			if a, m := num(r, c), num(r, c+4); math.Abs(a-m) > 1e-9*math.Max(1, math.Abs(a)) {
				bad++
			}
		}
	}
	if bad > 0 {
		t.Errorf("%d of %d curve rows are off the fitted deformation (F12, F21 ≠ 0) or differ between +30° and −30°; first: %v", bad, len(rows)-1, rows[1])
	}
}
