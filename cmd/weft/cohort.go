package main

import (
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
	"github.com/weft-tools/weft/cmd/weft/internal/cohortfiles"
	"github.com/weft-tools/weft/cmd/weft/internal/cohortreport"
	"github.com/weft-tools/weft/cmd/weft/internal/fitfolder"
	"github.com/weft-tools/weft/cmd/weft/internal/grouptable"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
	"github.com/weft-tools/weft/cmd/weft/internal/summary"
)

// cohortOptions are the options of weft cohort.
type cohortOptions struct {
	streams
	files   []string
	read    biaxial.Options
	out     string
	force   bool
	groupBy string
	// form holds --preset, --terms and their layout flags, read as weft
	// fit reads them.
	form   fitOptions
	asJSON bool
	quiet  bool
	// noSpecimenReports leaves report.html and plots/ out of each
	// specimen's folder: drawing them costs more than fitting.
	noSpecimenReports bool
}

func newCohortCmd(s *streams) *cobra.Command {
	co := &cohortOptions{streams: *s}
	cmd := &cobra.Command{
		Use:   "cohort DATA... -o DIR",
		Short: "Fit one model form to many specimens and compare groups",
		Long: `cohort fits the specimens of a study together: one model form for all of
them, each specimen with its own parameters and fibre angles, statistics of
every parameter, group comparisons and a model of the whole population.

Without --preset or --terms the form is DISCOVERED for the cohort: candidate
forms are searched on a few specimens spread over the cohort, then scored on
every specimen; the verdict on the fibre families and the pick inside the
winning form follow the rules of 'weft fit', on the held-out error pooled over
specimens (each specimen counts the same), and the verdict says how many
specimens reach it on their own. With --preset or --terms the form is given.

DIR receives one folder per specimen as 'weft fit' writes it, cohort.csv (one
row per specimen), cohort.json (form, verdict, specimens, statistics with a
Student t interval of each mean, group comparisons), population.json (the form
fitted to all specimens at once, each weighted equally), mean-parameters.json
(the specimens' mean parameters) and report.html.

--group-by KEY groups the specimens by a metadata line of their files
('# KEY = value'), or, when KEY names a file, by that two-column CSV (file,
group). Two groups are compared with Welch's t-test, the Mann–Whitney U test
and Hedges' g, more with the Kruskal–Wallis test, with Holm-adjusted p-values.

A file that cannot be read or fitted gets a failed row and the others go on;
the exit code is then 1 (2 when no file could be used, and nothing is
written). The result does not depend on the order of the files.

The statistics describe the specimens tested, not a population.

` + helpCautions,
		Example: `  # discover one form for every specimen of a study
  weft cohort study/*.csv -o study-cohort

  # a given form, groups from the files' "# donor_age = ..." lines
  weft cohort study/*.csv -o study-hgo --preset hgo --group-by donor_age

  # groups from a table of file,group rows
  weft cohort study/*.csv -o study-cohort --group-by groups.csv`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				return badInputf("cohort needs DATA files (see 'weft cohort --help')")
			}
			return nil
		},
	}
	rf := addReadFlags(cmd)
	fl := cmd.Flags()
	fl.StringVarP(&co.out, "output", "o", "", "the cohort's output folder (required)")
	fl.BoolVar(&co.force, "force", false, "replace an existing output folder that weft wrote (never anything else)")
	fl.StringVar(&co.groupBy, "group-by", "", "group specimens by this metadata key, or by a two-column CSV file (file,group)")
	fl.StringVar(&co.form.preset, "preset", "", "fit this classical preset to every specimen instead of discovering (see 'weft terms')")
	fl.StringVar(&co.form.termIDs, "terms", "", "fit these catalogue terms to every specimen instead of discovering, comma-separated")
	fl.IntVar(&co.form.families, "families", -1, "fibre families for --terms: 0, 1 or 2")
	fl.StringVar(&co.form.layout, "layout", "", "two families for --terms: free (the default) or mirror")
	fl.StringVar(&co.form.dispersion, "dispersion", "", "how fibres spread: in-plane, kappa or none (as for 'weft fit')")
	fl.StringVar(&co.form.pairAxis, "pair-axis", "", "axis of a mirror pair: axis-1 (default) or free (as for 'weft fit')")
	fl.IntVar(&co.form.maxTerms, "max-terms", 5, "largest number of terms discovery considers")
	fl.BoolVar(&co.asJSON, "json", false, "print cohort.json instead of the summary")
	fl.BoolVar(&co.quiet, "quiet", false, "no progress bar")
	fl.BoolVar(&co.noSpecimenReports, "no-specimen-reports", false, "leave report.html and plots/ out of each specimen's folder (much faster for large cohorts; the cohort's own report is still written)")
	cmd.RunE = func(cmd *cobra.Command, args []string) error {
		opt, err := rf.options()
		if err != nil {
			return err
		}
		co.files, co.read = args, opt
		return runCohort(co)
	}
	return cmd
}

