package aniso

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"
)

// The confidence band of a fitted model curve by the delta method: the
// stress s(F; q) of the fitted model depends on the estimated quantities
// q (active weights and non-linear parameters); with their Gauss–Newton
// covariance C (the one behind Result.Estimates) the variance of the
// modelled stress at F is g(F)ᵀ C g(F), g = ∂s/∂q, and the 95 % band is
// s ± t₀.₉₇₅ √(gᵀ C g) with the Student-t quantile of rows − quantities
// degrees of freedom (Bates & Watts 1988, Nonlinear Regression Analysis and
// Its Applications, §2.3.1). It is a band for the model curve — where the
// fitted curve would lie when the test were repeated — not for single new
// measurements, which scatter further by the noise. Its accuracy is that of
// the linearisation: good where the estimates' intervals are, and wide
// (not wrong) where quantities are correlated.

// Band is a fitted model's stress along a deformation path with its 95 %
// confidence band.
type Band struct {
	// Stress[i][c] is the modelled stress at the i-th deformation,
	// component c in the order 11, 22, 12, 21 (biaxial.Component), nominal
	// or Cauchy as asked (the Cauchy 21 is the 12), in the stress unit;
	// NaN where the model cannot be evaluated.
	Stress [][4]float64
	// HalfWidth[i][c] is the half-width of the 95 % confidence band (stress
	// unit): the band runs from Stress − HalfWidth to Stress + HalfWidth.
	// NaN where it cannot be computed.
	HalfWidth [][4]float64
	// Quantile is the Student-t quantile t₀.₉₇₅ used and DOF its degrees of
	// freedom (rows − estimated quantities).
	Quantile float64
	DOF      int
}

// ErrNoCovariance says that a result has no covariance to draw a band from:
// it estimated no quantity, has no more rows than quantities, or was not
// made by Fit.
var ErrNoCovariance = errors.New("the fit has no covariance of its estimates")

// bandParam is one estimated quantity of a band: a design group's weight
// (group ≥ 0) or a non-linear parameter (param ≥ 0).
type bandParam struct {
	group, param int
}

// bandParams maps the result's covariance names (Result.CorrelationNames)
// to weights and parameters of its engine.
func (r *Result) bandParams() ([]bandParam, error) {
	e := r.e
	var out []bandParam
	for _, name := range r.CorrelationNames {
		bp := bandParam{group: -1, param: -1}
		if label, ok := strings.CutPrefix(name, "weight["); ok {
			label = strings.TrimSuffix(label, "]")
			for g, t := range r.Structure.Terms {
				if t.Label(r.Structure.Layout) == label {
					bp.group = g
				}
			}
		} else {
			for i, q := range e.params {
				if q.Name == name {
					bp.param = i
				}
			}
		}
		if bp.group < 0 && bp.param < 0 {
			return nil, fmt.Errorf("estimated quantity %s has no parameter of the model form", name)
		}
		out = append(out, bp)
	}
	return out, nil
}

