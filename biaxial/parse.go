package biaxial

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"math"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"
)

// role is what a column of the input means.
type role int

const (
	roleIgnore role = iota
	roleProtocol
	roleCycle
	roleTime
	roleStretch1
	roleStretch2
	roleF11
	roleF12
	roleF21
	roleF22
	roleCauchy11
	roleCauchy22
	roleCauchy12
	roleCauchy21
	roleNominal11
	roleNominal22
	roleNominal12
	roleNominal21
	roleLoad1
	roleLoad2
	numRoles
)

// columnNames maps canonical header names (lower case) to roles.
var columnNames = map[string]role{
	"protocol":   roleProtocol,
	"cycle":      roleCycle,
	"time":       roleTime,
	"stretch_1":  roleStretch1,
	"stretch_2":  roleStretch2,
	"f11":        roleF11,
	"f12":        roleF12,
	"f21":        roleF21,
	"f22":        roleF22,
	"f_11":       roleF11,
	"f_12":       roleF12,
	"f_21":       roleF21,
	"f_22":       roleF22,
	"cauchy_11":  roleCauchy11,
	"cauchy_22":  roleCauchy22,
	"cauchy_12":  roleCauchy12,
	"cauchy_21":  roleCauchy21,
	"nominal_11": roleNominal11,
	"nominal_22": roleNominal22,
	"nominal_12": roleNominal12,
	"nominal_21": roleNominal21,
	"load_1":     roleLoad1,
	"load_2":     roleLoad2,
}

// roleName is the canonical header name of each role, for messages.
var roleName = [numRoles]string{
	"", "protocol", "cycle", "time", "stretch_1", "stretch_2",
	"F11", "F12", "F21", "F22",
	"cauchy_11", "cauchy_22", "cauchy_12", "cauchy_21",
	"nominal_11", "nominal_22", "nominal_12", "nominal_21",
	"load_1", "load_2",
}

// column is one header field.
type column struct {
	role   role
	header string  // as written
	unit   string  // unit text as written, may be empty
	factor float64 // multiplies the value into the record's unit
}

// tableParser turns header and data rows (from CSV or a sheet) into a Record.
type tableParser struct {
	file, sheet string
	rec         *Record
	metaLine    map[string]int // line of each metadata key
	sep         byte           // CSV separator, 0 for xlsx
	cols        []column
	byRole      [numRoles]int // 1-based column index of each role, 0 if absent
	ignored     []string
	header      bool
	headerLine  int
	protoLabel  string // label when there is no protocol column
	lastLabel   string
	decComma    bool // a decimal comma was met
	decCommaOK  bool // decimal commas are accepted (not a comma-separated CSV)
	nRows       int
	lim         Limits  // with defaults filled in
	toKPa       float64 // multiplies a stress in the record's unit into kPa
	intoTable   bool    // rows go to table, else to rec.Rows
	table       *rawTable
	// prev holds, per protocol label, the protocol's previous data row as
	// read and the cells of its ignored columns; last is the entry used
	// for the row before, so a file that lists its protocols one after
	// the other looks the map up only where the label changes. key is the
	// current row's ignored cells (trimmed, each behind its length),
	// reused from row to row. Together they count the rows that repeat
	// their protocol's row before: dupRows of them, the first on line
	// dupFirst.
	prev     map[string]*repeatState
	last     *repeatState
	key      []byte
	dupRows  int
	dupFirst int
}

// repeatState is a protocol's previous data row, for the repeat check.
type repeatState struct {
	row Row
	key []byte // the row's ignored cells, as tableParser.key
}

// newTableParser starts reading a table. With intoTable the data rows are
// kept in a rawTable (made when the header is known) instead of rec.Rows.
func newTableParser(file, sheet string, lim Limits, intoTable bool) *tableParser {
	stem := filepath.Base(file)
	if ext := filepath.Ext(stem); ext != "" {
		stem = strings.TrimSuffix(stem, ext)
	}
	return &tableParser{
		file:      file,
		sheet:     sheet,
		lim:       lim.withDefaults(),
		metaLine:  map[string]int{},
		intoTable: intoTable,
		rec: &Record{
			Name:   stem,
			Source: file,
			Sheet:  sheet,
			Meta:   map[string]string{},
		},
	}
}

