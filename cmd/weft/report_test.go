package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/csv"
	"encoding/json"
	"encoding/xml"
	"fmt"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// demoFile is a synthetic demo specimen shipped in testdata/demo.
func demoFile(name string) string { return filepath.Join("..", "..", "testdata", "demo", name) }

// fitDemo runs 'weft fit' on a demo file into a fresh folder.
func fitDemo(t *testing.T, file string, extra ...string) string {
	t.Helper()
	return fitPath(t, demoFile(file), extra...)
}

// fitPath runs 'weft fit' on a data file into a fresh folder and returns
// the folder; the test fails when the fit does.
func fitPath(t *testing.T, data string, extra ...string) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "out.weft")
	args := append([]string{"fit", data, "-o", dir, "--quiet"}, extra...)
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
}

// Colours of the report (Okabe & Ito 2008 palette, as the SVG writes them).
const (
	svgBlue       = "#0072B2"
	svgVermillion = "#D55E00"
	svgGreen      = "#009E73"
	svgPurple     = "#CC79A7"
)

// tiledPlots are the report's figures with one tile per protocol.
var tiledPlots = []string{"fit-all", "raw", "presets", "residuals", "load-share"}

// tileTitles counts, per protocol label, the texts of an SVG that begin
// with the label (tile titles such as "1:0.5 · R² 0.9990 / 0.9985").
func tileTitles(texts []string, labels []string) map[string]int {
	n := map[string]int{}
	for _, s := range texts {
		for _, l := range labels {
			if s == l || strings.HasPrefix(s, l+" · ") {
				n[l]++
			}
		}
	}
	return n
}

// TestReportDemo fits the 5-protocol synthetic demo specimen membrane-M1
// (discovery) and checks the report weft fit writes with it.
func TestReportDemo(t *testing.T) {
	t.Parallel()
	dir := demoFitCopy(t, "membrane-M1")
	labels, points := fitCSVPoints(t, dir)
	if len(labels) != 5 {
		t.Fatalf("fit.csv has %d protocols, the demo file has 5", len(labels))
	}
	var c demoCardSections
	mj, err := os.ReadFile(filepath.Join(dir, "model.json"))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(mj, &c); err != nil {
		t.Fatal(err)
	}
	rd := &reportDemo{dir: dir, labels: labels, points: points, c: c}
	t.Run("every plot has a tile per protocol, and SVG only by default", rd.tilesAndSVGOnly)
	t.Run("fit tiles: points, model, band and held-out on top, from zero", rd.fitTiles)
	t.Run("presets figure: the discovered model and every preset", rd.presetsFigure)
	t.Run("selection plot shows held-out errors with their standard errors", rd.selectionPlot)
	t.Run("report.html is self-contained and complete", rd.selfContainedHTML)
	t.Run("the input's SHA-256 and the version are in the card and the report", rd.inputHashAndVersion)
	t.Run("weft report rebuilds the same bytes", rd.reportRebuildsSameBytes)
	t.Run("--strain plots against Green strain", rd.strainAxis)
	t.Run("--png writes each plot as PNG with its resolution", rd.pngOnRequest)
	t.Run("held-out curves are the cross-validation folds", rd.heldoutCurvesAreFolds)
	t.Run("chromium renders and prints it", func(t *testing.T) { checkInChromium(t, dir, labels) })
}

// reportDemo is what the checks of TestReportDemo share: a copy of demo
// membrane M1's fit folder, its protocols and points per protocol (from
// fit.csv) and the card's sections they read. The checks run in order: the
// later ones rewrite the folder's report.
type reportDemo struct {
	dir    string
	labels []string
	points map[string]int
	c      demoCardSections
}

// demoCardSections are the sections of model.json that TestReportDemo's
// checks read.
type demoCardSections struct {
	Selection  card.SelectionSection `json:"selection"`
	Verdict    card.VerdictSection   `json:"verdict"`
	Fit        card.FitSection       `json:"fit"`
	Provenance card.Provenance       `json:"provenance"`
}

