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
}

// assess returns the Reliability of the mechanism of node under ws.
func assess(node string, ws []Warning) Reliability {
	rel := Reliability{Verdict: VerdictSound, Kinds: []WarningKind{}}
	for _, w := range ws {
		if !slices.Contains(w.Nodes, node) {
			continue
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
// r.Warnings.
func setReliability(r *Result) {
	for i := range r.Mechanisms {
		r.Mechanisms[i].Reliability = assess(r.Mechanisms[i].Node, r.Warnings)
	}
}
