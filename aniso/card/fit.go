package card

import (
	"encoding/json"
	"math"
	"strconv"

	"github.com/weft-tools/weft/aniso"
)

// Num is a number that may be undefined: NaN and ±Inf are written as JSON
// null (JSON has no such numbers) and null reads back as NaN.
type Num float64

// MarshalJSON writes null for a non-finite number.
func (n Num) MarshalJSON() ([]byte, error) {
	f := float64(n)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return []byte("null"), nil
	}
	return []byte(strconv.FormatFloat(f, 'g', -1, 64)), nil
}

// UnmarshalJSON reads null as NaN.
func (n *Num) UnmarshalJSON(b []byte) error {
	if string(b) == "null" {
		*n = Num(math.NaN())
		return nil
	}
	var f float64
	if err := json.Unmarshal(b, &f); err != nil {
		return err
	}
	*n = Num(f)
	return nil
}

// FitSection is the "fit" key of a fitted card: how the model was fitted
// and how well the data determine it. It holds nothing that changes from
// run to run (no times), so the same input gives the same card.
type FitSection struct {
	// Method names the fitting method.
	Method string `json:"method"`
	// Terms, Layout and Dispersion describe the fitted form.
	Terms      []string `json:"terms"`
	Layout     string   `json:"layout"`
	Dispersion bool     `json:"dispersion"`
	// InPlane is true when the families spread in the plane with a learned
	// concentration.
	InPlane bool `json:"in_plane_dispersion"`
	// StressKind is the measure the residuals were taken in ("cauchy" or
	// "nominal"); StressUnit its unit.
	StressKind string `json:"stress_kind"`
	StressUnit string `json:"stress_unit"`
	// Loss is the weighted residual sum of squares (dimensionless: each
	// row is weighted by 1/(stress range·√points) of its protocol and axis).
	Loss Num `json:"loss"`
	// Rows is the number of residuals, FreeParams the number of estimated
	// quantities (active weights and non-linear parameters).
	Rows       int `json:"rows"`
	FreeParams int `json:"free_params"`
	// AICc and BIC from the weighted residual sum of squares.
	AICc Num `json:"aicc"`
	BIC  Num `json:"bic"`
	// Iterations and Evaluations of the local refinement.
	Iterations  int `json:"iterations"`
	Evaluations int `json:"evaluations"`
	// AngleSignKnown is true when shear information fixed the angles' sign.
	AngleSignKnown bool `json:"angle_sign_known"`
	// Metrics per protocol and stress component.
	Metrics []MetricCard `json:"metrics"`
	// Estimates of every weight, angle, dispersion and shape parameter with
	// standard errors and 95 % intervals.
	Estimates []EstimateCard `json:"estimates"`
	// Correlation between the fitted quantities; Flags name pairs with
	// |r| > 0.95 ("not separately determined"), terms the data do not
	// support and angles the data do not determine.
	Correlation *CorrelationCard `json:"correlation,omitempty"`
	Flags       []string         `json:"flags"`
	// Combinations state, per block of correlated estimates, the
	// combination the data do determine.
	Combinations []CombinationCard `json:"combinations,omitempty"`
	// Notes on identifiability.
	Notes []string `json:"notes"`
	// Profiles of the loss over every fibre angle parameter.
	Profiles []ProfileCard `json:"profiles,omitempty"`
}

// MetricCard is the fit quality of one protocol and stress component.
type MetricCard struct {
	Protocol  string `json:"protocol"`
	Component string `json:"component"`
	Points    int    `json:"points"`
	// R2 is null when the measured stress is constant.
	R2 Num `json:"r2"`
	// RMSE and Range are in the stress unit; NRMSE = RMSE/Range (null for
	// zero range).
	RMSE  Num `json:"rmse"`
	NRMSE Num `json:"nrmse"`
	Range Num `json:"range"`
}

// EstimateCard is one estimated quantity.
type EstimateCard struct {
	Name  string `json:"name"`
	Kind  string `json:"kind"`
	Value Num    `json:"value"`
	// Unit is the stress unit for weights, "deg" for angles, "" otherwise.
	Unit   string `json:"unit"`
	StdErr Num    `json:"std_err"`
	CI95   [2]Num `json:"ci95"`
	// Status is "estimated", "correlated", "degenerate", "inactive",
	// "at-bound" or "not-determined" (see aniso.StatusMeaning); ci95 is
	// null unless it is "estimated" or "correlated", and for an angle
	// fitted exactly on a symmetry line, whose interval is its profile's
	// (fit.profiles).
	Status string `json:"status"`
}

