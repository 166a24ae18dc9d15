// Command weft fits fibre-reinforced hyperelastic strain-energy models to
// planar biaxial tests of thin soft tissue and exports parameters for
// finite-element analysis.
//
// Exit codes: 0 success; 1 the run failed (a check failed, a fit could not
// succeed, an output could not be written, or the run was interrupted);
// 2 bad input (a test file, model card, flag or output path that cannot be
// used, found before any output is written).
//
// The commands are listed in root.go (newRootCmd). Each lives in a file of
// its own named after it (the terms command in termscmd.go), with its flags
// in an xOptions struct that carries its input and output streams and a
// runX function that tests call without cobra. errors.go maps typed errors
// to exit codes (exitCode); run, in this file, adds the cases cobra and the
// process raise (an unknown command, a failed write to standard output, a
// panic), and interrupted the exit code of an interrupt. Shared inside this
// package: readflags.go and limits.go (the reading flags and limits),
// cardread.go (reading a card and its data range, for export, check,
// evaluate and predict), provenance.go (a fit's provenance), progress.go
// (the progress bar on a terminal), streams.go, folderread.go (reading a
// fit's output folder for report and plan, readFitFolder); cohort.go
// reuses fit.go's form flags and folder writing; predict.go reads the card
// and the kinematics file and maps what package prediction refuses to
// exit code 2. After card.FromFit, fitOne (fit.go) adds the card's
// untested strips and calibration check. The rest lives in packages under
// internal/: fitfolder (writing a fit's output folder), report and
// cohortreport (the HTML reports; cohortreport also builds a cohort's
// cards, Cards), summary (printed summaries), planning (weft plan),
// prediction (what weft predict writes: each row's stresses and the band
// of the card's near-equivalent models, the alike_low_ and alike_high_
// columns), catalogue (what weft terms lists), grouptable (the table of
// file and group that weft cohort --group-by reads), cohortfiles (the
// files of a cohort run: read once each, in a fixed order, grouped, put in
// one stress unit), fe (export, check and evaluate documents), inspect,
// demo and safeout (atomic writes).
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"runtime/debug"
	"strings"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
)

// checkedWriter passes writes through to w and remembers the first error,
// so that a failed write to standard output (a closed pipe, a full disk)
// fails the run even where a command prints without looking at errors.
type checkedWriter struct {
	w   io.Writer
	err error
}

func (c *checkedWriter) Write(p []byte) (int, error) {
	if c.err != nil {
		return 0, c.err
	}
	n, err := c.w.Write(p)
	if err == nil && n < len(p) {
		err = io.ErrShortWrite
	}
	c.err = err
	return n, err
}

// run executes weft with args and returns the exit code; main and the tests
// share it.
func run(args []string, stdout, stderr io.Writer) (code int) {
	defer func() {
		// A bug must not look like bad input (Go exits 2 on a panic).
		if r := recover(); r != nil {
			fmt.Fprintf(stderr, "weft: internal error, please report it: %v\n%s", r, debug.Stack())
			code = exitFailed
		}
	}()
	out := &checkedWriter{w: stdout}
	s := &streams{In: os.Stdin, Out: out, ErrOut: stderr, ErrIsTerminal: isTerminal(stderr)}
	root := newRootCmd(s)
	root.SetArgs(args)
	started := false
	root.PersistentPreRun = func(*cobra.Command, []string) { started = true }
	err := root.Execute()
	if err != nil && !started {
		// An error before any command started is cobra's own usage error
		// (an unknown command); flags and arguments give typed errors.
		// Cobra's text says what is wrong (and may suggest a command on
		// the lines after); the first line gains what to type.
		msg := strings.TrimRight(err.Error(), "\n")
		first, rest, _ := strings.Cut(msg, "\n")
		if strings.HasPrefix(first, "unknown command") {
			first += "; 'weft --help' lists the commands"
			if rest != "" {
				first += "\n" + rest
			}
			err = errors.New(first)
		}
		err = badInput(err)
	}
	if out.err != nil {
		werr := fmt.Errorf("cannot write to standard output (%v)", safeout.Reason(out.err))
		if err == nil || errors.Is(err, out.err) {
			err = werr
		} else {
			err = errors.Join(err, werr)
		}
		if exitCode(err) == exitBadInput {
			err = errors.New(err.Error()) // a failed write is never bad input
		}
	}
	if err != nil {
		fmt.Fprintln(stderr, "weft:", err)
	}
	return exitCode(err)
}

// interrupted tells the user that a signal stopped the run, once package
// safeout has removed the run's temporary files; an interrupted run has
// failed.
func interrupted(sig os.Signal) int {
	fmt.Fprintf(os.Stderr, "weft: interrupted (%v); unfinished outputs and temporary files were removed\n", sig)
	return exitFailed
}

func main() {
	stopSignals := safeout.HandleSignals(interrupted)
	code := run(os.Args[1:], os.Stdout, os.Stderr)
	stopSignals()
	os.Exit(code)
}
