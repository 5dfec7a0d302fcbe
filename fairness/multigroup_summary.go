package fairness

import "fmt"

// GroupsSummary is the overview of an audit of several comparison values
// (RunGroups): which values were audited and skipped, and the summary
// matrix, one cell per comparison and metric. Its JSON encoding (the
// command line's summary.json) is part of the tool's contract; field names
// are stable.
type GroupsSummary struct {
	Tool  ToolInfo `json:"tool"`
	Title string   `json:"title,omitempty"`
	// Column is the group column and Reference the value every
	// comparison is decomposed against.
	Column    string `json:"column"`
	Reference string `json:"reference"`
	// Selection says how the comparisons were chosen: "list" (values
	// listed under groups.comparison) or "every-other" (EveryOther).
	Selection   string              `json:"selection"`
	Metrics     []string            `json:"metrics"`
	Comparisons []ComparisonSummary `json:"comparisons"`
	// Skipped lists the comparison values not audited, with the reason;
	// empty, never null, when every value was audited.
	Skipped []SkippedGroup `json:"skipped"`
	// Matrix holds one cell per audited comparison and metric, the
	// comparisons in the order of Comparisons and the metrics in the
	// spec's order within each.
	Matrix []MatrixCell `json:"matrix"`
	// Policy, present when a policy judged the results (ApplyPolicy on
	// each), says whether every comparison passed.
	Policy      *GroupsPolicy `json:"policy,omitempty"`
	Assumptions []string      `json:"assumptions"`
	Synthetic   bool          `json:"synthetic,omitempty"`
	Inputs      InputInfo     `json:"inputs"`
}

// ComparisonSummary is one audited comparison value.
type ComparisonSummary struct {
	Value string `json:"value"`
	// NComparison counts the group's audited records; nil (null) when
	// small-cell suppression withholds it.
	NComparison *int `json:"n_comparison"`
	// Warnings counts the warnings of the comparison's Result.
	Warnings int `json:"warnings"`
	// PolicyPassed is the policy's verdict on this comparison; absent
	// without a policy.
	PolicyPassed *bool `json:"policy_passed,omitempty"`
	// ResultFile and ReportFile name the comparison's files in the
	// command line's output folder (--out); absent otherwise.
	ResultFile string `json:"result_file,omitempty"`
	ReportFile string `json:"report_file,omitempty"`
}

// MatrixCell summarises one metric of one comparison: the gap (comparison
// − reference) with its interval, the mechanism that leads it
// (Headline.Lead) with its contribution and interval, and the headline's
// reliability verdict.
type MatrixCell struct {
	Comparison string    `json:"comparison"`
	Metric     string    `json:"metric"`
	Reference  float64   `json:"reference"`
	Value      float64   `json:"comparison_value"`
	Gap        float64   `json:"gap"`
	GapCI      *Interval `json:"gap_ci,omitempty"`
	// Lead is the node of the largest estimable contribution, "" when none
	// is; LeadContribution its Shapley value, LeadCI its interval and
	// LeadShare its share of the gap (Headline.LeadShare).
	Lead             string    `json:"lead_node"`
	LeadContribution *float64  `json:"lead_contribution,omitempty"`
	LeadCI           *Interval `json:"lead_ci,omitempty"`
	LeadShare        *float64  `json:"lead_share,omitempty"`
	// Verdict is the metric's Headline.Verdict: sound, note, caution or
	// unreliable.
	Verdict Severity `json:"verdict"`
}

// GroupsPolicy is the policy's verdict over every comparison.
type GroupsPolicy struct {
	Passed bool `json:"passed"`
	// Breaches counts the breaching checks over all comparisons.
	Breaches int `json:"breaches"`
}

// Summarise builds the summary of the results of several comparisons
// against one reference (RunGroups) and the values skipped. It reads the
// results only: call it again (SummarisePolicy) after ApplyPolicy.
func Summarise(spec *Spec, results []*Result, skipped []SkippedGroup) *GroupsSummary {
	s := &GroupsSummary{
		Column:      spec.Groups.Column,
		Reference:   spec.Groups.Reference,
		Selection:   "list",
		Metrics:     append([]string{}, spec.Metrics...),
		Comparisons: []ComparisonSummary{},
		Skipped:     append([]SkippedGroup{}, skipped...),
		Matrix:      []MatrixCell{},
		Assumptions: []string{},
		Synthetic:   spec.Synthetic,
	}
	if spec.Groups.EveryOther {
		s.Selection = EveryOther
	}
	if len(results) > 0 {
		r0 := results[0]
		s.Tool, s.Title, s.Inputs = r0.Tool, r0.Title, r0.Inputs
		s.Assumptions = append(s.Assumptions, r0.Assumptions...)
	}
	for _, r := range results {
		s.Comparisons = append(s.Comparisons, comparisonSummary(r))
		for _, m := range r.Metrics {
			s.Matrix = append(s.Matrix, matrixCell(r.Groups.Comparison, m))
		}
	}
	s.Policy = groupsPolicy(results)
	return s
}

// comparisonSummary summarises one comparison's Result.
func comparisonSummary(r *Result) ComparisonSummary {
	c := ComparisonSummary{Value: r.Groups.Comparison, Warnings: len(r.Warnings)}
	n := r.Groups.NComparison
	if _, withheld := r.Suppression.Withheld("groups.n_comparison"); !withheld {
		c.NComparison = &n
	}
	if r.Policy != nil {
		p := r.Policy.Passed
		c.PolicyPassed = &p
	}
	return c
}

// matrixCell summarises metric m of comparison value cmp.
func matrixCell(cmp string, m MetricResult) MatrixCell {
	c := MatrixCell{Comparison: cmp, Metric: m.Metric, Reference: m.Reference, Value: m.Comparison,
		Gap: m.Gap, GapCI: m.GapCI, Lead: m.Headline.Lead, LeadShare: m.Headline.LeadShare, Verdict: m.Headline.Verdict}
	for _, k := range m.Contributions {
		if k.Node != c.Lead || c.Lead == "" {
			continue
		}
		v := k.Value
		c.LeadContribution = &v
		if k.CILow != nil && k.CIHigh != nil {
			c.LeadCI = &Interval{Low: *k.CILow, High: *k.CIHigh}
		}
	}
	return c
}

// groupsPolicy is the verdict over every comparison judged by a policy;
// nil when none was.
func groupsPolicy(results []*Result) *GroupsPolicy {
	var p *GroupsPolicy
	for _, r := range results {
		if r.Policy == nil {
			continue
		}
		if p == nil {
			p = &GroupsPolicy{Passed: true}
		}
		p.Passed = p.Passed && r.Policy.Passed
		p.Breaches += r.Policy.Breaches
	}
	return p
}

// shownCount is &n, or nil when small-cell suppression below t withholds
// n (0 < n < t).
func shownCount(n, t int) *int {
	if t > 0 && n > 0 && n < t {
		return nil
	}
	return &n
}

// rowsWords reads a row count for a reason, "fewer than T rows" when
// suppression below t withholds it.
func rowsWords(n, t int) string {
	if shownCount(n, t) == nil {
		return fmt.Sprintf("fewer than %d rows", t)
	}
	return rowsText(n)
}
