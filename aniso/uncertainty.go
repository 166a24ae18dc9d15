package aniso

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// CorrelationFlagLevel is the |r| above which two estimates are flagged as
// not separately determined (status StatusCorrelated).
const CorrelationFlagLevel = 0.95

// Statuses of an Estimate.
const (
	// StatusEstimated: determined by the data, with a 95 % interval.
	StatusEstimated = "estimated"
	// StatusCorrelated: in a pair with |r| > CorrelationFlagLevel; its own
	// interval is wide and a combination with its partners is what the data
	// determine (Result.Combinations).
	StatusCorrelated = "correlated"
	// StatusDegenerate: a quantity of a term the data do not support
	// (Result.Degenerate), or the angle or dispersion of a family whose
	// active terms all are such terms; no interval.
	StatusDegenerate = "degenerate"
	// StatusInactive: a weight at zero (no symmetric interval at the w ≥ 0
	// bound), or a parameter of such a term.
	StatusInactive = "inactive"
	// StatusAtBound: a parameter held at a bound of its range.
	StatusAtBound = "at-bound"
	// StatusNotDetermined: the data cannot fix it (a direction the data do
	// not see, or an angle interval wider than the 180° period).
	StatusNotDetermined = "not-determined"
)

// StatusMeaning says in words what an Estimate status means, or "" for an
// unknown status.
func StatusMeaning(status string) string {
	switch status {
	case StatusEstimated:
		return "determined by the data, with a 95 % interval"
	case StatusCorrelated:
		return "not separately determined: correlated (|r| > 0.95) with another quantity; the notes name the combination the data do determine"
	case StatusDegenerate:
		return "a quantity of a term the data do not support, or the angle of a family made only of such terms (see the flags); no interval"
	case StatusInactive:
		return "weight at zero: the term is not used"
	case StatusAtBound:
		return "held at a bound of its range: a limit, not an estimate"
	case StatusNotDetermined:
		return "the data cannot fix it (its interval would span the whole range)"
	}
	return ""
}

// Combination is a combination of correlated estimates that the data
// determine better than any of its members: the direction of least
// variance of their correlation block, Σ Coefficients_i · value_i in the
// estimates' own units (degrees for angles).
type Combination struct {
	// Names are the members, as in Result.Estimates.
	Names []string
	// Coefficients of the sum, in the members' own units. The largest
	// |coefficient| is 1, taken among the members that are not weights
	// when there are any, so that a change of stress unit rescales the
	// weights' coefficients and leaves the rest of the statement alone.
	Coefficients []float64
	// Value of the combination and its StdErr; MemberStdErr are the
	// members' own standard errors, for comparison.
	Value, StdErr float64
	MemberStdErr  []float64
	// Text states the combination in words and numbers.
	Text string
}

// jcol is one column of the Jacobian of the weighted residuals: the
// quantity behind Estimates[est].
type jcol struct {
	est int
	v   []float64
	// sign is −1 for an angle reported as |α| whose fitted value is
	// negative, so that covariances refer to the reported value.
	sign float64
}

// uncertainty fills Estimates, Correlation, Flags and Combinations from the
// Gauss–Newton covariance at the optimum, σ̂²(JᵀJ)⁻¹ with σ̂² =
// loss/(rows − free), J the Jacobian of the weighted residuals with respect
// to the active weights and the non-linear parameters (Bates & Watts 1988,
// Nonlinear Regression Analysis and Its Applications, §2.3). Weights at
// zero are inactive and parameters at a bound are held, not given a
// symmetric interval; terms the data do not support are degenerate;
// intervals are clipped to each quantity's domain.
func (r *Result) uncertainty(p *Problem) {
	cols := r.initEstimates(p)
	k := len(cols)
	r.FreeParams = k
	for _, est := range r.Estimates {
		if est.Status != StatusInactive {
			r.Complexity++
		}
	}
	n := r.Rows
	lossFloor := math.Max(r.Loss, 1e-300)
	aic := float64(n)*math.Log(lossFloor/float64(n)) + 2*float64(k)
	r.AICc = aic + 2*float64(k*(k+1))/math.Max(float64(n-k-1), 1)
	r.BIC = float64(n)*math.Log(lossFloor/float64(n)) + float64(k)*math.Log(float64(n))
	if k == 0 || n <= k {
		return
	}
	cov, undetermined, ok := covariance(cols)
	if !ok {
		return
	}
	// cov is in the units of the Jacobian's columns (radians for angles);
	// scale it to the reported units with σ̂².
	sigma2 := r.Loss / float64(n-k)
	unit := make([]float64, k)
	for a, c := range cols {
		unit[a] = 1
		switch r.Estimates[c.est].Kind {
		case "angle":
			unit[a] = Deg(1) // degrees per radian
		case "weight":
			// The fitter's weights are in units of p.Scale (Problem.Scale).
			unit[a] = p.Scale
		}
	}
	for a := 0; a < k; a++ {
		for b := 0; b < k; b++ {
			cov.Set(a, b, cov.At(a, b)*sigma2*unit[a]*unit[b])
		}
	}
	r.intervals(p, cols, cov, undetermined, n-k)
	r.correlations(cols, cov)
}

