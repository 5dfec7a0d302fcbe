package main

import (
	"errors"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/compare"
)

// Exit statuses.
const (
	exitOK      = 0
	exitFailure = 1 // the tool failed (I/O, an estimation error)
	exitInput   = 2 // bad input or usage
	exitPolicy  = 3 // the result breaches the --policy file (outputs are written)
)

// usageError is a misuse of the command line found by a run function, such
// as an unknown --format. It exits with status 2.
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

// runError marks an error returned by a command's run function, as
// opposed to one from cobra's own parsing (which is always a usage error).
type runError struct{ err error }

func (e *runError) Error() string { return e.err.Error() }
func (e *runError) Unwrap() error { return e.err }

// exitCode maps an error from executing the root command to an exit
// status: errors from cobra's parsing, usage errors and input errors
// (fairness.IsInputError, a result file compare cannot read or compare,
// an output folder that is in the way) give 2, a
// result that breaches its policy 3, a
// write stopped by a signal 128+n (the shell's status for signal n, used
// only when the signal cannot be re-raised), everything else 1.
func exitCode(err error) int {
	if err == nil {
		return exitOK
	}
	var re *runError
	if !errors.As(err, &re) {
		return exitInput // cobra: unknown command or flag, missing required flag, ...
	}
	var ie *interruptedError
	if errors.As(err, &ie) {
		return signalStatus(ie.sig)
	}
	var pb *policyBreachError
	if errors.As(err, &pb) {
		return exitPolicy
	}
	var ue *usageError
	var oe *outDirError
	var ce *compare.Error
	if errors.As(err, &ue) || errors.As(err, &oe) || errors.As(err, &ce) || fairness.IsInputError(err) {
		return exitInput
	}
	return exitFailure
}

// wrapRun adapts a run function's error for exitCode.
func wrapRun(err error) error {
	if err == nil {
		return nil
	}
	return &runError{err}
}