// tilesAndSVGOnly: every plot has a tile per protocol, and SVG only by default.
func (rd *reportDemo) tilesAndSVGOnly(t *testing.T) {
	dir, labels := rd.dir, rd.labels
	for _, name := range tiledPlots {
		_, texts, root := readSVG(t, filepath.Join(dir, "plots", name+".svg"))
		n := tileTitles(texts, labels)
		for _, l := range labels {
			if n[l] != 1 {
				t.Errorf("%s: %d tiles titled for protocol %s, want 1", name, n[l], l)
			}
		}
		if root["width"] == "" || root["viewBox"] == "" {
			t.Errorf("%s: svg without width or viewBox: %v", name, root)
		}
	}
	if pngs, _ := filepath.Glob(filepath.Join(dir, "plots", "*.png")); len(pngs) != 0 {
		t.Errorf("weft fit wrote %d PNG files without --png", len(pngs))
	}
}

// fitTiles: fit tiles: points, model, band and held-out on top, from zero.
func (rd *reportDemo) fitTiles(t *testing.T) {
	dir, labels, points := rd.dir, rd.labels, rd.points
	paths, texts, _ := readSVG(t, filepath.Join(dir, "plots", "fit-all.svg"))
	total := 0
	for _, l := range labels {
		total += points[l]
	}
	// Measured points: a ring (axis 1) or square (axis 2) per fit.csv
	// row, plus one of each in the legend.
	rings := countPaths(paths, func(p svgPath) bool { return p.stroke == svgBlue && p.fill == "none" && p.arcs == 2 })
	squares := countPaths(paths, func(p svgPath) bool {
		return p.stroke == svgVermillion && p.fill == "none" && p.segs == 3 && strings.HasSuffix(p.d, "Z")
	})
	if rings != total+1 || squares != total+1 {
		t.Errorf("%d rings and %d squares, want %d each (the fit.csv rows and the legend)", rings, squares, total+1)
	}
	// One model curve per protocol and axis, densified between points.
	model := countPaths(paths, func(p svgPath) bool {
		return (p.stroke == svgBlue || p.stroke == svgVermillion) && !p.dashed && p.segs >= 30
	})
	if model != 2*len(labels) {
		t.Errorf("%d model curves, want one per protocol and axis (%d)", model, 2*len(labels))
	}
	// Held-out predictions are dashed and drawn after (on top of) the
	// model curves of their tile (two per tile, tiles in order); the
	// bands are translucent fills.
	models, held := 0, 0
	for _, p := range paths {
		switch {
		case (p.stroke == svgBlue || p.stroke == svgVermillion) && !p.dashed && p.segs >= 30:
			models++
		case p.dashed && p.segs >= 30:
			if models < 2*(held/2+1) {
				t.Errorf("held-out curve %d is drawn before its tile's model curves (%d drawn so far)", held, models)
			}
			held++
		}
	}
	if held != 2*len(labels) {
		t.Errorf("%d held-out curves, want one per protocol and axis (%d)", held, 2*len(labels))
	}
	b, _ := os.ReadFile(filepath.Join(dir, "plots", "fit-all.svg"))
	if bands := len(regexp.MustCompile(`fill-opacity:0\.2\d*`).FindAll(b, -1)); bands < 2*len(labels) {
		t.Errorf("%d band fills, want one per protocol and axis", bands)
	}
	// Stress axes start at zero: every tile labels a 0 tick.
	zeros := 0
	for _, s := range texts {
		if s == "0" {
			zeros++
		}
	}
	if zeros < len(labels) {
		t.Errorf("%d tick labels 0 for %d stress axes", zeros, len(labels))
	}
}

// presetsFigure: presets figure: the discovered model and every preset.
func (rd *reportDemo) presetsFigure(t *testing.T) {
	dir, c := rd.dir, rd.c
	_, texts, _ := readSVG(t, filepath.Join(dir, "plots", "presets.svg"))
	joined := strings.Join(texts, "\n")
	for _, p := range c.Selection.Presets {
		if name := strings.TrimPrefix(p.Name, "preset:"); !strings.Contains(joined, name+" · ") {
			t.Errorf("presets figure: no legend entry for %s with its held-out error", name)
		}
	}
	if !strings.Contains(joined, "fung") || !strings.Contains(joined, "discovered · ") {
		t.Errorf("presets figure lacks the Fung-type preset or the discovered model")
	}
}

