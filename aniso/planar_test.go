package aniso

import (
	"fmt"
	"math"
	"os"
	"sort"
	"sync"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"github.com/weft-tools/weft/terms"
)

// legendreNodes caches gonum's n-point Gauss–Legendre nodes and weights on
// [−1, 1]: computing them costs O(n²), and the brute-force references ask
// for the same few orders thousands of times.
var legendreNodes = struct {
	sync.Mutex
	m map[int][2][]float64
}{m: map[int][2][]float64{}}

// legendreRule returns gonum's n-point Gauss–Legendre nodes and weights on
// [−1, 1], cached.
func legendreRule(n int) [2][]float64 {
	legendreNodes.Lock()
	defer legendreNodes.Unlock()
	xw, ok := legendreNodes.m[n]
	if !ok {
		xw = [2][]float64{make([]float64, n), make([]float64, n)}
		quad.Legendre{}.FixedLocations(xw[0], xw[1], -1, 1)
		legendreNodes.m[n] = xw
	}
	return xw
}

// legendreFixed integrates f over [a, c] with the n-point Gauss–Legendre
// rule of gonum's quad.Legendre, as quad.Fixed does, with cached nodes.
func legendreFixed(f func(float64) float64, a, c float64, n int) float64 {
	v := legendreFixed4(func(x float64) [4]float64 { return [4]float64{f(x)} }, a, c, n)
	return v[0]
}

// legendreFixed4 is legendreFixed for four integrands sharing their nodes.
func legendreFixed4(f func(float64) [4]float64, a, c float64, n int) [4]float64 {
	xw := legendreRule(n)
	half, mid := (c-a)/2, (a+c)/2
	var s [4]float64
	for i, x := range xw[0] {
		v := f(mid + half*x)
		for j := range s {
			s[j] += xw[1][i] * v[j]
		}
	}
	for j := range s {
		s[j] *= half
	}
	return s
}

// planarRef integrates a planar family's Cauchy stress and energy per unit
// weight by brute force, independently of planar.go: the stretched ranges
// of θ are found by scanning I4(θ) − 1 = a0(θ)·C a0(θ) − 1 for sign changes
// and bisecting, each range is integrated with gonum's fixed-order
// Gauss–Legendre rule (a general-purpose library) at n points in all, and
// the density is normalised by integrating exp(b cos 2θ) over the period
// with the same rule instead of a Bessel function.
func planarRef(F [4]float64, alpha, b float64, sh *terms.Shape, p []float64, n int) (Sym, float64) {
	C := [3]float64{F[0]*F[0] + F[2]*F[2], F[1]*F[1] + F[3]*F[3], F[0]*F[1] + F[2]*F[3]}
	x := func(th float64) float64 {
		s, c := math.Sincos(th)
		return C[0]*c*c + 2*C[2]*c*s + C[1]*s*s - 1
	}
	lo, hi := alpha-math.Pi/2, alpha+math.Pi/2
	z := legendreFixed(func(th float64) float64 { return math.Exp(b * (math.Cos(2*(th-alpha)) - 1)) }, lo, hi, n)
	// Where x crosses 0 (the switch) or a level at which the shape's slope
	// is not smooth (the ends of a recruitment range, λ² − 1 at λa and
	// λa + Δ, written here from the shape's definition): sign changes on a
	// fine grid, refined by bisection.
	levels := []float64{0}
	if sh.ID == "fib-recruit" {
		levels = append(levels, p[0]*p[0]-1, (p[0]+p[1])*(p[0]+p[1])-1)
	}
	const scan = 4000
	cuts := []float64{lo}
	for i := 0; i < scan; i++ {
		for _, lv := range levels {
			a, c := lo+(hi-lo)*float64(i)/scan, lo+(hi-lo)*float64(i+1)/scan
			if (x(a) > lv) == (x(c) > lv) {
				continue
			}
			for k := 0; k < 200 && c-a > 1e-16; k++ {
				m := (a + c) / 2
				if (x(m) > lv) == (x(a) > lv) {
					a = m
				} else {
					c = m
				}
			}
			cuts = append(cuts, (a+c)/2)
		}
	}
	sort.Float64s(cuts)
	cuts = append(cuts, hi)
	var s Sym
	energy := 0.0
	per := n / (len(cuts) - 1)
	for k := 0; k+1 < len(cuts); k++ {
		a, c := cuts[k], cuts[k+1]
		if !(x((a+c)/2) > 0) {
			continue
		}
		// The three stress components and the energy, on one set of nodes.
		v := legendreFixed4(func(th float64) [4]float64 {
			e := x(th)
			if !(e > 0) {
				return [4]float64{}
			}
			rho := math.Exp(b*(math.Cos(2*(th-alpha))-1)) / z
			val := sh.Eval(e, p)
			sn, cs := math.Sincos(th)
			av := [2]float64{F[0]*cs + F[1]*sn, F[2]*cs + F[3]*sn}
			d := rho * val.D1
			return [4]float64{d * 2 * av[0] * av[0], d * 2 * av[1] * av[1], d * 2 * av[0] * av[1], rho * val.F}
		}, a, c, per)
		for comp := range s {
			s[comp] += v[comp]
		}
		energy += v[3]
	}
	return s, energy
}

