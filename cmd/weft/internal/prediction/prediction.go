// Package prediction writes what weft predict writes: a card's model
// evaluated on every row of a kinematics CSV (stretch_1, stretch_2 or
// F11, F12, F21, F22), the rows with the stresses appended, the band of
// the card's near-equivalent models (band.go) and comment lines that say
// where the rows may be used: the card's cautions, the rows outside its
// fitted data range, and what the band does and does not settle.
package prediction

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/fe"
)

// InputError is a kinematics file that cannot be used, naming its file,
// line and column where it can.
type InputError struct{ Msg string }

func (e *InputError) Error() string { return e.Msg }

// inputErrorf formats an *InputError.
func inputErrorf(format string, args ...any) error {
	return &InputError{Msg: fmt.Sprintf(format, args...)}
}

// headerName lower-cases a CSV header and strips a bracketed unit.
func headerName(h string) string {
	h = strings.TrimSpace(strings.TrimPrefix(h, "\ufeff"))
	if i := strings.Index(h, "["); i >= 0 {
		h = h[:i]
	}
	return strings.ToLower(strings.TrimSpace(h))
}

// Write evaluates m on every row of a kinematics CSV and writes the
// rows with stresses appended, after comment lines with the card's
// cautions (card.CautionsOf) and, when rows leave the fitted data range dr
// (nil: unknown), how many, and each of warnings: a CSV is often read
// without the card, so the file itself says where it may be used and what
// it leaves open. It returns the number of rows
// outside dr and of rows. Any bad row is an input error naming its line
// and column (an *InputError); nothing is written then.
func Write(r io.Reader, file string, c *card.Card, m *aniso.Model, dr *card.DataRange, warnings []string, alike []card.AlikeModel, w io.Writer) (outside, rows int, err error) {
	cr := csv.NewReader(r)
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	header, idx, stretch, err := kinematicsColumns(cr, file)
	if err != nil {
		return 0, 0, err
	}
	var out bytes.Buffer
	cw := csv.NewWriter(&out)
	cw.Write(predictHeader(header, c.StressUnit, len(alike) > 0))
	var band alikeBand
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return 0, 0, inputErrorf("%s: %v", file, err)
		}
		line, _ := cr.FieldPos(0)
		F, err := rowKinematics(cr, file, header, rec, idx, stretch)
		if err != nil {
			return 0, 0, err
		}
		bd, err := card.AlikeBand(m, alike, F)
		if err != nil {
			return 0, 0, inputErrorf("%s:%d: %v", file, line, err)
		}
		rows++
		if dr != nil && len(dr.Outside(m, F)) > 0 {
			outside++
		}
		row := append([]string(nil), rec...)
		cols := bd.Own[:]
		if len(alike) > 0 {
			band.add(bd, line)
			cols = append(append(cols, bd.Low[:]...), bd.High[:]...)
		}
		for _, x := range cols {
			row = append(row, strconv.FormatFloat(x, 'g', -1, 64))
		}
		cw.Write(row)
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return 0, 0, err
	}
	var b bytes.Buffer
	predictComments(&b, file, c, warnings, alike, &band, outside, rows)
	b.Write(out.Bytes())
	_, err = w.Write(b.Bytes())
	return outside, rows, err
}

// kinematicsColumns reads the kinematics file's header and returns it with the
// indices of the kinematics columns: F11, F12, F21, F22, or stretch_1,
// stretch_2 (stretch true).
func kinematicsColumns(cr *csv.Reader, file string) (header []string, idx []int, stretch bool, err error) {
	header, err = cr.Read()
	if err != nil {
		if errors.Is(err, io.EOF) {
			return nil, nil, false, inputErrorf("%s: empty file; expected a header with stretch_1,stretch_2 or F11,F12,F21,F22", file)
		}
		return nil, nil, false, inputErrorf("%s: %v", file, err)
	}
	col := map[string]int{}
	for i, h := range header {
		name := headerName(h)
		if _, dup := col[name]; dup {
			line, _ := cr.FieldPos(i)
			return nil, nil, false, inputErrorf("%s:%d:%d: column %s appears twice; keep one", file, line, i+1, biaxial.QuoteValue(name))
		}
		col[name] = i
	}
	if _, ok := col["f11"]; ok {
		for _, n := range []string{"f11", "f12", "f21", "f22"} {
			i, ok := col[n]
			if !ok {
				return nil, nil, false, inputErrorf("%s:1: column F11 is present but %s is missing; give all four of F11,F12,F21,F22", file, strings.ToUpper(n[:1])+n[1:])
			}
			idx = append(idx, i)
		}
		return header, idx, false, nil
	}
	i1, ok1 := col["stretch_1"]
	i2, ok2 := col["stretch_2"]
	if !ok1 || !ok2 {
		return nil, nil, false, inputErrorf("%s:1: no kinematics columns; give stretch_1,stretch_2 or F11,F12,F21,F22", file)
	}
	return header, []int{i1, i2}, true, nil
}

