package biaxial

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Limits bound what a test file may hold and which values are plausible, so
// that a damaged or hostile file fails at once with a message naming the
// limit, instead of exhausting memory or handing absurd numbers to a fit.
// A zero field takes its value from DefaultLimits.
type Limits struct {
	// MaxBytes is the largest test file read, in bytes (default 128 MiB).
	MaxBytes int64
	// MaxRows is the most data rows a file may hold, and the most points
	// Options.Resample may ask for per protocol (default 1 000 000).
	MaxRows int
	// MaxWorkbookBytes bounds the uncompressed size of the parts of an xlsx
	// workbook, in bytes (default 256 MiB): a small workbook can expand
	// to far more than its file size.
	MaxWorkbookBytes int64
	// StretchMin and StretchMax bound the in-plane principal stretches of
	// every row (dimensionless; default 0.2 and 5). A stretch outside them
	// is a unit or column mix-up, not a measurement of soft tissue.
	StretchMin, StretchMax float64
	// MaxStressKPa bounds the magnitude of every stress value after unit
	// conversion, in kPa (default 1e6 kPa = 1 GPa, far above what soft
	// tissue bears).
	MaxStressKPa float64
}

// DefaultLimits are the limits used where Limits leaves a field zero.
var DefaultLimits = Limits{
	MaxBytes:         128 << 20,
	MaxRows:          1_000_000,
	MaxWorkbookBytes: 256 << 20,
	StretchMin:       0.2,
	StretchMax:       5,
	MaxStressKPa:     1e6,
}

// MaxLabelLength is the longest protocol label and specimen name, in
// characters (labels name files and table rows).
const MaxLabelLength = 100

// withDefaults fills the zero fields from DefaultLimits.
func (l Limits) withDefaults() Limits {
	d := DefaultLimits
	if l.MaxBytes > 0 {
		d.MaxBytes = l.MaxBytes
	}
	if l.MaxRows > 0 {
		d.MaxRows = l.MaxRows
	}
	if l.MaxWorkbookBytes > 0 {
		d.MaxWorkbookBytes = l.MaxWorkbookBytes
	}
	if l.StretchMin > 0 {
		d.StretchMin = l.StretchMin
	}
	if l.StretchMax > 0 {
		d.StretchMax = l.StretchMax
	}
	if l.MaxStressKPa > 0 {
		d.MaxStressKPa = l.MaxStressKPa
	}
	return d
}

// check reports limits that cannot be used.
func (l Limits) check() error {
	l = l.withDefaults()
	if !(l.StretchMin < 1 && l.StretchMax > 1) || math.IsInf(l.StretchMax, 0) {
		return fmt.Errorf("%w: the plausible stretch range [%g, %g] must contain 1 (the reference state) and be finite", ErrOptions, l.StretchMin, l.StretchMax)
	}
	if math.IsNaN(l.MaxStressKPa) || math.IsInf(l.MaxStressKPa, 0) {
		return fmt.Errorf("%w: the stress limit must be a finite number of kPa", ErrOptions)
	}
	return nil
}

// Errors for the limits; each wraps its category, so errors.Is finds both.
var (
	// ErrLimit: a file exceeds a size limit (bytes, rows, workbook
	// expansion) or an option asks for more than one allows.
	ErrLimit = errors.New("size limit")
	// ErrFileSize: the file is larger than Limits.MaxBytes.
	ErrFileSize = fmt.Errorf("%w: file size", ErrLimit)
	// ErrRowCount: the file holds more rows than Limits.MaxRows, or
	// Options.Resample asks for more points.
	ErrRowCount = fmt.Errorf("%w: rows", ErrLimit)
	// ErrWorkbookSize: the workbook expands beyond Limits.MaxWorkbookBytes.
	ErrWorkbookSize = fmt.Errorf("%w: workbook expansion", ErrLimit)
	// ErrStretchLimit: a stretch lies outside the plausible range.
	ErrStretchLimit = fmt.Errorf("%w: implausible stretch", ErrRange)
	// ErrStressLimit: a stress exceeds the plausible magnitude.
	ErrStressLimit = fmt.Errorf("%w: implausible stress", ErrRange)
)

// sizeText writes a byte count in MiB (or bytes when small).
func sizeText(n int64) string {
	if n >= 1<<20 {
		return fmt.Sprintf("%g MiB", math.Round(float64(n)/(1<<20)*10)/10)
	}
	return fmt.Sprintf("%d bytes", n)
}

