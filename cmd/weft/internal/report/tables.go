package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// ftoa writes a table cell with the fewest digits that read back to x;
// a non-finite number is an empty cell.
func ftoa(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return ""
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}

// WriteFitTable writes fit.csv, the table a report is drawn from: one row
// per data point of p with its protocol, source line, cycle and F, and per
// measured component the measured and modelled (m) stress, the residual
// and each term's contribution, in the specimen's stress unit.
func WriteFitTable(w io.Writer, p *aniso.Problem, m *aniso.Model) error {
	s := p.Specimen
	pred, err := aniso.Predict(p, m)
	if err != nil {
		return err
	}
	contrib, err := aniso.PointContributions(p, m)
	if err != nil {
		return err
	}
	kind, unit := s.Kind.String(), s.StressUnit
	labels := make([]string, len(m.Terms))
	for k, t := range m.Terms {
		labels[k] = t.Shape.ID
		if t.Family >= 0 {
			labels[k] += "@" + m.Families[t.Family].Name
		}
	}
	cw := csv.NewWriter(w)
	h := []string{"protocol", "line", "cycle", "F11", "F12", "F21", "F22"}
	for _, c := range p.Output.Components {
		n := kind + "_" + biaxial.Component(c).String()
		h = append(h, fmt.Sprintf("measured_%s [%s]", n, unit), fmt.Sprintf("model_%s [%s]", n, unit), fmt.Sprintf("residual_%s [%s]", n, unit))
	}
	for _, c := range p.Output.Components {
		for k := range m.Terms {
			h = append(h, fmt.Sprintf("%s:%s_%s [%s]", labels[k], kind, biaxial.Component(c).String(), unit))
		}
	}
	cw.Write(h)
	nc := len(p.Output.Components)
	for i := 0; i < p.Data.Points(); i++ {
		r0 := i * nc
		pi := p.RowProtocol[r0]
		pt := s.Protocols[pi].Points[p.RowPoint[r0]]
		F := pt.F
		row := []string{s.Protocols[pi].Label, strconv.Itoa(pt.Line), strconv.Itoa(pt.Cycle), ftoa(F[0]), ftoa(F[1]), ftoa(F[2]), ftoa(F[3])}
		for j := range p.Output.Components {
			r := r0 + j
			row = append(row, ftoa(p.Measured[r]), ftoa(pred[r]), ftoa(pred[r]-p.Measured[r]))
		}
		for j := range p.Output.Components {
			for k := range m.Terms {
				row = append(row, ftoa(contrib[k][r0+j]))
			}
		}
		cw.Write(row)
	}
	cw.Flush()
	return cw.Error()
}

// WriteSelectionTable writes selection.csv: the Pareto front of discovery d
// on p and the classical presets, with their selection numbers and
// per-fold held-out errors.
func WriteSelectionTable(w io.Writer, p *aniso.Problem, d *aniso.Discovery) error {
	cw := csv.NewWriter(w)
	h := []string{"set", "name", "layout", "spread", "terms", "size", "parameters", "loss", "aicc", "bic", "lowest_r2", "heldout_error", "heldout_stderr", "chosen"}
	for _, pi := range p.Protocols {
		h = append(h, "heldout_error_without_"+p.Specimen.Protocols[pi].Label)
	}
	cw.Write(h)
	emit := func(set string, c *aniso.Candidate, chosen bool) {
		r := c.Compared()
		var ts string
		for i, t := range r.Structure.Terms {
			if r.Weights[i] > 0 {
				if ts != "" {
					ts += " + "
				}
				ts += t.Label(r.Structure.Layout)
			}
		}
		minR2 := card.LowestR2(r.Metrics)
		row := []string{set, c.Name, c.Layout.String(), spreadName(r.Structure), ts, strconv.Itoa(c.Terms),
			strconv.Itoa(r.Complexity), ftoa(r.Loss), ftoa(r.AICc), ftoa(r.BIC), ftoa(minR2)}
		if c.CV != nil {
			row = append(row, ftoa(c.CV.Mean), ftoa(c.CV.StdErr))
		} else {
			row = append(row, "", "")
		}
		row = append(row, strconv.FormatBool(chosen))
		for f := range p.Protocols {
			if c.CV != nil {
				row = append(row, ftoa(c.CV.Folds[f].Error))
			} else {
				row = append(row, "")
			}
		}
		cw.Write(row)
	}
	for i := range d.Pareto {
		emit("pareto", &d.Pareto[i], i == d.Chosen)
	}
	for i := range d.Presets {
		emit("preset", &d.Presets[i], false)
	}
	cw.Flush()
	return cw.Error()
}

