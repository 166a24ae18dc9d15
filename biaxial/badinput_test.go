package biaxial

import (
	"fmt"
	"strings"
	"testing"
)

// goodRows are five valid synthetic rows: protocol, stretch_1, stretch_2,
// cauchy_11, cauchy_22 (lines 2–6 after a one-line header).
const goodRows = "1:1,1,1,0,0\n1:1,1.02,1.02,2,2\n1:1,1.04,1.04,5,5\n1:1,1.06,1.06,9,9\n1:1,1.08,1.08,14,14\n"

const goodHeader = "protocol,stretch_1,stretch_2,cauchy_11,cauchy_22\n"

func readString(in string, opt Options) (*Specimen, error) {
	return Read(strings.NewReader(in), "data.csv", opt)
}

func TestBadMissingKinematics(t *testing.T) {
	_, err := readString("protocol,strech_1,stretch_2,cauchy_11,cauchy_22\n"+goodRows, Options{})
	wantParseError(t, err, ErrMissingColumn, 1, 0, "data.csv:1:", "stretch_1", "strech_1")
	_, err = readString("protocol,F11,F12,F22,cauchy_11,cauchy_22\n1:1,1,0,1,0,0\n", Options{})
	wantParseError(t, err, ErrMissingColumn, 1, 0, "F21")
	_, err = readString("protocol,cauchy_11,cauchy_22\n1:1,0,0\n", Options{})
	wantParseError(t, err, ErrMissingColumn, 1, 0, "no kinematic columns")
}

func TestBadMissingStress(t *testing.T) {
	_, err := readString("protocol,stretch_1,stretch_2,cauchy_11\n1:1,1,1,0\n", Options{})
	wantParseError(t, err, ErrMissingColumn, 1, 0, "cauchy_22")
	_, err = readString("protocol,stretch_1,stretch_2\n1:1,1,1\n", Options{})
	wantParseError(t, err, ErrMissingColumn, 1, 0, "no stress columns")
	_, err = readString("protocol,stretch_1,stretch_2,nominal_11,nominal_22,nominal_12\n1:1,1,1,0,0,0\n", Options{})
	wantParseError(t, err, ErrMissingColumn, 1, 0, "nominal_21")
}

func TestBadNumber(t *testing.T) {
	in := goodHeader + goodRows + "1:1,1.1,abc,20,20\n"
	_, err := readString(in, Options{})
	wantParseError(t, err, ErrNumber, 7, 3, "data.csv:7:3:", "stretch_2", `"abc"`, "not a number")
}

func TestBadEmptyCell(t *testing.T) {
	_, err := readString(goodHeader+"1:1,1,1,,0\n"+goodRows, Options{})
	wantParseError(t, err, ErrNumber, 2, 4, "cauchy_11 is empty")
	// A short row is named as such, not as an empty cell.
	_, err = readString(goodHeader+"1:1,1,1,0\n"+goodRows, Options{})
	wantParseError(t, err, ErrSyntax, 2, 5, "the row ends after 4 fields but the header (line 1) has 5", "cauchy_22 (column 5) is missing")
}

func TestBadNaNAndInf(t *testing.T) {
	for _, v := range []string{"NaN", "nan", "Inf", "-Inf", "+inf", "Infinity"} {
		_, err := readString(goodHeader+goodRows+"1:1,1.1,1.1,"+v+",20\n", Options{})
		wantParseError(t, err, ErrNumber, 7, 4, `cauchy_11 is "`+v+`"`, "finite")
	}
	_, err := readString(goodHeader+goodRows+"1:1,1.1,1.1,1e400,20\n", Options{})
	wantParseError(t, err, ErrNumber, 7, 4, "overflows")
}

func TestBadStretch(t *testing.T) {
	_, err := readString(goodHeader+"1:1,-0.2,1,0,0\n"+goodRows, Options{})
	pe := wantParseError(t, err, ErrRange, 2, 2, "stretch_1 is -0.2", "must be > 0", "column order")
	if got := pe.Error(); !strings.HasPrefix(got, "data.csv:2:2: stretch_1 is -0.2; stretches must be > 0 — ") {
		t.Errorf("message %q does not read file:line:col: problem — fix", got)
	}
	_, err = readString(goodHeader+goodRows+"1:1,1.1,0,0,0\n", Options{})
	wantParseError(t, err, ErrRange, 7, 3, "stretch_2 is 0")
}

