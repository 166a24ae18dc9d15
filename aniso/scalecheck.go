package aniso

import (
	"github.com/weft-tools/weft/biaxial"
)

// An error in one axis's conversion from load to stress is a material
// stiffer along that axis, so the data cannot show it, and it is the most
// damaging systematic error of a test tried on synthetic specimens: with
// axis 1's stress scaled by 1.05, isotropic solids read as fibred (README,
// Discovering the model). AxisScaleCheck rediscovers a specimen with axis
// 1's stress scaled both ways, so that a user sees whether the verdict
// depends on the calibration of the test's axes. Scaling axis 2 instead
// gives the same verdicts: a scale common to both axes changes no choice
// (Problem.Scale), so axis 2 scaled by 1/f is axis 1 scaled by f.

// AxisScaleOutcome is discovery's answer on a specimen with axis 1's
// stress scaled by Axis1Scale.
type AxisScaleOutcome struct {
	// Axis1Scale is the factor axis 1's stress was scaled by.
	Axis1Scale float64
	// Families is the verdict on the number of fibre families (see
	// Verdict.Families); Chosen the chosen candidate's name and AnglesDeg
	// its families' angles in degrees; Angles the same in words, ±|α|
	// where the data leave an angle's sign open.
	Families  string
	Chosen    string
	AnglesDeg []float64
	Angles    string
}

// AxisScaleCheck discovers s with axis 1's stress scaled by 1 + fraction
// and by 1 − fraction (0 < fraction < 1, e.g. 0.05), with set, and returns
// the two outcomes in that order.
func AxisScaleCheck(s *biaxial.Specimen, fraction float64, set DiscoverSettings) ([]AxisScaleOutcome, error) {
	var out []AxisScaleOutcome
	for _, f := range []float64{1 + fraction, 1 - fraction} {
		p, err := NewProblem(s.WithStressScaled(biaxial.C11, f), nil)
		if err != nil {
			return nil, err
		}
		d, err := Discover(p, set)
		if err != nil {
			return nil, err
		}
		o := AxisScaleOutcome{Axis1Scale: f, Families: d.Verdict.Families, Chosen: d.Best().Name, AnglesDeg: []float64{}, Angles: anglesText(d.Best().Result)}
		for _, fam := range d.Best().Result.Model.Families {
			o.AnglesDeg = append(o.AnglesDeg, Deg(fam.Angle))
		}
		out = append(out, o)
	}
	return out, nil
}
