package fairness

import "slices"

// Reliability is the verdict on one mechanism's contributions, drawn from
// the warnings that concern it (those whose Nodes include its node).
type Reliability struct {
	// Verdict is the most serious Severity among those warnings, or
	// VerdictSound when there are none.
	Verdict Severity `json:"verdict"`
	// Kinds lists the distinct kinds of those warnings, in the order of
	// Result.Warnings; empty (never nil) when the verdict is sound.
	Kinds []WarningKind `json:"warning_kinds"`
	// Estimable is false when the data cannot estimate the mechanism's
	// contribution (a not_estimable warning); NotEstimable then says why.
	Estimable    bool   `json:"estimable"`
	NotEstimable string `json:"not_estimable_reason,omitempty"`
}

// assess returns the Reliability of the mechanism of node under ws.
func assess(node string, ws []Warning) Reliability {
	rel := Reliability{Verdict: VerdictSound, Kinds: []WarningKind{}, Estimable: true}
	for _, w := range ws {
		if !slices.Contains(w.Nodes, node) {
			continue
		}
		if w.Kind == KindNotEstimable {
			rel.Estimable, rel.NotEstimable = false, w.Message
		}
		if !rel.Verdict.AtLeast(w.Severity) {
			rel.Verdict = w.Severity
		}
		if !slices.Contains(rel.Kinds, w.Kind) {
			rel.Kinds = append(rel.Kinds, w.Kind)
		}
	}
	return rel
}

// setReliability sets the Reliability of every mechanism of r from
// r.Warnings, and marks the contributions of mechanisms that are not
// estimable (Contribution.NotEstimable).
func setReliability(r *Result) {
	notEstimable := map[string]bool{}
	for i := range r.Mechanisms {
		m := &r.Mechanisms[i]
		m.Reliability = assess(m.Node, r.Warnings)
		notEstimable[m.Node] = !m.Reliability.Estimable
	}
	for i := range r.Metrics {
		for j := range r.Metrics[i].Contributions {
			c := &r.Metrics[i].Contributions[j]
			c.NotEstimable = notEstimable[c.Node]
		}
	}
}
