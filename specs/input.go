package specs

import "errors"

// InputError marks an error as bad input: something in the spec, its
// data, its fonts or the command line that the user must fix (the CLI's
// exit status 2). Any other error is a failure of the run (a disk that
// is full, a folder that cannot be written). Choose it with errors.As;
// Err keeps its own type for errors.As too.
type InputError struct{ Err error }

func (e *InputError) Error() string { return e.Err.Error() }

func (e *InputError) Unwrap() error { return e.Err }

// BadInput marks err as bad input. It returns nil for nil and err itself
// when it is already marked.
func BadInput(err error) error {
	if err == nil || IsBadInput(err) {
		return err
	}
	return &InputError{Err: err}
}

// IsBadInput reports whether err, or an error it wraps, is an InputError.
func IsBadInput(err error) bool {
	var e *InputError
	return errors.As(err, &e)
}
