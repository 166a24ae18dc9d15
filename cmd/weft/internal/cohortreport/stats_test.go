package cohortreport

import (
	"math"
	"math/rand/v2"
	"testing"
)

// The reference values below were computed with SciPy 1.10.1, NumPy 1.24.2
// and statsmodels 0.13.5 (general-purpose libraries), on the same invented
// samples: scipy.stats.ttest_ind(a, b, equal_var=False),
// scipy.stats.mannwhitneyu(..., alternative='two-sided', method='exact' or
// 'asymptotic'), scipy.stats.kruskal, statsmodels' multipletests(p,
// method='holm') and effectsize_smd (Hedges' g), numpy.percentile (type 7).
var (
	sampleA = []float64{27.1, 31.4, 29.8, 33.0, 30.2, 28.7, 32.5}
	sampleB = []float64{34.2, 36.8, 31.9, 35.5, 38.1, 33.7}
	tiesC   = []float64{1.2, 2.3, 2.3, 3.1, 4.0, 4.0, 5.5, 6.1}
	tiesD   = []float64{2.3, 3.1, 4.5, 5.5, 5.5, 6.8, 7.2, 8.0, 9.1}
)

func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.15g, reference %.15g", what, got, want)
	}
}

func TestWelch(t *testing.T) {
	tt, df, p := Welch(sampleA, sampleB)
	near(t, "t", tt, -3.8440393450119843, 1e-12)                        // SciPy 1.10.1 ttest_ind(equal_var=False)
	near(t, "df", df, 10.431033240681993, 1e-12)                        // Welch–Satterthwaite, NumPy
	near(t, "p", p, 0.0030028159518749233, 1e-9)                        // SciPy 1.10.1
	near(t, "g", HedgesG(sampleA, sampleB), -2.0003836736630256, 1e-12) // statsmodels 0.13.5 effectsize_smd
}

func TestMannWhitney(t *testing.T) {
	u, p, exact := MannWhitney(sampleA, sampleB)
	if !exact {
		t.Error("no ties and small samples: want the exact distribution")
	}
	near(t, "U", u, 2, 0)                              // SciPy 1.10.1 mannwhitneyu, method='exact'
	near(t, "p exact", p, 0.004662004662004662, 1e-12) // SciPy 1.10.1
	u, p, exact = MannWhitney(tiesC, tiesD)
	if exact {
		t.Error("ties: want the normal approximation")
	}
	near(t, "U ties", u, 15.5, 0)                   // SciPy 1.10.1, method='asymptotic'
	near(t, "p ties", p, 0.05281840077054885, 1e-9) // SciPy 1.10.1, use_continuity=True
}

func TestKruskalWallis(t *testing.T) {
	h, df, p := KruskalWallis([]float64{2.9, 3.0, 2.5, 2.6, 3.2}, []float64{3.8, 2.7, 4.0, 2.4}, []float64{2.8, 3.4, 3.7, 2.2, 2.0})
	near(t, "H", h, 0.7714285714285722, 1e-12) // SciPy 1.10.1 kruskal
	near(t, "df", df, 2, 0)
	near(t, "p", p, 0.6799647735788936, 1e-9) // SciPy 1.10.1
	h, _, p = KruskalWallis(tiesC, tiesD, []float64{1.2, 9.1, 4.0, 3.3})
	near(t, "H ties", h, 3.661930783242262, 1e-12) // SciPy 1.10.1 kruskal (tie-corrected)
	near(t, "p ties", p, 0.1602587805880752, 1e-9)
}

func TestHolm(t *testing.T) {
	got := Holm([]float64{0.01, 0.04, 0.03, 0.005, 0.2})
	want := []float64{0.04, 0.09, 0.09, 0.025, 0.2} // statsmodels 0.13.5 multipletests(method='holm')
	for i := range want {
		near(t, "Holm", got[i], want[i], 1e-12)
	}
	if got := Holm([]float64{math.NaN(), 0.02}); !math.IsNaN(got[0]) || got[1] != 0.02 {
		t.Errorf("Holm with a NaN: %v", got)
	}
}

