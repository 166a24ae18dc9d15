package main

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// The report is built from the files of an output folder only (model.json,
// fit.csv and, when weft fit wrote it, heldout.csv), so that 'weft report'
// rebuilds exactly what 'weft fit' wrote without refitting.

// reportInput is everything a report is drawn from.
type reportInput struct {
	// dir is the output folder (for messages); files the names found in it.
	dir   string
	files []string
	card  *card.Card
	model *aniso.Model
	fit   card.FitSection
	data  card.DataSection
	// dataRange, split, verdict and sel are nil when the card lacks them
	// (a chosen-form fit has no verdict or selection).
	dataRange *card.DataRange
	split     *card.SplitSection
	verdict   *card.VerdictSection
	sel       *card.SelectionSection
	// table is fit.csv; heldout is heldout.csv (nil when absent).
	table   *fitTable
	heldout *heldoutTable
	// cardLimits bound the card read.
	cardLimits card.Limits
}

// fitTable is fit.csv read back: one entry per protocol, in file order.
type fitTable struct {
	kind, unit string
	// comps are the measured stress components ("11", "22", "12", "21").
	comps []string
	// terms are the term labels of the contribution columns.
	terms     []string
	protocols []*protocolRows
}

// protocolRows are the points of one protocol.
type protocolRows struct {
	label string
	// line is each point's source line; F its deformation gradient
	// (F11, F12, F21, F22).
	line []int
	F    [][4]float64
	// measured, model and residual [component][point], stress unit;
	// contrib [term][component][point].
	measured, model, residual [][]float64
	contrib                   [][][]float64
}

// heldoutTable is heldout.csv read back: per protocol label, the stress of
// the form refitted without that protocol, [component][point] aligned with
// the protocol's rows in fit.csv (NaN where a point is missing).
type heldoutTable struct {
	comps  []string
	stress map[string][][]float64
}

// componentIndex returns the index of component c in comps, or −1.
func componentIndex(comps []string, c string) int {
	for i, x := range comps {
		if x == c {
			return i
		}
	}
	return -1
}

// parseCell reads a number written by ftoa; an empty cell is NaN.
func parseCell(s string) (float64, error) {
	if s == "" {
		return math.NaN(), nil
	}
	return strconv.ParseFloat(s, 64)
}

// splitUnit splits "name [unit]" into name and unit.
func splitUnit(h string) (string, string) {
	h = strings.TrimSpace(h)
	if i := strings.LastIndex(h, " ["); i >= 0 && strings.HasSuffix(h, "]") {
		return h[:i], h[i+2 : len(h)-1]
	}
	return h, ""
}

