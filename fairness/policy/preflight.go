package policy

import "fmt"

// Run describes what an audit will produce, so that a policy can be
// checked before the (slow) run: the metrics audited, the comparison
// groups and whether bootstrap intervals are made.
type Run struct {
	Metrics     []string
	Comparisons []string
	Intervals   bool
}

// Preflight returns, when p.Unjudged is UnjudgedError, the *Error (wrapping
// ErrUnjudged) of the first rule that would be unjudged on run because it
// is judged on an interval bound and the run makes no intervals, or names
// a metric the run does not audit; nil when every rule can be judged (a
// ratio of two zeros can only be found after the run) or when unjudged
// checks count as breaches.
func Preflight(p *Policy, run Run) error {
	if p.Unjudged != UnjudgedError {
		return nil
	}
	for _, r := range p.Rules {
		for _, cmp := range run.Comparisons {
			if !r.AppliesTo(cmp) {
				continue
			}
			key := fmt.Sprintf("rules[%d]", r.Index)
			if !contains(run.Metrics, r.Metric) {
				return errAt(p.File, r.Line, key, ErrUnjudged, "the rule is on %s, which the run does not audit; add it to the spec's metrics, or set unjudged: breach to count the check as a breach", r.Metric)
			}
			if r.NeedsIntervals() && !run.Intervals {
				return errAt(p.File, r.Line, key, ErrUnjudged, "judge: %s needs bootstrap intervals and the run makes none; ask for intervals (--intervals N, or intervals: in the spec), or set unjudged: breach to count the check as a breach", r.Judge)
			}
		}
	}
	return nil
}