func TestBadDetF(t *testing.T) {
	// det F = 1·1 − 1.2·1 = −0.2 on line 3.
	in := "protocol,F11,F12,F21,F22,cauchy_11,cauchy_22\n1:1,1,0,0,1,0,0\n1:1,1,1.2,1,1,1,1\n"
	_, err := readString(in, Options{})
	wantParseError(t, err, ErrRange, 3, 2, "det F", "-0.2", "must be > 0", "sign convention")
}

func TestBadDuplicateColumn(t *testing.T) {
	_, err := readString("protocol,stretch_1,Stretch_1,stretch_2,cauchy_11,cauchy_22\n", Options{})
	wantParseError(t, err, ErrDuplicateColumn, 1, 3, `"Stretch_1" repeats stretch_1 (column 2)`)
}

func TestBadLoadsWithoutGeometry(t *testing.T) {
	in := "# thickness = 0.5 mm\nprotocol,stretch_1,stretch_2,load_1 [N],load_2 [N]\n" + goodRows
	_, err := readString(in, Options{})
	wantParseError(t, err, ErrGeometry, 2, 4, "size_1, size_2", "# size_1 = 10 mm")
}

func TestBadUnits(t *testing.T) {
	geo := "# thickness = 0.5 mm\n# size_1 = 10 mm\n# size_2 = 10 mm\n"
	cases := []struct {
		in        string
		line, col int
		frag      string
	}{
		{"protocol,stretch_1,stretch_2,cauchy_11 [psi],cauchy_22\n" + goodRows, 1, 4, `unknown stress unit "psi"`},
		{geo + "protocol,stretch_1,stretch_2,load_1 [lbf],load_2 [N]\n" + goodRows, 4, 4, `unknown force unit "lbf"`},
		{geo + "protocol,stretch_1,stretch_2,load_1,load_2 [N]\n" + goodRows, 4, 4, "has no unit"},
		{"# thickness = 0.5 in\n# size_1 = 10 mm\n# size_2 = 10 mm\n" + goodHeader + goodRows, 1, 0, `unknown length unit "in"`},
		{"# thickness = 0.5\n" + goodHeader + goodRows, 1, 0, "has no unit"},
		{"# stress_unit = bar\n" + goodHeader + goodRows, 1, 0, `"bar" is not a stress unit`},
		{"protocol,stretch_1 [%],stretch_2,cauchy_11,cauchy_22\n" + goodRows, 1, 2, `unit "%"`},
		{"protocol,time [h],stretch_1,stretch_2,cauchy_11,cauchy_22\n", 1, 2, `unknown time unit "h"`},
	}
	for _, c := range cases {
		_, err := readString(c.in, Options{})
		wantParseError(t, err, ErrUnit, c.line, c.col, c.frag)
	}
}

func TestBadEmptyProtocol(t *testing.T) {
	_, err := readString(goodHeader+goodRows+" ,1.1,1.1,20,20\n", Options{})
	wantParseError(t, err, ErrProtocol, 7, 1, "protocol is empty")
}

func TestBadTooFewPoints(t *testing.T) {
	in := goodHeader + goodRows + "1:0.5,1,1,0,0\n1:0.5,1.02,1.01,2,1\n1:0.5,1.04,1.02,4,2\n"
	_, err := readString(in, Options{})
	wantParseError(t, err, ErrProtocol, 7, 0, "protocol 1:0.5", "keeps 3 points", "at least 5")
}

func TestBadTwoKindsForOneAxis(t *testing.T) {
	_, err := readString("protocol,stretch_1,stretch_2,cauchy_11,nominal_11,cauchy_22\n", Options{})
	wantParseError(t, err, ErrMixedStress, 1, 5, `"cauchy_11" and "nominal_11" both give the 11 stress`)
	_, err = readString("protocol,stretch_1,stretch_2,cauchy_11,cauchy_22,nominal_12,nominal_21\n", Options{})
	wantParseError(t, err, ErrMixedStress, 1, 6, "mixes Cauchy stress with nominal_12")
}

