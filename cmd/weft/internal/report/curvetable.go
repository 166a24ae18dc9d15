package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/biaxial"
)

// Model curves and their confidence bands (curves.csv) and the raw record
// (raw.csv): tables the fit writes beside fit.csv so that the report can
// draw what only the fit knows (the covariance of the estimates, the
// presets' fitted models, every cycle of the file) without refitting.

// maxCurvePoints bounds the points of one protocol's model curve: enough
// for a smooth line, few enough that a file of many points keeps the
// report small.
const maxCurvePoints = 400

// curveSubsteps is how many model evaluations are added between two
// consecutive data points, so that the model curve is smooth.
const curveSubsteps = 4

// CurvePath returns the deformations along which a protocol's model curve
// is drawn, from its measured deformations Fs in test order. A pure
// biaxial protocol (F12 = F21 = 0) is densified by linear interpolation of
// F between consecutive points. A protocol with shear deformation is drawn
// at its measured points only: there F12 and F21 answer the loads (e.g. no
// shear force on sutures), and an interpolated F would break that balance
// and show shear stresses the test never had. At most maxCurvePoints
// deformations are returned (evenly spaced in the test order, ends kept).
func CurvePath(Fs [][4]float64) [][4]float64 {
	sheared := false
	for _, F := range Fs {
		sheared = sheared || F[1] != 0 || F[2] != 0
	}
	n := len(Fs)
	if n == 0 {
		return nil
	}
	if n > maxCurvePoints {
		out := make([][4]float64, maxCurvePoints)
		for i := range out {
			out[i] = Fs[int(math.Round(float64(i)*float64(n-1)/float64(maxCurvePoints-1)))]
		}
		return out
	}
	sub := curveSubsteps
	if sheared {
		sub = 1
	} else if n*sub > maxCurvePoints {
		sub = max(1, maxCurvePoints/n)
	}
	out := make([][4]float64, 0, (n-1)*sub+1)
	for i, F := range Fs {
		if i > 0 {
			P := Fs[i-1]
			for s := 1; s < sub; s++ {
				t := float64(s) / float64(sub)
				var G [4]float64
				for k := range G {
					G[k] = P[k] + t*(F[k]-P[k])
				}
				out = append(out, G)
			}
		}
		out = append(out, F)
	}
	return out
}

// CurveModel is one fitted model whose curves curves.csv holds: Name is
// "model" for the fitted model and the preset's name (e.g. "hgo") for a
// classical preset fitted to the same data.
type CurveModel struct {
	Name   string
	Result *aniso.Result
}

// WriteCurveTable writes curves.csv: for every protocol of p, along its
// CurvePath (of the deformations the fit used: F12 = F21 = 0 where
// p.ShearTakenAsZero), each model's modelled stress of every measured component and
// the half-width of its 95 % confidence band (aniso.ConfidenceBand; an
// empty cell where the model has no covariance). Column names are
// "<model>_<kind>_<component> [unit]" and "<model>_ci95_<kind>_<component>
// [unit]".
func WriteCurveTable(w io.Writer, p *aniso.Problem, models []CurveModel) error {
	s := p.Specimen
	kind, unit := s.Kind.String(), s.StressUnit
	cw := csv.NewWriter(w)
	h := []string{"protocol", "F11", "F12", "F21", "F22"}
	for _, m := range models {
		for _, c := range p.Output.Components {
			n := kind + "_" + biaxial.Component(c).String()
			h = append(h, fmt.Sprintf("%s_%s [%s]", m.Name, n, unit), fmt.Sprintf("%s_ci95_%s [%s]", m.Name, n, unit))
		}
	}
	cw.Write(h)
	nominal := s.Kind == biaxial.Nominal
	for _, pi := range p.Protocols {
		pr := &s.Protocols[pi]
		Fs := make([][4]float64, len(pr.Points))
		for i, pt := range pr.Points {
			Fs[i] = pt.F
			if p.ShearTakenAsZero {
				// The fit took F12 and F21 within their scatter as zero;
				// along the noise a family at +α and at −α, which the data
				// cannot tell apart, would draw different curves.
				Fs[i][1], Fs[i][2] = 0, 0
			}
		}
		path := CurvePath(Fs)
		bands := make([]*aniso.Band, len(models))
		for k, m := range models {
			b, err := aniso.ConfidenceBand(p, m.Result, path, nominal)
			if err != nil {
				// No covariance: the curve alone.
				st, _, perr := aniso.PredictionJacobian(m.Result, path, nominal)
				if perr != nil {
					st = make([][4]float64, len(path))
					for i, F := range path {
						st[i] = evaluateAll(m.Result.Model, F, nominal)
					}
				}
				b = &aniso.Band{Stress: st, HalfWidth: make([][4]float64, len(path))}
				for i := range b.HalfWidth {
					b.HalfWidth[i] = [4]float64{math.NaN(), math.NaN(), math.NaN(), math.NaN()}
				}
			}
			bands[k] = b
		}
		for i, F := range path {
			row := []string{pr.Label, ftoa(F[0]), ftoa(F[1]), ftoa(F[2]), ftoa(F[3])}
			for _, b := range bands {
				for _, c := range p.Output.Components {
					row = append(row, ftoa(b.Stress[i][c]), ftoa(b.HalfWidth[i][c]))
				}
			}
			cw.Write(row)
		}
	}
	cw.Flush()
	return cw.Error()
}

