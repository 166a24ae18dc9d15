package summary

import (
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// An undecided verdict names the command that ranks the tests that would
// settle it, with the output folder quoted for a POSIX shell (in single
// quotes, an embedded single quote closed, escaped and reopened: common
// practice, POSIX shell quoting rules from memory); a verdict with fibres
// names the calibration check unless it ran; an isotropic verdict, or a
// fit without discovery, names nothing.
func TestNextStepForAnUndecidedVerdict(t *testing.T) {
	undecided := &aniso.Discovery{Verdict: aniso.Verdict{Families: "undecided"}}
	for _, c := range []struct {
		fit  Fit
		want string
	}{
		{Fit{Dir: "out/P2.weft", Discovery: undecided}, "weft plan out/P2.weft ranks"},
		{Fit{Dir: "my fits/Lee's P2.weft", Discovery: undecided}, `weft plan 'my fits/Lee'\''s P2.weft' ranks`},
		{Fit{Dir: "out/M1.weft", Discovery: &aniso.Discovery{Verdict: aniso.Verdict{Families: "0"}}}, ""},
		{Fit{Dir: "out/M1.weft"}, ""},
		// Fibres found without the calibration check: the option that
		// would test them against a per-axis error (README, the paragraph
		// on --calibration-check); none once it has run.
		{Fit{Dir: "out/M1.weft", Card: &card.Card{}, Discovery: &aniso.Discovery{Verdict: aniso.Verdict{Families: "1"}}}, "fit again with --calibration-check 0.05 to see whether these fibres survive"},
		{Fit{Dir: "out/M1.weft", Discovery: &aniso.Discovery{Verdict: aniso.Verdict{Families: "1-or-mirror-pair"}}}, "fit again with --calibration-check 0.05"},
		{Fit{Dir: "out/M1.weft", Discovery: &aniso.Discovery{Verdict: aniso.Verdict{Families: "2"}}}, "fit again with --calibration-check 0.05"},
		{Fit{Dir: "out/M1.weft", Card: &card.Card{CalibrationCheck: &card.CalibrationCheck{}}, Discovery: &aniso.Discovery{Verdict: aniso.Verdict{Families: "1"}}}, ""},
	} {
		got := nextStep(&c.fit)
		if c.want == "" && got != "" || c.want != "" && !strings.HasPrefix(got, c.want) {
			t.Errorf("%+v: next step %q, want it to start with %q", c.fit.Dir, got, c.want)
		}
	}
}

// A degenerate angle has no interval (README, *Uncertainty*: "degenerate
// … no interval, and a flag says why"), even where the unsupported
// family's profile crosses the threshold. On a synthetic isotropic
// specimen (neo-Hookean, 2 % noise, sutured) fitted with i1-lin +
// fib-expsq, the family's weight came out at 1.1e-5 kPa, felt on 2 of 30
// points, and the table printed "angle -72.232 [-108.98, -51.49] degenerate
// (profile interval)".
func TestDegenerateAngleHasNoInterval(t *testing.T) {
	nan := math.NaN()
	r := &aniso.Result{
		Estimates: []aniso.Estimate{
			{Name: "weight[i1-lin]", Kind: "weight", Value: 5.0067, Unit: "kPa", StdErr: 0.0098, Lo: 4.988, Hi: 5.026, Status: aniso.StatusEstimated},
			{Name: "angle", Kind: "angle", Value: -72.232, Unit: "deg", StdErr: nan, Lo: nan, Hi: nan, Status: aniso.StatusDegenerate},
		},
		Profiles:  []aniso.AngleProfile{{Name: "angle", LoDeg: -108.98, HiDeg: -51.49, Closed: true}},
		SignKnown: true,
	}
	var b strings.Builder
	printParameters(&b, r)
	for _, line := range strings.Split(b.String(), "\n") {
		if strings.HasPrefix(line, "angle ") && (strings.Contains(line, "[") || strings.Contains(line, "profile interval")) {
			t.Errorf("degenerate angle printed with an interval: %q", line)
		}
	}
}

// The verdict line says "undecided" once: an undecided reason starts with
// "undecided: " (aniso's verdict wording), and the line once read
// "families: undecided — undecided: the evidence points ...".
func TestVerdictLineSaysUndecidedOnce(t *testing.T) {
	for _, c := range []struct{ families, reason, want string }{
		{"undecided", "undecided: the evidence points towards 2-free", "the evidence points towards 2-free"},
		{"0", "isotropic: no richer form beats it", "isotropic: no richer form beats it"},
		{"2", "two fibre families at ±10°, ±70°: it beats 1", "two fibre families at ±10°, ±70°: it beats 1"},
	} {
		if got := verdictReason(c.families, c.reason); got != c.want {
			t.Errorf("%s: %q, want %q", c.families, got, c.want)
		}
	}
}
