package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/fitfolder"
	"github.com/weft-tools/weft/cmd/weft/internal/report"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
	"github.com/weft-tools/weft/cmd/weft/internal/summary"
	"github.com/weft-tools/weft/terms"
)

// fitOptions are the options of weft fit.
type fitOptions struct {
	streams
	// files are the DATA files; read says how to read them.
	files   []string
	read    biaxial.Options
	out     string
	force   bool
	preset  string
	termIDs string
	// termsGiven is true when --terms was given, even empty.
	termsGiven bool
	families   int
	layout     string
	dispersion string
	pairAxis   string
	maxTerms   int
	asJSON     bool
	quiet      bool
	// png also writes every plot as PNG beside its SVG.
	png bool
	// calibration > 0 also discovers each specimen with axis 1's stress
	// scaled by 1 ± calibration (aniso.AxisScaleCheck).
	calibration float64
}

// discoveryDispersion is the fibre spread discovery tries besides ideal
// families: --dispersion as given, in-plane when it was not.
func (ff *fitOptions) discoveryDispersion() string {
	if ff.dispersion == "" {
		return "in-plane"
	}
	return ff.dispersion
}

// discoverSettings are the discovery settings the flags choose.
func (ff *fitOptions) discoverSettings() aniso.DiscoverSettings {
	disp := ff.discoveryDispersion()
	return aniso.DiscoverSettings{MaxTerms: ff.maxTerms, NoPlanar: disp != "in-plane", Dispersion: disp == "kappa"}
}

func newFitCmd(s *streams) *cobra.Command {
	ff := &fitOptions{streams: *s}
	cmd := &cobra.Command{
		Use:   "fit DATA...",
		Short: "Discover or fit a constitutive model for each specimen file",
		Long: `fit reads one planar biaxial test file per specimen (CSV or xlsx, see the
README for the layout) and writes an output folder per specimen with the
model card (model.json), the point-by-point fit (fit.csv) and, when the model
was discovered, the selection evidence (selection.csv), plus the report.

Without --preset or --terms, fit DISCOVERS the model: which catalogue terms
and how many fibre families (0, 1 or 2; one family, a mirror pair or two free
angles) the data support, the fibre angles, and how the stress splits between
matrix and fibres. The pick is the smallest model whose leave-one-protocol-out
error is within one standard error of the best; the output states the rule
and the numbers, the family verdict with its evidence, and classical models
fitted to the same data for comparison.

With --preset NAME or --terms ID,ID,... it fits that model form only, with
learned fibre angles, and reports how well each parameter is determined.

The output folder defaults to <specimen>.weft next to the input. An existing
folder is never replaced without --force, and --force replaces only a folder
weft wrote that holds nothing else (its .weft-output file lists weft's
files); any other folder, file, device or pipe is kept and the run stops
with exit code 2. A second weft run writing the same folder at the same time
stops at once. With several DATA files every file is tried; the failures are
listed at the end and the exit code is 1 (2 when every file was bad input
and nothing was written).

` + helpCautions,
		Example: `  # discover the model of one specimen
  weft fit skin-A.csv

  # the two-family fibre model of Holzapfel, Gasser & Ogden 2000
  weft fit skin-A.csv --preset hgo -o skin-A-hgo

  # the same pair with its axis learned instead of held on axis 1
  weft fit skin-A.csv --preset hgo --pair-axis free

  # a chosen form: Demiray matrix plus one exponential fibre family
  weft fit skin-A.csv --terms i1-exp,fib-expsq --families 1

  # a chosen form whose fibres spread in the plane (learned concentration)
  weft fit skin-A.csv --terms i1-lin,fib-expsq --families 1 --dispersion in-plane

  # several specimens, each into its own folder; discovery without the
  # dispersed layouts
  weft fit a.csv b.csv c.xlsx --dispersion none

  # does the fibre verdict survive a 5 % error of one axis's load cell?
  weft fit skin-A.csv --calibration-check 0.05`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				return badInputf("fit needs at least one DATA file (see 'weft fit --help')")
			}
			return nil
		},
	}
	rf := addReadFlags(cmd)
	fl := cmd.Flags()
	fl.StringVarP(&ff.out, "output", "o", "", "output folder (default <specimen>.weft next to the input; with several inputs, the parent of one folder per specimen)")
	fl.BoolVar(&ff.force, "force", false, "replace an existing output folder that weft wrote (never anything else)")
	fl.StringVar(&ff.preset, "preset", "", "fit a classical preset instead of discovering (see 'weft terms')")
	fl.StringVar(&ff.termIDs, "terms", "", "fit these catalogue terms instead of discovering, comma-separated; fibre terms apply to every family")
	fl.IntVar(&ff.families, "families", -1, "fibre families for --terms: 0, 1 or 2")
	fl.Lookup("families").DefValue = "1 with a fibre term, else 0"
	fl.StringVar(&ff.layout, "layout", "", "two families for --terms: free (independent angles; the default) or mirror (θ ± β, shared stiffness)")
	fl.StringVar(&ff.dispersion, "dispersion", "", "how fibres spread about their mean direction: in-plane (a learned concentration, angular integration), kappa (the 3-D dispersion κ of Gasser, Ogden & Holzapfel 2006) or none; discovery tries in-plane besides ideal families unless told otherwise, --terms fits ideal families unless told otherwise")
	fl.StringVar(&ff.pairAxis, "pair-axis", "", "axis of a mirror pair (--preset hgo or goh, or --layout mirror): axis-1 holds the pair symmetric about axis 1 at ±β, as published (the default); free learns the pair's axis θ as well")
	fl.IntVar(&ff.maxTerms, "max-terms", 5, "largest number of terms discovery considers")
	fl.Float64Var(&ff.calibration, "calibration-check", 0, "also discover with axis 1's stress scaled by 1+F and 1-F (a per-axis load-cell or loaded-width error, e.g. 0.05) and report whether the fibre verdict holds; triples discovery's time (0: off)")
	fl.BoolVar(&ff.asJSON, "json", false, "print the model card(s) as JSON instead of the summary")
	fl.BoolVar(&ff.quiet, "quiet", false, "no progress bar")
	fl.BoolVar(&ff.png, "png", false, "also write every plot as PNG (144 dpi) beside its SVG in plots/")
	cmd.RunE = func(cmd *cobra.Command, args []string) error {
		opt, err := rf.options()
		if err != nil {
			return err
		}
		ff.files, ff.read = args, opt
		ff.termsGiven = cmd.Flags().Changed("terms")
		return runFit(ff)
	}
	return cmd
}

