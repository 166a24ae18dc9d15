package report

import (
	"fmt"
	"html/template"
	"strings"
)

// The strain energy typeset in the page as MathML (W3C MathML Core), which
// browsers draw without scripts or fonts from elsewhere, so the report
// stays one self-contained file. The energy's LaTeX (the card's
// energy_latex) uses a small subset of LaTeX — fractions, sub- and
// superscripts, \left…\right delimiters, a few Greek letters and
// functions — and mathML translates exactly that subset; anything else is
// an error and the page shows the plain-text energy instead.

// greek maps the Greek letters the catalogue writes to their characters.
var greek = map[string]string{"alpha": "α", "beta": "β", "kappa": "κ", "lambda": "λ", "mu": "μ", "theta": "θ", "Delta": "Δ", "Psi": "Ψ", "psi": "ψ", "sigma": "σ"}

// functions are the LaTeX operators written upright.
var functions = map[string]bool{"ln": true, "min": true, "max": true, "exp": true}

// mathML translates a LaTeX formula of the catalogue's subset into an
// inline MathML element (display="block" when block).
func mathML(latex string, block bool) (template.HTML, error) {
	p := &latexParser{s: latex}
	body, err := p.sequence(0)
	if err != nil {
		return "", err
	}
	if p.i < len(p.s) {
		return "", fmt.Errorf("unexpected %q at %d", p.s[p.i:], p.i)
	}
	disp := ""
	if block {
		disp = ` display="block"`
	}
	return template.HTML(`<math` + disp + `><mrow>` + body + `</mrow></math>`), nil
}

// latexParser reads a formula from s at position i.
type latexParser struct {
	s string
	i int
}

// Stops of a sequence: the end of a group or of a \left…\right pair.
const (
	stopNone = iota
	stopBrace
	stopRight
)

// sequence reads atoms with their sub- and superscripts up to the end, a
// closing brace (stop stopBrace) or \right (stop stopRight), which it
// leaves unread.
func (p *latexParser) sequence(stop int) (string, error) {
	var out strings.Builder
	for {
		p.skipSpace()
		if p.i >= len(p.s) {
			if stop != stopNone {
				return "", fmt.Errorf("unclosed group")
			}
			return out.String(), nil
		}
		if p.s[p.i] == '}' {
			if stop != stopBrace {
				return "", fmt.Errorf("unmatched } at %d", p.i)
			}
			return out.String(), nil
		}
		if strings.HasPrefix(p.s[p.i:], `\right`) {
			if stop != stopRight {
				return "", fmt.Errorf(`unmatched \right at %d`, p.i)
			}
			return out.String(), nil
		}
		base, err := p.atom()
		if err != nil {
			return "", err
		}
		sub, sup, err := p.scripts()
		if err != nil {
			return "", err
		}
		switch {
		case sub != "" && sup != "":
			out.WriteString("<msubsup>" + base + sub + sup + "</msubsup>")
		case sub != "":
			out.WriteString("<msub>" + base + sub + "</msub>")
		case sup != "":
			out.WriteString("<msup>" + base + sup + "</msup>")
		default:
			out.WriteString(base)
		}
	}
}

func (p *latexParser) skipSpace() {
	for p.i < len(p.s) && p.s[p.i] == ' ' {
		p.i++
	}
}

// scripts reads a subscript and a superscript, in either order.
func (p *latexParser) scripts() (sub, sup string, err error) {
	for k := 0; k < 2 && p.i < len(p.s); k++ {
		c := p.s[p.i]
		if c != '_' && c != '^' {
			break
		}
		p.i++
		arg, err := p.argument()
		if err != nil {
			return "", "", err
		}
		if c == '_' {
			sub = arg
		} else {
			sup = arg
		}
	}
	return sub, sup, nil
}

// argument reads a {group} or a single character as one element.
func (p *latexParser) argument() (string, error) {
	p.skipSpace()
	if p.i >= len(p.s) {
		return "", fmt.Errorf("missing argument")
	}
	if p.s[p.i] == '{' {
		p.i++
		body, err := p.sequence(stopBrace)
		if err != nil {
			return "", err
		}
		p.i++ // the closing brace
		return "<mrow>" + body + "</mrow>", nil
	}
	return p.atom()
}