// evaluateAll is a model's stress at F, components 11, 22, 12, 21 (NaN
// where it cannot be evaluated).
func evaluateAll(m *aniso.Model, F [4]float64, nominal bool) [4]float64 {
	r, err := m.Evaluate(F)
	if err != nil {
		return [4]float64{math.NaN(), math.NaN(), math.NaN(), math.NaN()}
	}
	if nominal {
		return r.Nominal
	}
	return [4]float64{r.Cauchy[0], r.Cauchy[1], r.Cauchy[2], r.Cauchy[2]}
}

// maxRawRows bounds the rows of one protocol in raw.csv; a longer record
// is thinned to every k-th row (its first row and the kept rows' first
// and last always stay).
const maxRawRows = 1500

// WriteRawTable writes raw.csv: the record of every protocol of all, a
// specimen read with every cycle and both branches as measured (no
// re-referencing or resampling), one row per point: protocol, source line,
// cycle, whether the fit kept the point (a line of kept, the specimen as
// fitted), F and every measured stress component. A protocol longer than
// maxRawRows is thinned evenly.
func WriteRawTable(w io.Writer, all, kept *biaxial.Specimen) error {
	kind, unit := all.Kind.String(), all.StressUnit
	cw := csv.NewWriter(w)
	h := []string{"protocol", "line", "cycle", "kept", "F11", "F12", "F21", "F22"}
	var comps []biaxial.Component
	for c := biaxial.C11; c < biaxial.NumComponents; c++ {
		if all.Measured[c] && !(c == biaxial.C21 && all.Kind == biaxial.Cauchy) {
			comps = append(comps, c)
			h = append(h, fmt.Sprintf("%s_%s [%s]", kind, c.String(), unit))
		}
	}
	cw.Write(h)
	keptLines := map[string]map[int]bool{}
	for _, pr := range kept.Protocols {
		m := map[int]bool{}
		for _, pt := range pr.Points {
			m[pt.Line] = true
		}
		keptLines[pr.Label] = m
	}
	for _, pr := range all.Protocols {
		stride := (len(pr.Points) + maxRawRows - 1) / maxRawRows
		kl := keptLines[pr.Label]
		for i, pt := range pr.Points {
			k := kl[pt.Line]
			edge := i > 0 && k != kl[pr.Points[i-1].Line] || i+1 < len(pr.Points) && k != kl[pr.Points[i+1].Line]
			if stride > 1 && i%stride != 0 && !edge {
				continue
			}
			F := pt.F
			row := []string{pr.Label, strconv.Itoa(pt.Line), strconv.Itoa(pt.Cycle), strconv.FormatBool(k), ftoa(F[0]), ftoa(F[1]), ftoa(F[2]), ftoa(F[3])}
			for _, c := range comps {
				row = append(row, ftoa(pt.Stress[c]))
			}
			cw.Write(row)
		}
	}
	cw.Flush()
	return cw.Error()
}