// readFitTable parses fit.csv as writeFitCSV writes it.
func readFitTable(r io.Reader, file string) (*fitTable, error) {
	rows, err := csv.NewReader(r).ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", file, err)
	}
	if len(rows) < 2 {
		return nil, fmt.Errorf("%s: no data rows", file)
	}
	h := rows[0]
	fixed := []string{"protocol", "line", "cycle", "F11", "F12", "F21", "F22"}
	if len(h) < len(fixed) {
		return nil, fmt.Errorf("%s: line 1: expected the columns %s first", file, strings.Join(fixed, ","))
	}
	for i, n := range fixed {
		if h[i] != n {
			return nil, fmt.Errorf("%s: line 1, column %d: expected %q, found %q", file, i+1, n, h[i])
		}
	}
	t := &fitTable{}
	type col struct {
		what       string // measured, model, residual, term
		comp, term int
	}
	cols := make([]col, len(h))
	termIndex := map[string]int{}
	for j := len(fixed); j < len(h); j++ {
		name, unit := splitUnit(h[j])
		if t.unit == "" {
			t.unit = unit
		}
		var label, kc string
		what := ""
		switch {
		case strings.HasPrefix(name, "measured_"):
			what, kc = "measured", strings.TrimPrefix(name, "measured_")
		case strings.HasPrefix(name, "model_"):
			what, kc = "model", strings.TrimPrefix(name, "model_")
		case strings.HasPrefix(name, "residual_"):
			what, kc = "residual", strings.TrimPrefix(name, "residual_")
		case strings.Contains(name, ":"):
			i := strings.LastIndex(name, ":")
			what, label, kc = "term", name[:i], name[i+1:]
		default:
			return nil, fmt.Errorf("%s: line 1, column %d: unknown column %q", file, j+1, h[j])
		}
		u := strings.LastIndex(kc, "_")
		if u < 0 {
			return nil, fmt.Errorf("%s: line 1, column %d: %q has no stress component", file, j+1, h[j])
		}
		kind, comp := kc[:u], kc[u+1:]
		if t.kind == "" {
			t.kind = kind
		} else if kind != t.kind {
			return nil, fmt.Errorf("%s: line 1, column %d: stress kind %q differs from %q", file, j+1, kind, t.kind)
		}
		ci := componentIndex(t.comps, comp)
		if ci < 0 {
			if what != "measured" {
				return nil, fmt.Errorf("%s: line 1, column %d: component %s has no measured column before it", file, j+1, comp)
			}
			t.comps = append(t.comps, comp)
			ci = len(t.comps) - 1
		}
		c := col{what: what, comp: ci, term: -1}
		if what == "term" {
			k, ok := termIndex[label]
			if !ok {
				k = len(t.terms)
				termIndex[label] = k
				t.terms = append(t.terms, label)
			}
			c.term = k
		}
		cols[j] = c
	}
	if len(t.comps) == 0 {
		return nil, fmt.Errorf("%s: line 1: no measured_ stress columns", file)
	}
	byLabel := map[string]*protocolRows{}
	nc, nt := len(t.comps), len(t.terms)
	for i, row := range rows[1:] {
		ln := i + 2
		if len(row) != len(h) {
			return nil, fmt.Errorf("%s: line %d: %d fields, the header has %d", file, ln, len(row), len(h))
		}
		pr := byLabel[row[0]]
		if pr == nil {
			pr = &protocolRows{label: row[0], measured: make([][]float64, nc), model: make([][]float64, nc), residual: make([][]float64, nc),
				contrib: make([][][]float64, nt)}
			for k := range pr.contrib {
				pr.contrib[k] = make([][]float64, nc)
			}
			byLabel[row[0]] = pr
			t.protocols = append(t.protocols, pr)
		}
		line, err := strconv.Atoi(row[1])
		if err != nil {
			return nil, fmt.Errorf("%s: line %d, column 2: %q is not a line number", file, ln, row[1])
		}
		var F [4]float64
		for k := 0; k < 4; k++ {
			v, err := strconv.ParseFloat(row[3+k], 64)
			if err != nil {
				return nil, fmt.Errorf("%s: line %d, column %d: %q is not a number", file, ln, 4+k, row[3+k])
			}
			F[k] = v
		}
		pr.line = append(pr.line, line)
		pr.F = append(pr.F, F)
		for j := len(fixed); j < len(h); j++ {
			v, err := parseCell(row[j])
			if err != nil {
				return nil, fmt.Errorf("%s: line %d, column %d: %q is not a number", file, ln, j+1, row[j])
			}
			c := cols[j]
			switch c.what {
			case "measured":
				pr.measured[c.comp] = append(pr.measured[c.comp], v)
			case "model":
				pr.model[c.comp] = append(pr.model[c.comp], v)
			case "residual":
				pr.residual[c.comp] = append(pr.residual[c.comp], v)
			default:
				pr.contrib[c.term][c.comp] = append(pr.contrib[c.term][c.comp], v)
			}
		}
	}
	for _, pr := range t.protocols {
		for c := 0; c < nc; c++ {
			n := len(pr.F)
			if len(pr.model[c]) != n || len(pr.residual[c]) != n {
				return nil, fmt.Errorf("%s: protocol %s: component %s lacks its model or residual column", file, pr.label, t.comps[c])
			}
		}
	}
	return t, nil
}

