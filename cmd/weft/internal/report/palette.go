package report

import (
	"image/color"
)

// The report's colours all come from the colour-blind-safe palette of
// Okabe & Ito 2008 ("Color Universal Design (CUD): how to make figures and
// presentations that are friendly to colorblind people"), and tints of it
// mixed with white. weft assigns them as follows:
//
//   - stress components: axis 1 blue, axis 2 vermillion, shear 12 bluish
//     green, shear 21 reddish purple; each also has its own marker shape,
//     so the plots read in grey print too; the held-out prediction is
//     dashed in a darker shade of the component's colour and the 95 % band
//     a translucent tint of it;
//   - the models of the presets figure: the discovered model black, the
//     presets sky blue (neo-Hookean), orange (hgo), reddish purple (goh)
//     and bluish green (fung, and fung-general dash-dotted), each with its
//     own dash pattern;
//   - the load-sharing figure: the matrix grey, the first fibre family
//     blue, the second vermillion, axis 1 solid and axis 2 dashed;
//   - model forms in the selection plot: no fibres black, one family blue,
//     a mirror pair bluish green, two free families vermillion.
var (
	okabeBlack         = color.NRGBA{0x00, 0x00, 0x00, 0xff}
	okabeOrange        = color.NRGBA{0xe6, 0x9f, 0x00, 0xff}
	okabeSkyBlue       = color.NRGBA{0x56, 0xb4, 0xe9, 0xff}
	okabeBluishGreen   = color.NRGBA{0x00, 0x9e, 0x73, 0xff}
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

// colorNRGBA names the colour type the report's palette uses.
type colorNRGBA = color.NRGBA
