package fairness

import (
	"math"
	"slices"
)

// Headline is what a reader looks for first about one metric: the
// mechanism with the largest estimable contribution, the share of the gap
// it accounts for, and a verdict on how far the two can be relied on.
type Headline struct {
	// Lead is the node of the estimable contribution of largest |φ| (the
	// first in graph order on ties); "" when none is estimable.
	Lead string `json:"lead_node"`
	// LeadShare is φ_lead / Gap, the share of the observed gap the lead
	// mechanism accounts for: above 1 when other mechanisms offset part
	// of it, below 0 when it narrows the gap. Absent when there is no
	// lead or the gap is 0.
	LeadShare *float64 `json:"lead_share,omitempty"`
	// Verdict is the most serious Severity among the Warnings below,
	// VerdictSound when there are none.
	Verdict Severity `json:"verdict"`
	// Warnings holds the indices in Result.Warnings, in order, of the
	// warnings that concern the headline: those about the metric
	// (Warning.Metric), those about the lead's mechanism (Warning.Nodes
	// holds Lead; any mechanism of the metric when there is no lead) and
	// those about the audit as a whole (no metric and no nodes). Empty,
	// never nil, when none does.
	Warnings []int `json:"warnings"`
}

// headline returns the Headline of m under the warnings ws; m's
// contributions must already carry NotEstimable (setReliability).
func headline(m MetricResult, ws []Warning) Headline {
	h := Headline{Verdict: VerdictSound, Warnings: []int{}}
	best := -1
	for i, c := range m.Contributions {
		if !c.NotEstimable && (best < 0 || math.Abs(c.Value) > math.Abs(m.Contributions[best].Value)) {
			best = i
		}
	}
	var nodes []string
	if best >= 0 {
		h.Lead = m.Contributions[best].Node
		nodes = []string{h.Lead}
		if m.Gap != 0 {
			h.LeadShare = finite(m.Contributions[best].Value / m.Gap)
		}
	} else {
		for _, c := range m.Contributions {
			nodes = append(nodes, c.Node)
		}
	}
	for i, w := range ws {
		if !concernsHeadline(w, m.Metric, nodes) {
			continue
		}
		h.Warnings = append(h.Warnings, i)
		if !h.Verdict.AtLeast(w.Severity) {
			h.Verdict = w.Severity
		}
	}
	return h
}

// concernsHeadline reports whether w is about the metric, one of nodes,
// or the audit as a whole.
func concernsHeadline(w Warning, metric string, nodes []string) bool {
	switch {
	case w.Metric != "":
		return w.Metric == metric
	case len(w.Nodes) == 0:
		return true
	}
	for _, n := range w.Nodes {
		if slices.Contains(nodes, n) {
			return true
		}
	}
	return false
}

// setHeadlines sets the Headline of every metric of r from its
// contributions and r.Warnings; it runs after setReliability.
func setHeadlines(r *Result) {
	for i := range r.Metrics {
		r.Metrics[i].Headline = headline(r.Metrics[i], r.Warnings)
	}
}