// selectionPlot: selection plot shows held-out errors with their standard errors.
func (rd *reportDemo) selectionPlot(t *testing.T) {
	dir, c := rd.dir, rd.c
	paths, texts, _ := readSVG(t, filepath.Join(dir, "plots", "pareto.svg"))
	if !strings.Contains(strings.Join(texts, " "), "held-out error") {
		t.Errorf("the selection plot's axis is not the held-out error")
	}
	cv := 0
	for _, cc := range append(append([]card.CandidateCard{}, c.Selection.Pareto...), c.Selection.Presets...) {
		if !math.IsNaN(float64(cc.HeldoutError)) {
			cv++
		}
	}
	// Each cross-validated form has an error bar: a vertical stroke
	// and two caps.
	bars := countPaths(paths, func(p svgPath) bool {
		return p.segs == 1 && p.fill == "none" && !p.dashed && strings.Count(p.d, "M") == 1 && verticalPath(p.d)
	})
	if bars < cv {
		t.Errorf("%d vertical strokes for %d cross-validated forms and presets", bars, cv)
	}
}

// selfContainedHTML: report.html is self-contained and complete.
func (rd *reportDemo) selfContainedHTML(t *testing.T) {
	dir, c := rd.dir, rd.c
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
	svgs := strings.Count(html, "<svg ")
	files, _ := filepath.Glob(filepath.Join(dir, "plots", "*.svg"))
	if svgs != len(files) {
		t.Errorf("report.html inlines %d plots, plots/ has %d SVG files", svgs, len(files))
	}
	// The energy is typeset, not LaTeX source.
	if !strings.Contains(html, "<math") || strings.Contains(html, `\frac`) {
		t.Errorf("report.html does not typeset the energy as MathML")
	}
	// The verdict's row of the layout table is marked and shows its
	// angles.
	row := regexp.MustCompile(`<tr class="mark"><td>([^<]*)</td><td>([^<]*)</td><td class="n">([^<]*)</td>`).FindAllStringSubmatch(html, -1)
	found := false
	for _, r := range row {
		if strings.Contains(html[strings.Index(html, r[0]):], "◀ verdict") && r[1] == "one family" {
			found = strings.Contains(r[3], "°")
		}
	}
	if !found || c.Verdict.Form != "1" {
		t.Errorf("the layout table does not mark the verdict's form (%s) with its angle: %v", c.Verdict.Form, row)
	}
	// One interval per angle: the profile's.
	if !regexp.MustCompile(`<td>angle</td><td class="n">[^<]*</td><td class="n">\[[^<]*\]</td><td>profile</td>`).MatchString(html) {
		t.Errorf("the angle's interval in the parameter table is not its profile interval")
	}
	for _, want := range append(append([]string{}, card.Cautions...), "SYNTHETIC DATA", "Verdict:", "Rule:", "Methods", "Bates DM, Watts DG (1988)") {
		if !strings.Contains(html, htmlText(want)) {
			t.Errorf("report.html lacks %q", want)
		}
	}
	// The cautions at the top and at the bottom are the same, the limit of
	// planar biaxial data (Holzapfel & Ogden 2009) included, as the README
	// promises; the bottom once lacked that limit.
	blocks := strings.Split(html, `<section class="cautions"`)[1:]
	if len(blocks) != 2 {
		t.Fatalf("report.html has %d cautions sections, want 2 (top and bottom)", len(blocks))
	}
	for i, b := range blocks {
		b = b[:strings.Index(b, "</section>")]
		for _, want := range append(append([]string{}, card.Cautions...), "constrain the in-plane response only", "Holzapfel &amp; Ogden 2009") {
			if !strings.Contains(b, htmlText(want)) && !strings.Contains(b, want) {
				t.Errorf("cautions section %d of report.html lacks %q", i+1, want)
			}
		}
	}
}

// inputHashAndVersion: the input's SHA-256 and the version are in the card and the report.
func (rd *reportDemo) inputHashAndVersion(t *testing.T) {
	dir, c := rd.dir, rd.c
	raw, err := os.ReadFile(demoFile("membrane-M1.csv"))
	if err != nil {
		t.Fatal(err)
	}
	// SHA-256 of the file computed here by the standard library
	// (FIPS 180-4), independently of weft's streaming hash.
	sum := fmt.Sprintf("%x", sha256.Sum256(raw))
	if len(c.Provenance.Inputs) != 1 || c.Provenance.Inputs[0].SHA256 != sum || c.Provenance.Inputs[0].Bytes != int64(len(raw)) {
		t.Errorf("card provenance inputs %+v, want membrane-M1.csv with SHA-256 %s", c.Provenance.Inputs, sum)
	}
	version, _, code := runWeft(t, "--version")
	if code != 0 || strings.TrimSpace(version) != "weft "+c.Provenance.VersionText() {
		t.Errorf("weft --version %q, card says %q", version, c.Provenance.VersionText())
	}
	if c.Provenance.Command != "weft fit" || !slices.Contains(c.Provenance.Options, "--cycle=last") {
		t.Errorf("card provenance command %q options %v", c.Provenance.Command, c.Provenance.Options)
	}
	html, _ := os.ReadFile(filepath.Join(dir, "report.html"))
	for _, want := range []string{sum, c.Provenance.VersionText(), "--max-terms=5"} {
		if !strings.Contains(string(html), htmlText(want)) {
			t.Errorf("report.html lacks %q", want)
		}
	}
}