// predictHeader is the input header with the stress columns appended, and
// the band's when alike.
func predictHeader(header []string, unit string, alike bool) []string {
	h := append([]string(nil), header...)
	sides := []string{""}
	if alike {
		sides = append(sides, "alike_low_", "alike_high_")
	}
	for _, side := range sides {
		for _, name := range fe.StressColumnNames {
			h = append(h, fmt.Sprintf("%s%s [%s]", side, name, unit))
		}
	}
	return h
}

// rowKinematics reads one row's deformation gradient (F11, F12, F21, F22);
// a missing or non-numeric field, a stretch ≤ 0 or det F ≤ 0 is an input
// error naming the line and column.
func rowKinematics(cr *csv.Reader, file string, header, rec []string, idx []int, stretch bool) ([4]float64, error) {
	line, _ := cr.FieldPos(0)
	var v [4]float64
	for j, i := range idx {
		if i >= len(rec) {
			return v, inputErrorf("%s:%d: the row has %d fields; column %s is missing", file, line, len(rec), biaxial.QuoteValue(header[i]))
		}
		x, err := biaxial.ParseNumber(strings.TrimSpace(rec[i]))
		if err != nil || x > 1e300 || x < -1e300 {
			_, cc := cr.FieldPos(i)
			return v, inputErrorf("%s:%d:%d: %s in column %s is not a finite decimal number", file, line, cc, biaxial.QuoteValue(rec[i]), biaxial.QuoteValue(header[i]))
		}
		v[j] = x
	}
	F := v
	if stretch {
		F = [4]float64{v[0], 0, 0, v[1]}
		if v[0] <= 0 || v[1] <= 0 {
			return F, inputErrorf("%s:%d: stretches %g, %g must be > 0", file, line, v[0], v[1])
		}
	}
	if det := F[0]*F[3] - F[1]*F[2]; det <= 0 {
		return F, inputErrorf("%s:%d: det F = F11·F22 − F12·F21 = %g ≤ 0, which would invert the material; check the column order and signs", file, line, det)
	}
	return F, nil
}

// predictComments writes predict's '#' lines: what the file holds, the
// card's cautions, the rows outside the fitted data range, warnings, and
// what the near-equivalent models' band says (or that there is none).
func predictComments(b *bytes.Buffer, file string, c *card.Card, warnings []string, alike []card.AlikeModel, band *alikeBand, outside, rows int) {
	what := "a model card"
	if c.Specimen != "" {
		what = "the model card of " + c.Specimen
	}
	fmt.Fprintf(b, "# weft predict: stresses of %s along %s; lines starting with # are comments\n", strings.ReplaceAll(what, "\n", " "), filepath.Base(file))
	for _, cn := range card.CautionsOf(c) {
		fmt.Fprintf(b, "# CAUTION: %s\n", cn)
	}
	if outside > 0 {
		fmt.Fprintf(b, "# WARNING: %s\n", OutsideRowsText(outside, rows))
	}
	for _, wn := range warnings {
		fmt.Fprintf(b, "# WARNING: %s\n", wn)
	}
	if len(alike) > 0 {
		for _, n := range band.notes(alike, c.StressUnit, outside, rows) {
			fmt.Fprintf(b, "# NOTE: %s\n", n)
		}
	}
	if c.AloneInSelection() {
		// No band is not a narrow band: an isotropic two-term Ogden
		// solid fitted without its strips had no near-equivalent model
		// and the strips were missed by 6.5 % of their peak.
		fmt.Fprintf(b, "# NOTE: no other model of the fit's selection predicted the held-out protocols within one standard error of this one's, so there are no alike_low_/alike_high_ columns; that does not mean the tested protocols settle this prediction\n")
	} else if len(alike) == 0 {
		// A card of a chosen form (--preset, --terms), a cohort's card or
		// one written by hand has no cross-validated candidates to
		// compare: saying nothing read as a settled prediction.
		fmt.Fprintf(b, "# NOTE: the card carries no cross-validated selection of other models (a chosen form, a cohort's card, a single protocol or a card written by hand), so there are no alike_low_/alike_high_ columns: nothing here says whether the tested protocols settle this prediction%s\n", stripsPointer(c))
	}
}

// stripsPointer points a cohort specimen's card, which has no selection of
// its own, at its untested strips, measured with the cohort's
// near-equivalent forms; "" when it has none measured.
func stripsPointer(c *card.Card) string {
	for _, st := range c.UntestedStrips {
		if st.Models > 0 {
			return " (its untested_strips section measures the strips its tests left out, with the forms a cohort's held-out protocols could not tell from its own)"
		}
	}
	return ""
}

// OutsideRowsText says how many of rows lie outside the card's fitted data
// range, in the words of export's warning.
func OutsideRowsText(outside, rows int) string {
	return fmt.Sprintf("%d of %d rows lie outside the fitted data range (data_range); there the model extrapolates", outside, rows)
}
