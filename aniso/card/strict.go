package card

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"reflect"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/biaxial"
)

// Cards are read strictly, because a card drives simulations and a
// silently misread number is worse than a refusal: keys are matched with
// their exact case, a key given twice is an error anywhere in the card, the
// top level must be an object, the text must be UTF-8 (a leading byte-order
// mark is accepted), numbers must fit a float64, and the card's size, its
// number of terms and of families are limited (Limits). Keys a reader does
// not know are still kept, so newer cards read in older versions.

// Limits bound the cards a reader accepts, so that a damaged or hostile
// card fails at once instead of exhausting memory or time. A zero field
// takes its value from DefaultLimits.
type Limits struct {
	// MaxBytes is the largest card read, in bytes (default 16 MiB; a fitted
	// card with its evidence is well under 1 MiB).
	MaxBytes int64
	// MaxTerms is the most terms a card may list (default 64).
	MaxTerms int
	// MaxFamilies is the most fibre families a card may list (default 8).
	MaxFamilies int
}

// DefaultLimits are the limits used where Limits leaves a field zero.
var DefaultLimits = Limits{MaxBytes: 16 << 20, MaxTerms: 64, MaxFamilies: 8}

func (l Limits) withDefaults() Limits {
	d := DefaultLimits
	if l.MaxBytes > 0 {
		d.MaxBytes = l.MaxBytes
	}
	if l.MaxTerms > 0 {
		d.MaxTerms = l.MaxTerms
	}
	if l.MaxFamilies > 0 {
		d.MaxFamilies = l.MaxFamilies
	}
	return d
}

// MaxAngleDeg bounds |angle_deg| of a family: an angle is read modulo 180°,
// and far beyond one turn the conversion to radians loses the digits that
// decide the direction.
const MaxAngleDeg = 360

// Errors for the limits, carried by Error.Err.
var (
	// ErrLimit: a card exceeds a size limit.
	ErrLimit = errors.New("card size limit")
	// ErrCardSize: the card is larger than Limits.MaxBytes.
	ErrCardSize = fmt.Errorf("%w: bytes", ErrLimit)
	// ErrTermCount: the card lists more terms than Limits.MaxTerms.
	ErrTermCount = fmt.Errorf("%w: terms", ErrLimit)
	// ErrFamilyCount: the card lists more families than Limits.MaxFamilies.
	ErrFamilyCount = fmt.Errorf("%w: families", ErrLimit)
)

// clip and quote shorten and quote text for a message as the test-file
// readers do (biaxial.ClipText, biaxial.QuoteValue: 80 characters).
func clip(s string) string  { return biaxial.ClipText(s, 80) }
func quote(s string) string { return biaxial.QuoteValue(s) }

// ParseLimits decodes and validates a card within lim. file names the
// source in errors.
func ParseLimits(r io.Reader, file string, lim Limits) (*Card, *aniso.Model, error) {
	lim = lim.withDefaults()
	b, err := io.ReadAll(io.LimitReader(r, lim.MaxBytes+1))
	if err != nil {
		return nil, nil, err
	}
	if int64(len(b)) > lim.MaxBytes {
		return nil, nil, &Error{File: file, Path: "$", Err: ErrCardSize,
			Msg: fmt.Sprintf("the card is larger than %d bytes, the limit for a model card", lim.MaxBytes)}
	}
	b = bytes.TrimPrefix(b, []byte("\xef\xbb\xbf"))
	if err := checkText(file, b); err != nil {
		return nil, nil, err
	}
	if err := checkStructure(file, b, lim); err != nil {
		return nil, nil, err
	}
	var c Card
	if err := json.Unmarshal(b, &c); err != nil {
		return nil, nil, decodeError(file, b, err)
	}
	m, err := c.Model()
	if err != nil {
		var ce *Error
		if errors.As(err, &ce) {
			ce.File = file
		}
		return nil, nil, err
	}
	return &c, m, nil
}

// checkText refuses text that is not UTF-8: the JSON decoder would turn
// such bytes into replacement characters without a word.
func checkText(file string, b []byte) error {
	if utf8.Valid(b) {
		return nil
	}
	off := 0
	for off < len(b) {
		r, size := utf8.DecodeRune(b[off:])
		if r == utf8.RuneError && size == 1 {
			break
		}
		off += size
	}
	line, col := lineCol(b, int64(off))
	return fmt.Errorf("%s:%d:%d: the card is not UTF-8 text (byte 0x%02X); save it as UTF-8", file, line, col, b[off])
}

// keyShape describes the keys of a JSON object of the card: each known key
// and the shape of its value (nil: any value). Arrays give the shape of
// their elements.
type keyShape struct {
	keys map[string]*keyShape
	elem *keyShape
}

// cardShape is derived from the json tags of Card and the types it holds,
// so that a field added to Family or Term is known without further code.
var cardShape = shapeOf(reflect.TypeFor[Card]())

func shapeOf(t reflect.Type) *keyShape {
	for t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	switch t.Kind() {
	case reflect.Slice, reflect.Array:
		if e := shapeOf(t.Elem()); e != nil {
			return &keyShape{elem: e}
		}
		return nil
	case reflect.Struct:
	default:
		return nil
	}
	s := &keyShape{keys: map[string]*keyShape{}}
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
		if name == "" || name == "-" || !f.IsExported() {
			continue
		}
		s.keys[name] = shapeOf(f.Type)
	}
	return s
}

