package biaxial

import "math"

// rawTable holds the data rows of a file grouped by protocol, in the order
// the labels first appear, with only the values the file gave: a stretch
// file with two stress columns keeps 5 numbers a row (7 with time and
// cycle), not a whole Row. The numbers live in fixed-size chunks without
// pointers, so the table grows without copying and the garbage collector
// does not scan it. Reading a file straight into a Specimen (Read,
// ReadFile) fills one of these instead of Record.Rows.
type rawTable struct {
	layout   rowLayout
	groups   []*rawGroup
	byLabel  map[string]*rawGroup
	last     *rawGroup // the group of the previous row: rows come in runs
	rows     int
	hasShear bool // some row has F12 or F21 ≠ 0
}

// rowLayout says where each value of a Point sits in a stored row; -1
// marks a value the file did not give, which takes its default (0, and NaN
// for time). Integers are stored by their bits, so every value is kept
// exactly.
type rowLayout struct {
	f      [4]int
	stress [NumComponents]int
	time   int
	cycle  int
	line   int
	stride int
}

// rawChunkRows is the number of rows in each chunk of a group.
const rawChunkRows = 4096

// rawGroup is the rows of one protocol in file order.
type rawGroup struct {
	label  string
	n      int
	chunks [][]float64
}

// layoutOf stores what a record's header says its rows carry.
func layoutOf(rec *Record) rowLayout {
	var l rowLayout
	next := func(keep bool) int {
		if !keep {
			return -1
		}
		l.stride++
		return l.stride - 1
	}
	grad := rec.Kinematics == GradientColumns
	l.f = [4]int{next(true), next(grad), next(grad), next(true)}
	for c := range l.stress {
		l.stress[c] = next(rec.Measured[c])
	}
	l.time = next(rec.HasTime)
	l.cycle = next(rec.HasCycle)
	l.line = next(true)
	return l
}

// fullLayout stores every value of a Point, for records built in code,
// whose rows may carry values their flags do not announce.
func fullLayout() rowLayout {
	return rowLayout{f: [4]int{0, 1, 2, 3}, stress: [NumComponents]int{4, 5, 6, 7}, time: 8, cycle: 9, line: 10, stride: 11}
}

func newRawTable(l rowLayout) *rawTable {
	return &rawTable{layout: l, byLabel: map[string]*rawGroup{}}
}

// tableOf copies the rows of a record into a table with every value.
func tableOf(rec *Record) *rawTable {
	t := newRawTable(fullLayout())
	for i := range rec.Rows {
		t.add(&rec.Rows[i])
	}
	return t
}

// add appends a row to its protocol's group.
func (t *rawTable) add(r *Row) {
	g := t.last
	if g == nil || g.label != r.Protocol {
		g = t.byLabel[r.Protocol]
		if g == nil {
			g = &rawGroup{label: r.Protocol}
			t.byLabel[r.Protocol] = g
			t.groups = append(t.groups, g)
		}
		t.last = g
	}
	if r.F[1] != 0 || r.F[2] != 0 {
		t.hasShear = true
	}
	l := &t.layout
	k := g.n % rawChunkRows
	if k == 0 {
		size := rawChunkRows * l.stride
		if g.n == 0 {
			size = 0 // a first chunk grows as needed: most protocols are short
		}
		g.chunks = append(g.chunks, make([]float64, 0, size))
	}
	c := &g.chunks[len(g.chunks)-1]
	for j, s := range l.f {
		if s >= 0 {
			*c = append(*c, r.F[j])
		}
	}
	for j, s := range l.stress {
		if s >= 0 {
			*c = append(*c, r.Stress[j])
		}
	}
	if l.time >= 0 {
		*c = append(*c, r.Time)
	}
	if l.cycle >= 0 {
		*c = append(*c, intBits(r.Cycle))
	}
	*c = append(*c, intBits(r.Line))
	g.n++
	t.rows++
}

// intBits and bitsInt store an int in a float64 slot by its bits.
func intBits(i int) float64 { return math.Float64frombits(uint64(i)) }
func bitsInt(v float64) int { return int(math.Float64bits(v)) }

// row returns the stored values of row i of the group.
func (t *rawTable) row(g *rawGroup, i int) []float64 {
	s := t.layout.stride
	k := (i % rawChunkRows) * s
	return g.chunks[i/rawChunkRows][k : k+s]
}

// f returns the deformation gradient of row i.
func (t *rawTable) f(g *rawGroup, i int) [4]float64 {
	v := t.row(g, i)
	var f [4]float64
	for j, s := range t.layout.f {
		if s >= 0 {
			f[j] = v[s]
		}
	}
	return f
}

// line returns the source line of row i.
func (t *rawTable) line(g *rawGroup, i int) int { return bitsInt(t.row(g, i)[t.layout.line]) }

// cycle returns the cycle number of row i as written (0 without a cycle
// column).
func (t *rawTable) cycle(g *rawGroup, i int) int {
	if t.layout.cycle < 0 {
		return 0
	}
	return bitsInt(t.row(g, i)[t.layout.cycle])
}

// point returns row i as a Point.
func (t *rawTable) point(g *rawGroup, i int) Point {
	v := t.row(g, i)
	l := &t.layout
	p := Point{F: t.f(g, i), Time: math.NaN(), Line: bitsInt(v[l.line])}
	for j, s := range l.stress {
		if s >= 0 {
			p.Stress[j] = v[s]
		}
	}
	if l.time >= 0 {
		p.Time = v[l.time]
	}
	if l.cycle >= 0 {
		p.Cycle = bitsInt(v[l.cycle])
	}
	return p
}
