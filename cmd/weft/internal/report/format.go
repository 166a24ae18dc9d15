package report

import (
	"fmt"
	"math"
	"strings"
)

// Numbers as the report writes them: with a true minus sign, and a mark
// for a number that is undefined (NaN) or infinite.

// trueMinus writes the first hyphen-minus of a formatted number as the
// minus sign U+2212.
func trueMinus(s string) string { return strings.Replace(s, "-", "−", 1) }

// sigFigs formats x with n significant digits; a non-finite x is written
// undefined.
func sigFigs(x float64, n int, undefined string) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return undefined
	}
	return trueMinus(fmt.Sprintf("%.*g", n, x))
}

// fnum formats a table cell with n significant digits; undefined is a
// dash.
func fnum(x float64, n int) string { return sigFigs(x, n, "—") }

// fmtNum formats a number in a plot's text with n significant digits;
// undefined is "n/a".
func fmtNum(x float64, n int) string { return sigFigs(x, n, "n/a") }

// pct formats a share as a percentage.
func pct(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "—"
	}
	return fmt.Sprintf("%.0f %%", 100*x)
}

// fmtR2 formats an R² for a legend or cell.
func fmtR2(r float64) string {
	switch {
	case math.IsNaN(r):
		return "n/a"
	case r >= 0.9995:
		return fmt.Sprintf("%.5f", r)
	case r >= 0:
		return fmt.Sprintf("%.4f", r)
	default:
		return trueMinus(fmt.Sprintf("%.3f", r))
	}
}

// fmtDeg formats an angle in degrees.
func fmtDeg(a float64) string {
	if math.IsNaN(a) {
		return "n/a"
	}
	return trueMinus(fmt.Sprintf("%.2f°", a))
}