// runCohort runs weft cohort: it reads and checks every file and the
// output folder before any fitting, fits the cohort, and writes the
// folder.
func runCohort(co *cohortOptions) error {
	st, given, err := structureFromFlags(&co.form)
	if err != nil {
		return err
	}
	if co.form.maxTerms < 1 || co.form.maxTerms > 8 {
		return badInputf("--max-terms %d: use 1 to 8", co.form.maxTerms)
	}
	if co.out == "" {
		return badInputf("cohort needs an output folder: -o DIR")
	}
	members := cohortfiles.Read(co.files, co.read, withLimitHint)
	if err := cohortfiles.CheckWeights(members, co.read.ProtocolWeights); err != nil {
		return badInputf("--protocol-weight %v", err)
	}
	groupFile, err := assignGroups(members, co.groupBy, co.ErrOut)
	if err != nil {
		return err
	}
	unit, kind := cohortfiles.Unit(members)
	problems := cohortfiles.Prepare(members, unit)
	if len(problems) == 0 {
		return cohortFailures(members, true)
	}
	od, err := safeout.PrepareDir(co.out, co.force, co.files)
	if err != nil {
		return outputError(err)
	}
	defer od.Close()
	start := time.Now()
	bar := newProgress(co.ErrOut, co.ErrIsTerminal, "fitting the cohort", co.quiet)
	set := aniso.CohortSettings{Progress: bar.set, Discover: co.form.discoverSettings()}
	if given {
		set.Form = &st
	}
	c, err := aniso.FitCohort(problems, set)
	bar.finish()
	if c != nil {
		for _, m := range members {
			if m.At >= 0 && m.Err == nil && c.Specimens[m.At].Err != nil {
				m.Err = fitFailed(m.Spec, c.Specimens[m.At].Err)
			}
		}
	}
	if err != nil {
		if errors.Is(err, aniso.ErrNoSpecimen) {
			return cohortFailures(members, true)
		}
		return checkFailed{msg: fmt.Sprintf("the cohort could not be fitted: %v", err)}
	}
	in, cards, err := cohortreport.Cards(cohortfiles.ForReport(members), c, co.groupBy, unit, kind)
	if err != nil {
		return err
	}
	trace := cohortTrace{co: co, members: members, cohort: c, form: formOptionList(&co.form, st, given), groupFile: groupFile}
	if err := trace.record(in, cards); err != nil {
		return err
	}
	sum := cohortreport.Build(in)
	if err := writeCohort(od, co, members, c, in, sum, cards); err != nil {
		return err
	}
	if co.asJSON {
		b, err := sum.JSON()
		if err != nil {
			return err
		}
		if _, err := co.Out.Write(b); err != nil {
			return err
		}
	} else {
		summary.PrintCohort(co.Out, sum, co.out, time.Since(start))
	}
	return cohortFailures(members, false)
}

