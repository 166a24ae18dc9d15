package biaxial

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// shearFile is one protocol of 60 points on sutures: equal stretches
// 1 + 0.004 i, a smooth curved shear F12 = 0.02 e + 0.3 e² (e = λ − 1),
// F21 = −F12/2, and the shear stresses given as zero (sutures), with
// Gaussian noise of standard deviation noise added to F12 and F21. With
// shearStress false the file has no shear-stress columns.
func shearFile(noise float64, shearStress bool, seed uint64) string {
	rng := rand.New(rand.NewPCG(seed, 5))
	var b strings.Builder
	b.WriteString("protocol,F11,F12,F21,F22,nominal_11 [kPa],nominal_22 [kPa]")
	if shearStress {
		b.WriteString(",nominal_12 [kPa],nominal_21 [kPa]")
	}
	b.WriteString("\n")
	for i := 1; i <= 60; i++ {
		e := 0.004 * float64(i)
		f12 := 0.02*e + 0.3*e*e + noise*rng.NormFloat64()
		f21 := -0.5*(0.02*e+0.3*e*e) + noise*rng.NormFloat64()
		fmt.Fprintf(&b, "1:1,%.17g,%.17g,%.17g,%.17g,%.17g,%.17g", 1+e, f12, f21, 1+e, 100*e*e, 80*e*e)
		if shearStress {
			b.WriteString(",0,0")
		}
		b.WriteString("\n")
	}
	return b.String()
}

// The point-to-point scatter of the shear is the noise added to it: the
// third differences of independent noise of standard deviation s have
// variance 20 s² (the squares of 1, −3, 3, −1; a textbook identity), a
// quadratic path has none, and the normal-consistent median absolute
// value (factor 1.4826, common practice) estimates s without bias: over
// 40 noisy files (80 estimates of 57 differences each, each within about
// ±45 % of s at 95 %, so their mean within about ±5 %) the mean is s
// within 8 %. The warning names the scatter only where the shear
// stresses are given and the scatter is above ShearScatterLimit.
func TestStrainScatter(t *testing.T) {
	scatterOf := func(in string) (*Specimen, [4]float64, []string) {
		t.Helper()
		s, err := readString(in, Options{})
		if err != nil {
			t.Fatal(err)
		}
		var ws []string
		for _, w := range s.Warnings {
			if strings.Contains(w.Message, "tracking noise of the markers?") {
				ws = append(ws, w.Message)
			}
		}
		return s, s.Protocols[0].StrainScatter, ws
	}
	sum := 0.0
	for seed := uint64(1); seed <= 40; seed++ {
		_, sc, _ := scatterOf(shearFile(0.001, true, seed))
		sum += sc[1] + sc[2]
	}
	if mean := sum / 80; math.Abs(mean-0.001) > 0.08*0.001 {
		t.Errorf("mean scatter of F12 and F21 over 40 files %.4g, want 0.001 within 8 %%", mean)
	}
	s, sc, ws := scatterOf(shearFile(0.001, true, 3))
	if sc[0] > 1e-12 || sc[3] > 1e-12 {
		t.Errorf("stretches without noise: scatter %.3g and %.3g, want 0 up to rounding", sc[0], sc[3])
	}
	if !s.HasShear || len(ws) != 1 || !strings.Contains(ws[0], "protocol 1:1") {
		t.Fatalf("noise 0.001 with shear stresses given: warnings %q, want one naming protocol 1:1", ws)
	}
	if _, sc, ws := scatterOf(shearFile(0, true, 3)); sc[1] > 1e-12 || sc[2] > 1e-12 || len(ws) != 0 {
		t.Errorf("smooth curved shear: scatter %.3g, warnings %q, want none", sc, ws)
	}
	if _, _, ws := scatterOf(shearFile(0.0002, true, 3)); len(ws) != 0 {
		t.Errorf("noise 0.0002, below the limit: warnings %q", ws)
	}
	if _, sc, ws := scatterOf(shearFile(0.001, false, 3)); len(ws) != 0 || sc[1] == 0 {
		t.Errorf("no shear stresses given: scatter %.3g, warnings %q, want the scatter recorded and no warning", sc, ws)
	}
}

