package report

import (
	"fmt"
	"math"
	"sort"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/go-echarts/go-echarts/v2/types"

	"github.com/gapwise/gapwise/fairness"
)

// walkStep is one row of the decomposition walk: a step from Start to End
// (End = Start + the step's amount), with an optional interval [Low, High]
// around End for totals or around Start + φ for contributions.
type walkStep struct {
	Label      string
	Kind       string // "reference", "mechanism", "unestimable", "residual", "comparison"
	Node       string // mechanism steps only
	Start, End float64
	Low, High  *float64
}

// walkSteps lays out the walk from the reference group's value to the
// comparison group's: reference, each contribution by decreasing size
// (reading order only: Shapley values do not depend on an order), the
// residual, comparison. Because Gap = Σφ + residual, the last step ends at
// the comparison value.
func walkSteps(res *fairness.Result, m fairness.MetricResult) []walkStep {
	steps := []walkStep{{Label: res.Groups.Reference + " (reference)", Kind: "reference", Start: m.Reference, End: m.Reference}}
	if m.ReferenceCI != nil {
		steps[0].Low, steps[0].High = &m.ReferenceCI.Low, &m.ReferenceCI.High
	}
	order := make([]int, len(m.Contributions))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool {
		return math.Abs(m.Contributions[order[a]].Value) > math.Abs(m.Contributions[order[b]].Value)
	})
	at := m.Reference
	for _, i := range order {
		c := m.Contributions[i]
		s := walkStep{Label: c.Mechanism, Kind: "mechanism", Node: c.Node, Start: at, End: at + c.Value}
		if c.NotEstimable {
			s.Kind, s.Label = "unestimable", c.Mechanism+" (not estimable)"
		} else if c.CILow != nil && c.CIHigh != nil {
			lo, hi := at+*c.CILow, at+*c.CIHigh
			s.Low, s.High = &lo, &hi
		}
		steps = append(steps, s)
		at += c.Value
	}
	steps = append(steps, walkStep{Label: "residual", Kind: "residual", Start: at, End: at + m.Residual})
	last := walkStep{Label: res.Groups.Comparison + " (comparison)", Kind: "comparison", Start: m.Comparison, End: m.Comparison}
	if m.ComparisonCI != nil {
		last.Low, last.High = &m.ComparisonCI.Low, &m.ComparisonCI.High
	}
	return append(steps, last)
}