func TestDescribe(t *testing.T) {
	x := []float64{3.1, 2.7, 4.4, 3.9, 2.2, 5.0, 3.3, 3.6, 4.1}
	d := Describe(x)
	near(t, "q1", d.Q1, 3.1, 1e-12) // numpy.percentile(x, 25), NumPy 1.24.2
	near(t, "median", d.Median, 3.6, 1e-12)
	near(t, "q3", d.Q3, 4.1, 1e-12)
	// The interval of the mean is mean ± t·s/√n with t(0.975, 8) = 2.306
	// (Student's t table, from memory; common practice); mean 32.3/9 and
	// s from the sum of squares by hand.
	mean := 32.3 / 9
	ss := 0.0
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	half := 2.306 * math.Sqrt(ss/8) / 3
	near(t, "ci95 low", d.CI95[0], mean-half, 2e-4)
	near(t, "ci95 high", d.CI95[1], mean+half, 2e-4)
	// The same sample in another order gives the same interval.
	r := []float64{5.0, 2.2, 4.1, 3.3, 3.9, 2.7, 3.6, 4.4, 3.1}
	if e := Describe(r); e.CI95 != d.CI95 {
		t.Errorf("interval depends on the order: %v vs %v", e.CI95, d.CI95)
	}
}

// Planted normal samples (invented population values): the interval of
// the mean holds the population mean about 95 % of the time, at n = 20
// and at n = 3, the small cohorts of tissue studies (exact for normal
// samples, Student 1908; the percentile bootstrap used before held it in
// about 75 % of samples of 3), and a planted difference of one standard
// deviation between two groups of 15 is detected by Welch's test (power
// about 0.75 at α = 0.05, common practice for a two-sample t-test).
func TestPlantedMeansAndDifference(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	draw := func(n int, mu, sd float64) []float64 {
		x := make([]float64, n)
		for i := range x {
			x[i] = mu + sd*rng.NormFloat64()
		}
		return x
	}
	cover := 0
	for k := 0; k < 200; k++ {
		d := Describe(draw(20, 30, 3))
		if d.CI95[0] <= 30 && 30 <= d.CI95[1] {
			cover++
		}
	}
	if cover < 176 || cover > 198 {
		t.Errorf("the interval held the planted mean in %d of 200 samples, want about 190", cover)
	}
	small := 0
	for k := 0; k < 400; k++ {
		d := Describe(draw(3, 30, 3))
		if d.CI95[0] <= 30 && 30 <= d.CI95[1] {
			small++
		}
	}
	// Binomial(400, 0.95): 380 ± 4.4 standard deviation; 0.75 would give
	// about 300.
	if small < 360 || small > 396 {
		t.Errorf("at n = 3 the interval held the planted mean in %d of 400 samples, want about 380", small)
	}
	hits := 0
	for k := 0; k < 200; k++ {
		if _, _, p := Welch(draw(15, 30, 3), draw(15, 33, 3)); p < 0.05 {
			hits++
		}
	}
	if hits < 120 {
		t.Errorf("a planted difference of 1 SD was detected in %d of 200 cohorts", hits)
	}
}

// Over 200 simulated cohorts without a group difference, Welch's test
// rejects at its level: 5 % ± 3 %. This fast path simulates the parameter
// table (two groups of lognormal weights, the cohort's parameter
// distribution) instead of fitting 200 cohorts: the test's level does not
// depend on how the values were obtained.
func TestWelchNullRejectionRate(t *testing.T) {
	rng := rand.New(rand.NewPCG(15, 1947))
	reject := 0
	for k := 0; k < 200; k++ {
		a, b := make([]float64, 12), make([]float64, 10)
		for i := range a {
			a[i] = 30 * math.Exp(0.2*rng.NormFloat64())
		}
		for i := range b {
			b[i] = 30 * math.Exp(0.2*rng.NormFloat64())
		}
		if _, _, p := Welch(a, b); p < 0.05 {
			reject++
		}
	}
	if rate := float64(reject) / 200; rate < 0.02 || rate > 0.08 {
		t.Errorf("null rejection rate %.3f, want 0.05 ± 0.03", rate)
	}
}
