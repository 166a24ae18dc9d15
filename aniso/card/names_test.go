package card

import (
	"bytes"
	"strings"
	"testing"
)

// A card written before the exponent's coefficient was named "stiffening"
// says "rate": it reads as before, and writing it again uses today's name.
func TestFormerParameterName(t *testing.T) {
	const old = `{"format": "weft.model/1", "stress_unit": "kPa", "families": [{"name": "f1", "angle_deg": 30}],
 "terms": [{"id": "i1-lin", "weight": 4}, {"id": "fib-expsq", "weight": 60, "params": {"rate": 8}, "family": "f1"}]}`
	c, m, err := Parse(strings.NewReader(old), "old.json")
	if err != nil {
		t.Fatal(err)
	}
	if got := m.Terms[1].Params[0]; got != 8 {
		t.Errorf("stiffening read from the former key: %g, want 8", got)
	}
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(b, []byte(`"stiffening": 8`)) || bytes.Contains(b, []byte(`"rate"`)) {
		t.Errorf("the card written again does not use today's name:\n%s", b)
	}
	both := strings.Replace(old, `{"rate": 8}`, `{"rate": 8, "stiffening": 8}`, 1)
	if _, _, err := Parse(strings.NewReader(both), "both.json"); err == nil || !strings.Contains(err.Error(), "$.terms[1].params.rate: give stiffening only") {
		t.Errorf("both names at once: %v", err)
	}
}
