package main

import (
	"encoding/csv"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// A strip that was never tested is predicted by a model the tested
// protocols chose; the models they could not tell from it may predict it
// otherwise. The Fung-type solid of testdata/fung-orthotropic.csv
// (SYNTHETIC, independent code; Tong & Fung 1976 form with c = 4 kPa,
// c1 = 30, c2 = 10, c3 = 4 in the tester's axes) is fitted without its
// 1:0 protocol (axis 2 held at stretch 1), and the strip is predicted
// along the file's own path (λ1 − 1 = 0.16 t, λ2 = 1). The truth is Tong &
// Fung's closed form, P11 = λ1 S11, P22 = S22 with S11 = c e^Q c1 E11,
// S22 = c e^Q c3 E11, Q = c1 E11², E11 = (λ1² − 1)/2 (derived here). The
// card's own model misses it by a few per cent of the peak; the band of
// its near-equivalent models (alike_low_, alike_high_) holds the truth
// within 1 % of the peak at every row, and is at least as wide as half
// the card's miss, so the file itself shows that the tests do not settle
// this prediction, and the fit's summary names the strip as untested.
// Measured once on 42 such strips of independent solids (Fung-type,
// isotropic, fibre-reinforced; README): the truth lay within 0.9 % of the
// peak of every band.
func TestPredictAlikeBandCoversUntestedStrip(t *testing.T) {
	t.Parallel()
	if testing.Short() {
		t.Skip("one discovery")
	}
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "fung-orthotropic.csv"))
	if err != nil {
		t.Fatal(err)
	}
	var kept []string
	for _, line := range strings.Split(string(src), "\n") {
		if !strings.HasPrefix(line, "1:0,") {
			kept = append(kept, line)
		}
	}
	data := writeTemp(t, "fung-without-strip.csv", strings.Join(kept, "\n"))
	dir := filepath.Join(t.TempDir(), "out.weft")
	summary, errs, exit := runWeft(t, "fit", data, "-o", dir)
	if exit != 0 {
		t.Fatalf("weft fit: exit %d: %s", exit, errs)
	}
	// The summary names the strip the data did not test, and not the 0:1
	// strip, which they did.
	if !strings.Contains(summary, "untested: strip 1:0 (axis 2 held at stretch 1, to stretch 1.16)") || strings.Contains(summary, "strip 0:1") {
		t.Errorf("summary's untested strips:\n%s", summary)
	}
	// The card records it (untested_strips) and the report says it.
	cd, _ := readCardFile(t, filepath.Join(dir, "model.json"))
	if u := cd.UntestedStrips; len(u) != 2 || u[0].Label != "1:0" || !(u[0].Percent > 1) || u[1].Label != "1:0 turned 45°" {
		t.Errorf("card's untested_strips %+v; want 1:0 and, for an orthotropic solid, 1:0 turned 45°", u)
	}
	if html, err := os.ReadFile(filepath.Join(dir, "report.html")); err != nil || !strings.Contains(string(html), "Strips not tested (one axis held at stretch 1; turned: cut or mounted so)") {
		t.Errorf("report.html does not name the untested strip (%v)", err)
	}
	const c, c1, c3 = 4.0, 30.0, 4.0
	var path strings.Builder
	path.WriteString("stretch_1,stretch_2\n")
	var truth [][2]float64
	peak := 0.0
	for i := range 40 {
		l1 := 1 + 0.16*float64(i)/39
		e := (l1*l1 - 1) / 2
		k := c * math.Exp(c1*e*e)
		p := [2]float64{l1 * k * c1 * e, k * c3 * e}
		truth = append(truth, p)
		peak = math.Max(peak, math.Max(math.Abs(p[0]), math.Abs(p[1])))
		fmt.Fprintf(&path, "%.12g,1\n", l1)
	}
	stdout, stderr, code := runWeft(t, "predict", filepath.Join(dir, "model.json"), writeTemp(t, "strip.csv", path.String()))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stdout, "# NOTE: ") || !strings.Contains(stdout, "predicted the held-out protocols as well as this one") {
		t.Fatalf("no note on the near-equivalent models:\n%s", stdout)
	}
	r := csv.NewReader(strings.NewReader(stdout))
	r.Comment = '#'
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range rows[0] {
		col[strings.Fields(h)[0]] = i
	}
	num := func(row []string, name string) float64 {
		i, ok := col[name]
		if !ok {
			t.Fatalf("no column %s in %v", name, rows[0])
		}
		v, err := strconv.ParseFloat(row[i], 64)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	miss, outside, width := 0.0, 0.0, 0.0
	for i, row := range rows[1:] {
		for j, name := range []string{"nominal_11", "nominal_22"} {
			want := truth[i][j]
			lo, hi := num(row, "alike_low_"+name), num(row, "alike_high_"+name)
			miss = math.Max(miss, math.Abs(num(row, name)-want))
			outside = math.Max(outside, math.Max(lo-want, want-hi))
			width = math.Max(width, hi-lo)
		}
	}
	t.Logf("card's miss %.2f %% of the peak, band up to %.2f %%, truth outside it by %.2f %%", 100*miss/peak, 100*width/peak, 100*math.Max(outside, 0)/peak)
	if miss < 0.01*peak {
		t.Fatalf("the card's model predicts the strip within %.2g %% of the peak: the test needs a prediction the tests do not settle", 100*miss/peak)
	}
	if outside > 0.01*peak || width < 0.5*miss {
		t.Errorf("the band (up to %.3g wide) misses the truth by %.3g (peak %.3g), card's miss %.3g", width, outside, peak, miss)
	}
}
