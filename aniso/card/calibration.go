package card

import (
	"fmt"
	"strings"

	"github.com/weft-tools/weft/aniso"
)

// KeyCalibrationCheck is the key of the section that reports discovery
// repeated with one axis's stress scaled (aniso.AxisScaleCheck).
const KeyCalibrationCheck = "calibration_check"

// CalibrationCheck says whether the card's fibre verdict holds when axis
// 1's stress is scaled up and down by Fraction: the data a per-axis error
// of the load-to-stress conversion (a load cell's calibration, an
// effective loaded width) would have given. Written only when asked for.
type CalibrationCheck struct {
	// Fraction is the relative scale tried (e.g. 0.05 for ±5 %).
	Fraction float64 `json:"fraction"`
	// Verdict is the card's own verdict on the number of fibre families.
	Verdict string `json:"verdict"`
	// Holds is true when every outcome's verdict equals Verdict.
	Holds bool `json:"holds"`
	// Outcomes are the verdicts with axis 1's stress scaled by 1 +
	// Fraction and 1 − Fraction.
	Outcomes []CalibrationOutcome `json:"outcomes"`
	// Summary says the above in words.
	Summary string `json:"summary"`
}

// CalibrationOutcome is discovery's answer with axis 1's stress scaled.
type CalibrationOutcome struct {
	// Axis1Scale is the factor axis 1's stress was scaled by.
	Axis1Scale float64 `json:"axis_1_scale"`
	// Verdict on the number of fibre families, the chosen model's name,
	// and its families' angles (degrees).
	Verdict   string    `json:"verdict"`
	Chosen    string    `json:"chosen"`
	AnglesDeg []float64 `json:"angles_deg"`
}

// NewCalibrationCheck builds the section from the card's verdict and the
// outcomes of aniso.AxisScaleCheck at fraction.
func NewCalibrationCheck(verdict string, fraction float64, outs []aniso.AxisScaleOutcome) *CalibrationCheck {
	c := &CalibrationCheck{Fraction: fraction, Verdict: verdict, Holds: true}
	var parts []string
	for _, o := range outs {
		c.Outcomes = append(c.Outcomes, CalibrationOutcome{Axis1Scale: o.Axis1Scale, Verdict: o.Families, Chosen: o.Chosen, AnglesDeg: o.AnglesDeg})
		if o.Families != verdict {
			c.Holds = false
		}
		at := ""
		if o.Angles != "" {
			at = " at " + o.Angles
		}
		parts = append(parts, fmt.Sprintf("axis 1's stress ×%g: %s%s", o.Axis1Scale, o.Families, at))
	}
	how := "the verdict holds"
	if !c.Holds {
		how = "the verdict changes, so it depends on the calibration of the test's axes: check both load cells against a known weight and the loaded widths before trusting it"
	}
	c.Summary = fmt.Sprintf("verdict %s; %s — %s", verdict, strings.Join(parts, "; "), how)
	return c
}