// errAt builds a ParseError at a line and column (1-based; 0 = unknown).
func (p *tableParser) errAt(line, col int, cat error, fix, format string, args ...any) *ParseError {
	e := &ParseError{File: p.file, Line: line, Column: col, Err: cat, Fix: fix, Msg: fmt.Sprintf(format, args...)}
	if p.sheet != "" {
		e.Sheet = p.sheet
		if line > 0 && col > 0 {
			e.Cell = cellName(col, line)
		}
	}
	return e
}

// where formats a location for notices and warnings.
func (p *tableParser) where(line, col int) string {
	return (&ParseError{File: p.file, Line: line, Column: col, Sheet: p.sheet, Cell: cellIf(p.sheet, col, line)}).Location()
}

func cellIf(sheet string, col, line int) string {
	if sheet == "" || col <= 0 || line <= 0 {
		return ""
	}
	return cellName(col, line)
}

// cellName returns the A1-style name of a 1-based column and row.
func cellName(col, row int) string {
	var b []byte
	for col > 0 {
		col--
		b = append([]byte{byte('A' + col%26)}, b...)
		col /= 26
	}
	return string(b) + strconv.Itoa(row)
}

func (p *tableParser) notice(format string, args ...any) {
	p.rec.Notices = append(p.rec.Notices, fmt.Sprintf(format, args...))
}

// comment handles a line or row that starts with '#'. text is the content
// after the '#' (it may be a view of the reader's buffer: what is kept is
// copied). Before the header, `key = value` is metadata.
func (p *tableParser) comment(line int, text string) error {
	if p.header {
		return nil
	}
	eq := strings.IndexByte(text, '=')
	if eq < 0 {
		return nil
	}
	key := strings.ToLower(strings.TrimSpace(text[:eq]))
	if key == "" || !validMetaKey(key) {
		return nil // prose, not metadata
	}
	val := strings.TrimSpace(text[eq+1:])
	if first, dup := p.metaLine[key]; dup {
		return p.errAt(line, 0, ErrMetadata, "keep one of the two lines",
			"metadata %s is given again (first on line %d)", quote(key), first)
	}
	key, val = strings.Clone(key), strings.Clone(val)
	p.metaLine[key] = line
	p.rec.Meta[key] = val
	p.rec.MetaKeys = append(p.rec.MetaKeys, key)
	return nil
}

func validMetaKey(k string) bool {
	for i := 0; i < len(k); i++ {
		c := k[i]
		if !(c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '_' || c == '-' || c == '.') {
			return false
		}
	}
	return true
}

// number parses a numeric cell strictly (see ParseNumber), accepting a
// decimal comma where the separator allows it.
func (p *tableParser) number(line, col int, s string) (float64, error) {
	s = trimSpace(s)
	name := p.cols[col-1].header
	if s == "" {
		return 0, p.errAt(line, col, ErrNumber, "fill in the value or delete the row",
			"%s is empty", name)
	}
	v, err := ParseNumber(s)
	if err != nil && p.decCommaOK && strings.Count(s, ",") == 1 && !strings.Contains(s, ".") {
		v, err = ParseNumber(strings.Replace(s, ",", ".", 1))
		if err == nil && !p.decComma {
			p.decComma = true
			p.notice("%s: decimal commas are read as decimal points", p.where(line, col))
		}
	}
	if err != nil {
		if ne, ok := err.(*strconv.NumError); ok && ne.Err == strconv.ErrRange {
			return 0, p.errAt(line, col, ErrNumber, "check the value",
				"%s is %s, which overflows a float64", name, quote(s))
		}
		fix := "write a plain decimal number such as 1.05 or 2.3e-2"
		switch {
		case strings.Contains(s, ",") && !p.decCommaOK:
			fix = "the file is comma-separated, so a decimal comma splits the number; separate columns with semicolons or use decimal points"
		case err.Error() == "only finite numbers are data":
			fix = "replace it with a measured value or delete the row"
		}
		return 0, p.errAt(line, col, ErrNumber, fix, "%s is %s: %v", name, quote(s), err)
	}
	return v, nil
}

