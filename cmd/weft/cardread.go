package main

// Helpers shared by export, check and evaluate: number lists, the fitted
// data range of a card, and the cautions block.

import (
	"errors"
	"os"
	"path/filepath"
	"strings"

	"github.com/weft-tools/weft/cmd/weft/internal/fe"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"

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

// cardError marks a card the FE documents cannot use as bad input.
func cardError(err error) error {
	var ce *fe.CardError
	if errors.As(err, &ce) {
		return badInput(err)
	}
	return err
}

// readCard reads and validates a model card within lim; problems are bad
// input.
func readCard(path string, lim card.Limits) (*card.Card, *aniso.Model, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, badInputf("%s: cannot read the model card (%s) — check the path and permissions; a fit writes it as model.json in its output folder", path, safeout.Reason(err))
	}
	defer f.Close()
	if st, err := f.Stat(); err == nil && st.IsDir() {
		return nil, nil, notACardFolder(path)
	}
	c, m, err := card.ParseLimits(f, path, lim)
	if err != nil {
		if ext := strings.ToLower(filepath.Ext(path)); ext == ".csv" || ext == ".xlsx" {
			// A test file given where a card belongs: say which file
			// to give instead of only why the JSON parser stopped.
			return nil, nil, badInputf("%v — %s looks like a test file; give the model card (model.json) that 'weft fit' writes from it", withLimitHint(err), path)
		}
		return nil, nil, withLimitHint(err)
	}
	return c, m, nil
}

// notACardFolder is the error for a folder given where a model card
// belongs, naming the card inside it when there is one: a fit's output
// folder holds model.json, a cohort's population.json.
func notACardFolder(dir string) error {
	for _, name := range []string{"model.json", "population.json"} {
		p := filepath.Join(dir, name)
		if st, err := os.Stat(p); err == nil && st.Mode().IsRegular() {
			return badInputf("%s is a folder, not a model card; give the card inside it: %s", dir, p)
		}
	}
	return badInputf("%s is a folder, not a model card; give the model.json that 'weft fit' writes in its output folder", dir)
}
