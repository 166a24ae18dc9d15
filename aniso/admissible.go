package aniso

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync"

	"github.com/weft-tools/weft/terms"
	"gonum.org/v1/gonum/mat"
)

// Admissibility checks of a model: stress-free reference, material
// stability and strong ellipticity over a grid of deformations, and the
// small-strain moduli.
//
// Material stability. The tangent A = ∂²W/∂F2² is a Hessian, so it is
// symmetric: its symmetric part is itself and the whole 4×4 matrix is
// tested. W is unchanged by an in-plane rigid rotation, W(R(θ)F) = W(F);
// differentiating twice at θ = 0 gives (ΩF):A:(ΩF) = σ11 + σ22 with
// Ω = [[0, −1], [1, 0]]. So wherever the in-plane stress is compressive
// enough the full 4×4 tangent is indefinite for every material — under dead
// loads a compressed membrane can rotate to relieve its load; that is a
// property of the load, not of the material. weft's criterion is therefore:
//
//	the smallest eigenvalue of A restricted to the three in-plane increments
//	orthogonal (Frobenius inner product) to the rotation increment ΩF is
//	positive.
//
// It is positive definiteness of the tangent modulo rigid rotation: no
// dead-load increment orthogonal to the rotation increment lowers the
// energy. Where the membrane is compressed, an increment that mixes the
// rotation with a deformation can still lower it (the full tangent's
// lowest mode is such a mix, not ΩF alone), so the criterion does not say
// that every increment other than a rigid rotation raises the energy. The
// smallest eigenvalue of the full 4×4 tangent is reported beside it.
//
// Strong ellipticity (the Legendre–Hadamard condition): for every pair of
// in-plane unit vectors a, b, (a⊗b):A:(a⊗b) > 0. For each direction b the
// 2×2 acoustic tensor Q(b)_ik = A_ijkl b_j b_l is formed and its smallest
// eigenvalue taken in closed form, which covers every a exactly; b is
// sampled at StabilityGrid.Directions angles evenly over [0°, 180°).

// StabilityGrid is the set of deformations a stability scan visits: every
// pure stretch (λ1, λ2) on a regular grid, and each of them with a simple
// shear added as F12 = γ or F21 = γ.
type StabilityGrid struct {
	// StretchMin and StretchMax bound λ1 and λ2 (dimensionless); default
	// 0.7 and 1.6.
	StretchMin, StretchMax float64
	// Steps is the number of stretches per axis, ends included; default 19
	// (a step of 0.05 on the default range).
	Steps int
	// ShearMax is the largest |γ|; the shears are ±ShearMax and
	// ±ShearMax/2. Default 0.3; 0 scans pure stretches only.
	ShearMax float64
	// Directions is the number of directions b sampled for strong
	// ellipticity; default 180 (1° apart).
	Directions int
}

// DefaultStabilityGrid returns the default grid: λ1, λ2 ∈ [0.7, 1.6] in
// steps of 0.05, shears ±0.15 and ±0.3, ellipticity directions 1° apart.
func DefaultStabilityGrid() StabilityGrid {
	return StabilityGrid{StretchMin: 0.7, StretchMax: 1.6, Steps: 19, ShearMax: 0.3, Directions: 180}
}

// Validate reports a grid that cannot be scanned.
func (g StabilityGrid) Validate() error {
	switch {
	case !(g.StretchMin > 0) || math.IsInf(g.StretchMax, 0) || !(g.StretchMax >= g.StretchMin):
		return fmt.Errorf("stretch range [%g, %g] must satisfy 0 < min ≤ max", g.StretchMin, g.StretchMax)
	case g.Steps < 1 || g.Steps > 1000:
		return fmt.Errorf("%d steps per axis; give 1 to 1000", g.Steps)
	case g.Steps == 1 && g.StretchMin != g.StretchMax:
		return fmt.Errorf("one step per axis needs min = max")
	case !(g.ShearMax >= 0) || math.IsInf(g.ShearMax, 0):
		return fmt.Errorf("shear %g must be a finite number ≥ 0", g.ShearMax)
	case g.Directions < 4 || g.Directions > 100000:
		return fmt.Errorf("%d ellipticity directions; give 4 to 100000", g.Directions)
	}
	return nil
}

// Stretches returns the stretches of one axis. A value within 1e-12 of 1
// is set to 1 exactly, so that the reference state is on the grid when the
// range and steps put it there.
func (g StabilityGrid) Stretches() []float64 {
	if g.Steps == 1 {
		return []float64{g.StretchMin}
	}
	out := make([]float64, g.Steps)
	for i := range out {
		v := g.StretchMin + (g.StretchMax-g.StretchMin)*float64(i)/float64(g.Steps-1)
		if math.Abs(v-1) < 1e-12 {
			v = 1
		}
		out[i] = v
	}
	return out
}

