package report

import (
	"bytes"
	"encoding/binary"
	"encoding/xml"
	"hash/crc32"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/terms"
)

// wellFormed parses s with a general XML parser.
func wellFormed(t *testing.T, s string) {
	t.Helper()
	dec := xml.NewDecoder(strings.NewReader(s))
	for {
		_, err := dec.Token()
		if err == io.EOF {
			return
		}
		if err != nil {
			t.Fatalf("not well-formed XML: %v\n%s", err, s)
		}
	}
}

// Every formula the catalogue writes, with its default parameters, with
// zeros (the polynomial limits) and with a negative exponent, translates
// to well-formed MathML; a fraction is <mfrac> with numerator and
// denominator, and a power of ten from %g is written as one (element names
// of W3C MathML Core).
func TestMathMLOfTheCatalogue(t *testing.T) {
	for _, s := range terms.Catalogue() {
		sets := [][]float64{s.DefaultParams(), make([]float64, len(s.Params))}
		if s.ID == "ps-neg" {
			sets = append(sets, []float64{-7.5})
		}
		for _, p := range sets {
			_, latex := s.Written(p)
			m, err := mathML(latex, true)
			if err != nil {
				t.Errorf("%s: %q: %v", s.ID, latex, err)
				continue
			}
			wellFormed(t, string(m))
		}
	}
	m, err := mathML(`\frac{w}{2}`, false)
	if err != nil || string(m) != `<math><mrow><mfrac><mrow><mi>w</mi></mrow><mrow><mn>2</mn></mrow></mfrac></mrow></math>` {
		t.Errorf(`\frac{w}{2}: %s, %v`, m, err)
	}
	m, _ = mathML(`1.5e-05\,E_{f1}^{2}`, false)
	if !strings.Contains(string(m), "<mn>1.5</mn><mo>×</mo><msup><mn>10</mn><mn>−5</mn></msup>") || !strings.Contains(string(m), "<msubsup><mi>E</mi>") {
		t.Errorf("number and scripts: %s", m)
	}
	if _, err := mathML(`\unknown{x}`, false); err == nil {
		t.Errorf("an unknown command must be an error, so the page falls back to plain text")
	}
}

// The energy of a card splits into its terms at the top level only: the
// Fung-type term's exponent holds " + " inside braces and must stay one
// term, and the plain-text energy splits into the same number of terms.
func TestEnergyTerms(t *testing.T) {
	m := &aniso.Model{Families: []aniso.Family{{Name: "f1", Angle: 0.5}}, Terms: []aniso.Term{
		{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 3},
		{Shape: terms.Lookup("fung"), Family: -1, Weight: 0.5, Params: []float64{12, 6, 2, 8}},
		{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 20, Params: []float64{5}},
	}}
	c := card.FromModel(m, "kPa", nil)
	lhs, ts := energyTerms(c.EnergyLaTeX)
	if lhs != `\Psi` || len(ts) != 3 {
		t.Fatalf("lhs %q, %d terms: %q", lhs, len(ts), ts)
	}
	if p := plainTerms(c.Energy); len(p) != 3 {
		t.Errorf("plain energy splits into %d terms: %q", len(p), p)
	}
	h, err := energyMathML(c.EnergyLaTeX, c.Energy, true)
	if err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(string(h), "<math"); n != 3 {
		t.Errorf("%d math elements, want one per term", n)
	}
	wellFormed(t, "<div>"+string(h)+"</div>")
}

