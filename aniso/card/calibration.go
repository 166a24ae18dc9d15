package card

import (
	"fmt"
	"math"
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
	// Holds is true when every outcome's verdict equals Verdict. The
	// chosen model's fibre directions may still move with the scale;
	// Summary says so when one moves by more than calibrationMoveDeg.
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

// calibrationMoveDeg is how far (degrees) a fibre direction of the
// chosen model may move under the check's scaled stresses before the
// summary says the angles depend on the calibration although the verdict
// holds: the closeness to a test axis within which a verdict's cautions
// treat fibres as along it (aniso's axisCautionDeg), well beyond the
// degree or two the check moves a real family (demo M1 at ±5 %: ±29.4°
// and ±29.6° against ±30.0°).
const calibrationMoveDeg = 10

// NewCalibrationCheck builds the section from the card's verdict, the
// angles (degrees) of the card's chosen model and whether their signs are
// identified (aniso.Result.SignKnown; otherwise only |α| is compared),
// and the outcomes of aniso.AxisScaleCheck at fraction.
func NewCalibrationCheck(verdict string, anglesDeg []float64, signKnown bool, fraction float64, outs []aniso.AxisScaleOutcome) *CalibrationCheck {
	c := &CalibrationCheck{Fraction: fraction, Verdict: verdict, Holds: true}
	var parts []string
	move, moved := 0.0, false
	for _, o := range outs {
		c.Outcomes = append(c.Outcomes, CalibrationOutcome{Axis1Scale: o.Axis1Scale, Verdict: o.Families, Chosen: o.Chosen, AnglesDeg: o.AnglesDeg})
		if o.Families != verdict {
			c.Holds = false
		}
		if m, ok := directionsMove(anglesDeg, o.AnglesDeg, signKnown); !ok || m > calibrationMoveDeg {
			moved = true
			if ok {
				move = math.Max(move, m)
			}
		}
		at := ""
		if o.Angles != "" {
			at = " at " + o.Angles
		}
		parts = append(parts, fmt.Sprintf("axis 1's stress ×%g: %s%s", o.Axis1Scale, o.Families, at))
	}
	how := "the verdict holds"
	switch {
	case !c.Holds:
		how = "the verdict changes, so it depends on the calibration of the test's axes: check both load cells against a known weight and the loaded widths before trusting it"
	case moved && move > 0:
		// The same count of families in a direction the scale chose: an
		// isotropic solid with axis 2's stress 2 % high read as one family
		// at ±59.3°, at ±30.3° with axis 1's ×1.05 and at ±60.7° with
		// ×0.95, and was told only that "the verdict holds".
		how = fmt.Sprintf("the verdict holds, but a fibre direction moves by up to %.1f° (more than %d°), so the angles depend on the calibration of the test's axes — and fibres that follow the calibration may be none: check both load cells against a known weight and the loaded widths before trusting them", move, calibrationMoveDeg)
	case moved:
		how = "the verdict holds, but the number of fibre directions of the chosen model changes, so the model depends on the calibration of the test's axes: check both load cells against a known weight and the loaded widths before trusting it"
	}
	c.Summary = fmt.Sprintf("verdict %s; %s — %s", verdict, strings.Join(parts, "; "), how)
	return c
}

// directionsMove returns the largest distance (degrees) from a direction
// in a to the nearest in b, or from one in b to the nearest in a (the
// Hausdorff distance of the two sets, so that a direction that appears in
// only one of them counts), directions having period 180° and, unless
// signKnown, α and −α being one: a mirror pair at ±α is then the one
// direction of a single family at α, as the verdict 1-or-mirror-pair
// treats them. ok is false when a and b hold different numbers of
// directions.
func directionsMove(a, b []float64, signKnown bool) (worst float64, ok bool) {
	a, b = directionSet(a, signKnown), directionSet(b, signKnown)
	if len(a) != len(b) {
		return 0, false
	}
	return math.Max(farthest(a, b), farthest(b, a)), true
}

// sameDirectionDeg is how close (degrees) two angles of one model must be
// to count as one direction in directionSet: a mirror pair's members are
// ±α exactly up to rounding.
const sameDirectionDeg = 1e-6

// axialDeg is the distance (degrees) between directions x and y of period
// 180°.
func axialDeg(x, y float64) float64 { return math.Abs(aniso.WrapDeg(x - y)) }

// directionSet returns the distinct directions of angles (degrees): each
// folded into [0°, 180°), or into [0°, 90°] as |α| unless signKnown, one
// of several within sameDirectionDeg of each other kept.
func directionSet(angles []float64, signKnown bool) []float64 {
	var out []float64
	for _, x := range angles {
		x = math.Mod(x, 180)
		if x < 0 {
			x += 180
		}
		if !signKnown {
			x = math.Min(x, 180-x)
		}
		dup := false
		for _, y := range out {
			dup = dup || axialDeg(x, y) <= sameDirectionDeg
		}
		if !dup {
			out = append(out, x)
		}
	}
	return out
}

// farthest returns the largest distance (degrees) from a direction in a to
// the nearest in b (0 when a is empty).
func farthest(a, b []float64) float64 {
	worst := 0.0
	for _, x := range a {
		best := math.Inf(1)
		for _, y := range b {
			best = math.Min(best, axialDeg(x, y))
		}
		worst = math.Max(worst, best)
	}
	return worst
}