// planarScale is the scale errors are measured against: the largest
// stress component, but at least 1e-4 of the stress the family would carry
// if all its fibres lay along the most stretched direction. Where the
// density puts almost nothing on stretched directions (a concentrated
// family pointing into compression) the stress is a tail of that size or
// less, and relative error of such a tail means nothing for a fit.
func planarScale(F [4]float64, sh *terms.Shape, p []float64, ref Sym) float64 {
	g := newPlanarGeom(&F)
	s := math.Max(math.Abs(ref[0]), math.Max(math.Abs(ref[1]), math.Abs(ref[2])))
	b0, _, _ := planarBases(&F)
	if x := g.A0 + g.R; x > 0 {
		s = math.Max(s, 1e-4*sh.Eval(x, p).D1*(b0[0]+b0[1]))
	}
	// Below 1e-14 of the stress scale of the deformation, a value is
	// round-off.
	return math.Max(s, 1e-14*(b0[0]+b0[1]))
}

var planarCases = [][4]float64{
	{1.2, 0, 0, 1.1},       // equibiaxial-like: every direction stretched
	{1.25, 0, 0, 0.93},     // partly compressed
	{1.18, 0.09, -0.04, 1}, // sheared
	{0.97, 0.05, 0.12, 1.15},
	{1.02, 0, 0, 0.995}, // barely stretched
}

// The quadrature Model.Evaluate uses (pointRule) against a 20 000-point
// brute-force reference: target ≤ 1e-12 relative to the largest stress
// component, and the energy likewise.
func TestPlanarQuadratureAccuracy(t *testing.T) {
	if testing.Short() {
		t.Skip("brute-force quadrature reference at many deformations; run without -short")
	}
	t.Parallel()
	shapes := []struct {
		id string
		p  []float64
	}{{"fib-quad", nil}, {"fib-expsq", []float64{5}}, {"fib-exp", []float64{8}}, {"fib-expsq", []float64{40}},
		{"fib-recruit", []float64{1.05, 0.1}}, {"fib-recruit", []float64{1.02, 0}}, {"fib-recruit", []float64{1, 0.3}}}
	for _, F := range planarCases {
		for _, b := range []float64{0, 0.5, 2, 6, 25, 120, 1000} {
			for _, alpha := range []float64{0.3, -1.1, 1.5} {
				for _, s := range shapes {
					sh := terms.Lookup(s.id)
					p := s.p
					if p == nil {
						p = sh.DefaultParams()
					}
					m := &Model{Families: []Family{{Angle: alpha, Planar: true, Concentration: b}},
						Terms: []Term{{Shape: sh, Family: 0, Weight: 1, Params: p}}}
					r, err := m.Evaluate(F)
					if err != nil {
						t.Fatal(err)
					}
					ref, eref := planarRef(F, alpha, b, sh, p, 20000)
					scale := planarScale(F, sh, p, ref)
					for j := range ref {
						if d := math.Abs(r.Cauchy[j] - ref[j]); d > 1e-12*scale && d > 1e-16 { // below 1e-16 of the weight: round-off
							t.Errorf("F=%v b=%g α=%g %s%v: σ[%d] = %.12g, reference %.12g (rel %.2g)", F, b, alpha, s.id, p, j, r.Cauchy[j], ref[j], d/scale)
						}
					}
					if d := math.Abs(r.Energy - eref); d > 1e-12*math.Max(math.Abs(eref), 1e-300) && d > 1e-14 {
						t.Errorf("F=%v b=%g α=%g %s: energy %.12g, reference %.12g", F, b, alpha, s.id, r.Energy, eref)
					}
				}
			}
		}
	}
}

