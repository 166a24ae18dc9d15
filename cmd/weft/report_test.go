package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"encoding/xml"
	"fmt"
	"image"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/weft-tools/weft/cmd/weft/internal/report"

	"github.com/weft-tools/weft/aniso/card"
)

// demoFile is a synthetic demo specimen shipped in testdata/demo.
func demoFile(name string) string { return filepath.Join("..", "..", "testdata", "demo", name) }

// fitDemo runs 'weft fit' on a demo file into a fresh folder.
func fitDemo(t *testing.T, file string, extra ...string) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "out.weft")
	args := append([]string{"fit", demoFile(file), "-o", dir, "--quiet"}, extra...)
	if _, stderr, code := runWeft(t, args...); code != 0 {
		t.Fatalf("weft %v: exit %d: %s", args, code, stderr)
	}
	return dir
}

// svgPath is one drawn path of an SVG file: its colours, whether it is
// dashed, its straight segments and arcs.
type svgPath struct {
	d, stroke, fill string
	dashed          bool
	segs, arcs      int
}

// readSVG parses an SVG file with a general XML parser and returns its
// paths and texts; the file must be well-formed.
func readSVG(t *testing.T, file string) ([]svgPath, []string, map[string]string) {
	t.Helper()
	b, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	dec := xml.NewDecoder(bytes.NewReader(b))
	var paths []svgPath
	var texts []string
	root := map[string]string{}
	inText := false
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("%s is not well-formed XML: %v", file, err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			attrs := map[string]string{}
			for _, a := range el.Attr {
				attrs[a.Name.Local] = a.Value
			}
			switch el.Name.Local {
			case "svg":
				root = attrs
			case "path":
				p := svgPath{d: attrs["d"], segs: strings.Count(attrs["d"], "L"), arcs: strings.Count(attrs["d"], "A")}
				for _, kv := range strings.Split(attrs["style"], ";") {
					k, v, _ := strings.Cut(kv, ":")
					switch k {
					case "stroke":
						p.stroke = v
					case "fill":
						p.fill = v
					case "stroke-dasharray":
						p.dashed = v != "none"
					}
				}
				paths = append(paths, p)
			case "text":
				inText = true
				texts = append(texts, "")
			}
		case xml.CharData:
			if inText {
				texts[len(texts)-1] += string(el)
			}
		case xml.EndElement:
			if el.Name.Local == "text" {
				inText = false
			}
		}
	}
	return paths, texts, root
}

// countPaths counts the paths for which keep is true.
func countPaths(ps []svgPath, keep func(svgPath) bool) int {
	n := 0
	for _, p := range ps {
		if keep(p) {
			n++
		}
	}
	return n
}

