package planning

import (
	"errors"
	"fmt"
)

// InputError says that an output folder's files cannot be planned from: a
// file is missing, unreadable or does not belong to the fit the card
// describes.
type InputError struct{ Err error }

// Error implements error.
func (e *InputError) Error() string { return e.Err.Error() }

// Unwrap returns the underlying error.
func (e *InputError) Unwrap() error { return e.Err }

func inputError(err error) error {
	if err == nil {
		return nil
	}
	var ie *InputError
	if errors.As(err, &ie) {
		return err
	}
	return &InputError{Err: err}
}

func inputErrorf(format string, args ...any) error {
	return &InputError{Err: fmt.Errorf(format, args...)}
}

// limitError is a message with a category for errors.Is (biaxial.ErrRowCount)
// that does not show in the text.
type limitError struct {
	msg string
	cat error
}

func (e limitError) Error() string { return e.msg }
func (e limitError) Unwrap() error { return e.cat }

// RebuildError says that the folder's fit could not be rebuilt as the card
// states it: the files parse but do not hold one fit.
type RebuildError struct{ Msg string }

// Error implements error.
func (e *RebuildError) Error() string { return e.Msg }