// assignGroups gives each member its group: a metadata key of its file,
// or its row of a two-column CSV when by names a file, whose path it
// returns ("" for a key). Members without a group are told about on w and
// left out of group comparisons.
func assignGroups(ms []*cohortfiles.Member, by string, w io.Writer) (string, error) {
	if by == "" {
		return "", nil
	}
	file := ""
	st, err := os.Stat(by)
	if err == nil && st.Mode().IsRegular() {
		table, err := readGroupTable(by)
		if err != nil {
			return "", err
		}
		if err := cohortfiles.GroupByTable(ms, table, by); err != nil {
			return "", badInputf("--group-by %v", err)
		}
		file = by
	} else if !cohortfiles.GroupByKey(ms, by) && (looksLikePath(by) || err == nil) {
		// A group table that is missing (a typo, another folder) would
		// otherwise be read as a metadata key no file has, leaving every
		// specimen without a group and the run a success.
		why := "no such file"
		if err != nil && !errors.Is(err, fs.ErrNotExist) {
			why = safeout.Reason(err)
		} else if err == nil {
			why = "not a regular file"
		}
		key := strings.ToLower(strings.TrimSpace(by))
		return "", badInputf("--group-by %s: %s, and no file has a metadata line %q; give a two-column CSV of file,group that exists, or a metadata key", by, why, "# "+key+" = …")
	}
	for _, m := range ms {
		if m.Spec != nil && m.Group == "" {
			fmt.Fprintf(w, "weft: %s has no group for --group-by %s; it is left out of the group comparisons\n", m.File, by)
		}
		// "all" names the statistics over every specimen: a group of
		// that name would give two rows no reader could tell apart.
		if strings.EqualFold(m.Group, "all") {
			return "", badInputf("%s: the group %q for --group-by %s is the name of the rows over every specimen; rename the group", m.File, m.Group, by)
		}
	}
	return file, nil
}

// looksLikePath reports whether a --group-by value names a file rather
// than a metadata key: it holds a path separator, or ends in .csv or .txt
// (a key may hold dots, so a bare name without those endings stays a key).
func looksLikePath(by string) bool {
	if strings.ContainsAny(by, `/`+string(filepath.Separator)) {
		return true
	}
	ext := strings.ToLower(filepath.Ext(by))
	return ext == ".csv" || ext == ".txt"
}

// readGroupTable reads the group table at path (grouptable.Parse) as
// bad input, named by the flag that gave it.
func readGroupTable(path string) (grouptable.Table, error) {
	b, err := readAtMost(path, 16<<20)
	if err != nil {
		return nil, badInputf("--group-by %s: %s", path, safeout.Reason(err))
	}
	t, err := grouptable.Parse(b, path)
	if err != nil {
		return nil, badInputf("--group-by %v", err)
	}
	return t, nil
}

// cohortFailures is nil when every member was used, else the list of
// failures: exit code 1, or 2 (nothing written) when none could be used.
func cohortFailures(ms []*cohortfiles.Member, noneUsable bool) error {
	var b strings.Builder
	n := 0
	for _, m := range ms {
		if m.Err == nil {
			continue
		}
		n++
		msg := m.Err.Error()
		if !strings.HasPrefix(msg, m.File) {
			msg = m.File + ": " + msg
		}
		b.WriteString("\n  " + msg)
	}
	if n == 0 {
		return nil
	}
	if noneUsable {
		return badInputf("no file of the cohort could be used; nothing was written:%s", b.String())
	}
	return fmt.Errorf("%d of %d files failed (the others were written, with a failed row for each of these):%s", n, len(ms), b.String())
}

// writeCohort writes every file of the cohort's folder and puts it in
// place.
func writeCohort(od *safeout.Dir, co *cohortOptions, ms []*cohortfiles.Member, c *aniso.Cohort, in *cohortreport.Input, sum *cohortreport.Summary, cards map[string]*card.Card) error {
	for _, m := range ms {
		cd, ok := cards[m.Folder]
		if !ok || m.Err != nil {
			continue
		}
		cs := c.Specimens[m.At]
		o := &fitOutcome{Outcome: fitfolder.Outcome{Specimen: m.Problem.Specimen, Problem: m.Problem, Result: cs.Result, Card: cd}}
		sub := od.Sub(m.Folder)
		var err error
		if co.noSpecimenReports {
			err = fitfolder.WriteCardAndTables(&o.Outcome, sub)
		} else {
			err = writeFitFiles(o, sub)
		}
		if err != nil {
			return err
		}
		if err := sub.WriteMarker(); err != nil {
			return err
		}
	}
	for _, name := range []string{cohortreport.PopulationCard, cohortreport.MeanCard} {
		if cd, ok := cards[name]; ok {
			b, err := cd.Marshal()
			if err != nil {
				return err
			}
			if err := od.Write(name, b); err != nil {
				return err
			}
		}
	}
	b, err := sum.CSV()
	if err != nil {
		return err
	}
	if err := od.Write("cohort.csv", b); err != nil {
		return err
	}
	if b, err = sum.JSON(); err != nil {
		return err
	}
	if err := od.Write("cohort.json", b); err != nil {
		return err
	}
	_, final := od.Dirs()
	files, err := sum.Report(in, filepath.Base(final), cards)
	if err != nil {
		return fmt.Errorf("building the cohort report: %w", err)
	}
	for _, f := range files {
		if err := od.Write(filepath.FromSlash(f.Rel), f.Data); err != nil {
			return err
		}
	}
	return outputError(od.Commit(co.force))
}

