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

// sampleSizeWarnings reports, per group, metrics resting on fewer than
// WarnFewRecords records (MetricResult.RecordsReference and
// RecordsComparison), once for all metrics that rest on the same records
// (the FNR and TPR both on the positives), and per group a size too small
// for the fold count or below StudiedGroupSize. Never nil.
func sampleSizeWarnings(r *Result) []Warning {
	out := []Warning{}
	g := r.Groups
	seen := map[string]int{} // group and basis → index in out
	for _, mr := range r.Metrics {
		for _, side := range []struct {
			value    string
			basis    int
			observed float64
		}{{g.Reference, mr.RecordsReference, mr.Reference}, {g.Comparison, mr.RecordsComparison, mr.Comparison}} {
			w, ok := fewRecords(mr.Metric, side.value, side.basis, side.observed)
			if !ok {
				continue
			}
			f, _ := metrics.FactOf(mr.Metric)
			key := fmt.Sprintf("%s\x00%d\x00%d", side.value, f.Counts, side.basis)
			if i, dup := seen[key]; dup {
				m := strings.Replace(out[i].Message, " in group ", " and "+mr.Metric+" in group ", 1)
				out[i].Message = strings.Replace(m, " rests on ", " rest on ", 1)
				continue
			}
			seen[key] = len(out)
			out = append(out, w)
		}
	}
	for _, side := range []struct {
		value string
		n     int
	}{{g.Reference, g.NReference}, {g.Comparison, g.NComparison}} {
		if w, ok := smallGroup(side.value, side.n, r.Settings.Folds); ok {
			out = append(out, w)
		}
	}
	return out
}

// fewRecords is the warning on a metric resting on basis records of the
// group with value group, whose observed value is v. For a share of
// records the message gives its standard error,
// √(p̃(1 − p̃)/(m + 4)) with p̃ = (m·v + 2)/(m + 4), the adjusted Wald
// form of Agresti & Coull (1998, The American Statistician 52:119; from
// memory), which stays above zero when v is 0 or 1.
func fewRecords(metric, group string, basis int, v float64) (Warning, bool) {
	if basis >= WarnFewRecords {
		return Warning{}, false
	}
	f, _ := metrics.FactOf(metric)
	sev := SeverityCaution
	if basis < WarnVeryFewRecords {
		sev = SeverityUnreliable
	}
	msg := fmt.Sprintf("%s in group %q rests on %s %s", metric, group, thousands(basis), f.BasisNoun())
	if f.Proportion {
		m := float64(basis)
		p := (m*v + 2) / (m + 4)
		msg += fmt.Sprintf(": its value has a standard error of about %.2f, so gaps and contributions of that size cannot be told from chance", math.Sqrt(p*(1-p)/(m+4)))
	} else {
		msg += "; its value, the gap and the contributions are imprecise"
	}
	return Warning{Kind: KindFewRecords, Severity: sev, Metric: metric, Nodes: []string{}, Message: msg}, true
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
