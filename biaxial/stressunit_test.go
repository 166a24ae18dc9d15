package biaxial

import (
	"math"
	"testing"
)

// Converting the stress unit scales stresses by the unit ratio (1 kPa =
// 1000 Pa, SI prefixes) and residual weights by its inverse, so every
// weighted residual stays the same.
func TestInStressUnit(t *testing.T) {
	s := &Specimen{Name: "x", StressUnit: "kPa", Protocols: []Protocol{{Label: "1:1",
		Points: []Point{{F: [4]float64{1.1, 0, 0, 1.1}, Stress: [4]float64{2, 3, 0, 0}}},
		Weight: [4]float64{0.5, 0.25, 0, 0}}}}
	c, err := s.InStressUnit("Pa")
	if err != nil {
		t.Fatal(err)
	}
	pr := c.Protocols[0]
	if c.StressUnit != "Pa" || pr.Points[0].Stress[0] != 2000 || pr.Points[0].Stress[1] != 3000 {
		t.Errorf("converted %s %v", c.StressUnit, pr.Points[0].Stress)
	}
	for k := 0; k < 2; k++ {
		before := s.Protocols[0].Weight[k] * s.Protocols[0].Points[0].Stress[k]
		after := pr.Weight[k] * pr.Points[0].Stress[k]
		if math.Abs(before-after) > 1e-12*before {
			t.Errorf("weighted stress %g became %g", before, after)
		}
	}
	if s.Protocols[0].Points[0].Stress[0] != 2 || s.StressUnit != "kPa" {
		t.Error("the original specimen changed")
	}
	if same, _ := s.InStressUnit("kpa"); same != s {
		t.Error("a specimen already in the unit should come back unchanged")
	}
	if _, err := s.InStressUnit("psi"); err == nil {
		t.Error("psi accepted")
	}
}