// Points returns the grid's deformations (F11, F12, F21, F22) in a fixed
// order: λ1 outer, λ2 inner, and for each pure stretch the sheared states
// F12 = −γmax, −γmax/2, γmax/2, γmax then F21 likewise.
func (g StabilityGrid) Points() [][4]float64 {
	st := g.Stretches()
	var shears []float64
	if g.ShearMax > 0 {
		shears = []float64{-g.ShearMax, -g.ShearMax / 2, g.ShearMax / 2, g.ShearMax}
	}
	out := make([][4]float64, 0, len(st)*len(st)*(1+2*len(shears)))
	for _, l1 := range st {
		for _, l2 := range st {
			out = append(out, [4]float64{l1, 0, 0, l2})
			for _, s := range shears {
				out = append(out, [4]float64{l1, s, 0, l2})
			}
			for _, s := range shears {
				out = append(out, [4]float64{l1, 0, s, l2})
			}
		}
	}
	return out
}

// PointStability is the stability of a model at one deformation.
type PointStability struct {
	// F is the deformation (F11, F12, F21, F22).
	F [4]float64
	// Cauchy is the in-plane Cauchy stress there, stress unit.
	Cauchy Sym
	// MinModuloRotation is the smallest eigenvalue of the tangent
	// restricted to increments orthogonal to the rigid rotation (stress
	// unit): weft's stability criterion, which needs it > 0.
	MinModuloRotation float64
	// MinFull is the smallest eigenvalue of the full 4×4 tangent.
	MinFull float64
	// MinEllipticity is the smallest (a⊗b):A:(a⊗b) over unit a and the
	// sampled b (stress unit); strong ellipticity needs it > 0.
	MinEllipticity float64
	// EllipticityA and EllipticityB are the a and b that attain it.
	EllipticityA, EllipticityB [2]float64
	// Resolution is the smallest eigenvalue magnitude double precision can
	// resolve here: RelativeResolution × the largest |A_ij|. Where an
	// exponential term makes the tangent huge, a slightly negative
	// eigenvalue below it is round-off, not a failure.
	Resolution float64
}

// RelativeResolution is the fraction of the tangent's largest entry below
// which an eigenvalue is not resolved in double precision (about 1e5 times
// the machine epsilon, allowing for the eigen-solvers' error growth).
const RelativeResolution = 1e-11

// fails reports whether eigenvalue v fails a criterion with tolerance tol
// at this point: it must exceed tol, unless |v| is below the point's
// resolution, where its sign is round-off (counted as unresolved instead).
func (p *PointStability) fails(v, tol float64) (fail, unresolved bool) {
	if v > tol {
		return false, false
	}
	if math.Abs(v) <= p.Resolution {
		return false, true
	}
	return true, false
}

// StabilityReport summarises a scan.
type StabilityReport struct {
	// Grid is the grid scanned.
	Grid StabilityGrid
	// Points is the number of grid points; Evaluated of them could be
	// evaluated (the others are beyond a limiting extensibility or
	// overflow, listed by NotEvaluable with the first one's F).
	Points, Evaluated, NotEvaluable int
	FirstNotEvaluable               [4]float64
	NotEvaluableReason              string
	// Tolerance is the threshold (stress unit) an eigenvalue must exceed:
	// 1e-10 times the sum of the weights, a Fung-type term's weight c taken
	// times its largest coefficient (its small-strain modulus).
	Tolerance float64
	// Unresolved counts points where a criterion's eigenvalue was within
	// the point's Resolution of zero: its sign is round-off there (the
	// tangent is dominated by huge exponential terms), so the point is
	// neither passed nor failed but reported.
	Unresolved int
	// UnstablePoints counts points failing the stability criterion;
	// WorstStability is the point with the smallest MinModuloRotation
	// (MinModuloRotation +Inf when no point was resolved).
	UnstablePoints int
	WorstStability PointStability
	// NonEllipticPoints counts points failing strong ellipticity;
	// WorstEllipticity has the smallest MinEllipticity (+Inf when no
	// point was resolved).
	NonEllipticPoints int
	WorstEllipticity  PointStability
	// FullIndefinite counts points where the full 4×4 tangent is not
	// positive definite (its smallest eigenvalue at most Tolerance:
	// indefinite, or singular to within the point's Resolution);
	// FullIndefiniteTensile those of them where both principal in-plane
	// Cauchy stresses are > 0 (there the rotation mode does not explain
	// it) and the eigenvalue is resolved (|MinFull| > Resolution): a value
	// within the resolution shows nothing, and where fibres make the
	// tangent huge it is round-off of a positive definite tangent.
	FullIndefinite, FullIndefiniteTensile int
	// NoStiffness counts points where the membrane has no stiffness: the
	// tangent is zero (every entry at most Tolerance), or a criterion's
	// eigenvalue is not resolved while the model has no matrix term
	// (MatrixWeight is 0), so nothing guarantees a positive one. An FE
	// solve of such a state is singular. FirstNoStiffness is the first
	// such point. They fail the scan and are not counted as Unresolved.
	NoStiffness      int
	FirstNoStiffness [4]float64
}

