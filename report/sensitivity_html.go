package report

import (
	"html/template"

	"github.com/gapwise/gapwise/fairness"
)

// hiddenView is the HTML report's sensitivity section: the factors'
// headings and one panel per metric, shown with the selected metric like
// the decomposition's panels.
type hiddenView struct {
	Intro   string
	Heads   []string
	Metrics []hiddenMetricView
}

type hiddenMetricView struct {
	Name, Title string
	Selected    bool
	Skipped     string
	Rows        []hiddenRowView
	Lead        template.HTML
}

type hiddenRowView struct {
	Mechanism string // "" for the estimated gap
	Value     string
	Ranges    []string
	Reversal  string
	Fragile   bool // the sign could reverse at Λ ≤ fairness.FragileFactor
	Words     template.HTML
}

// hiddenPage builds the section's view; nil when the result has none.
// selected is the metric shown first.
func hiddenPage(res *fairness.Result, selected string) *hiddenView {
	ms := hiddenMetrics(res)
	if ms == nil {
		return nil
	}
	v := &hiddenView{Intro: hiddenIntro, Heads: factorHeads(res)}
	for _, m := range ms {
		mv := hiddenMetricView{Name: m.Metric, Title: MetricTitle(m.Metric), Selected: m.Metric == selected, Skipped: m.Skipped, Lead: codeSpans(m.Lead)}
		for _, r := range m.Rows {
			rv := hiddenRowView{Mechanism: r.Name, Value: formatDelta(m.Metric, r.Value), Reversal: reversalCell(r.Reversal, res.HiddenFactor.MaxFactor),
				Fragile: r.Reversal != nil && *r.Reversal <= fairness.FragileFactor, Words: codeSpans(r.Words)}
			for _, b := range r.Ranges {
				rv.Ranges = append(rv.Ranges, formatDeltaRange(m.Metric, b))
			}
			mv.Rows = append(mv.Rows, rv)
		}
		v.Metrics = append(v.Metrics, mv)
	}
	return v
}
