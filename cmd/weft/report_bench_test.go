package main

import (
	"path/filepath"
	"testing"
)

// BenchmarkReport rebuilds the report of the 5-protocol synthetic demo
// specimen membrane-M1 from its output folder, as 'weft report DIR
// --force' does: every plot as SVG, the admissibility checks on two grids
// and report.html ("svg"), and the same with a PNG of every plot
// ("svg+png", 'weft report --png'). Target: ≤ 0.3 s for the report weft
// fit writes (SVG only), the share of the report in a whole fit of a small
// specimen.
func BenchmarkReport(b *testing.B) {
	dir := filepath.Join(b.TempDir(), "m1.weft")
	if _, stderr, code := runWeft(b, "fit", filepath.Join("..", "..", "testdata", "demo", "membrane-M1.csv"), "-o", dir, "--quiet"); code != 0 {
		b.Fatalf("weft fit: exit %d: %s", code, stderr)
	}
	for _, c := range []struct {
		name  string
		extra []string
	}{{"svg", nil}, {"svg+png", []string{"--png"}}} {
		b.Run(c.name, func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				args := append([]string{"report", dir, "--force"}, c.extra...)
				if _, stderr, code := runWeft(b, args...); code != 0 {
					b.Fatalf("weft report: exit %d: %s", code, stderr)
				}
			}
		})
	}
}
