package main

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"
)

func init() { commands = append(commands, newReportCmd) }

// reportFile is one file of the report: report.html or plots/NAME.
type reportFile struct {
	rel  string
	data []byte
}

// reportFigures lists the report's figures in the order they appear.
func (in *reportInput) reportFigures(strain bool) []*figure {
	t := in.table
	var figs []*figure
	if t.hasNormal() {
		figs = append(figs, in.fitGridFigure(strain))
	}
	for i := range t.protocols {
		figs = append(figs, in.fitFigure(i, strain))
	}
	if t.hasNormal() {
		figs = append(figs, in.residualFigure(false, strain))
	}
	if t.hasShear() {
		figs = append(figs, in.residualFigure(true, strain))
	}
	if in.split != nil && len(in.split.Protocols) > 0 {
		figs = append(figs, in.shareFigure())
	}
	if terms := t.activeTerms(); len(terms) > 0 {
		for i := range t.protocols {
			figs = append(figs, in.splitFigure(i, strain, terms))
		}
	}
	for _, f := range []*figure{in.profileFigure(), in.paretoFigure(), in.crossFigure()} {
		if f != nil {
			figs = append(figs, f)
		}
	}
	return figs
}

// buildReport draws every figure and writes report.html; it returns the
// files in a fixed order (report.html first, then plots/ by figure order,
// SVG before PNG).
func buildReport(in *reportInput, strain bool) ([]reportFile, error) {
	figs, err := renderAll(in.reportFigures(strain))
	if err != nil {
		return nil, err
	}
	html, err := reportHTML(in, figs, strain)
	if err != nil {
		return nil, err
	}
	files := []reportFile{{rel: "report.html", data: html}}
	for _, f := range figs {
		files = append(files, reportFile{rel: path.Join("plots", f.name+".svg"), data: f.svg}, reportFile{rel: path.Join("plots", f.name+".png"), data: f.png})
	}
	return files, nil
}

// writeReportFiles is weft fit's hook: it writes heldout.csv (the model
// form refitted with each protocol left out, predicting it), then reads the
// folder's files back, exactly as 'weft report' does, and writes
// report.html and plots/ into the folder before it is committed.
func writeReportFiles(od *outputDir, o *fitOutcome) error {
	if folds := heldoutPredictions(o); folds != nil {
		var buf bytes.Buffer
		if err := writeHeldoutCSV(&buf, o, folds); err != nil {
			return err
		}
		if err := od.write("heldout.csv", buf.Bytes()); err != nil {
			return err
		}
	}
	// Messages name the folder the user will see, not the temporary one.
	named := func(err error) error {
		return fmt.Errorf("building the report: %s", strings.ReplaceAll(err.Error(), od.tmp, od.final))
	}
	in, err := loadReportInput(od.tmp)
	if err != nil {
		return named(err)
	}
	files, err := buildReport(in, false)
	if err != nil {
		return named(err)
	}
	for _, f := range files {
		if err := od.write(filepath.FromSlash(f.rel), f.data); err != nil {
			return err
		}
	}
	return nil
}

// reportFilesNote lists, for the fit summary, the files writeReportFiles
// adds to the folder.
func reportFilesNote(o *fitOutcome) string {
	if len(o.prob.Protocols) > 1 {
		return ", heldout.csv, report.html, plots/"
	}
	return ", report.html, plots/"
}

