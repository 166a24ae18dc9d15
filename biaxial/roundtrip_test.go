package biaxial

import (
	"bytes"
	"math"
	"strconv"
	"strings"
	"testing"
)

// Writing a record and reading it back gives the same numbers: exactly in
// the stress layout (shortest round-trip formatting), and to rounding in the
// load layout (stress → load → stress multiplies and divides by W·H).
func TestRoundTripRecord(t *testing.T) {
	rec := synthRecord("1:0.5", 3, 11, 1.01, 1.15, 0.5)
	rec.Geometry = &Geometry{Thickness: 0.35, Size1: 12, Size2: 9}
	more := synthRecord("#2:1, \"quoted\"", 1, 6, 1, 1.2, 2)
	rec.Rows = append(rec.Rows, more.Rows...)
	rec.HasTime = true
	for i := range rec.Rows {
		rec.Rows[i].Time = 0.25 * float64(i)
	}

	for _, layout := range []Layout{{}, {Gradient: true}, {Loads: true}, {Loads: true, LoadUnit: "gf"}} {
		var buf bytes.Buffer
		if err := WriteRecord(&buf, rec, layout); err != nil {
			t.Fatalf("%+v: %v", layout, err)
		}
		text := buf.String()
		back, err := ReadRecord(strings.NewReader(text), "rt.csv", Options{})
		if err != nil {
			t.Fatalf("%+v: %v\n%s", layout, err, text)
		}
		if len(back.Rows) != len(rec.Rows) || back.Kind != rec.Kind || back.StressUnit != rec.StressUnit || back.Name != rec.Name {
			t.Fatalf("%+v: %d rows %v %s %q; want %d rows %v %s %q", layout, len(back.Rows), back.Kind, back.StressUnit, back.Name,
				len(rec.Rows), rec.Kind, rec.StressUnit, rec.Name)
		}
		if back.Meta["notes"] != "synthetic" {
			t.Errorf("%+v: metadata lost: %v", layout, back.Meta)
		}
		tol := 0.0
		if layout.Loads {
			tol = 1e-13
		}
		for i := range rec.Rows {
			a, b := rec.Rows[i], back.Rows[i]
			if a.Protocol != b.Protocol || a.F != b.F || a.Cycle != b.Cycle || a.Time != b.Time {
				t.Fatalf("%+v row %d: %+v, read back %+v", layout, i, a, b)
			}
			for c := range a.Stress {
				if math.Abs(a.Stress[c]-b.Stress[c]) > tol*math.Abs(a.Stress[c]) {
					t.Fatalf("%+v row %d stress %d: %v, read back %v", layout, i, c, a.Stress[c], b.Stress[c])
				}
			}
		}
	}
}

// A prepared specimen written with WriteCSV reads back to the same kept
// points, including Cauchy shear and F columns, in MPa.
func TestRoundTripSpecimen(t *testing.T) {
	in := "# specimen = SYN-shear (synthetic)\n# axis_1 = along the long edge\n" +
		"protocol,F11,F12,F21,F22,cauchy_11 [MPa],cauchy_22 [MPa],cauchy_12 [MPa]\n"
	for i := 0; i < 7; i++ {
		x := 0.013 * float64(i)
		in += strings.Join([]string{"1:1", ftoa(1 + x), ftoa(x / 7), ftoa(-x / 9), ftoa(1 + x/3), ftoa(x * 1.1), ftoa(x / 3), ftoa(x / 11)}, ",") + "\n"
	}
	s, err := readString(in, Options{})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteCSV(&buf, s, Layout{}); err != nil {
		t.Fatal(err)
	}
	s2, err := readString(buf.String(), Options{})
	if err != nil {
		t.Fatalf("%v\n%s", err, buf.String())
	}
	if s2.StressUnit != "MPa" || s2.Kind != Cauchy || !s2.Measured[C12] || s2.Measured[C21] || s2.Meta["axis_1"] != "along the long edge" {
		t.Fatalf("read back %s %v %v %v", s2.StressUnit, s2.Kind, s2.Measured, s2.Meta)
	}
	for i := range s.Protocols[0].Points {
		a, b := s.Protocols[0].Points[i], s2.Protocols[0].Points[i]
		if a.F != b.F || a.Stress != b.Stress {
			t.Errorf("point %d: %+v, read back %+v", i, a, b)
		}
	}
	if err := WriteCSV(&buf, s, Layout{Loads: true}); err == nil {
		t.Error("Cauchy stress written as loads without an error")
	}
}

func ftoa(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
