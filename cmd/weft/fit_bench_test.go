package main

import (
	"path/filepath"
	"testing"
)

// BenchmarkFitDemo runs the whole 'weft fit' of the three synthetic demo
// specimens in process (discovery, card, folder and report), one after
// the other: with -cpuprofile, where a whole fit's time goes, in process
// (DEVELOPERS.md, Speed log, Whole fit of the demo specimen membrane-M1).
func BenchmarkFitDemo(b *testing.B) {
	out := b.TempDir()
	for i := 0; i < b.N; i++ {
		for _, name := range []string{"membrane-M1", "membrane-M3-sutured", "patch-P2"} {
			in := filepath.Join("..", "..", "testdata", "demo", name+".csv")
			if _, stderr, code := runWeft(b, "fit", in, "-o", filepath.Join(out, name), "--quiet", "--force"); code != 0 {
				b.Fatalf("weft fit %s: exit %d: %s", name, code, stderr)
			}
		}
	}
}