// b = 0 with the quadratic shape f = x²: the in-plane isotropic average in
// closed form, derived here from I4(θ) − 1 = A0 + R cos u on the stretched
// arc |u| < h, u = 2θ − φ, ρ = 1/π, dθ = du/2:
//
//	M0 = (2A0h + 2R sin h)/π,
//	(Mc, Ms) = (cos φ, sin φ)·(2A0 sin h + R(h + sin h cos h))/π,
//	Ψ = (2A0²h + 4A0R sin h + R²(h + sin h cos h))/(2π),
//
// with σ = F(M0 1 + Mc D_c + Ms D_s)Fᵀ.
func TestPlanarIsotropicClosedForm(t *testing.T) {
	sh := terms.Lookup("fib-quad")
	for _, F := range planarCases {
		C := [3]float64{F[0]*F[0] + F[2]*F[2], F[1]*F[1] + F[3]*F[3], F[0]*F[1] + F[2]*F[3]}
		A0 := (C[0]+C[1])/2 - 1
		rc, rs := (C[0]-C[1])/2, C[2]
		R := math.Hypot(rc, rs)
		phi := math.Atan2(rs, rc)
		h := math.Pi
		if A0 < R {
			h = math.Acos(-A0 / R)
		}
		M0 := (2*A0*h + 2*R*math.Sin(h)) / math.Pi
		q := (2*A0*math.Sin(h) + R*(h+math.Sin(h)*math.Cos(h))) / math.Pi
		Mc, Ms := math.Cos(phi)*q, math.Sin(phi)*q
		psi := (2*A0*A0*h + 4*A0*R*math.Sin(h) + R*R*(h+math.Sin(h)*math.Cos(h))) / (2 * math.Pi)
		// F M Fᵀ with M = [[M0+Mc, Ms], [Ms, M0−Mc]].
		M := [2][2]float64{{M0 + Mc, Ms}, {Ms, M0 - Mc}}
		Fm := [2][2]float64{{F[0], F[1]}, {F[2], F[3]}}
		var want [2][2]float64
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				for k := 0; k < 2; k++ {
					for l := 0; l < 2; l++ {
						want[i][j] += Fm[i][k] * M[k][l] * Fm[j][l]
					}
				}
			}
		}
		for _, alpha := range []float64{0, 0.7, -1.3} {
			m := &Model{Families: []Family{{Angle: alpha, Planar: true}},
				Terms: []Term{{Shape: sh, Family: 0, Weight: 1}}}
			r, err := m.Evaluate(F)
			if err != nil {
				t.Fatal(err)
			}
			got := [3]float64{r.Cauchy[0], r.Cauchy[1], r.Cauchy[2]}
			exp := [3]float64{want[0][0], want[1][1], want[0][1]}
			for j := range got {
				if !near(got[j], exp[j], 1e-12) {
					t.Errorf("F=%v α=%g: σ[%d] = %.15g, closed form %.15g", F, alpha, j, got[j], exp[j])
				}
			}
			if !near(r.Energy, psi, 1e-12) {
				t.Errorf("F=%v: energy %.15g, closed form %.15g", F, r.Energy, psi)
			}
		}
	}
}

