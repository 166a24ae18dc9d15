package biaxial

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/xuri/excelize/v2"
)

// twoBlocks returns a file in which the label "1:1" holds two blocks of
// synthetic rows, the second stretching axis 2 with ratio r2 (1: the same
// protocol repeated; 0.5: another protocol under the same label). With a
// cycle column, each block numbers its rows from cycle 1 up to cycles.
func twoBlocks(r2 float64, cycleColumn bool, cycles int) string {
	var b strings.Builder
	b.WriteString("protocol,")
	if cycleColumn {
		b.WriteString("cycle,")
	}
	b.WriteString("stretch_1,stretch_2,cauchy_11,cauchy_22\n")
	for blk, r := range []float64{1, r2} {
		for i := 0; i <= 10; i++ {
			k := i
			if i > 5 {
				k = 10 - i
			}
			l1, l2 := 1+0.02*float64(k), 1+0.02*float64(k)*r
			b.WriteString("1:1,")
			if cycleColumn {
				fmt.Fprintf(&b, "%d,", 1+i*cycles/11)
			}
			fmt.Fprintf(&b, "%g,%g,%g,%g\n", l1, l2, synthLoad(l1)+float64(blk), synthLoad(l2))
		}
	}
	return b.String()
}

// Finding 3: a label reused for another protocol is refused, naming both
// line ranges; the same protocol repeated under its label is still read.
func TestReusedProtocolLabel(t *testing.T) {
	// Block 1 ends and block 2 starts at stretch 1 (lines 12 and 13): a
	// hold at the low point, where block 2 starts from its own first row.
	_, err := readString(twoBlocks(0.5, false, 0), Options{})
	wantParseError(t, err, ErrProtocol, 13, 0, "protocol \"1:1\"", "lines 2–12 and 13–23", "different directions", "own label")
	_, err = readString(twoBlocks(0.5, true, 2), Options{})
	wantParseError(t, err, ErrProtocol, 13, 0, "lines 2–7 and 13–18", "both hold cycle 1")
	_, err = readString(twoBlocks(0.5, true, 1), Options{})
	wantParseError(t, err, ErrProtocol, 13, 0, "lines 2–12 and 13–23", "different directions")
	s, err := readString(twoBlocks(1, false, 0), Options{Cycle: CycleAll})
	if err != nil {
		t.Fatalf("one protocol in two cycles: %v", err)
	}
	if len(s.Protocols) != 1 || s.Protocols[0].Cycles != 2 {
		t.Errorf("%d protocols, %d cycles; want one protocol with two cycles", len(s.Protocols), s.Protocols[0].Cycles)
	}
}

// Finding 4: stretches and stresses beyond the plausible range are bad
// input at their line and column; the range can be widened.
func TestImplausibleValues(t *testing.T) {
	for _, v := range []string{"1e308", "1e-308", "1e-9", "5.1", "0.19"} {
		_, err := readString(goodHeader+goodRows+"1:1,"+v+",1.1,20,20\n", Options{})
		pe := wantParseError(t, err, ErrStretchLimit, 7, 2, "stretch_1 is", "outside the plausible range 0.2 to 5")
		if !errors.Is(pe, ErrRange) {
			t.Errorf("%s: not in the ErrRange category", v)
		}
	}
	_, err := readString(goodHeader+goodRows+"1:1,1.1,1.1,1e308,20\n", Options{})
	wantParseError(t, err, ErrStressLimit, 7, 4, "cauchy_11 is 1e+308 kPa", "±1e+06 kPa")
	_, err = readString("protocol,stretch_1,stretch_2,cauchy_11 [MPa],cauchy_22 [MPa]\n"+goodRows+"1:1,1.1,1.1,1001,2\n", Options{})
	wantParseError(t, err, ErrStressLimit, 7, 4, "cauchy_11 [MPa] is 1001 MPa")
	// Loads are limited through the stress they give: 1e6 N over
	// 10 mm × 0.5 mm is 2e8 kPa (hand-computed).
	geo := "# thickness = 0.5 mm\n# size_1 = 10 mm\n# size_2 = 10 mm\nprotocol,stretch_1,stretch_2,load_1 [N],load_2 [N]\n"
	_, err = readString(geo+"1:1,1.1,1.1,1e6,1\n", Options{})
	wantParseError(t, err, ErrStressLimit, 5, 4, "load_1 [N] = 1e+06 N gives a nominal stress of 2e+08 kPa")
	// F columns: the principal stretches of F (singular values), here 6 and 1.
	_, err = readString("protocol,F11,F12,F21,F22,cauchy_11,cauchy_22\n1:1,6,0,0,1,0,0\n", Options{})
	wantParseError(t, err, ErrStretchLimit, 2, 2, "principal stretches 6 and 1")
	// Widened limits accept the same rows.
	wide := Options{Limits: Limits{StretchMin: 1e-3, StretchMax: 10, MaxStressKPa: 1e9}}
	if _, err := ReadRecord(strings.NewReader("protocol,F11,F12,F21,F22,cauchy_11,cauchy_22\n1:1,6,0,0,1,1e8,0\n"), "data.csv", wide); err != nil {
		t.Errorf("widened limits: %v", err)
	}
	if _, err := readString(goodHeader+goodRows, Options{Limits: Limits{StretchMin: 1.5}}); !errors.Is(err, ErrOptions) {
		t.Errorf("a stretch range without 1: %v", err)
	}
}