// initEstimates lists every weight and non-linear parameter with its
// status and returns the Jacobian columns of those that are fitted
// (estimated or degenerate).
func (r *Result) initEstimates(p *Problem) []jcol {
	e := r.e
	var cols []jcol
	for g, t := range r.Structure.Terms {
		est := Estimate{Name: "weight[" + t.Label(r.Structure.Layout) + "]", Kind: "weight", Term: g, Value: e.w[g] * p.Scale, Unit: p.Specimen.StressUnit,
			StdErr: math.NaN(), Lo: math.NaN(), Hi: math.NaN(), Status: StatusEstimated}
		if e.w[g] <= 0 {
			est.Status = StatusInactive
		} else {
			cols = append(cols, jcol{len(r.Estimates), e.A[g*e.rows : (g+1)*e.rows], 1})
		}
		r.Estimates = append(r.Estimates, est)
	}
	for i, q := range e.params {
		v := r.theta[i]
		est := Estimate{Name: q.Name, Term: -1, Value: v, StdErr: math.NaN(), Lo: math.NaN(), Hi: math.NaN(), Status: StatusEstimated}
		sign := 1.0
		switch q.Kind {
		case kindAngle:
			est.Kind, est.Unit = "angle", "deg"
			if q.Periodic {
				est.Value = Deg(wrapAngle(v))
				if !p.HasShear && est.Value < 0 {
					// Only |α| is identified without shear information.
					est.Value, sign = -est.Value, -1
				}
			} else {
				est.Value = Deg(v)
			}
		case kindKappa:
			est.Kind = "dispersion"
		case kindConcentration:
			est.Kind = "concentration"
		case kindShape:
			est.Kind, est.Term = "shape", q.Group
		}
		if !q.Periodic && (v <= q.Lo || v >= q.Hi) {
			est.Status = StatusAtBound
		}
		// A shape parameter of an inactive term has no effect on the fit.
		if q.Kind == kindShape && e.w[q.Group] <= 0 {
			est.Status = StatusInactive
		}
		if (q.Kind == kindAngle || q.Kind == kindKappa || q.Kind == kindConcentration) && !r.anyFibreActive() {
			est.Status = StatusNotDetermined
		}
		if est.Status == StatusEstimated {
			col := e.v[i]
			if q.onMirrorLine(p, v) {
				// The angle's slope is zero there; what the column holds
				// is round-off. Left in, unit-normalised, it would
				// correlate at random with the other quantities.
				col = make([]float64, len(col))
				est.onMirrorLine = true
			}
			cols = append(cols, jcol{len(r.Estimates), col, sign})
		}
		r.Estimates = append(r.Estimates, est)
	}
	r.markDegenerate(p)
	return cols
}

