package biaxial

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// Layout chooses how WriteCSV and WriteRecord write a file. The zero value
// writes stresses with stretch columns (F columns when any F12 or F21 is
// non-zero) and every number in its shortest exact form.
type Layout struct {
	// Loads writes load_1, load_2 in LoadUnit instead of normal stresses:
	// load_1 = P11·W2·H, load_2 = P22·W1·H (package documentation, Loads
	// to stress). It needs
	// nominal stress and the specimen geometry; measured shear components
	// are written as nominal_12, nominal_21 beside the loads.
	Loads bool
	// LoadUnit is the unit of the load columns: "N" (default), "mN" or "gf".
	LoadUnit string
	// Gradient writes F11, F12, F21, F22 even for a pure biaxial stretch.
	// Default false: stretch_1, stretch_2 unless some F12 or F21 is non-zero.
	Gradient bool
	// Digits is the number of significant digits of every number; 0
	// (default) writes the shortest text that reads back to the same
	// float64, so a round trip is exact.
	Digits int
}

// Record returns the kept points of s as a Record (one row per point,
// Point.Cycle as the cycle number), e.g. to write them with WriteRecord.
func (s *Specimen) Record() *Record {
	rec := &Record{
		Name: s.Name, Source: s.Source, Sheet: s.Sheet,
		Meta: map[string]string{}, StressUnit: s.StressUnit, Kind: s.Kind,
		Measured: s.Measured, Kinematics: s.Kinematics, FromLoads: s.FromLoads,
		HasTime: s.HasTime, HasCycle: true,
	}
	for k, v := range s.Meta {
		rec.Meta[k] = v
	}
	rec.MetaKeys = append([]string(nil), s.MetaKeys...)
	if s.Geometry != nil {
		g := *s.Geometry
		rec.Geometry = &g
	}
	for i := range s.Protocols {
		for _, p := range s.Protocols[i].Points {
			rec.Rows = append(rec.Rows, Row{Protocol: s.Protocols[i].Label, Point: p})
		}
	}
	return rec
}

// WriteCSV writes the kept points of s in the weft layout (see WriteRecord).
func WriteCSV(w io.Writer, s *Specimen, layout Layout) error {
	return WriteRecord(w, s.Record(), layout)
}

// WriteRecord writes rec in the weft CSV layout: metadata lines
// (`# key = value`, the specimen name first), a header with units, and one
// line per row with its protocol, its cycle when rec.HasCycle or any row
// has a cycle number, and its time when rec.HasTime. For the load layout
// the geometry lines and `stress_unit` are written from rec.Geometry and
// rec.StressUnit so that reading the file back gives the same stresses.
func WriteRecord(w io.Writer, rec *Record, layout Layout) error {
	rw, err := newRecordWriter(rec, layout)
	if err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	if err := rw.metadata(bw); err != nil {
		return err
	}
	rw.header(bw)
	for i := range rec.Rows {
		if err := rw.row(bw, i); err != nil {
			return err
		}
	}
	return bw.Flush()
}

// recordWriter is what WriteRecord decides before it writes a line.
type recordWriter struct {
	rec        *Record
	layout     Layout
	unit       string     // stress unit
	loadUnit   string     // force unit of the load layout
	loadFactor [2]float64 // stress value → load in loadUnit, axes 1, 2
	gradient   bool       // F columns rather than stretches
	hasCycle   bool
	shear      []Component // shear components written
}

// newRecordWriter checks that rec can be written in layout and settles the
// columns.
func newRecordWriter(rec *Record, layout Layout) (*recordWriter, error) {
	rw := &recordWriter{rec: rec, layout: layout, unit: rec.StressUnit, loadUnit: layout.LoadUnit,
		gradient: layout.Gradient, hasCycle: rec.HasCycle}
	if rw.unit == "" {
		rw.unit = "kPa"
	}
	if _, ok := CanonicalStressUnit(rw.unit); !ok {
		return nil, fmt.Errorf("%w: stress unit %q is not Pa, kPa or MPa", ErrUnit, rw.unit)
	}
	if !rec.Measured[C11] || !rec.Measured[C22] {
		return nil, fmt.Errorf("%w: the record does not mark both normal stresses as measured", ErrMissingColumn)
	}
	if layout.Loads {
		if err := rw.loads(); err != nil {
			return nil, err
		}
	}
	for i := range rec.Rows {
		if rec.Rows[i].F[1] != 0 || rec.Rows[i].F[2] != 0 {
			rw.gradient = true
		}
		if rec.Rows[i].Cycle != 0 {
			rw.hasCycle = true
		}
	}
	for _, c := range []Component{C12, C21} {
		if rec.Measured[c] && !(c == C21 && rec.Kind == Cauchy) {
			rw.shear = append(rw.shear, c)
		}
	}
	return rw, nil
}

// loads checks the load layout and sets the factors from nominal stress to
// load: load_1 = P11·W2·H, load_2 = P22·W1·H.
func (rw *recordWriter) loads() error {
	rec := rw.rec
	if rec.Kind != Nominal {
		return fmt.Errorf("%w: the load layout needs nominal stress; this record holds Cauchy stress", ErrMixedStress)
	}
	g := rec.Geometry
	if g == nil || !(g.Thickness > 0 && g.Size1 > 0 && g.Size2 > 0) {
		return fmt.Errorf("%w: the load layout needs the geometry (thickness, size_1, size_2)", ErrGeometry)
	}
	if rw.loadUnit == "" {
		rw.loadUnit = "N"
	}
	fN, ok := ForceToNewton(rw.loadUnit)
	if !ok {
		return fmt.Errorf("%w: load unit %q is not N, mN or gf", ErrUnit, rw.loadUnit)
	}
	toPa, _ := StressFactor(rw.unit, "Pa")
	rw.loadFactor[0] = toPa * g.Size2 * 1e-3 * g.Thickness * 1e-3 / fN
	rw.loadFactor[1] = toPa * g.Size1 * 1e-3 * g.Thickness * 1e-3 / fN
	return nil
}

