package biaxial

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"regexp"
	"strings"

	"github.com/xuri/excelize/v2"
)

// isXLSX reports whether a file looks like an xlsx workbook (a zip
// archive) by its name or the first bytes of its content.
func isXLSX(name string, head []byte) bool {
	return bytes.HasPrefix(head, []byte("PK\x03\x04")) || strings.EqualFold(extOf(name), ".xlsx")
}

func extOf(name string) string {
	i := strings.LastIndexByte(name, '.')
	if i < 0 || strings.ContainsAny(name[i:], `/\`) {
		return ""
	}
	return name[i:]
}

// readXLSX parses one sheet of a workbook with the same layout as a CSV
// file: metadata cells `# key = value` in column A before the header (or
// `# key =` in A with the value in the following cells), then a header row,
// then data rows. Cells are read unformatted, so numbers keep every digit.
// The workbook is held in memory, within the workbook limit; r is read
// once. unpacked is the workbook's unpacked size in bytes, which bounds
// the cells read (cellBudget). intoTable is as for newTableParser.
func readXLSX(r io.Reader, name, sheet string, lim Limits, unpacked int64, intoTable bool) (rec *Record, t *rawTable, err error) {
	defer func() {
		// A malformed workbook must not crash the program: the workbook
		// library's failure becomes an input error.
		if r := recover(); r != nil {
			rec, t, err = nil, nil, &ParseError{File: name, Sheet: sheet, Err: ErrSyntax, Msg: fmt.Sprintf("the workbook is damaged (%s)", clip(fmt.Sprint(r), 80)),
				Fix: "open and save it again in a spreadsheet program, or export the sheet as CSV"}
		}
	}()
	// The same limit for the whole workbook and for any one part keeps
	// every part in memory: the reader then writes no temporary files
	// (which an interrupted run could leave behind).
	f, err := excelize.OpenReader(r, excelize.Options{UnzipSizeLimit: lim.MaxWorkbookBytes, UnzipXMLSizeLimit: lim.MaxWorkbookBytes})
	if err != nil {
		return nil, nil, &ParseError{File: name, Err: ErrSyntax, Msg: "not a readable xlsx workbook (" + err.Error() + ")",
			Fix: "save the workbook as .xlsx, or export the sheet as CSV"}
	}
	defer f.Close()
	sheets := f.GetSheetList()
	if len(sheets) == 0 {
		return nil, nil, &ParseError{File: name, Err: ErrSyntax, Msg: "the workbook has no sheets"}
	}
	if sheet == "" {
		sheet = sheets[0]
		if len(sheets) > 1 {
			// A workbook whose first sheet holds notes rather than the
			// record fails with a header error; say which sheet was read
			// and which others there are.
			defer func() {
				var pe *ParseError
				if errors.As(err, &pe) && pe.Sheet == sheet && pe.Err == ErrMissingColumn {
					pe.Fix = strings.TrimSpace(pe.Fix + fmt.Sprintf(" (the first of the workbook's sheets, %s, was read; the others are %s)", quote(sheet), quoteList(sheets[1:])))
				}
			}()
		}
	} else {
		found := false
		for _, s := range sheets {
			if s == sheet {
				found = true
				break
			}
		}
		if !found {
			return nil, nil, &ParseError{File: name, Err: ErrOptions, Msg: fmt.Sprintf("the workbook has no sheet %s", quote(sheet)),
				Fix: "choose one of " + quoteList(sheets)}
		}
	}
	p := newTableParser(name, sheet, lim, intoTable)
	p.decCommaOK = true // text cells may be typed with a decimal comma
	rows, err := f.Rows(sheet)
	if err != nil {
		return nil, nil, &ParseError{File: name, Sheet: sheet, Err: ErrSyntax, Msg: "cannot read the sheet (" + err.Error() + ")"}
	}
	defer rows.Close()
	// A second pass over the same rows gives each cell as displayed, which
	// tells a TRUE/FALSE cell or a date from a number (their raw values are
	// 1/0 and a day count).
	shown, err := f.Rows(sheet)
	if err != nil {
		return nil, nil, &ParseError{File: name, Sheet: sheet, Err: ErrSyntax, Msg: "cannot read the sheet (" + err.Error() + ")"}
	}
	defer shown.Close()
	line := 0
	budget := cellBudget(unpacked)
	for rows.Next() {
		line++
		shown.Next()
		cells, err := rows.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			return nil, nil, p.errAt(line, 0, ErrSyntax, "", "cannot read the row (%v)", err)
		}
		if budget -= int64(len(cells)); budget < 0 {
			return nil, nil, farCellError(p, line, len(cells), unpacked)
		}
		if allBlank(cells) {
			continue
		}
		a := strings.TrimSpace(cells[0])
		if strings.HasPrefix(a, "#") {
			text := a[1:]
			if strings.HasSuffix(strings.TrimSpace(text), "=") {
				var rest []string
				for _, c := range cells[1:] {
					if c = strings.TrimSpace(c); c != "" {
						rest = append(rest, c)
					}
				}
				text += " " + strings.Join(rest, " ")
			}
			if err := p.comment(line, text); err != nil {
				return nil, nil, err
			}
			continue
		}
		if !p.header {
			err = p.setHeader(line, cells)
		} else {
			display, _ := shown.Columns()
			if budget -= int64(len(display)); budget < 0 {
				return nil, nil, farCellError(p, line, len(display), unpacked)
			}
			if err = p.cellTypes(line, cells, display); err == nil {
				err = p.row(line, cells)
			}
		}
		if err != nil {
			return nil, nil, p.uncachedFormula(f, cells, err)
		}
	}
	if err := rows.Error(); err != nil {
		return nil, nil, p.errAt(line, 0, ErrSyntax, "", "cannot read the sheet (%v)", err)
	}
	rec, err = p.finish()
	return rec, p.table, err
}

// The workbook library hands every row out as a slice of all its cells up
// to the last one written, blank ones included, so a stray cell far to the
// right (column XFD is 16 384 cells across), repeated down the rows, makes
// a workbook of a few tens of kilobytes cost billions of cells and minutes
// of reading. Every cell of a real sheet takes a dozen bytes or more of
// unpacked XML, so a sheet is read only while the cells handed out (each
// row counted once as stored and once as displayed) stay within the
// workbook's unpacked size, or minCellBudget for a small workbook.
const minCellBudget = 1 << 20

// cellBudget is how many cells a workbook that unpacks to unpacked bytes
// may hand out.
func cellBudget(unpacked int64) int64 {
	return max(unpacked, minCellBudget)
}

// farCellError is the error for a sheet whose rows reach past the cell
// budget; line is the row where it ran out and width that row's cells.
func farCellError(p *tableParser, line, width int, unpacked int64) *ParseError {
	return p.errAt(line, width, ErrWorkbookSize, "delete the cells to the right of the data (or export the sheet as CSV)",
		"the sheet's rows reach out to column %s, far more cells than the workbook's %s unpacked hold (a stray cell far to the right of the data, repeated down the rows)",
		strings.TrimSuffix(cellName(width, 1), "1"), sizeText(unpacked))
}

// uncachedFormula turns err, when it concerns a cell that reads empty
// but holds a formula, into an error that says so. A workbook written by a
// program that does not calculate (a script, a converter) stores formulas
// without their results, and the cell's value, which weft reads, is then
// empty although the sheet shows a number once opened.
func (p *tableParser) uncachedFormula(f *excelize.File, cells []string, err error) error {
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Cell == "" || pe.Column < 1 || (pe.Column <= len(cells) && strings.TrimSpace(cells[pe.Column-1]) != "") {
		return err
	}
	formula, ferr := f.GetCellFormula(p.sheet, pe.Cell)
	if ferr != nil || formula == "" || pe.Column > len(p.cols) {
		return err
	}
	pe.Err = ErrNumber
	pe.Msg = fmt.Sprintf("%s holds the formula =%s but no stored result", p.cols[pe.Column-1].header, clip(strings.TrimPrefix(formula, "="), 40))
	pe.Fix = "open the workbook in a spreadsheet program and save it (which stores each formula's result), or type the values, or export the sheet as CSV"
	return pe
}

func quoteList(xs []string) string {
	q := make([]string, len(xs))
	for i, x := range xs {
		q[i] = quote(x)
	}
	return strings.Join(q, ", ")
}

// dateLike matches how a spreadsheet displays a date or a time.
var dateLike = regexp.MustCompile(`\d{1,4}\s*[-/.]\s*\d{1,2}\s*[-/.]\s*\d{1,4}|\d{1,2}:\d{2}|(?i)\b(jan|feb|mar|apr|may|jun|jul|aug|sep|oct|nov|dec)[a-z]*\b`)

// cellTypes refuses a TRUE/FALSE cell or a date where weft reads a number:
// their raw values (1 or 0, a day count) would otherwise pass for data. It
// also refuses a protocol label that the spreadsheet stored as a date or
// time: a ratio typed as 1:1 becomes the time 1:01, whose raw value (a
// fraction of a day, 0.0423611…) would otherwise become the label.
func (p *tableParser) cellTypes(line int, raw, display []string) error {
	for i := range p.cols {
		if p.cols[i].role == roleIgnore || i >= len(raw) || i >= len(display) {
			continue
		}
		r, d := strings.TrimSpace(raw[i]), strings.TrimSpace(display[i])
		if r == d || numberSyntax(r) != "" {
			continue
		}
		if p.cols[i].role == roleProtocol {
			if dateLike.MatchString(d) {
				what := "date"
				if strings.Contains(d, ":") {
					what = "time"
				}
				return p.errAt(line, i+1, ErrProtocol, "format the protocol column as text and type the labels again (e.g. 1:1)",
					"%s is the %s %s (the cell holds the number %s), not a label: the spreadsheet turned the ratio into a %s",
					p.cols[i].header, what, quote(d), clip(r, 24), what)
			}
			continue
		}
		switch {
		case (d == "TRUE" || d == "FALSE") && (r == "1" || r == "0"):
			return p.errAt(line, i+1, ErrNumber, "type the measured number into the cell",
				"%s is the logical value %s, not a number", p.cols[i].header, d)
		case numberSyntax(strings.ReplaceAll(d, ",", "")) != "" && dateLike.MatchString(d):
			return p.errAt(line, i+1, ErrNumber, "format the column as a number (a date's raw value is a day count, not data)",
				"%s is the date or time %s, not a number", p.cols[i].header, quote(d))
		}
	}
	return nil
}