// Numbers keep their significant digits, trailing zeros included, with a
// true minus sign.
func TestSignificantDigits(t *testing.T) {
	for _, c := range []struct {
		x    float64
		n    int
		want string
	}{
		{0.25, 3, "0.250"}, {0.731, 3, "0.731"}, {9.996, 3, "10.0"}, {-0.25, 3, "−0.250"},
		{1234.6, 4, "1235"}, {1.23e-5, 3, "1.23e−5"}, {2.5e7, 2, "2.5e7"}, {0, 3, "0"}, {math.NaN(), 3, "—"},
	} {
		if got := fsig(c.x, c.n); got != c.want {
			t.Errorf("fsig(%g, %d) = %q, want %q", c.x, c.n, got, c.want)
		}
	}
	if got := sameDecimals(0.00026, 0.00735, 3); got != "0.00026" {
		t.Errorf("standard error beside 0.00735: %q", got)
	}
	if got := fmtR2(0.99996); got != "> 0.9999" {
		t.Errorf("R² that rounds to 1: %q", got)
	}
}

// A PNG gets a pHYs chunk right after IHDR that states its resolution in
// pixels per metre (PNG specification, ISO/IEC 15948:2004, §11.3.5.3);
// the chunk's CRC-32 is checked with the standard library's table, and
// the file still decodes.
func TestPNGResolution(t *testing.T) {
	img := image.NewNRGBA(image.Rect(0, 0, 4, 3))
	img.Set(1, 1, color.Black)
	var buf bytes.Buffer
	if err := png.Encode(&buf, img); err != nil {
		t.Fatal(err)
	}
	b := withResolution(buf.Bytes(), 144)
	if _, err := png.Decode(bytes.NewReader(b)); err != nil {
		t.Fatalf("the PNG does not decode: %v", err)
	}
	at := 8 + 25 // signature, IHDR chunk
	if string(b[at+4:at+8]) != "pHYs" || binary.BigEndian.Uint32(b[at:]) != 9 {
		t.Fatalf("no pHYs chunk after IHDR: %q", b[at:at+8])
	}
	data := b[at+8 : at+17]
	if x, y := binary.BigEndian.Uint32(data), binary.BigEndian.Uint32(data[4:]); x != 5669 || y != 5669 || data[8] != 1 {
		t.Errorf("pHYs %d × %d, unit %d; 144 dpi is 5669 per metre", x, y, data[8])
	}
	if crc := binary.BigEndian.Uint32(b[at+17:]); crc != crc32.ChecksumIEEE(b[at+4:at+17]) {
		t.Errorf("pHYs CRC %08x is wrong", crc)
	}
}

// Axis ticks: at most the asked number of labels, at least two, distinct,
// on any span.
func TestTickLabels(t *testing.T) {
	for _, r := range [][2]float64{{0, 9.6}, {1.005, 1.15}, {-0.19, 0.19}, {0, 0.0031}, {0.005, 0.161}, {-2, 150}, {1.0004, 1.0009}, {0, 100}} {
		for _, most := range []int{5, 6} {
			seen := map[string]bool{}
			for _, tk := range (niceTicks{maxLabels: most}).Ticks(r[0], r[1]) {
				if tk.Label == "" {
					continue
				}
				if seen[tk.Label] {
					t.Errorf("%v: label %s twice", r, tk.Label)
				}
				seen[tk.Label] = true
			}
			if len(seen) > most || len(seen) < 2 {
				t.Errorf("%v with at most %d: %d labels %v", r, most, len(seen), seen)
			}
		}
	}
	// A span of one unit in the last place (a cohort quantity equal in
	// every specimen) once looped for ever, the step too small to move
	// the value: one labelled tick.
	lo := 7.872752441241504
	if ts := (niceTicks{maxLabels: 6}).Ticks(lo, math.Nextafter(lo, 10)); len(ts) != 1 || ts[0].Label == "" {
		t.Errorf("a span of one ulp: ticks %v, want one labelled tick", ts)
	}
	labelled := 0
	for _, tk := range (logTicks{maxLabels: 6}).Ticks(0.1, 2e5) {
		if tk.Label != "" {
			labelled++
			if tk.Label == "1" {
				labelled += 100
			}
		}
	}
	if labelled < 100 || labelled-100 > 6 {
		t.Errorf("log ticks over 0.1 … 2e5: %d labels, the threshold at 1 labelled: %v", labelled%100, labelled >= 100)
	}
}