// structureFromFlags turns --preset or --terms into a model form; ok is
// false when neither was given (discovery).
func structureFromFlags(ff *fitOptions) (aniso.Structure, bool, error) {
	st, ok, err := formFromFlags(ff)
	if err != nil {
		return st, ok, err
	}
	switch ff.pairAxis {
	case "":
	case "axis-1", "free":
		if !ok || st.Layout != aniso.LayoutMirror {
			return st, false, badInputf("--pair-axis applies to a mirror pair: --preset hgo or goh, or --terms with --families 2 --layout mirror")
		}
	default:
		return st, false, badInputf("--pair-axis %q: use axis-1 or free", ff.pairAxis)
	}
	if ok && st.Layout == aniso.LayoutMirror {
		st.HoldPairAxis = ff.pairAxis != "free"
	}
	return st, ok, nil
}

// formFromFlags reads --preset or --terms and their layout flags.
func formFromFlags(ff *fitOptions) (aniso.Structure, bool, error) {
	if ff.preset != "" && ff.termIDs != "" {
		return aniso.Structure{}, false, badInputf("give --preset or --terms, not both")
	}
	switch ff.dispersion {
	case "", "none", "in-plane", "kappa":
	default:
		return aniso.Structure{}, false, badInputf("--dispersion %q: use in-plane, kappa or none", ff.dispersion)
	}
	if ff.preset != "" && ff.dispersion != "" {
		return aniso.Structure{}, false, badInputf("--dispersion does not apply to --preset: a preset has its published form (see 'weft terms')")
	}
	if ff.preset != "" && (ff.layout != "" || ff.families >= 0) {
		return aniso.Structure{}, false, badInputf("--layout and --families apply to --terms; a preset has its published form (see 'weft terms')")
	}
	if ff.preset != "" {
		st, err := aniso.PresetStructure(ff.preset)
		if err != nil {
			return st, false, badInput(err)
		}
		return st, true, nil
	}
	if ff.termIDs == "" && ff.termsGiven {
		return aniso.Structure{}, false, badInputf("--terms is empty: name the catalogue terms to fit, comma-separated ('weft terms' lists them), or leave --terms out to discover the model")
	}
	if ff.termIDs == "" {
		if ff.layout != "" {
			return aniso.Structure{}, false, badInputf("--layout applies to --terms with --families 2; discovery compares the layouts itself")
		}
		if ff.families >= 0 {
			return aniso.Structure{}, false, badInputf("--families applies to --terms; discovery compares 0, 1 and 2 families itself")
		}
		return aniso.Structure{}, false, nil
	}
	var iso, fib []*terms.Shape
	seen := map[string]bool{}
	for _, id := range strings.Split(ff.termIDs, ",") {
		id = strings.TrimSpace(id)
		sh := terms.Lookup(id)
		if sh == nil {
			return aniso.Structure{}, false, badInputf("--terms: %q is not a catalogue term; 'weft terms' lists them", id)
		}
		if seen[sh.ID] {
			// Two copies of one term have the same column: their weights
			// cannot be told apart.
			return aniso.Structure{}, false, badInputf("--terms: %s appears twice; give each term once (a fibre term applies to every family)", id)
		}
		seen[sh.ID] = true
		if sh.Arg.NeedsFamily() {
			fib = append(fib, sh)
		} else {
			iso = append(iso, sh)
		}
	}
	nf := ff.families
	if nf < 0 {
		nf = 0
		if len(fib) > 0 {
			nf = 1
		}
	}
	var st aniso.Structure
	switch ff.dispersion {
	case "", "none":
	case "in-plane":
		st.Planar = true
	case "kappa":
		st.Dispersion = true
	}
	switch nf {
	case 0:
		st.Layout = aniso.LayoutNone
	case 1:
		st.Layout = aniso.LayoutSingle
	case 2:
		switch ff.layout {
		case "", "free":
			st.Layout = aniso.LayoutFree
		case "mirror":
			st.Layout = aniso.LayoutMirror
		default:
			return st, false, badInputf("--layout %q: use free or mirror", ff.layout)
		}
	default:
		return st, false, badInputf("--families %d: use 0, 1 or 2", nf)
	}
	if nf != 2 && ff.layout != "" {
		return st, false, badInputf("--layout %s applies to two families; add --families 2 (or leave --layout out for %d)", ff.layout, nf)
	}
	for _, sh := range iso {
		st.Terms = append(st.Terms, aniso.TermSpec{Shape: sh, Family: -1})
	}
	fams := nf
	if st.Layout == aniso.LayoutMirror {
		fams = 1
	}
	for f := 0; f < fams; f++ {
		for _, sh := range fib {
			st.Terms = append(st.Terms, aniso.TermSpec{Shape: sh, Family: f})
		}
	}
	if err := st.Validate(); err != nil {
		return st, false, badInput(err)
	}
	return st, true, nil
}

