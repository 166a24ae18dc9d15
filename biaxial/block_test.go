package biaxial

import (
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"
)

// cyclicRows writes the rows (no header) of a synthetic stretch-controlled
// cyclic test of protocol label: cycles cycles of n rows up and n − 1 down
// to stretches 1.15 × (1 + 0.15 ratio) of an incompressible neo-Hookean
// membrane in plane stress, σ11 = μ (λ1² − (λ1 λ2)⁻²) and likewise σ22
// with μ = 20 kPa (Rivlin 1948, as in Holzapfel 2000, Nonlinear Solid
// Mechanics, §6.5), 10 rows a second; every entry of F gets Gaussian
// scatter sdF and each stress Gaussian noise of relS times 8 kPa. Columns:
// protocol, cycle, time, F11, F12, F21, F22, cauchy_11, cauchy_22; digits
// decimals for F.
func cyclicRows(seed uint64, label string, ratio float64, cycles, n int, sdF, relS float64, digits int) []string {
	rng := rand.New(rand.NewPCG(seed, 11))
	var out []string
	row := 0
	for c := 1; c <= cycles; c++ {
		for i := 0; i < 2*n-1; i++ {
			u := float64(i) / float64(n-1)
			if i >= n {
				u = 2 - u
			}
			l1, l2 := 1+0.15*u, 1+0.15*ratio*u
			p := 1 / (l1 * l1 * l2 * l2)
			s1, s2 := 20*(l1*l1-p), 20*(l2*l2-p)
			e := func() float64 { return sdF * rng.NormFloat64() }
			out = append(out, fmt.Sprintf("%s,%d,%.1f,%.*f,%.*f,%.*f,%.*f,%.5f,%.5f", label, c, float64(row)/10,
				digits, l1+e(), digits, e(), digits, e(), digits, l2+e(), s1+8*relS*rng.NormFloat64(), s2+8*relS*rng.NormFloat64()))
			row++
		}
	}
	return out
}

const cyclicHeader = "# specimen = BLOCK (synthetic)\nprotocol,cycle,time [s],F11,F12,F21,F22,cauchy_11 [kPa],cauchy_22 [kPa]\n"

func blockWarnings(t *testing.T, rows []string, opt Options) []Warning {
	t.Helper()
	s, err := readString(cyclicHeader+strings.Join(rows, "\n")+"\n", opt)
	if err != nil {
		t.Fatal(err)
	}
	return warningsWith(s, "written twice?")
}

