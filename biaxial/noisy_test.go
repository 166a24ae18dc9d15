package biaxial

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// noisyFile writes a synthetic gradient file (Cauchy stress, kPa) of the
// protocols 1:1, 1:0.5 and 0.5:1, each cycles loading and unloading
// cycles of n rows a branch to a strain of 0.15, every entry of F with
// Gaussian scatter of sd (the tracking noise of markers); with column
// the rows carry their cycle number.
func noisyFile(seed uint64, sd float64, cycles, n int, column bool) string {
	rng := rand.New(rand.NewPCG(seed, 3))
	var b strings.Builder
	b.WriteString("# specimen = SYN-noisy (synthetic)\n# stress_unit = kPa\nprotocol,")
	if column {
		b.WriteString("cycle,")
	}
	b.WriteString("F11,F12,F21,F22,cauchy_11,cauchy_22\n")
	for _, p := range []struct {
		label  string
		r1, r2 float64
	}{{"1:1", 1, 1}, {"1:0.5", 1, 0.5}, {"0.5:1", 0.5, 1}} {
		for c := 1; c <= cycles; c++ {
			for i := 0; i <= 2*n; i++ {
				e := 0.15 * (1 - math.Abs(float64(i-n))/float64(n))
				if cycles == 1 && i > n {
					break // a single loading ramp
				}
				F := [4]float64{1 + p.r1*e + sd*rng.NormFloat64(), sd * rng.NormFloat64(), sd * rng.NormFloat64(), 1 + p.r2*e + sd*rng.NormFloat64()}
				b.WriteString(p.label + ",")
				if column {
					fmt.Fprintf(&b, "%d,", c)
				}
				fmt.Fprintf(&b, "%.6f,%.6f,%.6f,%.6f,%.5g,%.5g\n", F[0], F[1], F[2], F[3], 20*(math.Exp(5*(F[0]*F[0]-1))-1), 15*(math.Exp(5*(F[3]*F[3]-1))-1))
			}
		}
	}
	return b.String()
}

// Stretches from tracked markers scatter from row to row. A monotonic ramp
// of 60 rows to a strain of 0.15 with a scatter of 0.004 in each entry of
// F (synthetic) was cut into up to five "cycles" of which the last (6 rows
// of 60) was kept, and with a cycle column 4 of 5 such files were refused
// as two protocols under one label. The turns and the directions of
// stretch are now judged against the scatter estimated from the rows'
// third differences (as the strain scatter is, leaving out the windows a
// turn passes through): every such file keeps one cycle and all its 61
// rows, the rows past the noisy maximum included (they had gone to the
// unloading branch, up to 8 of them), three real cycles in a noisy file
// without a cycle column are still three, three coarse cycles of four
// rows a branch without scatter are still three, and two protocols in
// blocks under one label are still refused.
func TestNoisyStretchesKeepTheirCycles(t *testing.T) {
	for _, sd := range []float64{0.002, 0.004, 0.006, 0.01} {
		for seed := uint64(1); seed <= 5; seed++ {
			for _, column := range []bool{false, true} {
				s, err := Read(strings.NewReader(noisyFile(seed, sd, 1, 60, column)), "noisy.csv", Options{})
				if err != nil {
					t.Errorf("scatter %g, seed %d, cycle column %v: %v", sd, seed, column, err)
					continue
				}
				for _, pr := range s.Protocols {
					if pr.Cycles != 1 || len(pr.Points) != 61 {
						t.Errorf("scatter %g, seed %d, cycle column %v, %s: %d cycles, %d of 61 rows kept (%s)", sd, seed, column, pr.Label, pr.Cycles, len(pr.Points), pr.Kept)
					}
				}
			}
		}
	}
	for seed := uint64(1); seed <= 5; seed++ {
		s, err := Read(strings.NewReader(noisyFile(seed, 0.004, 3, 40, false)), "cycles.csv", Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, pr := range s.Protocols {
			if pr.Cycles != 3 {
				t.Errorf("seed %d, %s: %d cycles found, want the 3 the file has", seed, pr.Label, pr.Cycles)
			}
		}
	}
	// Few rows a branch and no scatter: the turns are not scatter (a
	// triangle of four rows up and four down, three cycles, all kept).
	rec := synthRecord("1:1", 3, 4, 1.0, 1.2, 0.5)
	rec.HasCycle = false
	if s, err := Prepare(rec, Options{Cycle: CycleAll}); err != nil || s.Protocols[0].Cycles != 3 {
		t.Errorf("three coarse cycles without scatter: %v", err)
	}
	// 1:1 and then 1:0.5 under one label, in blocks, one cycle number.
	one := strings.ReplaceAll(noisyFile(1, 0.003, 1, 60, true), "1:0.5,", "1:1,")
	if _, err := Read(strings.NewReader(one), "mixed.csv", Options{}); err == nil || !strings.Contains(err.Error(), "two protocols under one label") {
		t.Errorf("two protocols in blocks under one label, scatter 0.003: error %v, want them refused", err)
	}
}
