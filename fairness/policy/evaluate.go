package policy

import (
	"fmt"
	"math"
)

// Interval is an interval of the run (a bootstrap percentile interval).
type Interval struct{ Low, High float64 }

// Subject is what a policy judges for one comparison group and metric: the
// two groups' values of the metric and, when the run has bootstrap
// intervals, the intervals of the gap and of the ratio lower ÷ higher.
type Subject struct {
	Metric     string
	Reference  string // the groups' values in the data
	Comparison string
	// ReferenceValue and ComparisonValue are the metric in each group; the
	// gap is ComparisonValue − ReferenceValue.
	ReferenceValue, ComparisonValue float64
	// GapCI bounds the gap, LowerToHigherCI the ratio min ÷ max of the two
	// values; nil when the run has no such interval.
	GapCI, LowerToHigherCI *Interval
	// Level is the intervals' level (0.95), for the reports; 0 when
	// unknown.
	Level float64
}

// Outcome is the judgement of a policy on a run: one Check per rule,
// comparison group and limit, and whether the run passed.
type Outcome struct {
	File   string `json:"file"`
	SHA256 string `json:"sha256"`
	Title  string `json:"title,omitempty"`
	// Unjudged is the policy's setting: with UnjudgedError a check that
	// cannot be judged is an error and no outcome is made, so only
	// UnjudgedBreach outcomes hold unjudged checks.
	Unjudged string `json:"unjudged"`
	// Passed is true when no check breached (Breaches == 0).
	Passed bool `json:"passed"`
	// Breaches counts the checks with status StatusBreach or
	// StatusUnjudged.
	Breaches int     `json:"breaches"`
	Checks   []Check `json:"checks"`
}

// Check is one limit of one rule judged on one comparison group.
type Check struct {
	Rule int `json:"rule"` // 1-based index of the rule in the file
	Line int `json:"line"` // its line in the file
	// Preset and Note name the preset the rule came from and its caution.
	Preset     string `json:"preset,omitempty"`
	Note       string `json:"note,omitempty"`
	Metric     string `json:"metric"`
	Reference  string `json:"reference"`
	Comparison string `json:"comparison"`
	// Limit is LimitMaxGap (on |gap|) or LimitMinRatio (on lower ÷
	// higher), LimitValue its value.
	Limit      string  `json:"limit"`
	LimitValue float64 `json:"limit_value"`
	Judge      string  `json:"judge"`
	// Level is the level of the interval a bound comes from; absent when
	// judged on the estimate.
	Level float64 `json:"level,omitempty"`
	// Estimate is the judged quantity (|gap| or lower ÷ higher) at the
	// point estimate, Value the one judged: the estimate, or the chosen
	// bound over the interval. Both are absent when undefined.
	Estimate *float64 `json:"estimate,omitempty"`
	Value    *float64 `json:"value,omitempty"`
	Status   string   `json:"status"`
	// Reason says why a check is unjudged or skipped.
	Reason string `json:"reason,omitempty"`
}

// Values of Check.Status.
const (
	StatusPass     = "pass"
	StatusBreach   = "breach"
	StatusUnjudged = "unjudged" // cannot be judged; counted as a breach
	StatusSkipped  = "skipped"  // the rule names other comparison groups
)

// Breached reports whether the check counts against the run.
func (c Check) Breached() bool { return c.Status == StatusBreach || c.Status == StatusUnjudged }

// Evaluate judges every rule of p on the subjects, in the order of the
// rules, then of the comparison groups (in their first order among the
// subjects), then max_gap before min_ratio. A limit is kept when
//
//	max_gap:   v ≤ max_gap + Tolerance,   v = |gap|
//	min_ratio: q ≥ min_ratio − Tolerance, q = min(ref, cmp) / max(ref, cmp)
//
// with v and q taken at the estimate, or over the interval [lo, hi] at its
// worst bound (v = max(|lo|, |hi|), q = lo of the ratio's interval) or its
// best bound (v = 0 when the interval holds 0, else min(|lo|, |hi|); q =
// hi of the ratio's interval). A check without the numbers it needs is
// unjudged: with p.Unjudged == UnjudgedBreach it counts as a breach, with
// UnjudgedError Evaluate returns an *Error wrapping ErrUnjudged that
// names the rule.
func Evaluate(p *Policy, subjects []Subject) (*Outcome, error) {
	out := &Outcome{File: p.File, SHA256: p.SHA256, Title: p.Title, Unjudged: p.Unjudged, Checks: []Check{}}
	comparisons := comparisonsOf(subjects)
	for _, r := range p.Rules {
		for _, cmp := range comparisons {
			for _, c := range judgeRule(r, cmp, subjects) {
				if c.Status == StatusUnjudged && p.Unjudged == UnjudgedError {
					return nil, unjudgedError(p, r, c)
				}
				out.Checks = append(out.Checks, c)
			}
		}
	}
	for _, c := range out.Checks {
		if c.Breached() {
			out.Breaches++
		}
	}
	out.Passed = out.Breaches == 0
	return out, nil
}