// The stretch where the fibres take over half the load is interpolated
// linearly between the points that straddle one half; a fraction that
// starts above or never reaches one half says so.
func TestTakeover(t *testing.T) {
	xs := []float64{1.00, 1.05, 1.10, 1.15}
	to, ok := takeoverOf(xs, []float64{math.NaN(), 0.3, 0.4, 0.6})
	if !ok || math.Abs(to.at-1.125) > 1e-12 || to.from || to.never || to.first != 1.05 {
		t.Errorf("crossing: %+v", to)
	}
	if to, _ := takeoverOf(xs, []float64{0.6, 0.7, 0.7, 0.8}); !to.from || !math.IsNaN(to.at) {
		t.Errorf("from the start: %+v", to)
	}
	if to, _ := takeoverOf(xs, []float64{0.1, 0.2, 0.3, 0.4}); !to.never || to.last != 1.15 {
		t.Errorf("never: %+v", to)
	}
}

// A protocol's model curve is densified between pure-stretch points,
// drawn at the measured points where markers measured shear, and never
// longer than maxCurvePoints.
func TestCurvePath(t *testing.T) {
	var pure, sheared, long [][4]float64
	for i := 0; i < 10; i++ {
		l := 1 + 0.01*float64(i)
		pure = append(pure, [4]float64{l, 0, 0, l})
		sheared = append(sheared, [4]float64{l, 0.01, 0, l})
	}
	for i := 0; i < 5000; i++ {
		long = append(long, [4]float64{1 + 1e-5*float64(i), 0, 0, 1})
	}
	if n := len(CurvePath(pure)); n != 9*curveSubsteps+1 {
		t.Errorf("pure stretch: %d points, want %d", n, 9*curveSubsteps+1)
	}
	if n := len(CurvePath(sheared)); n != 10 {
		t.Errorf("sheared: %d points, want the 10 measured", n)
	}
	p := CurvePath(long)
	if len(p) != maxCurvePoints || p[0] != long[0] || p[len(p)-1] != long[len(long)-1] {
		t.Errorf("long: %d points from %v to %v", len(p), p[0], p[len(p)-1])
	}
}

// Markers of a long series are an even sample (every k-th point, the
// last kept) plus every outlier among its neighbours: on 5 000 points of
// Gaussian scatter with one wild point at an index no stride meets, the
// wild point is drawn, the sample is the every-k-th one, and the rule
// adds only a few points to it (about 5 in 10 000 of Gaussian scatter lie
// beyond a modified z-score of 3.5; Iglewicz & Hoaglin 1993, from
// memory). A short series is drawn whole.
func TestMarkerIndices(t *testing.T) {
	const n = 5000
	rng := rand.New(rand.NewPCG(1, 2))
	ys := make([]float64, n)
	for i := range ys {
		ys[i] = 0.01 * rng.NormFloat64()
	}
	ys[2517] = 0.06 // six standard deviations
	idx := markerIndices(n, ys)
	stride := (n + maxMarkers - 1) / maxMarkers
	even := 0
	for _, k := range idx {
		if k%stride == 0 {
			even++
		}
	}
	if even != (n+stride-1)/stride || !containsIndex(idx, n-1) || !containsIndex(idx, 2517) {
		t.Errorf("%d of the every-%d-th points, last %v, the wild point %v", even, stride, containsIndex(idx, n-1), containsIndex(idx, 2517))
	}
	if extra := len(idx) - even - 1; extra < 1 || extra > 10 {
		t.Errorf("%d points added to the even sample, want the wild one and a few more", extra)
	}
	if !sort.IntsAreSorted(idx) {
		t.Errorf("indices out of order")
	}
	if markerIndices(40, ys[:40]) != nil {
		t.Errorf("a short series lost points")
	}
}

