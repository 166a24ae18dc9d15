package biaxial

import (
	"bufio"
	"io"
	"strings"
	"unicode/utf8"
	"unsafe"
)

// csvReader splits RFC 4180 text into records as it reads it, line by line,
// keeping line numbers. A line is a view of the bufio.Reader's buffer and
// its fields are substrings of it, valid until the next line is read:
// reading allocates nothing per line, so memory holds what the rows keep
// and little else. Whatever outlives its line is copied — metadata, the
// header, protocol labels, messages — and a quoted field that spans lines
// is built in a buffer. The one exception is classic Mac text, whose lines
// end in carriage returns alone: only the absence of any line feed tells it
// apart, so such a file is read whole.
type csvReader struct {
	br      *bufio.Reader
	readErr func(error) error // turns a failed read into the error to report
	p       *tableParser
	line    int    // number of the line read last (1-based)
	mac     string // the rest of a classic Mac text, line feeds for its line ends
	macMode bool
	started bool
	sep     byte
	fields  []string
	buf     []byte
}

// next returns the next physical line with its line feed (none at the end
// of the input); ok is false when the input is exhausted. Every line is
// checked to be UTF-8 before it is used.
func (s *csvReader) next() (ln string, ok bool, err error) {
	if s.macMode {
		if s.mac == "" {
			return "", false, nil
		}
		i := strings.IndexByte(s.mac, '\n')
		if i < 0 {
			ln, s.mac = s.mac, ""
		} else {
			ln, s.mac = s.mac[:i+1], s.mac[i+1:]
		}
		s.line++
		return ln, true, nil
	}
	ln, err = s.readLine()
	if err != nil && err != io.EOF {
		return "", false, s.readErr(err)
	}
	if ln == "" {
		return "", false, nil
	}
	s.line++
	if err := checkUTF8(s.p, s.line, ln); err != nil {
		return "", false, err
	}
	if !s.started {
		s.started = true
		if !strings.Contains(ln, "\n") && strings.Contains(ln, "\r") {
			// No line feed in the whole input: classic Mac line ends.
			s.p.notice("%s: the lines end in carriage returns only (classic Mac text); they are read as line breaks", s.p.file)
			s.macMode, s.mac, s.line = true, strings.ReplaceAll(ln, "\r", "\n"), 0
			return s.next()
		}
	}
	return ln, true, nil
}

// readLine returns the next line with its line feed, as
// bufio.Reader.ReadString('\n') would, but as a view of the reader's
// buffer when the line fits it (nearly every line does): the text is valid
// until the next read only.
func (s *csvReader) readLine() (string, error) {
	b, err := s.br.ReadSlice('\n')
	if err != bufio.ErrBufferFull {
		if len(b) == 0 {
			return "", err
		}
		return unsafe.String(&b[0], len(b)), err
	}
	long := append([]byte(nil), b...)
	for err == bufio.ErrBufferFull {
		b, err = s.br.ReadSlice('\n')
		long = append(long, b...)
	}
	return string(long), err
}

// record reads one record that starts in ln and, while a quoted field is
// open at the end of a line, goes on with the lines after it. It returns
// the fields, or the column (1-based) and a message when the quoting is
// broken; err is a read error.
func (s *csvReader) record(ln string) (fields []string, errCol int, errMsg string, err error) {
	s.fields = s.fields[:0]
	d := ln
	i := 0
	for {
		// Start of a field: leading blanks are not part of it.
		for i < len(d) && (d[i] == ' ' || d[i] == '\t') && d[i] != s.sep {
			i++
		}
		if i < len(d) && d[i] == '"' {
			var field string
			field, d, i, errMsg, err = s.quoted(d, i+1)
			if err != nil || errMsg != "" {
				return nil, len(s.fields) + 1, errMsg, err
			}
			for i < len(d) && (d[i] == ' ' || d[i] == '\t') && d[i] != s.sep {
				i++
			}
			if i < len(d) && d[i] == '\r' {
				i++
			}
			s.fields = append(s.fields, field)
			switch {
			case i >= len(d) || d[i] == '\n':
				return s.fields, 0, "", nil
			case d[i] == s.sep:
				i++
				continue
			}
			return nil, len(s.fields), "text follows the closing quote of a quoted field", nil
		}
		// Unquoted field: up to the separator or the end of the line (d
		// holds one line, so a line feed can only be its last byte).
		j := strings.IndexByte(d[i:], s.sep)
		if j < 0 {
			j = len(d)
			if d[j-1] == '\n' {
				j--
			}
		} else {
			j += i
		}
		field := d[i:j]
		if len(field) > 0 && field[len(field)-1] == '\r' {
			field = field[:len(field)-1]
		}
		s.fields = append(s.fields, field)
		if j >= len(d) || d[j] == '\n' {
			return s.fields, 0, "", nil
		}
		i = j + 1
	}
}

