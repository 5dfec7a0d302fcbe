package fairness

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"sort"

	"github.com/gapwise/gapwise/internal/didyoumean"
)

// GroupsResult is the outcome of an audit with several comparison values
// (RunGroups): one Result per audited comparison, each exactly the Result
// of a spec naming that value alone, and their summary.
type GroupsResult struct {
	Summary *GroupsSummary
	Results []*Result // in the order of Summary.Comparisons
}

// RunGroups performs the audit of a spec whose groups.comparison lists
// several values or is every-other (GroupSpec.Several): each comparison
// value c is decomposed against the reference as Run would decompose the
// spec with comparison: c, so for every metric of every comparison
//
//	Gap_c = M(comparison c) − M(reference) = Σ_i φ_i(c) + Residual_c,
//
// with the Shapley values φ_i(c) of the game between the reference's
// mechanisms and c's (Zhang et al. 2023, "Why did the model fail?":
// Attributing model performance changes to distribution shifts, ICML 2023).
// The spec is parsed once and the data file read once; its rows are
// passed through the checks of ReadData (or ReadParquet) once per
// comparison, from memory.
//
// A comparison group too small for the group classifiers (fewer than
// MinComparisonRecords rows, fewer rows kept than folds, or a metric
// without a value in it) is not audited: it is listed in
// Summary.Skipped with the reason, never merged with another. A listed
// value absent from the data is an input error naming
// groups.comparison[i], with the nearest value present as a suggestion.
// The results depend only on spec and the data, not on opt.Workers.
func RunGroups(spec *Spec, opt RunOptions) (*GroupsResult, error) {
	src, err := readDataFile(spec)
	if err != nil {
		return nil, err
	}
	counts, err := scanGroupValues(spec, src)
	if err != nil {
		return nil, err
	}
	values, err := chooseComparisons(spec, counts)
	if err != nil {
		return nil, err
	}
	load := func(s *Spec) (*Dataset, error) { return loadBytes(s, src) }
	out := &GroupsResult{}
	skipped := []SkippedGroup{}
	for _, v := range values {
		if min := MinComparisonRecords(spec.Folds); counts[v] < min {
			skipped = append(skipped, SkippedGroup{Value: v, Rows: shownCount(counts[v], spec.SuppressBelow), Reason: fmt.Sprintf(
				"%s; the group classifiers need at least %d (%d per held-out fold with %d folds)", rowsWords(counts[v], spec.SuppressBelow), min, WarnFoldRecords, spec.Folds)})
			continue
		}
		r, err := run(spec.ForComparison(v), opt, load)
		if reason, ok := tooSmall(err); ok {
			skipped = append(skipped, SkippedGroup{Value: v, Rows: shownCount(counts[v], spec.SuppressBelow), Reason: reason})
			continue
		}
		if err != nil {
			return nil, err
		}
		out.Results = append(out.Results, r)
	}
	if len(out.Results) == 0 {
		return nil, specErr(spec.File, spec.Groups.comparisonLine, "groups.comparison", ErrTooFewRecords,
			"no comparison group could be audited: %s", skippedText(skipped))
	}
	out.Summary = Summarise(spec, out.Results, skipped)
	return out, nil
}

// MinComparisonRecords is the fewest rows a comparison group of RunGroups
// needs with folds cross-fitting folds: WarnFoldRecords per held-out
// fold, below which the group classifiers cannot be judged (a single
// audit warns; an audit of several groups skips the group).
func MinComparisonRecords(folds int) int { return folds * WarnFoldRecords }

// SkippedGroup is a comparison value RunGroups did not audit, with its
// rows in the data and the reason.
type SkippedGroup struct {
	Value string `json:"value"`
	// Rows counts the rows holding the value, before any is dropped for
	// missing values; nil (null in JSON) when small-cell suppression
	// (suppress_below) withholds it.
	Rows   *int   `json:"rows"`
	Reason string `json:"reason"`
}

// tooSmall returns the reason when err says a comparison group is too
// small to audit: too few rows kept for the folds, or a metric without a
// value in it.
func tooSmall(err error) (string, bool) {
	var me *MetricUndefinedError
	var de *DataError
	switch {
	case err == nil:
		return "", false
	case errors.As(err, &me):
		return me.Error(), true
	case errors.Is(err, ErrTooFewRecords) && errors.As(err, &de):
		return de.Err.Error(), true
	}
	return "", false
}

// skippedText lists the skipped values with their reasons.
func skippedText(sk []SkippedGroup) string {
	var b bytes.Buffer
	for i, s := range sk {
		if i > 0 {
			b.WriteString("; ")
		}
		fmt.Fprintf(&b, "%q: %s", s.Value, s.Reason)
	}
	return b.String()
}

