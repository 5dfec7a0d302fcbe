// Package compare compares gapwise results: a release review of two runs
// (model v3 against v4 on the same cohort, or one model over two periods:
// how each gap and each mechanism's contribution changed, with an
// interval for the change where both runs have intervals) and a history
// of several runs in time order (each gap and its leading contributions
// over the releases). It reads the results' JSON (Load), refuses runs
// that are not comparable (match) unless asked to compare what they
// share, and computes; the report package renders.
//
// The contributions are the Shapley values of Zhang et al. (2023), "Why
// did the model fail?": Attributing model performance changes to
// distribution shifts, ICML 2023 (PMLR 202); a change of a contribution is the
// difference of two such estimates, each under the assumptions of its
// run (the graph, no hidden confounders, overlap).
package compare

import (
	"fmt"
	"math"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/policy"
)

// Options choose how runs are compared.
type Options struct {
	// Shared compares what the runs share (metrics, and mechanisms with
	// the same parents and columns) instead of refusing runs whose
	// metrics or graphs differ; the rest is listed as omitted. Runs with
	// different labels or groups are refused regardless.
	Shared bool
	// Independent declares that the runs are on disjoint cohorts (two
	// periods with no record in common), so their estimates are
	// independent and the change intervals may use MethodIndependent;
	// without it they use MethodBonferroni, valid under any dependence.
	Independent bool
	// Leading is how many of each metric's contributions a History
	// follows (those largest in absolute value in any run); 0 means 3.
	Leading int
}

// Groups names the group column and the two groups compared.
type Groups struct {
	Column     string `json:"column"`
	Reference  string `json:"reference"`
	Comparison string `json:"comparison"`
}

// Change is one quantity in both runs and its change After − Before.
type Change struct {
	Before float64 `json:"before"`
	After  float64 `json:"after"`
	Change float64 `json:"change"`
	// BeforeCI and AfterCI are the runs' intervals; ChangeCI the
	// interval of the change (Review.Intervals says how it is made),
	// present only when both runs have an interval.
	BeforeCI *fairness.Interval `json:"before_ci,omitempty"`
	AfterCI  *fairness.Interval `json:"after_ci,omitempty"`
	ChangeCI *fairness.Interval `json:"change_ci,omitempty"`
	// ExcludesZero is set when ChangeCI lies wholly above or below 0:
	// the change is distinguished from sampling noise at the interval's
	// level.
	ExcludesZero bool `json:"excludes_zero,omitempty"`
}

// ContributionChange is the change of one mechanism's contribution.
type ContributionChange struct {
	Node string `json:"node"`
	Change
	// NotEstimable is set when either run marks the contribution as not
	// estimable: the reports then show no value.
	NotEstimable bool `json:"not_estimable,omitempty"`
}

// MetricChange is one metric's change between the runs: the groups'
// values, the gap (comparison − reference) and every shared mechanism's
// contribution, in graph order.
type MetricChange struct {
	Metric        string               `json:"metric"`
	Reference     Change               `json:"reference"`
	Comparison    Change               `json:"comparison"`
	Gap           Change               `json:"gap"`
	Contributions []ContributionChange `json:"contributions"`
	// LeadBefore and LeadAfter are the nodes of the largest contribution
	// in each run (the runs' headlines).
	LeadBefore string `json:"lead_before,omitempty"`
	LeadAfter  string `json:"lead_after,omitempty"`
}

// ComparisonReview is the review of one comparison group against the
// reference.
type ComparisonReview struct {
	Groups  Groups         `json:"groups"`
	Metrics []MetricChange `json:"metrics"`
}

// Review is the release review of two runs. Its JSON encoding is what
// `gapwise compare --format json` prints for two files.
type Review struct {
	Before Run `json:"before"`
	After  Run `json:"after"`
	// SharedOnly and Independent echo the options.
	SharedOnly  bool `json:"shared_only,omitempty"`
	Independent bool `json:"independent_cohorts,omitempty"`
	// Intervals says how the change intervals were made; absent when no
	// change has one, and NoIntervals then says why.
	Intervals   *ChangeIntervals `json:"change_intervals,omitempty"`
	NoIntervals string           `json:"no_change_intervals,omitempty"`
	// Notes are the differences between the runs a reader should know
	// of (threshold, score column, data, estimation settings).
	Notes       []string           `json:"notes"`
	Omitted     []Omission         `json:"omitted,omitempty"`
	Mechanisms  []Mechanism        `json:"mechanisms"`
	Comparisons []ComparisonReview `json:"comparisons"`
	// Names are the display names of the later run.
	Names *fairness.Names `json:"names,omitempty"`
	// Policy is the judgement of a policy file on the later run (the
	// release under review); absent without one.
	Policy      *policy.Outcome `json:"policy,omitempty"`
	Assumptions []string        `json:"assumptions"`
}

