package card

import (
	"encoding/json"
	"math"
)

// Cards written before the selection evidence used the words of the report
// ("held-out error", "lowest R²") named those quantities cv_error,
// cv_stderr, cv_folds, cv_metric and min_r2. The readers below accept
// those keys, so that older folders still give a report; weft writes only
// today's names.

// UnmarshalJSON reads a candidate, also under its former keys.
func (c *CandidateCard) UnmarshalJSON(b []byte) error {
	type plain CandidateCard
	v := struct {
		*plain
		FormerError  *Num       `json:"cv_error"`
		FormerStdErr *Num       `json:"cv_stderr"`
		FormerFolds  []FoldCard `json:"cv_folds"`
		FormerR2     *Num       `json:"min_r2"`
	}{plain: (*plain)(c)}
	nan := Num(math.NaN())
	c.HeldoutError, c.HeldoutStdErr, c.LowestR2 = nan, nan, nan
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	former(&c.HeldoutError, v.FormerError)
	former(&c.HeldoutStdErr, v.FormerStdErr)
	former(&c.LowestR2, v.FormerR2)
	if c.HeldoutFolds == nil {
		c.HeldoutFolds = v.FormerFolds
	}
	return nil
}

// former sets *now to a value read under its former key when today's key
// gave none.
func former(now *Num, old *Num) {
	if old != nil && math.IsNaN(float64(*now)) {
		*now = *old
	}
}

// UnmarshalJSON reads the selection evidence, also under its former keys.
func (s *SelectionSection) UnmarshalJSON(b []byte) error {
	type plain SelectionSection
	v := struct {
		*plain
		FormerMetric string `json:"cv_metric"`
	}{plain: (*plain)(s)}
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	if s.HeldoutMetric == "" {
		s.HeldoutMetric = v.FormerMetric
	}
	return nil
}

// UnmarshalJSON reads the verdict, also under its former keys.
func (s *VerdictSection) UnmarshalJSON(b []byte) error {
	type plain VerdictSection
	v := struct {
		*plain
		FormerError map[string]Num `json:"cv_error"`
	}{plain: (*plain)(s)}
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	if s.HeldoutError == nil {
		s.HeldoutError = v.FormerError
	}
	// Cards before these keys were always written left them out when
	// empty; a card read and written again has them.
	if s.Comparisons == nil {
		s.Comparisons = []ComparisonCard{}
	}
	if s.RuledOut == nil {
		s.RuledOut = []string{}
	}
	return nil
}
