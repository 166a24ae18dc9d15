package biaxial

import (
	"bytes"
	"fmt"
	"strings"

	"github.com/xuri/excelize/v2"
)

// isXLSX reports whether data look like an xlsx workbook (a zip archive).
func isXLSX(name string, data []byte) bool {
	return bytes.HasPrefix(data, []byte("PK\x03\x04")) || strings.EqualFold(extOf(name), ".xlsx")
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
func readXLSX(data []byte, name, sheet string) (rec *Record, err error) {
	f, err := excelize.OpenReader(bytes.NewReader(data))
	if err != nil {
		return nil, &ParseError{File: name, Err: ErrSyntax, Msg: "not a readable xlsx workbook (" + err.Error() + ")",
			Fix: "save the workbook as .xlsx, or export the sheet as CSV"}
	}
	defer f.Close()
	sheets := f.GetSheetList()
	if len(sheets) == 0 {
		return nil, &ParseError{File: name, Err: ErrSyntax, Msg: "the workbook has no sheets"}
	}
	if sheet == "" {
		sheet = sheets[0]
	} else {
		found := false
		for _, s := range sheets {
			if s == sheet {
				found = true
				break
			}
		}
		if !found {
			return nil, &ParseError{File: name, Err: ErrOptions, Msg: fmt.Sprintf("the workbook has no sheet %q", sheet),
				Fix: "choose one of " + quoteList(sheets)}
		}
	}
	p := newTableParser(name, sheet)
	p.decCommaOK = true // text cells may be typed with a decimal comma
	rows, err := f.Rows(sheet)
	if err != nil {
		return nil, &ParseError{File: name, Sheet: sheet, Err: ErrSyntax, Msg: "cannot read the sheet (" + err.Error() + ")"}
	}
	defer rows.Close()
	line := 0
	for rows.Next() {
		line++
		cells, err := rows.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			return nil, p.errAt(line, 0, ErrSyntax, "", "cannot read the row (%v)", err)
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
				return nil, err
			}
			continue
		}
		if !p.header {
			err = p.setHeader(line, cells)
		} else {
			err = p.row(line, cells)
		}
		if err != nil {
			return nil, err
		}
	}
	if err := rows.Error(); err != nil {
		return nil, p.errAt(line, 0, ErrSyntax, "", "cannot read the sheet (%v)", err)
	}
	return p.finish()
}

func quoteList(xs []string) string {
	q := make([]string, len(xs))
	for i, x := range xs {
		q[i] = fmt.Sprintf("%q", x)
	}
	return strings.Join(q, ", ")
}