func TestBadSyntax(t *testing.T) {
	_, err := readString(goodHeader+goodRows+"\"1:1,1.1,1.1,20,20\n", Options{})
	wantParseError(t, err, ErrSyntax, 7, 1, "never closed")
	_, err = readString(goodHeader+goodRows+"1:1,1.1,1.1,20,20,5\n", Options{})
	wantParseError(t, err, ErrSyntax, 7, 6, "6 fields", "header (line 1) has 5", "decimal commas")
	_, err = readString("\xff\xfe", Options{})
	wantParseError(t, err, ErrSyntax, 1, 0, "UTF-16")
	_, err = readString("# only = metadata\n", Options{})
	wantParseError(t, err, ErrMissingColumn, 0, 0, "no header")
	_, err = readString(goodHeader, Options{})
	wantParseError(t, err, ErrProtocol, 1, 0, "no data rows")
}

func TestBadMetadata(t *testing.T) {
	_, err := readString("# specimen = a\n# Specimen = b\n"+goodHeader+goodRows, Options{})
	wantParseError(t, err, ErrMetadata, 2, 0, `"specimen" is given again (first on line 1)`)
}

func TestBadCycleNumber(t *testing.T) {
	_, err := readString("protocol,cycle,stretch_1,stretch_2,cauchy_11,cauchy_22\n1:1,1.5,1,1,0,0\n", Options{})
	wantParseError(t, err, ErrNumber, 2, 2, "whole number")
}

// Options problems are reported as ErrOptions.
func TestBadOptions(t *testing.T) {
	in := goodHeader + goodRows
	// A weight of 0 left the protocol in cross-validation with nothing
	// fitted to it: every fold failed and the rule read +Inf ± NaN.
	for _, o := range []Options{{Resample: 3}, {Cycle: -2}, {ProtocolWeights: map[string]float64{"1:1": -1}}, {ProtocolWeights: map[string]float64{"1:1": 0}}} {
		if _, err := readString(in, o); err == nil || !strings.Contains(err.Error(), "options") {
			t.Errorf("options %+v: error %v, want an options error", o, err)
		}
	}
	_, err := readString(in, Options{ProtocolWeights: map[string]float64{"2:1": 2}})
	if err == nil || !strings.Contains(err.Error(), `"2:1"`) || !strings.Contains(err.Error(), `"1:1"`) {
		t.Errorf("unknown protocol weight: %v", err)
	}
	_, err = readString(in, Options{Cycle: 2})
	wantParseError(t, err, ErrProtocol, 2, 0, "cycle 2 was asked for", "has 1")
	_, err = readString(in, Options{Sheet: "x"})
	if err == nil || !strings.Contains(err.Error(), "not an xlsx") {
		t.Errorf("sheet on CSV: %v", err)
	}
}

// A header of many names weft does not know keeps a notice for the first
// ten ignored columns and counts the rest in one. Until 2026-12-05 a
// notice a column made a 1 MB header of half a million names allocate
// some 250 MB and keep half a million notices (found while fuzzing the
// reader, by checking that memory grows with the input only by a small
// factor). The columns are still ignored, and the data read.
func TestManyIgnoredColumnsOneNotice(t *testing.T) {
	var h, row strings.Builder
	h.WriteString("stretch_1,stretch_2,cauchy_11,cauchy_22")
	for i := 0; i < 1000; i++ {
		fmt.Fprintf(&h, ",extra%d", i)
	}
	in := h.String() + "\n"
	for k := 0; k < 6; k++ {
		row.Reset()
		fmt.Fprintf(&row, "%g,%g,%g,%g", 1+0.01*float64(k), 1+0.01*float64(k), float64(k), float64(k))
		row.WriteString(strings.Repeat(",x", 1000))
		in += row.String() + "\n"
	}
	rec, err := ReadRecord(strings.NewReader(in), "wide.csv", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(rec.Rows) != 6 {
		t.Fatalf("%d rows read, want 6", len(rec.Rows))
	}
	var each, rest int
	for _, n := range rec.Notices {
		if strings.Contains(n, "is not part of the weft layout") {
			each++
		}
		if strings.Contains(n, "990 more columns are not part of the weft layout") {
			rest++
		}
	}
	if each != maxIgnoredNotices || rest != 1 || len(rec.Notices) > maxIgnoredNotices+3 {
		t.Fatalf("%d notices for single columns and %d for the rest, want %d and 1: %d notices in all", each, rest, maxIgnoredNotices, len(rec.Notices))
	}
	if !strings.Contains(strings.Join(rec.Notices, "\n"), `column "extra0" is not part of the weft layout`) {
		t.Fatalf("the first ignored column is not named: %q", rec.Notices[:3])
	}
}
