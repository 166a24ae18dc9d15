package aniso

import (
	"math"
)

// nnls solves min ‖A w − y‖² subject to w ≥ 0 from the cross products
// G = AᵀA and b = Aᵀy, with the active-set method of Lawson & Hanson 1974
// in the cross-product form of Bro & De Jong 1997 (J Chemometrics
// 11:393–401). Working on G keeps the cost independent of the number of
// data rows, which is what makes subset searches cheap.
//
// The caller scales columns so that diag(G) is about 1; a small ridge keeps
// nearly collinear columns solvable. It reuses its buffers.
type nnls struct {
	n       int
	passive []bool
	w, s    []float64
	grad    []float64
	idx     []int
	nz      []int
	chol    []float64
	rhs     []float64
	// done rows of chol (stride n) are the Cholesky rows of the passive
	// indices prev[:done] for the current G: row i depends only on
	// G and the first i+1 passive indices, so a passive set that shares
	// a prefix with the last one factorised reuses those rows, bit for bit.
	prev []int
	done int
}

// nnlsRidge is added to diag(G) of the passive set: far below any
// resolvable difference between unit-norm columns, but enough to keep the
// Cholesky factorisation of nearly collinear columns from failing.
const nnlsRidge = 1e-11

func (q *nnls) resize(n int) {
	q.n = n
	if cap(q.w) < n {
		q.passive = make([]bool, n)
		q.w = make([]float64, n)
		q.s = make([]float64, n)
		q.grad = make([]float64, n)
		q.idx = make([]int, n)
		q.nz = make([]int, 0, n)
		q.chol = make([]float64, n*n)
		q.rhs = make([]float64, n)
		q.prev = make([]int, n)
	}
	q.done = 0
	q.passive = q.passive[:n]
	q.w, q.s, q.grad = q.w[:n], q.s[:n], q.grad[:n]
}

// solve returns w (a view into q's buffer) for the n×n row-major G and b,
// restricted to the columns allowed[j] (nil: all).
func (q *nnls) solve(G, b []float64, n int, allowed []bool) []float64 {
	q.resize(n)
	for j := 0; j < n; j++ {
		q.passive[j] = false
		q.w[j] = 0
	}
	// The built-in max (inlined; math.Max is a call) differs from
	// math.Max only for NaN against +Inf (NaN instead of +Inf): then tol
	// is NaN instead of +Inf, and either way no column passes g > tol, so
	// the weights are the same zeros.
	scale := 0.0
	for j := 0; j < n; j++ {
		scale = max(scale, math.Abs(b[j]))
	}
	tol := 1e-12 * max(scale, 1e-300)
	for outer := 0; outer < 3*n+3; outer++ {
		// Gradient of −½‖Aw − y‖²: b − G w, summed over the nonzero
		// weights in index order (a handful of the n).
		q.nz = q.nz[:0]
		for k := 0; k < n; k++ {
			if q.w[k] != 0 {
				q.nz = append(q.nz, k)
			}
		}
		best, bj := tol, -1
		for j := 0; j < n; j++ {
			if q.passive[j] || (allowed != nil && !allowed[j]) {
				continue
			}
			g := b[j]
			for _, k := range q.nz {
				g -= G[j*n+k] * q.w[k]
			}
			if g > best {
				best, bj = g, j
			}
		}
		if bj < 0 {
			break
		}
		q.passive[bj] = true
		for inner := 0; inner < 3*n+3; inner++ {
			if !q.solvePassive(G, b, n) {
				// Numerically dependent on the passive set: drop it again.
				q.passive[bj] = false
				return q.w
			}
			ok := true
			for j := 0; j < n; j++ {
				if q.passive[j] && q.s[j] <= 0 {
					ok = false
					break
				}
			}
			if ok {
				copy(q.w, q.s)
				break
			}
			alpha := math.Inf(1)
			for j := 0; j < n; j++ {
				if q.passive[j] && q.s[j] <= 0 {
					if a := q.w[j] / (q.w[j] - q.s[j]); a < alpha {
						alpha = a
					}
				}
			}
			for j := 0; j < n; j++ {
				if q.passive[j] {
					q.w[j] += alpha * (q.s[j] - q.w[j])
					if q.w[j] <= 1e-15*max(1, math.Abs(q.s[j])) {
						q.w[j] = 0
						q.passive[j] = false
					}
				}
			}
		}
	}
	return q.w
}

// solvePassive solves G_PP s_P = b_P by Cholesky; s is zero off P.
func (q *nnls) solvePassive(G, b []float64, n int) bool {
	m := 0
	for j := 0; j < n; j++ {
		q.s[j] = 0
		if q.passive[j] {
			q.idx[m] = j
			m++
		}
	}
	L := q.chol[:n*n]
	start := 0
	for start < q.done && start < m && q.prev[start] == q.idx[start] {
		start++
	}
	for i := start; i < m; i++ {
		q.prev[i] = q.idx[i]
		for j := 0; j <= i; j++ {
			v := G[q.idx[i]*n+q.idx[j]]
			if i == j {
				v += nnlsRidge * max(1, v)
			}
			for k := 0; k < j; k++ {
				v -= L[i*n+k] * L[j*n+k]
			}
			if i == j {
				if !(v > 0) {
					q.done = i
					return false
				}
				L[i*n+i] = math.Sqrt(v)
			} else {
				L[i*n+j] = v / L[j*n+j]
			}
		}
	}
	q.done = m
	z := q.rhs[:m]
	for i := 0; i < m; i++ {
		v := b[q.idx[i]]
		for k := 0; k < i; k++ {
			v -= L[i*n+k] * z[k]
		}
		z[i] = v / L[i*n+i]
	}
	for i := m - 1; i >= 0; i-- {
		v := z[i]
		for k := i + 1; k < m; k++ {
			v -= L[k*n+i] * z[k]
		}
		z[i] = v / L[i*n+i]
	}
	for i := 0; i < m; i++ {
		q.s[q.idx[i]] = z[i]
	}
	return true
}
