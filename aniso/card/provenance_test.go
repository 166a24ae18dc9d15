package card

import (
	"bytes"
	"strings"
	"testing"

	"github.com/weft-tools/weft/biaxial"
)

// The set-up section keeps the geometry and how the file gave stress and
// deformation, the control the metadata state, and the other metadata in
// file order; provenance and set-up survive a write and a read.
func TestSetupAndProvenance(t *testing.T) {
	s := &biaxial.Specimen{FromLoads: true, Kinematics: biaxial.GradientColumns, Geometry: &biaxial.Geometry{Thickness: 0.15, Size1: 12, Size2: 10},
		Meta:     map[string]string{"specimen": "S", "control": "load", "operator": "synthetic example", "thickness": "0.15 mm"},
		MetaKeys: []string{"specimen", "thickness", "operator", "control"}}
	st := NewSetup(s)
	if st.StressFrom != "loads and geometry" || st.Kinematics != "deformation gradient" || st.Control != "load" ||
		*st.ThicknessMM != 0.15 || *st.Size1MM != 12 || *st.Size2MM != 10 {
		t.Errorf("set-up %+v", st)
	}
	if len(st.Metadata) != 1 || st.Metadata[0] != (MetaLine{"operator", "synthetic example"}) {
		t.Errorf("other metadata %+v, want only the operator line", st.Metadata)
	}
	p := &Provenance{Software: "weft", Version: "v1.2.0", Revision: "0123456789abcdef0123", Modified: true, Command: "weft fit",
		Options: []string{"--cycle=last"}, Inputs: []InputFile{{File: "a.csv", Bytes: 3, SHA256: strings.Repeat("ab", 32)}}}
	if got := p.VersionText(); got != "v1.2.0, revision 0123456789ab (modified)" {
		t.Errorf("version text %q", got)
	}
	c := &Card{Format: Format, StressUnit: "kPa", Families: []Family{}, Terms: []Term{{ID: "i1-lin", Weight: ptr(1.0)}}, Provenance: p, Setup: st}
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	back, _, err := Parse(bytes.NewReader(b), "c.json")
	if err != nil {
		t.Fatal(err)
	}
	if back.Provenance == nil || back.Provenance.Inputs[0].SHA256 != p.Inputs[0].SHA256 || back.Setup == nil || back.Setup.Control != "load" {
		t.Errorf("provenance or set-up lost in a write and read: %+v %+v", back.Provenance, back.Setup)
	}
}

func ptr(x float64) *float64 { return &x }

// The data section records the stress measure of the file and the
// specimen's reference geometry: edge loads become nominal stress over the
// reference cross-section, P11 = load_1/(W2 H) (common practice), which an
// FE analyst needs to compare reaction forces with the test.
func TestDataSectionStressMeasureAndGeometry(t *testing.T) {
	loads := NewDataSection(&biaxial.Specimen{FromLoads: true, Kind: biaxial.Nominal, Geometry: &biaxial.Geometry{Thickness: 0.15, Size1: 12, Size2: 10}})
	if loads.StressMeasure != "loads" || !strings.Contains(loads.StressMeasureNote, "load_1/(W2 H)") || loads.Geometry == nil ||
		loads.Geometry.ThicknessMM != 0.15 || loads.Geometry.Size1MM != 12 || loads.Geometry.Size2MM != 10 {
		t.Errorf("from loads: %q (%q), geometry %+v", loads.StressMeasure, loads.StressMeasureNote, loads.Geometry)
	}
	for kind, want := range map[biaxial.StressKind]string{biaxial.Nominal: "nominal", biaxial.Cauchy: "cauchy"} {
		d := NewDataSection(&biaxial.Specimen{Kind: kind})
		if d.StressMeasure != want || d.Geometry != nil {
			t.Errorf("%v columns: measure %q, geometry %+v", kind, d.StressMeasure, d.Geometry)
		}
	}
}
