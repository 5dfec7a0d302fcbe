package report

import (
	"bytes"
	_ "embed"
	"fmt"
	"html/template"
	"io"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/compare"
	"github.com/gapwise/gapwise/fairness/policy"
)

//go:embed templates/compare.html.tmpl
var compareTemplateText string

//go:embed assets/compare.js
var compareJS string

var compareTemplate = template.Must(template.New("compare").Funcs(template.FuncMap{
	"inc": func(i int) int { return i + 1 },
}).Parse(compareTemplateText))

// comparePage is the view of a review or a history the template renders.
type comparePage struct {
	Kind, Title              string
	History                  bool
	Runs, RunLabels          []string
	LastRun                  string
	Column, RefName, CmpName string
	Synthetic                bool
	IntervalSentence         string
	Notes, Omitted           []string
	Review                   []reviewMetric
	HistoryMetrics           []historyMetric
	Gate                     *gateView
	Assumptions              []string
	Scripts                  []template.JS
	CSS                      template.CSS
	Policy                   template.HTMLAttr
}

// historyChart is one metric's chart data for assets/compare.js.
type historyChart struct {
	Metric string          `json:"metric"`
	Unit   string          `json:"unit"`
	Runs   []string        `json:"runs"`
	Series []historySeries `json:"series"`
}

type historySeries struct {
	Name   string     `json:"name"`
	Values []*float64 `json:"values"`
	Low    []*float64 `json:"low,omitempty"`
	High   []*float64 `json:"high,omitempty"`
}

// WriteReviewHTML writes the release review rv as one standalone page in
// the report's style (its stylesheet, palette and Content-Security-
// Policy): the runs, how the change intervals were made, a table per
// metric of the values before and after with the change and its
// interval, the policy gate and the cautions. It returns an error if w
// fails.
func WriteReviewHTML(w io.Writer, rv *compare.Review) error {
	p := comparePage{Kind: "release review", Title: "Release review: " + rv.Before.Label + " → " + rv.After.Label,
		Runs: []string{runLine(rv.Before), runLine(rv.After)}, LastRun: rv.After.Label,
		Synthetic: anySynthetic(rv.Before, rv.After), IntervalSentence: changeIntervalSentence(rv),
		Notes: rv.Notes, Omitted: omittedLines(rv.Omitted), Assumptions: rv.Assumptions}
	g := rv.Comparisons[0].Groups
	p.setGroups(rv.Names, g)
	for _, m := range rv.Comparisons[0].Metrics {
		p.Review = append(p.Review, reviewRows(rv, g, m))
	}
	p.Gate = compareGate(rv.Policy, rv.Names)
	return p.write(w, "")
}

// WriteHistoryHTML writes the history h as one standalone page: per
// metric a chart of the gap and the leading contributions over the runs
// (points with their intervals where the runs have them) beside a table,
// the policy gate on the last run and the cautions.
func WriteHistoryHTML(w io.Writer, h *compare.History) error {
	p := comparePage{Kind: "history", Title: fmt.Sprintf("History over %d runs", len(h.Runs)), History: true,
		LastRun: h.Runs[len(h.Runs)-1].Label, Synthetic: anySynthetic(h.Runs...), Notes: h.Notes,
		Omitted: omittedLines(h.Omitted), Assumptions: h.Assumptions}
	for _, r := range h.Runs {
		p.Runs = append(p.Runs, runLine(r))
		p.RunLabels = append(p.RunLabels, r.Label)
	}
	g := h.Comparisons[0].Groups
	p.setGroups(h.Names, g)
	var charts []historyChart
	for _, m := range h.Comparisons[0].Metrics {
		v := historyRows(h, g, m)
		p.HistoryMetrics = append(p.HistoryMetrics, v)
		ch := historyChart{Metric: m.Metric, Unit: axisUnit(m.Metric), Runs: p.RunLabels}
		ch.Series = append(ch.Series, chartSeries(m.Metric, v.Rows[0].Name, m.Gap))
		for i, s := range m.Leading {
			ch.Series = append(ch.Series, chartSeries(m.Metric, v.Rows[i+1].Name, s.Points))
		}
		charts = append(charts, ch)
	}
	js, err := encodeOptions(map[string]any{"charts": charts})
	if err != nil {
		return err
	}
	p.Gate = compareGate(h.Policy, h.Names)
	return p.write(w, js)
}

// chartSeries scales the points to the metric's display unit; a point
// not estimable has no value.
func chartSeries(metric, name string, pts []compare.Point) historySeries {
	s := historySeries{Name: formatterText(name)}
	k := scaleOf(metric)
	withCI := false
	for _, p := range pts {
		withCI = withCI || p.CI != nil
	}
	for _, p := range pts {
		var v, lo, hi *float64
		if !p.NotEstimable {
			x := k * p.Value
			v = &x
			if p.CI != nil {
				l, h := k*p.CI.Low, k*p.CI.High
				lo, hi = &l, &h
			}
		}
		s.Values = append(s.Values, v)
		if withCI {
			s.Low, s.High = append(s.Low, lo), append(s.High, hi)
		}
	}
	return s
}

func (p *comparePage) setGroups(names *fairness.Names, g compare.Groups) {
	p.Column = names.ColumnName(g.Column)
	p.RefName, p.CmpName = names.GroupName(g.Reference, false), names.GroupName(g.Comparison, true)
}

// compareGate is the policy section of a comparison page; nil without a
// policy.
func compareGate(o *policy.Outcome, names *fairness.Names) *gateView {
	if o == nil {
		return nil
	}
	return &gateView{Passed: o.Passed, Headline: policyHeadline(o), File: o.File, Title: o.Title,
		Rows: policyRows(o, names), Notes: policyNotes(o), Caution: policyCaution}
}

// write inlines the scripts (ECharts and the chart data only when js is
// not empty) and the report's stylesheet under the page's
// Content-Security-Policy and renders the page.
func (p *comparePage) write(w io.Writer, js string) error {
	var scripts []string
	if js != "" {
		scripts = []string{echartsJS, "window.gapwiseCompare = " + js + ";", compareJS}
	}
	for _, s := range scripts {
		inlineText(s, "script")
		p.Scripts = append(p.Scripts, template.JS(s))
	}
	css := reportCSS + compareCSS
	inlineText(css, "style")
	p.CSS = template.CSS(css)
	p.Policy = template.HTMLAttr(`content="` + pagePolicy(scripts, []string{css}) + `"`)
	var buf bytes.Buffer
	if err := compareTemplate.Execute(&buf, p); err != nil {
		return fmt.Errorf("report: rendering HTML: %w", err)
	}
	_, err := w.Write(buf.Bytes())
	return err
}

// compareCSS adds the comparison page's own rules to the report's.
const compareCSS = `
.gw-clear td { background: #FFF3E6; }
tr[data-kind="contribution"] td:first-child { padding-left: 1.4em; }
`
