// Package fitfolder builds the data files of one specimen's output folder
// from what its fit produced and writes them, in a fixed order, into a
// sink (package safeout): the model card model.json, the fit table
// fit.csv, the candidates' table selection.csv (when the model was
// discovered), the held-out predictions heldout.csv (with two protocols
// or more), the model curves curves.csv and the record as measured
// raw.csv (when it was read whole): WriteData, with the held-out
// predictions built by HeldoutPredictions (heldout.go). 'weft fit' and
// 'weft cohort' write their folders through it and add the report, which
// is built from these files as 'weft report' builds it. Its errors say
// what went wrong; the command adds what to type.
package fitfolder

import (
	"bytes"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/report"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
)

// Outcome is what one specimen's fit produced.
type Outcome struct {
	// Specimen is the data fitted and Problem its fitting problem; Result
	// the model fitted (the chosen one of a discovery).
	Specimen *biaxial.Specimen
	Problem  *aniso.Problem
	Result   *aniso.Result
	// Discovery is the discovery that chose Result, nil for a fit of a
	// given form.
	Discovery *aniso.Discovery
	// Card is the model card of Result.
	Card *card.Card
	// Raw is the file read with every cycle and branch, as measured, for
	// the report's view of the record (nil when it could not be read so).
	Raw *biaxial.Specimen
}

// chosenCV is the cross-validation of the discovered model's form, nil for
// a fit of a given form.
func (o *Outcome) chosenCV() *aniso.CVScore {
	if o.Discovery == nil {
		return nil
	}
	return o.Discovery.Best().CV
}

// WriteData writes the data files of o's folder into od: model.json,
// fit.csv, selection.csv (a discovery), heldout.csv (the model form
// refitted with each protocol left out, predicting it; the
// cross-validation's own folds for a discovered model), curves.csv (the
// model curves with their confidence bands, and the presets') and raw.csv
// (when o.Raw is set), in that order. The first error, of building a file
// or of writing it, stops it.
func WriteData(o *Outcome, od safeout.Sink) error {
	// The fit and raw tables need neither the fits' engines nor the
	// held-out refits, so they are built while those run (on a long record
	// each takes a few tenths of a second). The files are written in the
	// same order either way, and the first error in that order is the one
	// returned.
	var fitCSV, rawCSV outFile
	done := make(chan struct{})
	go func() {
		defer close(done)
		fitCSV = fitTableFile(o)
		if o.Raw != nil {
			var buf bytes.Buffer
			err := report.WriteRawTable(&buf, o.Raw, o.Specimen)
			rawCSV = outFile{"raw.csv", buf.Bytes(), err}
		}
	}()
	modelJSON := cardFile(o)
	var sel []outFile
	if o.Discovery != nil {
		var buf bytes.Buffer
		err := report.WriteSelectionTable(&buf, o.Problem, o.Discovery)
		sel = append(sel, outFile{"selection.csv", buf.Bytes(), err})
	}
	rest := heldoutAndCurves(o)
	<-done
	files := append(append([]outFile{modelJSON, fitCSV}, sel...), rest...)
	if o.Raw != nil {
		files = append(files, rawCSV)
	}
	return writeOutFiles(od, files)
}

// WriteCardAndTables writes model.json, fit.csv and heldout.csv (the
// form refitted with each protocol left out): what a cohort member's
// folder holds when its report is not written.
func WriteCardAndTables(o *Outcome, od safeout.Sink) error {
	if err := writeOutFiles(od, []outFile{cardFile(o), fitTableFile(o)}); err != nil {
		return err
	}
	folds := HeldoutPredictions(o.Problem, o.Result, nil)
	if folds == nil {
		return nil
	}
	var buf bytes.Buffer
	if err := report.WriteHeldoutTable(&buf, o.Problem, folds); err != nil {
		return err
	}
	return od.Write("heldout.csv", buf.Bytes())
}

// Files lists the files WriteData writes for o, in the order a summary of
// what a folder holds names them (not the order they are written),
// followed by the report's (report.html and plots/).
func Files(o *Outcome) []string {
	files := []string{"model.json", "fit.csv"}
	if o.Discovery != nil {
		files = append(files, "selection.csv")
	}
	files = append(files, "curves.csv")
	if o.Raw != nil {
		files = append(files, "raw.csv")
	}
	if len(o.Problem.Protocols) > 1 {
		files = append(files, "heldout.csv")
	}
	return append(files, "report.html", "plots/")
}

// outFile is one file of an output folder, or the error that prevented it.
type outFile struct {
	name string
	data []byte
	err  error
}

// cardFile is model.json.
func cardFile(o *Outcome) outFile {
	b, err := o.Card.Marshal()
	return outFile{"model.json", b, err}
}

// fitTableFile is fit.csv.
func fitTableFile(o *Outcome) outFile {
	var buf bytes.Buffer
	err := report.WriteFitTable(&buf, o.Problem, o.Result.Model)
	return outFile{"fit.csv", buf.Bytes(), err}
}

// writeOutFiles writes files into od in order; the first error, of
// building a file or of writing it, stops it.
func writeOutFiles(od safeout.Sink, files []outFile) error {
	for _, f := range files {
		if f.err != nil {
			return f.err
		}
		if err := od.Write(f.name, f.data); err != nil {
			return err
		}
	}
	return nil
}

// heldoutAndCurves returns heldout.csv (absent with a single protocol)
// and curves.csv, or the error that prevented the first of them.
func heldoutAndCurves(o *Outcome) []outFile {
	var out []outFile
	if folds := HeldoutPredictions(o.Problem, o.Result, o.chosenCV()); folds != nil {
		var buf bytes.Buffer
		err := report.WriteHeldoutTable(&buf, o.Problem, folds)
		out = append(out, outFile{"heldout.csv", buf.Bytes(), err})
		if err != nil {
			return out
		}
	}
	// The bands use the fits' state, so they come after the held-out
	// refits, which run in parallel.
	models := []report.CurveModel{{Name: "model", Result: o.Result}}
	if o.Discovery != nil {
		for i := range o.Discovery.Presets {
			c := &o.Discovery.Presets[i]
			models = append(models, report.CurveModel{Name: strings.TrimPrefix(c.Name, "preset:"), Result: c.Result})
		}
	}
	var buf bytes.Buffer
	err := report.WriteCurveTable(&buf, o.Problem, models)
	return append(out, outFile{"curves.csv", buf.Bytes(), err})
}
