package compare

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness"
)

// validate checks what a comparison reads from a decoded result: that it
// is gapwise's (tool.name), names its groups, has metrics with distinct
// names and mechanisms with distinct nodes, that every metric's
// contributions are those of the mechanisms in their order, and that
// every interval has low ≤ high. The Error names the JSON path; its File
// is set by the caller.
func validate(r *fairness.Result) *Error {
	bad := func(path, format string, args ...any) *Error {
		return &Error{Path: path, Err: wrapf(ErrBadValue, fmt.Sprintf(format, args...))}
	}
	if r.Tool.Name != "gapwise" {
		return &Error{Path: "tool.name", Err: wrapf(ErrNotResult, fmt.Sprintf("is %q, want \"gapwise\": this is not a gapwise result (decompose --format json or result.json)", r.Tool.Name))}
	}
	switch {
	case r.Groups.Column == "":
		return bad("groups.column", "is missing or empty")
	case r.Groups.Reference == "":
		return bad("groups.reference", "is missing or empty")
	case r.Groups.Comparison == "":
		return bad("groups.comparison", "is missing or empty")
	case len(r.Metrics) == 0:
		return bad("metrics", "is missing or empty: the result holds no metric to compare")
	case len(r.Mechanisms) == 0:
		return bad("mechanisms", "is missing or empty: the result holds no graph")
	}
	if iv := r.Settings.Intervals; iv != nil && !(iv.Level > 0 && iv.Level < 1) {
		return bad("settings.intervals.level", "is %v, want a level strictly between 0 and 1", iv.Level)
	}
	nodes := map[string]int{}
	for i, m := range r.Mechanisms {
		p := fmt.Sprintf("mechanisms[%d].node", i)
		if m.Node == "" {
			return bad(p, "is missing or empty")
		}
		if j, dup := nodes[m.Node]; dup {
			return bad(p, "%q is also mechanisms[%d]", m.Node, j)
		}
		nodes[m.Node] = i
	}
	seen := map[string]int{}
	for i, m := range r.Metrics {
		p := fmt.Sprintf("metrics[%d]", i)
		if m.Metric == "" {
			return bad(p+".metric", "is missing or empty")
		}
		if j, dup := seen[m.Metric]; dup {
			return bad(p+".metric", "%q is also metrics[%d]", m.Metric, j)
		}
		seen[m.Metric] = i
		for _, iv := range []struct {
			key string
			ci  *fairness.Interval
		}{{"reference_ci", m.ReferenceCI}, {"comparison_ci", m.ComparisonCI}, {"gap_ci", m.GapCI}} {
			if iv.ci != nil && iv.ci.Low > iv.ci.High {
				return bad(p+"."+iv.key, "ci_low %v is above ci_high %v", iv.ci.Low, iv.ci.High)
			}
		}
		if len(m.Contributions) != len(r.Mechanisms) {
			return bad(p+".contributions", "has %d entries for %d mechanisms", len(m.Contributions), len(r.Mechanisms))
		}
		for k, c := range m.Contributions {
			cp := fmt.Sprintf("%s.contributions[%d]", p, k)
			if c.Node != r.Mechanisms[k].Node {
				return bad(cp+".node", "is %q, want %q (mechanisms[%d])", c.Node, r.Mechanisms[k].Node, k)
			}
			switch {
			case (c.CILow == nil) != (c.CIHigh == nil):
				return bad(cp, "has only one of ci_low and ci_high")
			case c.CILow != nil && *c.CILow > *c.CIHigh:
				return bad(cp+".ci_low", "%v is above ci_high %v", *c.CILow, *c.CIHigh)
			}
		}
	}
	return nil
}