// PredictionJacobian returns, for each deformation F in Fs, the modelled
// stress of r's model (components 11, 22, 12, 21; nominal or Cauchy) and
// its derivative with respect to each estimated quantity named in
// r.CorrelationNames, in that order: jac[i][j][c] = ∂stress_c/∂q_j at
// Fs[i], with weights in the stress unit and angles in radians (so
// ∂stress/∂weight is dimensionless and ∂stress/∂angle in stress unit per
// radian). Weights enter linearly and are differentiated exactly;
// non-linear parameters by central differences (one-sided at a bound).
func PredictionJacobian(r *Result, Fs [][4]float64, nominal bool) (stress [][4]float64, jac [][][4]float64, err error) {
	if r.e == nil {
		return nil, nil, ErrNoCovariance
	}
	bps, err := r.bandParams()
	if err != nil {
		return nil, nil, err
	}
	e := r.e
	// Models at θ and at θ ± h for each parameter, built once; their
	// angles come from θ as the engine sets them.
	at := func(theta []float64) *Model {
		tmp := &engine{model: cloneModelDeep(r.Model), groups: e.groups, famOf: e.famOf, layout: e.layout, params: e.params}
		tmp.apply(theta)
		return tmp.model
	}
	base := at(r.theta)
	type step struct {
		lo, hi *Model
		h      float64
	}
	steps := make([]step, len(bps))
	for j, bp := range bps {
		if bp.param < 0 {
			continue
		}
		q := e.params[bp.param]
		v := r.theta[bp.param]
		h := 1e-5 * math.Max(1, math.Abs(v))
		lo, hi := v-h, v+h
		if !q.Periodic && q.Hi > q.Lo {
			lo, hi = math.Max(lo, q.Lo), math.Min(hi, q.Hi)
		}
		tl := append([]float64(nil), r.theta...)
		th := append([]float64(nil), r.theta...)
		tl[bp.param], th[bp.param] = lo, hi
		steps[j] = step{lo: at(tl), hi: at(th), h: hi - lo}
	}
	pick := func(res *Response, F [4]float64, sym Sym) [4]float64 {
		if !nominal {
			return [4]float64{sym[0], sym[1], sym[2], sym[2]}
		}
		k, _ := NewKinematics(F)
		return k.Nominal(sym)
	}
	stress = make([][4]float64, len(Fs))
	jac = make([][][4]float64, len(Fs))
	nan := [4]float64{math.NaN(), math.NaN(), math.NaN(), math.NaN()}
	for i, F := range Fs {
		jac[i] = make([][4]float64, len(bps))
		res, err := base.Evaluate(F)
		if err != nil {
			stress[i] = nan
			for j := range jac[i] {
				jac[i][j] = nan
			}
			continue
		}
		stress[i] = pick(&res, F, res.Cauchy)
		for j, bp := range bps {
			if bp.group >= 0 {
				var unit Sym
				for _, k := range e.groups[bp.group] {
					if w := base.Terms[k].Weight; w != 0 {
						c := res.TermCauchy[k]
						unit = Sym{unit[0] + c[0]/w, unit[1] + c[1]/w, unit[2] + c[2]/w}
					}
				}
				jac[i][j] = pick(&res, F, unit)
				continue
			}
			s := steps[j]
			rl, el := s.lo.Evaluate(F)
			rh, eh := s.hi.Evaluate(F)
			if el != nil || eh != nil || !(s.h > 0) {
				jac[i][j] = nan
				continue
			}
			pl, ph := pick(&rl, F, rl.Cauchy), pick(&rh, F, rh.Cauchy)
			for c := range jac[i][j] {
				jac[i][j][c] = (ph[c] - pl[c]) / s.h
			}
		}
	}
	return stress, jac, nil
}

// ConfidenceBand returns the fitted model of r along the deformations Fs
// (nominal or Cauchy stress) with its pointwise 95 % confidence band from
// the Gauss–Newton covariance of r's estimates on problem p (see the note
// above). The covariance is that of Result.Estimates: the Jacobian of the
// weighted residuals at the optimum, pseudo-inverted where the data do not
// see a direction, scaled by loss/(rows − quantities).
func ConfidenceBand(p *Problem, r *Result, Fs [][4]float64, nominal bool) (*Band, error) {
	if r.e == nil || len(r.CorrelationNames) == 0 || r.Rows <= len(r.CorrelationNames) {
		return nil, ErrNoCovariance
	}
	bps, err := r.bandParams()
	if err != nil {
		return nil, err
	}
	// The engine's columns and derivative vectors at the optimum (other
	// evaluations, e.g. of the profiles, may have moved them).
	e := r.e
	e.eval(r.theta, true)
	cols := make([]jcol, len(bps))
	for j, bp := range bps {
		if bp.group >= 0 {
			cols[j] = jcol{est: j, v: e.A[bp.group*e.rows : (bp.group+1)*e.rows], sign: 1}
		} else {
			cols[j] = jcol{est: j, v: e.v[bp.param], sign: 1}
		}
	}
	cov, _, ok := covariance(cols)
	if !ok {
		return nil, ErrNoCovariance
	}
	k := len(cols)
	dof := r.Rows - k
	sigma2 := r.Loss / float64(dof)
	// The fitter's weights are in units of p.Scale (Problem.Scale); the
	// Jacobian below is per weight in the stress unit.
	unit := make([]float64, k)
	for j, bp := range bps {
		unit[j] = 1
		if bp.group >= 0 {
			unit[j] = p.Scale
		}
	}
	tq := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(dof)}.Quantile(0.975)
	stress, jac, err := PredictionJacobian(r, Fs, nominal)
	if err != nil {
		return nil, err
	}
	b := &Band{Stress: stress, HalfWidth: make([][4]float64, len(Fs)), Quantile: tq, DOF: dof}
	for i := range Fs {
		for c := 0; c < 4; c++ {
			v := 0.0
			for a := 0; a < k; a++ {
				for bb := 0; bb < k; bb++ {
					v += jac[i][a][c] * cov.At(a, bb) * unit[a] * unit[bb] * jac[i][bb][c]
				}
			}
			b.HalfWidth[i][c] = tq * math.Sqrt(math.Max(v*sigma2, 0))
		}
	}
	return b, nil
}
