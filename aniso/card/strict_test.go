package card

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
	"unicode/utf8"
)

const okCard = `{"format": "weft.model/1", "stress_unit": "kPa",
 "families": [{"name": "f1", "angle_deg": 30}],
 "terms": [{"id": "i1-exp", "weight": 2, "params": {"stiffening": 3}}, {"id": "fib-quad", "weight": 5, "family": "f1"}]}`

func parseString(s string) (*Card, error) {
	c, _, err := Parse(strings.NewReader(s), "card.json")
	return c, err
}

// Finding 11 (cards): the reader is strict and every message names the
// real problem at its JSON path, quoting at most 80 characters.
func TestStrictCardReading(t *testing.T) {
	if _, err := parseString(okCard); err != nil {
		t.Fatalf("a valid card: %v", err)
	}
	big := strings.Repeat("x", 1<<20)
	for _, c := range []struct{ name, in, want string }{
		{"key case", strings.Replace(okCard, `"weight": 2`, `"Weight": 2`, 1), `$.terms[0].Weight: write the key as "weight": keys are case-sensitive`},
		{"top-level key case", strings.Replace(okCard, `"terms"`, `"Terms"`, 1), `$.Terms: write the key as "terms"`},
		{"param case", strings.Replace(okCard, `"stiffening"`, `"Stiffening"`, 1), `$.terms[0].params.Stiffening: write the key as "stiffening"`},
		{"duplicate key", strings.Replace(okCard, `"weight": 2`, `"weight": 2, "weight": 7`, 1), `$.terms[0].weight: the key "weight" is given twice`},
		{"duplicate in a section", strings.Replace(okCard, `"format"`, `"fit": {"a": 1, "a": 2}, "format"`, 1), `$.fit.a: the key "a" is given twice`},
		{"top-level array", "[" + okCard + "]", "the card is a JSON array; a model card is one JSON object"},
		{"top-level string", `"weft.model/1"`, "the card is a JSON string"},
		{"angle far out", strings.Replace(okCard, `"angle_deg": 30`, `"angle_deg": 1e300`, 1), "$.families[0].angle_deg: 1e+300 is outside [-360, 360]"},
		{"number overflow", strings.Replace(okCard, `"weight": 5`, `"weight": 1e400`, 1), "$.terms[1].weight: 1e400 overflows"},
		{"Latin-1", strings.Replace(okCard, `"f1"`, "\"f\xe9\"", 1), "card.json:2:26: the card is not UTF-8 text (byte 0xE9)"},
		{"trailing text", okCard + "{}", "text follows the end of the card"},
		{"cut off", okCard[:40], "the card ends early"},
		{"huge id", strings.Replace(okCard, `"i1-exp"`, `"`+big+`"`, 1), "is not a catalogue term"},
		{"huge key", strings.Replace(okCard, `"format"`, `"`+big+`": 1, "`+big+`": 2, "format"`, 1), "is given twice"},
	} {
		_, err := parseString(c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v; want %q", c.name, err, c.want)
			continue
		}
		if n := utf8.RuneCountInString(err.Error()); n > 400 {
			t.Errorf("%s: a message of %d characters", c.name, n)
		}
	}
	// A byte-order mark is accepted; an angle within a turn is read
	// modulo 180°.
	c, m, err := Parse(strings.NewReader("\xef\xbb\xbf"+strings.Replace(okCard, `"angle_deg": 30`, `"angle_deg": -330`, 1)), "card.json")
	if err != nil || c.Format != Format {
		t.Fatalf("card with a byte-order mark: %v", err)
	}
	if d := math.Remainder(m.Families[0].Angle*180/math.Pi-30, 180); math.Abs(d) > 1e-12 {
		t.Errorf("-330° read as %g°", m.Families[0].Angle*180/math.Pi)
	}
}

// Finding 10 (cards): size, terms and families are limited, each error
// naming the limit and carrying its category.
func TestCardLimits(t *testing.T) {
	var terms []string
	for i := 0; i < 65; i++ {
		terms = append(terms, `{"id": "i1-lin", "weight": 1}`)
	}
	many := `{"format": "weft.model/1", "stress_unit": "kPa", "families": [], "terms": [` + strings.Join(terms, ",") + `]}`
	_, err := parseString(many)
	if !errors.Is(err, ErrTermCount) || !errors.Is(err, ErrLimit) || !strings.Contains(err.Error(), "more than 64 terms") {
		t.Errorf("65 terms: %v", err)
	}
	if _, _, err := ParseLimits(strings.NewReader(many), "card.json", Limits{MaxTerms: 100}); err != nil {
		t.Errorf("65 terms within a raised limit: %v", err)
	}
	var fams []string
	for i := 0; i < 9; i++ {
		fams = append(fams, fmt.Sprintf(`{"name": "f%d", "angle_deg": %d}`, i, 10*i))
	}
	_, err = parseString(`{"format": "weft.model/1", "stress_unit": "kPa", "families": [` + strings.Join(fams, ",") + `], "terms": [{"id": "i1-lin", "weight": 1}]}`)
	if !errors.Is(err, ErrFamilyCount) || !strings.Contains(err.Error(), "more than 8 families") {
		t.Errorf("9 families: %v", err)
	}
	_, _, err = ParseLimits(strings.NewReader(okCard), "card.json", Limits{MaxBytes: 100})
	if !errors.Is(err, ErrCardSize) || !strings.Contains(err.Error(), "larger than 100 bytes") {
		t.Errorf("card over the byte limit: %v", err)
	}
}