// trimSpace is strings.TrimSpace, quicker for a cell that starts and ends
// with a printable ASCII character (no white space, ASCII or not, to trim).
func trimSpace(s string) string {
	if n := len(s); n > 0 && s[0] > ' ' && s[0] < utf8.RuneSelf && s[n-1] > ' ' && s[n-1] < utf8.RuneSelf {
		return s
	}
	return strings.TrimSpace(s)
}

// row reads a data row.
func (p *tableParser) row(line int, fields []string) error {
	if p.nRows >= p.lim.MaxRows {
		return p.errAt(line, 0, ErrRowCount, "split the file, or raise the row limit if the rows are all needed",
			"the file has more than %d data rows, the limit for a test file", p.lim.MaxRows)
	}
	if err := p.fieldCount(line, fields); err != nil {
		return err
	}
	var r Row
	r.Time = math.NaN()
	r.Line = line
	get := func(col int) string {
		if col-1 < len(fields) {
			return fields[col-1]
		}
		return ""
	}
	if c := p.byRole[roleProtocol]; c != 0 {
		lab := strings.TrimSpace(get(c))
		if lab == "" {
			return p.errAt(line, c, ErrProtocol, "write the protocol label (e.g. 1:0.5) in every data row",
				"the protocol is empty")
		}
		if n := utf8.RuneCountInString(lab); n > MaxLabelLength {
			return p.errAt(line, c, ErrProtocol, fmt.Sprintf("shorten the label to at most %d characters", MaxLabelLength),
				"the protocol label is %d characters long (%s)", n, quote(lab))
		}
		if lab != p.lastLabel {
			p.lastLabel = strings.Clone(lab)
		}
		r.Protocol = p.lastLabel
	} else {
		r.Protocol = p.protoLabel
	}
	for i := range p.cols {
		c := &p.cols[i]
		if c.role == roleIgnore || c.role == roleProtocol {
			continue
		}
		col := i + 1
		v, err := p.number(line, col, get(col))
		if err != nil {
			return err
		}
		switch c.role {
		case roleCycle:
			if v != math.Trunc(v) || v < 0 || v > 1e9 {
				return p.errAt(line, col, ErrNumber, "number the cycles 1, 2, 3, … (or from 0)",
					"cycle is %s; it must be a whole number ≥ 0", quote(strings.TrimSpace(get(col))))
			}
			r.Cycle = int(v)
		case roleTime:
			r.Time = v * c.factor
		case roleStretch1, roleStretch2:
			if v <= 0 {
				return p.errAt(line, col, ErrRange, "check the column order or the marker export",
					"%s is %s; stretches must be > 0", c.header, strings.TrimSpace(get(col)))
			}
			if c.role == roleStretch1 {
				r.F[0] = v
			} else {
				r.F[3] = v
			}
		case roleF11:
			r.F[0] = v
		case roleF12:
			r.F[1] = v
		case roleF21:
			r.F[2] = v
		case roleF22:
			r.F[3] = v
		default:
			_, comp, _ := stressRole(c.role)
			r.Stress[comp] = v * c.factor
			if err := p.plausibleStress(line, col, v, r.Stress[comp]); err != nil {
				return err
			}
		}
	}
	if p.rec.Kinematics == GradientColumns {
		det := r.F[0]*r.F[3] - r.F[1]*r.F[2]
		if !(det > 0) {
			return p.errAt(line, p.byRole[roleF11], ErrRange,
				"check the sign convention and the order of the F columns (F11, F12, F21, F22)",
				"det F = F11·F22 − F12·F21 = %.6g; it must be > 0", det)
		}
	}
	if err := p.plausibleStretch(line, &r); err != nil {
		return err
	}
	p.repeats(&r, get)
	p.nRows++
	if p.table != nil {
		p.table.add(&r)
	} else {
		p.rec.Rows = append(p.rec.Rows, r)
	}
	return nil
}

