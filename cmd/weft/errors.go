package main

import (
	"errors"
	"fmt"

	"github.com/spf13/cobra"
)

// Errors and exit codes: a command returns an error, and its type, found
// with errors.As, decides the exit code.

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

// exactArgs is cobra.ExactArgs with a bad-input exit code and a hint.
func exactArgs(n int) cobra.PositionalArgs {
	return func(cmd *cobra.Command, args []string) error {
		if len(args) != n {
			return badInputf("%s takes %d argument(s), got %d; see 'weft %s --help'", cmd.Name(), n, len(args), cmd.Name())
		}
		return nil
	}
}
