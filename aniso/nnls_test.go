package aniso

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// The active-set solver against the definition of non-negative least
// squares: over every subset S of the allowed columns, the unconstrained
// least-squares weights on S solved by gonum (mat.Dense.Solve); the
// solution is the feasible one (every weight ≥ 0) of lowest objective
// ½ wᵀG w − bᵀw (Lawson & Hanson 1974, ch. 23: the solution is the
// unconstrained optimum on its own support). Random problems of 6 columns,
// some nearly collinear, with and without a mask of allowed columns.
func TestNNLSAgainstEnumeration(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	const n, rows = 6, 30
	var q nnls
	for trial := 0; trial < 200; trial++ {
		A := mat.NewDense(rows, n, nil)
		y := make([]float64, rows)
		for r := 0; r < rows; r++ {
			for j := 0; j < n; j++ {
				A.Set(r, j, rng.NormFloat64())
			}
			y[r] = rng.NormFloat64()
		}
		if trial%4 == 1 {
			// Two nearly collinear columns.
			for r := 0; r < rows; r++ {
				A.Set(r, 5, A.At(r, 4)+1e-3*rng.NormFloat64())
			}
		}
		var Gm mat.Dense
		Gm.Mul(A.T(), A)
		G := make([]float64, n*n)
		b := make([]float64, n)
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				G[i*n+j] = Gm.At(i, j)
			}
			for r := 0; r < rows; r++ {
				b[i] += A.At(r, i) * y[r]
			}
		}
		var allowed []bool
		if trial%2 == 0 {
			allowed = make([]bool, n)
			for j := range allowed {
				allowed[j] = rng.IntN(4) > 0
			}
		}
		got := append([]float64(nil), q.solve(G, b, n, allowed)...)
		want := enumerateNNLS(G, b, n, allowed)
		objective := func(w []float64) float64 {
			o := 0.0
			for i := 0; i < n; i++ {
				o -= b[i] * w[i]
				for j := 0; j < n; j++ {
					o += 0.5 * w[i] * G[i*n+j] * w[j]
				}
			}
			return o
		}
		og, ow := objective(got), objective(want)
		if og > ow+1e-9*math.Max(1, math.Abs(ow)) {
			t.Fatalf("trial %d: objective %.12g, enumeration %.12g (weights %v, want %v)", trial, og, ow, got, want)
		}
		for j := range got {
			if got[j] < 0 || (allowed != nil && !allowed[j] && got[j] != 0) {
				t.Fatalf("trial %d: weight %d = %g (allowed %v)", trial, j, got[j], allowed)
			}
			if trial%4 != 1 && math.Abs(got[j]-want[j]) > 1e-7*math.Max(1, math.Abs(want[j])) {
				t.Fatalf("trial %d: weight %d = %.12g, enumeration %.12g", trial, j, got[j], want[j])
			}
		}
	}
}

// enumerateNNLS solves non-negative least squares from the cross products
// by trying every support.
func enumerateNNLS(G, b []float64, n int, allowed []bool) []float64 {
	best, bestW := 0.0, make([]float64, n)
	for set := 1; set < 1<<n; set++ {
		var idx []int
		ok := true
		for j := 0; j < n; j++ {
			if set&(1<<j) != 0 {
				if allowed != nil && !allowed[j] {
					ok = false
				}
				idx = append(idx, j)
			}
		}
		if !ok {
			continue
		}
		m := len(idx)
		Gs := mat.NewDense(m, m, nil)
		bs := mat.NewVecDense(m, nil)
		for a, i := range idx {
			for c, j := range idx {
				Gs.Set(a, c, G[i*n+j])
			}
			bs.SetVec(a, b[i])
		}
		var ws mat.VecDense
		if err := ws.SolveVec(Gs, bs); err != nil {
			continue
		}
		w := make([]float64, n)
		feasible := true
		for a, i := range idx {
			w[i] = ws.AtVec(a)
			feasible = feasible && w[i] >= 0
		}
		if !feasible {
			continue
		}
		o := 0.0
		for i := 0; i < n; i++ {
			o -= b[i] * w[i]
			for j := 0; j < n; j++ {
				o += 0.5 * w[i] * G[i*n+j] * w[j]
			}
		}
		if o < best {
			best, bestW = o, w
		}
	}
	return bestW
}

