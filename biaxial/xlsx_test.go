package biaxial

import (
	"bytes"
	"errors"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// makeWorkbook builds a synthetic two-sheet workbook: "notes" (prose only)
// and "SYN-3" holding a specimen in the weft layout. bad, if not empty,
// replaces cell C9.
func makeWorkbook(t testing.TB, bad string) []byte {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	if err := f.SetSheetName("Sheet1", "notes"); err != nil {
		t.Fatal(err)
	}
	f.SetCellStr("notes", "A1", "synthetic workbook for the weft tests")
	if _, err := f.NewSheet("SYN-3"); err != nil {
		t.Fatal(err)
	}
	sh := "SYN-3"
	f.SetCellStr(sh, "A1", "# specimen = SYN-3 (synthetic)")
	f.SetCellStr(sh, "A2", "# thickness =")
	f.SetCellStr(sh, "B2", "0.5")
	f.SetCellStr(sh, "C2", "mm")
	f.SetCellStr(sh, "A3", "# size_1 = 10 mm")
	f.SetCellStr(sh, "A4", "# size_2 = 10 mm")
	// Row 5 left empty on purpose.
	for i, h := range []string{"protocol", "stretch_1", "stretch_2", "load_1 [mN]", "load_2 [mN]"} {
		cell, _ := excelize.CoordinatesToCellName(i+1, 6)
		f.SetCellStr(sh, cell, h)
	}
	twoDecimals, err := f.NewStyle(&excelize.Style{NumFmt: 2}) // shows 0.00
	if err != nil {
		t.Fatal(err)
	}
	for r := 0; r < 6; r++ {
		row := 7 + r
		lam := 1 + 0.02*float64(r) + 1e-9 // digits a cell format would hide
		f.SetCellStr(sh, cellName(1, row), "1:1")
		f.SetCellFloat(sh, cellName(2, row), lam, -1, 64)
		f.SetCellFloat(sh, cellName(3, row), lam, -1, 64)
		f.SetCellStyle(sh, cellName(2, row), cellName(3, row), twoDecimals)
		f.SetCellInt(sh, cellName(4, row), int64(100*r))
		f.SetCellInt(sh, cellName(5, row), int64(50*r))
	}
	f.SetCellStr(sh, "E12", "250,0") // a decimal comma typed as text
	if bad != "" {
		f.SetCellStr(sh, "C9", bad)
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func TestXLSXRead(t *testing.T) {
	data := makeWorkbook(t, "")
	s, err := Read(bytes.NewReader(data), "tests.xlsx", Options{Sheet: "SYN-3"})
	if err != nil {
		t.Fatal(err)
	}
	if s.Name != "SYN-3 (synthetic)" || s.Sheet != "SYN-3" || s.Geometry == nil || s.Geometry.Thickness != 0.5 {
		t.Fatalf("specimen %q sheet %q geometry %+v", s.Name, s.Sheet, s.Geometry)
	}
	pr := s.Protocols[0]
	if len(pr.Points) != 6 || pr.Points[0].Line != 7 {
		t.Fatalf("%d points from row %d; want 6 from row 7", len(pr.Points), pr.Points[0].Line)
	}
	// Raw cell values keep every digit.
	if got := pr.Points[1].F[0]; got != 1.02+1e-9 {
		t.Errorf("stretch %v, want %v (unformatted)", got, 1.02+1e-9)
	}
	// 500 mN over W2·H = 10 mm · 0.5 mm → 0.5 / 5e-6 Pa = 100 kPa (Sacks 2000
	// conversion, hand-computed); 250 mN on axis 2 → 50 kPa.
	if p := pr.Points[5]; !near(p.Stress[C11], 100, 1e-12) || !near(p.Stress[C22], 50, 1e-12) {
		t.Errorf("stress %v, %v; want 100, 50 kPa", p.Stress[C11], p.Stress[C22])
	}

	// From a file path, first sheet by default: "notes" has no header.
	path := filepath.Join(t.TempDir(), "tests.xlsx")
	if err := writeFile(path, data); err != nil {
		t.Fatal(err)
	}
	_, err = ReadFile(path, Options{})
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Sheet != "notes" || !errors.Is(err, ErrMissingColumn) {
		t.Errorf("first sheet without header: %v", err)
	}
	// It names the sheet read and the others, where the record may be.
	if err == nil || !strings.Contains(err.Error(), `sheets, "notes", was read; the others are "SYN-3"`) {
		t.Errorf("first sheet without header: the error does not name the other sheets: %v", err)
	}
	_, err = ReadFile(path, Options{Sheet: "nope"})
	if err == nil || !strings.Contains(err.Error(), `no sheet "nope"`) || !strings.Contains(err.Error(), `"SYN-3"`) {
		t.Errorf("unknown sheet: %v", err)
	}
}

func TestXLSXErrorsNameTheCell(t *testing.T) {
	data := makeWorkbook(t, "-1.04")
	_, err := Read(bytes.NewReader(data), "tests.xlsx", Options{Sheet: "SYN-3"})
	pe := wantParseError(t, err, ErrRange, 9, 3, "tests.xlsx:SYN-3!C9:", "stretch_2 is -1.04")
	if pe.Cell != "C9" || pe.Sheet != "SYN-3" {
		t.Errorf("cell %q sheet %q", pe.Cell, pe.Sheet)
	}
	data = makeWorkbook(t, "n/a")
	_, err = Read(bytes.NewReader(data), "tests.xlsx", Options{Sheet: "SYN-3"})
	wantParseError(t, err, ErrNumber, 9, 3, "SYN-3!C9", `"n/a"`)
	_, err = Read(bytes.NewReader([]byte("PK\x03\x04broken")), "broken.xlsx", Options{})
	if !errors.Is(err, ErrSyntax) || !strings.Contains(err.Error(), "broken.xlsx") {
		t.Errorf("broken workbook: %v", err)
	}
}

func TestCellName(t *testing.T) {
	// A1 references (ECMA-376 / common spreadsheet practice): column 27 is AA.
	for _, c := range []struct {
		col, row int
		want     string
	}{{1, 1, "A1"}, {26, 3, "Z3"}, {27, 14, "AA14"}, {703, 2, "AAA2"}} {
		if got := cellName(c.col, c.row); got != c.want {
			t.Errorf("cellName(%d,%d) = %s, want %s", c.col, c.row, got, c.want)
		}
		if want, _ := excelize.CoordinatesToCellName(c.col, c.row); want != c.want {
			t.Errorf("excelize disagrees: %s", want)
		}
	}
}

// A cell written with a formula but no stored result (a workbook saved by
// a program that does not calculate; in the xlsx format a cell's formula
// and its cached value are separate elements, ECMA-376 Part 1, from
// memory) reads as empty: the error says it holds a formula and how to get
// its result stored, instead of calling the cell empty.
func TestXLSXFormulaWithoutResult(t *testing.T) {
	f, err := excelize.OpenReader(bytes.NewReader(makeWorkbook(t, "")))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if err := f.SetCellValue("SYN-3", "C9", nil); err != nil {
		t.Fatal(err)
	}
	if err := f.SetCellFormula("SYN-3", "C9", "B9"); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	_, err = Read(bytes.NewReader(buf.Bytes()), "tests.xlsx", Options{Sheet: "SYN-3"})
	pe := wantParseError(t, err, ErrNumber, 9, 3, "SYN-3!C9", "stretch_2 holds the formula =B9 but no stored result")
	if !strings.Contains(pe.Fix, "save it") {
		t.Errorf("the fix does not say how to store the result: %q", pe.Fix)
	}
	// A cell left empty is still called empty.
	if err := f.SetCellFormula("SYN-3", "C9", ""); err != nil {
		t.Fatal(err)
	}
	buf.Reset()
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	_, err = Read(bytes.NewReader(buf.Bytes()), "tests.xlsx", Options{Sheet: "SYN-3"})
	wantParseError(t, err, ErrNumber, 9, 3, "SYN-3!C9", "stretch_2 is empty")
}

// A refusal in a workbook names rows as rows: until 2026-12-05 a cycle
// pasted again with its number read "the rows at rows 3–41 and 120–130
// both hold cycle 2" and "the rows at rows 120–130 repeat those at rows
// 61–71". The rows are those of TestRefusalNamesPastedBlock (synthetic
// neo-Hookean cycles), one per sheet row from row 3.
func TestXLSXRefusalNamesRows(t *testing.T) {
	base := cyclicRows(4, "1:1", 1, 3, 20, 0.002, 0.01, 6)
	rows := append([]string(nil), base...)
	rows = append(rows, base[39+19:39+30]...) // cycle 2's peak and 10 rows down, pasted again
	f := excelize.NewFile()
	defer f.Close()
	sh := "Sheet1"
	f.SetCellStr(sh, "A1", "# specimen = BLOCK (synthetic)")
	for i, h := range strings.Split("protocol,cycle,time [s],F11,F12,F21,F22,cauchy_11 [kPa],cauchy_22 [kPa]", ",") {
		f.SetCellStr(sh, cellName(i+1, 2), h)
	}
	for r, line := range rows {
		for i, v := range strings.Split(line, ",") {
			if i == 0 {
				f.SetCellStr(sh, cellName(1, r+3), v)
				continue
			}
			x, err := strconv.ParseFloat(v, 64)
			if err != nil {
				t.Fatal(err)
			}
			f.SetCellFloat(sh, cellName(i+1, r+3), x, -1, 64)
		}
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	_, err := Read(bytes.NewReader(buf.Bytes()), "tests.xlsx", Options{})
	pe := wantParseError(t, err, ErrProtocol, 120, 0, `protocol "1:1": rows 42–80 and 120–130 both hold cycle 2`, "; rows 120–130 repeat rows 61–71")
	if strings.Contains(pe.Error(), "the rows at rows") {
		t.Errorf("rows named as lines of text: %v", pe)
	}
}

// workbookOf writes CSV text into the first sheet of a workbook, one
// sheet row per line: comment lines and the header as text, data cells as
// numbers where they read as one (the protocol label stays text).
func workbookOf(t *testing.T, text string) []byte {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	for r, line := range strings.Split(strings.TrimSuffix(text, "\n"), "\n") {
		if strings.HasPrefix(line, "#") {
			f.SetCellStr("Sheet1", cellName(1, r+1), line)
			continue
		}
		for i, v := range strings.Split(line, ",") {
			if x, err := strconv.ParseFloat(v, 64); err == nil && i > 0 {
				f.SetCellFloat("Sheet1", cellName(i+1, r+1), x, -1, 64)
			} else {
				f.SetCellStr("Sheet1", cellName(i+1, r+1), v)
			}
		}
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// The held-load warning and the refusal of a branch shorter than the
// smoothing window name a workbook's rows as rows, as the other messages
// of a workbook do (TestXLSXRefusalNamesRows): until 2026-12-05 they read
// "(lines 24–28)" and "protocol 1:1 (rows from line 3): … in the branch
// from line 3" for sheet rows. The
// data are TestHeldLoadWarning's (synthetic), one sheet row per line.
func TestXLSXHoldAndSmoothingNameRows(t *testing.T) {
	book := workbookOf(t, heldLoadFile())
	s, err := Read(bytes.NewReader(book), "hold.xlsx", Options{})
	if err != nil {
		t.Fatal(err)
	}
	var held []string
	for _, w := range s.Warnings {
		if strings.Contains(w.Message, "stop the stress's rise") {
			held = append(held, w.Message)
		}
	}
	if len(held) != 1 || !strings.Contains(held[0], "the last 5 kept rows of cycle 1 (rows 24–28)") {
		t.Errorf("held-load warning in a workbook: %q, want the held rows named as rows 24–28", held)
	}
	_, err = Read(bytes.NewReader(book), "hold.xlsx", Options{SmoothStrain: 31})
	pe := wantParseError(t, err, ErrProtocol, 3, 0, "protocol 1:1 (from row 3): keeps 26 points in the branch from row 3 (cycle 1), fewer than the smoothing window of 31")
	if strings.Contains(pe.Error(), "line") {
		t.Errorf("sheet rows named as lines of text: %v", pe)
	}
}

// A workbook with a blank cell in the sheet's last column (XFD, 16 384
// cells across) on each of its first 100 rows unpacks to a few tens of
// kilobytes, but the workbook library hands each of those rows out as 16
// 384 cells: a hundred thousand such rows would take minutes to read. The
// reader stops once the cells handed out pass the workbook's unpacked size
// (or 2^20 cells for a small one), with an error naming the far cell.
// Until 2026-12-05 it read on: a 52 kB workbook of such rows took 3 s of
// CPU and a 0.5 MB one about half a minute (found while fuzzing the
// workbook reader, by checking that work grows with the input's size).
func TestXLSXFarCellIsRefused(t *testing.T) {
	f := excelize.NewFile()
	defer f.Close()
	sh := "Sheet1"
	f.SetCellStr(sh, "A1", "# specimen = far-cell (synthetic)")
	for r := 2; r <= 100; r++ {
		f.SetCellStr(sh, cellName(16384, r), " ")
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	_, err := ReadRecord(bytes.NewReader(buf.Bytes()), "far.xlsx", Options{})
	var pe *ParseError
	if !errors.As(err, &pe) || !errors.Is(err, ErrWorkbookSize) {
		t.Fatalf("err = %v, want a workbook size error", err)
	}
	if pe.Column != 16384 || pe.Line < 2 || pe.Line > 100 || !strings.HasPrefix(pe.Cell, "XFD") || !strings.Contains(pe.Msg, "column XFD") {
		t.Fatalf("error %v does not name the far cell", err)
	}
	// The same rows within the budget (a cell at column Z) read on to the
	// ordinary error for a sheet without a header.
	g := excelize.NewFile()
	defer g.Close()
	for r := 2; r <= 100; r++ {
		g.SetCellStr(sh, cellName(26, r), " ")
	}
	buf.Reset()
	if err := g.Write(&buf); err != nil {
		t.Fatal(err)
	}
	_, err = ReadRecord(bytes.NewReader(buf.Bytes()), "near.xlsx", Options{})
	if err == nil || errors.Is(err, ErrWorkbookSize) {
		t.Fatalf("a sheet reaching column Z: %v, want an error that is not about its size", err)
	}
}