// Finding 10: file size, rows, --resample and workbook expansion are
// limited, each with a message naming the limit.
func TestSizeLimits(t *testing.T) {
	in := goodHeader + goodRows
	_, err := ReadRecord(strings.NewReader(in), "data.csv", Options{Limits: Limits{MaxBytes: 100}})
	wantParseError(t, err, ErrFileSize, 0, 0, "larger than 100 bytes")
	if !errors.Is(err, ErrLimit) {
		t.Error("file size error is not in the ErrLimit category")
	}
	// An endless stream (as /dev/zero) stops at the limit.
	_, err = ReadRecord(zeroReader{}, "zero", Options{Limits: Limits{MaxBytes: 1 << 16}})
	wantParseError(t, err, ErrFileSize, 0, 0, "larger than 65536 bytes")
	path := filepath.Join(t.TempDir(), "data.csv")
	os.WriteFile(path, []byte(in), 0o644)
	_, err = ReadRecordFile(path, Options{Limits: Limits{MaxBytes: 100}})
	wantParseError(t, err, ErrFileSize, 0, 0, "data.csv")

	_, err = ReadRecord(strings.NewReader(in), "data.csv", Options{Limits: Limits{MaxRows: 4}})
	wantParseError(t, err, ErrRowCount, 6, 0, "more than 4 data rows")

	_, err = readString(in, Options{Resample: 2_000_000})
	if !errors.Is(err, ErrRowCount) || !errors.Is(err, ErrOptions) || !strings.Contains(err.Error(), "row limit of 1000000") {
		t.Errorf("--resample beyond the row limit: %v", err)
	}

	// A workbook whose parts expand beyond the limit; the reader writes no
	// temporary file meanwhile (an interrupted run could not remove it).
	tmp := t.TempDir()
	t.Setenv("TMPDIR", tmp)
	data := makeWorkbook(t, "")
	_, err = Read(bytes.NewReader(data), "tests.xlsx", Options{Sheet: "SYN-3", Limits: Limits{MaxWorkbookBytes: 2000}})
	wantParseError(t, err, ErrWorkbookSize, 0, 0, "expands to more than 2000 bytes")
	if _, err := Read(bytes.NewReader(data), "tests.xlsx", Options{Sheet: "SYN-3"}); err != nil {
		t.Fatal(err)
	}
	if left, _ := os.ReadDir(tmp); len(left) > 0 {
		t.Errorf("the workbook reader left %d temporary files", len(left))
	}
}

type zeroReader struct{}

func (zeroReader) Read(p []byte) (int, error) {
	clear(p)
	return len(p), nil
}

// Finding 11 (data files): strict numbers, UTF-8 only, carriage-return
// line ends, short rows, long values clipped in messages, over-long labels.
func TestStrictReading(t *testing.T) {
	for _, c := range []struct{ v, why string }{
		{"1_000", "digit separators"}, {"0x1p3", "hexadecimal"}, {"1.2.3", "not a number"}, {"1e", "exponent"}, {"--1", "not a number"},
	} {
		_, err := readString(goodHeader+goodRows+"1:1,1.1,"+c.v+",20,20\n", Options{})
		wantParseError(t, err, ErrNumber, 7, 3, `stretch_2 is "`+c.v+`"`, c.why)
	}
	_, err := readString("# tissue = caf\xe9\n"+goodHeader+goodRows, Options{})
	wantParseError(t, err, ErrSyntax, 1, 0, "not UTF-8", "0xE9", "save the file as UTF-8")

	s, err := readString(strings.ReplaceAll(goodHeader+goodRows, "\n", "\r"), Options{})
	if err != nil || s.NumPoints() != 5 || !strings.Contains(strings.Join(s.Notices, "\n"), "carriage returns only") {
		t.Errorf("carriage-return line ends: %v", err)
	}

	long := strings.Repeat("é", 1<<20)
	_, err = readString(goodHeader+goodRows+"1:1,1.1,"+long+",20,20\n", Options{})
	if err == nil || utf8.RuneCountInString(err.Error()) > 300 {
		t.Errorf("a 1 MB cell gives a message of %d characters", utf8.RuneCountInString(fmt.Sprint(err)))
	}
	_, err = readString(goodHeader+long+",1,1,0,0\n", Options{})
	wantParseError(t, err, ErrProtocol, 2, 1, "label is 1048576 characters long")
	if utf8.RuneCountInString(err.Error()) > 300 {
		t.Errorf("a 1 MB label gives a message of %d characters", utf8.RuneCountInString(err.Error()))
	}
}

