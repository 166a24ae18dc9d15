package biaxial

import (
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// The one-pass reading of plain decimals must give the float64 that Go's
// standard library (strconv.ParseFloat, the reference here) gives, bit for
// bit, and ParseNumber must refuse what it refused before the shortcut.
func TestParseNumberMatchesStrconv(t *testing.T) {
	cases := []string{
		"0", "-0", "+0", "0.0", "-0.0", ".5", "5.", "-.5", "+.5", "1", "-1", "1.05", "2.3e-2", "2.3E+2",
		"1.0000075", "1.5000563e-06", "19999.99", "0.00000000000000000001", "123456789012345678",
		"9007199254740991", "9007199254740992", "9007199254740993", "1e22", "1e23", "1e-22", "1e-23",
		"4.9406564584124654e-324", "1.7976931348623157e308", "1e308", "1e-400", "0e9999", "1e0000",
		"12345678901234567890", "0.1", "0.2", "0.3", "3.0000000000000004", "1e", "1e+", ".", "-", "+",
		"1.2.3", "--1", "1_000", "0x1p3", "inf", "NaN", "1e5x", " 1", "1 ", "", "١",
	}
	rng := rand.New(rand.NewPCG(7, 2026))
	for range 20000 {
		cases = append(cases, randomDecimal(rng))
	}
	for _, s := range cases {
		got, gerr := ParseNumber(s)
		var want float64
		var werr error
		if why := numberSyntax(s); why != "" {
			if gerr == nil || gerr.Error() != why {
				t.Errorf("ParseNumber(%q) = %v, %v; want the error %q", s, got, gerr, why)
			}
			continue
		}
		want, werr = strconv.ParseFloat(s, 64)
		if (gerr == nil) != (werr == nil) || math.Float64bits(got) != math.Float64bits(want) {
			t.Errorf("ParseNumber(%q) = %v (%x), %v; strconv.ParseFloat gives %v (%x), %v",
				s, got, math.Float64bits(got), gerr, want, math.Float64bits(want), werr)
		}
	}
}

// randomDecimal writes a decimal number of the kinds test files hold, with
// up to 20 digits and exponents around the edges of the exact range.
func randomDecimal(rng *rand.Rand) string {
	var b strings.Builder
	switch rng.IntN(3) {
	case 0:
		b.WriteByte('-')
	case 1:
		b.WriteByte('+')
	}
	n := 1 + rng.IntN(20)
	point := rng.IntN(n + 2)
	for i := 0; i < n; i++ {
		if i == point {
			b.WriteByte('.')
		}
		b.WriteByte(byte('0' + rng.IntN(10)))
	}
	if rng.IntN(3) == 0 {
		b.WriteString([]string{"e", "E", "e-", "e+", "E-"}[rng.IntN(5)])
		b.WriteString(strconv.Itoa(rng.IntN(60)))
	}
	return b.String()
}
