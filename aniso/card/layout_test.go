package card

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/terms"
)

// A mirror pair's layout in the card gives the pair's axis θ and half
// angle β that the fit estimated, so that the card and the fit's
// estimates describe the pair alike. A pair at 82° ± 43° (families at
// 125° ≡ −55° and 39°) worked out from the families' wrapped angles reads
// −8° ± 47°: the same pair (θ − 90° ± (90° − β)), in other numbers than the
// estimates beside it. The specimen is made by the model itself: this
// checks bookkeeping, not mechanics.
func TestMirrorLayoutFollowsTheEstimates(t *testing.T) {
	sh := terms.Lookup("fib-expsq")
	m := &aniso.Model{
		Families: []aniso.Family{{Name: "f1", Angle: aniso.Rad(125)}, {Name: "f2", Angle: aniso.Rad(39)}},
		Terms: []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 4},
			{Shape: sh, Family: 0, Weight: 30, Params: []float64{3}}, {Shape: sh, Family: 1, Weight: 30, Params: []float64{3}}},
	}
	var strains []float64
	for i := 1; i <= 15; i++ {
		strains = append(strains, 0.15*float64(i)/15)
	}
	p := problemFrom(t, m, [][2]float64{{1, 1}, {1, 0.5}, {0.5, 1}}, strains, 0.02)
	st := aniso.Structure{Layout: aniso.LayoutMirror, Terms: []aniso.TermSpec{{Shape: terms.Lookup("i1-lin"), Family: -1}, {Shape: sh, Family: 0}}}
	r, err := aniso.Fit(p, st, aniso.Settings{NoScan: true, Init: map[string]float64{"mean_angle": aniso.Rad(82), "half_angle": aniso.Rad(43)}})
	if err != nil {
		t.Fatal(err)
	}
	est := map[string]float64{}
	for _, e := range r.Estimates {
		est[e.Name] = e.Value
	}
	l := fitLayout(r)
	if l == nil || l.MeanDeg == nil || l.HalfAngleDeg == nil {
		t.Fatalf("no mirror layout: %+v", l)
	}
	if math.Abs(*l.MeanDeg-est["mean_angle"]) > 1e-9 || math.Abs(*l.HalfAngleDeg-est["half_angle"]) > 1e-9 {
		t.Errorf("layout %.4f° ± %.4f°, estimates %.4f° ± %.4f°", *l.MeanDeg, *l.HalfAngleDeg, est["mean_angle"], est["half_angle"])
	}
	if math.Abs(*l.MeanDeg-82) > 0.01 || math.Abs(*l.HalfAngleDeg-43) > 0.01 {
		t.Errorf("layout %.4f° ± %.4f°, want the pair's 82° ± 43°", *l.MeanDeg, *l.HalfAngleDeg)
	}
}

// The fitted range runs from the reference state F = I, where a model's
// stress is zero by construction, to the largest kept stretch: a test
// whose first kept point is at 1.005 (a small tare) leaves a strip row
// with F22 = 1 inside, and a compressed 0.99 outside.
func TestDataRangeFromTheReferenceState(t *testing.T) {
	sh := terms.Lookup("fib-expsq")
	m := &aniso.Model{
		Families: []aniso.Family{{Name: "f1", Angle: aniso.Rad(30)}},
		Terms:    []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 4}, {Shape: sh, Family: 0, Weight: 30, Params: []float64{3}}},
	}
	var strains []float64
	for i := 0; i <= 10; i++ {
		strains = append(strains, 0.005+0.145*float64(i)/10)
	}
	p := problemFrom(t, m, [][2]float64{{1, 1}, {1, 0.5}}, strains, 0)
	dr := NewDataRange(p, m)
	if dr.Stretch1[0] != 1 || dr.Stretch2[0] != 1 || dr.FibreStretch[0][0] != 1 {
		t.Errorf("ranges start at %g, %g (fibre %g), want the reference state 1", dr.Stretch1[0], dr.Stretch2[0], dr.FibreStretch[0][0])
	}
	if out := dr.Outside(m, [4]float64{1.1, 0, 0, 1}); len(out) != 0 {
		t.Errorf("a strip row inside the tested stretch is outside: %v", out)
	}
	if out := dr.Outside(m, [4]float64{1.1, 0, 0, 0.99}); len(out) == 0 || !strings.HasPrefix(out[0], "F22 = 0.99 outside [1, ") {
		t.Errorf("a compressed F22 = 0.99: %v, want it outside a range from 1", out)
	}
}

// problemFrom makes a problem whose nominal stresses m itself gives (a
// bookkeeping check, not mechanics): one protocol per ratio r1 : r2, a
// point at each strain e of the leading axis, F = [[1 + r1·e, shear·e],
// [0, 1 + r2·e]]; with shear the shear stresses are measured too.
func problemFrom(t *testing.T, m *aniso.Model, ratios [][2]float64, strains []float64, shear float64) *aniso.Problem {
	t.Helper()
	s := &biaxial.Specimen{Name: "SYN-card (synthetic)", StressUnit: "kPa", Kind: biaxial.Nominal, HasShear: shear != 0}
	s.Measured[biaxial.C11], s.Measured[biaxial.C22] = true, true
	s.Measured[biaxial.C12], s.Measured[biaxial.C21] = shear != 0, shear != 0
	for _, r := range ratios {
		pr := biaxial.Protocol{Label: fmt.Sprintf("%g:%g", r[0], r[1]), UserWeight: 1}
		for i, e := range strains {
			F := [4]float64{1 + r[0]*e, shear * e, 0, 1 + r[1]*e}
			res, err := m.Evaluate(F)
			if err != nil {
				t.Fatal(err)
			}
			pr.Points = append(pr.Points, biaxial.Point{F: F, Stress: res.Nominal, Line: i + 1, Cycle: 1, Time: math.NaN()})
		}
		s.Protocols = append(s.Protocols, pr)
	}
	s.Weigh()
	p, err := aniso.NewProblem(s, nil)
	if err != nil {
		t.Fatal(err)
	}
	return p
}