// FuzzCard feeds arbitrary bytes to the card reader (capped at 64 KiB). It
// must never panic; the same bytes must give the same error twice;
// whatever it accepts must write back to a card that reads again to the
// same model and the same bytes.
func FuzzCard(f *testing.F) {
	f.Add([]byte(okCard))
	f.Add([]byte("\xef\xbb\xbf" + okCard))
	f.Add([]byte(`{"format":"weft.model/1","stress_unit":"MPa","families":[{"name":"a","angle_deg":-90,"dispersion":0.2}],"terms":[{"id":"fib-expsq","weight":1,"params":{"stiffening":2},"family":"a"},{"id":"i1-gent","weight":1,"params":{"limit":3}}],"fit":{"x":[1,2]}}`))
	f.Add([]byte(`[1,2]`))
	f.Add([]byte(`{"a":1,"a":2}`))
	if b, err := FromModel(sampleModel(), "kPa", []bool{true, false}).Marshal(); err == nil {
		f.Add(b)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 64<<10 {
			return
		}
		c, m, err := ParseLimits(bytes.NewReader(data), "fuzz.json", Limits{})
		_, _, err2 := ParseLimits(bytes.NewReader(data), "fuzz.json", Limits{})
		if (err == nil) != (err2 == nil) || (err != nil && err.Error() != err2.Error()) {
			t.Fatalf("the same card read twice: %v, then %v", err, err2)
		}
		if err != nil {
			if !strings.HasPrefix(err.Error(), "fuzz.json") {
				t.Fatalf("error does not name the file: %v", err)
			}
			return
		}
		b, err := c.Marshal()
		if err != nil {
			t.Fatalf("writing an accepted card: %v", err)
		}
		c2, m2, err := Parse(bytes.NewReader(b), "back.json")
		if err != nil {
			t.Fatalf("reading back an accepted card: %v\n%s", err, b)
		}
		if len(m2.Terms) != len(m.Terms) || len(m2.Families) != len(m.Families) {
			t.Fatalf("round trip changed the model: %d/%d terms, %d/%d families", len(m2.Terms), len(m.Terms), len(m2.Families), len(m.Families))
		}
		b2, _ := c2.Marshal()
		if !bytes.Equal(b, b2) {
			t.Fatalf("writing twice gave different bytes:\n%s\n%s", b, b2)
		}
	})
}

// A card nested deeper than maxCardDepth is refused at the path where it
// goes too deep, at once. Until 2026-12-05 each level built the path of
// the next, so a 1 MB card of half a million '[' took minutes to refuse
// (found while fuzzing the card reader, by checking that work grows with
// the input's size); encoding/json's own bound of 10 000 levels came only
// later, when the card was decoded.
func TestDeeplyNestedCardRefused(t *testing.T) {
	for _, d := range []int{maxCardDepth + 1, 200_000} {
		in := `{"format": "weft.model/1", "stress_unit": "kPa", "terms": [{"id": "i1-lin", "weight": 1}], "fit": {"x": ` +
			strings.Repeat("[", d) + strings.Repeat("]", d) + "}}"
		_, _, err := Parse(strings.NewReader(in), "deep.json")
		var ce *Error
		if !errors.As(err, &ce) || !strings.Contains(err.Error(), "levels deep") || !strings.HasPrefix(ce.Path, "$.fit.x[0][0]") {
			t.Fatalf("depth %d: %v, want the nesting refused at its path", d, err)
		}
		if want := strings.Count(ce.Path, "["); want != maxCardDepth-2 {
			t.Fatalf("depth %d: refused at %s (%d brackets), want the level past %d", d, ce.Path, want, maxCardDepth)
		}
	}
	// maxCardDepth levels in all (the card, fit, and 62 arrays) are not
	// refused for their depth.
	d := maxCardDepth - 2
	in := `{"format": "weft.model/1", "stress_unit": "kPa", "terms": [{"id": "i1-lin", "weight": 1}], "fit": {"x": ` +
		strings.Repeat("[", d) + strings.Repeat("]", d) + "}}"
	if _, _, err := Parse(strings.NewReader(in), "deep.json"); err != nil && strings.Contains(err.Error(), "levels deep") {
		t.Fatalf("%d levels refused: %v", maxCardDepth, err)
	}
}
