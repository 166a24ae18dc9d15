package main

import (
	"bytes"
	"strings"
	"testing"
	"time"
)

// The bar's count never moves backwards when concurrent workers report
// out of order (seen on a terminal as "58/95" followed by "57/95"); a new
// total (the next stage of the work) starts its own count.
func TestProgressCountNeverGoesBack(t *testing.T) {
	var b bytes.Buffer
	p := newProgress(&b, true, "fitting x", false)
	p.start = time.Now().Add(-2 * time.Second) // past the one-second delay
	for _, r := range [][2]int{{56, 95}, {58, 95}, {57, 95}, {59, 95}, {3, 120}} {
		p.set(r[0], r[1])
	}
	var counts []string
	for _, frame := range strings.Split(b.String(), "\r")[1:] {
		f := strings.Fields(frame)
		counts = append(counts, f[len(f)-1])
	}
	if got, want := strings.Join(counts, " "), "56/95 58/95 59/95 3/120"; got != want {
		t.Errorf("drawn counts %q, want %q", got, want)
	}
}
