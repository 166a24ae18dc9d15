package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/planning"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
)

// planOptions are the options of weft plan.
type planOptions struct {
	streams
	// dir is the output folder of a fit; json prints the plan as JSON;
	// write and plot name the files for the top test's path and plot.
	dir         string
	json        bool
	write, plot string
	force       bool
	// top is how many tests the table lists (0: all).
	top int
	// dataLimits and cardLimits bound what is read.
	dataLimits biaxial.Limits
	cardLimits card.Limits
}

func newPlanCmd(s *streams) *cobra.Command {
	o := &planOptions{streams: *s}
	var limits *limitFlags
	cmd := &cobra.Command{
		Use:   "plan DIR [--json] [--write FILE] [--plot FILE.svg|FILE.png]",
		Short: "Rank candidate next tests of a fitted specimen: what each would decide and how much it would narrow the parameters",
		Long: `plan reads the output folder that 'weft fit' wrote (model.json and fit.csv;
nothing is refitted beyond confirming the fit) and ranks candidate next
tests of the same specimen:

  - stretch ratios not yet run, from strip-biaxial 1:0 (axis 2 held at
    stretch 1) through equibiaxial to 0:1;
  - on sutures with the shear tracked by markers (F12, F21 measured, the
    edges free to shear), every ratio;
  - the specimen cut or mounted off-axis, its axis 1 at 15°, 30°, 45°,
    60° or 75° to the current axis 1, every ratio.

Every test peaks where its largest principal stretch, or a fibre family's
stretch, first reaches the largest tested; a test that leaves the tested
range elsewhere is flagged.

Two scores. The information gain, in nats, is the D-optimal criterion
log det(J'J + Jc'Jc) - log det(J'J) from the fit's Gauss-Newton Jacobian
(Atkinson & Donev 1992), with the predicted narrowing of each parameter's
95 % interval. The discrimination is, for each question the data leave open
(one family at +a, at -a or a mirror pair; the signs of the angles; an
undecided family count; the model forms within one standard error of the
best held-out error), the summed squared difference of the competing
explanations' predicted stresses in units of the noise, for the weakest pair
(Hunter & Reiner 1965); D >= 25 (five noise standard deviations) settles it.
Tests that settle something the verdict left open come first, unless
another test's gain is larger by more than ln 10.

The scores rest on the fitted model's own predictions: the ranking holds if
the model's family is right.

` + helpCautions,
		Example: `  # the ranked table
  weft plan membrane-M1.weft

  # the top test's target path for the tester's operator, and its plot
  weft plan membrane-M1.weft --write next-test.csv --plot next-test.svg

  # every candidate as JSON
  weft plan membrane-M1.weft --json`,
		Args: oneFolderArg("plan"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var err error
			if o.dataLimits, o.cardLimits, err = limits.parse(); err != nil {
				return err
			}
			o.dir = args[0]
			return runPlan(o)
		},
	}
	fl := cmd.Flags()
	fl.BoolVar(&o.json, "json", false, "print the plan as JSON (every candidate) instead of the table")
	fl.StringVar(&o.write, "write", "", "write the top test's target path to FILE in weft's input layout, without stress columns")
	fl.StringVar(&o.plot, "plot", "", "draw the top test's predicted stresses under each competing explanation to FILE.svg (SVG) or FILE.png (PNG)")
	fl.BoolVar(&o.force, "force", false, "replace existing --write and --plot files")
	fl.IntVar(&o.top, "top", 15, "how many tests the table lists (0: all; --json lists all)")
	limits = addLimitFlag(cmd)
	return cmd
}

// insideFolder reports whether path lies in folder dir (or is dir),
// however either is spelled: the folders above path that exist are
// compared with dir as files (device and inode), so a symbolic link to
// the folder, or one on the way to it, does not hide it (through one,
// --force replaced the fit's fit.csv). A path whose folders cannot be
// read is compared by name.
func insideFolder(path, dir string) bool {
	p, err1 := filepath.Abs(path)
	d, err2 := filepath.Abs(dir)
	if err1 != nil || err2 != nil {
		return false
	}
	if rel, err := filepath.Rel(d, p); err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return true
	}
	ds, err := os.Stat(dir)
	if err != nil {
		return false
	}
	// The path's own folder is resolved by the system (EvalSymlinks
	// follows a link before a "..", as opening the file would); a path
	// that does not resolve cannot be written either.
	parent, err := filepath.EvalSymlinks(planning.ParentDir(path))
	if err != nil {
		return false
	}
	if st, err := os.Stat(path); err == nil && os.SameFile(st, ds) {
		return true
	}
	for q := parent; ; q = filepath.Dir(q) {
		if st, err := os.Stat(q); err == nil && os.SameFile(st, ds) {
			return true
		}
		if filepath.Dir(q) == q {
			return false
		}
	}
}

