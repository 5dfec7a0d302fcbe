package compare

import (
	"errors"
	"strconv"
)

// Sentinels wrapped by *Error. Test with errors.Is.
var (
	ErrNotFound      = errors.New("result file not found")
	ErrRead          = errors.New("cannot read result file")
	ErrSyntax        = errors.New("invalid JSON")
	ErrType          = errors.New("value of the wrong type")
	ErrNotResult     = errors.New("not a gapwise result")
	ErrBadValue      = errors.New("bad value")
	ErrNotComparable = errors.New("runs are not comparable")
	ErrTooFewRuns    = errors.New("too few result files")
)

// Error is a problem with a result file given to compare, or between the
// files. File names the file (empty when the problem is between several),
// Line and Column locate a JSON syntax or type error (0 when unknown),
// Path is the JSON path of the value concerned, such as
// "metrics[2].contributions[0].ci_high" (empty when none), and Err wraps
// one of the Err* sentinels above with the sentence. The message reads
//
//	before.json:12:7: key metrics.gap: want a number, got a string
type Error struct {
	File         string
	Line, Column int
	Path         string
	Err          error
}

func (e *Error) Error() string {
	s := e.File
	if e.Line > 0 {
		s += ":" + strconv.Itoa(e.Line)
		if e.Column > 0 {
			s += ":" + strconv.Itoa(e.Column)
		}
	}
	if e.Path != "" {
		if s != "" {
			s += ": "
		}
		s += "key " + e.Path
	}
	if s != "" {
		s += ": "
	}
	return s + e.Err.Error()
}

func (e *Error) Unwrap() error { return e.Err }

// sentence is a message that wraps the sentinel it is an instance of.
type sentence struct {
	sentinel error
	msg      string
}

func (e *sentence) Error() string { return e.msg }
func (e *sentence) Unwrap() error { return e.sentinel }

func wrapf(sentinel error, msg string) error { return &sentence{sentinel, msg} }
