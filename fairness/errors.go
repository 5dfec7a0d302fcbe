package fairness

import (
	"errors"
	"fmt"
	"strconv"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/fairness/policy"
	"github.com/gapwise/gapwise/metrics"
)

// Sentinels wrapped by *SpecError. Test with errors.Is.
var (
	ErrSpecNotFound          = errors.New("spec file not found")
	ErrSyntax                = errors.New("invalid YAML")
	ErrUnknownKey            = errors.New("unknown key")
	ErrDuplicateKey          = errors.New("key given twice")
	ErrMissingKey            = errors.New("missing required key")
	ErrBadValue              = errors.New("bad value")
	ErrThresholdRange        = errors.New("threshold must be strictly between 0 and 1")
	ErrUnknownMetric         = errors.New("unknown metric")
	ErrUnknownClassifier     = errors.New("unknown classifier")
	ErrClassifierUnavailable = errors.New("classifier is not available")
	ErrUnknownNode           = errors.New("unknown node")
	ErrDuplicateNode         = errors.New("duplicate node")
	ErrColumnReuse           = errors.New("column belongs to two nodes")
	ErrCycle                 = errors.New("graph has a cycle")
	ErrLabelNotNode          = errors.New("label is not in the graph")
	ErrGroupInGraph          = errors.New("group column is in the graph")
	ErrScoreInGraph          = errors.New("score column shares a node with other columns")
)

// Sentinels wrapped by *DataError. Test with errors.Is.
var (
	ErrFileNotFound     = errors.New("data file not found")
	ErrReadFailed       = errors.New("cannot read data file")
	ErrCSVSyntax        = errors.New("malformed CSV")
	ErrEmptyFile        = errors.New("file is empty")
	ErrNoRecords        = errors.New("no data rows")
	ErrDuplicateHeader  = errors.New("duplicate column in header")
	ErrMissingColumn    = errors.New("column not in header")
	ErrRaggedRow        = errors.New("row has the wrong number of fields")
	ErrNotNumeric       = errors.New("not a number")
	ErrNotBinary        = metrics.ErrNotBinary // one sentinel for labels that are not 0/1, here and in metrics
	ErrScoreRange       = errors.New("score outside [0, 1]")
	ErrProbabilityRange = errors.New("value of a probability column outside [0, 1]")
	ErrMissingValue     = errors.New("missing value")
	ErrGroupAbsent      = errors.New("group value absent")
	ErrTooFewRecords    = errors.New("too few records in a group")
	ErrEncoding         = errors.New("text is not UTF-8")
	ErrUnnamedColumn    = errors.New("value in a column without a name")
)

// SpecError is a problem in the spec file. Line is 1-based (0 when unknown)
// and Key is a path such as "graph[2].parents" (empty when the problem is
// not tied to a key, e.g. a YAML syntax error). Err wraps one of the Err*
// sentinels above. The message reads
//
//	spec.yaml:7: key graph[2].parents: unknown node "lbs"
type SpecError struct {
	File string
	Line int
	Key  string
	Err  error
}

func (e *SpecError) Error() string {
	s := e.File
	if e.Line > 0 {
		s += ":" + strconv.Itoa(e.Line)
	}
	if e.Key != "" {
		s += ": key " + e.Key
	}
	return s + ": " + e.Err.Error()
}

func (e *SpecError) Unwrap() error { return e.Err }

// DataError is a problem in the data file. Line is the 1-based CSV line
// (0 when the problem concerns the whole file, and for a Parquet file),
// Row and RowGroup the 1-based row of a Parquet file (counted over the
// whole file) and its row group (0 when none; RowGroup alone for a problem
// with a column chunk), and Column the column involved (empty when none).
// Err wraps one of the Err* sentinels above. The message reads
//
//	cohort.csv:17: column "hb": "12,4" is not a number
//	cohort.parquet: row 1017 (row group 2): column "hb": "x" is not a number
type DataError struct {
	File          string
	Line          int
	Row, RowGroup int
	Column        string
	Err           error
}

func (e *DataError) Error() string {
	s := e.File
	switch {
	case e.Line > 0:
		s += ":" + strconv.Itoa(e.Line)
	case e.Row > 0:
		s += fmt.Sprintf(": row %d (row group %d)", e.Row, e.RowGroup)
	case e.RowGroup > 0:
		s += fmt.Sprintf(": row group %d", e.RowGroup)
	}
	if e.Column != "" {
		s += ": column " + strconv.Quote(e.Column)
	}
	return s + ": " + e.Err.Error()
}

func (e *DataError) Unwrap() error { return e.Err }

// MetricUndefinedError reports an audited metric that has no value in one
// of the groups, e.g. FPR in a group without negatives. It wraps
// metrics.ErrUndefined. The message reads
//
//	metric fpr is undefined in group "south" (clinic): it has no negatives
type MetricUndefinedError struct {
	Metric string
	Group  string // the group's value in the data, e.g. "south"
	Column string // the group column
	Reason string // e.g. "it has no negatives"
}

func (e *MetricUndefinedError) Error() string {
	return fmt.Sprintf("metric %s is undefined in group %q (%s): %s", e.Metric, e.Group, e.Column, e.Reason)
}

func (e *MetricUndefinedError) Unwrap() error { return metrics.ErrUndefined }

// IsInputError reports whether err is caused by the user's input (spec,
// data, policy file, or a metric without a value on the data) rather than by a failure
// of the tool. The CLI exits with status 2 for these and 1 otherwise.
func IsInputError(err error) bool {
	var se *SpecError
	var de *DataError
	var me *MetricUndefinedError
	var ae *attribution.MetricError
	var pe *policy.Error
	return errors.As(err, &se) || errors.As(err, &de) || errors.As(err, &me) || errors.As(err, &ae) || errors.As(err, &pe)
}

// inputError is a sentence describing one problem that wraps the sentinel
// it is an instance of, so that the sentence need not start with the
// sentinel's own words.
type inputError struct {
	sentinel error
	cause    error // the underlying error, e.g. a *csv.ParseError; may be nil
	msg      string
}

func (e *inputError) Error() string { return e.msg }

// Unwrap gives errors.Is and errors.As both the sentinel and the cause.
func (e *inputError) Unwrap() []error {
	if e.cause == nil {
		return []error{e.sentinel}
	}
	return []error{e.sentinel, e.cause}
}

// wrapf returns an error reading like format that wraps sentinel.
func wrapf(sentinel error, format string, args ...any) error {
	return &inputError{sentinel: sentinel, msg: fmt.Sprintf(format, args...)}
}

// wrapCause is wrapf that also keeps cause reachable through errors.As
// (the message is still format's alone).
func wrapCause(sentinel, cause error, format string, args ...any) error {
	return &inputError{sentinel: sentinel, cause: cause, msg: fmt.Sprintf(format, args...)}
}

// specErr builds a *SpecError whose Err reads like format and wraps
// sentinel.
func specErr(file string, line int, key string, sentinel error, format string, args ...any) *SpecError {
	return &SpecError{File: file, Line: line, Key: key, Err: wrapf(sentinel, format, args...)}
}