// A block of rows written twice — a cycle pasted again at the end of its
// protocol, numbered as a new cycle, or a whole protocol pasted again —
// is one measurement that a fit keeping every cycle and both branches fits twice; before
// 2026-12-05 nothing said so. It is warned about, naming the protocol and
// the lines of both blocks, also when the copy was written with five
// decimals instead of six. The genuine cycles of a cyclic test (3 cycles
// of the same path, with tracking noise of 0.0005 to 0.004 in F and 1 %
// stress noise, or without any noise but with their time stamps) are not
// warned about, and neither is a state held at rest, written as the same
// row again and again. Synthetic data.
func TestRepeatedBlockWarned(t *testing.T) {
	base := cyclicRows(1, "1:1", 1, 3, 20, 0.002, 0.01, 6) // lines 3–119, 39 rows a cycle
	// Cycle 2 (lines 42–80) pasted again at the end as cycle 4 (with the
	// same number, the reader refuses it as two protocols under one label).
	rows := append([]string(nil), base...)
	for _, r := range base[39:78] {
		rows = append(rows, strings.Replace(r, "1:1,2,", "1:1,4,", 1))
	}
	ws := blockWarnings(t, rows, Options{Cycle: CycleAll, Branch: BranchAll})
	if len(ws) != 1 || ws[0].Protocol != "1:1" || ws[0].Line != 120 ||
		!strings.Contains(ws[0].Message, "protocol 1:1: the 39 rows at lines 120–158 repeat the rows at lines 42–80") {
		t.Errorf("a cycle pasted again: warnings %v, want one for the 39 rows at lines 120–158", ws)
	}

	// A whole protocol pasted again, after another protocol, with five
	// decimals in the copy's F instead of six.
	a := cyclicRows(2, "1:1", 1, 1, 30, 0.001, 0.01, 6)
	b := cyclicRows(3, "1:0.5", 0.5, 1, 30, 0.001, 0.01, 6)
	again := cyclicRows(2, "1:1", 1, 1, 30, 0.001, 0.01, 5)
	for i := range again {
		again[i] = strings.Replace(again[i], "1:1,1,", "1:1,2,", 1)
	}
	rows = append(append(append([]string(nil), a...), b...), again...)
	ws = blockWarnings(t, rows, Options{Cycle: CycleAll, Branch: BranchAll})
	if len(ws) != 1 || ws[0].Protocol != "1:1" || !strings.Contains(ws[0].Message, "the 59 rows at lines 121–179 repeat the rows at lines 3–61") {
		t.Errorf("a protocol pasted again with five decimals: warnings %v", ws)
	}

	// Genuine cycles: the same path, read anew each time.
	for seed := uint64(1); seed <= 8; seed++ {
		for _, sdF := range []float64{0.0005, 0.004} {
			if ws := blockWarnings(t, cyclicRows(seed, "1:1", 1, 3, 40, sdF, 0.01, 6), Options{Cycle: CycleAll, Branch: BranchAll}); len(ws) != 0 {
				t.Errorf("genuine noisy cycles (seed %d, scatter %g) warned: %v", seed, sdF, ws)
			}
		}
	}
	if ws := blockWarnings(t, cyclicRows(1, "1:1", 1, 3, 40, 0, 0, 6), Options{Cycle: CycleAll, Branch: BranchAll}); len(ws) != 0 {
		t.Errorf("genuine noise-free cycles with their time stamps warned: %v", ws)
	}
	// A state held at rest between two ramps: the same row twelve times.
	rest := cyclicRows(4, "1:1", 1, 1, 20, 0.001, 0.01, 6)
	for k := 0; k < 12; k++ {
		rest = append(rest, "1:1,1,9.9,1.000000,0.000000,0.000000,1.000000,0.00000,0.00000")
	}
	s, err := readString(cyclicHeader+strings.Join(rest, "\n")+"\n", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if ws := warningsWith(s, "written twice?"); len(ws) != 0 {
		t.Errorf("rows held at rest taken for a block written twice: %v", ws)
	}
}

// A block pasted at the end of a protocol is read as one more cycle, and
// the refusal it causes must name it: until 2026-12-05 a synthetic cycle's
// peak and the 10 rows after it, pasted again at the end, gave "keeps 2
// points (cycle 4 of 4, loading branch); at least 5 are needed" without
// the lines of those points or the repeat the reader had found (the
// warnings of a refused file are not shown), and, pasted with its cycle
// number, "they look like two protocols under one label" alone, and a
// branch shorter than the smoothing window only its count. The
// synthetic data are an incompressible neo-Hookean membrane in plane
// stress (Treloar 1943; σ_ii = μ(λ_i² − 1/(λ1λ2)²)).
func TestRefusalNamesPastedBlock(t *testing.T) {
	base := cyclicRows(4, "1:1", 1, 3, 20, 0.002, 0.01, 6) // lines 3–119, 39 rows a cycle
	paste := func(cycle string) []string {
		rows := append([]string(nil), base...)
		for _, r := range base[39+19 : 39+30] { // cycle 2's peak (line 61) and 10 rows down
			rows = append(rows, strings.Replace(r, "1:1,2,", "1:1,"+cycle+",", 1))
		}
		return rows
	}
	const block = "; lines 120–130 repeat lines 61–71"
	noCycle := func(rows []string) string {
		var b strings.Builder
		b.WriteString("# specimen = BLOCK (synthetic)\nprotocol,time [s],F11,F12,F21,F22,cauchy_11 [kPa],cauchy_22 [kPa]\n")
		for _, r := range rows {
			f := strings.SplitN(r, ",", 3)
			b.WriteString(f[0] + "," + f[2] + "\n")
		}
		return b.String()
	}

	// Cycles from the turns of the stretch: the copy begins at a peak.
	_, err := readString(noCycle(paste("2")), Options{})
	pe := wantParseError(t, err, ErrProtocol, 3, 0, "keeps 2 points", "lines 119–120", block, "written twice", "delete the copy")
	if strings.Count(pe.Error(), " repeat lines") != 1 {
		t.Errorf("the block is named once: %v", pe)
	}
	// Numbered as a new cycle.
	_, err = readString(cyclicHeader+strings.Join(paste("4"), "\n")+"\n", Options{})
	wantParseError(t, err, ErrProtocol, 3, 0, "keeps 1 point (", "line 120)", block, "delete the copy")
	// Keeping the number of the cycle it was copied from.
	_, err = readString(cyclicHeader+strings.Join(paste("2"), "\n")+"\n", Options{})
	wantParseError(t, err, ErrProtocol, 120, 0, "both hold cycle 2", block, "delete the copy")

	// A pasted rise, kept as a last cycle of 9 points, is shorter than a
	// smoothing window of 11.
	rise := append(append([]string(nil), base...), base[39+5:39+13]...) // lines 120–127 repeat 47–54
	_, err = readString(noCycle(rise), Options{SmoothStrain: 11})
	wantParseError(t, err, ErrProtocol, 3, 0, "smoothing window of 11", "; lines 120–127 repeat lines 47–54", "delete the copy")

	// A short last cycle that repeats nothing is refused as before, with
	// its lines and without a repeat named.
	short := append(append([]string(nil), base...), base[39+19:39+22]...) // 3 rows, below a block
	_, err = readString(noCycle(short), Options{})
	pe = wantParseError(t, err, ErrProtocol, 3, 0, "keeps 2 points", "lines 119–120")
	if strings.Contains(pe.Error(), "repeat") {
		t.Errorf("no block, none named: %v", pe)
	}
}
