package card

import (
	"bytes"
	"encoding/json"
	"math"
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

// The selection evidence and the verdict of a card written before they
// used the report's words read under their former keys.
func TestFormerSelectionKeys(t *testing.T) {
	var sel SelectionSection
	if err := json.Unmarshal([]byte(`{"chosen": "single-k2-p4", "cv_metric": "m", "pareto": [{"name": "single-k2-p4", "cv_error": 0.0074, "cv_stderr": 0.0003, "min_r2": 0.998, "cv_folds": [{"protocol": "1:1", "error": 0.007, "r2": 0.99}]}]}`), &sel); err != nil {
		t.Fatal(err)
	}
	c := sel.Pareto[0]
	if sel.HeldoutMetric != "m" || c.HeldoutError != 0.0074 || c.HeldoutStdErr != 0.0003 || c.LowestR2 != 0.998 || len(c.HeldoutFolds) != 1 {
		t.Errorf("former keys not read: %+v, metric %q", c, sel.HeldoutMetric)
	}
	var now CandidateCard
	if err := json.Unmarshal([]byte(`{"name": "x", "heldout_error": 0.5}`), &now); err != nil {
		t.Fatal(err)
	}
	if now.HeldoutError != 0.5 || !math.IsNaN(float64(now.LowestR2)) {
		t.Errorf("today's keys: %+v", now)
	}
	var v VerdictSection
	if err := json.Unmarshal([]byte(`{"families": "1", "form": "1", "cv_error": {"1": 0.007}}`), &v); err != nil {
		t.Fatal(err)
	}
	if v.HeldoutError["1"] != 0.007 {
		t.Errorf("verdict: former cv_error not read: %v", v.HeldoutError)
	}
}
