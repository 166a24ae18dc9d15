package report

import (
	"bytes"
	"errors"
	"fmt"
	"sort"
	"sync"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// A report is built from the files of an output folder only (model.json,
// fit.csv and, when weft fit wrote it, heldout.csv), so that rebuilding a
// report gives exactly what the fit wrote, without refitting.

// Folder is what a report reads from an output folder.
type Folder struct {
	// Files are the names of the folder's entries (hidden ones left out).
	Files []string
	// ModelJSON, FitCSV and HeldoutCSV are the contents of model.json,
	// fit.csv and heldout.csv; HeldoutCSV is nil when the folder has none.
	ModelJSON, FitCSV, HeldoutCSV []byte
	// CurvesCSV and RawCSV are curves.csv (model curves with their
	// confidence bands, and the presets') and raw.csv (every cycle of the
	// record); nil when the folder has none (folders of older versions).
	CurvesCSV, RawCSV []byte
}

// InputError says that a folder's files cannot make a report: a file is
// malformed or the card lacks a section the report needs. Nothing was
// written.
type InputError struct {
	// MissingSection is the card section that is absent (card.KeyFit or
	// card.KeyData), or "" when the error is another one.
	MissingSection string
	Err            error
}

func (e *InputError) Error() string { return e.Err.Error() }

// Unwrap returns the underlying error.
func (e *InputError) Unwrap() error { return e.Err }

// Input is everything a report is drawn from, read from a Folder.
type Input struct {
	// files are the names found in the folder.
	files []string
	card  *card.Card
	model *aniso.Model
	fit   card.FitSection
	data  card.DataSection
	// dataRange, split, verdict and sel are nil when the card lacks them
	// (a chosen-form fit has no verdict or selection).
	dataRange *card.DataRange
	split     *card.SplitSection
	verdict   *card.VerdictSection
	// calibration is the card's calibration check, nil when not asked for.
	calibration *card.CalibrationCheck
	// untested are the card's untested strips (none when absent).
	untested []card.UntestedStrip
	sel      *card.SelectionSection
	// table is fit.csv; heldout, curves and raw are heldout.csv,
	// curves.csv and raw.csv (nil when absent).
	table   *fitTable
	heldout *heldoutTable
	curves  *curveTable
	raw     *rawTable
}

// Parse reads the files of an output folder, the card within lim. Every
// error is an *InputError.
func Parse(f Folder, lim card.Limits) (*Input, error) {
	in := &Input{files: append([]string(nil), f.Files...)}
	sort.Strings(in.files)
	if err := in.parse(f, lim); err != nil {
		var ie *InputError
		if errors.As(err, &ie) {
			return nil, err
		}
		return nil, &InputError{Err: err}
	}
	return in, nil
}

// parse fills the input from the folder's files.
func (in *Input) parse(f Folder, lim card.Limits) error {
	c, m, err := card.ParseLimits(bytes.NewReader(f.ModelJSON), "model.json", lim)
	if err != nil {
		return err
	}
	in.card, in.model = c, m
	// A section that is present but malformed is reported before a
	// missing one that comes after it, in the order the report needs them.
	sectionErr := func(key string) error {
		if err := c.SectionError(key); err != nil {
			return fmt.Errorf("model.json: $.%s: %v", key, err)
		}
		return nil
	}
	if err := sectionErr(card.KeyFit); err != nil {
		return err
	}
	if c.Fit == nil {
		return &InputError{MissingSection: card.KeyFit, Err: errors.New("model.json has no 'fit' section")}
	}
	if err := sectionErr(card.KeyData); err != nil {
		return err
	}
	if c.Data == nil {
		return &InputError{MissingSection: card.KeyData, Err: errors.New("model.json has no 'data' section (the data the card was fitted to)")}
	}
	for _, key := range []string{card.KeyDataRange, card.KeySplit, card.KeyVerdict, card.KeySelection, card.KeyCalibrationCheck, card.KeyProvenance, card.KeySetup} {
		if err := sectionErr(key); err != nil {
			return err
		}
	}
	in.fit, in.data = *c.Fit, *c.Data
	in.dataRange, in.split, in.verdict, in.sel, in.calibration = c.DataRange, c.Split, c.Verdict, c.Selection, c.CalibrationCheck
	in.untested = c.UntestedStrips
	in.table, err = readFitTable(bytes.NewReader(f.FitCSV), "fit.csv")
	if err != nil {
		return err
	}
	if in.table.kind != in.fit.StressKind {
		return fmt.Errorf("fit.csv holds %s stress but model.json says the fit used %s stress; the files are not from the same fit", in.table.kind, in.fit.StressKind)
	}
	// The three tables only read the fit table, so they are parsed side by
	// side (each takes a tenth of a second on a long record); the first
	// error in this order is the one returned.
	var errs [3]error
	var wg sync.WaitGroup
	parse := func(i int, data []byte, read func([]byte) error) {
		if data == nil {
			return
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			errs[i] = read(data)
		}()
	}
	parse(0, f.HeldoutCSV, func(b []byte) (err error) {
		in.heldout, err = readHeldoutTable(bytes.NewReader(b), "heldout.csv", in.table)
		return err
	})
	parse(1, f.CurvesCSV, func(b []byte) (err error) {
		in.curves, err = readCurveTable(bytes.NewReader(b), "curves.csv", in.table)
		return err
	})
	parse(2, f.RawCSV, func(b []byte) (err error) {
		in.raw, err = readRawTable(bytes.NewReader(b), "raw.csv", in.table)
		return err
	})
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}