// Stable reports whether every evaluated point passed both criteria and
// had stiffness.
func (r *StabilityReport) Stable() bool {
	return r.UnstablePoints == 0 && r.NonEllipticPoints == 0 && r.NoStiffness == 0
}

// MatrixWeight is the sum of the weights of the terms without a fibre
// family (the isotropic I1, I2 and principal-stretch terms and the
// Green-strain term), stress unit: the part of the energy that is stiff
// in compression as well as in tension. A model whose MatrixWeight is 0
// carries load only through fibre terms, which switch off when their
// family is not stretched, so it has no stiffness in compression or at
// rest.
func (m *Model) MatrixWeight() float64 {
	s := 0.0
	for _, t := range m.Terms {
		if t.Family < 0 {
			s += t.Weight
		}
	}
	return s
}

// StabilityAt evaluates both criteria at one deformation with directions
// sampled directions b for ellipticity.
func (m *Model) StabilityAt(F [4]float64, directions int) (PointStability, error) {
	tg, err := m.Tangent(F)
	if err != nil {
		return PointStability{}, err
	}
	for i := range tg.A {
		for _, v := range tg.A[i] {
			if math.IsInf(v, 0) || math.IsNaN(v) {
				return PointStability{}, fmt.Errorf("the tangent overflows at F = %v", F)
			}
		}
	}
	r, err := m.Evaluate(F)
	if err != nil {
		return PointStability{}, err
	}
	p := PointStability{F: F, Cauchy: r.Cauchy}
	for i := range tg.A {
		for _, v := range tg.A[i] {
			p.Resolution = math.Max(p.Resolution, RelativeResolution*math.Abs(v))
		}
	}
	full := tg.A
	p.MinFull = minEigen4(&full)
	p.MinModuloRotation = minEigenModuloRotation(&tg.A, F)
	p.MinEllipticity, p.EllipticityA, p.EllipticityB = minEllipticity(&tg.A, directions)
	return p, nil
}

// CheckStability scans the grid. Points where the model cannot be
// evaluated are counted, not failed. The points are evaluated on every
// core; the report does not depend on how many there are.
func (m *Model) CheckStability(g StabilityGrid) (StabilityReport, error) {
	if err := g.Validate(); err != nil {
		return StabilityReport{}, err
	}
	if err := m.Validate(); err != nil {
		return StabilityReport{}, err
	}
	rep := StabilityReport{Grid: g, Tolerance: 1e-10 * m.StressScale()}
	rep.WorstStability.MinModuloRotation = math.Inf(1)
	rep.WorstEllipticity.MinEllipticity = math.Inf(1)
	matrix := m.MatrixWeight() > 0
	pts := g.Points()
	at := make([]PointStability, len(pts))
	errs := make([]error, len(pts))
	const chunk = 64
	var jobs []func()
	for lo := 0; lo < len(pts); lo += chunk {
		hi := min(lo+chunk, len(pts))
		jobs = append(jobs, func() {
			for i := lo; i < hi; i++ {
				at[i], errs[i] = m.StabilityAt(pts[i], g.Directions)
			}
		})
	}
	(&pool{n: runtime.GOMAXPROCS(0)}).run(jobs)
	for i, F := range pts {
		rep.Points++
		p, err := at[i], errs[i]
		if err != nil {
			if rep.NotEvaluable == 0 {
				rep.FirstNotEvaluable, rep.NotEvaluableReason = F, err.Error()
			}
			rep.NotEvaluable++
			continue
		}
		rep.Evaluated++
		tol := rep.Tolerance
		f1, u1 := p.fails(p.MinModuloRotation, tol)
		f2, u2 := p.fails(p.MinEllipticity, tol)
		// A zero tangent (every entry at most tol) makes every eigenvalue
		// "unresolved", but that is no stiffness, not round-off; without
		// a matrix term an unresolved eigenvalue is no stiffness as well.
		if p.Resolution <= RelativeResolution*tol || (u1 || u2) && !matrix {
			if rep.NoStiffness == 0 {
				rep.FirstNoStiffness = F
			}
			rep.NoStiffness++
			continue
		}
		if f1 {
			rep.UnstablePoints++
		}
		if f2 {
			rep.NonEllipticPoints++
		}
		if u1 || u2 {
			rep.Unresolved++
		}
		if !(p.MinFull > tol) {
			rep.FullIndefinite++
			// Only a resolved eigenvalue can show an indefinite tangent
			// under tension: on the demo membrane M1's card four tensile
			// points had MinFull between −46 and 0 kPa with a resolution
			// of 3e6 to 4e7 kPa, where the tangent's smallest eigenvalue
			// is 7.91 kPa (Weyl's inequality and 110-digit arithmetic).
			if minPrincipal(p.Cauchy) > rep.Tolerance && math.Abs(p.MinFull) > p.Resolution {
				rep.FullIndefiniteTensile++
			}
		}
		// Without failures the worst point is the smallest resolved
		// value: a positive eigenvalue within the point's resolution
		// passes (nothing fails there), but its digits are round-off, so
		// it is not reported as the smallest (on the membrane demo it
		// was 7.56 kPa where the matrix alone guarantees 8.46).
		r1 := !(math.Abs(p.MinModuloRotation) <= p.Resolution)
		r2 := !(math.Abs(p.MinEllipticity) <= p.Resolution)
		if f1 && p.MinModuloRotation < rep.WorstStability.MinModuloRotation || rep.UnstablePoints == 0 && p.MinModuloRotation < rep.WorstStability.MinModuloRotation && r1 {
			rep.WorstStability = p
		}
		if f2 && p.MinEllipticity < rep.WorstEllipticity.MinEllipticity || rep.NonEllipticPoints == 0 && p.MinEllipticity < rep.WorstEllipticity.MinEllipticity && r2 {
			rep.WorstEllipticity = p
		}
	}
	if rep.Evaluated == 0 {
		return rep, errors.New("no grid point could be evaluated: " + rep.NotEvaluableReason)
	}
	return rep, nil
}

