// Command weft fits fibre-reinforced hyperelastic strain-energy models to
// planar biaxial tests of thin soft tissue and exports parameters for
// finite-element analysis.
//
// Exit codes: 0 success, 1 a check failed or a fit could not succeed, 2 bad
// input (nothing written), 3 an unexpected internal error (a bug to report).
package main

import (
	"errors"
	"fmt"
	"os"
	"strings"

	"github.com/spf13/cobra"
)

// Exit codes shared by every subcommand.
const (
	exitOK            = 0
	exitCheckFail     = 1
	exitBadInput      = 2
	exitInternalError = 3
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

// commands lists the constructors of every subcommand; files add themselves
// in init so that subcommands live beside their own code.
var commands []func() *cobra.Command

func newRootCmd() *cobra.Command {
	root := &cobra.Command{
		Use:   "weft",
		Short: "Discover fibre-reinforced hyperelastic models from planar biaxial tests",
		Long: `weft reads planar biaxial test files of thin soft tissue, finds which
strain-energy terms and how many fibre families the data support, learns the
fibre angles, and writes a model card with parameters an FE analyst can verify.

Parameters are research-grade and specimen-specific, valid only within the
tested range, and not for clinical decisions; follow the regulations,
standards and licensed professional practice that apply.`,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error {
		return badInputf("%v (see 'weft %s --help')", err, c.Name())
	})
	for _, mk := range commands {
		root.AddCommand(mk())
	}
	return root
}

// exitCode maps an error returned by a command to the process exit code.
func exitCode(err error) int {
	var in inputError
	var cf checkFailed
	switch {
	case err == nil:
		return exitOK
	case errors.As(err, &cf):
		return exitCheckFail
	case errors.As(err, &in):
		return exitBadInput
	case strings.HasPrefix(err.Error(), "unknown command"):
		// cobra's own usage errors are bad input too.
		return exitBadInput
	}
	return exitInternalError
}

func main() {
	root := newRootCmd()
	err := root.Execute()
	if err != nil {
		fmt.Fprintln(os.Stderr, "weft:", err)
	}
	os.Exit(exitCode(err))
}
