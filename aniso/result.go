package aniso

import (
	"fmt"
	"strings"
	"time"

	"github.com/weft-tools/weft/terms"
)

// Estimate is one fitted quantity with its uncertainty.
type Estimate struct {
	// Name identifies it, e.g. "weight[i1-lin]", "angle", "stiffening[fib-expsq@f1]".
	Name string
	// Kind is "weight", "angle", "dispersion" or "shape".
	Kind string
	// Term is the index into Structure.Terms for weights and shape
	// parameters, −1 otherwise.
	Term int
	// Value is the estimate in Unit ("deg" for angles, the stress unit for
	// weights, "" when dimensionless).
	Value float64
	Unit  string
	// StdErr and the 95 % interval [Lo, Hi] come from the Gauss–Newton
	// covariance scaled by the residual variance, the interval kept inside
	// the quantity's domain (weights ≥ 0, parameters within their bounds,
	// |α| and half angles within [0°, 90°]); they are NaN unless Status is
	// StatusEstimated or StatusCorrelated, and for an angle fitted exactly
	// on a symmetry line without shear information, which has no slope
	// there: its interval is its profile's (Result.Profiles).
	StdErr, Lo, Hi float64
	// Status is one of StatusEstimated, StatusCorrelated,
	// StatusDegenerate, StatusInactive, StatusAtBound and
	// StatusNotDetermined (see StatusMeaning).
	Status string

	// onMirrorLine marks an angle fitted exactly on a symmetry line
	// without shear information: its slope is zero there, so it has no
	// Wald interval and its profile decides whether the data determine it.
	onMirrorLine bool
}

// Metric is the fit quality of one protocol and stress component.
type Metric struct {
	Protocol  string
	Component string
	Points    int
	// R2 is 1 − SS_res/SS_tot; R2Defined is false when the measured
	// stress is constant (SS_tot = 0).
	R2        float64
	R2Defined bool
	// RMSE in the stress unit; NRMSE = RMSE / measured range (0 range: NaN
	// and NRMSEDefined false).
	RMSE, NRMSE  float64
	NRMSEDefined bool
	// Range is max − min of the measured stress.
	Range float64
}

// AngleProfile is the loss over one angle parameter, minimised over all
// other non-linear parameters and the weights at every grid angle: each
// angle is re-optimised from both neighbouring grid angles, and the loss is
// never above the best loss of the form without the family the angle moves
// (zero weights for that family are admissible at any angle). When a
// profile meets a lower loss than the fit, Fit refits from there and,
// when that lowers the loss by at least profileRefitGain of the 95 %
// threshold's margin, profiles again (at most maxProfileRefits times), so
// the fitted loss is the profile's minimum (to within that fraction of the
// margin) and its value at OptimumDeg.
type AngleProfile struct {
	// Name is the parameter's name ("angle", "angle_1", "mean_angle", ...).
	Name string
	// AnglesDeg and Loss are the grid and the profiled loss.
	AnglesDeg, Loss []float64
	// OptimumDeg is the fitted value; Threshold the loss level that bounds
	// the 95 % profile-likelihood interval [LoDeg, HiDeg]. Angles are modulo
	// 180°, so an interval may reach beyond ±90° (e.g. [80°, 97°] passes
	// through 90°); AnglesDeg itself is wrapped into (−90°, 90°].
	OptimumDeg, Threshold float64
	LoDeg, HiDeg          float64
	// Closed is false when the loss stays below the threshold to an end of
	// the range: the data do not bound the angle there.
	Closed bool
	// NotDetermined is true when the loss stays below the threshold over
	// the whole range (a full 180° period, or [0°, 90°] for |α| and for a
	// half angle): the data exclude no angle, LoDeg and HiDeg are NaN, and
	// the angle's Estimate has StatusNotDetermined.
	NotDetermined bool
	// Mirrored is true when only |α| was profiled (no shear information)
	// and the curve was mirrored to negative angles.
	Mirrored bool
	// Unresolved is true when the sweeps over the grid stopped at their
	// bound of work (profileRounds further rounds, or profileWork loss
	// evaluations per grid angle) while the last still lowered the
	// profile by more than 1e-6 of itself somewhere within a hundred
	// threshold margins of the minimum: the profile may lie above the
	// true one there, and its interval may be too narrow. Fit flags it.
	Unresolved bool
	// Evaluations counts the loss evaluations of the profile's own
	// minimisations (its grid, guide and interval ends; the fit without
	// the family excluded): the profile's work, the same on any number of
	// cores.
	Evaluations int

	// minLoss and minTheta are the lowest point off the optimum and its
	// parameters, to refit from when it lies below the fit.
	minLoss  float64
	minTheta []float64
	// periodic is the angle's kind (a half angle is not); twin its exact
	// equivalence (twinNone, twinMeanAngle, twinHalfAngle), so that
	// belowAway does not report the same model seen from the other side.
	periodic bool
	twin     int
}