// readHeldoutTable parses heldout.csv and aligns it with fit.csv's rows by
// protocol and source line.
func readHeldoutTable(r io.Reader, file string, t *fitTable) (*heldoutTable, error) {
	rows, err := csv.NewReader(r).ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", file, err)
	}
	if len(rows) < 1 || len(rows[0]) < 7 || rows[0][0] != "protocol" || rows[0][1] != "line" {
		return nil, fmt.Errorf("%s: line 1: expected protocol,line,F11,F12,F21,F22 and held-out stress columns", file)
	}
	h := rows[0]
	ht := &heldoutTable{stress: map[string][][]float64{}}
	colComp := make([]int, len(h))
	for j := 6; j < len(h); j++ {
		name, _ := splitUnit(h[j])
		u := strings.LastIndex(name, "_")
		if !strings.HasPrefix(name, "heldout_") || u < 0 {
			return nil, fmt.Errorf("%s: line 1, column %d: unknown column %q", file, j+1, h[j])
		}
		comp := name[u+1:]
		colComp[j] = componentIndex(t.comps, comp)
		ht.comps = append(ht.comps, comp)
	}
	index := map[string]map[int]int{}
	for _, pr := range t.protocols {
		m := map[int]int{}
		for i, l := range pr.line {
			m[l] = i
		}
		index[pr.label] = m
	}
	for i, row := range rows[1:] {
		ln := i + 2
		if len(row) != len(h) {
			return nil, fmt.Errorf("%s: line %d: %d fields, the header has %d", file, ln, len(row), len(h))
		}
		pts, ok := index[row[0]]
		if !ok {
			return nil, fmt.Errorf("%s: line %d: protocol %q is not in fit.csv", file, ln, row[0])
		}
		line, err := strconv.Atoi(row[1])
		if err != nil {
			return nil, fmt.Errorf("%s: line %d, column 2: %q is not a line number", file, ln, row[1])
		}
		pi, ok := pts[line]
		if !ok {
			return nil, fmt.Errorf("%s: line %d: protocol %s has no point from source line %d in fit.csv", file, ln, row[0], line)
		}
		st := ht.stress[row[0]]
		if st == nil {
			n := len(pts)
			st = make([][]float64, len(t.comps))
			for c := range st {
				st[c] = make([]float64, n)
				for k := range st[c] {
					st[c][k] = math.NaN()
				}
			}
			ht.stress[row[0]] = st
		}
		for j := 6; j < len(h); j++ {
			if colComp[j] < 0 {
				continue
			}
			v, err := parseCell(row[j])
			if err != nil {
				return nil, fmt.Errorf("%s: line %d, column %d: %q is not a number", file, ln, j+1, row[j])
			}
			st[colComp[j]][pi] = v
		}
	}
	return ht, nil
}

// loadReportInput reads an output folder within the default limits.
func loadReportInput(dir string) (*reportInput, error) {
	return loadReportInputLimits(dir, biaxial.Limits{}, card.Limits{})
}