// StressScale is the model's stress scale (stress unit), the yardstick of
// its tolerances and of an exported bulk modulus: Σ w_k, except that a
// Green-strain (Fung-type) term counts with its largest small-strain
// modulus c·max(b1, b2, |b3|, b4) rather than its weight c. Every other
// weight is a modulus or a stiffness coefficient, but c alone is not (Tong
// & Fung 1976: S11 = c (b1 E11 + b3 E22) at small strain): a fit whose
// exponent coefficients go to zero drives c up with c·b fixed (c ≈ 9e9 kPa
// on the sutured demo membrane), and a tolerance of 1e-10·c then counted
// real positive eigenvalues as failures, or the whole grid as without
// stiffness. 1 for a model whose scale is zero.
func (m *Model) StressScale() float64 {
	s := 0.0
	for _, t := range m.Terms {
		w := t.Weight
		if t.Shape != nil && t.Shape.Arg == terms.Green {
			b := 0.0
			for _, p := range t.Params {
				b = math.Max(b, math.Abs(p))
			}
			w *= b
		}
		s += w
	}
	if s == 0 {
		return 1
	}
	return s
}

// minPrincipal returns the smaller principal value of a symmetric tensor.
func minPrincipal(s Sym) float64 {
	c := 0.5 * (s[0] + s[1])
	r := math.Hypot(0.5*(s[0]-s[1]), s[2])
	return c - r
}

// ReferenceStress returns the largest |σ_ij| at F = I and the tolerance it
// must not exceed: 1e-9 times the sum of the weights (stress unit; a
// Fung-type term counted with its small-strain modulus, see StressScale).
func (m *Model) ReferenceStress() (maxAbs, tol float64, err error) {
	r, err := m.Evaluate([4]float64{1, 0, 0, 1})
	if err != nil {
		return 0, 0, err
	}
	for _, v := range r.Cauchy {
		maxAbs = math.Max(maxAbs, math.Abs(v))
	}
	return maxAbs, 1e-9 * m.StressScale(), nil
}

// minEllipticity returns min over unit a and the n sampled directions b of
// (a⊗b):A:(a⊗b), with the minimising a and b.
func minEllipticity(A *[4][4]float64, n int) (float64, [2]float64, [2]float64) {
	best := math.Inf(1)
	var ba, bb [2]float64
	for _, b := range ellipticityDirections(n) {
		// Q_ik = Σ_jl A[2i+j][2k+l] b_j b_l (acoustic tensor).
		b0, b1 := b[0], b[1]
		Q := [2][2]float64{
			{acousticEntry(A[0][0], A[0][1], A[1][0], A[1][1], b0, b1), acousticEntry(A[0][2], A[0][3], A[1][2], A[1][3], b0, b1)},
			{acousticEntry(A[2][0], A[2][1], A[3][0], A[3][1], b0, b1), acousticEntry(A[2][2], A[2][3], A[3][2], A[3][3], b0, b1)},
		}
		q12 := 0.5 * (Q[0][1] + Q[1][0])
		mid := 0.5 * (Q[0][0] + Q[1][1])
		dx := 0.5 * (Q[0][0] - Q[1][1])
		// e = mid − √(dx² + q12²) cannot beat best when mid − best > 0
		// and (mid − best)² exceeds dx² + q12² by far more than their
		// rounding: skip the exact square root then (it is most of a
		// scan's time). Anything else, overflow and NaN included, takes
		// the exact path, so the result is the same either way.
		if g := mid - best; g > 0 && g*g > (dx*dx+q12*q12)*(1+1e-9) {
			continue
		}
		rad := math.Hypot(dx, q12)
		e := mid - rad
		if e < best {
			best, ba, bb = e, acousticEigenvector(&Q, q12, e), b
		}
	}
	return best, ba, bb
}

