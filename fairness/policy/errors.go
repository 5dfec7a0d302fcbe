package policy

import (
	"errors"
	"fmt"
	"strconv"
)

// Sentinels wrapped by *Error. Test with errors.Is.
var (
	ErrNotFound     = errors.New("policy file not found")
	ErrTooLarge     = errors.New("policy file too large")
	ErrSyntax       = errors.New("invalid YAML")
	ErrUnknownKey   = errors.New("unknown key")
	ErrDuplicateKey = errors.New("key given twice")
	ErrMissingKey   = errors.New("missing required key")
	ErrBadValue     = errors.New("bad value")
	ErrUnknownName  = errors.New("unknown name") // a metric, preset, judge or unjudged value
	// ErrUnjudged is wrapped when, with unjudged: error, a check cannot
	// be judged on the run.
	ErrUnjudged = errors.New("check cannot be judged")
)

// Error is a problem with a policy file, or with judging one of its rules
// on a run. Line is 1-based (0 when unknown) and Key a path such as
// "rules[2].max_gap" (empty when the problem is not tied to a key). The
// message reads
//
//	policy.yaml:7: key rules[2].judge: unknown judge "worst"; did you mean "worst_bound"?
type Error struct {
	File string
	Line int
	Key  string
	Err  error
}

func (e *Error) Error() string {
	s := e.File
	if e.Line > 0 {
		s += ":" + strconv.Itoa(e.Line)
	}
	if e.Key != "" {
		s += ": key " + e.Key
	}
	return s + ": " + e.Err.Error()
}

func (e *Error) Unwrap() error { return e.Err }

// sentence is a message that wraps the sentinel it is an instance of.
type sentence struct {
	sentinel error
	msg      string
}

func (s *sentence) Error() string { return s.msg }
func (s *sentence) Unwrap() error { return s.sentinel }

// errAt builds an *Error at line and key whose message reads like format
// and wraps sentinel.
func errAt(file string, line int, key string, sentinel error, format string, args ...any) *Error {
	return &Error{File: file, Line: line, Key: key, Err: &sentence{sentinel, fmt.Sprintf(format, args...)}}
}
