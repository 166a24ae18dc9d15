package report

import (
	"image/color"
)

// The report's colours all come from the colour-blind-safe palette of
// Okabe & Ito 2008 ("Color Universal Design (CUD): how to make figures and
// presentations that are friendly to colorblind people"), and tints of it
// mixed with white. weft assigns them as follows:
//
//   - stress components in the fit and residual plots: axis 1 blue, axis 2
//     vermillion, shear 12 bluish green, shear 21 reddish purple; each also
//     has its own marker shape, so the plots read in grey print too; the
//     held-out prediction is dashed in a darker shade of the component's
//     colour, so that it stays visible where it follows the fitted curve;
//   - the stress split: the matrix terms in greys (tints of black), the
//     first fibre family in blues (blue, sky blue and their tints), the
//     second in warm colours (vermillion, orange, yellow and tints);
//   - model forms in the Pareto plot: no fibres black, one family blue, a
//     mirror pair bluish green, two free families vermillion, presets
//     reddish purple;
//   - the cross-validation heat map: white to blue.
var (
	okabeBlack         = color.NRGBA{0x00, 0x00, 0x00, 0xff}
	okabeOrange        = color.NRGBA{0xe6, 0x9f, 0x00, 0xff}
	okabeSkyBlue       = color.NRGBA{0x56, 0xb4, 0xe9, 0xff}
	okabeBluishGreen   = color.NRGBA{0x00, 0x9e, 0x73, 0xff}
	okabeYellow        = color.NRGBA{0xf0, 0xe4, 0x42, 0xff}
	okabeBlue          = color.NRGBA{0x00, 0x72, 0xb2, 0xff}
	okabeVermillion    = color.NRGBA{0xd5, 0x5e, 0x00, 0xff}
	okabeReddishPurple = color.NRGBA{0xcc, 0x79, 0xa7, 0xff}
)

// tint mixes c with white: f = 1 keeps c, f = 0 gives white.
func tint(c color.NRGBA, f float64) color.NRGBA {
	mix := func(v uint8) uint8 { return uint8(float64(v)*f + 255*(1-f) + 0.5) }
	return color.NRGBA{mix(c.R), mix(c.G), mix(c.B), 0xff}
}

// componentColor is the colour of a stress component in the fit plots.
func componentColor(comp string) color.NRGBA {
	switch comp {
	case "11":
		return okabeBlue
	case "22":
		return okabeVermillion
	case "12":
		return okabeBluishGreen
	default:
		return okabeReddishPurple
	}
}

// groupColors lists the colours of a split group's terms in order; the
// first is the group's own colour (its bar in the share chart).
func groupColors(group string) []color.NRGBA {
	switch group {
	case "matrix":
		return []color.NRGBA{tint(okabeBlack, 0.55), tint(okabeBlack, 0.3), tint(okabeBlack, 0.75), tint(okabeBlack, 0.15)}
	case "f1":
		return []color.NRGBA{okabeBlue, okabeSkyBlue, tint(okabeBlue, 0.5), tint(okabeSkyBlue, 0.45)}
	default:
		return []color.NRGBA{okabeVermillion, okabeOrange, okabeYellow, tint(okabeVermillion, 0.5)}
	}
}

// layoutColor is the colour of a model form's fibre layout in the Pareto
// plot.
func layoutColor(layout string) color.NRGBA {
	switch layout {
	case "none":
		return okabeBlack
	case "single":
		return okabeBlue
	case "mirror":
		return okabeBluishGreen
	default:
		return okabeVermillion
	}
}

// heatColor maps t ∈ [0, 1] to white … Okabe–Ito blue.
func heatColor(t float64) color.NRGBA {
	t = max(0, min(1, t))
	return tint(okabeBlue, 0.08+0.92*t)
}