// A very concentrated planar family approaches the ideal family, with an
// error that falls like 1/b (the density's variance).
func TestPlanarIdealLimit(t *testing.T) {
	sh := terms.Lookup("fib-expsq")
	F := [4]float64{1.2, 0.05, -0.02, 1.08}
	ideal := &Model{Families: []Family{{Angle: 0.5}}, Terms: []Term{{Shape: sh, Family: 0, Weight: 1, Params: []float64{3}}}}
	ri, _ := ideal.Evaluate(F)
	relErr := func(b float64) float64 {
		m := &Model{Families: []Family{{Angle: 0.5, Planar: true, Concentration: b}}, Terms: ideal.Terms}
		r, err := m.Evaluate(F)
		if err != nil {
			t.Fatal(err)
		}
		return math.Abs(r.Cauchy[0]-ri.Cauchy[0]) / math.Abs(ri.Cauchy[0])
	}
	e3, e4 := relErr(1e3), relErr(1e4)
	if e4 > 1e-3 || e3/e4 < 8 || e3/e4 > 12 {
		t.Errorf("relative error %.3g at b = 1e3 and %.3g at b = 1e4; want < 1e-3 and a ratio near 10", e3, e4)
	}
}

// Rotating the mean fibre direction and the loading frame together leaves
// the energy unchanged (frame indifference and material symmetry; common
// practice): Ψ(Q F Qᵀ; α + ψ) = Ψ(F; α).
func TestPlanarRotationInvariance(t *testing.T) {
	sh := terms.Lookup("fib-expsq")
	for _, F := range planarCases {
		for _, psi := range []float64{0.4, -1.2, 2.9} {
			s, c := math.Sincos(psi)
			Q := [2][2]float64{{c, -s}, {s, c}}
			Fm := [2][2]float64{{F[0], F[1]}, {F[2], F[3]}}
			var R [2][2]float64
			for i := 0; i < 2; i++ {
				for j := 0; j < 2; j++ {
					for k := 0; k < 2; k++ {
						for l := 0; l < 2; l++ {
							R[i][j] += Q[i][k] * Fm[k][l] * Q[j][l]
						}
					}
				}
			}
			Fr := [4]float64{R[0][0], R[0][1], R[1][0], R[1][1]}
			for _, b := range []float64{0, 3, 60} {
				m := func(a float64) *Model {
					return &Model{Families: []Family{{Angle: a, Planar: true, Concentration: b}},
						Terms: []Term{{Shape: sh, Family: 0, Weight: 2, Params: []float64{4}}}}
				}
				r0, _ := m(0.3).Evaluate(F)
				r1, _ := m(0.3 + psi).Evaluate(Fr)
				if !near(r0.Energy, r1.Energy, 1e-10) {
					t.Errorf("F=%v ψ=%g b=%g: energy %.15g, rotated %.15g", F, psi, b, r0.Energy, r1.Energy)
				}
			}
		}
	}
}

// No stress and no energy in the reference state, for every fibre shape.
func TestPlanarStressFreeReference(t *testing.T) {
	for _, sh := range terms.Catalogue() {
		if sh.Arg != terms.Fibre {
			continue
		}
		m := &Model{Families: []Family{{Angle: 0.2, Planar: true, Concentration: 2}},
			Terms: []Term{{Shape: sh, Family: 0, Weight: 5, Params: sh.DefaultParams()}}}
		r, err := m.Evaluate([4]float64{1, 0, 0, 1})
		if err != nil {
			t.Fatal(err)
		}
		if r.Energy != 0 || r.Cauchy != (Sym{}) {
			t.Errorf("%s: reference state has σ = %v, Ψ = %g", sh.ID, r.Cauchy, r.Energy)
		}
	}
}

// planarModel has a planar family with two fibre terms and an ideal one.
func planarModel() *Model {
	return &Model{
		Families: []Family{{Name: "f1", Angle: 0.6, Planar: true, Concentration: 2.5}, {Name: "f2", Angle: -0.9}},
		Terms: []Term{
			{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 3},
			{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 4, Params: []float64{2.2}},
			{Shape: terms.Lookup("fib-exp"), Family: 0, Weight: 1.5, Params: []float64{3}},
			{Shape: terms.Lookup("fib-quad"), Family: 1, Weight: 2},
		},
	}
}

