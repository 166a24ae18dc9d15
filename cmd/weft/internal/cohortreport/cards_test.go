package cohortreport

import (
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
)

// A discovered cohort's verdict with fibre families carries the misfit
// caution when the shared form misfits most specimens: the median of the
// fitted specimens' ratios (1, 2.5, 3; a failed one has none) is 2.5, at
// or above aniso.MisfitFlagRatio, with 2 of the 3 flagged. One at 1.9, or
// an undecided verdict, adds nothing.
func TestCohortVerdictNotesMostSpecimensMisfit(t *testing.T) {
	sps := []Specimen{{MisfitRatio: 1}, {MisfitRatio: 2.5}, {MisfitRatio: 3}, {MisfitRatio: math.NaN()}}
	for _, c := range []struct {
		families string
		top      float64
		want     string
	}{{"2", 3, "misfits 2 of the 3 specimens fitted, its residuals 2.5 times"}, {"2", 1.9, ""}, {"undecided", 3, ""}} {
		sps[2].MisfitRatio, sps[1].MisfitRatio = c.top, math.Min(c.top, 2.5)
		co := &aniso.Cohort{Discovery: &aniso.Discovery{Verdict: aniso.Verdict{Families: c.families, Reason: "two fibre families"}}}
		noteCohortMisfit(co, sps)
		got := co.Discovery.Verdict.Reason
		if c.want == "" && got != "two fibre families" || c.want != "" && !strings.Contains(got, c.want) {
			t.Errorf("verdict %s, largest ratio %g: reason %q, want %q", c.families, c.top, got, c.want)
		}
	}
}