// fitJob is one DATA file of a fit run and what became of it.
type fitJob struct {
	path string
	// rows, when set, is the file as read, for the record view.
	rows *biaxial.Rows
	spec *biaxial.Specimen
	dir  string
	od   *safeout.Dir
	err  error
}

// outputFolders decides the output folder of each job that was read; a
// job whose folder another job already claims fails.
func outputFolders(jobs []*fitJob, out string) {
	seen := map[string]string{}
	several := len(jobs) > 1
	var files []*fitJob // read so far, to tell a file given twice
	for _, j := range jobs {
		if j.err != nil {
			continue
		}
		if prev := sameFileAs(j.path, files); prev != "" {
			j.err = badInputf("%s is given twice (also as %s); give each file once", j.path, prev)
			continue
		}
		files = append(files, j)
		name := report.SafeName(j.spec.Name)
		if name == "" || name == "." || name == ".." {
			name = strings.TrimSuffix(filepath.Base(j.path), filepath.Ext(j.path))
		}
		switch {
		case out != "" && !several:
			j.dir = out
		case out != "":
			j.dir = filepath.Join(out, name+".weft")
		default:
			j.dir = filepath.Join(filepath.Dir(j.path), name+".weft")
		}
		// Case is ignored: on a case-insensitive disk (macOS, Windows)
		// the two folders would be one.
		key := strings.ToLower(filepath.Clean(j.dir))
		if prev, dup := seen[key]; dup {
			j.err = badInputf("%s and %s would both write %s (their specimen names give the same folder name, ignoring case); give them different 'specimen' metadata or fit them separately with -o", prev, j.path, j.dir)
			continue
		}
		seen[key] = j.path
	}
}