// acousticEigenvector returns the unit eigenvector of the acoustic tensor
// Q (symmetric part, off-diagonal q12) for its eigenvalue e.
func acousticEigenvector(Q *[2][2]float64, q12, e float64) [2]float64 {
	ax, ay := q12, e-Q[0][0]
	if math.Abs(ax)+math.Abs(ay) < 1e-300 {
		ax, ay = e-Q[1][1], q12
	}
	if math.Abs(ax)+math.Abs(ay) < 1e-300 {
		ax, ay = 1, 0
	}
	h := math.Hypot(ax, ay)
	return [2]float64{ax / h, ay / h}
}

// acousticEntry is one entry Σ_jl a_jl b_j b_l of the acoustic tensor,
// summed in the order j, l = 00, 01, 10, 11 of the loop it replaces, so
// that it keeps that loop's bits; written out, it takes about half the
// time of a scan (BenchmarkCheckStability).
func acousticEntry(a00, a01, a10, a11, b0, b1 float64) float64 {
	v := 0.0
	v += a00 * b0 * b0
	v += a01 * b0 * b1
	v += a10 * b1 * b0
	v += a11 * b1 * b1
	return v
}

// ellipticityDirections returns the n directions b = (cos θ, sin θ),
// θ = πk/n, k = 0…n−1, computed once per n for every point of a scan.
func ellipticityDirections(n int) [][2]float64 {
	if v, ok := directionTables.Load(n); ok {
		return v.([][2]float64)
	}
	bs := make([][2]float64, n)
	for k := range bs {
		s, c := math.Sincos(math.Pi * float64(k) / float64(n))
		bs[k] = [2]float64{c, s}
	}
	v, _ := directionTables.LoadOrStore(n, bs)
	return v.([][2]float64)
}

// directionTables caches ellipticityDirections by n.
var directionTables sync.Map

// minEigen4 returns the smallest eigenvalue of a symmetric 4×4 matrix.
func minEigen4(A *[4][4]float64) float64 {
	var a [4][4]float64 = *A
	return minEigenJacobi(a[:], 4)
}

// minEigenModuloRotation returns the smallest eigenvalue of A restricted
// to the orthogonal complement of the rotation increment ΩF.
func minEigenModuloRotation(A *[4][4]float64, F [4]float64) float64 {
	basis := complementBasis(rotationMode(F))
	var r [4][4]float64
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			r[i][j] = quadForm(A, basis[i], basis[j])
		}
	}
	return minEigenJacobi(r[:], 3)
}

// complementBasis returns an orthonormal basis of the 3-dimensional
// complement of v (Gram–Schmidt on v and the unit vectors).
func complementBasis(v [4]float64) [3][4]float64 {
	var out [4][4]float64
	n := 0
	add := func(x [4]float64) {
		for k := 0; k < n; k++ {
			d := dot4(x, out[k])
			for i := range x {
				x[i] -= d * out[k][i]
			}
		}
		if nn := math.Sqrt(dot4(x, x)); nn > 1e-6 {
			for i := range x {
				x[i] /= nn
			}
			out[n] = x
			n++
		}
	}
	add(v)
	for k := 0; k < 4 && n < 4; k++ {
		var e [4]float64
		e[k] = 1
		add(e)
	}
	return [3][4]float64{out[1], out[2], out[3]}
}

func dot4(a, b [4]float64) float64 { return a[0]*b[0] + a[1]*b[1] + a[2]*b[2] + a[3]*b[3] }

// minEigenJacobi returns the smallest eigenvalue of the symmetric leading
// n×n block of a (n ≤ 4) by the cyclic Jacobi method (Golub & Van Loan,
// Matrix Computations, §8.5); a is overwritten.
func minEigenJacobi(a [][4]float64, n int) float64 {
	for sweep := 0; sweep < 50; sweep++ {
		off, diag := 0.0, 0.0
		for i := 0; i < n; i++ {
			diag += a[i][i] * a[i][i]
			for j := i + 1; j < n; j++ {
				off += a[i][j] * a[i][j]
			}
		}
		if off <= 1e-32*diag || off == 0 {
			break
		}
		for p := 0; p < n; p++ {
			for q := p + 1; q < n; q++ {
				if a[p][q] == 0 {
					continue
				}
				theta := (a[q][q] - a[p][p]) / (2 * a[p][q])
				t := math.Copysign(1, theta) / (math.Abs(theta) + math.Sqrt(theta*theta+1))
				c := 1 / math.Sqrt(t*t+1)
				s := t * c
				for k := 0; k < n; k++ {
					akp, akq := a[k][p], a[k][q]
					a[k][p], a[k][q] = c*akp-s*akq, s*akp+c*akq
				}
				for k := 0; k < n; k++ {
					apk, aqk := a[p][k], a[q][k]
					a[p][k], a[q][k] = c*apk-s*aqk, s*apk+c*aqk
				}
			}
		}
	}
	m := a[0][0]
	for i := 1; i < n; i++ {
		m = math.Min(m, a[i][i])
	}
	return m
}

