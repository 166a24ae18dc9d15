package biaxial

import (
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"
)

// growingFile writes a synthetic stretch-column file of one protocol, 1:1,
// five preconditioning cycles of growing amplitude (peak strains 0.03 to
// 0.15) of n rows a branch, each stretch with Gaussian scatter of sd.
func growingFile(seed uint64, sd float64, n int) string {
	rng := rand.New(rand.NewPCG(seed, 7))
	var b strings.Builder
	b.WriteString("# specimen = SYN-growing (synthetic)\n# stress_unit = kPa\nprotocol,stretch_1,stretch_2,nominal_11,nominal_22\n")
	for c := 1; c <= 5; c++ {
		a := 0.03 * float64(c)
		for i := 0; i <= 2*n; i++ {
			if c > 1 && i == 0 {
				continue
			}
			e := a * float64(n-abs(i-n)) / float64(n)
			fmt.Fprintf(&b, "1:1,%.6f,%.6f,%.5g,%.5g\n", 1+e+sd*rng.NormFloat64(), 1+e+sd*rng.NormFloat64(), 100*e+400*e*e, 100*e+400*e*e)
		}
	}
	return b.String()
}

func abs(i int) int {
	if i < 0 {
		return -i
	}
	return i
}

// One protocol whose stretches scatter (synthetic: 1:1, five cycles of
// growing amplitude, 20 or 200 rows a branch, scatter 0.006 or 0.01 in
// each stretch) was refused as two protocols written in turn: above half
// the largest stretch, |F − I| ≈ 0.1, a scatter of 0.01 turns the
// direction of F − I from row to row by several degrees, and the fixed 5°
// of the check for rows going back and forth was crossed often enough (3
// of these 20 files refused, all at 0.01 and 20 rows a branch). Rows of
// protocols in turn alternate, so their scatter read from neighbouring
// rows exceeds that read from rows two to four apart; the rows of one
// protocol scatter alike at every lag, and are no longer refused. Two
// protocols written in turn are still refused
// (TestTwoProtocolsInTurnUnderOneLabelRefused, and with scatter
// TestNoisyProtocolsInTurnStillRefused).
func TestNoisyProtocolIsNotTwoInTurn(t *testing.T) {
	for _, sd := range []float64{0.006, 0.01} {
		for _, n := range []int{20, 200} {
			for seed := uint64(1); seed <= 5; seed++ {
				_, err := Read(strings.NewReader(growingFile(seed, sd, n)), "growing.csv", Options{})
				if err != nil {
					t.Errorf("scatter %g, %d rows a branch, seed %d: %v", sd, n, seed, err)
				}
			}
		}
	}
}

// Two protocols written row by row under one label are still refused
// when every entry of F scatters (synthetic: 1:1 and 1:0.5 of
// noisyFile, a ramp of 61 rows each, scatter 0.001 to 0.003): their
// alternation makes the scatter of neighbouring rows larger than that of
// rows two apart.
func TestNoisyProtocolsInTurnStillRefused(t *testing.T) {
	for _, sd := range []float64{0.001, 0.002, 0.003} {
		for seed := uint64(1); seed <= 3; seed++ {
			lines := strings.Split(strings.TrimSpace(noisyFile(seed, sd, 1, 60, false)), "\n")
			var a, b []string
			for _, l := range lines {
				switch {
				case strings.HasPrefix(l, "1:1,"):
					a = append(a, l)
				case strings.HasPrefix(l, "1:0.5,"):
					b = append(b, "1:1,"+strings.TrimPrefix(l, "1:0.5,"))
				}
			}
			var in strings.Builder
			in.WriteString(lines[0] + "\n" + lines[1] + "\n" + lines[2] + "\n")
			for i := range a {
				in.WriteString(a[i] + "\n" + b[i] + "\n")
			}
			_, err := Read(strings.NewReader(in.String()), "inturn.csv", Options{})
			if err == nil || !strings.Contains(err.Error(), "two protocols under one label") {
				t.Errorf("scatter %g, seed %d: error %v, want the label refused as two protocols", sd, seed, err)
			}
		}
	}
}

// blocksFile writes a synthetic gradient file with 1:1 and then 1:0.75
// under one label "1:1", three cycles each of n rows a branch to a strain
// of 0.15 on the leading axis, every entry of F with Gaussian scatter of
// sd; with column the rows carry cycle numbers 1 to 6.
func blocksFile(seed uint64, sd float64, n int, column bool) string {
	rng := rand.New(rand.NewPCG(seed, 13))
	var b strings.Builder
	b.WriteString("# specimen = SYN-blocks (synthetic)\n# stress_unit = kPa\nprotocol,")
	if column {
		b.WriteString("cycle,")
	}
	b.WriteString("F11,F12,F21,F22,nominal_11,nominal_22\n")
	for c := 1; c <= 6; c++ {
		r2 := 1.0
		if c > 3 {
			r2 = 0.75
		}
		for i := 0; i <= 2*n; i++ {
			e := 0.15 * float64(n-abs(i-n)) / float64(n)
			b.WriteString("1:1,")
			if column {
				fmt.Fprintf(&b, "%d,", c)
			}
			fmt.Fprintf(&b, "%.6f,%.6f,%.6f,%.6f,%.5g,%.5g\n", 1+e+sd*rng.NormFloat64(), sd*rng.NormFloat64(), sd*rng.NormFloat64(), 1+r2*e+sd*rng.NormFloat64(), 100*e, 100*r2*e)
		}
	}
	return b.String()
}

// 1:1 and then 1:0.75 (8° apart) under one label, in blocks, with a
// scatter of 0.004 in each entry of F (synthetic, 200 rows a branch):
// compared at their peaks alone, whose directions that scatter turns by
// a standard deviation of about 3°, the two passed as one protocol (4 SD
// is 12°) and the 1:1 rows were dropped without a word (seeds 1 and 3,
// with and without a cycle column: 4 of these 6 files). The mean direction of each cycle's
// rows above half the largest stretch scatters √n times less: refused.
// One protocol with that scatter is still read (TestNoisyStretchesKeepTheirCycles,
// TestNoisyProtocolIsNotTwoInTurn).
func TestNoisyProtocolsInBlocksRefused(t *testing.T) {
	for seed := uint64(1); seed <= 3; seed++ {
		for _, column := range []bool{false, true} {
			_, err := Read(strings.NewReader(blocksFile(seed, 0.004, 200, column)), "blocks.csv", Options{})
			if err == nil || !strings.Contains(err.Error(), "two protocols under one label") {
				t.Errorf("seed %d, cycle column %v: error %v, want the label refused as two protocols", seed, column, err)
			}
		}
	}
}