// reportRebuildsSameBytes: weft report rebuilds the same bytes.
func (rd *reportDemo) reportRebuildsSameBytes(t *testing.T) {
	dir := rd.dir
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
}

// strainAxis: --strain plots against Green strain.
func (rd *reportDemo) strainAxis(t *testing.T) {
	dir := rd.dir
	if _, stderr, code := runWeft(t, "report", dir, "--strain", "--force"); code != 0 {
		t.Fatalf("weft report --strain: exit %d: %s", code, stderr)
	}
	_, texts, _ := readSVG(t, filepath.Join(dir, "plots", "fit-all.svg"))
	joined := strings.Join(texts, "\n")
	if !strings.Contains(joined, "Green strain E") || strings.Contains(joined, "stretch λ") {
		t.Errorf("--strain: the x axis is not labelled Green strain")
	}
	// The x tick labels must be strains, not stretches: the demo
	// stretches run from 1.005 to 1.15, so E = ½(λ² − 1) runs from
	// 0.005 to 0.16125 (Green–Lagrange strain, Holzapfel 2000, §2.5).
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
	// The take-over table gives the Green strain the load-sharing
	// figure's diamonds mark, not the stretch.
	page, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	html := string(page)
	if !strings.Contains(html, "against Green strain") || !regexp.MustCompile(`(from the start \(|<td[^>]*>)E(11|22) = 0\.`).MatchString(html) || regexp.MustCompile(`(from the start \(|throughout \(to |<td[^>]*>)λ[12]? = 1\.`).MatchString(html) {
		t.Errorf("--strain: the load-sharing figure or its take-over table still speaks of stretch")
	}
	if _, stderr, code := runWeft(t, "report", dir, "--force"); code != 0 {
		t.Fatalf("weft report: exit %d: %s", code, stderr)
	}
}

// pngOnRequest: --png writes each plot as PNG with its resolution.
func (rd *reportDemo) pngOnRequest(t *testing.T) {
	dir := rd.dir
	out := filepath.Join(t.TempDir(), "png.weft")
	if err := os.CopyFS(out, os.DirFS(dir)); err != nil {
		t.Fatal(err)
	}
	if _, stderr, code := runWeft(t, "report", out, "--force", "--png"); code != 0 {
		t.Fatalf("weft report --png: exit %d: %s", code, stderr)
	}
	svgs, _ := filepath.Glob(filepath.Join(out, "plots", "*.svg"))
	for _, s := range svgs {
		p := strings.TrimSuffix(s, ".svg") + ".png"
		checkPNG(t, p)
		b, _ := os.ReadFile(p)
		// The pHYs chunk (PNG specification, ISO/IEC 15948:2004,
		// §11.3.5.3): 144 dpi is 5669 pixels per metre (144/0.0254,
		// rounded), unit 1 (metre).
		i := bytes.Index(b, []byte("pHYs"))
		if i < 0 || i+13 > len(b) {
			t.Errorf("%s has no pHYs chunk", p)
			continue
		}
		x, y := binary.BigEndian.Uint32(b[i+4:]), binary.BigEndian.Uint32(b[i+8:])
		if x != 5669 || y != 5669 || b[i+12] != 1 {
			t.Errorf("%s: pHYs %d × %d per unit %d, want 5669 per metre (144 dpi)", p, x, y, b[i+12])
		}
	}
}

// heldoutCurvesAreFolds: held-out curves are the cross-validation folds.
func (rd *reportDemo) heldoutCurvesAreFolds(t *testing.T) {
	dir, labels, c := rd.dir, rd.labels, rd.c
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
}