// rotationMode returns ΩF for Ω = [[0, −1], [1, 0]], the increment of F
// under an infinitesimal in-plane rigid rotation, in the order
// (F11, F12, F21, F22).
func rotationMode(F [4]float64) [4]float64 {
	return [4]float64{-F[2], -F[3], F[0], F[1]}
}

// quadForm returns xᵀ A y.
func quadForm(A *[4][4]float64, x, y [4]float64) float64 {
	s := 0.0
	for i := range x {
		for j := range y {
			s += x[i] * A[i][j] * y[j]
		}
	}
	return s
}

// Small-strain moduli.
//
// At F = I the reference is stress-free and the tangent is the linear
// elasticity of the incompressible membrane in plane stress. Fibre and I5
// terms switch on only when their family is stretched (I4 > 1) and cofactor
// terms only when K > 1, so each adds its stiffness w·f″(0⁺)·∇x⊗∇x on one
// side only: the small-strain response is piecewise linear, and the moduli
// in tension and compression differ. weft solves the piecewise-linear
// problem exactly: for a uniaxial stress ±n⊗n it finds the set of switched
// terms whose activity agrees with the strain they produce (the energy is
// convex, so the answer is unique when the matrix alone has stiffness).

// voigt converts a 4×4 tangent at the stress-free reference to the 3×3
// stiffness D relating (σ11, σ22, σ12) to (ε11, ε22, γ12), γ12 = 2ε12.
func voigt(A *[4][4]float64) [3][3]float64 {
	var D [3][3]float64
	for k := 0; k < 3; k++ {
		var u [4]float64
		switch k {
		case 0:
			u[0] = 1
		case 1:
			u[3] = 1
		case 2:
			u[1], u[2] = 0.5, 0.5
		}
		var P [4]float64
		for i := range P {
			for j := range u {
				P[i] += A[i][j] * u[j]
			}
		}
		D[0][k], D[1][k], D[2][k] = P[0], P[3], 0.5*(P[1]+P[2])
	}
	return D
}

// voigtVec converts a gradient over F to one over (ε11, ε22, γ12).
func voigtVec(g [4]float64) [3]float64 { return [3]float64{g[0], g[3], 0.5 * (g[1] + g[2])} }

// switchedTerm is one term that acts on one side of the reference only.
type switchedTerm struct {
	index int        // into Model.Terms
	s     [3]float64 // active when s·ε > 0
	D     [3][3]float64
}

// DirectionalModulus is the small-strain uniaxial modulus along one
// direction.
type DirectionalModulus struct {
	// AngleDeg is the direction in degrees from axis 1 towards axis 2.
	AngleDeg float64
	// Tension and Compression are the moduli (stress unit) for a small
	// uniaxial tension and compression along the direction, the other
	// in-plane stresses zero; 0 means the membrane has no small-strain
	// stiffness in that mode: the stress loads a strain mode that nothing
	// engaged resists. A stiffness singular only in modes the stress does
	// not load (a Fung-type term with b4 = 0 along an axis) still gives a
	// modulus.
	Tension, Compression float64
	// TensionTerms and CompressionTerms list the indices (into
	// Model.Terms) of the one-sided terms engaged in each.
	TensionTerms, CompressionTerms []int
}

// Moduli are the small-strain moduli of a model.
type Moduli struct {
	// InitialShear is μ0 = 2 Σ w f′(0) over the I1 and I2 terms plus
	// Σ w (g′(1) + g″(1))/2 over the principal-stretch terms (w each for
	// the catalogue's shapes), in the stress unit: the shear modulus of
	// the isotropic part. A Green-strain term (Tong & Fung 1976) is
	// two-sided but not isotropic; it adds to the other moduli, not to
	// this one.
	InitialShear float64
	// ShearPositive and ShearNegative are the in-plane shear moduli
	// τ12/γ12 for a small positive and negative shear stress on the axes
	// (stress unit; they differ when fibres engage on one side only).
	ShearPositive, ShearNegative float64
	// Young holds the uniaxial moduli along the requested directions.
	Young []DirectionalModulus
	// OneSided is the number of terms whose stiffness is one-sided.
	OneSided int
}