// quoted reads a quoted field whose text starts at d[i], reading further
// lines while the field is open. It returns the field, the line and
// position just after the closing quote, or a message when the input ends
// inside the field (the line number is then that of the opening quote).
func (s *csvReader) quoted(d string, i int) (field, rest string, pos int, errMsg string, err error) {
	startLine := s.line
	from := i // the text from here on is not yet in s.buf
	built := false
	s.buf = s.buf[:0]
	for {
		j := strings.IndexByte(d[i:], '"')
		if j < 0 {
			// The field goes on in the next line, which replaces this one
			// in the reader's buffer: what is kept of it is copied first.
			s.buf = append(s.buf, d[from:]...)
			built = true
			for k, f := range s.fields {
				s.fields[k] = strings.Clone(f)
			}
			next, ok, err := s.next()
			if err != nil {
				return "", "", 0, "", err
			}
			if !ok {
				s.line = startLine
				return "", "", 0, "a quoted field is never closed", nil
			}
			d, i, from = next, 0, 0
			continue
		}
		if i+j+1 < len(d) && d[i+j+1] == '"' {
			// A doubled quote stands for one.
			s.buf = append(s.buf, d[from:i+j+1]...)
			built = true
			i += j + 2
			from = i
			continue
		}
		if built {
			s.buf = append(s.buf, d[from:i+j]...)
			return string(s.buf), d, i + j + 1, "", nil
		}
		return d[from : i+j], d, i + j + 1, "", nil
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

// readCSV parses CSV text from br into p, line by line. readErr turns a
// failed read into the error to report.
func readCSV(br *bufio.Reader, p *tableParser, readErr func(error) error) (*Record, error) {
	if err := encoding(br, p, readErr); err != nil {
		return nil, err
	}
	s := &csvReader{br: br, readErr: readErr, p: p}
	for {
		ln, ok, err := s.next()
		if err != nil {
			return nil, err
		}
		if !ok {
			break
		}
		t := strings.TrimSpace(ln)
		if t == "" {
			continue
		}
		if t[0] == '#' {
			if err := p.comment(s.line, t[1:]); err != nil {
				return nil, err
			}
			continue
		}
		if !p.header {
			s.setSeparator(ln)
		}
		line := s.line
		fields, errCol, errMsg, err := s.record(ln)
		if err != nil {
			return nil, err
		}
		if errMsg != "" {
			return nil, p.errAt(s.line, errCol, ErrSyntax, "close or double the quote (\"\" inside a quoted field)", "%s", errMsg)
		}
		if allBlank(fields) {
			continue
		}
		if !p.header {
			for k, f := range fields {
				fields[k] = strings.Clone(f) // the header outlives its line
			}
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

// encoding skips a UTF-8 byte-order mark and refuses UTF-16 text.
func encoding(br *bufio.Reader, p *tableParser, readErr func(error) error) error {
	head, err := br.Peek(3)
	if err != nil && err != io.EOF && err != bufio.ErrBufferFull {
		return readErr(err)
	}
	switch h := string(head); {
	case h == "\xef\xbb\xbf":
		br.Discard(3)
	case strings.HasPrefix(h, "\xff\xfe"), strings.HasPrefix(h, "\xfe\xff"):
		return p.errAt(1, 0, ErrSyntax, "save the file as UTF-8 (with or without BOM)",
			"the file is UTF-16 encoded")
	}
	return nil
}

// setSeparator takes the separator from the header line.
func (s *csvReader) setSeparator(ln string) {
	p := s.p
	s.sep = detectSeparator(ln)
	p.sep = s.sep
	p.decCommaOK = s.sep != ','
	switch s.sep {
	case ';':
		p.notice("%s: semicolon-separated file detected", p.file)
	case '\t':
		p.notice("%s: tab-separated file detected", p.file)
	}
}

// checkUTF8 refuses a line that is not UTF-8, naming the character of the
// first byte that does not decode: read as UTF-8, Latin-1 or Windows-1252
// text would silently turn into replacement characters.
func checkUTF8(p *tableParser, line int, ln string) error {
	if utf8.ValidString(ln) {
		return nil
	}
	off := 0
	for off < len(ln) {
		r, size := utf8.DecodeRuneInString(ln[off:])
		if r == utf8.RuneError && size == 1 {
			break
		}
		off += size
	}
	col := 1 + utf8.RuneCountInString(ln[:off])
	return p.errAt(line, 0, ErrSyntax, "save the file as UTF-8 (in spreadsheet programs: CSV UTF-8); Latin-1 or Windows-1252 text is not read",
		"the text is not UTF-8: byte 0x%02X at character %d of the line does not decode", ln[off], col)
}