// markDegenerate gives the quantities of the terms the data do not support
// (Degenerate) their own status and a flag, and so the angle and dispersion
// of a family whose every active term is such a term. They keep their place
// in the Jacobian, being part of the fitted model, but get no interval.
func (r *Result) markDegenerate(p *Problem) {
	nw := len(r.Structure.Terms)
	degen := make([]bool, nw)
	mark := func(j int) {
		if st := r.Estimates[j].Status; st == StatusEstimated || st == StatusAtBound {
			r.Estimates[j].Status = StatusDegenerate
		}
	}
	for _, d := range r.Degenerate(p) {
		degen[d.Term] = true
		for j, est := range r.Estimates {
			if est.Term == d.Term && (est.Kind == "weight" || est.Kind == "shape") {
				mark(j)
			}
		}
		r.Flags = append(r.Flags, fmt.Sprintf("%s is degenerate, not supported by the data: %s", r.Structure.Terms[d.Term].Label(r.Structure.Layout), d.Detail))
	}
	// A structure family is 0 or 1; a mirror pair's terms all use 0.
	for f := 0; f < 2; f++ {
		active, supported := 0, 0
		for g, t := range r.Structure.Terms {
			if t.Family == f && r.Weights[g] > 0 {
				active++
				if !degen[g] {
					supported++
				}
			}
		}
		if active == 0 || supported > 0 {
			continue
		}
		for i, q := range r.e.params {
			fam := 0
			switch {
			case r.Structure.Layout == LayoutFree && q.Kind == kindAngle:
				fam = q.Angle
			case r.Structure.Layout == LayoutFree && (q.Kind == kindKappa || q.Kind == kindConcentration):
				fam = q.Families[0]
			}
			if (q.Kind == kindAngle || q.Kind == kindKappa || q.Kind == kindConcentration) && fam == f {
				mark(nw + i)
			}
		}
	}
}