// solvePassive reuses the Cholesky rows of the passive indices it shares
// with the last passive set it factorised for the same G. Row i of a
// Cholesky factor depends only on the leading i+1 rows and columns of the
// matrix (common practice: the row-by-row Cholesky–Banachiewicz order),
// so the reused rows must give the same bits as a factorisation from
// scratch. Checked here against such a factorisation (choleskyFromScratch,
// the solver's own arithmetic without the reuse) after every step of
// random sequences of passive sets on one G (some indefinite, so that
// factorisations fail part way), and across problems of
// different sizes sharing one solver (whose reuse must restart per G).
func TestNNLSPassiveReuseBitForBit(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 13))
	var q nnls
	for trial := 0; trial < 300; trial++ {
		n := 2 + rng.IntN(9)
		G, b := randomNNLSProblem(rng, n, trial%3 == 1)
		q.solve(G, b, n, nil) // a G of its own leaves its rows behind
		G, b = randomNNLSProblem(rng, n, trial%3 == 2)
		if trial%4 == 3 {
			// An indefinite G, so that some passive sets fail part way
			// through the factorisation and leave rows unfinished.
			for j := 0; j < n; j++ {
				G[j*n+j] -= 2.5 * float64(n)
			}
		}
		q.resize(n)
		for step := 0; step < 12; step++ {
			// Flip one or two indices of the passive set, as the active-set
			// method does: mostly a shared prefix, sometimes none.
			for f := 0; f < 1+rng.IntN(2); f++ {
				j := rng.IntN(n)
				q.passive[j] = !q.passive[j]
			}
			ok := q.solvePassive(G, b, n)
			want, wantOK := choleskyFromScratch(G, b, n, q.passive)
			if ok != wantOK {
				t.Fatalf("trial %d step %d: solved %v, from scratch %v", trial, step, ok, wantOK)
			}
			if !ok {
				continue
			}
			for j := 0; j < n; j++ {
				if math.Float64bits(q.s[j]) != math.Float64bits(want[j]) {
					t.Fatalf("trial %d step %d: s[%d] = %v, from scratch %v", trial, step, j, q.s[j], want[j])
				}
			}
		}
	}
}

// randomNNLSProblem returns G = AᵀA and b = Aᵀy of a random 3n × n A,
// with two nearly collinear columns when collinear.
func randomNNLSProblem(rng *rand.Rand, n int, collinear bool) (G, b []float64) {
	rows := 3 * n
	A := make([]float64, rows*n)
	y := make([]float64, rows)
	for r := 0; r < rows; r++ {
		for j := 0; j < n; j++ {
			A[r*n+j] = rng.NormFloat64()
		}
		if collinear {
			A[r*n+n-1] = A[r*n+n-2] + 1e-7*rng.NormFloat64()
		}
		y[r] = rng.NormFloat64()
	}
	G, b = make([]float64, n*n), make([]float64, n)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			for r := 0; r < rows; r++ {
				G[i*n+j] += A[r*n+i] * A[r*n+j]
			}
		}
		for r := 0; r < rows; r++ {
			b[i] += A[r*n+i] * y[r]
		}
	}
	return G, b
}

// choleskyFromScratch solves G_PP s_P = b_P with the solver's ridge and
// order of operations, factorising every row.
func choleskyFromScratch(G, b []float64, n int, passive []bool) ([]float64, bool) {
	var idx []int
	for j := 0; j < n; j++ {
		if passive[j] {
			idx = append(idx, j)
		}
	}
	m := len(idx)
	L := make([]float64, m*m)
	for i := 0; i < m; i++ {
		for j := 0; j <= i; j++ {
			v := G[idx[i]*n+idx[j]]
			if i == j {
				v += nnlsRidge * math.Max(1, v)
			}
			for k := 0; k < j; k++ {
				v -= L[i*m+k] * L[j*m+k]
			}
			if i == j {
				if !(v > 0) {
					return nil, false
				}
				L[i*m+i] = math.Sqrt(v)
			} else {
				L[i*m+j] = v / L[j*m+j]
			}
		}
	}
	z := make([]float64, m)
	for i := 0; i < m; i++ {
		v := b[idx[i]]
		for k := 0; k < i; k++ {
			v -= L[i*m+k] * z[k]
		}
		z[i] = v / L[i*m+i]
	}
	for i := m - 1; i >= 0; i-- {
		v := z[i]
		for k := i + 1; k < m; k++ {
			v -= L[k*m+i] * z[k]
		}
		z[i] = v / L[i*m+i]
	}
	s := make([]float64, n)
	for i, j := range idx {
		s[j] = z[i]
	}
	return s, true
}

// A target with +Inf and NaN cross products (an overflowing column)
// leaves every weight at zero, whichever comes first: the tolerance on
// Aᵀy is then +Inf (math.Max's rule for NaN against +Inf) or NaN (the
// built-in max's), and no column passes it either way, so the two give
// the same weights (common practice: IEEE 754 comparisons with NaN are
// false).
func TestNNLSNonFiniteTargetLeavesWeightsZero(t *testing.T) {
	G := []float64{1, 0, 0, 0, 1, 0, 0, 0, 1}
	for _, b := range [][]float64{
		{1, math.NaN(), math.Inf(1)},
		{math.Inf(1), math.NaN(), 2},
		{math.NaN(), 3, math.Inf(1)},
	} {
		var q nnls
		for j, w := range q.solve(G, b, 3, nil) {
			if w != 0 {
				t.Errorf("b = %v: w[%d] = %v, want 0", b, j, w)
			}
		}
	}
}
