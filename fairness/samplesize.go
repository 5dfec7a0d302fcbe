package fairness

import (
	"fmt"
	"math"
	"strings"

	"github.com/gapwise/gapwise/metrics"
)

// Sample-size thresholds of the warnings below.
const (
	// WarnFewRecords: a metric resting on fewer records than this in a
	// group gets a caution, and on fewer than WarnVeryFewRecords an
	// "unreliable" (common practice: rates from fewer than about 30 cases
	// are read with care, and from under 10 not at all).
	WarnFewRecords     = 30
	WarnVeryFewRecords = 10
	// WarnFoldRecords: a group whose held-out folds hold fewer records
	// than this is too small for its fold count (the group classifiers are
	// judged on each held-out fold; common practice).
	WarnFoldRecords = 20
	// StudiedGroupSize is the smallest group size at which the accuracy
	// study measured the estimator (errors and interval coverage, see the
	// README's Accuracy section); smaller groups get a note.
	StudiedGroupSize = 800
	// WarnDroppedGap and WarnDroppedZ: the shares of rows dropped for
	// missing values differ between the groups by at least this much and
	// by at least this many standard errors (z = 3: about 1 false alarm in
	// 370 when the shares are equal; common practice).
	WarnDroppedGap = 0.02
	WarnDroppedZ   = 3
)

// sampleSizeWarnings reports, once per group, the metrics that rest on
// fewer than WarnFewRecords of its records (MetricResult.RecordsReference
// and RecordsComparison; metrics on the same records, such as the FNR and
// TPR on the positives, share a clause), and per group a size too small
// for the fold count or below StudiedGroupSize. Never nil.
func sampleSizeWarnings(r *Result) []Warning {
	out := []Warning{}
	g := r.Groups
	for _, side := range []struct {
		value      string
		comparison bool
	}{{r.ReferenceName(), false}, {r.ComparisonName(), true}} {
		if w, ok := fewRecords(r.Metrics, side.value, side.comparison); ok {
			out = append(out, w)
		}
	}
	for _, side := range []struct {
		value string
		n     int
	}{{r.ReferenceName(), g.NReference}, {r.ComparisonName(), g.NComparison}} {
		if w, ok := smallGroup(side.value, side.n, r.Settings.Folds); ok {
			out = append(out, w)
		}
	}
	return out
}

// fewRecords is the warning on the metrics that rest on fewer than
// WarnFewRecords records of one group (caution; unreliable below
// WarnVeryFewRecords). For a share of m records with observed value v the
// clause gives its standard error √(p̃(1 − p̃)/(m + 4)) with
// p̃ = (m·v + 2)/(m + 4), the adjusted Wald form of Agresti & Coull (1998,
// The American Statistician 52:119; from memory), which stays above zero
// when v is 0 or 1. Metric is set when one metric is concerned.
func fewRecords(ms []MetricResult, group string, comparison bool) (Warning, bool) {
	type clause struct {
		metrics []string
		text    string
	}
	var clauses []clause
	index := map[string]int{}
	sev := SeverityCaution
	for _, mr := range ms {
		basis, v := mr.RecordsReference, mr.Reference
		if comparison {
			basis, v = mr.RecordsComparison, mr.Comparison
		}
		if basis >= WarnFewRecords {
			continue
		}
		if basis < WarnVeryFewRecords {
			sev = SeverityUnreliable
		}
		f, _ := metrics.FactOf(mr.Metric)
		text := fmt.Sprintf("%s %s", thousands(basis), f.BasisNoun())
		if f.Proportion {
			m := float64(basis)
			p := (m*v + 2) / (m + 4)
			text += fmt.Sprintf(" (standard error about %.2f)", math.Sqrt(p*(1-p)/(m+4)))
		}
		key := fmt.Sprintf("%d\x00%d", f.Counts, basis)
		if i, ok := index[key]; ok {
			clauses[i].metrics = append(clauses[i].metrics, mr.Metric)
			continue
		}
		index[key] = len(clauses)
		clauses = append(clauses, clause{[]string{mr.Metric}, text})
	}
	if len(clauses) == 0 {
		return Warning{}, false
	}
	parts := make([]string, len(clauses))
	var names []string
	for i, c := range clauses {
		verb := " rests on "
		if len(c.metrics) > 1 {
			verb = " rest on "
		}
		parts[i] = strings.Join(c.metrics, " and ") + verb + c.text
		names = append(names, c.metrics...)
	}
	w := Warning{Kind: KindFewRecords, Severity: sev, Nodes: []string{},
		Message: fmt.Sprintf("in group %q, %s: a value from so few records is imprecise, and gaps and contributions of the size of its standard error cannot be told from chance", group, strings.Join(parts, ", "))}
	if len(names) == 1 {
		w.Metric = names[0]
	}
	return w, true
}

// smallGroup is the warning on a group of n records cross-fitted with
// folds folds.
func smallGroup(group string, n, folds int) (Warning, bool) {
	w := Warning{Kind: KindSmallGroup, Nodes: []string{}}
	switch {
	case folds > 0 && n/folds < WarnFoldRecords:
		w.Severity = SeverityCaution
		w.Message = fmt.Sprintf("group %q has %s records: with %d folds each held-out fold holds about %d of them, too few to fit and judge the group classifiers (use fewer folds or more data)", group, thousands(n), folds, n/folds)
	case n < StudiedGroupSize:
		w.Severity = SeverityNote
		w.Message = fmt.Sprintf("group %q has %s records, fewer than the %s per group at which the accuracy study measured the estimator; contributions and intervals are less well supported", group, thousands(n), thousands(StudiedGroupSize))
	default:
		return Warning{}, false
	}
	return w, true
}
