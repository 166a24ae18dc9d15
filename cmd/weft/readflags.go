package main

import (
	"strings"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/biaxial"
)

// readFlags are the options every command that reads test files shares.
type readFlags struct {
	sheet       string
	cycle       string
	branch      string
	rereference bool
	resample    int
	smooth      int
	weights     []string
	oldWeights  []string
	limits      *limitFlags
}

// addReadFlags registers the data-reading flags on cmd.
func addReadFlags(cmd *cobra.Command) *readFlags {
	f := &readFlags{}
	fl := cmd.Flags()
	fl.StringVar(&f.sheet, "sheet", "", "xlsx sheet to read (default: the first sheet)")
	fl.StringVar(&f.cycle, "cycle", "last", "cycle kept in each protocol: a number from 1, last, or all")
	fl.StringVar(&f.branch, "branch", "loading", "branch kept: loading, unloading or all")
	fl.BoolVar(&f.rereference, "rereference", false, "move the reference state to the first kept point of each protocol and remove its stress as a tare")
	fl.IntVar(&f.resample, "resample", 0, "resample each protocol to N points evenly spaced in stretch (0: off)")
	fl.IntVar(&f.smooth, "smooth-strain", 0, "smooth each protocol's measured F over N points (odd, at least 5) with a quadratic Savitzky–Golay filter, against marker tracking noise (0: off, F as measured)")
	fl.StringArrayVar(&f.weights, "protocol-weight", nil, "relative weight of a protocol's residuals, LABEL=W (repeatable; default 1)")
	// --weight is the former name of --protocol-weight, kept so that scripts
	// still run; the word now belongs to the energy terms' coefficients.
	fl.StringArrayVar(&f.oldWeights, "weight", nil, "former name of --protocol-weight")
	fl.MarkHidden("weight")
	f.limits = addLimitFlag(cmd)
	return f
}

// options turns the flags into biaxial.Options; errors are bad input.
func (f *readFlags) options() (biaxial.Options, error) {
	var o biaxial.Options
	var err error
	if o.Limits, _, err = f.limits.parse(); err != nil {
		return o, err
	}
	o.Sheet = f.sheet
	if o.Cycle, err = biaxial.ParseCycle(f.cycle); err != nil {
		return o, badInputf("--cycle: %v", err)
	}
	if o.Branch, err = biaxial.ParseBranch(f.branch); err != nil {
		return o, badInputf("--branch: %v", err)
	}
	o.Rereference = f.rereference
	if f.resample != 0 && f.resample < biaxial.MinPoints {
		return o, badInputf("--resample %d: use 0 (off) or at least %d points", f.resample, biaxial.MinPoints)
	}
	o.Resample = f.resample
	if f.smooth != 0 && (f.smooth < biaxial.MinPoints || f.smooth%2 == 0) {
		return o, badInputf("--smooth-strain %d: use 0 (off) or an odd number of points of at least %d, e.g. 9", f.smooth, biaxial.MinPoints)
	}
	o.SmoothStrain = f.smooth
	for _, w := range append(append([]string(nil), f.weights...), f.oldWeights...) {
		i := strings.LastIndexByte(w, '=')
		if i <= 0 {
			return o, badInputf("--protocol-weight %s: write LABEL=W, e.g. --protocol-weight 1:0.5=2", quoteArg(w))
		}
		v, err := biaxial.ParseNumber(strings.TrimSpace(w[i+1:]))
		// W > 0 (README, Weighting): until 2026-12-05 this said "≥ 0",
		// and a weight of 0, which passed here, was then refused.
		if err != nil || !(v > 0) || v > 1e300 {
			return o, badInputf("--protocol-weight %s: the protocol weight must be a finite decimal number > 0 (a protocol to be left out of the fit must be left out of the data)", quoteArg(w))
		}
		if o.ProtocolWeights == nil {
			o.ProtocolWeights = map[string]float64{}
		}
		label := strings.TrimSpace(w[:i])
		if _, dup := o.ProtocolWeights[label]; dup {
			return o, badInputf("--protocol-weight: protocol %s is given twice", quoteArg(label))
		}
		o.ProtocolWeights[label] = v
	}
	return o, nil
}

// readRows reads a file once and prepares it as readSpecimen does,
// returning the rows as read too (for other views of the same bytes).
func readRows(path string, opt biaxial.Options) (*biaxial.Rows, *biaxial.Specimen, error) {
	rows, err := biaxial.ReadRows(path, opt)
	if err != nil {
		return nil, nil, withLimitHint(err)
	}
	s, err := rows.Prepare(opt)
	if err != nil {
		return nil, nil, withLimitHint(err)
	}
	return rows, s, nil
}

// readSpecimen reads and prepares one test file; problems are bad input.
func readSpecimen(path string, opt biaxial.Options) (*biaxial.Specimen, error) {
	s, err := biaxial.ReadFile(path, opt)
	if err != nil {
		return nil, withLimitHint(err)
	}
	return s, nil
}

// oneFolderArg accepts exactly one argument, an output folder, for the
// command name.
func oneFolderArg(name string) cobra.PositionalArgs {
	return func(cmd *cobra.Command, args []string) error {
		if len(args) != 1 {
			return badInputf("%s needs one output folder DIR (see 'weft %s --help')", name, name)
		}
		return nil
	}
}