// SmallStrainModuli returns the moduli at F = I, with uniaxial moduli
// along each of directionsDeg. Fibre terms stiffen one side only (a fibre
// in compression carries nothing), so the response to a small stress is
// found by an active-set solve: engage every one-sided piece whose
// activation s·ε is positive at the current strain, solve, repeat until
// the engaged set no longer changes (the energy is convex and piecewise
// quadratic in ε, so the set settles). The stiffness is split into its
// eigenmodes, not inverted whole, so a card without stiffness in one mode
// (a Fung-type term with b4 = 0 resists no shear) still gets the moduli of
// the stresses that do not load that mode, and 0 for those that do. A
// family spread in the plane is represented by planarModuliDirections
// directions, each weighted by the density.
func (m *Model) SmallStrainModuli(directionsDeg []float64) (Moduli, error) {
	if err := m.Validate(); err != nil {
		return Moduli{}, err
	}
	D0, mu, err := m.twoSidedModuli()
	if err != nil {
		return Moduli{}, err
	}
	sw := m.switchedTerms()
	mod := Moduli{InitialShear: mu, OneSided: countTerms(sw)}
	if eps, _, carried, ok := respond(D0, sw, [3]float64{0, 0, 1}); ok && carried && eps[2] != 0 {
		mod.ShearPositive = 1 / eps[2]
	}
	if eps, _, carried, ok := respond(D0, sw, [3]float64{0, 0, -1}); ok && carried && eps[2] != 0 {
		mod.ShearNegative = -1 / eps[2]
	}
	for _, d := range directionsDeg {
		s, c := math.Sincos(Rad(d))
		nn := [3]float64{c * c, s * s, c * s}
		dm := DirectionalModulus{AngleDeg: d}
		for _, sign := range []float64{1, -1} {
			sig := [3]float64{sign * nn[0], sign * nn[1], sign * nn[2]}
			eps, on, carried, ok := respond(D0, sw, sig)
			if !ok {
				continue
			}
			// Not carried: the strain along the direction is unbounded and
			// the modulus 0; no terms are listed, as which of them the
			// unbounded strain engages is arbitrary.
			en := eps[0]*c*c + eps[1]*s*s + eps[2]*c*s
			modulus := 0.0
			if carried && en != 0 {
				modulus = sign / en
			} else {
				on = nil
			}
			if sign > 0 {
				dm.Tension, dm.TensionTerms = modulus, on
			} else {
				dm.Compression, dm.CompressionTerms = modulus, on
			}
		}
		mod.Young = append(mod.Young, dm)
	}
	return mod, nil
}

// twoSidedModuli returns the Voigt stiffness at F = I of the terms that
// act on both sides of the reference (isotropic, principal-stretch and
// Green-strain terms) and the initial shear modulus of the isotropic ones.
// The one-sided terms are added by switchedTerms, never through the switch
// test at I4 = 1, which round-off in cos²α + sin²α could tip either way.
func (m *Model) twoSidedModuli() ([3][3]float64, float64, error) {
	iso := &Model{Families: m.Families}
	mu := 0.0
	for _, t := range m.Terms {
		switch t.Shape.Arg {
		case terms.I1, terms.I2:
			iso.Terms = append(iso.Terms, t)
			mu += 2 * t.Weight * t.Shape.Eval(0, t.Params).D1
		case terms.Green:
			iso.Terms = append(iso.Terms, t) // two-sided, but not isotropic
		case terms.Principal:
			iso.Terms = append(iso.Terms, t)
			mu += t.Weight * principalShear(t.Shape, t.Params)
		}
	}
	base, err := iso.Tangent([4]float64{1, 0, 0, 1})
	if err != nil {
		return [3][3]float64{}, 0, err
	}
	return voigt(&base.A), mu, nil
}

// planarModuliDirections is how many directions stand for a family spread
// in the plane in the small-strain moduli.
const planarModuliDirections = 180

// switchedTerms returns the one-sided pieces at F = I: each fibre,
// cofactor or I5 term of an ideal or κ-dispersed family, and each of
// planarModuliDirections directions of a term on a planar family.
func (m *Model) switchedTerms() []switchedTerm {
	q := newInvariantJets([4]float64{1, 0, 0, 1})
	var sw []switchedTerm
	for i, t := range m.Terms {
		a := t.Shape.Arg
		if (a != terms.Fibre && a != terms.Fifth && a != terms.Cofactor) || t.Weight == 0 {
			continue
		}
		fam := m.Families[t.Family]
		if !fam.Planar {
			sw = append(sw, oneSided(i, &t, fam.Angle, fam.Dispersion, t.Weight, &q))
			continue
		}
		norm, _ := density(fam.Concentration)
		const n = planarModuliDirections
		for k := 0; k < n; k++ {
			th := fam.Angle + math.Pi*(float64(k)+0.5)/n - math.Pi/2
			rho := norm * math.Exp(fam.Concentration*(math.Cos(2*(th-fam.Angle))-1))
			sw = append(sw, oneSided(i, &t, th, 0, t.Weight*rho*math.Pi/n, &q))
		}
	}
	return sw
}

// oneSided is term t at fibre angle alpha with weight w as a switched
// piece: its stiffness when engaged, the right-hand limit of f′ and f″ at
// x = 0.
func oneSided(index int, t *Term, alpha, kappa, w float64, q *invariantJets) switchedTerm {
	a := t.Shape.Arg
	I4, I5, K := q.fibreJets(alpha)
	// Force the term on: evaluate its argument as if switched on.
	forced, forcedK := I4, K
	forced.v, forcedK.v = 2, 2
	x, _ := argJet(a, kappa, q, &forced, &I5, &forcedK)
	switch a {
	case terms.Fibre:
		x.v = kappa*(q.I1.v-3) + (1-3*kappa)*(I4.v-1)
	case terms.Fifth:
		x.v = I5.v - 1
	case terms.Cofactor:
		x.v = K.v - 1
	}
	v := t.Shape.Eval(math.Max(x.v, 0)+1e-300, t.Params)
	var A [4][4]float64
	for r := range A {
		for c := range A[r] {
			A[r][c] = w * (v.D2*x.g[r]*x.g[c] + v.D1*x.h[r][c])
		}
	}
	st := switchedTerm{index: index, D: voigt(&A)}
	if a == terms.Cofactor {
		st.s = voigtVec(K.g)
	} else {
		st.s = voigtVec(I4.g)
	}
	return st
}

