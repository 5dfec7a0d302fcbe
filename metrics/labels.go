package metrics

import (
	"errors"
	"fmt"
)

// ErrNotBinary is wrapped by LabelError.
var ErrNotBinary = errors.New("label is not 0 or 1")

// LabelError reports the first label that is neither 0 nor 1.
type LabelError struct {
	Index int     // position in the labels slice
	Value float64 // the offending value
}

func (e *LabelError) Error() string {
	return fmt.Sprintf("metrics: label %d is %v: %v", e.Index, e.Value, ErrNotBinary)
}

func (e *LabelError) Unwrap() error { return ErrNotBinary }

// CheckLabels returns a *LabelError for the first label that is not exactly
// 0 or 1, and nil otherwise.
//
// The metric functions of this package do not validate labels: they treat a
// label equal to 1 as an event and every other value (including NaN) as a
// non-event, exactly as Cell does. Validating labels is the caller's job,
// and the data loader, which knows file, line and column, is the place to
// do it; CheckLabels is for callers that have no such context.
func CheckLabels(labels []float64) error {
	for i, y := range labels {
		if y != 0 && y != 1 {
			return &LabelError{Index: i, Value: y}
		}
	}
	return nil
}
