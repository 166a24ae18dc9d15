package main

import (
	"path/filepath"
	"testing"
)

// BenchmarkReport rebuilds the report (every plot as SVG and PNG, and
// report.html) of the 5-protocol synthetic demo specimen membrane-M1 from
// its output folder, as 'weft report DIR --force' does. Target: ≤ 1 s.
func BenchmarkReport(b *testing.B) {
	dir := filepath.Join(b.TempDir(), "m1.weft")
	if _, stderr, code := runWeft(b, "fit", filepath.Join("..", "..", "testdata", "demo", "membrane-M1.csv"), "-o", dir, "--quiet"); code != 0 {
		b.Fatalf("weft fit: exit %d: %s", code, stderr)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, stderr, code := runWeft(b, "report", dir, "--force"); code != 0 {
			b.Fatalf("weft report: exit %d: %s", code, stderr)
		}
	}
}