// A long curve or band is drawn by the first point and the extremes of each
// run of consecutive points, with its last point: within about the bound,
// with a narrow peak at an index no stride meets drawn, and a gap (a
// non-finite value) kept a gap.
func TestDrawnIndices(t *testing.T) {
	const n = 5000
	xs, ys := make([]float64, n), make([]float64, n)
	for i := range xs {
		xs[i] = 1 + 0.2*float64(i)/n
		ys[i] = xs[i] * xs[i]
	}
	ys[2517] = 5 // the peak
	ys[3000] = math.NaN()
	idx := drawnIndices(n, maxDrawnPoints, xs, ys)
	if len(idx) > maxDrawnPoints+1 || len(idx) < maxDrawnPoints/3 {
		t.Errorf("%d points drawn of %d, bound %d", len(idx), n, maxDrawnPoints)
	}
	for _, k := range []int{0, n - 1, 2517, 3000} {
		if !containsIndex(idx, k) {
			t.Errorf("point %d not drawn", k)
		}
	}
	if !sort.IntsAreSorted(idx) {
		t.Errorf("indices out of order")
	}
	if px, py := pick(xs, idx), pick(ys, idx); len(finitePieces(px, py)) != 2 {
		t.Errorf("the gap at point 3000 was not kept")
	}
	if band := drawnIndices(n, maxDrawnPoints, xs, ys, ys); len(band) > maxDrawnPoints+1 {
		t.Errorf("band: %d points drawn, bound %d", len(band), maxDrawnPoints)
	}
	if drawnIndices(40, maxDrawnPoints, xs[:40], ys[:40]) != nil {
		t.Errorf("a short series lost points")
	}
}

// containsIndex reports whether the sorted indices idx hold k.
func containsIndex(idx []int, k int) bool {
	j := sort.SearchInts(idx, k)
	return j < len(idx) && idx[j] == k
}

// A resampled protocol can give two points the same source line (each
// resampled point takes the line of its nearer measured row): the held-out
// table's rows are matched to fit.csv's points in their order, one each,
// and a held-out row beyond fit.csv's points is an error, not a crash.
func TestHeldoutRowsMatchRepeatedLines(t *testing.T) {
	fit := "protocol,line,cycle,F11,F12,F21,F22,measured_nominal_11 [kPa],model_nominal_11 [kPa],residual_nominal_11 [kPa]\n" +
		"1:1,5,1,1.00,0,0,1,0,0,0\n" +
		"1:1,5,1,1.01,0,0,1,1,1,0\n" +
		"1:1,6,1,1.02,0,0,1,2,2,0\n"
	ft, err := readFitTable(strings.NewReader(fit), "fit.csv")
	if err != nil {
		t.Fatal(err)
	}
	held := "protocol,line,F11,F12,F21,F22,heldout_nominal_11 [kPa]\n" +
		"1:1,5,1.00,0,0,1,10\n" +
		"1:1,5,1.01,0,0,1,11\n" +
		"1:1,6,1.02,0,0,1,12\n"
	ht, err := readHeldoutTable(strings.NewReader(held), "heldout.csv", ft)
	if err != nil {
		t.Fatal(err)
	}
	got := ht.stress["1:1"][0]
	if len(got) != 3 || got[0] != 10 || got[1] != 11 || got[2] != 12 {
		t.Errorf("held-out stresses %v, want [10 11 12] in fit.csv's order", got)
	}
	extra := held + "1:1,5,1.03,0,0,1,13\n"
	if _, err := readHeldoutTable(strings.NewReader(extra), "heldout.csv", ft); err == nil || !strings.Contains(err.Error(), "source line 5") {
		t.Errorf("a third row from line 5: want an error naming the line, got %v", err)
	}
}