// verticalPath reports whether a path is one vertical stroke "Mx,yLx,z".
func verticalPath(d string) bool {
	m := regexp.MustCompile(`^M([-\d.]+),[-\d.]+L([-\d.]+),[-\d.]+$`).FindStringSubmatch(d)
	return m != nil && m[1] == m[2]
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
// chosen form: the report gets the shear figures, whose stress axes span
// at least ±2 % of each protocol's largest normal stress, and no selection
// evidence.
func TestReportShearAndChosenForm(t *testing.T) {
	t.Parallel()
	dir := fitDemo(t, "membrane-M3-sutured.csv", "--terms", "i1-lin,fib-expsq", "--families", "1")
	labels, points := fitCSVPoints(t, dir)
	fit := readCSV(t, filepath.Join(dir, "fit.csv"))
	peak := map[string]float64{}
	for _, r := range fit[1:] {
		for j, h := range fit[0] {
			if strings.HasPrefix(h, "measured_nominal_11") || strings.HasPrefix(h, "measured_nominal_22") {
				v, _ := strconv.ParseFloat(r[j], 64)
				peak[r[0]] = math.Max(peak[r[0]], math.Abs(v))
			}
		}
	}
	for _, name := range []string{"fit-shear", "residuals-shear"} {
		paths, texts, _ := readSVG(t, filepath.Join(dir, "plots", name+".svg"))
		n := tileTitles(texts, labels)
		for _, l := range labels {
			if n[l] != 1 {
				t.Errorf("%s: %d tiles for protocol %s", name, n[l], l)
			}
		}
		// P12: open triangles in bluish green; P21: crosses (two strokes
		// each) in reddish purple; each with a legend entry.
		total := 0
		for _, l := range labels {
			total += points[l]
		}
		tri := countPaths(paths, func(p svgPath) bool { return p.stroke == svgGreen && p.segs == 2 && strings.HasSuffix(p.d, "Z") })
		cross := countPaths(paths, func(p svgPath) bool { return p.stroke == svgPurple && p.segs == 1 && !p.dashed })
		if tri != total+1 || cross < 2*total {
			t.Errorf("%s: %d triangles and %d cross strokes for %d points", name, tri, cross, total)
		}
		// The ±2 % rule: the largest tick label of the shear axes reaches
		// at least 1 % of the smallest protocol peak (the axis spans 2 %;
		// its outermost labelled tick can sit up to half of that inside).
		low := math.Inf(1)
		for _, v := range peak {
			low = math.Min(low, v)
		}
		top := 0.0
		for _, s := range texts {
			if v, err := strconv.ParseFloat(strings.Replace(s, "−", "-", 1), 64); err == nil && v < 1 {
				top = math.Max(top, math.Abs(v))
			}
		}
		if top < 0.01*low {
			t.Errorf("%s: largest stress tick %g, want at least 1 %% of the smallest normal peak %g", name, top, low)
		}
		if !strings.Contains(strings.Join(texts, "\n"), "Green shear strain E12") {
			t.Errorf("%s: no shear abscissa", name)
		}
	}
	for _, f := range []string{"pareto.svg", "presets.svg"} {
		if _, err := os.Stat(filepath.Join(dir, "plots", f)); err == nil {
			t.Errorf("plots/%s written for a chosen-form fit, which has no selection evidence", f)
		}
	}
	b, _ := os.ReadFile(filepath.Join(dir, "report.html"))
	if !strings.Contains(string(b), htmlText("chosen form: i1-lin + fib-expsq@f1, single fibre layout (fitted as asked, not discovered)")) {
		t.Errorf("report.html does not say the model form was chosen")
	}
}

// On a sutured specimen the modelled shear stress stays near zero while
// the matrix and the fibre family carry shear stresses that cancel: the
// card, the summary and the report give no share for it instead of
// "50 % / 50 %" (the shares are of magnitudes; the sum of the terms'
// contributions is the modelled stress, checked here from fit.csv).
func TestSuturedShearHasNoShare(t *testing.T) {
	t.Parallel()
	dir := demoFitCopy(t, "membrane-M3-sutured")
	var c card.Card
	b, err := os.ReadFile(filepath.Join(dir, "model.json"))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &c); err != nil {
		t.Fatal(err)
	}
	if c.Split == nil {
		t.Fatal("no split section")
	}
	fit := readCSV(t, filepath.Join(dir, "fit.csv"))
	for _, pp := range c.Split.Protocols {
		for _, cc := range pp.Components {
			shear := cc.Component == "12" || cc.Component == "21"
			// The modelled shear and the largest |term contribution| from
			// fit.csv: the terms carry far more than their sum.
			net, gross := 0.0, 0.0
			for _, r := range fit[1:] {
				if r[0] != pp.Protocol {
					continue
				}
				for j, h := range fit[0] {
					v, _ := strconv.ParseFloat(r[j], 64)
					switch {
					case strings.HasPrefix(h, "model_nominal_"+cc.Component+" "):
						net = math.Max(net, math.Abs(v))
					case strings.Contains(h, ":nominal_"+cc.Component+" "):
						gross = math.Max(gross, math.Abs(v))
					}
				}
			}
			if shear {
				if cc.NoShare == "" || !math.IsNaN(float64(cc.GroupShare["matrix"])) {
					t.Errorf("%s P%s: share %v given for a net-zero shear (no_share %q)", pp.Protocol, cc.Component, cc.GroupShare, cc.NoShare)
				}
				if !(gross > 10*net) {
					t.Errorf("%s P%s: terms carry up to %g kPa, net %g kPa: not a cancelling shear", pp.Protocol, cc.Component, gross, net)
				}
			} else if cc.NoShare != "" {
				t.Errorf("%s P%s: no share for a normal stress: %s", pp.Protocol, cc.Component, cc.NoShare)
			}
		}
	}
	html, _ := os.ReadFile(filepath.Join(dir, "report.html"))
	if !strings.Contains(string(html), "P12 and P21 have no share in any protocol") {
		t.Errorf("report.html does not say that the shear components have no share")
	}
	if regexp.MustCompile(`<td>P(12|21)</td>(<td class="n">[^<]*</td>)*<td class="n">50 %</td>`).Match(html) {
		t.Errorf("report.html gives a shear component a 50 %% share")
	}
	for _, line := range strings.Split(demoFits(t).stdout, "\n") {
		if f := strings.Fields(line); len(f) >= 4 && (f[1] == "P12" || f[1] == "P21") && strings.HasSuffix(f[2], "%") {
			t.Errorf("the summary gives a shear share: %q", line)
		}
	}
	// The sutured specimen has the most to print (four components).
	labels, _ := fitCSVPoints(t, dir)
	t.Run("chromium renders and prints it", func(t *testing.T) { checkInChromium(t, dir, labels) })
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

// A card's calibration check (weft fit --calibration-check) is shown in
// the report beside the verdict: the demo M1 fit's card is given one by
// hand and the report rebuilt.
func TestReportShowsCalibrationCheck(t *testing.T) {
	t.Parallel()
	dir := demoFitCopy(t, "membrane-M1")
	path := filepath.Join(dir, "model.json")
	c, _ := readCardFile(t, path)
	c.CalibrationCheck = card.NewCalibrationCheck(c.Verdict.Families, []float64{30}, false, 0.05, []aniso.AxisScaleOutcome{
		{Axis1Scale: 1.05, Families: "0", Chosen: "none-t1-p2", AnglesDeg: []float64{}},
		{Axis1Scale: 0.95, Families: c.Verdict.Families, Chosen: "single-t2-p4", AnglesDeg: []float64{29.6}, Angles: "±29.6°"}})
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, stderr, code := runWeft(t, "report", dir, "--force"); code != 0 {
		t.Fatalf("weft report: exit %d: %s", code, stderr)
	}
	html, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	want := "Calibration check: verdict 1-or-mirror-pair; axis 1&#39;s stress ×1.05: 0; axis 1&#39;s stress ×0.95: 1-or-mirror-pair at ±29.6° — the verdict changes"
	if !strings.Contains(string(html), want) {
		t.Errorf("report.html lacks %q", want)
	}
}

// A model without fibres (the fung preset on demo membrane M1, synthetic)
// has no take-over columns, so the table's title speaks of the energy
// only; it once read "Where the fibres take over half of the load" above
// a matrix-only energy column.
func TestReportTitleWithoutFibres(t *testing.T) {
	t.Parallel()
	b, err := os.ReadFile(filepath.Join(presetFit(t, "fung"), "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	if strings.Contains(html, "Where the fibres take over") || !strings.Contains(html, "<h3>The strain energy at each protocol's largest deformation</h3>") {
		t.Errorf("the take-over table's title for a model without fibres is wrong")
	}
}