// atom reads one number, letter, operator, group or command.
func (p *latexParser) atom() (string, error) {
	c := p.s[p.i]
	switch {
	case c >= '0' && c <= '9' || c == '.':
		return p.number(), nil
	case c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z':
		p.i++
		return "<mi>" + string(c) + "</mi>", nil
	case c == '{':
		p.i++
		body, err := p.sequence(stopBrace)
		if err != nil {
			return "", err
		}
		p.i++
		return "<mrow>" + body + "</mrow>", nil
	case c == '\\':
		return p.command()
	}
	p.i++
	switch c {
	case '-':
		return "<mo>−</mo>", nil
	case '+', '=', ',', '/':
		return "<mo>" + template.HTMLEscapeString(string(c)) + "</mo>", nil
	case '(', ')', '[', ']':
		return `<mo stretchy="false">` + string(c) + "</mo>", nil
	}
	return "", fmt.Errorf("unexpected %q at %d", c, p.i-1)
}

// number reads digits with a decimal point and an optional exponent
// (e-05 from %g), written as a power of ten.
func (p *latexParser) number() string {
	start := p.i
	for p.i < len(p.s) && (p.s[p.i] >= '0' && p.s[p.i] <= '9' || p.s[p.i] == '.') {
		p.i++
	}
	mant := p.s[start:p.i]
	if p.i+1 < len(p.s) && p.s[p.i] == 'e' {
		j := p.i + 1
		if p.s[j] == '-' || p.s[j] == '+' {
			j++
		}
		k := j
		for k < len(p.s) && p.s[k] >= '0' && p.s[k] <= '9' {
			k++
		}
		if k > j {
			exp := strings.TrimLeft(p.s[j:k], "0")
			if exp == "" {
				exp = "0"
			}
			if p.s[p.i+1] == '-' {
				exp = "−" + exp
			}
			p.i = k
			return "<mrow><mn>" + mant + "</mn><mo>×</mo><msup><mn>10</mn><mn>" + exp + "</mn></msup></mrow>"
		}
	}
	return "<mn>" + mant + "</mn>"
}

// command reads a backslash command.
func (p *latexParser) command() (string, error) {
	p.i++
	if p.i < len(p.s) && !isLetter(p.s[p.i]) {
		c := p.s[p.i]
		p.i++
		switch c {
		case ',':
			return `<mspace width="0.17em"></mspace>`, nil
		case ' ', ';':
			return `<mspace width="0.28em"></mspace>`, nil
		}
		return "", fmt.Errorf(`unknown command \%c`, c)
	}
	start := p.i
	for p.i < len(p.s) && isLetter(p.s[p.i]) {
		p.i++
	}
	name := p.s[start:p.i]
	switch {
	case greek[name] != "":
		return "<mi>" + greek[name] + "</mi>", nil
	case functions[name]:
		return "<mi>" + name + "</mi><mspace width=\"0.1em\"></mspace>", nil
	case name == "cdot":
		return "<mo>·</mo>", nil
	case name == "langle":
		return `<mo stretchy="false">⟨</mo>`, nil
	case name == "rangle":
		return `<mo stretchy="false">⟩</mo>`, nil
	case name == "frac":
		num, err := p.argument()
		if err != nil {
			return "", err
		}
		den, err := p.argument()
		if err != nil {
			return "", err
		}
		return "<mfrac>" + num + den + "</mfrac>", nil
	case name == "left":
		open, err := p.delimiter()
		if err != nil {
			return "", err
		}
		body, err := p.sequence(stopRight)
		if err != nil {
			return "", err
		}
		p.i += len(`\right`)
		cl, err := p.delimiter()
		if err != nil {
			return "", err
		}
		return "<mrow><mo>" + open + "</mo>" + body + "<mo>" + cl + "</mo></mrow>", nil
	}
	return "", fmt.Errorf(`unknown command \%s`, name)
}

