package report

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Numbers as the report writes them: with a true minus sign, a fixed
// number of significant digits (trailing zeros kept, so that 0.250 stands
// beside 0.731), and a mark for a number that is undefined (NaN) or
// infinite.

// trueMinus writes the first hyphen-minus of a formatted number as the
// minus sign U+2212.
func trueMinus(s string) string { return strings.Replace(s, "-", "−", 1) }

// fsig formats x with n significant digits, keeping trailing zeros:
// positionally for 10⁻³ ≤ |x| < 10⁶, otherwise as a mantissa and a power
// of ten ("1.23e−5"); undefined is a dash.
func fsig(x float64, n int) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "—"
	}
	if x == 0 {
		return "0"
	}
	ax := math.Abs(x)
	if ax >= 1e-3 && ax < 1e6 {
		e := int(math.Floor(math.Log10(ax)))
		// Rounding can carry into the next decade (9.996 → 10.0).
		if r, _ := strconv.ParseFloat(strconv.FormatFloat(ax, 'g', n, 64), 64); r >= math.Pow(10, float64(e+1)) {
			e++
		}
		return trueMinus(strconv.FormatFloat(x, 'f', max(0, n-1-e), 64))
	}
	s := strconv.FormatFloat(x, 'e', n-1, 64)
	mant, exp, _ := strings.Cut(s, "e")
	ev, _ := strconv.Atoi(exp)
	return trueMinus(mant) + "e" + trueMinus(strconv.Itoa(ev))
}

// fixed formats x with d decimals; undefined is a dash.
func fixed(x float64, d int) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "—"
	}
	s := strconv.FormatFloat(x, 'f', d, 64)
	if v, _ := strconv.ParseFloat(s, 64); v == 0 {
		s = strings.TrimPrefix(s, "-") // no "−0.0"
	}
	return trueMinus(s)
}

// fmtNum formats a number in a plot's text with n significant digits;
// undefined is "n/a".
func fmtNum(x float64, n int) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "n/a"
	}
	return fsig(x, n)
}

// pct formats a share as a whole percentage.
func pct(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "—"
	}
	return fmt.Sprintf("%.0f %%", 100*x)
}

// fmtR2 formats an R² with four decimals; one that would round to 1
// without being 1 reads "> 0.9999".
func fmtR2(r float64) string {
	switch {
	case math.IsNaN(r) || math.IsInf(r, 0):
		return "—"
	case r >= 0.99995 && r < 1:
		return "> 0.9999"
	}
	return trueMinus(fmt.Sprintf("%.4f", r))
}

// fmtDeg formats an angle in degrees with two fixed decimals: an angle
// that rounds to zero is "0.00°", neither a power of ten nor "−0.00°".
func fmtDeg(a float64) string {
	if math.IsNaN(a) {
		return "n/a"
	}
	return fixed(a, 2) + "°"
}
