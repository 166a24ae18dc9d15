package aniso

import "math"

// Angles are read and written in degrees and kept in radians inside (see
// the package documentation). Deg and Rad are the one place that converts;
// they multiply before they divide, so every conversion rounds alike.

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