// sameFileAs returns the path of the job in jobs that names the same file
// on disk as path (safeout.SameFile: another spelling, a link), or "".
func sameFileAs(path string, jobs []*fitJob) string {
	for _, j := range jobs {
		if safeout.SameFile(path, j.path) {
			return j.path
		}
	}
	return ""
}

// runFit fits every DATA file. Each file is read and its output folder
// checked before any fitting starts; a file that fails does not stop the
// others. Every failure is reported at the end.
func runFit(ff *fitOptions) error {
	args := ff.files
	st, chosen, err := structureFromFlags(ff)
	if err != nil {
		return err
	}
	if ff.maxTerms < 1 || ff.maxTerms > 8 {
		return badInputf("--max-terms %d: use 1 to 8", ff.maxTerms)
	}
	if !(ff.calibration >= 0 && ff.calibration < 0.5) {
		return badInputf("--calibration-check %g: give a fraction from 0 (off) to below 0.5, e.g. 0.05 for ±5 %%", ff.calibration)
	}
	if ff.calibration > 0 && chosen {
		return badInputf("--calibration-check asks whether discovery's verdict on the fibre families holds; it does not apply to a chosen form (--preset, --terms)")
	}
	jobs := make([]*fitJob, len(args))
	for i, path := range args {
		jobs[i] = &fitJob{path: path}
		if len(args) == 1 {
			// One file is read once: its rows also give the report's
			// view of the whole record. With several, each is read again
			// for that view while it is fitted, so that the rows of every
			// file are not held at once.
			jobs[i].rows, jobs[i].spec, jobs[i].err = readRows(path, ff.read)
			continue
		}
		jobs[i].spec, jobs[i].err = readSpecimen(path, ff.read)
	}
	outputFolders(jobs, ff.out)
	container, err := prepareContainer(ff.out, len(jobs) > 1)
	if err != nil {
		return err
	}
	defer container.removeIfEmpty()
	for _, j := range jobs {
		if j.err == nil {
			j.od, j.err = safeout.PrepareDir(j.dir, ff.force, args)
			j.err = outputError(j.err)
		}
	}
	defer func() {
		for _, j := range jobs {
			j.od.Close()
		}
	}()
	form := formOptionList(ff, st, chosen)
	var outcomes []*fitOutcome
	for _, j := range jobs {
		if j.err != nil {
			continue
		}
		// The view of the whole record (every cycle and branch) for the
		// report is prepared while the model is fitted: from the rows
		// already read for one file, else by reading the file again (a
		// long record takes a few tenths of a second to parse).
		type recordView struct {
			raw     *biaxial.Specimen
			changed bool
		}
		view := make(chan recordView, 1)
		// The rows are let go once the view is prepared.
		rows := j.rows
		j.rows = nil
		go func() {
			if rows != nil {
				view <- recordView{recordViewOf(rows, ff.read), false}
				return
			}
			raw, changed := readRecordView(j.path, ff.read, j.spec.Digest)
			view <- recordView{raw, changed}
		}()
		o, err := fitOne(j.spec, st, chosen, ff)
		if err == nil {
			o.Card.Provenance, err = fitProvenance(j.path, j.spec, ff.read, form)
		}
		rv := <-view
		if err == nil {
			o.dir, o.png = j.dir, ff.png
			o.Raw = rv.raw
			if rv.changed {
				fmt.Fprintf(ff.ErrOut, "weft: warning: %s changed after it was read for the fit; raw.csv and the report's view of the whole record are left out (fit the file again once it is complete)\n", j.path)
			}
			err = writeFitOutputs(o, j.od, ff.force)
		}
		j.od.Close()
		if err != nil {
			j.err = err
			continue
		}
		outcomes = append(outcomes, o)
		if o.Result.Model.MatrixWeight() == 0 {
			fmt.Fprintf(ff.ErrOut, "weft: warning: %s: %s; check it with 'weft check' before an FE analysis, or fit a form with a matrix term (--terms, --preset)\n", j.spec.Name, summary.ZeroMatrixWarning)
		}
		if !ff.asJSON {
			printFitSummary(ff.Out, o)
		}
	}
	if ff.asJSON && len(outcomes) > 0 {
		if err := printCardsJSON(ff.Out, outcomes, len(jobs) > 1); err != nil {
			return err
		}
	}
	return fitFailures(jobs)
}

