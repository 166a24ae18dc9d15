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
	// load_1 = P11·W2·H, load_2 = P22·W1·H (physics sheet §3). It needs
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
	unit := rec.StressUnit
	if unit == "" {
		unit = "kPa"
	}
	if _, ok := CanonicalStressUnit(unit); !ok {
		return fmt.Errorf("%w: stress unit %q is not Pa, kPa or MPa", ErrUnit, unit)
	}
	if !rec.Measured[C11] || !rec.Measured[C22] {
		return fmt.Errorf("%w: the record does not mark both normal stresses as measured", ErrMissingColumn)
	}
	loadUnit := layout.LoadUnit
	var loadFactor [2]float64 // stress value → load in loadUnit, axes 1, 2
	if layout.Loads {
		if rec.Kind != Nominal {
			return fmt.Errorf("%w: the load layout needs nominal stress; this record holds Cauchy stress", ErrMixedStress)
		}
		if rec.Geometry == nil || !(rec.Geometry.Thickness > 0 && rec.Geometry.Size1 > 0 && rec.Geometry.Size2 > 0) {
			return fmt.Errorf("%w: the load layout needs the geometry (thickness, size_1, size_2)", ErrGeometry)
		}
		if loadUnit == "" {
			loadUnit = "N"
		}
		fN, ok := ForceToNewton(loadUnit)
		if !ok {
			return fmt.Errorf("%w: load unit %q is not N, mN or gf", ErrUnit, loadUnit)
		}
		toPa, _ := StressFactor(unit, "Pa")
		g := rec.Geometry
		loadFactor[0] = toPa * g.Size2 * 1e-3 * g.Thickness * 1e-3 / fN
		loadFactor[1] = toPa * g.Size1 * 1e-3 * g.Thickness * 1e-3 / fN
	}
	gradient := layout.Gradient
	hasCycle := rec.HasCycle
	for i := range rec.Rows {
		if rec.Rows[i].F[1] != 0 || rec.Rows[i].F[2] != 0 {
			gradient = true
		}
		if rec.Rows[i].Cycle != 0 {
			hasCycle = true
		}
	}

	bw := bufio.NewWriter(w)
	meta := func(k, v string) {
		v = strings.Join(strings.Fields(v), " ")
		fmt.Fprintf(bw, "# %s = %s\n", k, v)
	}
	skip := map[string]bool{"stress_unit": true}
	if rec.Geometry != nil {
		// Written below from the parsed values, in mm with decimal points.
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
	num := func(v float64) string {
		if layout.Digits > 0 {
			return strconv.FormatFloat(v, 'g', layout.Digits, 64)
		}
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	if rec.Geometry != nil {
		meta("thickness", num(rec.Geometry.Thickness)+" mm")
		meta("size_1", num(rec.Geometry.Size1)+" mm")
		meta("size_2", num(rec.Geometry.Size2)+" mm")
	}
	if layout.Loads {
		meta("stress_unit", unit)
	}

	// Header.
	hdr := []string{"protocol"}
	if hasCycle {
		hdr = append(hdr, "cycle")
	}
	if rec.HasTime {
		hdr = append(hdr, "time [s]")
	}
	if gradient {
		hdr = append(hdr, "F11", "F12", "F21", "F22")
	} else {
		hdr = append(hdr, "stretch_1", "stretch_2")
	}
	prefix := "cauchy_"
	if rec.Kind == Nominal {
		prefix = "nominal_"
	}
	if layout.Loads {
		hdr = append(hdr, "load_1 ["+loadUnit+"]", "load_2 ["+loadUnit+"]")
	} else {
		hdr = append(hdr, prefix+"11 ["+unit+"]", prefix+"22 ["+unit+"]")
	}
	shear := []Component{}
	for _, c := range []Component{C12, C21} {
		if rec.Measured[c] {
			if c == C21 && rec.Kind == Cauchy {
				continue
			}
			shear = append(shear, c)
			hdr = append(hdr, prefix+c.String()+" ["+unit+"]")
		}
	}
	bw.WriteString(strings.Join(hdr, ","))
	bw.WriteByte('\n')

	for i := range rec.Rows {
		r := &rec.Rows[i]
		if r.Protocol == "" {
			return fmt.Errorf("%w: row %d has an empty protocol label", ErrProtocol, i+1)
		}
		vals := r.F[:]
		for _, v := range vals {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Errorf("%w: row %d has a non-finite F", ErrNumber, i+1)
			}
		}
		bw.WriteString(csvQuote(r.Protocol))
		if hasCycle {
			bw.WriteByte(',')
			bw.WriteString(strconv.Itoa(r.Cycle))
		}
		if rec.HasTime {
			if math.IsNaN(r.Time) || math.IsInf(r.Time, 0) {
				return fmt.Errorf("%w: row %d has no finite time", ErrNumber, i+1)
			}
			bw.WriteByte(',')
			bw.WriteString(num(r.Time))
		}
		if gradient {
			for _, v := range r.F {
				bw.WriteByte(',')
				bw.WriteString(num(v))
			}
		} else {
			bw.WriteByte(',')
			bw.WriteString(num(r.F[0]))
			bw.WriteByte(',')
			bw.WriteString(num(r.F[3]))
		}
		a, b := r.Stress[C11], r.Stress[C22]
		if layout.Loads {
			a *= loadFactor[0]
			b *= loadFactor[1]
		}
		for _, v := range []float64{a, b} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Errorf("%w: row %d has a non-finite stress", ErrNumber, i+1)
			}
			bw.WriteByte(',')
			bw.WriteString(num(v))
		}
		for _, c := range shear {
			bw.WriteByte(',')
			bw.WriteString(num(r.Stress[c]))
		}
		bw.WriteByte('\n')
	}
	return bw.Flush()
}

// csvQuote quotes a field when RFC 4180 needs it, and also when it starts
// with '#' or a blank (the reader would take the line as a comment or trim).
func csvQuote(s string) string {
	if s == "" || strings.ContainsAny(s, ",;\"\r\n\t") || s[0] == '#' || s[0] == ' ' || s[len(s)-1] == ' ' {
		return "\"" + strings.ReplaceAll(s, "\"", "\"\"") + "\""
	}
	return s
}
