package cohortreport

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"strconv"
)

// CSV is cohort.csv: one row per specimen with file, specimen, group,
// status (ok or failed) and error, then every parameter with its unit in
// the header (angles as in ParamInfo), the lowest R², the held-out
// error and the misfit ratio (SpecimenRow.MisfitRatio); an undefined
// number is an empty cell.
func (s *Summary) CSV() ([]byte, error) {
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	head := []string{"file", "specimen", "group", "status", "error"}
	for _, p := range s.Parameters {
		head = append(head, paramHeader(p))
	}
	head = append(head, "lowest_r2", "heldout_error", "misfit_ratio")
	if err := w.Write(head); err != nil {
		return nil, err
	}
	for _, r := range s.Specimens {
		rec := []string{r.File, r.Specimen, r.Group, r.Status, r.Error}
		for _, p := range s.Parameters {
			v, ok := r.Parameters[p.Name]
			if !ok {
				rec = append(rec, "")
				continue
			}
			rec = append(rec, csvNum(float64(v)))
		}
		rec = append(rec, csvNum(float64(r.LowestR2)), csvNum(float64(r.HeldOut)), csvNum(float64(r.MisfitRatio)))
		if err := w.Write(rec); err != nil {
			return nil, err
		}
	}
	w.Flush()
	return buf.Bytes(), w.Error()
}

// paramHeader is a parameter's column name: its name, |…| for an angle
// summarised as |α|, and its unit in brackets.
func paramHeader(p ParamInfo) string {
	n := p.Name
	if p.Absolute {
		n = "|" + n + "|"
	}
	if p.Unit != "" {
		n += " [" + p.Unit + "]"
	}
	return n
}

func csvNum(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return ""
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}

// JSON is cohort.json, indented, with a trailing newline.
func (s *Summary) JSON() ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(s); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}
