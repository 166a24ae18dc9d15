package biaxial

import (
	"strings"
	"testing"
)

// warningsWith returns the warnings of s whose message contains frag.
func warningsWith(s *Specimen, frag string) []Warning {
	var out []Warning
	for _, w := range s.Warnings {
		if strings.Contains(w.Message, frag) {
			out = append(out, w)
		}
	}
	return out
}

// Rows written twice (every column equal to the row before) are kept, as
// the file gives them, but warned about once with their count and the
// first line: each copy counts as another measurement in the fit. Rows
// that differ in any column, an ignored one or the time included, or
// that repeat a row further up, are no copies. Synthetic data.
func TestRepeatedRowsWarned(t *testing.T) {
	var doubled strings.Builder
	for _, r := range strings.SplitAfter(goodRows, "\n") {
		doubled.WriteString(r + r)
	}
	s, err := readString(goodHeader+doubled.String(), Options{Branch: BranchAll})
	if err != nil {
		t.Fatal(err)
	}
	if n := s.NumPoints(); n != 10 {
		t.Errorf("%d points kept, want all 10 rows", n)
	}
	ws := warningsWith(s, "repeat their protocol's row before them exactly")
	if len(ws) != 1 {
		t.Fatalf("warnings %v; want one about 5 repeated rows", s.Warnings)
	}
	w := ws[0]
	for _, frag := range []string{"5 rows repeat", "first on line 3", "counts twice in the fit"} {
		if !strings.Contains(w.Message, frag) {
			t.Errorf("warning %q does not say %q", w.Message, frag)
		}
	}
	if w.Line != 3 || w.File != "data.csv" || !strings.HasPrefix(w.String(), "data.csv:3: ") {
		t.Errorf("warning at %q, want data.csv:3", w.Location())
	}

	// One copy, with spaces around a cell: named by its line alone.
	s, err = readString(goodHeader+goodRows+"1:1, 1.08,1.08,14,14 \n", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if ws := warningsWith(s, "repeats its protocol's row before it exactly"); len(ws) != 1 || ws[0].Line != 7 {
		t.Errorf("one repeated row: warnings %v", s.Warnings)
	}

	// No copies: a time stamp or an ignored column differs, or the row
	// repeats one that is not the row before.
	for _, in := range []string{
		"protocol,time,stretch_1,stretch_2,cauchy_11,cauchy_22\n1:1,0,1,1,0,0\n1:1,1,1,1,0,0\n1:1,2,1.02,1.02,2,2\n1:1,3,1.04,1.04,5,5\n1:1,4,1.06,1.06,9,9\n1:1,5,1.08,1.08,14,14\n",
		"protocol,stretch_1,stretch_2,cauchy_11,cauchy_22,sample\n1:1,1,1,0,0,a\n1:1,1,1,0,0,b\n1:1,1.02,1.02,2,2,c\n1:1,1.04,1.04,5,5,d\n1:1,1.06,1.06,9,9,e\n1:1,1.08,1.08,14,14,f\n",
		goodHeader + goodRows + "1:1,1.06,1.06,9,9\n",
	} {
		s, err := readString(in, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if ws := warningsWith(s, "exactly, every column equal"); len(ws) != 0 {
			t.Errorf("no copies, but warned: %v", ws)
		}
	}
}

// A shear stress column that is exactly zero on every kept row of data
// whose kinematics carry no shear is the data's only shear information:
// it is kept as measured, but warned about, since a column of
// placeholders would decide the sign of fibre angles and rule out a
// single off-axis family. Zero shear with a measured F12/F21 (a sutured
// specimen) and a shear stress that is not zero everywhere are not
// warned about. Synthetic data.
func TestZeroShearColumnWarned(t *testing.T) {
	rows := func(header string, cell func(i int) string) string {
		var b strings.Builder
		b.WriteString(header)
		for i, r := range strings.Split(strings.TrimSuffix(goodRows, "\n"), "\n") {
			b.WriteString(r + "," + cell(i) + "\n")
		}
		return b.String()
	}
	zero := func(int) string { return "0,0" }
	for _, c := range []struct {
		in   string
		want string // "" for no warning
	}{
		{rows("protocol,stretch_1,stretch_2,nominal_11,nominal_22,nominal_12,nominal_21\n", zero), "columns nominal_12 and nominal_21 are exactly zero"},
		{rows("protocol,stretch_1,stretch_2,cauchy_11,cauchy_22,cauchy_12\n", func(int) string { return "0" }), "column cauchy_12 is exactly zero"},
		{rows("protocol,stretch_1,stretch_2,nominal_11,nominal_22,nominal_12,nominal_21\n", func(i int) string { return "0,0." + string(rune('1'+i)) }), "column nominal_12 is exactly zero"},
		{rows("protocol,stretch_1,stretch_2,cauchy_11,cauchy_22,cauchy_12\n", func(i int) string { return []string{"0", "0", "0.1", "0", "0"}[i] }), ""},
		{"protocol,F11,F12,F21,F22,nominal_11,nominal_22,nominal_12,nominal_21\n" +
			"1:1,1,0,0,1,0,0,0,0\n1:1,1.02,0.01,0,1.02,2,2,0,0\n1:1,1.04,0.02,0,1.04,5,5,0,0\n1:1,1.06,0.03,0,1.06,9,9,0,0\n1:1,1.08,0.04,0,1.08,14,14,0,0\n", ""},
	} {
		s, err := readString(c.in, Options{})
		if err != nil {
			t.Fatal(err)
		}
		ws := warningsWith(s, "exactly zero on every kept row")
		switch {
		case c.want == "" && len(ws) != 0:
			t.Errorf("warned about shear that is measured: %v", ws)
		case c.want != "" && len(ws) != 1:
			t.Errorf("%d warnings about zero shear, want 1 (%q)", len(ws), c.want)
		case c.want != "":
			for _, frag := range []string{c.want, "taken as measured", "sign of fibre angles", "off-axis fibre family", "remove the column"} {
				if !strings.Contains(ws[0].Message, frag) {
					t.Errorf("warning %q does not say %q", ws[0].Message, frag)
				}
			}
			if !s.HasShear {
				t.Errorf("the zeros are kept as shear information, but HasShear is false")
			}
		}
	}
}

// The rows of a protocol need not be contiguous (README, Input files), so
// a copy is a row equal to its protocol's row before, not the file's: the
// same synthetic data with a row of 1:0.5 written twice raise the same
// warning whether the file lists its protocols in blocks or interleaves
// them row by row. Interleaved, the copy follows a row of 1:1, and until
// 2026-12-05 it went unwarned. A row repeating another protocol's row
// before it, or its protocol's row further up, is still no copy.
func TestRepeatedRowsWarnedInInterleavedProtocols(t *testing.T) {
	a := []string{"1:1,1,1,0,0", "1:1,1.02,1.02,2,2", "1:1,1.04,1.04,5,5", "1:1,1.06,1.06,9,9", "1:1,1.08,1.08,14,14"}
	b := []string{"1:0.5,1,1,0,0", "1:0.5,1.02,1.01,2,1", "1:0.5,1.04,1.02,5,2", "1:0.5,1.04,1.02,5,2", "1:0.5,1.06,1.03,9,4", "1:0.5,1.08,1.04,14,6"}
	blocks := strings.Join(append(append([]string(nil), a...), b...), "\n") + "\n"
	var inter strings.Builder
	for i := range b {
		if i < len(a) {
			inter.WriteString(a[i] + "\n")
		}
		inter.WriteString(b[i] + "\n")
	}
	for _, c := range []struct {
		name, rows string
		line       int // the copy's line
	}{{"blocks", blocks, 10}, {"interleaved", inter.String(), 9}} {
		s, err := readString(goodHeader+c.rows, Options{})
		if err != nil {
			t.Fatal(err)
		}
		ws := warningsWith(s, "repeats its protocol's row before it exactly")
		if len(ws) != 1 || ws[0].Line != c.line {
			t.Errorf("%s: warnings %v; want one, on line %d", c.name, s.Warnings, c.line)
		}
	}

	// Not copies: 1:0.5's row repeats 1:1's row before it in the file
	// (another protocol), and 1:1's last row repeats one of its rows
	// further up.
	s, err := readString(goodHeader+"1:1,1,1,0,0\n1:0.5,1,1,0,0\n1:1,1.02,1.02,2,2\n1:0.5,1.02,1.01,2,1\n1:1,1.04,1.04,5,5\n1:0.5,1.04,1.02,5,2\n1:1,1.06,1.06,9,9\n1:0.5,1.06,1.03,9,4\n1:1,1.08,1.08,14,14\n1:0.5,1.08,1.04,14,6\n1:1,1.06,1.06,9,9\n", Options{Branch: BranchAll})
	if err != nil {
		t.Fatal(err)
	}
	if ws := warningsWith(s, "exactly, every column equal"); len(ws) != 0 {
		t.Errorf("no copies, but warned: %v", ws)
	}
}