// Folder names keep letters and digits of any script (two specimens named
// "Probe-Ä" and "Probe-Ö" once both became "Probe-_" and collided), turn
// every other run into one '_', and never start with a dot, which would
// hide the folder ("../../escape" once became ".._.._escape", now
// "__.._escape").
func TestSafeName(t *testing.T) {
	for in, want := range map[string]string{
		"membrane-M1":      "membrane-M1",
		"Probe-Ä":          "Probe-Ä",
		"Probe-Ö":          "Probe-Ö",
		"Membrán-Ω 膜 😀":    "Membrán-Ω_膜_",
		"../../escape":     "__.._escape",
		".hidden":          "_hidden",
		"a/b\\c:d":         "a_b_c_d",
		"..":               "..",
		"skin sample 3.v2": "skin_sample_3.v2",
	} {
		if got := SafeName(in); got != want {
			t.Errorf("SafeName(%q) = %q, want %q", in, got, want)
		}
	}
}

// splitFitCSV is a fit.csv of two protocols whose axis 2 carries under
// 2 % of axis 1's largest stress: in "alone" the matrix carries it alone
// (a fibre family along axis 1 has no 22 stress under pure biaxial
// stretch; Holzapfel 2000, §6.6), in "cancel" the matrix and the fibres
// carry stresses that cancel to 1 % of their magnitudes.
const splitFitCSV = "protocol,line,cycle,F11,F12,F21,F22,measured_nominal_11 [kPa],model_nominal_11 [kPa],residual_nominal_11 [kPa]," +
	"measured_nominal_22 [kPa],model_nominal_22 [kPa],residual_nominal_22 [kPa]," +
	"i1-lin:nominal_11 [kPa],fib-quad@f1:nominal_11 [kPa],i1-lin:nominal_22 [kPa],fib-quad@f1:nominal_22 [kPa]\n" +
	"alone,2,1,1.01,0,0,1.005,1,1,0,0.1,0.1,0,0.5,0.5,0.1,0\n" +
	"alone,3,1,1.05,0,0,1.025,10,10,0,0.2,0.2,0,1,9,0.2,0\n" +
	"alone,4,1,1.10,0,0,1.05,30,30,0,0.3,0.3,0,1.5,28.5,0.3,0\n" +
	"cancel,2,1,1.01,0,0,1.005,1,1,0,0.01,0.01,0,0.5,0.5,-1,1.01\n" +
	"cancel,3,1,1.05,0,0,1.025,10,10,0,0.02,0.02,0,1,9,-2,2.02\n" +
	"cancel,4,1,1.10,0,0,1.05,30,30,0,0.03,0.03,0,1.5,28.5,-3,3.03\n"

// A component under 2 % of its protocol's normal stress has no share only
// when its terms cancel (aniso.NoLoadToShare): the report's own test on
// fit.csv, for cards written before they gave the reason, once withheld
// the share of a small stress that the matrix carried alone.
func TestNoShareOnlyWhereTermsCancel(t *testing.T) {
	ft, err := readFitTable(strings.NewReader(splitFitCSV), "fit.csv")
	if err != nil {
		t.Fatal(err)
	}
	in := &Input{table: ft}
	if got := in.noShare("alone", card.SplitCompCard{Component: "22"}); got != "" {
		t.Errorf("alone P22 (matrix only): %q, want a share", got)
	}
	if got := in.noShare("cancel", card.SplitCompCard{Component: "22"}); got == "" {
		t.Errorf("cancel P22 (terms cancel to 1 %%): a share, want none")
	}
}