// unjudgedError is the error of a check that cannot be judged under
// unjudged: error.
func unjudgedError(p *Policy, r Rule, c Check) *Error {
	return errAt(p.File, r.Line, fmt.Sprintf("rules[%d]", r.Index), ErrUnjudged,
		"%s %s for %q cannot be judged: %s (set unjudged: breach to count such a check as a breach)", c.Metric, c.Limit, c.Comparison, c.Reason)
}

// comparisonsOf lists the distinct comparison groups of the subjects in
// their first order.
func comparisonsOf(subjects []Subject) []string {
	var out []string
	seen := map[string]bool{}
	for _, s := range subjects {
		if !seen[s.Comparison] {
			seen[s.Comparison] = true
			out = append(out, s.Comparison)
		}
	}
	return out
}

// judgeRule returns the checks of rule r on comparison group cmp: one per
// limit, skipped when r names other groups.
func judgeRule(r Rule, cmp string, subjects []Subject) []Check {
	var s *Subject
	for i := range subjects {
		if subjects[i].Comparison == cmp && subjects[i].Metric == r.Metric {
			s = &subjects[i]
			break
		}
	}
	base := Check{Rule: r.Index, Line: r.Line, Preset: r.Preset, Metric: r.Metric, Comparison: cmp, Judge: r.Judge}
	if pr, ok := presetOf(r.Preset); ok {
		base.Note = pr.note
	}
	if s != nil {
		base.Reference = s.Reference
	} else {
		for _, o := range subjects {
			if o.Comparison == cmp {
				base.Reference = o.Reference
				break
			}
		}
	}
	var checks []Check
	if r.MaxGap != nil {
		c := base
		c.Limit, c.LimitValue = LimitMaxGap, *r.MaxGap
		checks = append(checks, c)
	}
	if r.MinRatio != nil {
		c := base
		c.Limit, c.LimitValue = LimitMinRatio, *r.MinRatio
		checks = append(checks, c)
	}
	for i := range checks {
		c := &checks[i]
		switch {
		case !r.AppliesTo(cmp):
			c.Status, c.Reason = StatusSkipped, fmt.Sprintf("the rule is for the comparison groups %q only", r.Groups)
		case s == nil:
			c.Status, c.Reason = StatusUnjudged, fmt.Sprintf("the run did not audit %s", r.Metric)
		case c.Limit == LimitMaxGap:
			judgeGap(c, s)
		default:
			judgeRatio(c, s)
		}
	}
	return checks
}

// judgeGap judges |gap| ≤ limit.
func judgeGap(c *Check, s *Subject) {
	est := math.Abs(s.ComparisonValue - s.ReferenceValue)
	c.Estimate = &est
	v := est
	if c.Judge != JudgeEstimate {
		if s.GapCI == nil {
			c.Status, c.Reason = StatusUnjudged, fmt.Sprintf("judge: %s needs bootstrap intervals and the run has none", c.Judge)
			return
		}
		c.Level = s.Level
		lo, hi := s.GapCI.Low, s.GapCI.High
		switch {
		case c.Judge == JudgeWorstBound:
			v = math.Max(math.Abs(lo), math.Abs(hi))
		case lo <= 0 && hi >= 0:
			v = 0
		default:
			v = math.Min(math.Abs(lo), math.Abs(hi))
		}
	}
	c.Value = &v
	c.Status = StatusPass
	if v > c.LimitValue+Tolerance {
		c.Status = StatusBreach
	}
}

// judgeRatio judges min(ref, cmp) / max(ref, cmp) ≥ limit.
func judgeRatio(c *Check, s *Subject) {
	lower, higher := math.Min(s.ReferenceValue, s.ComparisonValue), math.Max(s.ReferenceValue, s.ComparisonValue)
	if higher > 0 {
		est := lower / higher
		c.Estimate = &est
	}
	var v float64
	switch {
	case c.Judge == JudgeEstimate && c.Estimate == nil:
		c.Status, c.Reason = StatusUnjudged, "both groups' values are 0, so their ratio is undefined"
		return
	case c.Judge == JudgeEstimate:
		v = *c.Estimate
	case s.LowerToHigherCI == nil && s.GapCI == nil:
		c.Status, c.Reason = StatusUnjudged, fmt.Sprintf("judge: %s needs bootstrap intervals and the run has none", c.Judge)
		return
	case s.LowerToHigherCI == nil:
		c.Status, c.Reason = StatusUnjudged, "the run has no interval of the ratio (a resample had both values 0)"
		return
	case c.Judge == JudgeWorstBound:
		c.Level, v = s.Level, s.LowerToHigherCI.Low
	default:
		c.Level, v = s.Level, s.LowerToHigherCI.High
	}
	c.Value = &v
	c.Status = StatusPass
	if v < c.LimitValue-Tolerance {
		c.Status = StatusBreach
	}
}