// The quadratic Savitzky–Golay filter against its published convolution
// weights (Savitzky & Golay 1964, the table of quadratic smoothing
// coefficients, from memory: 5 points (−3, 12, 17, 12, −3)/35, 7 points
// (−2, 3, 6, 7, 6, 3, −2)/21, 9 points (−21, 14, 39, 54, 59, 54, 39, 14,
// −21)/231), their noise factor √w0 (√(59/231) = 0.5054 for 9), and the
// filter's defining properties: a quadratic path comes through unchanged,
// ends included, and independent noise of standard deviation s is left
// at about 0.505 s at interior points.
func TestSmoothStrain(t *testing.T) {
	for _, c := range []struct {
		window int
		w      []float64
		norm   float64
	}{
		{5, []float64{-3, 12, 17, 12, -3}, 35},
		{7, []float64{-2, 3, 6, 7, 6, 3, -2}, 21},
		{9, []float64{-21, 14, 39, 54, 59, 54, 39, 14, -21}, 231},
	} {
		m := c.window / 2
		for k, w := range c.w {
			if got := savitzkyGolayWeight(m, k-m, 0); math.Abs(got-w/c.norm) > 1e-14 {
				t.Errorf("%d points, weight %d: %.15g, want %g/%g", c.window, k-m, got, w, c.norm)
			}
		}
		if got, want := SmoothingNoiseFactor(c.window), math.Sqrt(c.w[m]/c.norm); math.Abs(got-want) > 1e-14 {
			t.Errorf("%d points: noise factor %.15g, want %.15g", c.window, got, want)
		}
	}
	quad := func(i int) float64 { return 1 + 0.01*float64(i) - 0.0003*float64(i*i) }
	pts := make([]Point, 20)
	for i := range pts {
		pts[i].F = [4]float64{quad(i), 0.5 * quad(i), -quad(i), 2 * quad(i)}
	}
	smoothStrain(pts, 9)
	for i := range pts {
		for e, f := range []float64{1, 0.5, -1, 2} {
			if math.Abs(pts[i].F[e]-f*quad(i)) > 1e-13 {
				t.Fatalf("point %d, entry %d: %.15g, want the quadratic's %.15g", i, e, pts[i].F[e], f*quad(i))
			}
		}
	}
	rng := rand.New(rand.NewPCG(4, 4))
	ss, n := 0.0, 0
	for rep := 0; rep < 400; rep++ {
		pts := make([]Point, 30)
		for i := range pts {
			pts[i].F[1] = 0.001 * rng.NormFloat64()
		}
		smoothStrain(pts, 9)
		for i := 4; i < 26; i++ {
			ss += pts[i].F[1] * pts[i].F[1]
			n++
		}
	}
	if got := math.Sqrt(ss/float64(n)) / 0.001; math.Abs(got-0.5054) > 0.02 {
		t.Errorf("noise left at interior points %.4g of it, want 0.5054", got)
	}
}

// The smoothing, edges included, against a general-purpose library:
// scipy.signal.savgol_filter(x, window, 2, mode="interp") (SciPy 1.10.1,
// NumPy 1.24.2, run once on 2026-12-05; the values below are its output,
// printed with repr). Its "interp" mode fits the quadratic to the first or
// last window for the points within half a window of an end, as weft
// does; a check with a quadratic path alone cannot tell that from other
// end treatments, since any of them that fits a quadratic keeps one.
func TestSmoothStrainMatchesSciPy(t *testing.T) {
	x := []float64{1.000, 1.013, 1.019, 1.034, 1.038, 1.052, 1.067, 1.069, 1.088, 1.096, 1.111, 1.117}
	for _, c := range []struct {
		window int
		want   []float64
	}{
		{5, []float64{1.0001142857142857, 1.0117428571428568, 1.0220857142857136, 1.0304857142857138, 1.0405714285714283, 1.052428571428571,
			1.0632285714285707, 1.073971428571428, 1.0840571428571424, 1.098914285714285, 1.109457142857143, 1.1172857142857147}},
		{7, []float64{1.0015952380952384, 1.0105714285714287, 1.0202142857142855, 1.0305238095238103, 1.0417142857142867, 1.0518571428571435,
			1.0625238095238103, 1.074238095238096, 1.0858095238095244, 1.096857142857143, 1.1078571428571433, 1.1188095238095246}},
	} {
		pts := make([]Point, len(x))
		for i, v := range x {
			pts[i].F = [4]float64{v, 0, 0, 2 - v}
		}
		smoothStrain(pts, c.window)
		for i, want := range c.want {
			if math.Abs(pts[i].F[0]-want) > 1e-13 || math.Abs(pts[i].F[3]-(2-want)) > 1e-13 {
				t.Errorf("%d points, point %d: F11 %.16g, F22 %.16g; want %.16g, %.16g (scipy.signal.savgol_filter)",
					c.window, i, pts[i].F[0], pts[i].F[3], want, 2-want)
			}
		}
	}
}

