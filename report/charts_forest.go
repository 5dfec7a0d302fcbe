package report

import (
	"fmt"
	"math"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/metrics"
)

// forestRow is one row of a metric's contribution chart: a mechanism's
// Shapley value with its interval, the residual, or the observed gap.
type forestRow struct {
	Label     string
	Kind      string // "mechanism", "unestimable", "residual" or "gap"
	Role      string // "widens", "narrows" or "neutral": the part the value plays in the gap
	Value     float64
	Low, High *float64
	Reason    string // why the contribution is unreliable, or ""
}

// forestRows lays out a metric's chart from top to bottom: its
// mechanisms in graph order (the order of the Result, which the reader
// also finds in the causal graph), then the residual and the observed gap
// with its interval. A value widens the gap when it has the gap's sign and
// narrows it otherwise (gapRole).
func forestRows(res *fairness.Result, m fairness.MetricResult) []forestRow {
	flags := unreliable(res)
	role := func(v float64) string { return gapRole(m, v) }
	var rows []forestRow
	for _, c := range m.Contributions {
		r := forestRow{Label: contribMech(res, c), Kind: "mechanism", Role: role(c.Value), Value: c.Value, Low: c.CILow, High: c.CIHigh, Reason: flags[c.Node]}
		if c.NotEstimable {
			r = forestRow{Label: contribMech(res, c), Kind: "unestimable", Role: "neutral"}
		}
		rows = append(rows, r)
	}
	rows = append(rows, forestRow{Label: "residual (not assigned)", Kind: "residual", Role: "neutral", Value: m.Residual})
	gap := forestRow{Label: "observed gap", Kind: "gap", Role: "neutral", Value: m.Gap}
	if m.GapCI != nil {
		gap.Low, gap.High = &m.GapCI.Low, &m.GapCI.High
	}
	return append(rows, gap)
}

// gapRole is the part a contribution v plays in m's gap: "widens" when it
// has the gap's sign, "narrows" otherwise, "neutral" when the gap or v
// prints as zero.
func gapRole(m fairness.MetricResult, v float64) string {
	switch {
	case isZeroText(formatMagnitude(m.Metric, m.Gap)), isZeroText(formatMagnitude(m.Metric, v)):
		return "neutral"
	case (v > 0) == (m.Gap > 0):
		return "widens"
	}
	return "narrows"
}

// roleWords say what each gapRole means.
var roleWords = map[string]string{"widens": "widens the gap", "narrows": "narrows the gap", "neutral": "0 at the precision shown"}

// The colours of the contribution chart, from the Okabe & Ito (2008)
// set: orange for a mechanism that widens the gap, sky blue for one that
// narrows it, grey for the residual and values that print as zero; the
// observed gap is drawn in ink. Widening is also a square and narrowing a
// circle, so that the two stay apart in grey print.
var forestColours = map[string]string{"widens": colourWidens, "narrows": colourNarrows, "neutral": colourResidual}

// forestAxis returns the x range of a metric's chart in its chart unit
// (scaleOf): the values and intervals of rows and 0, widened to a 1-2-5
// step (niceAxis) and kept within ±(Max − Min) of the metric's range
// (metrics.Fact), so that the axis shows no difference the metric cannot
// have, e.g. beyond ±100 points for a rate.
func forestAxis(metric string, rows []forestRow) (lo, hi, step float64) {
	k := scaleOf(metric)
	lo, hi = 0, 0
	for _, r := range rows {
		if r.Kind == "unestimable" {
			continue
		}
		lo, hi = math.Min(lo, k*r.Value), math.Max(hi, k*r.Value)
		if r.Low != nil && r.High != nil {
			lo, hi = math.Min(lo, k**r.Low), math.Max(hi, k**r.High)
		}
	}
	lo, hi, step = niceAxis(lo, hi)
	if f, ok := metrics.FactOf(metric); ok && !math.IsInf(f.Max-f.Min, 0) {
		span := k * (f.Max - f.Min)
		lo, hi = math.Max(lo, -span), math.Min(hi, span)
	}
	return lo, hi, step
}