// Result is a fitted model form with its evidence.
type Result struct {
	Structure Structure
	// Model is the fitted model (mirror terms expanded to both families).
	Model *Model
	// Weights are the fitted weights per Structure.Terms, stress unit.
	Weights []float64
	// Estimates lists weights, angles, dispersions and shape parameters.
	Estimates []Estimate
	// Correlation between the fitted quantities (every Estimate whose
	// Status is estimated, correlated or degenerate, and those the data
	// turned out not to determine), named by CorrelationNames; Flags name
	// pairs with |r| > CorrelationFlagLevel, degenerate terms and angles
	// the data do not determine.
	Correlation      [][]float64
	CorrelationNames []string
	Flags            []string
	// Combinations state, per block of correlated estimates, the
	// combination the data do determine.
	Combinations []Combination
	// Loss is the weighted residual sum of squares; Rows the number of
	// residuals; FreeParams the number of estimated quantities (active
	// weights and non-linear parameters not held at a bound).
	Loss       float64
	Rows       int
	FreeParams int
	// Complexity counts the active terms and every non-linear parameter
	// they and the layout bring, whether or not it sits at a bound: the
	// size of the model form, used to prefer the simpler of two forms.
	Complexity int
	// AICc and BIC from the weighted residual sum of squares.
	AICc, BIC float64
	// Metrics per protocol and measured component.
	Metrics []Metric
	// Iterations and Evaluations of the local refinements; Elapsed wall
	// time of the fit (without profiles); ProfileElapsed of the profiles.
	Iterations, Evaluations int
	Elapsed, ProfileElapsed time.Duration
	// SignKnown is true when shear information identifies the angles' sign.
	SignKnown bool
	// Notes state what the data can and cannot determine.
	Notes []string
	// Profiles over every angle parameter (when Settings.Profile).
	Profiles []AngleProfile

	e     *engine
	theta []float64
	// alternates are the refined θ of the other starts with their losses,
	// best first (other local minima, used as anchors by discovery).
	alternates [][]float64
	// noMetrics: Metrics are filled on demand (see Settings.noMetrics).
	noMetrics bool
	// held are the shape parameters held at 0 for want of shear strain
	// (see heldShear).
	held []heldParam
	// sweeps counts the profiling passes over every angle (1 unless a
	// profile met a lower point and the fit was refitted and profiled
	// again).
	sweeps int
}