// repeats counts a data row r whose every value equals the previous data
// row of its protocol: each number read (time and cycle included), the
// protocol label and the cells of the columns weft ignores (spaces around
// a cell aside). A copied block of rows looks like data but is one
// measurement counted twice; a state truly sampled twice differs at least
// in its time stamp. The previous row is taken within the protocol, not
// the file, because the rows of one protocol need not be contiguous: a
// file that interleaves its protocols row by row holds the same data as
// one that lists them in blocks, and must raise the same warning (compared
// with the file's previous row, the copy went unnoticed there). The values
// read are compared as numbers, which costs nothing on the parse's path;
// only the ignored cells are copied, usually none.
func (p *tableParser) repeats(r *Row, get func(col int) string) {
	p.key = p.key[:0]
	for i := range p.cols {
		if p.cols[i].role != roleIgnore {
			continue
		}
		f := trimSpace(get(i + 1))
		p.key = binary.AppendUvarint(p.key, uint64(len(f)))
		p.key = append(p.key, f...)
	}
	st := p.last
	if st == nil || st.row.Protocol != r.Protocol {
		st = p.prev[r.Protocol]
		if st == nil {
			if p.prev == nil {
				p.prev = make(map[string]*repeatState)
			}
			p.prev[r.Protocol] = &repeatState{row: *r, key: append([]byte(nil), p.key...)}
			p.last = p.prev[r.Protocol]
			return
		}
		p.last = st
	}
	if sameReading(r, &st.row) && bytes.Equal(p.key, st.key) {
		if p.dupRows == 0 {
			p.dupFirst = r.Line
		}
		p.dupRows++
	}
	st.row = *r
	st.key = append(st.key[:0], p.key...)
}

// sameReading reports whether two rows hold the same label and numbers
// (bit for bit; a missing time, NaN, equals a missing time).
func sameReading(a, b *Row) bool {
	same := func(x, y float64) bool { return math.Float64bits(x) == math.Float64bits(y) }
	if a.Protocol != b.Protocol || a.Cycle != b.Cycle || !same(a.Time, b.Time) {
		return false
	}
	for i := range a.F {
		if !same(a.F[i], b.F[i]) {
			return false
		}
	}
	for i := range a.Stress {
		if !same(a.Stress[i], b.Stress[i]) {
			return false
		}
	}
	return true
}

// warnRepeats warns about the rows that repeat their protocol's row before
// them. They
// are kept: the file may hold a state sampled twice, and dropping rows
// would hide what the file says; the warning says what keeping them does.
func (p *tableParser) warnRepeats() {
	if p.dupRows == 0 {
		return
	}
	lines := "line"
	if p.sheet != "" {
		lines = "row"
	}
	what := fmt.Sprintf("%d rows repeat their protocol's row before them exactly, every column equal (the first on %s %d)", p.dupRows, lines, p.dupFirst)
	if p.dupRows == 1 {
		what = fmt.Sprintf("the row on %s %d repeats its protocol's row before it exactly, every column equal", lines, p.dupFirst)
	}
	p.rec.Warnings = append(p.rec.Warnings, Warning{File: p.file, Line: p.dupFirst, Sheet: p.sheet,
		Message: what + "; repeated rows are kept, and where they are among the points fitted a repeated sample counts twice in the fit, which inflates the evidence for a model and narrows its intervals — delete the copies unless the specimen was truly sampled twice in the same state"})
}

// fieldCount refuses a row with cells beyond the header, and a CSV row that
// ends before a column weft reads (a workbook row simply has empty cells
// there, which the number check reports).
func (p *tableParser) fieldCount(line int, fields []string) error {
	if len(fields) > len(p.cols) {
		for i := len(p.cols); i < len(fields); i++ {
			if strings.TrimSpace(fields[i]) != "" {
				fix := "remove the extra cells or add a header for them"
				if !p.decCommaOK && p.sep == ',' {
					fix = "if the numbers use decimal commas, separate the columns with semicolons; otherwise remove the extra cells or add a header for them"
				}
				return p.errAt(line, i+1, ErrSyntax, fix,
					"the row has %d fields but the header (line %d) has %d", len(fields), p.headerLine, len(p.cols))
			}
		}
	}
	if p.sheet != "" || len(fields) >= len(p.cols) {
		return nil
	}
	for i := len(fields); i < len(p.cols); i++ {
		if p.cols[i].role != roleIgnore {
			return p.errAt(line, i+1, ErrSyntax, "complete the row or delete it",
				"the row ends after %d fields but the header (line %d) has %d; %s (column %d) is missing",
				len(fields), p.headerLine, len(p.cols), p.cols[i].header, i+1)
		}
	}
	return nil
}