// checkStructure walks the card's JSON once: the top level must be an
// object; no object may repeat a key; a key that differs from a known key
// only in case is refused; numbers must fit a float64; the lists of terms
// and families must stay within lim.
func checkStructure(file string, b []byte, lim Limits) error {
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.UseNumber()
	w := &walker{dec: dec, file: file, b: b, lim: lim, depth: 1} // the card's own object
	tok, err := dec.Token()
	if err != nil {
		return w.syntax(err)
	}
	if d, ok := tok.(json.Delim); !ok || d != '{' {
		return &Error{File: file, Path: "$", Msg: fmt.Sprintf("the card is %s; a model card is one JSON object, {\"format\": %q, ...}", jsonKind(tok), Format)}
	}
	if err := w.object("$", cardShape); err != nil {
		return err
	}
	if _, err := dec.Token(); err != io.EOF {
		line, col := lineCol(b, dec.InputOffset())
		return fmt.Errorf("%s:%d:%d: text follows the end of the card's object", file, line, col)
	}
	return nil
}

func jsonKind(tok json.Token) string {
	switch v := tok.(type) {
	case json.Delim:
		if v == '[' {
			return "a JSON array"
		}
	case string:
		return "a JSON string"
	case json.Number:
		return "a JSON number"
	case bool:
		return "true or false"
	case nil:
		return "null"
	}
	return "not a JSON object"
}

type walker struct {
	dec  *json.Decoder
	file string
	b    []byte
	lim  Limits
	// depth is how many objects and arrays are open, the card's own
	// object included.
	depth int
}

// maxCardDepth bounds how deeply a card's objects and arrays may nest. A
// card weft writes nests eight levels at most (a discovered model's card,
// its own object counted), so 64 refuses nothing real;
// without a bound, each level of a card nested half a million deep (a
// 1 MB file of '[') built the path of the level below, and reading it took
// minutes.
const maxCardDepth = 64

func (w *walker) syntax(err error) error {
	if errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) {
		return fmt.Errorf("%s: the card ends early (the JSON is cut off or a bracket is not closed)", w.file)
	}
	return decodeError(w.file, w.b, err)
}

// object reads the members of an object whose '{' was read.
func (w *walker) object(path string, shape *keyShape) error {
	seen := map[string]bool{}
	for w.dec.More() {
		tok, err := w.dec.Token()
		if err != nil {
			return w.syntax(err)
		}
		key := tok.(string)
		kp := path + "." + clip(key)
		if seen[key] {
			return &Error{File: w.file, Path: kp, Msg: fmt.Sprintf("the key %s is given twice in the same object; keep one", quote(key))}
		}
		seen[key] = true
		var sub *keyShape
		if shape != nil && shape.keys != nil {
			s, known := shape.keys[key]
			if !known {
				for k := range shape.keys {
					if strings.EqualFold(k, key) {
						return &Error{File: w.file, Path: kp, Msg: fmt.Sprintf("write the key as %q: keys are case-sensitive", k)}
					}
				}
			}
			sub = s
		}
		if err := w.value(kp, key, sub); err != nil {
			return err
		}
	}
	if _, err := w.dec.Token(); err != nil { // '}'
		return w.syntax(err)
	}
	return nil
}

// value reads one value at path; key is its member name ("" in arrays).
func (w *walker) value(path, key string, shape *keyShape) error {
	tok, err := w.dec.Token()
	if err != nil {
		return w.syntax(err)
	}
	switch v := tok.(type) {
	case json.Delim:
		if w.depth++; w.depth > maxCardDepth {
			return &Error{File: w.file, Path: path, Msg: fmt.Sprintf("the card nests objects and arrays more than %d levels deep here; a model card nests a few levels", maxCardDepth)}
		}
		defer func() { w.depth-- }()
		if v == '{' {
			return w.object(path, shape)
		}
		var elem *keyShape
		if shape != nil {
			elem = shape.elem
		}
		max, lerr := 0, error(nil)
		if path == "$.terms" {
			max, lerr = w.lim.MaxTerms, ErrTermCount
		} else if path == "$.families" {
			max, lerr = w.lim.MaxFamilies, ErrFamilyCount
		}
		for i := 0; w.dec.More(); i++ {
			if max > 0 && i >= max {
				return &Error{File: w.file, Path: path, Err: lerr,
					Msg: fmt.Sprintf("the card lists more than %d %s, the limit for a model card", max, key)}
			}
			if err := w.value(fmt.Sprintf("%s[%d]", path, i), "", elem); err != nil {
				return err
			}
		}
		if _, err := w.dec.Token(); err != nil { // ']'
			return w.syntax(err)
		}
	case json.Number:
		if _, err := strconv.ParseFloat(string(v), 64); err != nil {
			return &Error{File: w.file, Path: path, Msg: fmt.Sprintf("%s overflows a double-precision number", clip(string(v)))}
		}
	}
	return nil
}