// Finding 11 (workbooks): a TRUE/FALSE cell or a date where a number is
// read is refused with its cell, not read as 1 or as a day count.
func TestWorkbookBooleansAndDates(t *testing.T) {
	for _, c := range []struct {
		set  func(f *excelize.File)
		want string
	}{
		{func(f *excelize.File) { f.SetCellBool("SYN-3", "D9", true) }, "load_1 [mN] is the logical value TRUE"},
		{func(f *excelize.File) { f.SetCellValue("SYN-3", "D9", time.Date(2024, 1, 2, 0, 0, 0, 0, time.UTC)) }, "is the date or time"},
	} {
		f, err := excelize.OpenReader(bytes.NewReader(makeWorkbook(t, "")))
		if err != nil {
			t.Fatal(err)
		}
		c.set(f)
		var buf bytes.Buffer
		f.Write(&buf)
		_, err = Read(bytes.NewReader(buf.Bytes()), "tests.xlsx", Options{Sheet: "SYN-3"})
		wantParseError(t, err, ErrNumber, 9, 4, "tests.xlsx:SYN-3!D9", c.want)
	}
	// Number formats that only change the display stay numbers.
	f, _ := excelize.OpenReader(bytes.NewReader(makeWorkbook(t, "")))
	for i, nf := range []int{2, 4, 9, 11, 12} { // 0.00, #,##0.00, 0%, 0.00E+00, # ?/?
		st, _ := f.NewStyle(&excelize.Style{NumFmt: nf})
		f.SetCellStyle("SYN-3", cellName(4, 7+i), cellName(4, 7+i), st)
	}
	var buf bytes.Buffer
	f.Write(&buf)
	if _, err := Read(bytes.NewReader(buf.Bytes()), "tests.xlsx", Options{Sheet: "SYN-3"}); err != nil {
		t.Errorf("display formats: %v", err)
	}
}

// A protocol label typed as 1:1 that the spreadsheet stored as the time
// 1:01 (a fraction of a day, 61/1440, under the h:mm format, numFmtId 20)
// or as a date is refused with its cell, not read silently as the label
// "0.042361111111111106" (synthetic workbook; every label cell of the
// protocol, rows 7 to 12, so that nothing else stops the file).
func TestWorkbookLabelAsTime(t *testing.T) {
	for _, c := range []struct {
		set  func(f *excelize.File, cell string)
		want []string
	}{
		{func(f *excelize.File, cell string) {
			st, _ := f.NewStyle(&excelize.Style{NumFmt: 20}) // h:mm
			f.SetCellFloat("SYN-3", cell, 61.0/1440, -1, 64)
			f.SetCellStyle("SYN-3", cell, cell, st)
		}, []string{`protocol is the time "`, `1:01"`, "0.04236111", "turned the ratio into a time"}},
		{func(f *excelize.File, cell string) {
			f.SetCellValue("SYN-3", cell, time.Date(2024, 1, 2, 0, 0, 0, 0, time.UTC))
		}, []string{"protocol is the date", "turned the ratio into a date"}},
	} {
		f, err := excelize.OpenReader(bytes.NewReader(makeWorkbook(t, "")))
		if err != nil {
			t.Fatal(err)
		}
		for r := 7; r <= 12; r++ {
			c.set(f, cellName(1, r))
		}
		var buf bytes.Buffer
		f.Write(&buf)
		_, err = Read(bytes.NewReader(buf.Bytes()), "tests.xlsx", Options{Sheet: "SYN-3"})
		pe := wantParseError(t, err, ErrProtocol, 7, 1, append([]string{"tests.xlsx:SYN-3!A7"}, c.want...)...)
		if !strings.Contains(pe.Fix, "as text") {
			t.Errorf("fix %q does not say to store the labels as text", pe.Fix)
		}
	}
	// A plain number as a label stays a label.
	f, _ := excelize.OpenReader(bytes.NewReader(makeWorkbook(t, "")))
	for r := 7; r <= 12; r++ {
		f.SetCellInt("SYN-3", cellName(1, r), 2)
	}
	var buf bytes.Buffer
	f.Write(&buf)
	if s, err := Read(bytes.NewReader(buf.Bytes()), "tests.xlsx", Options{Sheet: "SYN-3"}); err != nil || s.Protocols[0].Label != "2" {
		t.Errorf("a number as a label: %v", err)
	}
}