// Smoothing is an option of its own: the window must be odd and at least
// MinPoints, a protocol must keep that many points, the kept text and the
// protocol record it, and the scatter warning judges what smoothing
// leaves (0.001 of noise, estimated 0.0013 in this file, about 0.0004
// after 21 points, whose noise factor is 0.328: below the limit, no
// warning, the measured scatter still recorded).
func TestSmoothStrainOption(t *testing.T) {
	for _, w := range []int{4, 8, -3} {
		if _, err := readString(shearFile(0.001, true, 3), Options{SmoothStrain: w}); !errors.Is(err, ErrOptions) {
			t.Errorf("window %d: error %v, want ErrOptions", w, err)
		}
	}
	if _, err := readString(shearFile(0.001, true, 3), Options{SmoothStrain: 61}); !errors.Is(err, ErrProtocol) {
		t.Errorf("window 61 on 60 points: error %v, want ErrProtocol", err)
	}
	s9, err := readString(shearFile(0.001, true, 3), Options{SmoothStrain: 9})
	if err != nil {
		t.Fatal(err)
	}
	if len(s9.Warnings) != 1 || !strings.Contains(s9.Warnings[0].Message, "smoothed over 9 points, about 0.00") {
		t.Errorf("smoothed over 9 points, about 0.0007 left: warnings %v, want one that says what smoothing left", s9.Warnings)
	}
	s, err := readString(shearFile(0.001, true, 3), Options{SmoothStrain: 21})
	if err != nil {
		t.Fatal(err)
	}
	pr := s.Protocols[0]
	if pr.SmoothWindow != 21 || !strings.Contains(pr.Kept, "F smoothed over 21 points") || pr.StrainScatter[1] < 0.0005 {
		t.Errorf("window %d, kept %q, scatter %.3g", pr.SmoothWindow, pr.Kept, pr.StrainScatter)
	}
	if f := pr.FittedStrainScatter(); math.Abs(f[1]/pr.StrainScatter[1]-SmoothingNoiseFactor(21)) > 1e-12 {
		t.Errorf("fitted scatter %.3g of %.3g", f[1], pr.StrainScatter[1])
	}
	for _, w := range s.Warnings {
		if strings.Contains(w.Message, "tracking noise") {
			t.Errorf("warned after smoothing over 21 points: %s", w.Message)
		}
	}
}

// Smoothing stays inside each kept branch. A least-squares polynomial
// filter reproduces any polynomial of its degree or lower (Savitzky &
// Golay 1964), so a branch whose stretch is linear in the point index
// comes through unchanged — but only if the window never reaches across
// a turning point or across the jump from one cycle's peak to the next
// cycle's low point, which no marker track contains. The synthetic record
// has three triangular cycles, linear in the index on each branch; every
// kept point must keep its measured F with --cycle all, for the loading
// branches alone (a jump of the whole stretch range between them) and for
// both branches (a turn at every peak and valley).
func TestSmoothStrainStaysInsideEachBranch(t *testing.T) {
	rec := synthRecord("1:1", 3, 12, 1.0, 1.2, 0.5)
	for _, br := range []Branch{BranchLoading, BranchUnloading, BranchAll} {
		raw, err := Prepare(rec, Options{Cycle: CycleAll, Branch: br})
		if err != nil {
			t.Fatal(err)
		}
		sm, err := Prepare(rec, Options{Cycle: CycleAll, Branch: br, SmoothStrain: 5})
		if err != nil {
			t.Fatal(err)
		}
		a, b := raw.Protocols[0].Points, sm.Protocols[0].Points
		if len(a) != len(b) {
			t.Fatalf("%v: %d points smoothed, %d raw", br, len(b), len(a))
		}
		for i := range a {
			for e := range a[i].F {
				if math.Abs(a[i].F[e]-b[i].F[e]) > 1e-12 {
					t.Fatalf("%v, point %d (line %d, cycle %d), F entry %d: smoothed %.6g, measured %.6g — the window crossed a turn or a jump between branches",
						br, i, a[i].Line, a[i].Cycle, e, b[i].F[e], a[i].F[e])
				}
			}
		}
	}
	// A kept branch shorter than the window is refused, even when the
	// branches together would be long enough.
	if _, err := Prepare(synthRecord("1:1", 3, 4, 1.0, 1.2, 0.5), Options{Cycle: CycleAll, SmoothStrain: 5}); !errors.Is(err, ErrProtocol) {
		t.Errorf("branches of 4 points, window of 5: error %v, want ErrProtocol", err)
	}
}

