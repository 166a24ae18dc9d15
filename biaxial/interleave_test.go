package biaxial

import (
	"errors"
	"fmt"
	"strings"
	"testing"
)

// ratioRows writes n rows of a stretch-controlled protocol under label,
// stretch_1 − 1 : stretch_2 − 1 = r1 : r2 up to a strain of 0.2 on the
// leading axis, with made-up stresses (synthetic data).
func ratioRows(label string, r1, r2 float64, n int) []string {
	var out []string
	for i := range n {
		t := float64(i) / float64(n-1)
		out = append(out, fmt.Sprintf("%s,%.6f,%.6f,%.4f,%.4f", label, 1+0.2*t*r1, 1+0.2*t*r2, 80*t*r1, 80*t*r2))
	}
	return out
}

// inTurn writes the rows of the given protocols in turn, k rows of each.
func inTurn(k int, protocols ...[]string) string {
	var b strings.Builder
	for i := 0; i < len(protocols[0]); i += k {
		for _, p := range protocols {
			for _, r := range p[i:min(i+k, len(p))] {
				b.WriteString(r + "\n")
			}
		}
	}
	return b.String()
}

// Two protocols under one label are refused (README, Input files:
// "A label reused for another protocol ... is refused"), whether the file
// lists them in blocks or writes their rows in turn, which it may, since
// the rows of one protocol need not be contiguous. Written in turn, 1:1
// and 1:0.5 under one label made a single cycle, 1:1's direction at its
// peak, and until 2026-12-05 were fitted as one protocol (59 of 60 rows
// kept, no warning). A single path that turns its direction gradually,
// and a single stray row, are not refused. Synthetic data.
func TestTwoProtocolsInTurnUnderOneLabelRefused(t *testing.T) {
	a := ratioRows("A", 1, 1, 30)
	b := ratioRows("A", 1, 0.5, 30)
	c := ratioRows("A", 0.75, 1, 30)
	for _, tc := range []struct{ name, rows string }{
		{"blocks", inTurn(30, a, b)},
		{"row by row", inTurn(1, a, b)},
		{"two rows at a time", inTurn(2, a, b)},
		{"three protocols row by row", inTurn(1, a, b, c)},
	} {
		_, err := readString(goodHeader+tc.rows, Options{})
		var pe *ParseError
		if !errors.As(err, &pe) || !errors.Is(err, ErrProtocol) || !strings.Contains(err.Error(), "two protocols under one label") {
			t.Errorf("%s: error %v; want the label refused as two protocols", tc.name, err)
		}
	}

	// Each protocol under its own label, written in turn: accepted, three
	// protocols of 30 points each.
	s, err := readString(goodHeader+inTurn(1, ratioRows("1:1", 1, 1, 30), ratioRows("1:0.5", 1, 0.5, 30), ratioRows("0.75:1", 0.75, 1, 30)), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Protocols) != 3 || s.NumPoints() != 90 {
		t.Errorf("%d protocols, %d points; want 3 and 90", len(s.Protocols), s.NumPoints())
	}

	// One path whose direction turns from 1 : 0.2 to 1 : 1 (as under load
	// control, where the stiffer axis lags), and a stable path with one
	// stray row at its middle: one protocol each.
	var curved, stray strings.Builder
	for i := range 30 {
		t := float64(i) / 29
		fmt.Fprintf(&curved, "L,%.6f,%.6f,%.4f,%.4f\n", 1+0.2*t, 1+0.2*t*t, 80*t, 80*t)
		s2 := 1 + 0.1*t
		if i == 15 {
			s2 = 1 + 0.05*t
		}
		fmt.Fprintf(&stray, "S,%.6f,%.6f,%.4f,%.4f\n", 1+0.2*t, s2, 80*t, 40*t)
	}
	for _, in := range []string{curved.String(), stray.String()} {
		s, err := readString(goodHeader+in, Options{})
		if err != nil {
			t.Errorf("one protocol refused: %v", err)
			continue
		}
		if n := s.NumPoints(); n != 30 {
			t.Errorf("%d points kept, want 30", n)
		}
	}
}
