package aniso

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/weft-tools/weft/biaxial"
	"gonum.org/v1/gonum/mat"
)

// bruteForce refits r's form with simulated data of planned test ts added
// (the fitted model's predictions along the test's path plus Gaussian noise
// at the fit's noise level in weighted units) and returns the ratio of each
// estimated quantity's new 95 % interval width to its current one, and the
// information gain read off the two covariance matrices.
func bruteForce(t *testing.T, s *biaxial.Specimen, p *Problem, r *Result, ts TestScore, seed uint64) ([]float64, float64) {
	t.Helper()
	if ts.Test.MountingDeg != 0 {
		t.Fatal("brute force needs a test in the fit's axes")
	}
	names, _, err := r.StressJacobian(p, r.Model)
	if err != nil {
		t.Fatal(err)
	}
	sigma := math.Sqrt(r.Loss / float64(r.Rows-r.FreeParams))
	s2 := withSimulatedTest(t, s, r, ts, sigma, seed)
	p2, err := NewProblem(s2, nil)
	if err != nil {
		t.Fatal(err)
	}
	r2 := refitFromReported(t, p2, r)
	// Rows of zero weight carry no residual: the noise level counts the
	// others only, and the refit's standard errors are rescaled to it.
	rows := 0
	for _, w := range p2.RowWeight {
		if w > 0 {
			rows++
		}
	}
	sigma2 := math.Sqrt(r2.Loss / float64(rows-r2.FreeParams))
	fit2 := math.Sqrt(r2.Loss / float64(r2.Rows-r2.FreeParams))
	cov := func(res *Result, sg float64) *mat.SymDense {
		idx := map[string]int{}
		for i, n := range res.CorrelationNames {
			idx[n] = i
		}
		se := map[string]float64{}
		for _, e := range res.Estimates {
			se[e.Name] = e.StdErr
		}
		c := mat.NewSymDense(len(names), nil)
		for a, na := range names {
			for b := 0; b <= a; b++ {
				nb := names[b]
				c.SetSym(a, b, res.Correlation[idx[na]][idx[nb]]*se[na]*se[nb]/(sg*sg))
				if res == r2 {
					c.SetSym(a, b, c.At(a, b)*sigma2*sigma2/(fit2*fit2))
				}
			}
		}
		return c
	}
	logdet := func(c *mat.SymDense) float64 {
		var ch mat.Cholesky
		if !ch.Factorize(c) {
			t.Fatal("covariance not positive definite")
		}
		return ch.LogDet()
	}
	gain := logdet(cov(r, sigma)) - logdet(cov(r2, sigma2))
	ratios := make([]float64, len(names))
	for a, n := range names {
		var w1, w2 float64
		for _, e := range r.Estimates {
			if e.Name == n {
				w1 = e.StdErr
			}
		}
		for _, e := range r2.Estimates {
			if e.Name == n {
				w2 = e.StdErr * sigma2 / fit2
			}
		}
		ratios[a] = w2 / w1
	}
	return ratios, gain
}

// withSimulatedTest returns s with planned test ts added as a protocol:
// r's model's predictions along the test's path plus Gaussian noise of
// sigma in weighted units (seeded).
func withSimulatedTest(t *testing.T, s *biaxial.Specimen, r *Result, ts TestScore, sigma float64, seed uint64) *biaxial.Specimen {
	t.Helper()
	meas := s.Measured
	if ts.Test.Sutured {
		meas[biaxial.C12], meas[biaxial.C21] = true, s.Kind == biaxial.Nominal
	}
	pr := biaxial.Protocol{Label: "new", UserWeight: 1}
	for i, F := range ts.Test.Path {
		res, err := r.Model.Evaluate(F)
		if err != nil {
			t.Fatal(err)
		}
		pt := biaxial.Point{F: F, Line: 1000 + i, Cycle: 1, Time: math.NaN(), Stress: res.Nominal}
		if s.Kind == biaxial.Cauchy {
			pt.Stress = [4]float64{res.Cauchy[0], res.Cauchy[1], res.Cauchy[2], 0}
		}
		pr.Points = append(pr.Points, pt)
	}
	// Weights from the noise-free predictions, as the planner assumes;
	// noise of σ/weight in stress units, so that the weighted noise level
	// is the fit's.
	tmp := &biaxial.Specimen{Kind: s.Kind, Measured: meas, StressUnit: s.StressUnit, Protocols: []biaxial.Protocol{pr}}
	tmp.Weigh()
	w := tmp.Protocols[0].Weight
	rng := rand.New(rand.NewPCG(seed, 3))
	for i := range pr.Points {
		for c := biaxial.C11; c < biaxial.NumComponents; c++ {
			if meas[c] {
				pr.Points[i].Stress[c] += sigma / w[c] * rng.NormFloat64()
			}
		}
	}
	s2 := *s
	s2.Measured = meas
	s2.HasShear = s.HasShear || ts.Test.Sutured
	s2.Protocols = append(append([]biaxial.Protocol(nil), s.Protocols...), pr)
	s2.Weigh()
	// The fitted protocols did not measure what only the planned test
	// does (shear tractions on sutures): their rows of it weigh nothing.
	for i := range s2.Protocols[:len(s.Protocols)] {
		for c := biaxial.C11; c < biaxial.NumComponents; c++ {
			if !s.Measured[c] {
				s2.Protocols[i].Weight[c] = 0
			}
		}
	}
	return &s2
}

// refitFromReported refits r's form to p2 from r's parameters with the
// reported angle signs, without an angle scan.
func refitFromReported(t *testing.T, p2 *Problem, r *Result) *Result {
	t.Helper()
	init := map[string]float64{}
	for k, v := range r.Params() {
		init[k] = v
	}
	if len(r.Model.Families) > 0 {
		// Start from the reported signs, the variant the data were
		// simulated from.
		for k := range init {
			switch k {
			case "angle", "angle_1":
				init[k] = r.Model.Families[0].Angle
			case "angle_2":
				init[k] = r.Model.Families[1].Angle
			}
		}
	}
	r2, err := Fit(p2, r.Structure, Settings{Init: init, NoScan: true})
	if err != nil {
		t.Fatal(err)
	}
	return r2
}
