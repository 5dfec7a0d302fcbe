// Package policy is the release gate of an audit: a YAML file of limits on
// the gaps between groups, judged against an audit's results, so that a
// pipeline can stop a model release whose gaps break them.
//
// A policy file holds rules. Each rule names a metric (optionally only for
// some comparison groups) and one or both limits:
//
//	max_gap:   |comparison − reference| ≤ max_gap (in the metric's units:
//	           0.05 is 5 percentage points for a rate)
//	min_ratio: lower ÷ higher of the two groups' values ≥ min_ratio, for
//	           rates only (metrics.Fact.Proportion); with two groups this
//	           is min(r, 1/r) for the impact ratio r = comparison ÷ reference
//
// judged on the point estimate (judge: estimate, the default) or on a
// bound of the run's bootstrap interval: worst_bound takes the bound least
// favourable to the limit (the check passes only when the whole interval
// keeps the limit), best_bound the most favourable one (the check breaches
// only when the whole interval breaks it). A check that cannot be judged
// (a bound without intervals, a metric the run did not audit, a ratio of
// two zeros) is never passed silently: the setting unjudged says whether
// it counts as a breach or stops the run with an error (the default).
//
// The preset four-fifths is the rule of 29 CFR 1607.4(D) (US Uniform
// Guidelines on Employee Selection Procedures): a selection rate below
// four-fifths of the highest group's rate is taken as evidence of adverse
// impact. It is an employment rule; in a clinical audit it serves as an
// analogy for the share flagged positive, and is labelled so.
//
// The package knows nothing of how the numbers were estimated: Evaluate
// judges Subjects (one per comparison group and metric), which an audit
// result, or a comparison of two results, supplies.
package policy

// Policy is a parsed and validated policy file. Build it with Load or
// Parse.
type Policy struct {
	File   string // path as given
	SHA256 string // hex SHA-256 of the file's bytes
	Title  string
	// Unjudged is UnjudgedError or UnjudgedBreach: what a check that
	// cannot be judged becomes.
	Unjudged string
	Rules    []Rule
}

// Rule is one entry of rules, with a preset expanded into its metric and
// limits.
type Rule struct {
	Index int // 1-based position in rules
	Line  int // line of the entry in the file
	// Preset names the preset the rule came from ("" for none).
	Preset string
	Metric string
	// Groups, when not empty, limits the rule to these comparison group
	// values; other comparisons are skipped.
	Groups []string
	// MaxGap and MinRatio are the limits; nil when not given (at least one
	// is).
	MaxGap   *float64
	MinRatio *float64
	Judge    string // JudgeEstimate, JudgeWorstBound or JudgeBestBound
}

// Values of Policy.Unjudged.
const (
	UnjudgedError  = "error"
	UnjudgedBreach = "breach"
)

// Values of Rule.Judge.
const (
	JudgeEstimate   = "estimate"
	JudgeWorstBound = "worst_bound"
	JudgeBestBound  = "best_bound"
)

// Names of the limits, as keys in the file and in Check.Limit.
const (
	LimitMaxGap   = "max_gap"
	LimitMinRatio = "min_ratio"
)

// Tolerance is the slack with which values are compared to limits, so
// that a value exactly at a limit in decimal arithmetic is not failed by
// binary rounding: 0.48 ÷ 0.60 is 0.7999999999999999 in float64, yet 48 %
// against 60 % is exactly four-fifths and keeps the rule.
const Tolerance = 1e-9

// MaxBytes caps the size of a policy file.
const MaxBytes = 1 << 20

// NeedsIntervals reports whether the rule is judged on an interval bound.
func (r Rule) NeedsIntervals() bool { return r.Judge != JudgeEstimate }

// AppliesTo reports whether the rule judges the comparison group value
// comparison: always when Groups is empty.
func (r Rule) AppliesTo(comparison string) bool {
	if len(r.Groups) == 0 {
		return true
	}
	for _, g := range r.Groups {
		if g == comparison {
			return true
		}
	}
	return false
}
