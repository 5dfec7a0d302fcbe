package compare

import (
	"fmt"
	"slices"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// Mechanism is a mechanism the compared runs share: its node, parents
// and columns are the same in every run.
type Mechanism struct {
	Node    string   `json:"node"`
	Parents []string `json:"parents"`
	Columns []string `json:"columns"`
}

// Omission is something only some of the runs hold, left out because
// Options.Shared asked to compare what they share.
type Omission struct {
	// Kind is "metric", "mechanism" or "comparison".
	Kind string `json:"kind"`
	Name string `json:"name"`
	// Reason says which runs hold it, or how it differs.
	Reason string `json:"reason"`
}

// shared is what every run holds alike: the metrics (in the last run's
// order), the mechanisms with the same node, parents and columns (in its
// graph order), and what was left out.
type shared struct {
	metrics    []string
	mechanisms []Mechanism
	omitted    []Omission
	// graphDiffers is set when the runs' graphs are not the same: the
	// contributions are then Shapley values of different games.
	graphDiffers bool
}

// match checks that the runs (at least two) are comparable: the same
// label, group column and groups (never overridable), and, unless
// sharedOnly, the same metrics and the same graph. With sharedOnly it
// keeps what all share and lists the rest; nothing shared is an error.
// files names the runs for the messages.
func match(files []string, rs []*fairness.Result, sharedOnly bool) (shared, error) {
	last := rs[len(rs)-1]
	var hard, soft []string
	for i, r := range rs[:len(rs)-1] {
		pair := fmt.Sprintf("%s and %s", files[i], files[len(rs)-1])
		if r.Label != last.Label {
			hard = append(hard, fmt.Sprintf("the label differs (%q in %s, %q in %s): the runs answer different questions", r.Label, files[i], last.Label, files[len(rs)-1]))
		}
		g, h := r.Groups, last.Groups
		if g.Column != h.Column || g.Reference != h.Reference || g.Comparison != h.Comparison {
			hard = append(hard, fmt.Sprintf("the groups differ (%s: %s vs %s in %s, %s: %s vs %s in %s)",
				g.Column, g.Comparison, g.Reference, files[i], h.Column, h.Comparison, h.Reference, files[len(rs)-1]))
		}
		if !slices.Equal(metricNames(r), metricNames(last)) {
			soft = append(soft, fmt.Sprintf("the metrics differ between %s (%s) and %s (%s)", files[i], strings.Join(metricNames(r), ", "), files[len(rs)-1], strings.Join(metricNames(last), ", ")))
		}
		if d := graphDifference(r, last); d != "" {
			soft = append(soft, fmt.Sprintf("the graphs of %s differ: %s", pair, d))
		}
	}
	if len(hard) > 0 {
		return shared{}, &Error{Err: wrapf(ErrNotComparable, "runs are not comparable: "+strings.Join(hard, "; "))}
	}
	if len(soft) > 0 && !sharedOnly {
		return shared{}, &Error{Err: wrapf(ErrNotComparable, "runs are not comparable: "+strings.Join(soft, "; ")+" (--shared compares what the runs share)")}
	}
	var s shared
	s.graphDiffers = len(soft) > 0 && anyGraphDiffers(rs)
	for _, m := range last.Metrics {
		if in := holding(rs, func(r *fairness.Result) bool { return hasMetric(r, m.Metric) }); in == len(rs) {
			s.metrics = append(s.metrics, m.Metric)
		}
	}
	for _, mech := range last.Mechanisms {
		ok := true
		for _, r := range rs {
			o, found := mechanismOf(r, mech.Node)
			ok = ok && found && slices.Equal(o.Parents, mech.Parents) && slices.Equal(o.Columns, mech.Columns)
		}
		if ok {
			s.mechanisms = append(s.mechanisms, Mechanism{Node: mech.Node, Parents: mech.Parents, Columns: mech.Columns})
		}
	}
	s.omitted = omissions(files, rs, s)
	if len(s.metrics) == 0 {
		return shared{}, &Error{Err: wrapf(ErrNotComparable, "runs are not comparable: they share no metric")}
	}
	return s, nil
}

// omissions lists the metrics and mechanisms of any run that s leaves out.
func omissions(files []string, rs []*fairness.Result, s shared) []Omission {
	var out []Omission
	seen := map[string]bool{}
	for _, r := range rs {
		for _, m := range r.Metrics {
			if seen["m"+m.Metric] || slices.Contains(s.metrics, m.Metric) {
				continue
			}
			seen["m"+m.Metric] = true
			out = append(out, Omission{Kind: "metric", Name: m.Metric, Reason: "only in " + holders(files, rs, func(r *fairness.Result) bool { return hasMetric(r, m.Metric) })})
		}
	}
	for _, r := range rs {
		for _, mech := range r.Mechanisms {
			if seen["n"+mech.Node] || slices.ContainsFunc(s.mechanisms, func(x Mechanism) bool { return x.Node == mech.Node }) {
				continue
			}
			seen["n"+mech.Node] = true
			in := holders(files, rs, func(r *fairness.Result) bool { _, ok := mechanismOf(r, mech.Node); return ok })
			reason := "only in " + in
			if holding(rs, func(r *fairness.Result) bool { _, ok := mechanismOf(r, mech.Node); return ok }) == len(rs) {
				reason = "its parents or columns differ between the runs"
			}
			out = append(out, Omission{Kind: "mechanism", Name: mech.Node, Reason: reason})
		}
	}
	return out
}

func metricNames(r *fairness.Result) []string {
	out := make([]string, len(r.Metrics))
	for i, m := range r.Metrics {
		out[i] = m.Metric
	}
	slices.Sort(out)
	return out
}

func hasMetric(r *fairness.Result, name string) bool {
	return slices.ContainsFunc(r.Metrics, func(m fairness.MetricResult) bool { return m.Metric == name })
}

func metricOf(r *fairness.Result, name string) fairness.MetricResult {
	i := slices.IndexFunc(r.Metrics, func(m fairness.MetricResult) bool { return m.Metric == name })
	return r.Metrics[i]
}

func mechanismOf(r *fairness.Result, node string) (fairness.MechanismResult, bool) {
	i := slices.IndexFunc(r.Mechanisms, func(m fairness.MechanismResult) bool { return m.Node == node })
	if i < 0 {
		return fairness.MechanismResult{}, false
	}
	return r.Mechanisms[i], true
}

// contributionOf returns the contribution of node to m (present: validate
// checked that every mechanism has one).
func contributionOf(m fairness.MetricResult, node string) fairness.Contribution {
	i := slices.IndexFunc(m.Contributions, func(c fairness.Contribution) bool { return c.Node == node })
	return m.Contributions[i]
}

func holding(rs []*fairness.Result, has func(*fairness.Result) bool) int {
	n := 0
	for _, r := range rs {
		if has(r) {
			n++
		}
	}
	return n
}

func holders(files []string, rs []*fairness.Result, has func(*fairness.Result) bool) string {
	var in []string
	for i, r := range rs {
		if has(r) {
			in = append(in, files[i])
		}
	}
	return strings.Join(in, ", ")
}

// graphDifference describes how the graphs of a and b differ ("" when
// they are the same: the same nodes in the same order, each with the same
// parents and columns).
func graphDifference(a, b *fairness.Result) string {
	if len(a.Mechanisms) != len(b.Mechanisms) {
		return fmt.Sprintf("%d mechanisms against %d", len(a.Mechanisms), len(b.Mechanisms))
	}
	for i, m := range a.Mechanisms {
		o := b.Mechanisms[i]
		switch {
		case m.Node != o.Node:
			return fmt.Sprintf("mechanism %d is %q in one and %q in the other", i+1, m.Node, o.Node)
		case !slices.Equal(m.Parents, o.Parents):
			return fmt.Sprintf("node %q has parents [%s] in one and [%s] in the other", m.Node, strings.Join(m.Parents, ", "), strings.Join(o.Parents, ", "))
		case !slices.Equal(m.Columns, o.Columns):
			return fmt.Sprintf("node %q has columns [%s] in one and [%s] in the other", m.Node, strings.Join(m.Columns, ", "), strings.Join(o.Columns, ", "))
		}
	}
	return ""
}

func anyGraphDiffers(rs []*fairness.Result) bool {
	for _, r := range rs[:len(rs)-1] {
		if graphDifference(r, rs[len(rs)-1]) != "" {
			return true
		}
	}
	return false
}