// The take-over is found on every point with a load, the toe included:
// below 2 % of the protocol's largest normal stress the matrix carries
// the load alone until the fibres are recruited (Lanir 1983), and the
// fibres take over between the second and the third point. When such
// points were left out as negligible, the report said "fibres > ½ from
// the start (λ = 1.050)" for a protocol that starts at λ = 1.01 with the
// matrix carrying all of it. Points whose groups cancel stay out.
func TestTakeoverSeesTheToe(t *testing.T) {
	toe := "toe,2,1,1.01,0,0,1.005,0.1,0.1,0,1,1,0,0.1,0,1,0\n" +
		"toe,3,1,1.03,0,0,1.015,0.2,0.2,0,2,2,0,0.2,0,2,0\n" +
		"toe,4,1,1.05,0,0,1.025,10,10,0,3,3,0,0.3,9.7,3,0\n" +
		"toe,5,1,1.10,0,0,1.05,30,30,0,4,4,0,0.4,29.6,4,0\n"
	ft, err := readFitTable(strings.NewReader(splitFitCSV+toe), "fit.csv")
	if err != nil {
		t.Fatal(err)
	}
	groups := ft.groupsOf()
	for _, pr := range ft.protocols {
		switch pr.label {
		case "toe":
			fib := fibreFraction(groups, ft.groupShares(pr, 0, groups))
			to, ok := takeoverOf(xsOf(pr.F, "11", false), fib)
			if !ok || to.from || to.first != 1.01 || !(to.at > 1.03 && to.at < 1.05) {
				t.Errorf("toe: fibre fractions %v, take-over %+v; want from λ = 1.01, crossing between 1.03 and 1.05", fib, to)
			}
		case "cancel":
			for g, sh := range ft.groupShares(pr, 1, groups) {
				for i, v := range sh {
					if !math.IsNaN(v) {
						t.Errorf("cancel P22 point %d: group %s has share %g of stresses that cancel", i, groups[g], v)
					}
				}
			}
		}
	}
}

// A record tile counts its cycles in words: "1 cycle", "3 cycles", and
// nothing when raw.csv numbers none (a one-cycle file once read "1 cycles").
func TestRawTitle(t *testing.T) {
	for _, c := range []struct {
		n    int
		want string
	}{{0, "1:1"}, {1, "1:1 · 1 cycle"}, {3, "1:1 · 3 cycles"}} {
		if got := rawTitle("1:1", c.n); got != c.want {
			t.Errorf("rawTitle(1:1, %d) = %q, want %q", c.n, got, c.want)
		}
	}
}

// A strip-biaxial protocol (common practice: one axis held at a fixed
// stretch, the other pulled) plots the held axis's stress against the
// pulled axis's stretch and says so; against its own, constant stretch
// every point stacked on one vertical line at λ = 1 and the fit of that
// axis could not be read. A protocol 1:0.25 (span ratio 0.25) keeps each
// axis's own stretch.
func TestHeldAxisAgainstTheOther(t *testing.T) {
	var strip, quarter [][4]float64
	for i := 0; i <= 10; i++ {
		e := 0.015 * float64(i)
		strip = append(strip, [4]float64{1 + e, 0, 0, 1})
		quarter = append(quarter, [4]float64{1 + e, 0, 0, 1 + e/4})
	}
	if a := abscissaComp(strip, "22"); a != "11" {
		t.Errorf("strip 1:0, P22 against %s, want 11", a)
	}
	if a := abscissaComp(strip, "11"); a != "11" {
		t.Errorf("strip 1:0, P11 against %s, want 11", a)
	}
	if a := abscissaComp(quarter, "22"); a != "22" {
		t.Errorf("1:0.25, P22 against %s, want its own 22", a)
	}
	if a := abscissaComp(strip, "12"); a != "12" {
		t.Errorf("shear against %s, want its own shear strain", a)
	}
	if xs := xsOf(strip, "22", false); xs[0] != 1 || math.Abs(xs[10]-1.15) > 1e-12 {
		t.Errorf("strip 1:0, P22 abscissae %v, want λ1 from 1 to 1.15", xs)
	}
	ft := &fitTable{comps: []string{"11", "22"}, kind: "nominal"}
	if n := ft.heldNote(strip, false); n != "\nP22 against λ1 (axis 2 held)" {
		t.Errorf("held note %q", n)
	}
	if n := ft.heldNote(quarter, true); n != "" {
		t.Errorf("1:0.25 held note %q, want none", n)
	}
	if s := takeoverText(takeover{from: true, first: 1.008}, true, "λ1"); s != "fibres > ½ from the start (λ1 = 1.008)" {
		t.Errorf("take-over text %q", s)
	}
}
