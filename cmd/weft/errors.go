package main

import (
	"errors"
	"fmt"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
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

// flagValueError restates a flag value the flag parser could not read as
// what the flag wants (the parser's own text names Go's number parser,
// "strconv.ParseInt: parsing ...: invalid syntax"); other errors pass
// unchanged.
func flagValueError(err error) error {
	var iv *pflag.InvalidValueError
	if !errors.As(err, &iv) || iv.GetFlag() == nil {
		return err
	}
	want := "a valid value"
	switch iv.GetFlag().Value.Type() {
	case "int", "int8", "int16", "int32", "int64", "uint", "uint8", "uint16", "uint32", "uint64":
		want = "a whole number"
	case "float32", "float64":
		want = "a decimal number"
	case "bool":
		want = "true or false"
	case "duration":
		want = "a duration such as 30s"
	}
	return fmt.Errorf("--%s %s: give %s", iv.GetFlag().Name, quoteArg(iv.GetValue()), want)
}

// checkFailed is returned when a check ran and found a failure (exit code 1).
type checkFailed struct{ msg string }

func (e checkFailed) Error() string { return e.msg }

// exitCode maps an error returned by a command to the process exit code:
// bad input is 2, every other failure 1. A problem with an output path is
// bad input when it was found before the work, a failure when found as
// the output was put in place.
func exitCode(err error) int {
	var in inputError
	var out *safeout.Error
	switch {
	case err == nil:
		return exitOK
	case errors.As(err, &in):
		return exitBadInput
	case errors.As(err, &out) && !out.Late:
		return exitBadInput
	}
	return exitFailed
}

// outputError adds to a problem with an output path (package safeout says
// what is wrong) what to type about it; other errors pass unchanged.
func outputError(err error) error {
	var e *safeout.Error
	if !errors.As(err, &e) || e.Advice != "" {
		return err
	}
	c := *e
	c.Advice = outputAdvice(&c)
	return &c
}

// outputAdvice is what the user can do about a problem with an output
// file or folder that the user named with -o (or as an argument).
func outputAdvice(e *safeout.Error) string {
	const another = " or choose another output"
	const anotherFolder = " choose another folder with -o"
	switch e.Problem {
	case safeout.Busy:
		hint := "; wait for it to finish"
		if e.LockFile != "" {
			hint += fmt.Sprintf(" (if no weft is running, delete %s)", e.LockFile)
		}
		return hint + another
	case safeout.NoParent:
		return "; create it first" + another
	case safeout.LockFailed, safeout.Unwritable:
		// A test file's folder is often read-only (a shared or mounted
		// data folder), and fit writes beside the file by default.
		return another
	case safeout.Exists:
		if e.Target == safeout.TargetFolder {
			return "; pass --force to replace it (only a folder weft wrote is replaced) or" + anotherFolder
		}
		return "; pass --force to replace it" + another
	case safeout.NotRegular:
		return " — choose another output (or write to standard output and redirect it)"
	case safeout.NotOutputFolder, safeout.NoMarker:
		return "; --force replaces only folders weft wrote —" + anotherFolder
	case safeout.HoldsWorkDir, safeout.HoldsInput:
		return " —" + anotherFolder
	case safeout.Foreign:
		return " — move them elsewhere or" + anotherFolder
	case safeout.NotWholeFolder:
		return "; give a new folder name"
	case safeout.IsInput:
		return " — choose another output with -o"
	}
	return ""
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
