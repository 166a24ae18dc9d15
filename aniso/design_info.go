package aniso

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// infoBase is the information of the fitted data about the estimated
// quantities under one sign variant of the fitted model: JᵀJ with its
// columns scaled to unit norm (the scale cancels from every score), its
// log determinant and the diagonal of its inverse.
type infoBase struct {
	scale   []float64
	m       *mat.SymDense
	logdet  float64
	invDiag []float64
}

// StressJacobian returns the Jacobian of the weighted stresses of r's
// model on the rows of q (a Problem with its own row weights) with respect
// to r's estimated quantities whose status is estimated or correlated: one
// column per quantity, named by its Estimate name, angles per radian. The
// weights, shape parameters and family angles are those of m, which must be
// r's fitted model or one that differs from it only in its family angles
// (a sign variant, or the model seen from turned tester axes). It is the
// Gauss–Newton Jacobian behind r's covariance (Bates & Watts 1988) when q
// is the problem r was fitted on and m is r.Model.
func (r *Result) StressJacobian(q *Problem, m *Model) ([]string, [][]float64, error) {
	if r.e == nil {
		return nil, nil, errors.New("the result holds no fit to differentiate")
	}
	var est []int
	for j, e := range r.Estimates {
		if (e.Status == StatusEstimated || e.Status == StatusCorrelated) && j < len(r.Structure.Terms)+len(r.e.params) {
			est = append(est, j)
		}
	}
	cols, err := r.jacobian(q, m, est)
	if err != nil {
		return nil, nil, err
	}
	names := make([]string, len(est))
	for a, j := range est {
		names[a] = r.Estimates[j].Name
	}
	return names, cols, nil
}

// jacobian returns the columns of StressJacobian for the Estimate indices
// est: a weight's column is its design group's stress column, a non-linear
// parameter's the derivative of the model's stress, Σ_g w_g ∂A_g/∂θ
// (engine.derivatives).
func (r *Result) jacobian(q *Problem, m *Model, est []int) ([][]float64, error) {
	if len(m.Terms) != len(r.e.model.Terms) {
		return nil, errors.New("the model does not have the fit's terms")
	}
	e := newEngine(q, cloneModelDeep(m), r.e.groups, r.e.famOf, r.e.layout, r.e.params)
	q.Data.Fill(e.model, &e.cols, true)
	copy(e.w, r.e.w)
	e.derivatives()
	nw := len(r.Structure.Terms)
	// q's rows are weighted canonically (RowWeight × q.Scale) and the
	// fit's weights are in units of its own Scale (Problem.Scale): bring
	// both back to physical units, weighted by q's RowWeight.
	wScale, vScale := 1/q.Scale, r.e.p.Scale/q.Scale
	cols := make([][]float64, len(est))
	for a, j := range est {
		if j < nw {
			c := make([]float64, e.rows)
			for _, k := range e.groups[j] {
				src := e.cols.A[k*e.rows : (k+1)*e.rows]
				for i := range c {
					c[i] += src[i]
				}
			}
			for i := range c {
				c[i] *= wScale
			}
			cols[a] = c
		} else {
			c := append([]float64(nil), e.v[j-nw]...)
			for i := range c {
				c[i] *= vScale
			}
			cols[a] = c
		}
		for _, x := range cols[a] {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return nil, fmt.Errorf("the stress of %s overflows along the planned path", r.Estimates[j].Name)
			}
		}
	}
	return cols, nil
}

// crossProducts returns JᵀJ of the columns, each scaled by 1/scale.
func crossProducts(cols [][]float64, scale []float64) *mat.SymDense {
	k := len(cols)
	m := mat.NewSymDense(k, nil)
	for a := 0; a < k; a++ {
		for b := 0; b <= a; b++ {
			s := 0.0
			for i, x := range cols[a] {
				s += x * cols[b][i]
			}
			m.SetSym(a, b, s/(scale[a]*scale[b]))
		}
	}
	return m
}

// ridge is added to the diagonal of a unit-scaled information matrix that
// is not numerically positive definite (quantities the data determine only
// in combination), so that its log determinant stays finite.
const ridge = 1e-12

// logdetInv returns log det m and the diagonal of m⁻¹, adding ridge to
// the diagonal when m is not numerically positive definite.
func logdetInv(m *mat.SymDense) (float64, []float64, error) {
	var ch mat.Cholesky
	if !ch.Factorize(m) {
		k := m.SymmetricDim()
		r := mat.NewSymDense(k, nil)
		r.CopySym(m)
		for a := 0; a < k; a++ {
			r.SetSym(a, a, r.At(a, a)+ridge)
		}
		if !ch.Factorize(r) {
			return 0, nil, errors.New("the information matrix is not positive definite")
		}
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return 0, nil, err
	}
	diag := make([]float64, inv.SymmetricDim())
	for a := range diag {
		diag[a] = inv.At(a, a)
	}
	return ch.LogDet(), diag, nil
}

// baseInformation is the information of the fitted data under model m.
func (d *designer) baseInformation(m *Model) (infoBase, error) {
	cols, err := d.r.jacobian(d.p, m, d.est)
	if err != nil {
		return infoBase{}, err
	}
	b := infoBase{scale: make([]float64, len(cols))}
	for a, c := range cols {
		s := 0.0
		for _, x := range c {
			s += x * x
		}
		b.scale[a] = math.Sqrt(s)
		if b.scale[a] == 0 {
			b.scale[a] = 1
		}
	}
	b.m = crossProducts(cols, b.scale)
	b.logdet, b.invDiag, err = logdetInv(b.m)
	if err != nil {
		return infoBase{}, err
	}
	return b, nil
}

// gain returns the D-optimal gain of adding the rows whose Jacobian
// columns are cols, and the narrowing of each quantity's interval.
func (b *infoBase) gain(cols [][]float64) (float64, []float64, error) {
	add := crossProducts(cols, b.scale)
	k := len(cols)
	sum := mat.NewSymDense(k, nil)
	sum.AddSym(b.m, add)
	ld, diag, err := logdetInv(sum)
	if err != nil {
		return 0, nil, err
	}
	shrink := make([]float64, k)
	for a := range shrink {
		shrink[a] = 1 - math.Sqrt(diag[a]/b.invDiag[a])
	}
	return ld - b.logdet, shrink, nil
}
