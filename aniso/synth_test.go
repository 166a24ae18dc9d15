package aniso

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/terms"
)

// Test data are generated here from known parameters (invented, or quoted
// from the literature from memory where a test says so), with Gaussian
// noise of a stated fraction of each protocol-axis stress range.

// standardRatios are the usual stretch-ratio protocols (common practice;
// see the biaxial package documentation, Protocols).
var standardRatios = [][2]float64{{1, 1}, {1, 0.75}, {0.75, 1}, {1, 0.5}, {0.5, 1}}

type synthOptions struct {
	ratios    [][2]float64
	points    int
	maxStrain float64 // largest λ − 1 of the leading axis
	noise     float64 // noise σ as a fraction of each protocol-axis range
	seed      uint64
	sutured   bool // shear free edges: solve F12, F21 so that P12 = P21 = 0
	cauchy    bool
	// loadMax > 0 (stress unit) makes synthFrom's protocols load-controlled:
	// the ratios are of nominal stress P11:P22, the leading axis loaded to
	// loadMax, and the stretches solved for (no shear; maxStrain unused).
	loadMax float64
	// stretchNoise > 0 adds Gaussian noise of this standard deviation
	// (absolute, in stretch) to each recorded deformation-gradient entry
	// the specimen measures (F11 and F22, and F12 and F21 on sutures)
	// after the stresses were computed from the true ones: the tracking
	// noise of optical markers. Its draws come from a stream of their own,
	// so the stress noise is the same with and without it.
	stretchNoise float64
}

func (o synthOptions) withDefaults() synthOptions {
	if o.ratios == nil {
		o.ratios = standardRatios
	}
	if o.points == 0 {
		o.points = 40
	}
	if o.maxStrain == 0 {
		o.maxStrain = 0.25
	}
	if o.seed == 0 {
		o.seed = 7
	}
	return o
}

func label(r [2]float64) string {
	f := func(x float64) string {
		switch x {
		case 1:
			return "1"
		case 0.75:
			return "0.75"
		case 0.5:
			return "0.5"
		case 0.25:
			return "0.25"
		case 0:
			return "0"
		}
		return "x"
	}
	return f(r[0]) + ":" + f(r[1])
}

// synthSpecimen generates a specimen from a known model.
func synthSpecimen(t testing.TB, m *Model, o synthOptions) *biaxial.Specimen {
	t.Helper()
	o = o.withDefaults()
	rng := rand.New(rand.NewPCG(o.seed, 99))
	s := &biaxial.Specimen{Name: "synthetic", StressUnit: "kPa", Kind: biaxial.Nominal, HasShear: o.sutured}
	if o.cauchy {
		s.Kind = biaxial.Cauchy
	}
	s.Measured[biaxial.C11], s.Measured[biaxial.C22] = true, true
	if o.sutured {
		s.Measured[biaxial.C12] = true
		s.Measured[biaxial.C21] = !o.cauchy
	}
	for _, r := range o.ratios {
		pr := biaxial.Protocol{Label: label(r), UserWeight: 1}
		var shear [2]float64
		for i := 1; i <= o.points; i++ {
			e := o.maxStrain * float64(i) / float64(o.points)
			F := [4]float64{1 + r[0]*e, 0, 0, 1 + r[1]*e}
			if o.sutured {
				shear = solveSutured(t, m, F, shear)
				F[1], F[2] = shear[0], shear[1]
			}
			res, err := m.Evaluate(F)
			if err != nil {
				t.Fatal(err)
			}
			pt := biaxial.Point{F: F, Line: i + 1, Cycle: 1, Time: math.NaN()}
			if o.cauchy {
				pt.Stress = [4]float64{res.Cauchy[0], res.Cauchy[1], res.Cauchy[2], 0}
			} else {
				pt.Stress = res.Nominal
			}
			if o.sutured && !o.cauchy {
				// Sutures carry no shear: the measured shear stresses are zero.
				pt.Stress[2], pt.Stress[3] = 0, 0
			}
			pr.Points = append(pr.Points, pt)
		}
		addNoiseRand(&pr, o.noise, rng, s.Measured)
		s.Protocols = append(s.Protocols, pr)
	}
	return s
}

// addNoise adds Gaussian noise of σ = noise × range to the normal stress
// components of a protocol and sets the default weights.
func addNoise(pr *biaxial.Protocol, noise float64, seed uint64) {
	m := [4]bool{true, true}
	addNoiseRand(pr, noise, rand.New(rand.NewPCG(seed, 99)), m)
}

// addNoiseRand adds the noise and sets default weights: each protocol and
// axis counts equally; shear rows use the mean range of the normal
// components (their own range may be zero).
func addNoiseRand(pr *biaxial.Protocol, noise float64, rng *rand.Rand, measured [4]bool) {
	for c := biaxial.C11; c <= biaxial.C22; c++ {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, pt := range pr.Points {
			lo, hi = math.Min(lo, pt.Stress[c]), math.Max(hi, pt.Stress[c])
		}
		rg := hi - lo
		for i := range pr.Points {
			pr.Points[i].Stress[c] += noise * rg * rng.NormFloat64()
		}
		if rg == 0 {
			rg = 1 // all-zero stress: weigh rows equally
		}
		pr.Weight[c] = 1 / (rg * math.Sqrt(float64(len(pr.Points))))
	}
	for c := biaxial.C12; c < biaxial.NumComponents; c++ {
		if measured[c] {
			pr.Weight[c] = 2 / (1/pr.Weight[0] + 1/pr.Weight[1])
		}
	}
}

// solveSutured finds the sutured specimen's shear (see Model.SuturedShear).
func solveSutured(t testing.TB, m *Model, F [4]float64, start [2]float64) [2]float64 {
	x, err := m.SuturedShear(F[0], F[3], start)
	if err != nil {
		t.Fatal(err)
	}
	return x
}

func lookup(id string) *terms.Shape { return terms.Lookup(id) }

// freeExpSqPair is the two-free-family form many tests fit: i1-lin, and an
// fib-expsq on each of two families at free angles.
func freeExpSqPair() Structure {
	return Structure{Layout: LayoutFree, Terms: []TermSpec{{Shape: lookup("i1-lin"), Family: -1}, {Shape: lookup("fib-expsq"), Family: 0}, {Shape: lookup("fib-expsq"), Family: 1}}}
}

// hgoModel is a mirror pair at ±beta with the fibre energy of Holzapfel,
// Gasser & Ogden 2000.
func hgoModel(c, k1, k2, betaDeg float64) *Model {
	return &Model{
		Families: []Family{{Name: "f1", Angle: betaDeg * deg}, {Name: "f2", Angle: -betaDeg * deg}},
		Terms: []Term{
			{Shape: lookup("i1-lin"), Family: -1, Weight: c / 2},
			{Shape: lookup("fib-expsq"), Family: 0, Weight: k1, Params: []float64{k2}},
			{Shape: lookup("fib-expsq"), Family: 1, Weight: k1, Params: []float64{k2}},
		},
	}
}

func oneFamily(matrix Term, fibre Term, angleDeg float64) *Model {
	fibre.Family = 0
	matrix.Family = -1
	return &Model{Families: []Family{{Name: "f1", Angle: angleDeg * deg}}, Terms: []Term{matrix, fibre}}
}
