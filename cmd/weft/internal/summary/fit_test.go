package summary

import (
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
)

// An undecided verdict names the command that ranks the tests that would
// settle it, with the output folder quoted for a POSIX shell (in single
// quotes, an embedded single quote closed, escaped and reopened: common
// practice, POSIX shell quoting rules from memory); a decided
// verdict, or a fit without discovery, names none.
func TestNextStepForAnUndecidedVerdict(t *testing.T) {
	undecided := &aniso.Discovery{Verdict: aniso.Verdict{Families: "undecided"}}
	for _, c := range []struct {
		fit  Fit
		want string
	}{
		{Fit{Dir: "out/P2.weft", Discovery: undecided}, "weft plan out/P2.weft ranks"},
		{Fit{Dir: "my fits/Lee's P2.weft", Discovery: undecided}, `weft plan 'my fits/Lee'\''s P2.weft' ranks`},
		{Fit{Dir: "out/M1.weft", Discovery: &aniso.Discovery{Verdict: aniso.Verdict{Families: "1"}}}, ""},
		{Fit{Dir: "out/M1.weft"}, ""},
	} {
		got := nextStep(&c.fit)
		if c.want == "" && got != "" || c.want != "" && !strings.HasPrefix(got, c.want) {
			t.Errorf("%+v: next step %q, want it to start with %q", c.fit.Dir, got, c.want)
		}
	}
}