// CombinationCard is a combination of correlated estimates that the data
// determine (aniso.Combination): Σ coefficient·value in the estimates'
// own units, the largest |coefficient| 1.
type CombinationCard struct {
	// Names are the members, as in estimates.
	Names        []string `json:"names"`
	Coefficients []Num    `json:"coefficients"`
	// Value of the combination, its StdErr and the members' own
	// standard errors.
	Value        Num    `json:"value"`
	StdErr       Num    `json:"std_err"`
	MemberStdErr []Num  `json:"member_std_err"`
	Text         string `json:"text"`
}

// CorrelationCard is a correlation matrix with the names of its rows.
type CorrelationCard struct {
	Names  []string `json:"names"`
	Matrix [][]Num  `json:"matrix"`
}

// ProfileCard is the loss profile over one angle parameter.
type ProfileCard struct {
	Name        string `json:"name"`
	AnglesDeg   []Num  `json:"angles_deg"`
	Loss        []Num  `json:"loss"`
	OptimumDeg  Num    `json:"optimum_deg"`
	Threshold   Num    `json:"threshold"`
	IntervalDeg [2]Num `json:"interval_deg"`
	// Closed is false when the data do not bound the angle at one end.
	Closed bool `json:"closed"`
	// NotDetermined: the loss stays below the threshold over the angle's
	// whole range; interval_deg is null.
	NotDetermined bool `json:"not_determined"`
	// Mirrored: only |α| was profiled (no shear) and the curve mirrored.
	Mirrored bool `json:"mirrored"`
}

// FitMethod names weft's fitting method in cards.
const FitMethod = "variable projection: weights by non-negative least squares, fibre angles, dispersion and shape parameters by bounded Levenberg-Marquardt from the best minima of a global angle scan"

func nums(v []float64) []Num {
	out := make([]Num, len(v))
	for i, x := range v {
		out[i] = Num(x)
	}
	return out
}

// NewFitSection describes a fit result.
func NewFitSection(r *aniso.Result, stressKind, stressUnit string) *FitSection {
	fs := &FitSection{Method: FitMethod, Layout: r.Structure.Layout.String(), Dispersion: r.Structure.Dispersion, InPlane: r.Structure.Planar,
		StressKind: stressKind, StressUnit: stressUnit, Loss: Num(r.Loss), Rows: r.Rows, FreeParams: r.FreeParams,
		AICc: Num(r.AICc), BIC: Num(r.BIC), Iterations: r.Iterations, Evaluations: r.Evaluations,
		AngleSignKnown: r.SignKnown, Flags: append([]string{}, r.Flags...), Notes: append([]string{}, r.Notes...)}
	for _, t := range r.Structure.Terms {
		fs.Terms = append(fs.Terms, t.Label(r.Structure.Layout))
	}
	for _, m := range r.Metrics {
		mc := MetricCard{Protocol: m.Protocol, Component: m.Component, Points: m.Points, R2: Num(math.NaN()),
			RMSE: Num(m.RMSE), NRMSE: Num(math.NaN()), Range: Num(m.Range)}
		if m.R2Defined {
			mc.R2 = Num(m.R2)
		}
		if m.NRMSEDefined {
			mc.NRMSE = Num(m.NRMSE)
		}
		fs.Metrics = append(fs.Metrics, mc)
	}
	for _, e := range r.Estimates {
		fs.Estimates = append(fs.Estimates, EstimateCard{Name: e.Name, Kind: e.Kind, Value: Num(e.Value), Unit: e.Unit,
			StdErr: Num(e.StdErr), CI95: [2]Num{Num(e.Lo), Num(e.Hi)}, Status: e.Status})
	}
	for _, c := range r.Combinations {
		fs.Combinations = append(fs.Combinations, CombinationCard{Names: c.Names, Coefficients: nums(c.Coefficients),
			Value: Num(c.Value), StdErr: Num(c.StdErr), MemberStdErr: nums(c.MemberStdErr), Text: c.Text})
	}
	if len(r.CorrelationNames) > 0 {
		cc := &CorrelationCard{Names: r.CorrelationNames}
		for _, row := range r.Correlation {
			cc.Matrix = append(cc.Matrix, nums(row))
		}
		fs.Correlation = cc
	}
	for _, p := range r.Profiles {
		fs.Profiles = append(fs.Profiles, ProfileCard{Name: p.Name, AnglesDeg: nums(p.AnglesDeg), Loss: nums(p.Loss),
			OptimumDeg: Num(p.OptimumDeg), Threshold: Num(p.Threshold), IntervalDeg: [2]Num{Num(p.LoDeg), Num(p.HiDeg)},
			Closed: p.Closed, NotDetermined: p.NotDetermined, Mirrored: p.Mirrored})
	}
	return fs
}