// shearedNeoHookean writes a synthetic gradient file (Cauchy normal
// stresses only, kPa) of protocols 1:1, 1:0.5 and 0.5:1, n rows each to a
// strain of 0.2, whose true F carries the shear F12 = g·(load fraction);
// the stresses are those of an incompressible neo-Hookean membrane in
// plane stress, σ = μ (F Fᵀ − J⁻² I) in plane with μ = 20 kPa (Rivlin
// 1948, as in Holzapfel 2000, Nonlinear Solid Mechanics, §6.5), at the
// true F; the written F has Gaussian scatter sd in every entry.
func shearedNeoHookean(seed uint64, n int, sd, g float64) string {
	rng := rand.New(rand.NewPCG(seed, 11))
	var b strings.Builder
	b.WriteString("# specimen = SYN-shear (synthetic)\nprotocol,F11,F12,F21,F22,cauchy_11 [kPa],cauchy_22 [kPa]\n")
	for _, p := range []struct {
		label  string
		r1, r2 float64
	}{{"1:1", 1, 1}, {"1:0.5", 1, 0.5}, {"0.5:1", 0.5, 1}} {
		for i := 0; i < n; i++ {
			x := float64(i) / float64(n-1)
			f11, f12, f22 := 1+0.2*p.r1*x, g*x, 1+0.2*p.r2*x
			j2 := (f11 * f22) * (f11 * f22)
			s11, s22 := 20*(f11*f11+f12*f12-1/j2), 20*(f22*f22-1/j2)
			fmt.Fprintf(&b, "%s,%.6f,%.6f,%.6f,%.6f,%.5f,%.5f\n", p.label, f11+sd*rng.NormFloat64(), f12+sd*rng.NormFloat64(),
				sd*rng.NormFloat64(), f22+sd*rng.NormFloat64(), s11, s22)
		}
	}
	return b.String()
}

// Without a shear stress, F12 and F21 are the only thing that tells a
// fibre family at +α from one at −α; when they are tracking noise about
// zero, that sign follows the noise (a synthetic one-family specimen at
// +30°, scatter 0.004 in F, was fitted at −29.3° and at −24.6° in 2 of 7
// seeds, each with an interval excluding +30°, its sign called
// identified). Such files are warned about and read as carrying no shear
// information (Specimen.ShearWithinScatter); files whose F carries a real
// shear, or no shear at all, or whose shear stresses are given, are not.
func TestNoiseOnlyShearIsWarned(t *testing.T) {
	noiseOnly := func(in string) bool {
		s, err := readString(in, Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, w := range s.Warnings {
			if strings.Contains(w.Message, "stay within 5 times their point-to-point scatter") {
				return true
			}
		}
		return false
	}
	for _, c := range []struct {
		n     int
		sd, g float64
		want  bool
	}{
		{30, 0.001, 0, true}, {100, 0.004, 0, true}, {500, 0.006, 0, true},
		{100, 0.004, 0.05, false}, {500, 0.002, 0.02, false}, {100, 0, 0.02, false}, {100, 0, 0, false},
	} {
		in := shearedNeoHookean(1, c.n, c.sd, c.g)
		if got := noiseOnly(in); got != c.want {
			t.Errorf("n %d, scatter %g, shear %g: noise-only shear warned %v, want %v", c.n, c.sd, c.g, got, c.want)
		}
		// Shear within its scatter is no shear information, and says so.
		s, err := readString(in, Options{})
		if err != nil {
			t.Fatal(err)
		}
		// The warning says what would decide the sign, to the end of its
		// sentence (until 2026-12-05 it stopped at "… would").
		for _, w := range s.Warnings {
			if strings.Contains(w.Message, "stay within 5 times their point-to-point scatter") && !strings.HasSuffix(w.Message, "would decide it") {
				t.Errorf("n %d, scatter %g: the noise-only shear warning breaks off: …%s", c.n, c.sd, w.Message[len(w.Message)-40:])
			}
		}
		sheared := c.sd > 0 || c.g > 0
		if s.ShearWithinScatter != c.want || s.HasShear != (sheared && !c.want) {
			t.Errorf("n %d, scatter %g, shear %g: shear within scatter %v, shear information %v; want %v, %v",
				c.n, c.sd, c.g, s.ShearWithinScatter, s.HasShear, c.want, sheared && !c.want)
		}
	}
	// From 30 rows a protocol an entry's scatter estimate can come out at
	// half the true one; the noise of that entry must not pass for shear.
	for seed := uint64(1); seed <= 12; seed++ {
		if !noiseOnly(shearedNeoHookean(seed, 30, 0.004, 0)) {
			t.Errorf("seed %d: noise-only shear of 30 rows a protocol (scatter 0.004) not warned about", seed)
		}
	}
	// The shear stress given: the shear-scatter warning speaks instead.
	with := strings.Replace(shearedNeoHookean(1, 100, 0.004, 0), "cauchy_22 [kPa]\n", "cauchy_22 [kPa],cauchy_12 [kPa]\n", 1)
	with = strings.ReplaceAll(with, "\n1:", ",0\n1:")
	with = strings.ReplaceAll(with, "\n0.5:", ",0\n0.5:")
	with = strings.TrimSuffix(with, "\n") + ",0\n"
	if noiseOnly(with) {
		t.Errorf("a file with shear stresses is warned of noise-only shear")
	}
}