// plausibleStretch refuses a row whose in-plane principal stretches lie
// outside the plausible range: for stretch columns each stretch, for F
// columns the singular values of F.
func (p *tableParser) plausibleStretch(line int, r *Row) error {
	lo, hi := p.lim.StretchMin, p.lim.StretchMax
	fix := "check the column order and the unit (a stretch is a ratio, 1 in the reference state, not a length or a strain); if the value is real, widen the plausible stretch range"
	if p.rec.Kinematics == StretchColumns {
		for _, rl := range []role{roleStretch1, roleStretch2} {
			v := r.F[0]
			if rl == roleStretch2 {
				v = r.F[3]
			}
			if !(v >= lo && v <= hi) {
				return p.errAt(line, p.byRole[rl], ErrStretchLimit, fix,
					"%s is %g, outside the plausible range %g to %g for soft tissue", roleName[rl], v, lo, hi)
			}
		}
		return nil
	}
	s1, s2 := principalStretches(r.F)
	if !(s2 >= lo && s1 <= hi) {
		return p.errAt(line, p.byRole[roleF11], ErrStretchLimit, fix,
			"F = (%g, %g, %g, %g) has principal stretches %.4g and %.4g, outside the plausible range %g to %g for soft tissue",
			r.F[0], r.F[1], r.F[2], r.F[3], s1, s2, lo, hi)
	}
	return nil
}

// principalStretches returns the larger and smaller singular value of the
// 2×2 matrix F (row-major F11, F12, F21, F22).
func principalStretches(F [4]float64) (float64, float64) {
	a := F[0]*F[0] + F[1]*F[1] + F[2]*F[2] + F[3]*F[3]
	det := math.Abs(F[0]*F[3] - F[1]*F[2])
	d := math.Sqrt(math.Max(a*a-4*det*det, 0))
	s1 := math.Sqrt((a + d) / 2)
	if s1 == 0 {
		return 0, 0
	}
	return s1, det / s1
}

// plausibleStress refuses a stress whose magnitude exceeds the limit. raw
// is the cell's value, v the value in the record's unit.
func (p *tableParser) plausibleStress(line, col int, raw, v float64) error {
	kPa := v * p.toKPa
	if math.Abs(kPa) <= p.lim.MaxStressKPa {
		return nil
	}
	c := &p.cols[col-1]
	what := fmt.Sprintf("%s is %g %s", c.header, v, p.rec.StressUnit)
	if c.role == roleLoad1 || c.role == roleLoad2 {
		what = fmt.Sprintf("%s = %g %s gives a nominal stress of %.4g %s", c.header, raw, c.unit, v, p.rec.StressUnit)
	}
	return p.errAt(line, col, ErrStressLimit,
		"check the stress unit and the column (and the thickness and sizes for loads); if the value is real, raise the stress limit",
		"%s; stresses beyond ±%g kPa are not plausible for soft tissue", what, p.lim.MaxStressKPa)
}

// finish checks what can only be checked at the end.
func (p *tableParser) finish() (*Record, error) {
	if !p.header {
		return nil, p.errAt(0, 0, ErrMissingColumn, "add a header line such as `protocol,stretch_1,stretch_2,cauchy_11,cauchy_22`",
			"no header line found (the file is empty or holds only comments)")
	}
	if p.nRows == 0 {
		return nil, p.errAt(p.headerLine, 0, ErrProtocol, "add the measured rows below the header",
			"the file has a header but no data rows")
	}
	p.warnRepeats()
	return p.rec, nil
}

func sortedKeys[V any](m map[string]V) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}
