package report

import (
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso/card"
)

// discoveredInput is a minimal Input of a discovered fit, enough for the
// sections built from the card alone: shear says whether the data carry
// shear information (and so whether the fit knew the angles' signs), fams
// are the chosen model's family angles, sel and vd the selection and the
// verdict (either may be nil).
func discoveredInput(shear bool, fams []float64, sel *card.SelectionSection, vd *card.VerdictSection) *Input {
	c := &card.Card{StressUnit: "kPa", Selection: sel, Verdict: vd}
	for i, a := range fams {
		a, known := a, shear
		c.Families = append(c.Families, card.Family{Name: "f" + string(rune('1'+i)), AngleDeg: &a, AngleSignKnown: &known})
	}
	return &Input{card: c, sel: sel, verdict: vd, table: &fitTable{},
		fit:  card.FitSection{AngleSignKnown: shear, StressKind: "nominal", StressUnit: "kPa"},
		data: card.DataSection{Specimen: "S", HasShear: shear, StressKind: "nominal", StressUnit: "kPa"}}
}

// nums converts float64s to card numbers.
func nums(xs ...float64) []card.Num {
	out := make([]card.Num, len(xs))
	for i, x := range xs {
		out[i] = card.Num(x)
	}
	return out
}

// The sign of a fibre angle is known only from shear information, a
// property of the data (data.has_shear, fit.angle_sign_known), not of the
// chosen model: with an isotropic pick on data without shear, the table
// of fibre layouts still writes every candidate's angles as ±|α|
// (cmd/weft/testdata/orthogonal-fibres-load-controlled.csv gave
// "83.94°, −5.03°"); with shear information the signs stay. A pair whose
// fitted angles lie within 2° is marked as one direction with or without
// shear information, the rule discovery itself applies to the fitted
// angles (demo patch-P2's mirror-t5-p11 at ±0.00°, ±0.00°).
func TestLayoutAnglesSignFromTheData(t *testing.T) {
	mirror := card.CandidateCard{Name: "mirror-t2-p5", AnglesDeg: nums(83.94, -5.03)}
	same := card.CandidateCard{Name: "mirror-t5-p11", AnglesDeg: nums(0, 0)}
	for _, tc := range []struct {
		shear     bool
		fams      []float64
		c         card.CandidateCard
		want, not string
	}{
		{false, nil, mirror, "±83.94°, ±5.03°", "−"},
		{false, []float64{30}, mirror, "±83.94°, ±5.03°", "−"},
		{true, nil, mirror, "83.94°, −5.03°", "±"},
		{false, nil, same, "±0.00°, ±0.00° (coincident: one direction)", "−"},
		{false, []float64{0}, same, "±0.00°, ±0.00° (coincident: one direction)", "−"},
		{true, []float64{1}, same, "0.00°, 0.00° (coincident: one direction)", "±"},
	} {
		in := discoveredInput(tc.shear, tc.fams, nil, nil)
		got := in.anglesOf(tc.c)
		if got != tc.want || strings.Contains(got, tc.not) {
			t.Errorf("shear %v, chosen families %v, %s: %q, want %q", tc.shear, tc.fams, tc.c.Name, got, tc.want)
		}
	}
}