// NewReview compares the result before (read from beforeFile) with after
// (from afterFile). It returns an *Error wrapping ErrNotComparable when
// the runs differ in label or groups, or, without o.Shared, in metrics or
// graph.
func NewReview(beforeFile string, before *fairness.Result, afterFile string, after *fairness.Result, o Options) (*Review, error) {
	files := []string{beforeFile, afterFile}
	rs := []*fairness.Result{before, after}
	s, err := match(files, rs, o.Shared)
	if err != nil {
		return nil, err
	}
	runs := []Run{newRun(beforeFile, before), newRun(afterFile, after)}
	distinctLabels(runs)
	rv := &Review{Before: runs[0], After: runs[1], SharedOnly: o.Shared, Independent: o.Independent,
		Omitted: s.omitted, Mechanisms: s.mechanisms, Names: after.Names, Assumptions: assumptions(o.Independent)}
	rv.Intervals, rv.NoIntervals = newChangeIntervals(runs[0].IntervalLevel, runs[1].IntervalLevel, o.Independent)
	method := ""
	if rv.Intervals != nil {
		method = rv.Intervals.Method
	}
	rv.Notes = notes(runs[0], runs[1], before, after, s)
	cr := ComparisonReview{Groups: Groups{after.Groups.Column, after.Groups.Reference, after.Groups.Comparison}}
	for _, name := range s.metrics {
		mb, ma := metricOf(before, name), metricOf(after, name)
		mc := MetricChange{Metric: name,
			Reference:  change(method, mb.Reference, ma.Reference, mb.ReferenceCI, ma.ReferenceCI),
			Comparison: change(method, mb.Comparison, ma.Comparison, mb.ComparisonCI, ma.ComparisonCI),
			Gap:        change(method, mb.Gap, ma.Gap, mb.GapCI, ma.GapCI),
			LeadBefore: mb.Headline.Lead, LeadAfter: ma.Headline.Lead}
		for _, mech := range s.mechanisms {
			cb, ca := contributionOf(mb, mech.Node), contributionOf(ma, mech.Node)
			mc.Contributions = append(mc.Contributions, ContributionChange{Node: mech.Node,
				Change:       change(method, cb.Value, ca.Value, ciOf(cb), ciOf(ca)),
				NotEstimable: cb.NotEstimable || ca.NotEstimable})
		}
		cr.Metrics = append(cr.Metrics, mc)
	}
	rv.Comparisons = []ComparisonReview{cr}
	return rv, nil
}

// change is the Change from b to a with the runs' intervals bi and ai.
func change(method string, b, a float64, bi, ai *fairness.Interval) Change {
	c := Change{Before: b, After: a, Change: a - b, BeforeCI: bi, AfterCI: ai}
	if method != "" {
		c.ChangeCI = changeCI(method, b, a, bi, ai)
		c.ExcludesZero = c.ChangeCI != nil && (c.ChangeCI.Low > 0 || c.ChangeCI.High < 0)
	}
	return c
}

func ciOf(c fairness.Contribution) *fairness.Interval {
	if c.CILow == nil || c.CIHigh == nil {
		return nil
	}
	return &fairness.Interval{Low: *c.CILow, High: *c.CIHigh}
}

// notes lists how the runs differ besides their numbers.
func notes(b, a Run, rb, ra *fairness.Result, s shared) []string {
	var out []string
	if b.DataSHA256 != "" && b.DataSHA256 == a.DataSHA256 {
		out = append(out, "Both runs read the same data file (same SHA-256).")
	} else if b.NReference == a.NReference && b.NComparison == a.NComparison {
		out = append(out, "The runs read different data files with the same group sizes: the same cohort with a new score, or another cohort.")
	} else {
		out = append(out, fmt.Sprintf("The runs read different data (%d and %d reference records, %d and %d comparison records).", b.NReference, a.NReference, b.NComparison, a.NComparison))
	}
	if b.Score != a.Score {
		out = append(out, fmt.Sprintf("The score column differs: %q before, %q after.", b.Score, a.Score))
	}
	if math.Abs(b.Threshold-a.Threshold) > 0 {
		out = append(out, fmt.Sprintf("The threshold differs: %v before, %v after; threshold metrics count different decisions.", b.Threshold, a.Threshold))
	}
	sb, sa := rb.Settings, ra.Settings
	if sb.Classifier != sa.Classifier || sb.Folds != sa.Folds || sb.FoldSplits != sa.FoldSplits || sb.EstimateFrom != sa.EstimateFrom || sb.ClipRatios != sa.ClipRatios {
		out = append(out, "The estimation settings differ (classifier, folds, fold splits, sides or clipping): part of a change may come from the estimation rather than the data or the model.")
	}
	if s.graphDiffers {
		out = append(out, "The graphs differ: a shared mechanism's contribution is a Shapley value over a different set of mechanisms in each run, so its change is not a change of one quantity.")
	}
	return out
}

// Cautions every comparison states.
const (
	cautionEstimates = "Each run's numbers are statistical estimates under that run's assumptions: the causal graph is right, no hidden confounders act on the mechanisms, and the groups overlap where the weights reach."
	cautionChange    = "A change is the difference of two estimates; one whose interval includes zero is not distinguished from sampling noise."
	cautionFindings  = "These are not clinical or legal findings; local regulation and institutional review govern what follows from them."
)

// historyAssumptions are the cautions of a History.
func historyAssumptions() []string {
	return []string{cautionEstimates, "A movement between runs that stays within the runs' intervals is not distinguished from sampling noise.", cautionFindings}
}

// assumptions are the cautions of a Review.
func assumptions(independent bool) []string {
	out := []string{cautionEstimates, cautionChange}
	if independent {
		out = append(out, "The change intervals assume the runs are on disjoint cohorts (independent estimates); for runs that share records they are too narrow.")
	} else {
		out = append(out, "The runs are taken to be dependent (the same cohort, or overlapping records): the change intervals add the two runs' half-widths, which holds under any dependence but may be wide.")
	}
	return append(out, cautionFindings)
}
