package card

import (
	"bytes"
	"reflect"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
)

// The calibration check's section: it holds only when every outcome's
// verdict is the card's, says so in words with the outcomes' angles, and
// is written and read back unchanged under its key.
func TestCalibrationCheckSection(t *testing.T) {
	outs := []aniso.AxisScaleOutcome{
		{Axis1Scale: 1.05, Families: "1", Chosen: "single-t2-p4", AnglesDeg: []float64{31.2}, Angles: "31.2°"},
		{Axis1Scale: 0.95, Families: "1", Chosen: "single-t2-p4", AnglesDeg: []float64{28.9}, Angles: "28.9°"},
	}
	c := NewCalibrationCheck("1", 0.05, outs)
	if !c.Holds || c.Summary != "verdict 1; axis 1's stress ×1.05: 1 at 31.2°; axis 1's stress ×0.95: 1 at 28.9° — the verdict holds" {
		t.Errorf("holds %v, summary %q", c.Holds, c.Summary)
	}
	outs[1].Families = "0"
	c = NewCalibrationCheck("1", 0.05, outs)
	if c.Holds || !strings.Contains(c.Summary, "the verdict changes") {
		t.Errorf("a changed verdict: holds %v, summary %q", c.Holds, c.Summary)
	}
	cd := FromModel(oneFamily(), "kPa", []bool{true})
	cd.CalibrationCheck = c
	b, err := cd.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), `"calibration_check": {`) {
		t.Fatalf("no calibration_check key in\n%s", b)
	}
	back, _, err := Parse(bytes.NewReader(b), "card.json")
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(back.CalibrationCheck, c) {
		t.Errorf("read back %+v, want %+v", back.CalibrationCheck, c)
	}
}
