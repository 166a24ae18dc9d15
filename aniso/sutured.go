package aniso

import (
	"fmt"
	"math"
)

// SuturedShear returns the in-plane shears (F12, F21) that a specimen takes
// when its edges are free to shear — on sutures or rakes that pass only
// normal loads — at the normal stretches F11 = stretch1, F22 = stretch2: the
// shears at which both nominal shear stresses vanish, P12 = P21 = 0. An
// off-axis fibre family makes such a specimen shear (common practice; Sacks
// 2000, J Biomech Eng 122:23–30). start is the first guess (the previous
// point's solution along a path). Newton's method with a central-difference
// Jacobian.
func (m *Model) SuturedShear(stretch1, stretch2 float64, start [2]float64) ([2]float64, error) {
	x := start
	res := func(x [2]float64) ([2]float64, error) {
		r, err := m.Evaluate([4]float64{stretch1, x[0], x[1], stretch2})
		return [2]float64{r.Nominal[2], r.Nominal[3]}, err
	}
	scale := 1.0
	if r, err := m.Evaluate([4]float64{stretch1, 0, 0, stretch2}); err == nil {
		scale = math.Max(math.Abs(r.Nominal[0])+math.Abs(r.Nominal[1]), 1e-12)
	}
	for it := 0; it < 60; it++ {
		r, err := res(x)
		if err != nil {
			return x, err
		}
		if math.Abs(r[0])+math.Abs(r[1]) < 1e-13*scale {
			return x, nil
		}
		const h = 1e-7
		var J [2][2]float64
		for j := 0; j < 2; j++ {
			xp, xm := x, x
			xp[j] += h
			xm[j] -= h
			rp, err1 := res(xp)
			rm, err2 := res(xm)
			if err1 != nil || err2 != nil {
				return x, fmt.Errorf("stress overflows near F12=%g, F21=%g", x[0], x[1])
			}
			J[0][j], J[1][j] = (rp[0]-rm[0])/(2*h), (rp[1]-rm[1])/(2*h)
		}
		det := J[0][0]*J[1][1] - J[0][1]*J[1][0]
		if det == 0 {
			return x, fmt.Errorf("singular shear response at stretches %g, %g", stretch1, stretch2)
		}
		x[0] += (-r[0]*J[1][1] + r[1]*J[0][1]) / det
		x[1] += (-J[0][0]*r[1] + J[1][0]*r[0]) / det
	}
	return x, fmt.Errorf("the shear of a sutured specimen did not converge at stretches %g, %g", stretch1, stretch2)
}
