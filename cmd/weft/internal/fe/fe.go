// Package fe writes what a finite-element analyst needs from a model card:
// the export document (parameters, the energy written out and a stress
// verification table, as a table, CSV, JSON or LaTeX, or as a UFL form for
// FEniCS, WriteExportUFL in ufl.go; the 3-D block of a card, ThreeDBlock in
// threed.go, states what the in-plane data leave open), the admissibility
// check report and the evaluation at one deformation, each with the
// cautions; the export and the check carry the fitted data range, and the
// evaluation warns when the deformation lies outside it. The command line
// reads the card and prints or writes the documents.
package fe

import (
	"fmt"
	"io"
	"strconv"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// CardError says that the card's model cannot be evaluated where a
// document needs it (at the reference state, on the check's grid, at the
// verification points or at the deformation asked for): the card, or the
// deformation given with it, cannot be used.
type CardError struct{ msg string }

func (e *CardError) Error() string { return e.msg }

// cardErrorf formats a CardError.
func cardErrorf(format string, args ...any) error {
	return &CardError{fmt.Sprintf(format, args...)}
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

// printCautions writes the cautions cs (card.CautionsOf the card) as an
// indented block.
func printCautions(w io.Writer, cs []string) {
	fmt.Fprintln(w, "CAUTIONS")
	for _, c := range cs {
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