// ParseNumber reads a decimal number strictly, as every number in a test
// file is read: an optional sign, digits with at most one decimal point,
// and an optional exponent. Wider syntax (hexadecimal floats, digit
// separators, "inf", "nan") is refused, because in data such text is a
// mistake, not a number. The error says what is wrong with s; a value
// beyond the float64 range gives a *strconv.NumError with ErrRange.
func ParseNumber(s string) (float64, error) {
	if v, ok := plainDecimal(s); ok {
		return v, nil
	}
	if why := numberSyntax(s); why != "" {
		return 0, errors.New(why)
	}
	return strconv.ParseFloat(s, 64)
}

// exactPow10 are the powers of ten a float64 holds exactly.
var exactPow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// plainDecimal reads the numbers a tester writes — a few digits, a point,
// perhaps an exponent — in one pass, and reports false for anything else,
// which ParseNumber then reads the long way. It only answers when the
// digits form an integer m < 2⁵³ and the value is m·10^e with |e| ≤ 22:
// m and 10^|e| are then exact float64 values, so one IEEE multiplication
// or division rounds m·10^e correctly, to the same float64 as
// strconv.ParseFloat (which takes the same shortcut, Clinger 1990).
func plainDecimal(s string) (float64, bool) {
	i, neg := 0, false
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		neg = s[i] == '-'
		i++
	}
	var m uint64
	digits, frac, point := 0, 0, false
	for ; i < len(s); i++ {
		c := s[i]
		if c >= '0' && c <= '9' {
			if digits == 19 {
				return 0, false // may overflow: the long way
			}
			m = m*10 + uint64(c-'0')
			digits++
			if point {
				frac++
			}
			continue
		}
		if c == '.' && !point {
			point = true
			continue
		}
		break
	}
	if digits == 0 || m >= 1<<53 {
		return 0, false
	}
	exp := 0
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		eneg := false
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			eneg = s[i] == '-'
			i++
		}
		start := i
		for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
			if i-start == 4 {
				return 0, false
			}
			exp = exp*10 + int(s[i]-'0')
		}
		if i == start {
			return 0, false
		}
		if eneg {
			exp = -exp
		}
	}
	if i < len(s) {
		return 0, false
	}
	v := float64(m)
	switch e := exp - frac; {
	case m == 0:
	case e >= 0 && e <= 22:
		v *= exactPow10[e]
	case e < 0 && e >= -22:
		v /= exactPow10[-e]
	default:
		return 0, false
	}
	if neg {
		v = -v
	}
	return v, true
}

// numberSyntax returns "" for a plain decimal number, else why it is not one.
func numberSyntax(s string) string {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits, point := 0, false
	for ; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			digits++
			continue
		case c == '.' && !point:
			point = true
			continue
		}
		break
	}
	if digits == 0 {
		return notNumberWhy(s)
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			i++
		}
		exp := 0
		for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
			exp++
		}
		if exp == 0 {
			return "the exponent has no digits"
		}
	}
	if i < len(s) {
		return notNumberWhy(s)
	}
	return ""
}

func notNumberWhy(s string) string {
	l := strings.ToLower(s)
	switch {
	case strings.Contains(s, "_"):
		return "digit separators (_) are not part of a number"
	case strings.Contains(l, "0x"):
		return "hexadecimal numbers are not read; write it in decimal"
	case strings.Contains(l, "inf") || strings.Contains(l, "nan"):
		return "only finite numbers are data"
	}
	return "not a number"
}

// ClipText shortens text for a message to at most n characters (runes),
// invalid UTF-8 replaced by U+FFFD, so that a huge or binary value read
// from a file does not flood the terminal; a clipped text ends with "…".
func ClipText(s string, n int) string {
	if !utf8.ValidString(s) {
		s = strings.ToValidUTF8(s, "\uFFFD")
	}
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	r := []rune(s)
	return string(r[:n]) + "…"
}

// QuoteValue quotes text for a message as a Go string literal, clipped to
// 80 characters by ClipText. Every package of weft quotes values in its
// messages with it.
func QuoteValue(s string) string { return strconv.Quote(ClipText(s, 80)) }

// clip and quote are ClipText and QuoteValue under the short names the
// readers' messages use.
func clip(s string, n int) string { return ClipText(s, n) }
func quote(s string) string       { return QuoteValue(s) }

// categorised is a message in one or more categories (for errors.Is) that
// do not show in its text.
type categorised struct {
	msg  string
	cats []error
}

func (e categorised) Error() string   { return e.msg }
func (e categorised) Unwrap() []error { return e.cats }