// covariance returns (JᵀJ)⁻¹ of the columns, computed on unit-norm
// columns so that the eigen-decomposition sees the geometry, not the
// units, and marks the columns that load on a direction the data do not
// see (relative eigenvalue below 1e-12): those are undetermined.
func covariance(cols []jcol) (*mat.Dense, []bool, bool) {
	k := len(cols)
	scale := make([]float64, k)
	JtJ := mat.NewSymDense(k, nil)
	for a := range cols {
		s := 0.0
		for _, x := range cols[a].v {
			s += x * x
		}
		scale[a] = math.Sqrt(s)
		if scale[a] == 0 {
			scale[a] = 1
		}
	}
	cov := mat.NewDense(k, k, nil)
	undetermined := make([]bool, k)
	for a := 0; a < k; a++ {
		for b := 0; b <= a; b++ {
			s := 0.0
			va, vb := cols[a].v, cols[b].v
			for i := range va {
				s += va[i] * vb[i]
			}
			JtJ.SetSym(a, b, s/(scale[a]*scale[b]))
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(JtJ, true) {
		return nil, nil, false
	}
	vals := eig.Values(nil)
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	maxEig := 0.0
	for _, v := range vals {
		maxEig = math.Max(maxEig, v)
	}
	for c, lam := range vals {
		if lam <= 1e-12*maxEig {
			for a := 0; a < k; a++ {
				if math.Abs(vecs.At(a, c)) > 1e-3 {
					undetermined[a] = true
				}
			}
			continue
		}
		for a := 0; a < k; a++ {
			for b := 0; b < k; b++ {
				cov.Set(a, b, cov.At(a, b)+vecs.At(a, c)*vecs.At(b, c)/lam)
			}
		}
	}
	for a := 0; a < k; a++ {
		zero := JtJ.At(a, a) == 0
		undetermined[a] = undetermined[a] || zero
		for b := 0; b < k; b++ {
			if zero || JtJ.At(b, b) == 0 {
				// A column of zeros has no variance and no correlation;
				// the eigenvectors' round-off would give it both.
				cov.Set(a, b, 0)
				continue
			}
			cov.Set(a, b, cov.At(a, b)*cols[a].sign*cols[b].sign/(scale[a]*scale[b]))
		}
	}
	return cov, undetermined, true
}

// intervals sets standard errors and 95 % Student-t intervals from the
// covariance in reported units, kept inside each quantity's domain:
// weights ≥ 0, dispersion and shape parameters within their bounds, |α|
// (no shear information) and a half angle within [0°, 90°]. An angle whose
// interval is wider than its 180° period is not determined.
func (r *Result) intervals(p *Problem, cols []jcol, cov *mat.Dense, undetermined []bool, dof int) {
	tq := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(dof)}.Quantile(0.975)
	nw := len(r.Structure.Terms)
	for a, c := range cols {
		est := &r.Estimates[c.est]
		if undetermined[a] {
			if est.Status == StatusEstimated {
				est.Status = StatusNotDetermined
			}
			continue
		}
		if est.Status != StatusEstimated {
			continue
		}
		se := math.Sqrt(cov.At(a, a))
		lo, hi := est.Value-tq*se, est.Value+tq*se
		if est.Kind == "angle" && hi-lo > 180 {
			est.Status = StatusNotDetermined
			r.Flags = append(r.Flags, fmt.Sprintf("%s is not determined by the data: its 95 %% interval (±%.3g°) is wider than the 180° period of a fibre angle", est.Name, tq*se))
			continue
		}
		dlo, dhi := math.Inf(-1), math.Inf(1)
		if c.est < nw {
			dlo = 0
		} else if q := r.e.params[c.est-nw]; q.Kind == kindAngle {
			switch {
			case !q.Periodic:
				dlo, dhi = Deg(q.Lo), Deg(q.Hi)
			case !p.HasShear:
				dlo, dhi = 0, 90
			}
		} else {
			dlo, dhi = q.Lo, q.Hi
		}
		est.StdErr, est.Lo, est.Hi = se, math.Max(lo, dlo), math.Min(hi, dhi)
		if est.Kind != "angle" && se > math.Abs(est.Value) {
			r.Flags = append(r.Flags, fmt.Sprintf("%s is hardly determined by the data: its standard error %.3g exceeds its value %.3g", est.Name, se, est.Value))
		}
	}
}

// correlations fills the correlation matrix of the fitted quantities, flags
// pairs with |r| > CorrelationFlagLevel, marks their members correlated and
// states, per connected block of such pairs, the combination the data
// determine.
func (r *Result) correlations(cols []jcol, cov *mat.Dense) {
	k := len(cols)
	names := make([]string, k)
	for a, c := range cols {
		names[a] = r.Estimates[c.est].Name
	}
	r.CorrelationNames = names
	r.Correlation = make([][]float64, k)
	for a := 0; a < k; a++ {
		r.Correlation[a] = make([]float64, k)
		for b := 0; b < k; b++ {
			if d := math.Sqrt(cov.At(a, a) * cov.At(b, b)); d > 0 {
				r.Correlation[a][b] = cov.At(a, b) / d
			}
		}
	}
	linked := make([][]int, k)
	for a := 0; a < k; a++ {
		for b := 0; b < a; b++ {
			c := r.Correlation[a][b]
			if math.Abs(c) <= CorrelationFlagLevel {
				continue
			}
			ea, eb := &r.Estimates[cols[a].est], &r.Estimates[cols[b].est]
			if ea.Status == StatusDegenerate || eb.Status == StatusDegenerate {
				// Its own flag says the data do not support it; a
				// correlation with a term of weight 1e-47 says nothing
				// more (r = 1.000 with the family's angle, say).
				continue
			}
			r.Flags = append(r.Flags, fmt.Sprintf("%s and %s are not separately determined (r = %.3f)", names[b], names[a], c))
			if ea.Status == StatusEstimated || ea.Status == StatusCorrelated {
				if eb.Status == StatusEstimated || eb.Status == StatusCorrelated {
					ea.Status, eb.Status = StatusCorrelated, StatusCorrelated
					linked[a] = append(linked[a], b)
					linked[b] = append(linked[b], a)
				}
			}
		}
	}
	// Connected blocks, in order of their first member.
	seen := make([]bool, k)
	for a := 0; a < k; a++ {
		if seen[a] || len(linked[a]) == 0 {
			continue
		}
		block := []int{a}
		seen[a] = true
		for i := 0; i < len(block); i++ {
			for _, b := range linked[block[i]] {
				if !seen[b] {
					seen[b] = true
					block = append(block, b)
				}
			}
		}
		sort.Ints(block)
		if c, ok := r.combination(cols, cov, block); ok {
			r.Combinations = append(r.Combinations, c)
		}
	}
}
func (r *Result) anyFibreActive() bool {
	for i, t := range r.Structure.Terms {
		if t.Family >= 0 && r.Weights != nil && r.Weights[i] > 0 {
			return true
		}
	}
	return false
}