// curveTable is curves.csv read back: per protocol label, the path and,
// per model, the stress and band half-width [component][point] of the
// fit table's components.
type curveTable struct {
	models []string
	protos map[string]*curveRows
}

// curveRows is one protocol's curves.
type curveRows struct {
	F [][4]float64
	// stress and half[model][component][point].
	stress, half [][][]float64
}

// readCurveTable parses curves.csv as WriteCurveTable writes it; its
// components must be those of fit.csv.
func readCurveTable(r io.Reader, file string, t *fitTable) (*curveTable, error) {
	rows, err := csv.NewReader(r).ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", file, err)
	}
	if len(rows) < 1 || len(rows[0]) < 5 || strings.Join(rows[0][:5], ",") != "protocol,F11,F12,F21,F22" {
		return nil, fmt.Errorf("%s: line 1: expected protocol,F11,F12,F21,F22 and model curve columns", file)
	}
	h := rows[0]
	if err := repeatedColumn(h, file); err != nil {
		return nil, err
	}
	ct := &curveTable{protos: map[string]*curveRows{}}
	type col struct{ model, comp int }
	cols := make([]col, len(h))
	halfCol := make([]bool, len(h))
	modelAt := map[string]int{}
	for j := 5; j < len(h); j++ {
		name, _ := splitUnit(h[j])
		u := strings.LastIndex(name, "_")
		if u < 0 {
			return nil, fmt.Errorf("%s: line 1, column %d: unknown column %q", file, j+1, h[j])
		}
		comp := componentIndex(t.comps, name[u+1:])
		rest := name[:u]
		rest = strings.TrimSuffix(rest, "_"+t.kind)
		model, half := rest, false
		if m, ok := strings.CutSuffix(rest, "_ci95"); ok {
			model, half = m, true
		}
		if comp < 0 || model == "" {
			return nil, fmt.Errorf("%s: line 1, column %d: %q does not name a model and a component of fit.csv", file, j+1, h[j])
		}
		// A map, not a search of ct.models: a header of tens of thousands
		// of model names took seconds a megabyte searched.
		mi, ok := modelAt[model]
		if !ok {
			ct.models = append(ct.models, model)
			mi = len(ct.models) - 1
			modelAt[model] = mi
		}
		cols[j], halfCol[j] = col{mi, comp}, half
	}
	nm, nc := len(ct.models), len(t.comps)
	for i, row := range rows[1:] {
		ln := i + 2
		if len(row) != len(h) {
			return nil, fmt.Errorf("%s: line %d: %d fields, the header has %d", file, ln, len(row), len(h))
		}
		cr := ct.protos[row[0]]
		if cr == nil {
			cr = &curveRows{stress: make([][][]float64, nm), half: make([][][]float64, nm)}
			for m := 0; m < nm; m++ {
				cr.stress[m], cr.half[m] = make([][]float64, nc), make([][]float64, nc)
			}
			ct.protos[row[0]] = cr
		}
		var F [4]float64
		for k := 0; k < 4; k++ {
			v, err := strconv.ParseFloat(row[1+k], 64)
			if err != nil {
				return nil, fmt.Errorf("%s: line %d, column %d: %q is not a number", file, ln, 2+k, row[1+k])
			}
			F[k] = v
		}
		cr.F = append(cr.F, F)
		for j := 5; j < len(h); j++ {
			v, err := parseCell(row[j])
			if err != nil {
				return nil, fmt.Errorf("%s: line %d, column %d: %q is not a number", file, ln, j+1, row[j])
			}
			c := cols[j]
			if halfCol[j] {
				cr.half[c.model][c.comp] = append(cr.half[c.model][c.comp], v)
			} else {
				cr.stress[c.model][c.comp] = append(cr.stress[c.model][c.comp], v)
			}
		}
	}
	return ct, completeCurveTable(ct, t, file)
}

