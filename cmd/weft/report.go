package main

import (
	"errors"
	"fmt"
	"path"
	"path/filepath"
	"strings"

	"github.com/weft-tools/weft/cmd/weft/internal/report"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// reportOptions are the options of weft report.
type reportOptions struct {
	streams
	// dir is the output folder; strain plots against Green strain.
	dir           string
	strain, force bool
	// png also writes every plot as PNG.
	png bool
	// dataLimits and cardLimits bound what is read.
	dataLimits biaxial.Limits
	cardLimits card.Limits
}

func newReportCmd(s *streams) *cobra.Command {
	o := &reportOptions{streams: *s}
	var limits *limitFlags
	cmd := &cobra.Command{
		Use:   "report DIR",
		Short: "Rebuild the fit report (report.html and plots/) of an output folder without refitting",
		Long: `report reads the output folder that 'weft fit' wrote (model.json, fit.csv
and, when present, heldout.csv) and writes report.html and plots/ into it
again: no data file is read and nothing is refitted.

report.html is one self-contained file (plots inlined as SVG; no external
fonts, scripts or links) that prints and reads offline. It holds the
specimen and data summary, the model with its energy and parameter table,
the family verdict with its evidence, the comparison with classical
presets, who carries the load, the admissibility checks, the methods and
traceability, every plot and the cautions. plots/ holds each plot as SVG;
--png adds a PNG (144 dpi) of each.

weft fit already writes the report, so replacing it needs --force.

` + helpCautions,
		Example: `  # plot against Green strain E = (λ² − 1)/2 instead of stretch
  weft report skin-A.weft --strain --force

  # PNG files of every plot too, e.g. for slides
  weft report skin-A.weft --png --force`,
		Args: oneFolderArg("report"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var err error
			if o.dataLimits, o.cardLimits, err = limits.parse(); err != nil {
				return err
			}
			o.dir = args[0]
			return runReport(o)
		},
	}
	cmd.Flags().BoolVar(&o.strain, "strain", false, "plot against Green strain E = ½(λ² − 1) instead of stretch λ")
	cmd.Flags().BoolVar(&o.force, "force", false, "replace an existing report.html and plots/")
	cmd.Flags().BoolVar(&o.png, "png", false, "also write every plot as PNG (144 dpi) beside its SVG in plots/")
	limits = addLimitFlag(cmd)
	return cmd
}

// betweenReportCommits, nil but in tests, runs between the commit of a
// report's plots/ and that of its page, where a test delivers a signal.
var betweenReportCommits func()

// afterReportPlotsStaged, nil but in tests, runs once the new plots are
// written beside plots/ and before the commits, where a test delivers a
// signal.
var afterReportPlotsStaged func()

// runReport rebuilds the report of the folder o.dir.
func runReport(o *reportOptions) error {
	dir, strain, force := o.dir, o.strain, o.force
	in, err := loadReportFolder(dir, o.dataLimits, o.cardLimits)
	if err != nil {
		return err
	}
	dir = filepath.Clean(dir)
	lock, err := safeout.Acquire(dir)
	var lf *safeout.Error
	if errors.As(err, &lf) && lf.Problem == safeout.LockFailed {
		// The lock of an output folder lies beside it, where a fit that
		// replaces the folder takes it too. A parent that cannot hold
		// the lock cannot take that replacement either (a rename in
		// it), so only other reports are left to exclude, and their
		// lock can lie inside the folder, which is all a report writes.
		lock, err = safeout.Acquire(filepath.Join(dir, "report.html"))
	}
	if err != nil {
		return outputError(err)
	}
	defer lock.Release()
	htmlPath, plotsPath := filepath.Join(dir, "report.html"), filepath.Join(dir, "plots")
	html, err := safeout.PrepareFile(htmlPath, force, true)
	if err != nil {
		return outputError(err)
	}
	listed, hasMarker, err := safeout.ReadMarker(dir)
	if err != nil {
		return err
	}
	if err := safeout.CheckPlots(plotsPath, force, listed, hasMarker); err != nil {
		return plotsError(err)
	}
	safeout.RemoveStale(htmlPath)
	safeout.RemoveStale(plotsPath)
	files, err := report.Build(in, report.Options{Strain: strain, PNG: o.png, Software: versionText()})
	if err != nil {
		return err
	}
	plots := make([]safeout.FileData, 0, len(files)-1)
	for _, f := range files[1:] {
		plots = append(plots, safeout.FileData{Name: path.Base(f.Rel), Data: f.Data})
	}
	// The plots are written before the hold (writing them is work: an
	// interruption meanwhile is handled at once and leaves the old report
	// whole). The plots, the page and the marker are then three commits:
	// an interruption between them left new plots beside the old page,
	// and the new plots missing from the marker, so that weft refused to
	// replace its own PNGs afterwards ('holds files weft did not write').
	// A signal now waits for the three.
	staged, err := safeout.StagePlots(plotsPath, plots)
	if err != nil {
		return err
	}
	defer staged.Discard()
	if afterReportPlotsStaged != nil {
		afterReportPlotsStaged()
	}
	release := safeout.HoldInterruptions()
	defer release()
	if err := staged.Commit(); err != nil {
		return err
	}
	if betweenReportCommits != nil {
		betweenReportCommits()
	}
	pageErr := html.Commit(files[0].Data)
	if hasMarker {
		// The new plots are in place even when the page could not be
		// written: listed, they stay weft's to replace.
		var names []string
		for i, f := range files {
			if i > 0 || pageErr == nil {
				names = append(names, f.Rel)
			}
		}
		if err := safeout.UpdateMarker(dir, listed, "plots", names); err != nil && pageErr == nil {
			return outputError(err)
		}
	}
	if pageErr != nil {
		return outputError(pageErr)
	}
	release()
	what := "SVG"
	if o.png {
		what = "SVG and PNG"
	}
	fmt.Fprintf(o.Out, "wrote %s and %s/ (%d plots as %s)\n", htmlPath, plotsPath, plotCount(files), what)
	return nil
}

// plotsError adds to a problem with the plots/ folder what to do about it:
// the folder is rebuilt as a whole, so anything else in it must go first.
func plotsError(err error) error {
	var e *safeout.Error
	if !errors.As(err, &e) {
		return err
	}
	c := *e
	switch e.Problem {
	case safeout.Exists:
		c.Advice = "; pass --force to replace report.html and plots/"
	case safeout.NotOutputFolder:
		c.Advice = " — move it elsewhere and run again"
	case safeout.Foreign:
		c.Advice = " — move them elsewhere and run again"
	}
	return &c
}

// loadReportFolder reads an output folder for its report: model.json
// within the card limits cl, fit.csv and heldout.csv within the file size
// limit of dl. A folder that lacks what the report needs is bad input
// (exit 2) with a message saying what is missing and what to type.
func loadReportFolder(dir string, dl biaxial.Limits, cl card.Limits) (*report.Input, error) {
	ff, err := readFitFolder(dir, dl, cl, "the report needs model.json and fit.csv as 'weft fit' writes them (fit the data again into a new folder with 'weft fit DATA -o NEW-FOLDER')",
		[]string{"model.json", "fit.csv"}, []string{"heldout.csv", "curves.csv", "raw.csv"})
	if err != nil {
		return nil, err
	}
	f := report.Folder{Files: ff.entries, ModelJSON: ff.files["model.json"], FitCSV: ff.files["fit.csv"],
		HeldoutCSV: ff.files["heldout.csv"], CurvesCSV: ff.files["curves.csv"], RawCSV: ff.files["raw.csv"]}
	in, err := report.Parse(f, cl)
	if err != nil {
		return nil, badInputf("%s: %v%s", dir, err, reportInputHint(err))
	}
	return in, nil
}

// reportInputHint says what to type when the card lacks a section the
// report needs.
func reportInputHint(err error) string {
	var ie *report.InputError
	if !errors.As(err, &ie) {
		return ""
	}
	switch ie.MissingSection {
	case card.KeyFit:
		return ": it is not a card written by 'weft fit', which the report needs"
	case card.KeyData:
		return "; refit with 'weft fit'"
	}
	return ""
}

// plotCount counts the plots among a report's files (one SVG each).
func plotCount(files []report.File) int {
	n := 0
	for _, f := range files {
		if strings.HasSuffix(f.Rel, ".svg") {
			n++
		}
	}
	return n
}