// fitCSVPoints counts fit.csv's rows per protocol with a plain CSV reader,
// in order of first appearance.
func fitCSVPoints(t *testing.T, dir string) ([]string, map[string]int) {
	t.Helper()
	f, err := os.Open(filepath.Join(dir, "fit.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var labels []string
	n := map[string]int{}
	for _, r := range rows[1:] {
		if n[r[0]] == 0 {
			labels = append(labels, r[0])
		}
		n[r[0]]++
	}
	return labels, n
}

// checkPNG decodes a PNG and checks that it is a real picture: large
// enough and not one flat colour.
func checkPNG(t *testing.T, file string) {
	t.Helper()
	f, err := os.Open(file)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("%s: %v", file, err)
	}
	b := img.Bounds()
	if b.Dx() < 600 || b.Dy() < 300 {
		t.Errorf("%s: %d×%d px, want at least 600×300", file, b.Dx(), b.Dy())
	}
	colours := map[[4]uint32]bool{}
	for y := b.Min.Y; y < b.Max.Y; y += 3 {
		for x := b.Min.X; x < b.Max.X; x += 3 {
			r, g, bb, a := img.At(x, y).RGBA()
			colours[[4]uint32{r, g, bb, a}] = true
		}
	}
	if len(colours) < 20 {
		t.Errorf("%s: only %d distinct colours: nothing drawn?", file, len(colours))
	}
	if _, ok := img.(image.Image); !ok {
		t.Errorf("%s: not an image", file)
	}
}

// Colours of the report (Okabe & Ito 2008 palette, as the SVG writes them).
const (
	svgBlue       = "#0072B2"
	svgVermillion = "#D55E00"
	svgGreen      = "#009E73"
	svgPurple     = "#CC79A7"
)

// TestReportDemo fits the 5-protocol synthetic demo specimen membrane-M1
// (discovery) and checks the report weft fit writes with it.
func TestReportDemo(t *testing.T) {
	t.Parallel()
	dir := demoFitCopy(t, "membrane-M1")
	labels, points := fitCSVPoints(t, dir)
	if len(labels) != 5 {
		t.Fatalf("fit.csv has %d protocols, the demo file has 5", len(labels))
	}
	var c struct {
		Terms []struct {
			ID     string  `json:"id"`
			Weight float64 `json:"weight"`
			Family string  `json:"family"`
		} `json:"terms"`
		Selection card.SelectionSection `json:"selection"`
		Fit       card.FitSection       `json:"fit"`
	}
	mj, err := os.ReadFile(filepath.Join(dir, "model.json"))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(mj, &c); err != nil {
		t.Fatal(err)
	}

	t.Run("a fit plot per protocol with its series", func(t *testing.T) {
		for i, l := range labels {
			base := filepath.Join(dir, "plots", plotName("fit", i, l))
			checkPNG(t, base+".png")
			if st, err := os.Stat(base + ".svg"); err != nil || st.Size() < 10000 {
				t.Fatalf("%s.svg missing or too small: %v", base, err)
			}
			paths, texts, root := readSVG(t, base+".svg")
			n := points[l]
			// Measured points: one ring (axis 1) or square (axis 2) per
			// fit.csv row, plus one in the legend.
			rings := countPaths(paths, func(p svgPath) bool { return p.stroke == svgBlue && p.fill == "none" && p.arcs == 2 })
			squares := countPaths(paths, func(p svgPath) bool { return p.stroke == svgVermillion && p.segs == 3 && strings.HasSuffix(p.d, "Z") })
			if rings != n+1 || squares != n+1 {
				t.Errorf("protocol %s: %d rings and %d squares, want %d each (%d points in fit.csv + legend)", l, rings, squares, n+1, n)
			}
			// Model curves: one solid polyline per axis, densified
			// between the points; held-out: one dashed polyline per axis.
			solid := countPaths(paths, func(p svgPath) bool {
				return (p.stroke == svgBlue || p.stroke == svgVermillion) && !p.dashed && p.segs >= n
			})
			dashed := countPaths(paths, func(p svgPath) bool { return p.dashed && p.segs >= n-1 })
			if solid != 2 || dashed != 2 {
				t.Errorf("protocol %s: %d model curves and %d held-out curves, want 2 and 2", l, solid, dashed)
			}
			joined := strings.Join(texts, "\n")
			for _, want := range []string{"Protocol " + l, "nominal stress P [kPa]", "stretch λ", "R² "} {
				if !strings.Contains(joined, want) {
					t.Errorf("protocol %s: the plot has no text %q", l, want)
				}
			}
			if root["width"] == "" || root["height"] == "" || root["viewBox"] == "" {
				t.Errorf("protocol %s: svg without width, height or viewBox: %v", l, root)
			}
		}
	})

	t.Run("grid of all protocols", func(t *testing.T) {
		checkPNG(t, filepath.Join(dir, "plots", "fit-all.png"))
		paths, texts, _ := readSVG(t, filepath.Join(dir, "plots", "fit-all.svg"))
		curves := countPaths(paths, func(p svgPath) bool { return p.stroke == svgBlue && !p.dashed && p.segs >= 30 })
		if curves != len(labels) {
			t.Errorf("fit-all has %d axis-1 model curves, want one per protocol (%d)", curves, len(labels))
		}
		joined := strings.Join(texts, "\n")
		for _, l := range labels {
			if !strings.Contains(joined, l+" · R² ") {
				t.Errorf("fit-all has no tile titled %q with its R²", l)
			}
		}
	})

	t.Run("split plots stack every active term", func(t *testing.T) {
		active := 0
		for _, tm := range c.Terms {
			if tm.Weight > 0 {
				active++
			}
		}
		for i, l := range labels {
			base := filepath.Join(dir, "plots", plotName("split", i, l))
			checkPNG(t, base+".png")
			paths, texts, _ := readSVG(t, base+".svg")
			// One band per active term and stress component (2), plus
			// the legend swatch; the matrix grey and the family blue.
			fills := map[string]int{}
			for _, p := range paths {
				if p.fill != "" && p.fill != "none" && p.fill != "#FFFFFF" && p.fill != "#000000" {
					fills[p.fill]++
				}
			}
			if len(fills) != active {
				t.Errorf("split %s: %d band colours %v, want %d active terms", l, len(fills), fills, active)
			}
			if fills[svgBlue] != 3 {
				t.Errorf("split %s: the fibre family's blue fills %d shapes, want 3 (two panels and the legend)", l, fills[svgBlue])
			}
			joined := strings.Join(texts, "\n")
			for _, tm := range c.Terms {
				if tm.Weight > 0 && !strings.Contains(joined, tm.ID) {
					t.Errorf("split %s: the legend does not name %s", l, tm.ID)
				}
			}
		}
		checkPNG(t, filepath.Join(dir, "plots", "split-shares.png"))
	})

	t.Run("evidence plots", func(t *testing.T) {
		for _, n := range []string{"residuals", "angle-profile", "pareto", "cross-r2"} {
			checkPNG(t, filepath.Join(dir, "plots", n+".png"))
		}
		paths, _, _ := readSVG(t, filepath.Join(dir, "plots", "pareto.svg"))
		single := 0
		for _, cc := range c.Selection.Pareto {
			if cc.Layout == "single" && !cc.Dispersion && !cc.InPlane {
				single++
			}
		}
		boxes := countPaths(paths, func(p svgPath) bool { return p.fill == svgBlue && p.segs == 3 })
		if boxes != single+1 {
			t.Errorf("pareto: %d filled blue squares, want %d one-family forms + legend", boxes, single+1)
		}
		if countPaths(paths, func(p svgPath) bool { return p.stroke == "#000000" && strings.Contains(p.d, "A8,8") }) != 2 {
			t.Errorf("pareto: the chosen model is not ringed (plot and legend)")
		}
		_, texts, _ := readSVG(t, filepath.Join(dir, "plots", "cross-r2.svg"))
		cell := regexp.MustCompile(`^(−\d\.\d{3}|\d\.\d{4,5})$`) // as the cells write R²
		cells := 0
		for _, s := range texts {
			if cell.MatchString(s) {
				cells++
			}
		}
		if n := len(c.Selection.CrossR2); cells != n*n || n != len(labels) {
			t.Errorf("cross-r2: %d value cells for a %d×%d matrix", cells, n, n)
		}
		_, texts, _ = readSVG(t, filepath.Join(dir, "plots", "angle-profile.svg"))
		if !strings.Contains(strings.Join(texts, " "), "95 % interval") {
			t.Errorf("angle profile: no interval in the title")
		}
	})

	t.Run("report.html is self-contained and complete", func(t *testing.T) {
		b, err := os.ReadFile(filepath.Join(dir, "report.html"))
		if err != nil {
			t.Fatal(err)
		}
		html := string(b)
		for _, bad := range []string{"http:", "https:", "src=", "@import", "url(", "<script", "<link", "<img", "<iframe", "<object"} {
			if strings.Contains(strings.ToLower(html), bad) {
				t.Errorf("report.html contains %q: it must refer to nothing outside itself", bad)
			}
		}
		for _, m := range regexp.MustCompile(`href="([^"]*)"`).FindAllStringSubmatch(html, -1) {
			if !strings.HasPrefix(m[1], "#") {
				t.Errorf("report.html links outside itself: %s", m[0])
			}
		}
		for _, l := range labels {
			if !strings.Contains(html, "<td>"+l+"</td>") {
				t.Errorf("report.html does not name protocol %s in its tables", l)
			}
		}
		svgs := strings.Count(html, "<svg ")
		files, _ := filepath.Glob(filepath.Join(dir, "plots", "*.svg"))
		if svgs != len(files) || svgs < 2*len(labels)+5 {
			t.Errorf("report.html inlines %d plots, plots/ has %d SVG files", svgs, len(files))
		}
		for _, want := range append(append([]string{}, card.Cautions...), "SYNTHETIC DATA", "60.608", "Verdict:", "preset:hgo", "Rule:") {
			if !strings.Contains(html, htmlText(want)) {
				t.Errorf("report.html lacks %q", want)
			}
		}
	})

	t.Run("weft report rebuilds the same bytes", func(t *testing.T) {
		before := readTree(t, dir)
		if _, stderr, code := runWeft(t, "report", dir); code != exitBadInput || !strings.Contains(stderr, "--force") {
			t.Errorf("report over an existing report without --force: exit %d, %s", code, stderr)
		}
		if _, stderr, code := runWeft(t, "report", dir, "--force"); code != 0 {
			t.Fatalf("weft report: exit %d: %s", code, stderr)
		}
		after := readTree(t, dir)
		if len(after) != len(before) {
			t.Errorf("%d files before, %d after", len(before), len(after))
		}
		for name, b := range before {
			if !bytes.Equal(after[name], b) {
				t.Errorf("%s differs after 'weft report --force'", name)
			}
		}
	})

	t.Run("--strain plots against Green strain", func(t *testing.T) {
		if _, stderr, code := runWeft(t, "report", dir, "--strain", "--force"); code != 0 {
			t.Fatalf("weft report --strain: exit %d: %s", code, stderr)
		}
		_, texts, _ := readSVG(t, filepath.Join(dir, "plots", plotName("fit", 0, labels[0])+".svg"))
		joined := strings.Join(texts, "\n")
		if !strings.Contains(joined, "Green strain E") || strings.Contains(joined, "stretch λ") {
			t.Errorf("--strain: the x axis is not labelled Green strain")
		}
		// The x tick labels must be strains, not stretches: the demo
		// stretches run from 1.005 to 1.15, so E = ½(λ² − 1) runs from
		// 0.005 to 0.16125 (Green–Lagrange strain, Holzapfel 2000, §2.5).
		// The stress ticks of this protocol are whole numbers.
		top := 0.0
		for _, s := range texts {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil || !strings.Contains(s, ".") {
				continue
			}
			if v > 1 && v < 1.2 {
				t.Errorf("--strain: a stretch-like tick %s", s)
			}
			if v < 1 {
				top = math.Max(top, v)
			}
		}
		if top < 0.1 || top > 0.17 {
			t.Errorf("--strain: largest strain tick %g, want one between 0.1 and 0.16", top)
		}
		if _, stderr, code := runWeft(t, "report", dir, "--force"); code != 0 {
			t.Fatalf("weft report: exit %d: %s", code, stderr)
		}
	})

	t.Run("held-out curves are the cross-validation folds", func(t *testing.T) {
		// The dashed curves must be the predictions the selection scored:
		// per protocol, the mean held-out R² over components from
		// heldout.csv and fit.csv equals the chosen form's fold R² in
		// model.json (a consistency check between two code paths).
		fit := readCSV(t, filepath.Join(dir, "fit.csv"))
		held := readCSV(t, filepath.Join(dir, "heldout.csv"))
		col := func(h []string, name string) int {
			for i, x := range h {
				if strings.HasPrefix(x, name+" [") {
					return i
				}
			}
			t.Fatalf("no column %s in %v", name, h)
			return -1
		}
		var folds []card.FoldCard
		for _, cc := range c.Selection.Pareto {
			if cc.Chosen {
				folds = cc.HeldoutFolds
			}
		}
		if len(folds) != len(labels) {
			t.Fatalf("%d folds for %d protocols", len(folds), len(labels))
		}
		var comps []string // "nominal_11", ...: every measured component
		for _, h := range fit[0] {
			if name, ok := strings.CutPrefix(h, "measured_"); ok {
				comps = append(comps, strings.Fields(name)[0])
			}
		}
		for _, f := range folds {
			sum := 0.0
			for _, comp := range comps {
				// The held-out prediction of each kept point, matched by
				// protocol and source line.
				hc := col(held[0], "heldout_"+comp)
				pred := map[string]float64{}
				for _, r := range held[1:] {
					if r[0] == f.Protocol {
						pred[r[1]], _ = strconv.ParseFloat(r[hc], 64)
					}
				}
				mc := col(fit[0], "measured_"+comp)
				var meas, mod []float64
				for _, r := range fit[1:] {
					if r[0] == f.Protocol {
						v, _ := strconv.ParseFloat(r[mc], 64)
						meas = append(meas, v)
						mod = append(mod, pred[r[1]])
					}
				}
				sum += coefficientOfDetermination(meas, mod)
			}
			got := sum / float64(len(comps))
			if math.Abs(got-float64(f.R2)) > 1e-8 {
				t.Errorf("protocol %s: held-out R² %v from heldout.csv, %v in the card's cross-validation", f.Protocol, got, float64(f.R2))
			}
		}
	})

	t.Run("chromium renders it", func(t *testing.T) { checkInChromium(t, dir, labels) })
}

// htmlText escapes s as html/template writes text.
func htmlText(s string) string {
	r := strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;", `"`, "&#34;", "'", "&#39;", "+", "&#43;")
	return r.Replace(s)
}

// readTree reads every file under dir by relative path.
func readTree(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	err := filepath.Walk(dir, func(p string, info os.FileInfo, err error) error {
		if err != nil || info.IsDir() {
			return err
		}
		b, err := os.ReadFile(p)
		rel, _ := filepath.Rel(dir, p)
		out[rel] = b
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// TestReportShearAndChosenForm fits the sutured demo specimen, whose
// markers give F12 and F21 and whose file gives the shear stresses, with a
// chosen form: the fit plots get a shear panel, and the report has no
// selection evidence.
func TestReportShearAndChosenForm(t *testing.T) {
	t.Parallel()
	dir := fitDemo(t, "membrane-M3-sutured.csv", "--terms", "i1-lin,fib-expsq", "--families", "1")
	labels, points := fitCSVPoints(t, dir)
	for i, l := range labels {
		paths, texts, _ := readSVG(t, filepath.Join(dir, "plots", plotName("fit", i, l)+".svg"))
		n := points[l]
		// P12: open triangles (3 segments, closed) in bluish green; P21:
		// crosses (two strokes each) in reddish purple; each with a
		// legend entry.
		tri := countPaths(paths, func(p svgPath) bool { return p.stroke == svgGreen && p.segs == 2 && strings.HasSuffix(p.d, "Z") })
		cross := countPaths(paths, func(p svgPath) bool { return p.stroke == svgPurple && p.segs == 1 && !p.dashed })
		if tri != n+1 || cross < 2*n {
			t.Errorf("protocol %s: %d triangles and %d cross strokes for %d points", l, tri, cross, n)
		}
		if !strings.Contains(strings.Join(texts, "\n"), "Green shear strain E12") {
			t.Errorf("protocol %s: no shear panel", l)
		}
	}
	for _, f := range []string{"residuals-shear.svg", "heldout.csv", "report.html"} {
		if _, err := os.Stat(filepath.Join(dir, filepathFromReport(f))); err != nil {
			t.Errorf("%s: %v", f, err)
		}
	}
	for _, f := range []string{"pareto.svg", "cross-r2.svg"} {
		if _, err := os.Stat(filepath.Join(dir, "plots", f)); err == nil {
			t.Errorf("plots/%s written for a chosen-form fit, which has no selection evidence", f)
		}
	}
	b, _ := os.ReadFile(filepath.Join(dir, "report.html"))
	if !strings.Contains(string(b), htmlText("chosen form: i1-lin + fib-expsq@f1, single fibre layout (fitted as asked, not discovered)")) {
		t.Errorf("report.html does not say the model form was chosen")
	}
}

// filepathFromReport maps a report file name to its place in the folder.
func filepathFromReport(f string) string {
	if strings.HasSuffix(f, ".svg") || strings.HasSuffix(f, ".png") {
		return filepath.Join("plots", f)
	}
	return f
}

// TestReportBadFolder: weft report on a folder that lacks what it needs
// exits 2 and says what is missing.
func TestReportBadFolder(t *testing.T) {
	empty := t.TempDir()
	onlyCard := t.TempDir()
	ex, err := os.ReadFile(filepath.Join("..", "..", "testdata", "example", "hgo-media.json"))
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(onlyCard, "model.json"), ex, 0o644)
	noFit := t.TempDir()
	os.WriteFile(filepath.Join(noFit, "model.json"), ex, 0o644)
	os.WriteFile(filepath.Join(noFit, "fit.csv"), []byte("protocol,line,cycle,F11,F12,F21,F22\n"), 0o644)
	file := filepath.Join(t.TempDir(), "x.csv")
	os.WriteFile(file, []byte("x"), 0o644)
	for _, tc := range []struct{ dir, want string }{
		{filepath.Join(empty, "absent"), "does not exist"},
		{file, "is not a folder"},
		{empty, "model.json is missing"},
		{onlyCard, "fit.csv is missing"},
		{noFit, "no 'fit' section"},
	} {
		_, stderr, code := runWeft(t, "report", tc.dir)
		if code != exitBadInput || !strings.Contains(stderr, tc.want) {
			t.Errorf("weft report %s: exit %d, %q; want exit 2 and %q", tc.dir, code, stderr, tc.want)
		}
	}
	if _, err := os.Stat(filepath.Join(onlyCard, "report.html")); err == nil {
		t.Errorf("a failed report wrote report.html")
	}
}

// plotName is the file stem of protocol i's plot as the report names it:
// prefix, the protocol's number and its label made safe for a file name.
func plotName(prefix string, i int, label string) string {
	return fmt.Sprintf("%s-%02d-%s", prefix, i+1, report.SafeName(strings.ReplaceAll(label, ":", "_")))
}

// coefficientOfDetermination is R² = 1 − SS_res/SS_tot of predictions
// against measurements (common practice).
func coefficientOfDetermination(meas, pred []float64) float64 {
	mean := 0.0
	for _, v := range meas {
		mean += v / float64(len(meas))
	}
	ssr, sst := 0.0, 0.0
	for i, v := range meas {
		ssr += (pred[i] - v) * (pred[i] - v)
		sst += (v - mean) * (v - mean)
	}
	return 1 - ssr/sst
}