// fitFailures is nil when every job succeeded, the one error of a single
// file, or a list of every failure: exit code 1, or 2 when every file was
// bad input and nothing was written.
func fitFailures(jobs []*fitJob) error {
	var failed []*fitJob
	allBad := true
	for _, j := range jobs {
		if j.err != nil {
			failed = append(failed, j)
			allBad = allBad && exitCode(j.err) == exitBadInput
		}
	}
	switch {
	case len(failed) == 0:
		return nil
	case len(jobs) == 1:
		return failed[0].err
	}
	var b strings.Builder
	fmt.Fprintf(&b, "%d of %d files failed", len(failed), len(jobs))
	if len(failed) < len(jobs) {
		b.WriteString(" (the others were written)")
	}
	b.WriteString(":")
	for _, j := range failed {
		msg := j.err.Error()
		if !strings.HasPrefix(msg, j.path) {
			msg = j.path + ": " + msg
		}
		b.WriteString("\n  " + msg)
	}
	if allBad && len(failed) == len(jobs) {
		return badInputf("%s", b.String())
	}
	return errors.New(b.String())
}

// containerDir is the -o folder that holds one output folder per specimen
// when several files are fitted; weft creates it when it is missing and
// removes it again if nothing was written into it.
type containerDir struct {
	path    string
	created bool
}

func prepareContainer(out string, several bool) (*containerDir, error) {
	c := &containerDir{path: out}
	if out == "" || !several {
		return c, nil
	}
	st, err := os.Stat(out)
	switch {
	case err == nil && !st.IsDir():
		return nil, badInputf("-o %s: with several DATA files -o names the folder that receives one folder per specimen, but %s is %s", out, out, safeout.KindOf(st.Mode()))
	case err == nil:
		return c, nil
	case !errors.Is(err, fs.ErrNotExist):
		return nil, badInputf("cannot use %s (%s)", out, safeout.Reason(err))
	}
	if err := safeout.CheckParent(filepath.Clean(out)); err != nil {
		return nil, outputError(err)
	}
	if err := os.Mkdir(out, 0o777); err != nil && !errors.Is(err, fs.ErrExist) {
		return nil, badInputf("cannot create %s (%s)", out, safeout.Reason(err))
	}
	c.created = true
	return c, nil
}

func (c *containerDir) removeIfEmpty() {
	if c != nil && c.created {
		os.Remove(c.path) // fails, as it should, unless the folder is empty
	}
}

// fitFailed reports a fit that could not succeed (exit code 1), with what
// to type where the data gave discovery nothing to work with.
func fitFailed(s *biaxial.Specimen, err error) error {
	switch {
	case errors.Is(err, aniso.ErrAllZero):
		err = fmt.Errorf("%w with 'weft inspect'", err)
	case errors.Is(err, aniso.ErrNoCandidate):
		err = fmt.Errorf("%w ('weft inspect' shows what was read; --preset or --terms fits a chosen form)", err)
	}
	return checkFailed{msg: fmt.Sprintf("%s: the fit did not succeed: %v", s.Source, err)}
}