// readDataFile reads the bytes of the spec's data file, at most
// MaxDataBytes and one more (loadBytes then refuses the file as
// LoadData would).
func readDataFile(spec *Spec) ([]byte, error) {
	f, err := os.Open(spec.DataPath)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, &DataError{File: spec.DataPath, Err: wrapf(ErrFileNotFound, "data file not found (key data on line %d of %s)", spec.KeyLine("data"), spec.File)}
		}
		return nil, &DataError{File: spec.DataPath, Err: wrapf(ErrReadFailed, "cannot open data file: %v", err)}
	}
	defer f.Close()
	src, err := io.ReadAll(io.LimitReader(f, MaxDataBytes+1))
	if err != nil {
		return nil, &DataError{File: spec.DataPath, Err: wrapCause(ErrReadFailed, err, "cannot read data file: %v", err)}
	}
	return src, nil
}

// loadBytes reads the data file's bytes src as LoadData reads the file.
func loadBytes(spec *Spec, src []byte) (*Dataset, error) {
	if IsParquet(spec.DataPath) {
		return ReadParquet(bytes.NewReader(src), int64(len(src)), spec.DataPath, spec)
	}
	return ReadData(&boundedReader{r: bytes.NewReader(src), total: MaxDataBytes, line: MaxLineBytes}, spec.DataPath, spec)
}

// scanGroupValues counts the rows of every value of the group column,
// passing the header and every row's width and group cell through the
// loader's checks; no row is kept.
func scanGroupValues(spec *Spec, src []byte) (map[string]int, error) {
	l := &csvLoader{name: spec.DataPath, spec: spec, scan: &excludedCounter{}}
	if IsParquet(spec.DataPath) {
		l.parquet = true
		if _, err := l.readParquet(bytes.NewReader(src), int64(len(src))); err != nil {
			return nil, err
		}
		return l.scan.counts, nil
	}
	text, err := skipBOM(&boundedReader{r: bytes.NewReader(src), total: MaxDataBytes, line: MaxLineBytes})
	if err != nil {
		return nil, l.textErr(err)
	}
	cr := csv.NewReader(text)
	cr.FieldsPerRecord = -1
	cr.ReuseRecord = true
	l.cr = cr
	if err := l.readHeader(cr); err != nil {
		return nil, err
	}
	if err := l.readRows(); err != nil {
		return nil, err
	}
	return l.scan.counts, nil
}

// chooseComparisons returns the comparison values to audit: the listed
// ones in their order, each present in the data (else an error naming
// groups.comparison[i] with the nearest value present), or for
// every-other every value but the reference, most rows first and then by
// value.
func chooseComparisons(spec *Spec, counts map[string]int) ([]string, error) {
	g := spec.Groups
	present := make([]string, 0, len(counts))
	for v := range counts {
		present = append(present, v)
	}
	sort.Slice(present, func(i, j int) bool {
		if counts[present[i]] != counts[present[j]] {
			return counts[present[i]] > counts[present[j]]
		}
		return present[i] < present[j]
	})
	if counts[g.Reference] == 0 {
		return nil, absentValue(spec, spec.KeyLine("groups"), "groups.reference", g.Reference, present)
	}
	if !g.EveryOther {
		vals := g.Comparisons
		if vals == nil {
			vals = []string{g.Comparison}
		}
		for i, v := range vals {
			if counts[v] == 0 {
				return nil, absentValue(spec, g.comparisonLineOf(i), g.comparisonKey(i), v, present)
			}
		}
		return vals, nil
	}
	var vals []string
	for _, v := range present {
		if v != g.Reference {
			vals = append(vals, v)
		}
	}
	switch {
	case len(vals) == 0:
		return nil, specErr(spec.File, g.comparisonLine, "groups.comparison", ErrGroupAbsent, "column %q of %s holds no value besides the reference %q", g.Column, spec.DataPath, g.Reference)
	case len(vals) > MaxComparisons:
		return nil, specErr(spec.File, g.comparisonLine, "groups.comparison", ErrBadValue, "%s finds %d values in column %q; at most %d are audited in one run (list the ones to compare)", EveryOther, len(vals), g.Column, MaxComparisons)
	}
	return vals, nil
}

// absentValue is the error for a group value at key that the column does
// not hold, suggesting the nearest value it does hold.
func absentValue(spec *Spec, line int, key, v string, present []string) error {
	msg := fmt.Sprintf("group value %q does not appear in %s of %s", v, spec.Groups.where(fmt.Sprintf("column %q", spec.Groups.Column)), spec.DataPath)
	if s, ok := didyoumean.Nearest(v, present); ok {
		return specErr(spec.File, line, key, ErrGroupAbsent, "%s; did you mean %q?", msg, s)
	}
	if len(present) > 0 && len(present) <= 10 {
		return specErr(spec.File, line, key, ErrGroupAbsent, "%s; it holds %s", msg, comparisonsText(present))
	}
	return specErr(spec.File, line, key, ErrGroupAbsent, "%s", msg)
}

// checkSeveralNames refuses names.groups.comparison in a spec with several
// comparisons: each is named by its value.
func checkSeveralNames(s *Spec) error {
	if !s.Groups.Several() || s.Names == nil || s.Names.Comparison == "" {
		return nil
	}
	return specErr(s.File, s.Names.groupsLine, "names.groups.comparison", ErrBadValue,
		"with several comparison values (groups.comparison) each group is called by its value; omit names.groups.comparison")
}
