package aniso

import (
	"strings"
	"testing"

	"github.com/weft-tools/weft/terms"
)

// A stress that is not finite names the term and the reason: a Gent term
// (Gent 1996) at its limiting extensibility is not an exponential overflow.
func TestNonFiniteStressNamesTheTerm(t *testing.T) {
	gent := &Model{Terms: []Term{
		{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 1},
		{Shape: terms.Lookup("i1-gent"), Family: -1, Weight: 1, Params: []float64{0.5}},
	}}
	// Equibiaxial stretch 2: I1 − 3 = 4 + 4 + 1/16 − 3 = 5.0625 > J = 0.5.
	_, err := gent.Evaluate([4]float64{2, 0, 0, 2})
	if err == nil || !strings.Contains(err.Error(), "term 2 (i1-gent) is at or beyond its limiting extensibility (argument 5.062, limit 0.5)") {
		t.Errorf("Gent beyond its limit: %v", err)
	}
	// exp(100·(I1 − 3)) with I1 − 3 = 15.01 at stretch 3 overflows a float64.
	exp := &Model{Terms: []Term{{Shape: terms.Lookup("i1-exp"), Family: -1, Weight: 1, Params: []float64{100}}}}
	_, err = exp.Evaluate([4]float64{3, 0, 0, 3})
	if err == nil || !strings.Contains(err.Error(), "term 1 (i1-exp) overflows") || strings.Contains(err.Error(), "limiting") {
		t.Errorf("exponential overflow: %v", err)
	}
}