// loadReportInputLimits reads an output folder: model.json within the card
// limits cl, fit.csv and heldout.csv within the file size limit of dl. A
// folder that lacks what the report needs is bad input (exit 2) with a
// message saying what is missing.
func loadReportInputLimits(dir string, dl biaxial.Limits, cl card.Limits) (*reportInput, error) {
	st, err := os.Stat(dir)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, badInputf("%s does not exist; give the output folder that 'weft fit' wrote", dir)
		}
		return nil, badInput(err)
	}
	if !st.IsDir() {
		return nil, badInputf("%s is not a folder; give the output folder that 'weft fit' wrote (with model.json and fit.csv)", dir)
	}
	in := &reportInput{dir: dir, cardLimits: cl}
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, badInput(err)
	}
	for _, e := range entries {
		if !strings.HasPrefix(e.Name(), ".") {
			in.files = append(in.files, e.Name())
		}
	}
	maxCSV := dl.MaxBytes
	if maxCSV <= 0 {
		maxCSV = biaxial.DefaultLimits.MaxBytes
	}
	maxCard := cl.MaxBytes
	if maxCard <= 0 {
		maxCard = card.DefaultLimits.MaxBytes
	}
	read := func(name string, required bool) ([]byte, error) {
		max := maxCSV
		if name == "model.json" {
			max = maxCard
		}
		b, err := readAtMost(filepath.Join(dir, name), max)
		if errors.Is(err, errTooLarge) {
			lim := biaxial.ErrFileSize
			if name == "model.json" {
				lim = card.ErrCardSize
			}
			return nil, tooLargeError(filepath.Join(dir, name), max, lim)
		}
		if err != nil {
			if errors.Is(err, fs.ErrNotExist) && !required {
				return nil, nil
			}
			if errors.Is(err, fs.ErrNotExist) {
				return nil, badInputf("%s: %s is missing; the report needs model.json and fit.csv as 'weft fit' writes them (fit the data again into a new folder with 'weft fit DATA -o NEW-FOLDER')", dir, name)
			}
			return nil, badInput(err)
		}
		return b, nil
	}
	mj, err := read("model.json", true)
	if err != nil {
		return nil, err
	}
	fc, err := read("fit.csv", true)
	if err != nil {
		return nil, err
	}
	ho, err := read("heldout.csv", false)
	if err != nil {
		return nil, err
	}
	if err := in.parse(mj, fc, ho); err != nil {
		return nil, badInputf("%s: %v", dir, err)
	}
	sort.Strings(in.files)
	return in, nil
}

// parse fills the input from the bytes of model.json, fit.csv and
// heldout.csv (nil when absent).
func (in *reportInput) parse(modelJSON, fitCSV, heldoutCSV []byte) error {
	c, m, err := card.ParseLimits(bytes.NewReader(modelJSON), "model.json", in.cardLimits)
	if err != nil {
		return err
	}
	in.card, in.model = c, m
	// A section that is present but malformed is reported before a
	// missing one that comes after it, in the order the report needs them.
	sectionErr := func(key string) error {
		if err := c.SectionError(key); err != nil {
			return fmt.Errorf("model.json: $.%s: %v", key, err)
		}
		return nil
	}
	if err := sectionErr(card.KeyFit); err != nil {
		return err
	}
	if c.Fit == nil {
		return errors.New("model.json has no 'fit' section: it is not a card written by 'weft fit', which the report needs")
	}
	if err := sectionErr(card.KeyData); err != nil {
		return err
	}
	if c.Data == nil {
		return errors.New("model.json has no 'data' section (the data the card was fitted to); refit with 'weft fit'")
	}
	for _, key := range []string{card.KeyDataRange, card.KeySplit, card.KeyVerdict, card.KeySelection} {
		if err := sectionErr(key); err != nil {
			return err
		}
	}
	in.fit, in.data = *c.Fit, *c.Data
	in.dataRange, in.split, in.verdict, in.sel = c.DataRange, c.Split, c.Verdict, c.Selection
	in.table, err = readFitTable(bytes.NewReader(fitCSV), "fit.csv")
	if err != nil {
		return err
	}
	if in.table.kind != in.fit.StressKind {
		return fmt.Errorf("fit.csv holds %s stress but model.json says the fit used %s stress; the files are not from the same fit", in.table.kind, in.fit.StressKind)
	}
	if heldoutCSV != nil {
		in.heldout, err = readHeldoutTable(bytes.NewReader(heldoutCSV), "heldout.csv", in.table)
		if err != nil {
			return err
		}
	}
	return nil
}

// metric returns the card's metric of one protocol and component.
func (in *reportInput) metric(protocol, comp string) (card.MetricCard, bool) {
	for _, m := range in.fit.Metrics {
		if m.Protocol == protocol && m.Component == comp {
			return m, true
		}
	}
	return card.MetricCard{}, false
}

// rSquared is the coefficient of determination 1 − SS_res/SS_tot of
// predictions against measurements (common practice); NaN when the
// measurement is constant or a prediction is missing.
func rSquared(meas, pred []float64) float64 {
	if len(meas) == 0 || len(meas) != len(pred) {
		return math.NaN()
	}
	mean := 0.0
	for _, v := range meas {
		mean += v
	}
	mean /= float64(len(meas))
	ssr, sst := 0.0, 0.0
	for i, v := range meas {
		if math.IsNaN(pred[i]) {
			return math.NaN()
		}
		ssr += (pred[i] - v) * (pred[i] - v)
		sst += (v - mean) * (v - mean)
	}
	if sst == 0 {
		return math.NaN()
	}
	return 1 - ssr/sst
}

