package biaxial

import (
	"strings"
	"unicode/utf8"
)

// csvScanner splits RFC 4180 text into records, keeping line numbers. Fields
// are substrings of the input wherever possible, so scanning a large file
// allocates little.
type csvScanner struct {
	data   string
	pos    int
	line   int // line number at pos (1-based)
	sep    byte
	fields []string
	buf    []byte
}

// skipBlank advances over empty lines and reports whether input remains.
func (s *csvScanner) atLineStart() (comment bool, text string, ok bool) {
	for s.pos < len(s.data) {
		end := strings.IndexByte(s.data[s.pos:], '\n')
		var ln string
		if end < 0 {
			ln = s.data[s.pos:]
		} else {
			ln = s.data[s.pos : s.pos+end]
		}
		t := strings.TrimSpace(ln)
		if t == "" {
			s.advanceLine(end)
			continue
		}
		if t[0] == '#' {
			s.advanceLine(end)
			return true, t[1:], true
		}
		return false, "", true
	}
	return false, "", false
}

func (s *csvScanner) advanceLine(end int) {
	if end < 0 {
		s.pos = len(s.data)
	} else {
		s.pos += end + 1
	}
	s.line++
}

// record reads one record starting at pos. It returns the fields and an
// error message with the column (1-based) when the quoting is broken.
func (s *csvScanner) record() (fields []string, errCol int, errMsg string) {
	s.fields = s.fields[:0]
	d := s.data
	for {
		// Start of a field: leading blanks are not part of it.
		i := s.pos
		for i < len(d) && (d[i] == ' ' || d[i] == '\t') && d[i] != s.sep {
			i++
		}
		if i < len(d) && d[i] == '"' {
			startLine := s.line
			i++
			start := i
			s.buf = s.buf[:0]
			escaped := false
			for {
				j := strings.IndexByte(d[i:], '"')
				if j < 0 {
					s.line = startLine
					return nil, len(s.fields) + 1, "a quoted field is never closed"
				}
				s.line += strings.Count(d[i:i+j], "\n")
				if i+j+1 < len(d) && d[i+j+1] == '"' {
					s.buf = append(s.buf, d[i:i+j+1]...)
					i += j + 2
					escaped = true
					continue
				}
				var field string
				if escaped {
					s.buf = append(s.buf, d[i:i+j]...)
					field = string(s.buf)
				} else {
					field = d[start : i+j]
				}
				i += j + 1
				for i < len(d) && (d[i] == ' ' || d[i] == '\t') && d[i] != s.sep {
					i++
				}
				if i < len(d) && d[i] == '\r' {
					i++
				}
				s.fields = append(s.fields, field)
				switch {
				case i >= len(d):
					s.pos = i
					return s.fields, 0, ""
				case d[i] == s.sep:
					s.pos = i + 1
				case d[i] == '\n':
					s.pos = i + 1
					s.line++
					return s.fields, 0, ""
				default:
					return nil, len(s.fields), "text follows the closing quote of a quoted field"
				}
				break
			}
			continue
		}
		// Unquoted field: up to the separator or the end of the line.
		j := i
		for j < len(d) && d[j] != s.sep && d[j] != '\n' {
			j++
		}
		field := d[i:j]
		if len(field) > 0 && field[len(field)-1] == '\r' {
			field = field[:len(field)-1]
		}
		s.fields = append(s.fields, field)
		if j >= len(d) {
			s.pos = j
			return s.fields, 0, ""
		}
		if d[j] == '\n' {
			s.pos = j + 1
			s.line++
			return s.fields, 0, ""
		}
		s.pos = j + 1
	}
}

// detectSeparator picks the separator of the header line: the most frequent
// of comma, semicolon and tab outside quotes (comma on a tie).
func detectSeparator(line string) byte {
	var n [3]int
	inQ := false
	for i := 0; i < len(line); i++ {
		switch line[i] {
		case '"':
			inQ = !inQ
		case ',':
			if !inQ {
				n[0]++
			}
		case ';':
			if !inQ {
				n[1]++
			}
		case '\t':
			if !inQ {
				n[2]++
			}
		case '\n':
			i = len(line)
		}
	}
	switch {
	case n[1] > n[0] && n[1] >= n[2]:
		return ';'
	case n[2] > n[0] && n[2] > n[1]:
		return '\t'
	}
	return ','
}

func allBlank(fields []string) bool {
	for _, f := range fields {
		if strings.TrimSpace(f) != "" {
			return false
		}
	}
	return true
}

// readCSV parses a whole CSV text.
func readCSV(data, name string, lim Limits) (*Record, error) {
	p := newTableParser(name, "", lim)
	switch {
	case strings.HasPrefix(data, "\xef\xbb\xbf"):
		data = data[3:]
	case strings.HasPrefix(data, "\xff\xfe"), strings.HasPrefix(data, "\xfe\xff"):
		return nil, p.errAt(1, 0, ErrSyntax, "save the file as UTF-8 (with or without BOM)",
			"the file is UTF-16 encoded")
	}
	if err := checkUTF8(p, data); err != nil {
		return nil, err
	}
	if !strings.Contains(data, "\n") && strings.Contains(data, "\r") {
		// Classic Mac line ends: carriage returns alone.
		data = strings.ReplaceAll(data, "\r", "\n")
		p.notice("%s: the lines end in carriage returns only (classic Mac text); they are read as line breaks", name)
	}
	s := &csvScanner{data: data, line: 1}
	for {
		comment, text, ok := s.atLineStart()
		if !ok {
			break
		}
		if comment {
			if err := p.comment(s.line-1, text); err != nil {
				return nil, err
			}
			continue
		}
		if !p.header {
			s.sep = detectSeparator(data[s.pos:])
			p.sep = s.sep
			p.decCommaOK = s.sep != ','
			switch s.sep {
			case ';':
				p.notice("%s: semicolon-separated file detected", name)
			case '\t':
				p.notice("%s: tab-separated file detected", name)
			}
		}
		line := s.line
		fields, errCol, errMsg := s.record()
		if errMsg != "" {
			return nil, p.errAt(s.line, errCol, ErrSyntax, "close or double the quote (\"\" inside a quoted field)", "%s", errMsg)
		}
		if allBlank(fields) {
			continue
		}
		var err error
		if !p.header {
			err = p.setHeader(line, fields)
		} else {
			err = p.row(line, fields)
		}
		if err != nil {
			return nil, err
		}
	}
	return p.finish()
}

// checkUTF8 refuses text that is not UTF-8, naming the first line with a
// byte that does not decode: read as UTF-8, Latin-1 or Windows-1252 text
// would silently turn into replacement characters.
func checkUTF8(p *tableParser, data string) error {
	if utf8.ValidString(data) {
		return nil
	}
	off := 0
	for off < len(data) {
		r, size := utf8.DecodeRuneInString(data[off:])
		if r == utf8.RuneError && size == 1 {
			break
		}
		off += size
	}
	line := 1 + strings.Count(data[:off], "\n")
	col := 1 + utf8.RuneCountInString(data[strings.LastIndexByte(data[:off], '\n')+1:off])
	return p.errAt(line, 0, ErrSyntax, "save the file as UTF-8 (in spreadsheet programs: CSV UTF-8); Latin-1 or Windows-1252 text is not read",
		"the text is not UTF-8: byte 0x%02X at character %d of the line does not decode", data[off], col)
}