// notes writes what the data can and cannot determine (package
// documentation, Mirror symmetry).
func (r *Result) notes(p *Problem) {
	nf := r.Structure.Layout.Families()
	if nf > 0 {
		if p.HasShear {
			n := "The data carry shear information (F12/F21 or a shear stress), so the sign of each fibre angle is identified."
			// Shear stresses given (zero on sutures) at shear that scatters
			// above biaxial.ShearScatterLimit identify the sign only as far
			// as the tracking allows: SYNTHETIC sutured mirror pairs at ±35°
			// tracked with a scatter of 0.001 to 0.003 were fitted as one
			// family along axis 1, yet this note said the sign was
			// identified, without a word about the scatter (until
			// 2026-12-05).
			if sc := shearScatterText(p); sc != "" {
				n = "The data carry shear information (F12/F21 or a shear stress), so the sign of each fibre angle is identified as far as the measured shear allows: it scatters from point to point (" + sc + "; tracking noise?), and the shear stresses given are compared with a model's at that noisy shear, so an angle or sign that rests on the shear can be the noise's."
			}
			r.Notes = append(r.Notes, n)
		} else {
			// F12 and F21 read as noise are not "a pure biaxial stretch".
			what := "pure biaxial stretch, no shear stress measured"
			if p.ShearTakenAsZero {
				what = "F12 and F21 within their scatter of zero, no shear stress measured"
			}
			r.Notes = append(r.Notes, "The data carry no shear information ("+what+"): the sign of a fibre angle cannot be determined, so angles are reported as ±|α|, and one family at α cannot be told from a mirror pair at ±α with half the weight each. Shear from markers or an off-axis protocol would decide it.")
			if p.ShearTakenAsZero {
				r.Notes = append(r.Notes, "F12 and F21 stay within their point-to-point scatter of zero, so they were fitted as zero: the shear they show is tracking noise, or too small to tell from it.")
			}
		}
	}
	switch {
	case r.Structure.Layout == LayoutMirror && r.Structure.HoldPairAxis:
		r.Notes = append(r.Notes, "The pair's axis is held on axis 1, as in the published form (Holzapfel, Gasser & Ogden 2000): the families sit at ±β, symmetric about axis 1 (a pair symmetric about axis 2 is the same form with β' = 90° − β). A pair whose axis is turned away from the loading axes is not part of this form; learn the axis to test for one.")
	case r.Structure.Layout == LayoutMirror && !p.HasShear:
		r.Notes = append(r.Notes, "Without shear information a mirror pair at θ ± β has the same normal stresses as θ' = θ − 90°, β' = 90° − β (and as −θ ± β): the pair's mean and half angle are reported as fitted, and the families' angles ±|α| in the model card are what the data determine.")
	}
	if r.Structure.Dispersion {
		for _, t := range r.Structure.Terms {
			if t.Shape.Arg == terms.I1 && len(t.Shape.Params) > 0 {
				r.Notes = append(r.Notes, "A dispersed fibre family acts partly like an isotropic I1 term; dispersion and "+t.Shape.ID+" compete, see the correlation flags.")
				break
			}
		}
	}
	for _, t := range r.Model.Terms {
		if t.Weight > 0 && t.Shape.Arg.InFifth() {
			r.Notes = append(r.Notes, "Planar biaxial data constrain the in-plane response only; the out-of-plane and I5 response is not fully determined by them (Holzapfel & Ogden 2009).")
			break
		}
	}
	for _, c := range r.Combinations {
		r.Notes = append(r.Notes, c.Text)
	}
	for _, est := range r.Estimates {
		if est.Status == StatusAtBound {
			r.Notes = append(r.Notes, fmt.Sprintf("%s sits at a bound of its range (%g); the data push it there, so treat it as a limit, not an estimate.", est.Name, est.Value))
		}
	}
}

// Params returns the fitted non-linear parameters by name (angles in
// radians), for warm starts of related fits; empty for a result that no
// fit made.
func (r *Result) Params() map[string]float64 {
	out := map[string]float64{}
	if r.e == nil {
		return out // a result not made by a fit (e.g. a pooled description)
	}
	for i, q := range r.e.params {
		out[q.Name] = r.theta[i]
	}
	return out
}

// Summary is a one-line description of the fitted form.
func (r *Result) Summary() string {
	var ids []string
	for i, t := range r.Structure.Terms {
		if r.Weights[i] > 0 {
			ids = append(ids, t.Label(r.Structure.Layout))
		}
	}
	return fmt.Sprintf("%s, %s layout, loss %.4g", strings.Join(ids, " + "), r.Structure.Layout, r.Loss)
}