// rmse is the root-mean-square difference of predictions and
// measurements, skipping missing predictions.
func rmse(meas, pred []float64) float64 {
	s, n := 0.0, 0
	for i, v := range meas {
		if i < len(pred) && !math.IsNaN(pred[i]) {
			s += (pred[i] - v) * (pred[i] - v)
			n++
		}
	}
	if n == 0 {
		return math.NaN()
	}
	return math.Sqrt(s / float64(n))
}

// axisCoordinate is the abscissa of a point for a stress component: for
// the normal components the stretch of a material line along that axis,
// λ = √C_ii (F11 when there is no shear), or the Green strain
// E_ii = ½(C_ii − 1) = ½(λ² − 1); for the shear components the Green shear
// strain E12 = ½ C12.
func axisCoordinate(F [4]float64, comp string, strain bool) float64 {
	c11 := F[0]*F[0] + F[2]*F[2]
	c22 := F[1]*F[1] + F[3]*F[3]
	switch comp {
	case "11":
		if strain {
			return 0.5 * (c11 - 1)
		}
		return math.Sqrt(c11)
	case "22":
		if strain {
			return 0.5 * (c22 - 1)
		}
		return math.Sqrt(c22)
	default:
		return 0.5 * (F[0]*F[1] + F[2]*F[3])
	}
}

// stressComponent picks component comp ("11", "22", "12", "21") of kind
// ("cauchy" or "nominal") from a model response. The Cauchy stress is
// symmetric, so its "21" is its "12".
func stressComponent(r *aniso.Response, kind, comp string) float64 {
	if kind == "cauchy" {
		switch comp {
		case "11":
			return r.Cauchy[0]
		case "22":
			return r.Cauchy[1]
		default:
			return r.Cauchy[2]
		}
	}
	switch comp {
	case "11":
		return r.Nominal[0]
	case "22":
		return r.Nominal[1]
	case "12":
		return r.Nominal[2]
	default:
		return r.Nominal[3]
	}
}

// curveSubsteps is how many model evaluations are added between two
// consecutive data points, so that the model curve is smooth.
const curveSubsteps = 4

// modelCurve evaluates the model card along a protocol's kinematics and
// returns x and stress per component (NaN where the model cannot be
// evaluated, which breaks the curve). A pure biaxial protocol
// (F12 = F21 = 0) is densified by linear interpolation of F between
// consecutive points. A protocol with shear deformation is evaluated at
// its measured points only: there F12 and F21 answer the loads (e.g. no
// shear force on sutures), and an interpolated F would break that balance
// and show shear stresses the test never had.
func modelCurve(m *aniso.Model, pr *protocolRows, kind string, comps []string, strain bool) (xs, ys [][]float64) {
	xs, ys = make([][]float64, len(comps)), make([][]float64, len(comps))
	emit := func(F [4]float64) {
		r, err := m.Evaluate(F)
		for c, comp := range comps {
			xs[c] = append(xs[c], axisCoordinate(F, comp, strain))
			if err != nil {
				ys[c] = append(ys[c], math.NaN())
				continue
			}
			v := stressComponent(&r, kind, comp)
			ys[c] = append(ys[c], v)
		}
	}
	sheared := false
	for _, F := range pr.F {
		sheared = sheared || F[1] != 0 || F[2] != 0
	}
	for i, F := range pr.F {
		if i > 0 && !sheared {
			P := pr.F[i-1]
			for s := 1; s < curveSubsteps; s++ {
				t := float64(s) / curveSubsteps
				var G [4]float64
				for k := range G {
					G[k] = P[k] + t*(F[k]-P[k])
				}
				emit(G)
			}
		}
		emit(F)
	}
	return xs, ys
}