// num writes a number with the layout's digits.
func (rw *recordWriter) num(v float64) string {
	if rw.layout.Digits > 0 {
		return strconv.FormatFloat(v, 'g', rw.layout.Digits, 64)
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// metadata writes the metadata lines; the geometry and, for loads, the
// stress unit come from the parsed values, in mm with decimal points.
func (rw *recordWriter) metadata(bw *bufio.Writer) error {
	rec := rw.rec
	meta := func(k, v string) {
		v = strings.Join(strings.Fields(v), " ")
		fmt.Fprintf(bw, "# %s = %s\n", k, v)
	}
	skip := map[string]bool{"stress_unit": true}
	if rec.Geometry != nil {
		skip["thickness"], skip["size_1"], skip["size_2"] = true, true, true
	}
	if _, ok := rec.Meta["specimen"]; !ok && rec.Name != "" {
		meta("specimen", rec.Name)
	}
	keys := rec.MetaKeys
	if len(keys) != len(rec.Meta) {
		keys = sortedKeys(rec.Meta)
	}
	for _, k := range keys {
		if skip[k] {
			continue
		}
		if !validMetaKey(k) || k == "" {
			return fmt.Errorf("%w: metadata key %q must be letters, digits, '_', '-' or '.'", ErrMetadata, k)
		}
		meta(k, rec.Meta[k])
	}
	if g := rec.Geometry; g != nil {
		meta("thickness", rw.num(g.Thickness)+" mm")
		meta("size_1", rw.num(g.Size1)+" mm")
		meta("size_2", rw.num(g.Size2)+" mm")
	}
	if rw.layout.Loads {
		meta("stress_unit", rw.unit)
	}
	return nil
}

// header writes the header line.
func (rw *recordWriter) header(bw *bufio.Writer) {
	hdr := []string{"protocol"}
	if rw.hasCycle {
		hdr = append(hdr, "cycle")
	}
	if rw.rec.HasTime {
		hdr = append(hdr, "time [s]")
	}
	if rw.gradient {
		hdr = append(hdr, "F11", "F12", "F21", "F22")
	} else {
		hdr = append(hdr, "stretch_1", "stretch_2")
	}
	prefix := "cauchy_"
	if rw.rec.Kind == Nominal {
		prefix = "nominal_"
	}
	if rw.layout.Loads {
		hdr = append(hdr, "load_1 ["+rw.loadUnit+"]", "load_2 ["+rw.loadUnit+"]")
	} else {
		hdr = append(hdr, prefix+"11 ["+rw.unit+"]", prefix+"22 ["+rw.unit+"]")
	}
	for _, c := range rw.shear {
		hdr = append(hdr, prefix+c.String()+" ["+rw.unit+"]")
	}
	bw.WriteString(strings.Join(hdr, ","))
	bw.WriteByte('\n')
}

// row writes row i; a value that is not finite is refused.
func (rw *recordWriter) row(bw *bufio.Writer, i int) error {
	r := &rw.rec.Rows[i]
	if r.Protocol == "" {
		return fmt.Errorf("%w: row %d has an empty protocol label", ErrProtocol, i+1)
	}
	for _, v := range r.F {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%w: row %d has a non-finite F", ErrNumber, i+1)
		}
	}
	field := func(v float64) {
		bw.WriteByte(',')
		bw.WriteString(rw.num(v))
	}
	bw.WriteString(csvQuote(r.Protocol))
	if rw.hasCycle {
		bw.WriteByte(',')
		bw.WriteString(strconv.Itoa(r.Cycle))
	}
	if rw.rec.HasTime {
		if math.IsNaN(r.Time) || math.IsInf(r.Time, 0) {
			return fmt.Errorf("%w: row %d has no finite time", ErrNumber, i+1)
		}
		field(r.Time)
	}
	if rw.gradient {
		for _, v := range r.F {
			field(v)
		}
	} else {
		field(r.F[0])
		field(r.F[3])
	}
	a, b := r.Stress[C11], r.Stress[C22]
	if rw.layout.Loads {
		a *= rw.loadFactor[0]
		b *= rw.loadFactor[1]
	}
	for _, v := range []float64{a, b} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%w: row %d has a non-finite stress", ErrNumber, i+1)
		}
		field(v)
	}
	for _, c := range rw.shear {
		field(r.Stress[c])
	}
	bw.WriteByte('\n')
	return nil
}

// csvQuote quotes a field when RFC 4180 needs it, and also when it starts
// with '#' or a blank (the reader would take the line as a comment or trim).
func csvQuote(s string) string {
	if s == "" || strings.ContainsAny(s, ",;\"\r\n\t") || s[0] == '#' || s[0] == ' ' || s[len(s)-1] == ' ' {
		return "\"" + strings.ReplaceAll(s, "\"", "\"\"") + "\""
	}
	return s
}
