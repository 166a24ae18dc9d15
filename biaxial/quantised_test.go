package biaxial

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// roundedFile writes a synthetic stretch-column file of one protocol, 1:1,
// three cycles of n rows a branch to a strain of 0.15, each stretch with
// Gaussian scatter of sd and then written with two decimals (as a tester
// export with a coarse format would); with column the rows carry their
// cycle number.
func roundedFile(seed uint64, sd float64, n int, column bool) string {
	rng := rand.New(rand.NewPCG(seed, 11))
	var b strings.Builder
	b.WriteString("# specimen = SYN-rounded (synthetic)\n# stress_unit = kPa\nprotocol,")
	if column {
		b.WriteString("cycle,")
	}
	b.WriteString("stretch_1,stretch_2,nominal_11,nominal_22\n")
	for c := 1; c <= 3; c++ {
		for i := 0; i <= 2*n; i++ {
			if c > 1 && i == 0 {
				continue
			}
			e := 0.15 * (1 - math.Abs(float64(i-n))/float64(n))
			b.WriteString("1:1,")
			if column {
				fmt.Fprintf(&b, "%d,", c)
			}
			fmt.Fprintf(&b, "%.2f,%.2f,%.5g,%.5g\n", 1+e+sd*rng.NormFloat64(), 1+e+sd*rng.NormFloat64(), 100*e+400*e*e, 100*e+400*e*e)
		}
	}
	return b.String()
}

// Stretches written with two decimals on a ramp of 200 rows a branch
// (synthetic: three cycles to a strain of 0.15, scatter 0.001 or 0.004
// before rounding) move by a last digit every dozen rows, so most third
// differences are zero and the scatter read about 0; the flips between
// two last digits were then turns (scatter 0.004, no cycle column: 175
// to 182 "cycles", each file refused for the last one's 2 points), and
// the direction at the top of a flip was compared with the peak's and
// the file refused as two protocols (every file at scatter 0.001, with
// and without a cycle column): 9 of these 12 files were refused.
// The scatter is now at least that of rounding to the last digit, q/√12
// (Sheppard 1898: rounding to a step q adds a variance q²/12): three
// cycles, every file read.
func TestRoundedStretchesKeepTheirCycles(t *testing.T) {
	for _, sd := range []float64{0.001, 0.004} {
		for seed := uint64(1); seed <= 3; seed++ {
			for _, column := range []bool{false, true} {
				s, err := Read(strings.NewReader(roundedFile(seed, sd, 200, column)), "rounded.csv", Options{})
				if err != nil {
					t.Errorf("scatter %g, seed %d, cycle column %v: %v", sd, seed, column, err)
					continue
				}
				if c := s.Protocols[0].Cycles; c != 3 {
					t.Errorf("scatter %g, seed %d, cycle column %v: %d cycles, want 3", sd, seed, column, c)
				}
			}
		}
	}
}
