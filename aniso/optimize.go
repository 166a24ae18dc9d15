package aniso

import (
	"math"
)

// cholSolve solves M X = B for symmetric positive definite n×n row-major M
// and n×k row-major B, in place in B; M is overwritten by its factor. It
// adds a relative ridge to the diagonal and reports false when M is not
// positive definite even then.
func cholSolve(M []float64, n int, B []float64, k int, ridge float64) bool {
	for i := 0; i < n; i++ {
		for j := 0; j <= i; j++ {
			v := M[i*n+j]
			if i == j {
				v += ridge * math.Max(math.Abs(v), 1e-300)
			}
			for p := 0; p < j; p++ {
				v -= M[i*n+p] * M[j*n+p]
			}
			if i == j {
				if !(v > 0) {
					return false
				}
				M[i*n+i] = math.Sqrt(v)
			} else {
				M[i*n+j] = v / M[j*n+j]
			}
		}
	}
	for c := 0; c < k; c++ {
		for i := 0; i < n; i++ {
			v := B[i*k+c]
			for p := 0; p < i; p++ {
				v -= M[i*n+p] * B[p*k+c]
			}
			B[i*k+c] = v / M[i*n+i]
		}
		for i := n - 1; i >= 0; i-- {
			v := B[i*k+c]
			for p := i + 1; p < n; p++ {
				v -= M[p*n+i] * B[p*k+c]
			}
			B[i*k+c] = v / M[i*n+i]
		}
	}
	return true
}

// project keeps θ_i within its bounds (wrapping periodic angles).
func (q *param) project(x float64) float64 {
	if q.Periodic {
		return wrapAngle(x)
	}
	return math.Min(q.Hi, math.Max(q.Lo, x))
}

// gradHess returns g = Jᵀr and H = JᵀJ over the parameters in idx, with J
// the variable-projection Jacobian (derivative vectors projected off the
// active columns). The engine must hold a derivative evaluation.
func (e *engine) gradHess(idx []int) (g, H []float64) {
	q := len(idx)
	g = make([]float64, q)
	H = make([]float64, q*q)
	// Row a of H and g[a] are dot products of v[idx[a]] with the residual
	// and with v[idx[0…a]], four at a time (dots4: the same sums, bit for
	// bit, in one pass over v[idx[a]]); -1 stands for the residual.
	cols := make([]int, 0, q+1)
	vec := func(j int) []float64 {
		if j < 0 {
			return e.r
		}
		return e.v[idx[j]]
	}
	put := func(a, j int, s float64) {
		if j < 0 {
			g[a] = s
			return
		}
		H[a*q+j], H[j*q+a] = s, s
	}
	for a, i := range idx {
		vi := e.v[i]
		cols = append(cols[:0], -1)
		for b := 0; b <= a; b++ {
			cols = append(cols, b)
		}
		k := 0
		for ; k+4 <= len(cols); k += 4 {
			s := dots4(vi, vec(cols[k]), vec(cols[k+1]), vec(cols[k+2]), vec(cols[k+3]))
			for m := range s {
				put(a, cols[k+m], s[m])
			}
		}
		for ; k < len(cols); k++ {
			put(a, cols[k], dot(vi, vec(cols[k])))
		}
	}
	act := e.activeGroups()
	p := len(act)
	if p == 0 || q == 0 {
		return g, H
	}
	// C = A_Pᵀ v (p×q), M = A_PᵀA_P; H −= Cᵀ M⁻¹ C.
	C := make([]float64, p*q)
	for a, gi := range act {
		col := e.A[gi*e.rows : (gi+1)*e.rows]
		b := 0
		for ; b+4 <= q; b += 4 {
			s := dots4(col, e.v[idx[b]], e.v[idx[b+1]], e.v[idx[b+2]], e.v[idx[b+3]])
			copy(C[a*q+b:a*q+b+4], s[:])
		}
		for ; b < q; b++ {
			C[a*q+b] = dot(col, e.v[idx[b]])
		}
	}
	M := make([]float64, p*p)
	for a, gi := range act {
		for b, gj := range act {
			M[a*p+b] = e.G[gi*e.ng+gj] * e.norm[gi] * e.norm[gj]
		}
	}
	X := append([]float64(nil), C...)
	if !cholSolve(M, p, X, q, 1e-12) {
		return g, H
	}
	for a := 0; a < q; a++ {
		for b := 0; b < q; b++ {
			s := 0.0
			for c := 0; c < p; c++ {
				s += C[c*q+a] * X[c*q+b]
			}
			H[a*q+b] -= s
		}
	}
	return g, H
}

// lmRoundoff is the relative decrease of the loss below which a trial
// step is not evaluated: about the round-off of a sum of squares over a
// few hundred to a few thousand rows, so that such a step could only be
// accepted or rejected by round-off.
const lmRoundoff = 1e-13