// runPlan plans the next test of the fit in o.dir.
func runPlan(o *planOptions) error {
	if o.top < 0 {
		return badInputf("--top %d: give 0 (all) or more", o.top)
	}
	if o.write != "" && o.plot != "" && planning.SameFile(o.write, o.plot) {
		return badInputf("--write and --plot name the same file %s", o.write)
	}
	for _, out := range []struct{ flag, path string }{{"--write", o.write}, {"--plot", o.plot}} {
		// The fit's folder holds the plan's inputs (model.json, fit.csv)
		// and only what 'weft fit' wrote: a plan file there could replace
		// an input, and would keep 'weft fit --force' from replacing the
		// folder later.
		if out.path != "" && insideFolder(out.path, o.dir) {
			return badInputf("%s %s lies inside the fit's folder %s; write the plan's files elsewhere", out.flag, out.path, o.dir)
		}
	}
	// The plot's format follows its name; a name that promises another
	// format (a .pdf, a .jpg) or none would hold SVG under a misleading name.
	if ext := strings.ToLower(filepath.Ext(o.plot)); o.plot != "" && ext != ".svg" && ext != ".png" {
		return badInputf("--plot %s: the plot is drawn as SVG or PNG; name it FILE.svg or FILE.png", o.plot)
	}
	var outs []*safeout.File
	defer func() {
		for _, f := range outs {
			f.Close()
		}
	}()
	prepare := func(path string) (*safeout.File, error) {
		if path == "" {
			return nil, nil
		}
		f, err := safeout.PrepareFile(path, o.force, false)
		if err != nil {
			return nil, outputError(err)
		}
		outs = append(outs, f)
		return f, nil
	}
	writeOut, err := prepare(o.write)
	if err != nil {
		return err
	}
	plotOut, err := prepare(o.plot)
	if err != nil {
		return err
	}
	f, err := readPlanFolder(o.dir, o.dataLimits, o.cardLimits)
	if err != nil {
		return err
	}
	qs, notes := f.Questions()
	d, err := aniso.PlanTests(f.Problem, f.Result, qs, aniso.DesignSettings{})
	if err != nil {
		return checkFailed{msg: o.dir + ": no test could be planned: " + err.Error()}
	}
	pl := planning.NewReport(f, d, append(notes, d.Notes...))
	if writeOut != nil {
		b, err := planning.PathCSV(f, &d.Tests[0].Test)
		if err != nil {
			return err
		}
		if err := writeOut.Commit(b); err != nil {
			return outputError(err)
		}
		pl.Wrote = append(pl.Wrote, o.write)
	}
	if plotOut != nil {
		b, err := planning.Plot(f, d, o.plot)
		if err != nil {
			return checkFailed{msg: "drawing the plot: " + err.Error()}
		}
		if err := plotOut.Commit(b); err != nil {
			return outputError(err)
		}
		pl.Wrote = append(pl.Wrote, o.plot)
	}
	if o.json {
		return writeJSON(o.Out, pl)
	}
	var buf bytes.Buffer
	planning.Print(&buf, pl, o.top)
	_, err = o.Out.Write(buf.Bytes())
	return err
}

// readPlanFolder reads dir's model.json and fit.csv within the limits and
// rebuilds the fit; a folder that is not one fit's is bad input (exit 2),
// a fit that cannot be rebuilt as the card states it fails (exit 1).
func readPlanFolder(dir string, dl biaxial.Limits, cl card.Limits) (*planning.Folder, error) {
	ff, err := readFitFolder(dir, dl, cl, "a plan needs model.json and fit.csv as 'weft fit' writes them", []string{"model.json", "fit.csv"}, nil)
	if err != nil {
		return nil, err
	}
	dl, cl = withDefaultSizes(dl, cl)
	f, err := planning.Rebuild(dir, ff.files["model.json"], ff.files["fit.csv"], dl, cl)
	var re *planning.RebuildError
	switch {
	case errors.As(err, &re):
		return nil, checkFailed{msg: re.Msg}
	case err != nil:
		return nil, withLimitHint(err)
	}
	return f, nil
}
