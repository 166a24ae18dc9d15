package aniso

import (
	"strings"
	"testing"

	"github.com/weft-tools/weft/terms"
)

// The verdict's answer is written from the fit the candidates were
// compared on, before the chosen model is refitted on every point. When
// the refit moves a quoted angle by more than answerMovedDeg, or a
// spread's concentration by more than answerMovedSpread, the reason says
// where the card's model has them; small moves add nothing. (Behaviour,
// not physics: the reason must not disagree with the card it is written
// in.)
func TestReasonNamesTheRefittedAngles(t *testing.T) {
	fam := func(deg, b float64) *Result {
		return &Result{Model: &Model{Families: []Family{{Angle: Rad(deg), Planar: b > 0, Concentration: b}},
			Terms: []Term{{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 1, Params: []float64{3}}}},
			Structure: Structure{Layout: LayoutSingle, Planar: b > 0}}
	}
	const reason = "one fibre direction at ±30.0°: it beats 0 decisively"
	for _, c := range []struct {
		name          string
		searched, now *Result
		want          string
	}{
		{"moved", fam(30, 0), fam(-32.5, 0), "puts its fibres at ±32.5°"},
		{"small move", fam(30, 0), fam(30.6, 0), ""},
		{"spread", fam(30, 2), fam(30.2, 3), "puts its fibres at ±30.2° (concentration 3)"},
		{"spread kept", fam(30, 2), fam(30.2, 2.2), ""},
	} {
		d := &Discovery{Verdict: Verdict{Reason: reason}}
		if c.searched.Structure.Planar {
			d.Verdict.Reason = "one fibre direction at ±30.0°, spread in the plane (concentration 2): it beats 0 decisively"
		}
		d.noteRefittedAnswer(&Candidate{Searched: c.searched, Result: c.now})
		got := strings.TrimPrefix(d.Verdict.Reason, reason)
		if c.want == "" && d.Verdict.Reason != reason && !c.searched.Structure.Planar {
			t.Errorf("%s: reason gained %q", c.name, got)
		}
		if c.want == "" && c.searched.Structure.Planar && strings.Contains(d.Verdict.Reason, "refitted") {
			t.Errorf("%s: reason %q names a refit that moved nothing far", c.name, d.Verdict.Reason)
		}
		if c.want != "" && !strings.Contains(d.Verdict.Reason, c.want) {
			t.Errorf("%s: reason %q does not say %q", c.name, d.Verdict.Reason, c.want)
		}
	}
	// Two families with known signs, listed in the other order by the
	// refit and one across ±90°: -89.8°, 30.0° against 30.2°, 89.9° moved
	// by 0.3° at most; against 30.2°, 80.0° by 10.2°.
	two := func(a, b float64) *Result {
		return &Result{Model: &Model{Families: []Family{{Angle: Rad(a)}, {Angle: Rad(b)}}}, SignKnown: true,
			Structure: Structure{Layout: LayoutFree}}
	}
	for _, c := range []struct {
		now  *Result
		note bool
	}{{two(30.2, 89.9), false}, {two(30.2, 80), true}} {
		d := &Discovery{Verdict: Verdict{Reason: "two fibre families at 30.0°, -89.8°: they beat 1 decisively"}}
		d.noteRefittedAnswer(&Candidate{Searched: two(-89.8, 30), Result: c.now})
		if got := strings.Contains(d.Verdict.Reason, "refitted on every point"); got != c.note {
			t.Errorf("two families refitted to %.1f°, %.1f°: note %v, want %v (%q)", Deg(c.now.Model.Families[0].Angle), Deg(c.now.Model.Families[1].Angle), got, c.note, d.Verdict.Reason)
		}
	}
	// A reason that quotes another model's angles is left alone.
	d := &Discovery{Verdict: Verdict{Reason: "one fibre direction at ±50.0°: it beats 0 decisively"}}
	d.noteRefittedAnswer(&Candidate{Searched: fam(30, 0), Result: fam(40, 0)})
	if strings.Contains(d.Verdict.Reason, "refitted") {
		t.Errorf("a reason quoting ±50.0° gained a note on a model at ±30.0°: %q", d.Verdict.Reason)
	}
}