func newReportCmd() *cobra.Command {
	var strain, force bool
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
presets, the matrix/fibre split, every plot and the cautions. plots/ holds
each plot as SVG and PNG.

weft fit already writes the report, so replacing it needs --force.

Parameters are research-grade and specimen-specific, valid only within the
tested range, not for clinical decisions.`,
		Example: `  # plot against Green strain E = (λ² − 1)/2 instead of stretch
  weft report skin-A.weft --strain --force`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) != 1 {
				return badInputf("report needs one output folder DIR (see 'weft report --help')")
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			return runReport(cmd, args[0], strain, force, limits)
		},
	}
	cmd.Flags().BoolVar(&strain, "strain", false, "plot against Green strain E = ½(λ² − 1) instead of stretch λ")
	cmd.Flags().BoolVar(&force, "force", false, "replace an existing report.html and plots/")
	limits = addLimitFlag(cmd)
	return cmd
}

func runReport(cmd *cobra.Command, dir string, strain, force bool, limits *limitFlags) error {
	dl, cl, err := limits.parse()
	if err != nil {
		return err
	}
	in, err := loadReportInputLimits(dir, dl, cl)
	if err != nil {
		return err
	}
	dir = filepath.Clean(dir)
	lock, err := lockOutput(dir)
	if err != nil {
		return lockError(dir, err)
	}
	defer lock.release()
	htmlPath, plotsPath := filepath.Join(dir, "report.html"), filepath.Join(dir, "plots")
	html, err := prepareOutputFile(htmlPath, force, true)
	if err != nil {
		return err
	}
	listed, hasMarker, err := readMarker(dir)
	if err != nil {
		return badInput(err)
	}
	if err := checkPlots(plotsPath, force, listed, hasMarker); err != nil {
		return err
	}
	removeStale(htmlPath)
	removeStale(plotsPath)
	files, err := buildReport(in, strain)
	if err != nil {
		return err
	}
	if err := replacePlots(plotsPath, files[1:]); err != nil {
		return err
	}
	if err := html.commit(files[0].data); err != nil {
		return err
	}
	if hasMarker {
		if err := updateMarker(dir, listed, files); err != nil {
			return err
		}
	}
	fmt.Fprintf(cmd.OutOrStdout(), "wrote %s and %s/ (%d plots as SVG and PNG)\n", htmlPath, plotsPath, (len(files)-1)/2)
	return nil
}

// checkPlots makes sure plots/ may be replaced: it does not exist, or
// (with force) it is a folder that holds only plots weft wrote.
func checkPlots(plotsPath string, force bool, listed map[string]bool, hasMarker bool) error {
	st, err := os.Lstat(plotsPath)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		return badInputf("cannot use %s (%s)", plotsPath, ioErrText(err))
	case !force:
		return badInputf("%s exists; pass --force to replace report.html and plots/", plotsPath)
	case !st.IsDir() || st.Mode()&fs.ModeSymlink != 0:
		return badInputf("%s exists and is %s, not weft's plots folder; it is kept — move it elsewhere and run again", plotsPath, kindOf(st.Mode()))
	}
	entries, err := os.ReadDir(plotsPath)
	if err != nil {
		return badInputf("cannot read %s (%s)", plotsPath, ioErrText(err))
	}
	var foreign []string
	for _, e := range entries {
		rel := "plots/" + e.Name()
		ok := e.Type().IsRegular() && (hasMarker && listed[rel] || !hasMarker && legacyPlot(rel)) || isWeftHelper(e.Name())
		if !ok && len(foreign) < 5 {
			foreign = append(foreign, rel)
		}
	}
	if len(foreign) > 0 {
		return badInputf("%s holds files weft did not write (%s); replacing plots/ would delete them, so it is kept — move them elsewhere and run again", plotsPath, strings.Join(foreign, ", "))
	}
	return nil
}

// replacePlots writes the plot files into a temporary sibling folder and
// swaps it in for plots/, so that a reader never sees a mixture of old and
// new plots.
func replacePlots(plotsPath string, files []reportFile) error {
	parent := filepath.Dir(plotsPath)
	cleanup.mu.Lock()
	tmp := filepath.Join(parent, ".plots"+tmpTag+randomTag())
	err := os.Mkdir(tmp, 0o777)
	if err == nil {
		trackTemp(tmp)
	}
	cleanup.mu.Unlock()
	if err != nil {
		return fmt.Errorf("cannot write %s (%s)", plotsPath, ioErrText(err))
	}
	defer func() {
		os.RemoveAll(tmp)
		untrackTemp(tmp)
	}()
	for _, f := range files {
		if err := writeNewFile(filepath.Join(tmp, filepath.Base(f.rel)), f.data); err != nil {
			return fmt.Errorf("cannot write %s (%s)", filepath.Join(plotsPath, filepath.Base(f.rel)), ioErrText(err))
		}
	}
	cleanup.mu.Lock()
	old := ""
	if _, err := os.Lstat(plotsPath); err == nil {
		old = filepath.Join(parent, ".plots"+oldTag+randomTag())
		if err := os.Rename(plotsPath, old); err != nil {
			cleanup.mu.Unlock()
			return fmt.Errorf("cannot replace %s (%s)", plotsPath, ioErrText(err))
		}
		trackTemp(old)
	}
	if err := os.Rename(tmp, plotsPath); err != nil {
		if old != "" && os.Rename(old, plotsPath) == nil {
			delete(cleanup.temps, old)
		}
		cleanup.mu.Unlock()
		return fmt.Errorf("cannot write %s (%s)", plotsPath, ioErrText(err))
	}
	cleanup.mu.Unlock()
	if old != "" {
		os.RemoveAll(old)
		untrackTemp(old)
	}
	return nil
}

// updateMarker rewrites the folder's marker after the report was rebuilt:
// the old plots leave the list, the new ones join it.
func updateMarker(dir string, listed map[string]bool, files []reportFile) error {
	var names []string
	for k := range listed {
		if !strings.HasPrefix(k, "plots/") {
			names = append(names, k)
		}
	}
	for _, f := range files {
		names = append(names, f.rel)
	}
	m, err := prepareOutputFile(filepath.Join(dir, markerName), true, true)
	if err != nil {
		return err
	}
	return m.commit(markerBytes(names))
}
