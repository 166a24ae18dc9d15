package aniso

import "math"

// Angles are read and written in degrees and kept in radians inside (see
// the package documentation). Deg and Rad are the one place in this package
// and those that import it that converts (package biaxial, below it,
// converts its one angle itself); they multiply before they divide, so
// every conversion rounds alike. The wrappers below are the one place that
// reduces an angle to its period.

// Deg converts an angle in radians to degrees.
func Deg(rad float64) float64 { return rad * 180 / math.Pi }

// Rad converts an angle in degrees to radians.
func Rad(deg float64) float64 { return deg * math.Pi / 180 }

// wrapHalfPeriod maps a into (−period/2, period/2]; a fibre has no sign,
// so its angle is defined modulo half a turn (period 180° or π).
func wrapHalfPeriod(a, period float64) float64 {
	a = math.Mod(a, period)
	if a > period/2 {
		a -= period
	} else if a <= -period/2 {
		a += period
	}
	return a
}

// WrapDeg maps an angle in degrees into (−90, 90], where weft reports fibre
// angles (a fibre has no sign, so angles are modulo 180°).
func WrapDeg(a float64) float64 {
	return wrapHalfPeriod(a, 180)
}

// wrapAngle maps an angle in radians into (−π/2, π/2].
func wrapAngle(a float64) float64 {
	return wrapHalfPeriod(a, math.Pi)
}

// wrapPi maps an angle to (−π, π].
func wrapPi(a float64) float64 {
	return wrapHalfPeriod(a, 2*math.Pi)
}
