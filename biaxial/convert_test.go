package biaxial

import (
	"fmt"
	"strings"
	"testing"
)

// Loads → nominal stress, P11 = f1/(W2·H), P22 = f2/(W1·H): common practice;
// Sacks 2000, J Biomech Eng 122:23–30. The expected values are worked by
// hand below.
func TestLoadsToNominalStress(t *testing.T) {
	// Synthetic specimen: H = 0.4 mm, W1 = 10 mm, W2 = 6 mm.
	// Row 1: f1 = 0.15 N   → P11 = 0.15 / (6e-3 · 0.4e-3) Pa = 62 500 Pa = 62.5 kPa
	//        f2 = 0.10 N   → P22 = 0.10 / (10e-3 · 0.4e-3) Pa = 25 000 Pa = 25 kPa
	in := `# specimen = SYN-load (synthetic)
# thickness = 0.4 mm
# size_1 = 10 mm
# size_2 = 6 mm
protocol,stretch_1,stretch_2,load_1 [N],load_2 [N]
` + rows5("1:1", "0.15", "0.10")
	s, err := Read(strings.NewReader(in), "syn.csv", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if s.Kind != Nominal || !s.FromLoads || s.StressUnit != "kPa" {
		t.Fatalf("kind %v fromLoads %v unit %s; want nominal from loads in kPa", s.Kind, s.FromLoads, s.StressUnit)
	}
	p := s.Protocols[0].Points[4]
	if !near(p.Stress[C11], 62.5, 1e-12) || !near(p.Stress[C22], 25, 1e-12) {
		t.Errorf("P11, P22 = %v, %v kPa; want 62.5, 25 (hand-computed)", p.Stress[C11], p.Stress[C22])
	}
	// For a pure biaxial stretch σ11 = λ1 P11 (package documentation,
	// Loads to stress; common practice); the reader keeps nominal stress and does not convert.
	if p.F[0] != 1.04 {
		t.Errorf("stretch_1 = %v, want 1.04", p.F[0])
	}
}

// rows5 gives five loading rows; the last has the given loads, the others
// fractions of them, so the protocol is valid.
func rows5(label, l1, l2 string) string {
	var b strings.Builder
	for i := 0; i < 5; i++ {
		lam := 1 + 0.01*float64(i)
		if i < 4 {
			fmt.Fprintf(&b, "%s,%g,%g,%g,%g\n", label, lam, lam, 0.01*float64(i), 0.005*float64(i))
		} else {
			fmt.Fprintf(&b, "%s,%g,%g,%s,%s\n", label, lam, lam, l1, l2)
		}
	}
	return b.String()
}

// Gram-force is defined through standard gravity gn = 9.80665 m/s² (3rd
// CGPM 1901; the conventional value), so 1 gf = 9.80665 mN. Micrometres and
// millinewtons are SI prefixes.
func TestForceAndLengthUnits(t *testing.T) {
	// f1 = 12 gf = 117.6798 mN = 0.1176798 N over W2·H = 6 mm · 400 µm
	//   → P11 = 0.1176798 / 2.4e-6 Pa = 49 033.25 Pa = 49.03325 kPa
	// f2 = 80 mN over W1·H = 10 mm · 400 µm → 0.08 / 4e-6 Pa = 20 kPa
	for _, th := range []string{"400 µm", "400 um", "0.4 mm", "0.0004 m", "400μm"} {
		in := "# thickness = " + th + `
# size_1 = 10 mm
# size_2 = 6 mm
protocol,stretch_1,stretch_2,load_1 [gf],load_2 [mN]
1:1,1,1,0,0
1:1,1.01,1.01,1,10
1:1,1.02,1.02,3,20
1:1,1.03,1.03,7,40
1:1,1.04,1.04,12,80
`
		s, err := Read(strings.NewReader(in), "syn.csv", Options{})
		if err != nil {
			t.Fatalf("thickness %s: %v", th, err)
		}
		p := s.Protocols[0].Points[4]
		if !near(p.Stress[C11], 49.03325, 1e-12) || !near(p.Stress[C22], 20, 1e-12) {
			t.Errorf("thickness %s: P = %v, %v kPa; want 49.03325, 20 (hand-computed)", th, p.Stress[C11], p.Stress[C22])
		}
	}
	if f, _ := ForceToNewton("gf"); f != 9.80665e-3 {
		t.Errorf("gf = %v N, want 9.80665e-3 (standard gravity)", f)
	}
}

// Stress units: 1 MPa = 1000 kPa = 1e6 Pa (SI prefixes). The first stress
// column's unit is the specimen's unit; others are converted with a notice.
func TestStressUnits(t *testing.T) {
	cases := []struct {
		name, header, row4 string
		unit               string
		want11, want22     float64
		notice             string
	}{
		{"no unit is kPa", "cauchy_11,cauchy_22", "12.5,8", "kPa", 12.5, 8, "read as kPa"},
		{"MPa kept", "cauchy_11 [MPa],cauchy_22 [MPa]", "0.0125,0.008", "MPa", 0.0125, 0.008, ""},
		{"mixed converted to first", "cauchy_11 [kPa],cauchy_22 [Pa]", "12.5,8000", "kPa", 12.5, 8, "converted to kPa"},
		{"N/mm2 is MPa", "nominal_11 [N/mm2],nominal_22 [MPa]", "0.5,0.25", "MPa", 0.5, 0.25, ""},
		{"metadata unit", "cauchy_11,cauchy_22", "1250,800", "Pa", 1250, 800, ""},
	}
	for _, c := range cases {
		meta := ""
		if c.name == "metadata unit" {
			meta = "# stress_unit = Pa\n"
		}
		in := meta + "protocol,stretch_1,stretch_2," + c.header + "\n"
		for i := 0; i < 4; i++ {
			in += fmt.Sprintf("p,%g,%g,%d,%d\n", 1+0.01*float64(i), 1+0.01*float64(i), i, i)
		}
		in += "p,1.05,1.05," + c.row4 + "\n"
		s, err := Read(strings.NewReader(in), "u.csv", Options{})
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		p := s.Protocols[0].Points[4]
		if s.StressUnit != c.unit || !near(p.Stress[C11], c.want11, 1e-12) || !near(p.Stress[C22], c.want22, 1e-12) {
			t.Errorf("%s: %v %v %s; want %v %v %s", c.name, p.Stress[C11], p.Stress[C22], s.StressUnit, c.want11, c.want22, c.unit)
		}
		if c.notice != "" && !strings.Contains(strings.Join(s.Notices, "\n"), c.notice) {
			t.Errorf("%s: notices %q lack %q", c.name, s.Notices, c.notice)
		}
	}
	if f, ok := StressFactor("MPa", "kPa"); !ok || f != 1000 {
		t.Errorf("MPa→kPa factor %v, want 1000", f)
	}
}

// Semicolons and decimal commas are accepted with a notice; a BOM is
// skipped; comments may appear anywhere; header names are case-insensitive.
func TestSemicolonDecimalCommaBOM(t *testing.T) {
	in := "\xef\xbb\xbf# specimen = SYN-semi\n# tissue = synthetic membrane\n\n" +
		"Protocol; Stretch_1 ; STRETCH_2; Cauchy_11 [kPa]; cauchy_22 [kPa]; comment\n" +
		"1:0,5;1;1;0;0;a\n# a comment between rows\n" +
		"1:0,5;1,01;1,005;1,5;0,5;b\n1:0,5;1,02;1,01;3,25;1;c\n" +
		"1:0,5;1,03;1,015;5;1,5;\n1:0,5;1,04;1,02;7,5;2;\n"
	s, err := Read(strings.NewReader(in), "semi.csv", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if s.Name != "SYN-semi" || s.Meta["tissue"] != "synthetic membrane" {
		t.Errorf("name %q meta %v", s.Name, s.Meta)
	}
	pr := s.Protocols[0]
	if pr.Label != "1:0,5" || len(pr.Points) != 5 {
		t.Fatalf("protocol %q with %d points", pr.Label, len(pr.Points))
	}
	if p := pr.Points[2]; p.F[0] != 1.02 || p.F[3] != 1.01 || p.Stress[C11] != 3.25 || p.Line != 8 {
		t.Errorf("point 3 = %+v; want stretch 1.02, 1.01, stress 3.25 on line 8", p)
	}
	all := strings.Join(s.Notices, "\n")
	for _, want := range []string{"semicolon", "decimal comma", `"comment"`} {
		if !strings.Contains(all, want) {
			t.Errorf("notices %q lack %q", s.Notices, want)
		}
	}
}

// A length in the metadata is the number typed, in millimetres: the SI
// prefixes (BIPM, The International System of Units, 9th ed. 2019:
// milli = 10⁻³, micro = 10⁻⁶) make 9 mm, 0.009 m and 9000 µm the same
// 9 mm, the decimal 9 exactly. Until 2026-12-05 the reader multiplied by
// 1e-3 and then by 1e3, and "9 mm" became 9.000000000000002 mm, "0.42 mm"
// 0.42000000000000004 mm, in the card's geometry and `weft inspect`.
func TestGeometryIsTheNumberTyped(t *testing.T) {
	for _, c := range []struct {
		th, s1, s2          string
		wantH, want1, want2 float64
	}{
		{"0.42 mm", "9.5 mm", "9 mm", 0.42, 9.5, 9},
		{"420 µm", "0.0095 m", "9000 um", 0.42, 9.5, 9},
		{"0.00042 m", "9500 µm", "0.009 m", 0.42, 9.5, 9},
		{"0.3 mm", "10 mm", "1.1 mm", 0.3, 10, 1.1},
		{"1.5e-4 m", "2.5e4 µm", "12.3456789 mm", 0.15, 25, 12.3456789},
	} {
		in := "# thickness = " + c.th + "\n# size_1 = " + c.s1 + "\n# size_2 = " + c.s2 + "\n" +
			"protocol,stretch_1,stretch_2,load_1 [N],load_2 [N]\n" + rows5("1:1", "0.15", "0.10")
		s, err := Read(strings.NewReader(in), "syn.csv", Options{})
		if err != nil {
			t.Fatalf("%s, %s, %s: %v", c.th, c.s1, c.s2, err)
		}
		g := s.Geometry
		if g == nil || g.Thickness != c.wantH || g.Size1 != c.want1 || g.Size2 != c.want2 {
			t.Errorf("%s, %s, %s: geometry %+v mm; want exactly %v, %v, %v (SI prefixes)", c.th, c.s1, c.s2, g, c.wantH, c.want1, c.want2)
		}
	}
}