// completeCurveTable checks that every model has a stress column for
// every component of fit.csv (its band column is optional): the report
// draws each model's curve of each component at every point.
func completeCurveTable(ct *curveTable, t *fitTable, file string) error {
	for m, model := range ct.models {
		for c, comp := range t.comps {
			for _, cr := range ct.protos {
				n := len(cr.F)
				if len(cr.stress[m][c]) != n || (len(cr.half[m][c]) != 0 && len(cr.half[m][c]) != n) {
					return fmt.Errorf("%s: line 1: model %s has no stress column for component %s", file, model, comp)
				}
			}
		}
	}
	return nil
}

// rawTable is raw.csv read back, per protocol label in file order.
type rawTable struct {
	labels []string
	protos map[string]*rawRows
}

// rawRows is one protocol's record.
type rawRows struct {
	line, cycle []int
	kept        []bool
	F           [][4]float64
	// stress[component][point], fit.csv's components.
	stress [][]float64
}

// readRawTable parses raw.csv as WriteRawTable writes it.
func readRawTable(r io.Reader, file string, t *fitTable) (*rawTable, error) {
	rows, err := csv.NewReader(r).ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", file, err)
	}
	const fixed = "protocol,line,cycle,kept,F11,F12,F21,F22"
	if len(rows) < 1 || len(rows[0]) < 8 || strings.Join(rows[0][:8], ",") != fixed {
		return nil, fmt.Errorf("%s: line 1: expected %s and stress columns", file, fixed)
	}
	h := rows[0]
	if err := repeatedColumn(h, file); err != nil {
		return nil, err
	}
	colComp := make([]int, len(h))
	for j := 8; j < len(h); j++ {
		name, _ := splitUnit(h[j])
		u := strings.LastIndex(name, "_")
		if u < 0 || name[:u] != t.kind {
			return nil, fmt.Errorf("%s: line 1, column %d: %q is not %s stress", file, j+1, h[j], t.kind)
		}
		colComp[j] = componentIndex(t.comps, name[u+1:])
	}
	rt := &rawTable{protos: map[string]*rawRows{}}
	for i, row := range rows[1:] {
		ln := i + 2
		if len(row) != len(h) {
			return nil, fmt.Errorf("%s: line %d: %d fields, the header has %d", file, ln, len(row), len(h))
		}
		rr := rt.protos[row[0]]
		if rr == nil {
			rr = &rawRows{stress: make([][]float64, len(t.comps))}
			rt.protos[row[0]] = rr
			rt.labels = append(rt.labels, row[0])
		}
		line, err1 := strconv.Atoi(row[1])
		cycle, err2 := strconv.Atoi(row[2])
		kept, err3 := strconv.ParseBool(row[3])
		if err1 != nil || err2 != nil || err3 != nil {
			return nil, fmt.Errorf("%s: line %d: line, cycle and kept must be a line number, a cycle number and true or false", file, ln)
		}
		var F [4]float64
		for k := 0; k < 4; k++ {
			v, err := strconv.ParseFloat(row[4+k], 64)
			if err != nil {
				return nil, fmt.Errorf("%s: line %d, column %d: %q is not a number", file, ln, 5+k, row[4+k])
			}
			F[k] = v
		}
		rr.line, rr.cycle, rr.kept, rr.F = append(rr.line, line), append(rr.cycle, cycle), append(rr.kept, kept), append(rr.F, F)
		for c := range rr.stress {
			rr.stress[c] = append(rr.stress[c], math.NaN())
		}
		for j := 8; j < len(h); j++ {
			if colComp[j] < 0 {
				continue
			}
			v, err := parseCell(row[j])
			if err != nil {
				return nil, fmt.Errorf("%s: line %d, column %d: %q is not a number", file, ln, j+1, row[j])
			}
			rr.stress[colComp[j]][len(rr.F)-1] = v
		}
	}
	return rt, nil
}