// cohortTrace records what made a cohort's outputs: each specimen's card
// records its own file as 'weft fit' would, the population and
// mean-parameter cards the files they were made from, and cohort.json
// every file read, with the options that decide each.
type cohortTrace struct {
	co      *cohortOptions
	members []*cohortfiles.Member
	cohort  *aniso.Cohort
	// form are the options of the model form (formOptionList);
	// groupFile the --group-by table, "" when groups come from metadata.
	form      []string
	groupFile string
}

// cohortCommand names the writer in every record of a cohort.
const cohortCommand = "weft cohort"

// record sets the provenance of every card and of the summary's input.
// Each file is hashed once.
func (t *cohortTrace) record(in *cohortreport.Input, cards map[string]*card.Card) error {
	var refs []inputRef
	var read []*cohortfiles.Member
	for i, m := range t.members {
		if m.Spec != nil {
			refs = append(refs, inputRef{filepath.FromSlash(m.File), m.Spec.Sheet, m.Spec.Digest})
			read = append(read, m)
			continue
		}
		// A file that was read but refused still decides the result (its
		// failed row and error), so the summary records its bytes too; one
		// that cannot be opened at all was not read and has none, and one
		// given twice is recorded once.
		if cohortfiles.SameFile(m, t.members[:i]) != nil {
			continue
		}
		if dg, err := biaxial.FileDigest(filepath.FromSlash(m.File)); err == nil {
			refs = append(refs, inputRef{path: filepath.FromSlash(m.File), digest: dg})
			read = append(read, nil)
		}
	}
	if t.groupFile != "" {
		refs = append(refs, inputRef{path: t.groupFile})
	}
	hashed, err := hashInputs(refs)
	if err != nil {
		return err
	}
	inputOf := map[*cohortfiles.Member]card.InputFile{}
	for i, m := range read {
		if m != nil {
			inputOf[m] = hashed[i]
		}
	}
	options := append(readOptionList(t.co.read, t.co.read.Sheet), t.form...)
	var fitted, pooled []card.InputFile
	inPopulation := map[int]bool{}
	for _, i := range t.cohort.InPopulation {
		inPopulation[i] = true
	}
	for _, m := range t.members {
		// A member refused before the fit (a second file with the same
		// folder name) names a folder that holds another file's card.
		if m.At < 0 {
			continue
		}
		cd, ok := cards[m.Folder]
		if !ok {
			continue
		}
		own := inputOf[m]
		cd.Provenance = newProvenance(cohortCommand, append(readOptionList(t.co.read, m.Spec.Sheet), t.form...), []card.InputFile{own})
		fitted = append(fitted, own)
		if inPopulation[m.At] {
			pooled = append(pooled, own)
		}
	}
	if cd := cards[cohortreport.PopulationCard]; cd != nil {
		cd.Provenance = newProvenance(cohortCommand, options, pooled)
	}
	if cd := cards[cohortreport.MeanCard]; cd != nil {
		cd.Provenance = newProvenance(cohortCommand, options, fitted)
	}
	all := options
	if t.co.groupBy != "" {
		by := t.co.groupBy
		if t.groupFile != "" {
			by = filepath.Base(t.groupFile)
		}
		all = append(append([]string(nil), options...), "--group-by="+by)
	}
	in.Provenance = newProvenance(cohortCommand, all, hashed)
	return nil
}