// walkChart builds the decomposition walk of one metric: a horizontal chart
// whose rows are the steps of walkSteps, mechanism and residual steps drawn
// as floating bars (vermillion when the step moves the metric up, blue when
// down, grey for the residual), the two groups' values as diamonds, and
// intervals as whiskers. The bars and whiskers are ECharts custom series
// whose drawing functions live in the page script (ids gw-walk-bars and
// gw-whiskers); item names carry the bar labels.
func walkChart(res *fairness.Result, m fairness.MetricResult) chartOption {
	steps := walkSteps(res, m)
	k := scaleOf(m.Metric)
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, s := range steps {
		for _, v := range []float64{s.Start, s.End} {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		if s.Low != nil {
			lo, hi = math.Min(lo, *s.Low), math.Max(hi, *s.High)
		}
	}
	amin, amax, step := niceAxis(k*lo, k*hi)

	var labels []string
	var bars, whiskers []opts.CustomData
	var totals []opts.ScatterData
	for row, s := range steps {
		labels = append(labels, s.Label)
		switch s.Kind {
		case "reference", "comparison":
			symbol := "diamond"
			if s.Kind == "comparison" {
				symbol = "triangle"
			}
			totals = append(totals, opts.ScatterData{Name: formatValue(m.Metric, s.End), Value: []float64{round6(k * s.End), float64(row)}, Symbol: symbol, SymbolSize: 16})
		default:
			amount := s.End - s.Start
			colour := colourUp
			if amount < 0 {
				colour = colourDown
			}
			if s.Kind == "residual" || s.Kind == "unestimable" {
				colour = colourResidual
			}
			tip := []string{s.Label, "contribution " + formatDelta(m.Metric, amount)}
			if s.Kind == "unestimable" {
				tip = []string{s.Label, "the data cannot estimate this contribution (see the warnings); the bar only keeps the walk adding up"}
			}
			if s.Low != nil {
				tip = append(tip, intervalName(res)+" "+formatDeltaInterval(m.Metric, ptrFloat(*s.Low-s.Start), ptrFloat(*s.High-s.Start)))
			}
			if s.Kind == "residual" {
				tip = append(tip, "observed gap minus the sum of contributions")
			}
			anchor := math.Max(s.Start, s.End)
			if s.High != nil {
				anchor = math.Max(anchor, *s.High)
			}
			bars = append(bars, opts.CustomData{Name: formatDelta(m.Metric, amount), Value: []float64{round6(k * s.Start), round6(k * s.End), float64(row), round6(k * anchor)},
				ItemStyle: &opts.ItemStyle{Color: colour}, Tooltip: itemTooltip(tip...)})
		}
		if s.Low != nil {
			whiskers = append(whiskers, opts.CustomData{Value: []float64{round6(k * *s.Low), round6(k * *s.High), float64(row)}})
		}
	}

	c := charts.NewCustom()
	c.SetGlobalOptions(
		charts.WithTooltipOpts(plainTooltip()),
		charts.WithLegendOpts(opts.Legend{Show: opts.Bool(false)}),
		charts.WithGridOpts(opts.Grid{Left: fmt.Sprint(labelWidth(labels)), Right: "64", Top: "8", Bottom: "28"}),
		charts.WithXAxisOpts(opts.XAxis{Type: "value", Min: amin, Max: amax, Scale: opts.Bool(true),
			AxisLabel: &opts.AxisLabel{Formatter: types.FuncStr("{value}" + axisUnit(m.Metric))},
			SplitLine: &opts.SplitLine{Show: opts.Bool(true), LineStyle: &opts.LineStyle{Color: colourRule, Type: "dashed"}}}),
		charts.WithYAxisOpts(opts.YAxis{Type: "category", Data: labels, Inverse: opts.Bool(true),
			AxisLabel: &opts.AxisLabel{Color: colourInk}}),
	)
	c.AddSeries("steps", bars, charts.WithSeriesOpts(func(s *charts.SingleSeries) {
		s.Id = "gw-walk-bars"
		s.Encode = &opts.Encode{X: []int{0, 1}, Y: 2}
	}))
	if len(whiskers) > 0 {
		c.AddSeries("intervals", whiskers, charts.WithSeriesOpts(func(s *charts.SingleSeries) {
			s.Id = "gw-whiskers"
			s.Encode = &opts.Encode{X: []int{0, 1}, Y: 2}
		}))
	}
	o := optionOf(c)
	// Ticks on multiples of the range's step, so that the two ends are
	// labelled like the rest (ECharts would otherwise pick its own step).
	if xs, ok := o["xAxis"].([]any); ok && len(xs) > 0 {
		if x, ok := xs[0].(map[string]any); ok {
			x["interval"] = round6(step)
		}
	}
	// Long row labels are cut with an ellipsis rather than pushed out of
	// the chart; the table beside the chart has them in full.
	if ys, ok := o["yAxis"].([]any); ok && len(ys) > 0 {
		if al, ok := ys[0].(map[string]any)["axisLabel"].(map[string]any); ok {
			al["width"] = labelWidth(labels) - 12
			al["overflow"] = "truncate"
		}
	}
	// The totals are a scatter series on the same axes; go-echarts' custom
	// chart takes only custom series, so it is added to the option here.
	all, _ := o["series"].([]any)
	for _, s := range all {
		if sm, ok := s.(map[string]any); ok && sm["id"] == "gw-whiskers" {
			sm["silent"] = true
		}
	}
	var totalItems []map[string]any
	for _, t := range totals {
		colour := colourReference
		if t.Symbol == "triangle" {
			colour = colourComparison
		}
		totalItems = append(totalItems, map[string]any{
			"value": t.Value, "symbol": t.Symbol, "symbolSize": t.SymbolSize,
			"itemStyle": map[string]any{"color": colour, "borderColor": colourInk, "borderWidth": 1},
			"label":     map[string]any{"show": true, "position": "top", "formatter": t.Name, "color": colourInk, "fontWeight": "bold"},
			"tooltip":   map[string]any{"formatter": t.Name},
		})
	}
	all = append(all, map[string]any{"type": "scatter", "name": "group values", "z": 6, "data": totalItems})
	o["series"] = all
	return o
}

// labelWidth is the pixel width kept left of the walk for its row labels:
// about 7 px per character of the longest label at 12 px type, within
// [60, 240].
func labelWidth(labels []string) int {
	n := 0
	for _, l := range labels {
		n = max(n, len([]rune(l)))
	}
	return min(240, max(60, 7*n+16))
}

func ptrFloat(v float64) *float64 { return &v }
