package biaxial

import (
	"strings"
	"testing"
)

// Weigh gives a specimen assembled in code the weights Prepare gives the
// same points read from a file: each protocol and measured axis counts
// equally, 1/(range·√n) (common practice for multi-protocol biaxial fits,
// e.g. Sacks 2000), here against the weights of the read file.
func TestWeighMatchesPrepare(t *testing.T) {
	csv := "# specimen = w\n# notes = synthetic\nprotocol,stretch_1,stretch_2,nominal_11,nominal_22\n" +
		"a,1.00,1.00,0,0\na,1.05,1.02,3,1\na,1.10,1.04,7,2\na,1.15,1.06,12,2.5\na,1.20,1.08,18,4\n" +
		"b,1.00,1.00,0,0\nb,1.02,1.05,1,2\nb,1.04,1.10,1.5,5\nb,1.06,1.15,2,9\nb,1.08,1.20,2.2,14\n"
	s, err := Read(strings.NewReader(csv), "w.csv", Options{ProtocolWeights: map[string]float64{"b": 2}})
	if err != nil {
		t.Fatal(err)
	}
	c := &Specimen{Name: s.Name, StressUnit: s.StressUnit, Kind: s.Kind, Measured: s.Measured}
	for _, pr := range s.Protocols {
		c.Protocols = append(c.Protocols, Protocol{Label: pr.Label, Points: pr.Points, UserWeight: pr.UserWeight})
	}
	c.Weigh()
	for i, pr := range s.Protocols {
		if c.Protocols[i].Weight != pr.Weight {
			t.Errorf("protocol %s: Weigh gives %v, Prepare %v", pr.Label, c.Protocols[i].Weight, pr.Weight)
		}
	}
	// Protocol a: ranges 18 and 4 over 5 points, so 1/(18·√5) on axis 1.
	if w, want := c.Protocols[0].Weight[C11], 1/(18*2.2360679774997896); w != want {
		t.Errorf("weight of a/11 = %g, want 1/(range·√n) = %g", w, want)
	}
}