func fitOne(s *biaxial.Specimen, st aniso.Structure, chosen bool, ff *fitOptions) (*fitOutcome, error) {
	start := time.Now()
	p, err := aniso.NewProblem(s, nil)
	if err != nil {
		return nil, badInput(fmt.Errorf("%s: %w", s.Source, err))
	}
	o := &fitOutcome{Outcome: fitfolder.Outcome{Specimen: s, Problem: p}}
	bar := newProgress(ff.ErrOut, ff.ErrIsTerminal, "fitting "+s.Name, ff.quiet)
	defer bar.finish()
	if chosen {
		bar.set(0, 1)
		o.Result, err = aniso.Fit(p, st, aniso.Settings{Profile: true})
		if err != nil {
			return nil, fitFailed(s, err)
		}
		o.Result = aniso.InFamilyOrder(p, o.Result, aniso.Settings{Profile: true})
	} else {
		set := ff.discoverSettings()
		set.Progress = bar.set
		d, err := aniso.Discover(p, set)
		if err != nil {
			return nil, fitFailed(s, err)
		}
		o.Discovery = d
		o.Result = d.Best().Result
	}
	// A misfit beyond the data's own scatter is flagged on the fit (not
	// on resampled points, whose interpolated neighbours share their
	// noise, so that third differences understate it).
	if ff.read.Resample == 0 {
		ratio, err := aniso.FlagMisfit(p, o.Result)
		if err != nil {
			return nil, fitFailed(s, err)
		}
		if o.Discovery != nil {
			o.Discovery.NoteMisfit(ratio)
		}
	}
	var check []aniso.AxisScaleOutcome
	if ff.calibration > 0 && o.Discovery != nil {
		// The bar runs again for each of the check's two discoveries.
		set := ff.discoverSettings()
		set.Progress = bar.set
		if check, err = aniso.AxisScaleCheck(s, ff.calibration, set); err != nil {
			return nil, fitFailed(s, fmt.Errorf("the calibration check: %w", err))
		}
	}
	o.elapsed = time.Since(start)
	o.Card = card.FromFit(p, o.Result, o.Discovery)
	if o.Discovery != nil {
		o.Card.UntestedStrips, err = card.NewUntestedStrips(s.Deformations(), s.Kind == biaxial.Nominal, o.Card, o.Result.Model)
	} else {
		// A chosen form leaves the same loadings untested: listed, with
		// where they leave the tested range, though nothing measures them.
		o.Card.UntestedStrips, err = card.NewUnmeasuredStrips(s.Deformations(), s.Kind == biaxial.Nominal, o.Card, o.Result.Model, card.ChosenFormWhy)
	}
	if err != nil {
		return nil, fitFailed(s, err)
	}
	if check != nil {
		var angles []float64
		for _, f := range o.Result.Model.Families {
			angles = append(angles, aniso.Deg(f.Angle))
		}
		o.Card.CalibrationCheck = card.NewCalibrationCheck(o.Discovery.Verdict.Families, angles, o.Result.SignKnown, ff.calibration, check)
	}
	return o, nil
}

// printCardsJSON prints one card, or an array of the cards written when
// several DATA files were given.
func printCardsJSON(w io.Writer, outcomes []*fitOutcome, several bool) error {
	if len(outcomes) == 1 && !several {
		b, err := outcomes[0].Card.Marshal()
		if err != nil {
			return err
		}
		_, err = w.Write(b)
		return err
	}
	var all []json.RawMessage
	for _, o := range outcomes {
		b, err := json.Marshal(o.Card)
		if err != nil {
			return err
		}
		all = append(all, b)
	}
	b, err := json.MarshalIndent(all, "", "  ")
	if err != nil {
		return err
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

// writeFitOutputs writes every file of the output folder and puts the
// folder in place.
func writeFitOutputs(o *fitOutcome, od *safeout.Dir, force bool) error {
	if err := writeFitFiles(o, od); err != nil {
		return err
	}
	return outputError(od.Commit(force))
}

// writeFitFiles writes the files of one specimen's output folder into od
// (an output folder, or one specimen's folder inside a cohort's): the
// data files (fitfolder.WriteData), then the report, built from them as
// 'weft report' builds it.
func writeFitFiles(o *fitOutcome, od safeout.Sink) error {
	if err := fitfolder.WriteData(&o.Outcome, od); err != nil {
		return err
	}
	return writeReport(od, o)
}

// writeReport reads the folder's files back, exactly as 'weft report'
// does, and writes report.html and plots/ into the folder before it is
// committed.
func writeReport(od safeout.Sink, o *fitOutcome) error {
	// Messages name the folder the user will see, not the temporary one.
	named := func(err error) error {
		tmp, final := od.Dirs()
		return fmt.Errorf("building the report: %s", strings.ReplaceAll(err.Error(), tmp, final))
	}
	tmp, _ := od.Dirs()
	in, err := loadReportFolder(tmp, biaxial.Limits{}, card.Limits{})
	if err != nil {
		return named(err)
	}
	files, err := report.Build(in, report.Options{PNG: o.png, Software: versionText()})
	if err != nil {
		return named(err)
	}
	for _, f := range files {
		if err := od.Write(filepath.FromSlash(f.Rel), f.Data); err != nil {
			return err
		}
	}
	return nil
}

// fitOutcome is everything one specimen's fit produced, and where and how
// its folder is written.
type fitOutcome struct {
	fitfolder.Outcome
	dir     string
	elapsed time.Duration
	// png asks for PNG plots beside the SVGs.
	png bool
}

// printFitSummary prints the short human summary of one specimen's fit.
func printFitSummary(w io.Writer, o *fitOutcome) {
	summary.PrintFit(w, &summary.Fit{Specimen: o.Specimen, Result: o.Result, Discovery: o.Discovery, Card: o.Card,
		Dir: o.dir, Files: fitfolder.Files(&o.Outcome), Elapsed: o.elapsed})
}
