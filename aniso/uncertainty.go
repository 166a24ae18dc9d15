package aniso

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// CorrelationFlagLevel is the |r| above which two estimates are flagged as
// not separately determined.
const CorrelationFlagLevel = 0.95

// uncertainty fills Estimates, Correlation and Flags from the Gauss–Newton
// covariance at the optimum, σ̂²(JᵀJ)⁻¹ with σ̂² = loss/(rows − free), J the
// Jacobian of the weighted residuals with respect to the active weights and
// the non-linear parameters (Bates & Watts 1988, Nonlinear Regression
// Analysis and Its Applications, §2.3). Weights at zero are inactive and
// parameters at a bound are held, not given a symmetric interval.
func (r *Result) uncertainty(p *Problem) {
	e := r.e
	unit := p.Specimen.StressUnit
	type col struct {
		est int
		v   []float64
	}
	var cols []col
	for g, t := range r.Structure.Terms {
		est := Estimate{Name: "weight[" + t.Label(r.Structure.Layout) + "]", Kind: "weight", Term: g, Value: e.w[g], Unit: unit,
			StdErr: math.NaN(), Lo: math.NaN(), Hi: math.NaN(), Status: "estimated"}
		if e.w[g] <= 0 {
			est.Status = "inactive"
		} else {
			cols = append(cols, col{len(r.Estimates), e.A[g*e.rows : (g+1)*e.rows]})
		}
		r.Estimates = append(r.Estimates, est)
	}
	for i, q := range e.params {
		v := r.theta[i]
		est := Estimate{Name: q.Name, Term: -1, Value: v, StdErr: math.NaN(), Lo: math.NaN(), Hi: math.NaN(), Status: "estimated"}
		switch q.Kind {
		case kindAngle:
			est.Kind, est.Unit = "angle", "deg"
			if q.Periodic {
				est.Value = wrapAngle(v) * 180 / math.Pi
				if !p.HasShear {
					// Only |α| is identified without shear information.
					est.Value = math.Abs(est.Value)
				}
			} else {
				est.Value = v * 180 / math.Pi
			}
		case kindKappa:
			est.Kind = "dispersion"
		case kindShape:
			est.Kind, est.Term = "shape", q.Group
		}
		if !q.Periodic && (v <= q.Lo || v >= q.Hi) {
			est.Status = "at-bound"
		}
		// A shape parameter of an inactive term has no effect on the fit.
		if q.Kind == kindShape && e.w[q.Group] <= 0 {
			est.Status = "inactive"
		}
		if q.Kind == kindAngle || q.Kind == kindKappa {
			if !r.anyFibreActive() {
				est.Status = "not-determined"
			}
		}
		if est.Status == "estimated" {
			cols = append(cols, col{len(r.Estimates), e.v[i]})
		}
		r.Estimates = append(r.Estimates, est)
	}
	k := len(cols)
	r.FreeParams = k
	for _, est := range r.Estimates {
		if est.Status != "inactive" {
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
	// Scale J's columns to unit norm so that the eigen-decomposition sees
	// the geometry, not the units.
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
		return
	}
	vals := eig.Values(nil)
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	maxEig := 0.0
	for _, v := range vals {
		maxEig = math.Max(maxEig, v)
	}
	// Directions the data do not see (relative eigenvalue below 1e-12) make
	// every quantity that loads on them undetermined.
	cov := mat.NewDense(k, k, nil)
	undetermined := make([]bool, k)
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
	sigma2 := r.Loss / float64(n-k)
	tq := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(n - k)}.Quantile(0.975)
	names := make([]string, k)
	for a := range cols {
		est := &r.Estimates[cols[a].est]
		names[a] = est.Name
		if undetermined[a] {
			est.Status = "not-determined"
			continue
		}
		se := math.Sqrt(sigma2*cov.At(a, a)) / scale[a]
		if est.Kind == "angle" {
			se *= 180 / math.Pi
		}
		est.StdErr = se
		est.Lo, est.Hi = est.Value-tq*se, est.Value+tq*se
		if est.Kind != "angle" && se > math.Abs(est.Value) {
			r.Flags = append(r.Flags, fmt.Sprintf("%s is hardly determined by the data: its standard error %.3g exceeds its value %.3g", est.Name, se, est.Value))
		}
	}
	r.CorrelationNames = names
	r.Correlation = make([][]float64, k)
	for a := 0; a < k; a++ {
		r.Correlation[a] = make([]float64, k)
		for b := 0; b < k; b++ {
			d := math.Sqrt(cov.At(a, a) * cov.At(b, b))
			if d > 0 {
				r.Correlation[a][b] = cov.At(a, b) / d
			}
		}
	}
	for a := 0; a < k; a++ {
		for b := 0; b < a; b++ {
			if c := r.Correlation[a][b]; math.Abs(c) > CorrelationFlagLevel {
				r.Flags = append(r.Flags, fmt.Sprintf("%s and %s are not separately determined (r = %.3f)", names[b], names[a], c))
			}
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

// Predict returns the model's stress on every row of p, unweighted, in the
// problem's stress measure and unit (for metrics, held-out protocols and
// fit tables).
func Predict(p *Problem, m *Model) ([]float64, error) {
	c, err := unweightedColumns(p, m)
	if err != nil {
		return nil, err
	}
	out := make([]float64, c.Rows)
	for k, t := range m.Terms {
		if t.Weight == 0 {
			continue
		}
		col := c.A[k*c.Rows : (k+1)*c.Rows]
		for r := range out {
			out[r] += mul0(t.Weight, col[r])
		}
	}
	return out, nil
}

// unweightedColumns fills m's stress columns on p's points without the
// residual weights: each term's stress per unit weight in the problem's
// measure and unit.
func unweightedColumns(p *Problem, m *Model) (*Columns, error) {
	F := make([][4]float64, p.Data.Points())
	for i := range F {
		F[i] = p.Data.Kinematics(i).F
	}
	d, err := NewDataset(F, p.Output, nil)
	if err != nil {
		return nil, err
	}
	c := &Columns{}
	d.Fill(m, c, false)
	return c, nil
}

// Metrics returns R², RMSE and normalised RMSE per protocol and component
// of model predictions pred on p's rows.
func Metrics(p *Problem, pred []float64) []Metric {
	var out []Metric
	for _, pi := range p.Protocols {
		for _, c := range p.Output.Components {
			var meas, mod []float64
			for r := range p.Measured {
				if p.RowProtocol[r] == pi && p.RowComponent[r] == c {
					meas = append(meas, p.Measured[r])
					mod = append(mod, pred[r])
				}
			}
			out = append(out, metric(p.Specimen.Protocols[pi].Label, componentName(c), meas, mod))
		}
	}
	return out
}

func componentName(c Component) string { return [...]string{"11", "22", "12", "21"}[c] }

func metric(label, comp string, meas, mod []float64) Metric {
	m := Metric{Protocol: label, Component: comp, Points: len(meas)}
	if len(meas) == 0 {
		return m
	}
	// Work in units of the largest measured magnitude so that squares of
	// extreme stresses cannot overflow.
	sc := 0.0
	for _, v := range meas {
		sc = math.Max(sc, math.Abs(v))
	}
	if sc == 0 || math.IsInf(sc, 0) {
		sc = 1
	}
	mean, lo, hi := 0.0, math.Inf(1), math.Inf(-1)
	for _, v := range meas {
		mean += v / sc
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	mean /= float64(len(meas))
	ssr, sst := 0.0, 0.0
	for i, v := range meas {
		d := (mod[i] - v) / sc
		ssr += d * d
		sst += (v/sc - mean) * (v/sc - mean)
	}
	m.Range = hi - lo
	m.RMSE = math.Sqrt(ssr/float64(len(meas))) * sc
	if sst > 0 && !math.IsInf(ssr, 0) {
		m.R2, m.R2Defined = 1-ssr/sst, true
	}
	if m.Range > 0 {
		m.NRMSE, m.NRMSEDefined = m.RMSE/m.Range, true
	}
	return m
}

func (r *Result) metrics(p *Problem) {
	pred, err := Predict(p, r.Model)
	if err != nil {
		return
	}
	r.Metrics = Metrics(p, pred)
}
