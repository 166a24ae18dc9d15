package biaxial

import (
	"fmt"
	"math"
)

// Blocks written twice. A protocol or a cycle pasted twice into a file —
// the same rows again further down, exactly or within rounding — is one
// measurement that a fit keeping every cycle and both branches
// counts twice, inflating the evidence for a model and narrowing its
// intervals; with the last cycle kept it may be the copy alone that is
// fitted. The row check of the reader (repeats, parse.go) sees only a row
// equal to the row before it; warnRepeatedBlocks compares a protocol's
// rows with all its earlier rows.
//
// Two rows are the same reading when every value read — the four entries
// of F, the stresses and the time, where the file gives them — agrees
// within blockRounding of the largest magnitude of its quantity (F, stress
// or time) in the protocol (the cycle number is not compared: a pasted
// cycle may have been numbered anew). A cyclic test repeats its path, not its readings: each
// cycle's rows carry the tester's noise (tracking noise of the markers is
// 10⁻⁴ of the stretch and more, common practice) and later time stamps, so
// no run of them agrees with an earlier run to 10⁻⁵.

// blockMinRows is the fewest rows a repeated block must have, at least
// blockMinRows − 1 of which differ from the row before them: a held
// state, written as the same row again and again, is no block (the reader warns of rows
// equal to the row before).
const blockMinRows = 5

// blockRounding is the agreement, as a fraction of the largest magnitude
// of a quantity in the protocol, within which two values count as the same
// reading written with other rounding (a stretch of about 1.2 written with
// five decimals instead of six).
const blockRounding = 1e-5

// repeatedBlock is a run of a protocol's rows (positions copy … copy+n−1)
// that repeats an earlier run (orig … orig+n−1).
type repeatedBlock struct{ orig, copy, n int }

// repeatedBlocks finds the runs of at least blockMinRows rows of the
// protocol g that repeat an earlier run of its rows, in file order;
// copies do not overlap their originals.
func repeatedBlocks(t *rawTable, g *rawGroup) []repeatedBlock {
	n := g.n
	if n < 2*blockMinRows {
		return nil
	}
	rx := newReadingIndex(t, g)
	var out []repeatedBlock
	done := 0 // the rows before are in a block found already
	for i := 0; i < n; {
		best := repeatedBlock{}
		j, slot := rx.find(i, rx.key(i))
		if j >= 0 && !(i > 0 && rx.same(i, i-1)) { // a block is looked for from a row that moves on, not inside a state at rest
			if x := rx.grow(i, j, done); x.n > best.n {
				best = x
			}
		}
		if best.n == 0 {
			if j < 0 {
				rx.table[slot] = int32(i + 1)
			}
			i++
			continue
		}
		out = append(out, best)
		for m := i; m < best.copy+best.n; m++ {
			rx.remember(m)
		}
		i = best.copy + best.n
		done = i
	}
	return out
}

// readingIndex finds, for a row of a protocol, the first earlier row that
// is the same reading (see Blocks written twice).
type readingIndex struct {
	t    *rawTable
	g    *rawGroup
	cols []int     // the columns compared: F entries, stresses, time
	step []float64 // their agreement, blockRounding of their quantity's scale
	// table is an open-addressing table of row positions (plus one; 0 is
	// empty), at most half full: 8 bytes or less a row, and no keys
	// stored, since a probe compares the rows themselves.
	table []int32
}

// newReadingIndex sets up the comparison of g's rows: the columns read and
// the scale of each quantity, the largest magnitude of its values in the
// protocol (of all the entries of F, since a shear F12 of 0.001 is written
// with as many decimals as F11; of all the stresses; of the time).
func newReadingIndex(t *rawTable, g *rawGroup) *readingIndex {
	rx := &readingIndex{t: t, g: g}
	var group []int // 0 F, 1 stress, 2 time
	for _, s := range t.layout.f {
		if s >= 0 {
			rx.cols, group = append(rx.cols, s), append(group, 0)
		}
	}
	for _, s := range t.layout.stress {
		if s >= 0 {
			rx.cols, group = append(rx.cols, s), append(group, 1)
		}
	}
	if t.layout.time >= 0 {
		rx.cols, group = append(rx.cols, t.layout.time), append(group, 2)
	}
	var scale [3]float64
	for i := 0; i < g.n; i++ {
		v := t.row(g, i)
		for k, c := range rx.cols {
			if a := math.Abs(v[c]); a > scale[group[k]] {
				scale[group[k]] = a
			}
		}
	}
	rx.step = make([]float64, len(rx.cols))
	for k := range rx.step {
		rx.step[k] = blockRounding * scale[group[k]]
	}
	size := 1
	for size < 2*g.n {
		size *= 2
	}
	rx.table = make([]int32, size)
	return rx
}

// same reports whether rows i and j are the same reading.
func (rx *readingIndex) same(i, j int) bool {
	a, b := rx.t.row(rx.g, i), rx.t.row(rx.g, j)
	for k, c := range rx.cols {
		x, y := a[c], b[c]
		if x != y && !(math.Abs(x-y) <= rx.step[k]) && !(math.IsNaN(x) && math.IsNaN(y)) {
			return false
		}
	}
	return true
}