// Column derivatives of a planar family (angle, concentration, shape
// parameters) against central finite differences.
func TestPlanarColumnDerivatives(t *testing.T) {
	for _, nominal := range []bool{false, true} {
		d := testDataset(t, nominal)
		m := planarModel()
		var c Columns
		d.Fill(m, &c, true)
		check := func(name string, analytic []float64, perturb func(m *Model, h float64), h float64) {
			checkColumnsFD(t, d, m, &c, fmt.Sprintf("nominal=%v", nominal), name, analytic, perturb, h)
		}
		check("angle", maskFamily(m, &c, c.DAngle, 0), func(m *Model, h float64) { m.Families[0].Angle += h }, 1e-6)
		check("concentration", maskFamily(m, &c, c.DKappa, 0), func(m *Model, h float64) { m.Families[0].Concentration += h }, 1e-6)
		for k := 1; k <= 2; k++ {
			k := k
			only := make([]float64, len(c.A))
			copy(only[k*c.Rows:(k+1)*c.Rows], c.DParam[0][k*c.Rows:(k+1)*c.Rows])
			check(fmt.Sprint("param of term ", k), only, func(m *Model, h float64) { m.Terms[k].Params[0] += h }, 1e-6)
		}
	}
}

// Columns of a planar model times weights reproduce Evaluate, within the
// accuracy of the fit's quadrature (accurateRule, 1e-8; Evaluate
// integrates with the finer pointRule).
func TestPlanarColumnsMatchEvaluate(t *testing.T) {
	F := planarCases
	d, err := NewDataset(F, Output{Nominal: true, Components: []Component{0, 1, 2, 3}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	m := planarModel()
	var c Columns
	d.Fill(m, &c, false)
	for i, f := range F {
		r, err := m.Evaluate(f)
		if err != nil {
			t.Fatal(err)
		}
		for j := 0; j < 4; j++ {
			s := 0.0
			for k, term := range m.Terms {
				s += term.Weight * c.A[k*c.Rows+i*4+j]
			}
			if !near(s, r.Nominal[j], 1e-8) {
				t.Errorf("point %d component %d: Σ w·column = %g, Evaluate %g", i, j, s, r.Nominal[j])
			}
		}
	}
}

// The tangent of a planar family against central differences of the
// nominal stress, and its stress against Evaluate.
func TestPlanarTangentFiniteDifference(t *testing.T) {
	m := planarModel()
	for _, F := range planarCases {
		tg, err := m.Tangent(F)
		if err != nil {
			t.Fatal(err)
		}
		r, _ := m.Evaluate(F)
		P := NominalFOrder(r.Nominal)
		for a := range P {
			if !near(tg.P[a], P[a], 1e-10) {
				t.Errorf("F=%v: tangent's P[%d] = %g, Evaluate %g", F, a, tg.P[a], P[a])
			}
		}
		fdA := fdTangent(t, m, F, 1e-6)
		for b := 0; b < 4; b++ {
			for a := 0; a < 4; a++ {
				fd := fdA[a][b]
				if math.Abs(fd-tg.A[a][b]) > 1e-5*math.Max(1, math.Abs(fd)) {
					t.Errorf("F=%v: A[%d][%d] = %.9g, finite difference %.9g", F, a, b, tg.A[a][b], fd)
				}
			}
		}
	}
}

// BenchmarkFillPlanar fills the columns of a planar family with two fibre
// terms over 5 protocols × 100 points, with derivatives.
func BenchmarkFillPlanar(b *testing.B) {
	d := benchSpecimen(b)
	m := planarModel()
	m.Terms = m.Terms[:3]
	m.Families = m.Families[:1]
	var c Columns
	d.Fill(m, &c, true)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		d.Fill(m, &c, true)
	}
}

// TestPlanarTune reports the quadrature's worst error and mean node count
// over the accuracy cases (run with WEFT_TUNE=1 when changing the panel
// policy).
func TestPlanarTune(t *testing.T) {
	if os.Getenv("WEFT_TUNE") == "" {
		t.Skip("set WEFT_TUNE=1 to report the quadrature's error and cost")
	}
	shapes := []struct {
		id string
		p  []float64
	}{{"fib-quad", nil}, {"fib-expsq", []float64{5}}, {"fib-exp", []float64{8}}, {"fib-expsq", []float64{40}}}
	type cs struct {
		F        [4]float64
		b, alpha float64
		sh       *terms.Shape
		p        []float64
		ref      Sym
		scale    float64
	}
	var all []cs
	for _, F := range planarCases {
		for _, b := range []float64{0, 0.5, 2, 6, 25, 120, 1000} {
			for _, alpha := range []float64{0.3, -1.1, 1.5} {
				for _, s := range shapes {
					sh := terms.Lookup(s.id)
					p := s.p
					if p == nil {
						p = sh.DefaultParams()
					}
					ref, _ := planarRef(F, alpha, b, sh, p, 20000)
					all = append(all, cs{F, b, alpha, sh, p, ref, planarScale(F, sh, p, ref)})
				}
			}
		}
	}
	saved := accurateRule
	defer func() { accurateRule = saved }()
	for _, order := range []int{8, 10, 12, 16} {
		for _, ps := range []float64{4, 6, 8} {
			for _, pb := range [][]float64{{1, 2.5, 5}, {2}} {
				accurateRule = newQuadRule(order, 4, pb, math.Pi, ps)
				worst, nodes := 0.0, 0
				for _, c := range all {
					m := &Model{Families: []Family{{Angle: c.alpha, Planar: true, Concentration: c.b}},
						Terms: []Term{{Shape: c.sh, Family: 0, Weight: 1, Params: c.p}}}
					r, _ := m.Evaluate(c.F)
					for j := range c.ref {
						worst = math.Max(worst, math.Abs(r.Cauchy[j]-c.ref[j])/c.scale)
					}
					g := newPlanarGeom(&c.F)
					var rule planarRule
					rule.build(accurateRule, &g, c.alpha, c.b, nil, familySteepness(m, 0, &g))
					nodes += len(rule.Nodes)
				}
				t.Logf("order %d breaks %v panelScale %g: worst %.2g, mean nodes %.1f", order, pb, ps, worst, float64(nodes)/float64(len(all)))
			}
		}
	}
}

// The search rule, which discovery uses for the many fits it only
// compares, stays within 1e-4 of the brute-force reference (about 1e-5
// typically) on the same cases.
func TestPlanarSearchRuleAccuracy(t *testing.T) {
	t.Parallel()
	d, err := NewDataset(planarCases, Output{Components: []Component{0, 1, 2}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	worst := 0.0
	for _, b := range []float64{0, 2, 6, 25, 120} {
		for _, alpha := range []float64{0.3, -1.1} {
			for _, s := range []struct {
				id string
				p  []float64
			}{{"fib-expsq", []float64{5}}, {"fib-recruit", []float64{1.05, 0.1}}, {"fib-exp", []float64{8}}} {
				sh := terms.Lookup(s.id)
				m := &Model{Families: []Family{{Angle: alpha, Planar: true, Concentration: b}},
					Terms: []Term{{Shape: sh, Family: 0, Weight: 1, Params: s.p}}}
				c := Columns{Search: true}
				d.Fill(m, &c, false)
				for i, F := range planarCases {
					ref, _ := planarRef(F, alpha, b, sh, s.p, 20000)
					scale := planarScale(F, sh, s.p, ref)
					for j := range ref {
						e := math.Abs(c.A[i*3+j]-ref[j]) / scale
						worst = math.Max(worst, e)
						if e > 1e-4 {
							t.Errorf("F=%v b=%g α=%g %s: σ[%d] = %.10g, reference %.10g (rel %.2g)", F, b, alpha, s.id, j, c.A[i*3+j], ref[j], e)
						}
					}
				}
			}
		}
	}
	t.Logf("worst relative error of the search rule: %.2g", worst)
}

// The scan path (cached directions re-weighted by the density) agrees with
// the general fill on the same scan rule's accuracy: within 1e-3 of the
// accurate columns, for several angles and spreads filled in turn.
func TestPlanarScanFill(t *testing.T) {
	d := testDataset(t, true)
	m := planarModel()
	m.Families = m.Families[:1]
	m.Terms = m.Terms[:3]
	c := Columns{scan: &planarScan{}}
	for _, a := range []float64{0.2, 1.1, -0.7} {
		for _, b := range []float64{1.5, 8} {
			m.Families[0].Angle, m.Families[0].Concentration = a, b
			var ref Columns
			d.Fill(m, &ref, false)
			d.Fill(m, &c, false)
			for k := 1; k < 3; k++ {
				scale := 0.0
				for r := 0; r < ref.Rows; r++ {
					scale = math.Max(scale, math.Abs(ref.A[k*ref.Rows+r]))
				}
				for r := 0; r < ref.Rows; r++ {
					if d := math.Abs(c.A[k*c.Rows+r] - ref.A[k*ref.Rows+r]); d > 1e-3*scale {
						t.Errorf("α=%g b=%g term %d row %d: scan %g, accurate %g", a, b, k, r, c.A[k*c.Rows+r], ref.A[k*ref.Rows+r])
					}
				}
			}
		}
	}
}

// The constants of the in-plane density against gonum's Gauss–Legendre
// integration over one period: ∫ρ dθ = 1 and ∫ρ cos 2(θ − α) dθ = r, for
// concentrations from 0 to 1000 (through the series and the asymptotic
// branch of the Bessel functions).
func TestPlanarDensityConstants(t *testing.T) {
	for _, b := range []float64{0, 0.3, 2, 12, 29.9, 30.1, 200, 1000} {
		c, r := PlanarDensity(b)
		rho := func(th float64) float64 { return c * math.Exp(b*(math.Cos(2*th)-1)) }
		var one, mean float64
		const panels = 400
		for k := 0; k < panels; k++ {
			lo := -math.Pi/2 + math.Pi*float64(k)/panels
			hi := lo + math.Pi/panels
			one += quad.Fixed(rho, lo, hi, 20, quad.Legendre{}, 0)
			mean += quad.Fixed(func(th float64) float64 { return rho(th) * math.Cos(2*th) }, lo, hi, 20, quad.Legendre{}, 0)
		}
		if math.Abs(one-1) > 1e-13 || math.Abs(mean-r) > 1e-13 {
			t.Errorf("b = %g: ∫ρ = %.16g, ∫ρ cos 2θ = %.16g, r = %.16g", b, one, mean, r)
		}
	}
}

// Small-strain moduli of a family spread in the plane: the uniaxial
// tension modulus along the family's mean direction (axis 1, so no shear
// couples in) against the secant modulus of the quadrature's stress under
// a uniaxial stretch of 1 + 1e-6 (SolveUniaxial, independent of the
// active-set solve), for a wide and a narrow spread.
func TestPlanarSmallStrainModuli(t *testing.T) {
	for _, b := range []float64{0.5, 3, 40} {
		m := &Model{Families: []Family{{Angle: 0, Planar: true, Concentration: b}},
			Terms: []Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 2},
				{Shape: terms.Lookup("fib-quad"), Family: 0, Weight: 30}}}
		mod, err := m.SmallStrainModuli([]float64{0})
		if err != nil {
			t.Fatal(err)
		}
		const e = 1e-6
		lt, err := SolveUniaxial(m, 0, 1+e)
		if err != nil {
			t.Fatal(err)
		}
		r, err := m.Evaluate([4]float64{1 + e, 0, 0, lt})
		if err != nil {
			t.Fatal(err)
		}
		secant := r.Cauchy[0] / e
		if got := mod.Young[0].Tension; math.Abs(got-secant) > 1e-3*secant {
			t.Errorf("b = %g: tension modulus %.6g, secant from the quadrature %.6g", b, got, secant)
		}
	}
}
