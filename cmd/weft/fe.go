package main

// Helpers shared by export, check and evaluate: number lists, the fitted
// data range of a card, and the cautions block.

import (
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// parseNumbers parses n comma-separated finite numbers given to flag.
func parseNumbers(flag, s string, n int) ([]float64, error) {
	parts := strings.Split(s, ",")
	if len(parts) != n {
		return nil, badInputf("--%s %s: give %d comma-separated numbers", flag, quoteArg(s), n)
	}
	out := make([]float64, n)
	for i, p := range parts {
		v, err := biaxial.ParseNumber(strings.TrimSpace(p))
		if err != nil {
			return nil, badInputf("--%s %s: %s is not a finite decimal number", flag, quoteArg(s), quoteArg(p))
		}
		out[i] = v
	}
	return out, nil
}

// cardDataRange returns the card's data_range section, or nil when it has
// none. A malformed section is bad input.
func cardDataRange(c *card.Card, file string) (*card.DataRange, error) {
	if err := c.SectionError(card.KeyDataRange); err != nil {
		return nil, badInputf("%s: $.data_range: %v; expected stretch_1, stretch_2 and shear as [min, max] pairs", file, err)
	}
	if c.DataRange == nil {
		return nil, nil
	}
	if err := c.DataRange.Validate(); err != nil {
		return nil, badInputf("%s: %v", file, err)
	}
	return c.DataRange, nil
}

// outsideRange lists, for one deformation, every quantity outside the
// fitted data range dr (none when dr is nil).
func outsideRange(dr *card.DataRange, m *aniso.Model, F [4]float64) []string {
	if dr == nil {
		return nil
	}
	return dr.Outside(m, F)
}

// noRangeNotice is printed when a card has no data_range section.
const noRangeNotice = "the card has no data_range section: the stretch range of the data it was fitted to is unknown, so nothing here shows where the model is supported by data"

// printCautions writes the cautions as an indented block.
func printCautions(w io.Writer) {
	fmt.Fprintln(w, "CAUTIONS")
	for _, c := range card.Cautions {
		fmt.Fprintln(w, "  - "+c)
	}
}

// fmtF writes an in-plane F as [[F11, F12], [F21, F22]].
func fmtF(F [4]float64) string {
	return fmt.Sprintf("[[%.6g, %.6g], [%.6g, %.6g]]", F[0], F[1], F[2], F[3])
}

// familyNames returns the card's family names in model order.
func familyNames(m *aniso.Model) []string {
	out := make([]string, len(m.Families))
	for i, f := range m.Families {
		out[i] = f.Name
		if out[i] == "" {
			out[i] = fmt.Sprintf("f%d", i+1)
		}
	}
	return out
}

// fullFloat formats v with the fewest digits that read back to v.
func fullFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// readCardWithRange reads a card, its model and its fitted data range (nil
// when the card has none); problems are bad input.
func readCardWithRange(path string, lim card.Limits) (*card.Card, *aniso.Model, *card.DataRange, error) {
	c, m, err := readCard(path, lim)
	if err != nil {
		return nil, nil, nil, err
	}
	dr, err := cardDataRange(c, path)
	if err != nil {
		return nil, nil, nil, err
	}
	return c, m, dr, nil
}
