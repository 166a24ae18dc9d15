package main

// Helpers shared by export, check and evaluate: number lists, the fitted
// data range of a card, and the cautions block.

import (
	"fmt"
	"io"
	"math"
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
	var dr card.DataRange
	ok, err := c.GetExtra(card.KeyDataRange, &dr)
	if err != nil {
		return nil, badInputf("%s: $.data_range: %v; expected stretch_1, stretch_2 and shear as [min, max] pairs", file, err)
	}
	if !ok {
		return nil, nil
	}
	for _, p := range []struct {
		name string
		v    [2]float64
	}{{"stretch_1", dr.Stretch1}, {"stretch_2", dr.Stretch2}, {"shear", dr.Shear}} {
		if !(p.v[0] <= p.v[1]) {
			return nil, badInputf("%s: $.data_range.%s: [%g, %g] is not a [min, max] pair", file, p.name, p.v[0], p.v[1])
		}
	}
	return &dr, nil
}

// rangeTol absorbs round-off when comparing a point with the data range.
const rangeTol = 1e-9

// outsideRange lists, for one deformation, every quantity outside the
// fitted data range: F11, F22, the shears F12 and F21 and each family's
// fibre stretch √I4.
func outsideRange(dr *card.DataRange, m *aniso.Model, F [4]float64) []string {
	if dr == nil {
		return nil
	}
	var out []string
	check := func(name string, v float64, r [2]float64) {
		if v < r[0]-rangeTol || v > r[1]+rangeTol {
			out = append(out, fmt.Sprintf("%s = %.6g outside [%.6g, %.6g]", name, v, r[0], r[1]))
		}
	}
	check("F11", F[0], dr.Stretch1)
	check("F22", F[3], dr.Stretch2)
	check("F12", F[1], dr.Shear)
	check("F21", F[2], dr.Shear)
	if len(dr.FibreStretch) == len(m.Families) {
		k, err := aniso.NewKinematics(F)
		if err == nil {
			for i, f := range m.Families {
				check("fibre stretch of "+f.Name, math.Sqrt(k.Fibre(f.Angle).I4), dr.FibreStretch[i])
			}
		}
	}
	return out
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
