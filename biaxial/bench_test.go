package biaxial

import (
	"math"
	"strconv"
	"strings"
	"testing"
)

// synth100k builds a synthetic 100 000-row file: 5 protocols, each with 10
// cycles of loads, stretches, cycle and time columns.
func synth100k() string {
	var b strings.Builder
	b.WriteString("# specimen = SYN-bench (synthetic)\n# thickness = 0.4 mm\n# size_1 = 10 mm\n# size_2 = 10 mm\n")
	b.WriteString("protocol,cycle,time [s],stretch_1,stretch_2,load_1 [N],load_2 [N]\n")
	labels := []string{"1:1", "1:0.75", "0.75:1", "1:0.5", "0.5:1"}
	ratios := [][2]float64{{1, 1}, {1, 0.75}, {0.75, 1}, {1, 0.5}, {0.5, 1}}
	const perProto, perCycle = 20000, 2000
	buf := make([]byte, 0, 64)
	for k, l := range labels {
		for i := 0; i < perProto; i++ {
			ph := float64(i%perCycle) / perCycle
			up := 1 - math.Abs(2*ph-1) // 0 → 1 → 0
			l1 := 1 + 0.15*ratios[k][0]*up
			l2 := 1 + 0.15*ratios[k][1]*up
			b.WriteString(l)
			for _, v := range []float64{float64(i/perCycle + 1), 0.01 * float64(i), l1, l2, 0.02 * (math.Exp(10*(l1-1)) - 1), 0.02 * (math.Exp(10*(l2-1)) - 1)} {
				b.WriteByte(',')
				buf = strconv.AppendFloat(buf[:0], v, 'g', 10, 64)
				b.Write(buf)
			}
			b.WriteByte('\n')
		}
	}
	return b.String()
}

// BenchmarkParse100k reads and prepares a 100 000-row file (default
// options). Target: ≤ 0.5 s per operation on a laptop core.
func BenchmarkParse100k(b *testing.B) {
	data := synth100k()
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	for b.Loop() {
		s, err := Read(strings.NewReader(data), "bench.csv", Options{})
		if err != nil {
			b.Fatal(err)
		}
		if len(s.Protocols) != 5 {
			b.Fatalf("%d protocols", len(s.Protocols))
		}
	}
}