// delimiter reads the delimiter after \left or \right.
func (p *latexParser) delimiter() (string, error) {
	p.skipSpace()
	if p.i >= len(p.s) {
		return "", fmt.Errorf("missing delimiter")
	}
	switch c := p.s[p.i]; c {
	case '(', ')', '[', ']', '.':
		p.i++
		if c == '.' {
			return "", nil
		}
		return string(c), nil
	}
	for _, d := range []struct{ name, char string }{{`\langle`, "⟨"}, {`\rangle`, "⟩"}} {
		if strings.HasPrefix(p.s[p.i:], d.name) {
			p.i += len(d.name)
			return d.char, nil
		}
	}
	return "", fmt.Errorf("unknown delimiter at %d", p.i)
}

func isLetter(c byte) bool { return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }

// energyTerms splits the LaTeX of an energy, "\Psi = t1 + t2 - t3", into
// its left-hand side and terms at the top level (outside braces and
// \left…\right pairs), each term with its sign as written ("+ t2"), so
// that a long energy can be typeset one term per line: MathML does not
// break lines by itself.
func energyTerms(latex string) (lhs string, terms []string) {
	lhs, rhs, ok := strings.Cut(latex, " = ")
	if !ok {
		return "", []string{latex}
	}
	depth, start := 0, 0
	for i := 0; i < len(rhs); i++ {
		switch {
		case rhs[i] == '{':
			depth++
		case rhs[i] == '}':
			depth--
		case strings.HasPrefix(rhs[i:], `\left`):
			depth++
			i += len(`\left`) - 1
		case strings.HasPrefix(rhs[i:], `\right`):
			depth--
			i += len(`\right`) - 1
		case depth == 0 && i > start && (strings.HasPrefix(rhs[i:], " + ") || strings.HasPrefix(rhs[i:], " - ")):
			terms = append(terms, strings.TrimSpace(rhs[start:i]))
			start = i + 1
		}
	}
	return lhs, append(terms, strings.TrimSpace(rhs[start:]))
}

// plainTerms splits the plain-text energy, "Psi = t1 + t2 - t3", as
// energyTerms splits its LaTeX (outside parentheses and brackets).
func plainTerms(plain string) []string {
	_, rhs, ok := strings.Cut(plain, " = ")
	if !ok {
		return []string{plain}
	}
	var terms []string
	depth, start := 0, 0
	for i := 0; i < len(rhs); i++ {
		switch c := rhs[i]; {
		case c == '(' || c == '[' || c == '<':
			depth++
		case c == ')' || c == ']' || c == '>':
			depth--
		case depth == 0 && i > start && (strings.HasPrefix(rhs[i:], " + ") || strings.HasPrefix(rhs[i:], " - ")):
			terms = append(terms, strings.TrimSpace(rhs[start:i]))
			start = i + 1
		}
	}
	return append(terms, strings.TrimSpace(rhs[start:]))
}

// longTerm is the length of a term's LaTeX beyond which it is shown as
// plain text, which can wrap: typeset, it would be wider than the page.
const longTerm = 170

// energyMathML typesets an energy one term per line as block MathML, or
// inline with a breakable space between terms (block false); a term too
// long for a line (longTerm) is written in plain text from plain, the
// card's plain-text energy, which wraps.
func energyMathML(latex, plain string, block bool) (template.HTML, error) {
	lhs, terms := energyTerms(latex)
	pts := plainTerms(plain)
	var b strings.Builder
	for i, t := range terms {
		if i > 0 && !block {
			b.WriteString(" ")
		}
		if len(t) > longTerm && len(pts) == len(terms) {
			p := pts[i]
			if i == 0 {
				p = "Ψ = " + p
			}
			tag := "span"
			if block {
				tag = "div"
			}
			b.WriteString("<" + tag + ` class="mono">` + template.HTMLEscapeString(p) + "</" + tag + ">")
			continue
		}
		src := t
		if i == 0 && lhs != "" {
			src = lhs + " = " + t
		}
		m, err := mathML(src, block)
		if err != nil {
			return "", err
		}
		b.WriteString(string(m))
	}
	return template.HTML(b.String()), nil
}
