package card

import (
	"bytes"
	"strings"
	"testing"
)

// A fit section is read into its typed field; one this version cannot
// decode (here a "fit" written as a string) is left nil, named by
// SectionError, and written back byte for byte, as are unknown keys, so a
// card shaped by a newer weft still serves every command that does not
// need that section.
func TestSectionsTypedAndKept(t *testing.T) {
	base := `{"format": "weft.model/1", "stress_unit": "kPa", "families": [],
 "terms": [{"id": "i1-lin", "weight": 5}],
 "data_range": {"stretch_1": [1, 1.2], "stretch_2": [1, 1.1], "shear": [0, 0]},
 "fit": "from the future", "zz_note": {"b": [1, 2], "a": null}}`
	c, _, err := Parse(strings.NewReader(base), "card.json")
	if err != nil {
		t.Fatal(err)
	}
	if c.DataRange == nil || c.DataRange.Stretch1 != (Interval{1, 1.2}) || c.SectionError(KeyDataRange) != nil {
		t.Errorf("data_range: %+v (%v)", c.DataRange, c.SectionError(KeyDataRange))
	}
	if c.Fit != nil || c.SectionError(KeyFit) == nil {
		t.Errorf("an undecodable fit section: %+v, error %v", c.Fit, c.SectionError(KeyFit))
	}
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{`"fit": "from the future"`, `"zz_note": {`, `"b": [`, `"a": null`} {
		if !bytes.Contains(b, []byte(want)) {
			t.Errorf("rewritten card lacks %s:\n%s", want, b)
		}
	}
	c2, _, err := Parse(bytes.NewReader(b), "card.json")
	if err != nil {
		t.Fatal(err)
	}
	b2, _ := c2.Marshal()
	if !bytes.Equal(b, b2) {
		t.Errorf("a second rewrite changed the card:\n%s\n%s", b, b2)
	}
	// The inside-the-range test allows for round-off only.
	if iv := (Interval{1, 1.2}); iv.Outside(1.2+1e-12, 1.2+1e-12) || !iv.Outside(1.21, 1.21) || !iv.Outside(0.99, 1) {
		t.Error("Interval.Outside")
	}
}

// The verdict's lists are always written, empty as []; a card written
// before that, whose verdict has neither key, still reads, and written
// again it has both.
func TestVerdictListsAlwaysWritten(t *testing.T) {
	old := `{"format": "weft.model/1", "stress_unit": "kPa", "families": [],
 "terms": [{"id": "i1-lin", "weight": 5}],
 "verdict": {"families": "0", "form": "0", "reason": "no fibre family beats the matrix alone", "delta_bic": {"0": 0}, "heldout_error": {"0": 0.02}, "noise": 0.01, "stderr_floor": 0.001}}`
	c, _, err := Parse(strings.NewReader(old), "card.json")
	if err != nil {
		t.Fatalf("a card without verdict.ruled_out: %v", err)
	}
	if c.Verdict == nil || c.Verdict.RuledOut == nil || len(c.Verdict.RuledOut) != 0 || c.Verdict.Comparisons == nil {
		t.Fatalf("verdict read as %+v, want empty, non-nil lists", c.Verdict)
	}
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{`"ruled_out": []`, `"comparisons": []`} {
		if !bytes.Contains(b, []byte(want)) {
			t.Errorf("written again, the card lacks %s:\n%s", want, b)
		}
	}
}
