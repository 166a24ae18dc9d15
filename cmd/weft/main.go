// Command weft fits fibre-reinforced hyperelastic strain-energy models to
// planar biaxial tests of thin soft tissue and exports parameters for
// finite-element analysis.
//
// Exit codes: 0 success; 1 the run failed (a check failed, a fit could not
// succeed, an output could not be written, or the run was interrupted);
// 2 bad input (a test file, model card, flag or output path that cannot be
// used, found before any output is written).
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"runtime/debug"

	"github.com/spf13/cobra"
)

// Exit codes shared by every subcommand. weft uses no others.
const (
	exitOK       = 0
	exitFailed   = 1
	exitBadInput = 2
)

// inputError marks an error caused by the user's input (exit code 2).
type inputError struct{ err error }

func (e inputError) Error() string { return e.err.Error() }
func (e inputError) Unwrap() error { return e.err }

// badInput wraps err so that weft exits with code 2.
func badInput(err error) error {
	if err == nil {
		return nil
	}
	return inputError{err}
}

// badInputf formats an input error (exit code 2).
func badInputf(format string, args ...any) error {
	return inputError{fmt.Errorf(format, args...)}
}

// checkFailed is returned when a check ran and found a failure (exit code 1).
type checkFailed struct{ msg string }

func (e checkFailed) Error() string { return e.msg }

// streams are where a command reads and writes. Every command's options
// carry them, so that tests run a command with buffers and no cobra.
type streams struct {
	In     io.Reader
	Out    io.Writer
	ErrOut io.Writer
	// ErrIsTerminal says whether ErrOut is a terminal: progress bars are
	// drawn only there.
	ErrIsTerminal bool
}

// newRootCmd builds the command tree; every subcommand writes to s.
func newRootCmd(s *streams) *cobra.Command {
	root := &cobra.Command{
		Use:   "weft",
		Short: "Discover fibre-reinforced hyperelastic models from planar biaxial tests",
		Long: `weft reads planar biaxial test files of thin soft tissue, finds which
strain-energy terms and how many fibre families the data support, learns the
fibre angles, and writes a model card with parameters an FE analyst can verify.

Exit codes: 0 success; 1 the run failed (a check failed, a fit did not
succeed, an output could not be written, or the run was interrupted); 2 bad
input (nothing written).

Parameters are research-grade and specimen-specific, valid only within the
tested range, and not for clinical decisions; follow the regulations,
standards and licensed professional practice that apply.`,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error {
		return badInputf("%v (see 'weft %s --help')", err, c.Name())
	})
	root.AddCommand(
		newFitCmd(s),
		newReportCmd(s),
		newInspectCmd(s),
		newDemoCmd(s),
		newPredictCmd(s),
		newExportCmd(s),
		newCheckCmd(s),
		newEvaluateCmd(s),
		newTermsCmd(s),
	)
	root.SetIn(s.In)
	root.SetOut(s.Out)
	root.SetErr(s.ErrOut)
	return root
}

// exitCode maps an error returned by a command to the process exit code:
// bad input is 2, every other failure 1.
func exitCode(err error) int {
	var in inputError
	switch {
	case err == nil:
		return exitOK
	case errors.As(err, &in):
		return exitBadInput
	}
	return exitFailed
}

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
		err = badInput(err)
	}
	if out.err != nil {
		werr := fmt.Errorf("cannot write to standard output (%v)", ioErrText(out.err))
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

func main() {
	stopSignals := handleSignals(os.Stderr)
	code := run(os.Args[1:], os.Stdout, os.Stderr)
	stopSignals()
	os.Exit(code)
}
