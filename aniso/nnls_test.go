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
