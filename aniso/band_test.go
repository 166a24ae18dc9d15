package aniso

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// For a model linear in its one weight the delta method is exact: the band
// of the neo-Hookean membrane fitted by weft equals the textbook band of
// ordinary least squares, t(n−1) · |x0| · σ̂/√(XᵀX), with x0 the stress per
// unit weight (common practice; Bates & Watts 1988, §1.1). The stress per
// unit weight comes from the closed form of the incompressible neo-Hookean
// membrane in plane stress, σ11 = 2(λ1² − 1/(λ1λ2)²) per unit C10 and
// P11 = σ11/λ1 (Holzapfel 2000, Nonlinear Solid Mechanics, §6.6).
func TestConfidenceBandLinearIsOrdinaryLeastSquares(t *testing.T) {
	truth := &Model{Terms: []Term{{Shape: lookup("i1-lin"), Family: -1, Weight: 5}}}
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.02, points: 20})
	p, err := NewProblem(spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	res, err := Fit(p, Structure{Layout: LayoutNone, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}}}, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	unit := func(F [4]float64, comp Component) float64 {
		l1, l2 := F[0], F[3]
		j2 := 1 / (l1 * l1 * l2 * l2)
		if comp == 0 {
			return 2 * (l1*l1 - j2) / l1
		}
		return 2 * (l2*l2 - j2) / l2
	}
	// Ordinary least squares on the weighted rows.
	xx, xy, n := 0.0, 0.0, p.Rows()
	xs := make([]float64, n)
	for r := 0; r < n; r++ {
		pt := spec.Protocols[p.RowProtocol[r]].Points[p.RowPoint[r]]
		xs[r] = p.RowWeight[r] * unit(pt.F, p.RowComponent[r])
		xx += xs[r] * xs[r]
		xy += xs[r] * p.Target[r]
	}
	w := xy / xx
	rss := 0.0
	for r := 0; r < n; r++ {
		d := p.Target[r] - w*xs[r]
		rss += d * d
	}
	se := math.Sqrt(rss / float64(n-1) / xx)
	tq := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(n - 1)}.Quantile(0.975)
	if math.Abs(res.Weights[0]-w) > 1e-9*w {
		t.Fatalf("weft's weight %.12g, least squares %.12g", res.Weights[0], w)
	}
	Fs := [][4]float64{{1.1, 0, 0, 1.05}, {1.2, 0, 0, 1}, {1.02, 0, 0, 1.15}}
	b, err := ConfidenceBand(p, res, Fs, true)
	if err != nil {
		t.Fatal(err)
	}
	if b.DOF != n-1 {
		t.Errorf("degrees of freedom %d, want %d", b.DOF, n-1)
	}
	for i, F := range Fs {
		for _, c := range []Component{0, 1} {
			want := tq * math.Abs(unit(F, c)) * se
			if got := b.HalfWidth[i][c]; math.Abs(got-want) > 1e-6*want {
				t.Errorf("F %v, component %d: half-width %.10g, least squares %.10g", F, c, got, want)
			}
			if got, want := b.Stress[i][c], w*unit(F, c); math.Abs(got-want) > 1e-9*math.Abs(want) {
				t.Errorf("F %v, component %d: stress %.10g, closed form %.10g", F, c, got, want)
			}
		}
	}
}

// For a non-linear one-family model the band equals the delta method done
// independently: the Jacobian of the weighted residuals and the gradient of
// the stress with respect to (matrix weight, fibre weight, angle,
// stiffening) by gonum's finite differences, the covariance σ̂²(JᵀJ)⁻¹ by
// gonum's matrix inverse (Bates & Watts 1988, §2.3.1).
func TestConfidenceBandMatchesIndependentDeltaMethod(t *testing.T) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 4}, Term{Shape: lookup("fib-expsq"), Weight: 30, Params: []float64{5}}, 30)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.01, points: 15, maxStrain: 0.2})
	p, err := NewProblem(spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	st := Structure{Layout: LayoutSingle, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}}}
	// With the angle profile, which moves the fitter's state away from
	// the optimum before the band is drawn.
	res, err := Fit(p, st, Settings{Profile: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.CorrelationNames) != 4 {
		t.Fatalf("estimated quantities %v, want the two weights, the angle and the stiffening", res.CorrelationNames)
	}
	model := func(q []float64) *Model {
		return oneFamily(Term{Shape: lookup("i1-lin"), Weight: q[0]}, Term{Shape: lookup("fib-expsq"), Weight: q[1], Params: []float64{q[3]}}, q[2]/deg)
	}
	q0 := []float64{res.Weights[0], res.Weights[1], res.Model.Families[0].Angle, res.Model.Terms[1].Params[0]}
	n := p.Rows()
	residuals := func(out, q []float64) {
		m := model(q)
		for r := 0; r < n; r++ {
			pt := spec.Protocols[p.RowProtocol[r]].Points[p.RowPoint[r]]
			resp, err := m.Evaluate(pt.F)
			if err != nil {
				t.Fatal(err)
			}
			out[r] = p.RowWeight[r]*resp.Nominal[p.RowComponent[r]] - p.Target[r]
		}
	}
	J := mat.NewDense(n, 4, nil)
	fd.Jacobian(J, residuals, q0, &fd.JacobianSettings{Formula: fd.Central})
	rv := make([]float64, n)
	residuals(rv, q0)
	rss := 0.0
	for _, x := range rv {
		rss += x * x
	}
	var jtj, cov mat.Dense
	jtj.Mul(J.T(), J)
	if err := cov.Inverse(&jtj); err != nil {
		t.Fatal(err)
	}
	cov.Scale(rss/float64(n-4), &cov)
	tq := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(n - 4)}.Quantile(0.975)
	Fs := [][4]float64{{1.1, 0, 0, 1.1}, {1.18, 0, 0, 1.05}, {1.05, 0, 0, 1.2}}
	b, err := ConfidenceBand(p, res, Fs, true)
	if err != nil {
		t.Fatal(err)
	}
	for i, F := range Fs {
		for c := 0; c < 2; c++ {
			g := fd.Gradient(nil, func(q []float64) float64 {
				resp, err := model(q).Evaluate(F)
				if err != nil {
					t.Fatal(err)
				}
				return resp.Nominal[c]
			}, q0, &fd.Settings{Formula: fd.Central})
			gv := mat.NewVecDense(4, g)
			want := tq * math.Sqrt(mat.Inner(gv, &cov, gv))
			if got := b.HalfWidth[i][c]; math.Abs(got-want) > 0.01*want {
				t.Errorf("F %v, P%d: half-width %.6g, independent delta method %.6g", F, []int{11, 22}[c], got, want)
			}
		}
	}
	t.Logf("half-widths at %v: %.4g, %.4g kPa (stress %.4g, %.4g kPa)", Fs[0], b.HalfWidth[0][0], b.HalfWidth[0][1], b.Stress[0][0], b.Stress[0][1])
}