// spreadName says how a form's families spread: "in-plane" (a learned
// concentration), "kappa" (a learned dispersion κ) or "none".
func spreadName(st aniso.Structure) string {
	switch {
	case st.Planar:
		return "in-plane"
	case st.Dispersion:
		return "kappa"
	}
	return "none"
}

// HeldoutFold is the prediction of one protocol by the fitted form refitted
// to every other protocol.
type HeldoutFold struct {
	// Protocol is the index into Specimen.Protocols.
	Protocol int
	// Pred is the predicted stress of every row of the protocol (its
	// points times the measured components), in the stress unit.
	Pred []float64
	// Err is why the refit failed; the protocol is then left out.
	Err error
}

// WriteHeldoutTable writes heldout.csv: for every point of every protocol
// whose fold succeeded, its protocol, source line and F, and per measured
// component the stress predicted by the model form refitted without that
// protocol. Rows follow fit.csv's order.
func WriteHeldoutTable(w io.Writer, p *aniso.Problem, folds []HeldoutFold) error {
	s := p.Specimen
	kind, unit := s.Kind.String(), s.StressUnit
	cw := csv.NewWriter(w)
	h := []string{"protocol", "line", "F11", "F12", "F21", "F22"}
	for _, c := range p.Output.Components {
		h = append(h, fmt.Sprintf("heldout_%s_%s [%s]", kind, biaxial.Component(c).String(), unit))
	}
	cw.Write(h)
	nc := len(p.Output.Components)
	for _, fd := range folds {
		if fd.Err != nil {
			continue
		}
		pr := &s.Protocols[fd.Protocol]
		for j, pt := range pr.Points {
			F := pt.F
			row := []string{pr.Label, strconv.Itoa(pt.Line), ftoa(F[0]), ftoa(F[1]), ftoa(F[2]), ftoa(F[3])}
			for c := 0; c < nc; c++ {
				row = append(row, ftoa(fd.Pred[j*nc+c]))
			}
			cw.Write(row)
		}
	}
	cw.Flush()
	return cw.Error()
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

// tableComponents are the in-plane stress components a table may hold
// (at most four, so components are looked up by a linear search).
var tableComponents = map[string]bool{"11": true, "22": true, "12": true, "21": true}

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

// repeatedColumn refuses a header (line 1 of file) that names a column
// twice (units aside): the report would take one of the two, or append
// both to one series and draw it twice as long as its points.
func repeatedColumn(h []string, file string) error {
	seen := map[string]int{}
	for j, c := range h {
		name, _ := splitUnit(c)
		if k, ok := seen[name]; ok {
			return fmt.Errorf("%s: line 1, column %d: %q repeats column %d", file, j+1, c, k+1)
		}
		seen[name] = j
	}
	return nil
}

// readFitTable parses fit.csv as WriteFitTable writes it.
func readFitTable(r io.Reader, file string) (*fitTable, error) {
	rows, err := csv.NewReader(r).ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", file, err)
	}
	if len(rows) < 2 {
		return nil, fmt.Errorf("%s: no data rows", file)
	}
	h := rows[0]
	if err := repeatedColumn(h, file); err != nil {
		return nil, err
	}
	fixed := []string{"protocol", "line", "cycle", "F11", "F12", "F21", "F22"}
	if len(h) < len(fixed) {
		return nil, fmt.Errorf("%s: line 1: expected the columns %s first", file, strings.Join(fixed, ","))
	}
	for i, n := range fixed {
		if h[i] != n {
			return nil, fmt.Errorf("%s: line 1, column %d: expected %q, found %q", file, i+1, n, h[i])
		}
	}
	t, cols, err := parseFitHeader(h, len(fixed), file)
	if err != nil {
		return nil, err
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
	return t, completeFitTable(t, file)
}

// completeFitTable checks that every component has its model and residual
// column and every term a column for every component: the report draws
// each of them for every point.
func completeFitTable(t *fitTable, file string) error {
	for _, pr := range t.protocols {
		n := len(pr.F)
		for c := range t.comps {
			if len(pr.model[c]) != n || len(pr.residual[c]) != n {
				return fmt.Errorf("%s: protocol %s: component %s lacks its model or residual column", file, pr.label, t.comps[c])
			}
			for k, term := range t.terms {
				if len(pr.contrib[k][c]) != n {
					return fmt.Errorf("%s: line 1: term %s has no column for component %s (%s:%s_%s)", file, term, t.comps[c], term, t.kind, t.comps[c])
				}
			}
		}
	}
	return nil
}

// fitColumn is what a column of fit.csv holds: what ("measured", "model",
// "residual" or "term"), its component (index into fitTable.comps) and,
// for a term's contribution, the term (index into fitTable.terms).
type fitColumn struct {
	what       string
	comp, term int
}

// parseFitHeader reads fit.csv's header after its first fixed columns: the
// stress kind and unit, the components and the terms, and what each column
// holds.
func parseFitHeader(h []string, fixed int, file string) (*fitTable, []fitColumn, error) {
	t := &fitTable{}
	cols := make([]fitColumn, len(h))
	termIndex := map[string]int{}
	for j := fixed; j < len(h); j++ {
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
			return nil, nil, fmt.Errorf("%s: line 1, column %d: unknown column %q", file, j+1, h[j])
		}
		u := strings.LastIndex(kc, "_")
		if u < 0 {
			return nil, nil, fmt.Errorf("%s: line 1, column %d: %q has no stress component", file, j+1, h[j])
		}
		kind, comp := kc[:u], kc[u+1:]
		if t.kind == "" {
			t.kind = kind
		} else if kind != t.kind {
			return nil, nil, fmt.Errorf("%s: line 1, column %d: stress kind %q differs from %q", file, j+1, kind, t.kind)
		}
		if !tableComponents[comp] {
			return nil, nil, fmt.Errorf("%s: line 1, column %d: %q: stress component %q is not 11, 22, 12 or 21", file, j+1, h[j], comp)
		}
		ci := componentIndex(t.comps, comp)
		if ci < 0 {
			if what != "measured" {
				return nil, nil, fmt.Errorf("%s: line 1, column %d: component %s has no measured column before it", file, j+1, comp)
			}
			t.comps = append(t.comps, comp)
			ci = len(t.comps) - 1
		}
		c := fitColumn{what: what, comp: ci, term: -1}
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
		return nil, nil, fmt.Errorf("%s: line 1: no measured_ stress columns", file)
	}
	return t, cols, nil
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
	if err := repeatedColumn(h, file); err != nil {
		return nil, err
	}
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
	// Points are matched by source line; a resampled protocol can give
	// several points the same line, matched in their order in both files.
	index := map[string]map[int][]int{}
	npts := map[string]int{}
	for _, pr := range t.protocols {
		m := map[int][]int{}
		for i, l := range pr.line {
			m[l] = append(m[l], i)
		}
		index[pr.label], npts[pr.label] = m, len(pr.line)
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
		at := pts[line]
		if len(at) == 0 {
			return nil, fmt.Errorf("%s: line %d: protocol %s has no point from source line %d in fit.csv (or fewer than heldout.csv lists)", file, ln, row[0], line)
		}
		pi := at[0]
		pts[line] = at[1:]
		st := ht.stress[row[0]]
		if st == nil {
			n := npts[row[0]]
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

// unsafeName matches the runs of characters a file name should not hold;
// leadingDots the dots that would hide it.
var (
	unsafeName  = regexp.MustCompile(`[^\p{L}\p{N}._-]+`)
	leadingDots = regexp.MustCompile(`^\.+`)
)

// SafeName replaces every run of characters a file name should not hold
// (anything but letters and digits of any script, '.', '_' and '-') with
// one '_', and leading dots, which would hide the file, with one '_'. "."
// and ".." stay as they are (callers refuse them).
func SafeName(s string) string {
	s = unsafeName.ReplaceAllString(s, "_")
	if s == "." || s == ".." {
		return s
	}
	return leadingDots.ReplaceAllString(s, "_")
}