// forestChart builds a metric's contribution chart: one row per
// forestRows entry, a vertical line at zero, each mechanism a marker at
// its contribution with its interval as a line with end caps, coloured by
// the part it plays in the gap (forestColours), hollow with a dashed
// interval in that colour and the word "unreliable" when a warning
// concerns it, and
// "not estimable" in place of a marker when the data cannot estimate it;
// below them the residual and the observed gap as a diamond spanning its
// interval. Labels carry the value in the metric's delta unit (points for
// rates), as the axis does. The rows are drawn by one ECharts custom
// series whose drawing function lives in the page script (id
// gw-forest); the table beside the chart has the same numbers.
func forestChart(res *fairness.Result, m fairness.MetricResult) chartOption {
	rows := forestRows(res, m)
	k := scaleOf(m.Metric)
	amin, amax, step := forestAxis(m.Metric, rows)
	var labels []string
	var items []opts.CustomData
	for i, r := range rows {
		labels = append(labels, r.Label)
		lo, hi := r.Value, r.Value
		if r.Low != nil && r.High != nil {
			lo, hi = *r.Low, *r.High
		}
		items = append(items, opts.CustomData{Name: forestLabel(m.Metric, r),
			Value:     []float64{round6(k * r.Value), round6(k * lo), round6(k * hi), float64(i)},
			ItemStyle: &opts.ItemStyle{Color: forestColours[r.Role]}, Tooltip: itemTooltip(forestTip(res, m.Metric, r)...)})
	}
	c := charts.NewCustom()
	c.SetGlobalOptions(
		charts.WithTooltipOpts(plainTooltip()),
		charts.WithLegendOpts(opts.Legend{Show: opts.Bool(false)}),
		charts.WithGridOpts(opts.Grid{Left: fmt.Sprint(labelWidth(labels)), Right: "24", Top: "12", Bottom: "48"}),
		charts.WithXAxisOpts(opts.XAxis{Type: "value", Min: amin, Max: amax, Name: deltaAxisName(m.Metric), NameLocation: "middle", NameGap: 28,
			SplitLine: &opts.SplitLine{Show: opts.Bool(true), LineStyle: &opts.LineStyle{Color: colourRule, Type: "dashed"}}}),
		charts.WithYAxisOpts(opts.YAxis{Type: "category", Data: labels, Inverse: opts.Bool(true),
			AxisLabel: &opts.AxisLabel{Color: colourInk}}),
	)
	c.AddSeries("contributions", items, charts.WithSeriesOpts(func(s *charts.SingleSeries) {
		s.Id = "gw-forest"
		s.Encode = &opts.Encode{X: []int{0, 1, 2}, Y: 3}
	}))
	o := optionOf(c)
	finishForest(o, rows, labels, step)
	return o
}

// finishForest adds to a contribution chart's option what go-echarts does
// not set: ticks on multiples of step (so both ends are labelled), row
// labels cut with an ellipsis, each item's kind, role and reliability for
// the drawing function, and the zero line.
func finishForest(o chartOption, rows []forestRow, labels []string, step float64) {
	if xs, ok := o["xAxis"].([]any); ok && len(xs) > 0 {
		if x, ok := xs[0].(map[string]any); ok {
			x["interval"] = round6(step)
			x["axisLine"] = map[string]any{"show": false}
		}
	}
	if ys, ok := o["yAxis"].([]any); ok && len(ys) > 0 {
		y := ys[0].(map[string]any)
		if al, ok := y["axisLabel"].(map[string]any); ok {
			al["width"] = labelWidth(labels) - 12
			al["overflow"] = "truncate"
		}
		y["axisTick"] = map[string]any{"show": false}
	}
	series, _ := o["series"].([]any)
	for _, s := range series {
		sm, ok := s.(map[string]any)
		if !ok || sm["id"] != "gw-forest" {
			continue
		}
		items, _ := sm["data"].([]any)
		for i, it := range items {
			item := it.(map[string]any)
			item["gwKind"], item["gwRole"] = rows[i].Kind, rows[i].Role
			item["gwHollow"] = rows[i].Reason != ""
			item["gwInterval"] = rows[i].Low != nil && rows[i].High != nil
		}
		sm["markLine"] = map[string]any{"silent": true, "symbol": []string{"none", "none"}, "label": map[string]any{"show": false},
			"lineStyle": map[string]any{"color": colourInk, "width": 1.2, "type": "solid"}, "data": []any{map[string]any{"xAxis": 0}}}
	}
}

// forestLabel is the text beside a row's marker: its value in the
// metric's delta unit, "unreliable" when a warning concerns it, or "not
// estimable".
func forestLabel(metric string, r forestRow) string {
	switch {
	case r.Kind == "unestimable":
		return notEstimable
	case r.Reason != "":
		return formatDelta(metric, r.Value) + " · unreliable"
	}
	return formatDelta(metric, r.Value)
}

// forestTip is the tooltip of a row: what it is, its value with its
// interval, and the part it plays in the gap.
func forestTip(res *fairness.Result, metric string, r forestRow) []string {
	tip := []string{r.Label}
	switch r.Kind {
	case "unestimable":
		return append(tip, "the data cannot estimate this contribution (see the warnings)")
	case "residual":
		return append(tip, formatDelta(metric, r.Value), "the observed gap minus the sum of contributions")
	}
	v := formatDelta(metric, r.Value)
	if r.Low != nil && r.High != nil {
		name := estimateIntervalName(res)
		if r.Kind == "gap" {
			name = intervalName(res)
		}
		v += ", " + name + " " + formatDeltaInterval(metric, r.Low, r.High)
	}
	tip = append(tip, v)
	switch r.Role {
	case "widens":
		tip = append(tip, "widens the gap")
	case "narrows":
		tip = append(tip, "narrows the gap")
	}
	if r.Reason != "" {
		tip = append(tip, "unreliable: "+r.Reason)
	}
	return tip
}

// deltaAxisName names the x axis of a contribution chart in the unit of
// its labels: percentage points for rates, the metric's own unit
// otherwise.
func deltaAxisName(metric string) string {
	if isProportion(metric) {
		return "percentage points (pts), comparison − reference"
	}
	return "difference in " + MetricTitle(metric) + ", comparison − reference"
}

// labelWidth is the pixel width kept left of the chart for its row
// labels: about 7 px per character of the longest label at 12 px type,
// within [60, 240]; the page script narrows it on small screens.
func labelWidth(labels []string) int {
	n := 0
	for _, l := range labels {
		n = max(n, len([]rune(l)))
	}
	return min(240, max(60, 7*n+16))
}