// key hashes row i. Rows are found by a hash (FNV-1a, Fowler, Noll & Vo;
// from memory) of their values on a grid of twice the rounding: two
// readings within the rounding of each other share their grid cells but
// where a value lies at a cell's edge, which a block reaching back (grow)
// mends. The first row of each reading is kept: the original of a pasted
// block is usually the only earlier row of its readings, and a block is
// looked for only from a row that moves on from the row before it, so a
// state at rest, written as the same row many times, is not tried against
// all its rows.
func (rx *readingIndex) key(i int) uint64 {
	h := uint64(14695981039346656037)
	v := rx.t.row(rx.g, i)
	for k, c := range rx.cols {
		x := v[c]
		if rx.step[k] > 0 {
			x = math.Floor(x / (2 * rx.step[k]))
		}
		u := math.Float64bits(x)
		for b := 0; b < 64; b += 8 {
			h ^= (u >> b) & 0xff
			h *= 1099511628211
		}
	}
	return h
}

// find returns the first earlier row remembered that is the same reading
// as row i (with hash k), and the slot where row i goes if there is none
// (j < 0).
func (rx *readingIndex) find(i int, k uint64) (j, slot int) {
	size := len(rx.table)
	for slot = int(k) & (size - 1); rx.table[slot] != 0; slot = (slot + 1) & (size - 1) {
		if j = int(rx.table[slot]) - 1; rx.same(i, j) {
			return j, slot
		}
	}
	return -1, slot
}

// remember records row i unless an earlier row is the same reading.
func (rx *readingIndex) remember(i int) {
	if j, slot := rx.find(i, rx.key(i)); j < 0 {
		rx.table[slot] = int32(i + 1)
	}
}

// grow returns the block that row i, the same reading as the earlier row
// j, starts: as long as the rows after both agree (the copy not reaching
// its original), reaching back over rows whose originals a cell's edge hid
// but not into rows before done, already in a block; n is 0 when fewer
// than blockMinRows − 1 of its rows move on from the row before them.
func (rx *readingIndex) grow(i, j, done int) repeatedBlock {
	n := rx.g.n
	x := repeatedBlock{orig: j, copy: i}
	for i+x.n < n && j+x.n < i && rx.same(i+x.n, j+x.n) {
		x.n++
	}
	for x.orig > 0 && x.copy > done && x.orig+x.n <= x.copy-1 && rx.same(x.copy-1, x.orig-1) {
		x.orig, x.copy, x.n = x.orig-1, x.copy-1, x.n+1
	}
	moved := 0
	for m := 1; m < x.n; m++ {
		if !rx.same(x.copy+m, x.copy+m-1) {
			moved++
		}
	}
	if moved < blockMinRows-1 {
		return repeatedBlock{}
	}
	return x
}

// warnRepeatedBlocks finds the runs of the protocol's rows that repeat an
// earlier run (repeatedBlocks), keeps them for the refusals that they may
// explain (pastedAmong), and warns once for the protocol, naming the first
// and how many there are.
func (r *protocolRows) warnRepeatedBlocks(s *Specimen) {
	r.blocks = repeatedBlocks(r.t, r.g)
	blocks := r.blocks
	if len(blocks) == 0 {
		return
	}
	b := blocks[0]
	lines := "lines"
	if r.rec.Sheet != "" {
		lines = "rows"
	}
	more := ""
	if len(blocks) > 1 {
		rows := 0
		for _, x := range blocks[1:] {
			rows += x.n
		}
		more = fmt.Sprintf(" (and %s in %s more)", plural(rows, "row"), plural(len(blocks)-1, "block"))
	}
	s.warn(r.line(b.copy), r.g.label, "protocol %s: the %d rows at %s %d–%d repeat the rows at %s %d–%d, every value read equal within %g of the largest of its quantity%s — a block of rows (a cycle, or the protocol) written twice? A repeated cyclic test repeats its path, not its readings; where both blocks are among the points kept (every cycle and both branches kept) the block counts twice in the fit, which inflates the evidence for a model and narrows its intervals — delete the copy",
		r.g.label, b.n, lines, r.line(b.copy), r.line(b.copy+b.n-1), lines, r.line(b.orig), r.line(b.orig+b.n-1), blockRounding, more)
}

// pastedAmong says, for a refusal, which repeated block (warnRepeatedBlocks)
// holds rows at any of the given positions of the protocol, in words that
// end the refusal's message with guess (what the copy looks like to the
// check that refused), or "" when none does. A block pasted at the
// end of a protocol is read as one more cycle: the stretch turns where the
// copy begins, and the copy, shorter than a cycle, is the last cycle a fit
// keeps by default (or, numbered as an earlier cycle, a cycle that comes
// back). The refusal names what it sees — too few points, a cycle number
// again — and without this the cause, which the reader had found, would go
// unsaid: the warnings of a refused file are not shown.
func (r *protocolRows) pastedAmong(pos []int, guess string) string {
	for _, b := range r.blocks {
		for _, p := range pos {
			if p >= b.copy && p < b.copy+b.n {
				return fmt.Sprintf("; %s repeat %s, every value read equal within %g of the largest of its quantity: %s",
					r.lineRange(r.line(b.copy), r.line(b.copy+b.n-1)), r.lineRange(r.line(b.orig), r.line(b.orig+b.n-1)), blockRounding, guess)
			}
		}
	}
	return ""
}