// lmResult reports one local minimisation.
type lmResult struct {
	Loss       float64
	Iterations int
	Evals      int
}

// minimize runs a bounded Levenberg–Marquardt iteration (Marquardt 1963)
// on the variable-projection objective from theta, changing only the
// parameters with free[i] (nil: all). theta is updated in place; on return
// the engine holds a derivative evaluation at theta.
func (e *engine) minimize(theta []float64, free []bool, maxIter int) lmResult {
	res := lmResult{}
	loss := e.eval(theta, true)
	res.Evals++
	if math.IsInf(loss, 1) {
		res.Loss = loss
		return res
	}
	lambda := 1e-3
	trial := make([]float64, len(theta))
	step := make([]float64, len(theta))
	stale := false
	small := 0
	for res.Iterations < maxIter && loss > 0 {
		res.Iterations++
		var idx []int
		for i := range theta {
			if free == nil || free[i] {
				idx = append(idx, i)
			}
		}
		if len(idx) == 0 {
			break
		}
		g, H := e.gradHess(idx)
		keep := e.unblocked(theta, idx, g)
		if len(keep) == 0 {
			break
		}
		accepted := false
		for tries := 0; tries < 12; tries++ {
			pred, ok := e.dampedStep(theta, trial, step, idx, keep, g, H, lambda)
			if !ok {
				lambda *= 10
				continue
			}
			if math.Abs(pred) < lmRoundoff*loss {
				// The model promises no change the loss's own round-off
				// would not hide, so the step could only be accepted or
				// rejected by round-off, and a larger damping would only
				// shrink it: the refinement has converged.
				break
			}
			tl := e.eval(trial, true)
			res.Evals++
			if tl < loss {
				rel := (loss - tl) / loss
				copy(theta, trial)
				loss = tl
				lambda = math.Max(lambda/3, 1e-12)
				accepted = true
				stale = false
				tol := e.tol
				if tol <= 0 {
					tol = 1e-10
				}
				if rel < tol {
					small++
				} else {
					small = 0
				}
				break
			}
			stale = true
			lambda *= 4
			if lambda > 1e12 {
				break
			}
		}
		if !accepted || small >= 2 {
			break
		}
	}
	if stale {
		loss = e.eval(theta, true)
		res.Evals++
	}
	res.Loss = loss
	return res
}

// unblocked returns the positions in idx (indices into g) of the
// parameters the descent direction does not push against a bound they are
// held at.
func (e *engine) unblocked(theta []float64, idx []int, g []float64) []int {
	var keep []int
	for a, i := range idx {
		q := &e.params[i]
		if !q.Periodic && ((theta[i] <= q.Lo && g[a] > 0) || (theta[i] >= q.Hi && g[a] < 0)) {
			continue
		}
		keep = append(keep, a)
	}
	return keep
}

// dampedStep solves the Levenberg–Marquardt system (H + λ diag) δ = −g
// over the parameters keep (positions in idx), writes θ + δ projected onto
// the bounds into trial and the step taken into step, and returns the
// decrease the Gauss–Newton model predicts for that step; ok is false
// when the damped system is not positive definite.
func (e *engine) dampedStep(theta, trial, step []float64, idx, keep []int, g, H []float64, lambda float64) (pred float64, ok bool) {
	k := len(keep)
	M := make([]float64, k*k)
	rhs := make([]float64, k)
	maxDiag := 0.0
	for a := range keep {
		maxDiag = math.Max(maxDiag, H[keep[a]*len(idx)+keep[a]])
	}
	for a, ia := range keep {
		for b, ib := range keep {
			M[a*k+b] = H[ia*len(idx)+ib]
		}
		M[a*k+a] += lambda * (H[ia*len(idx)+ia] + 1e-9*maxDiag + 1e-300)
		rhs[a] = -g[ia]
	}
	if !cholSolve(M, k, rhs, 1, 1e-12) {
		return 0, false
	}
	copy(trial, theta)
	for a, ia := range keep {
		i := idx[ia]
		trial[i] = e.params[i].project(theta[i] + rhs[a])
		step[a] = trial[i] - theta[i]
		if e.params[i].Periodic {
			step[a] = rhs[a]
		}
	}
	// The decrease the Gauss–Newton model predicts for the step taken
	// (bounds applied): −(2gᵀδ + δᵀHδ), since the loss is ‖r‖² and
	// g = Jᵀr, H = JᵀJ.
	for a, ia := range keep {
		hd := 0.0
		for b, ib := range keep {
			hd += H[ia*len(idx)+ib] * step[b]
		}
		pred -= step[a] * (2*g[ia] + hd)
	}
	return pred, true
}