// countTerms returns how many model terms the pieces belong to.
func countTerms(sw []switchedTerm) int {
	n := 0
	for k, st := range sw {
		if k == 0 || st.index != sw[k-1].index {
			n++
		}
	}
	return n
}

// respond returns the small strain ε (Voigt: ε11, ε22, γ12) under the
// stress sig, with the indices of the terms engaged, by the active-set
// solve described at SmallStrainModuli. carried is false when the engaged
// stiffness does not resist sig: sig has a component along a strain mode of
// zero stiffness (a Fung-type term with b4 = 0 resists no shear, fibres
// alone nothing across them), so the strain grows without bound along eps,
// that mode, and the modulus is 0. ok is false when no consistent engaged
// set is found.
func respond(D0 [3][3]float64, sw []switchedTerm, sig [3]float64) (eps [3]float64, engaged []int, carried, ok bool) {
	on := make([]bool, len(sw))
	for k := range on {
		on[k] = true
	}
	for it := 0; it < 100; it++ {
		D := D0
		for k, st := range sw {
			if on[k] {
				for r := range D {
					for c := range D[r] {
						D[r][c] += st.D[r][c]
					}
				}
			}
		}
		eps, carried, ok = solveSym3(D, sig)
		if !ok {
			return [3]float64{}, nil, false, false
		}
		changed := false
		for k, st := range sw {
			act := st.s[0]*eps[0] + st.s[1]*eps[1] + st.s[2]*eps[2]
			scale := 1e-12 * (math.Abs(st.s[0]*eps[0]) + math.Abs(st.s[1]*eps[1]) + math.Abs(st.s[2]*eps[2]))
			want := on[k]
			switch {
			case act > scale:
				want = true
			case act < -scale:
				want = false
			}
			if want != on[k] {
				on[k], changed = want, true
			}
		}
		if !changed {
			for k, st := range sw {
				if on[k] && (len(engaged) == 0 || engaged[len(engaged)-1] != st.index) {
					engaged = append(engaged, st.index)
				}
			}
			return eps, engaged, carried, true
		}
	}
	return [3]float64{}, nil, false, false
}

// nullStiffness is the relative size below which an eigenvalue of the
// small-strain stiffness counts as zero, and nullLoad that below which a
// stress component along such a mode is round-off (cos 90° is 6e-17, not
// 0, so a uniaxial stress along axis 2 has a shear component of that size).
const (
	nullStiffness = 1e-12
	nullLoad      = 1e-10
)

// solveSym3 solves D ε = sig for the symmetric small-strain stiffness D,
// which may be singular: a card can lack stiffness in one mode and still
// carry a stress that does not load that mode (a Fung-type term with
// b4 = 0 resists no shear, yet carries a uniaxial stress along an axis).
// So D is split into its eigenmodes rather than inverted whole. When sig
// loads no zero mode, ε is the solution without a zero-mode part (any such
// part does no work against sig, so the modulus does not depend on it) and
// carried is true. Otherwise the strain along the loaded zero modes is
// unbounded: ε is the direction it grows in (the part of sig along them)
// and carried is false. ok is false when the eigendecomposition fails.
func solveSym3(D [3][3]float64, sig [3]float64) (eps [3]float64, carried, ok bool) {
	S := mat.NewSymDense(3, nil)
	for i := 0; i < 3; i++ {
		for j := i; j < 3; j++ {
			S.SetSym(i, j, (D[i][j]+D[j][i])/2)
		}
	}
	var es mat.EigenSym
	if !es.Factorize(S, true) {
		return [3]float64{}, false, false
	}
	vals := es.Values(nil)
	var V mat.Dense
	es.VectorsTo(&V)
	big, load := 0.0, 0.0
	for i, v := range vals {
		big = math.Max(big, math.Abs(v))
		load = math.Max(load, math.Abs(sig[i]))
	}
	var free [3]float64
	carried = true
	for k, v := range vals {
		c := V.At(0, k)*sig[0] + V.At(1, k)*sig[1] + V.At(2, k)*sig[2]
		if math.Abs(v) > nullStiffness*big {
			for i := range eps {
				eps[i] += c / v * V.At(i, k)
			}
			continue
		}
		if math.Abs(c) > nullLoad*load {
			carried = false
			for i := range free {
				free[i] += c * V.At(i, k)
			}
		}
	}
	if !carried {
		return free, false, true
	}
	return eps, true, true
}
