package report

import (
	"math"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/go-echarts/go-echarts/v2/types"

	"github.com/gapwise/gapwise/fairness"
)

// reliabilityChart plots each group's reliability curve (event rate against
// mean score per non-empty score bin, in percent) with the diagonal of
// perfect calibration; a bin that small-cell suppression withholds is left
// out, the curve broken there. The reference group is drawn solid with circles and
// the comparison group dashed with triangles, so the two stay apart in grey
// print too.
func reliabilityChart(res *fairness.Result, d *fairness.Details) chartOption {
	line := charts.NewLine()
	axis := func(name string) (opts.XAxis, opts.YAxis) {
		return opts.XAxis{Type: "value", Name: name, NameLocation: "middle", NameGap: 28, Min: 0, Max: 100,
				AxisLabel: &opts.AxisLabel{Formatter: types.FuncStr("{value}%")}},
			opts.YAxis{Type: "value", Name: "observed event rate", NameLocation: "middle", NameGap: 40, Min: 0, Max: 100,
				AxisLabel: &opts.AxisLabel{Formatter: types.FuncStr("{value}%")},
				SplitLine: &opts.SplitLine{Show: opts.Bool(true), LineStyle: &opts.LineStyle{Color: colourRule, Type: "dashed"}}}
	}
	x, y := axis("mean score in bin")
	line.SetGlobalOptions(
		charts.WithTooltipOpts(plainTooltip()),
		charts.WithLegendOpts(opts.Legend{Show: opts.Bool(true), Top: "0"}),
		charts.WithGridOpts(opts.Grid{Left: "56", Right: "16", Top: "36", Bottom: "44"}),
		charts.WithXAxisOpts(x), charts.WithYAxisOpts(y),
	)
	curve := func(role string, g fairness.GroupDetails) []opts.LineData {
		var out []opts.LineData
		for j, b := range g.Curve {
			if _, ok := withheldText(res, fairness.ReliabilityPath(role, j, "mean_score")); ok {
				// small-cell suppression: the bin is not drawn, and the
				// curve breaks there ("-" is ECharts' empty value)
				out = append(out, opts.LineData{Value: "-"})
				continue
			}
			out = append(out, opts.LineData{Value: []float64{round6(100 * b.MeanScore), round6(100 * b.EventRate)}})
		}
		return out
	}
	line.AddSeries("perfect calibration", []opts.LineData{{Value: []float64{0, 0}}, {Value: []float64{100, 100}}},
		charts.WithLineStyleOpts(opts.LineStyle{Color: colourMuted, Type: "dotted", Width: 1}),
		charts.WithSeriesOpts(func(s *charts.SingleSeries) { s.Symbol = "none"; s.Color = colourMuted }))
	line.AddSeries(refName(res)+" (reference)", curve("reference", d.Reference),
		charts.WithLineStyleOpts(opts.LineStyle{Color: colourReference, Width: 2}),
		charts.WithSeriesOpts(func(s *charts.SingleSeries) { s.Symbol = "circle"; s.SymbolSize = 8; s.Color = colourReference }))
	line.AddSeries(cmpName(res)+" (comparison)", curve("comparison", d.Comparison),
		charts.WithLineStyleOpts(opts.LineStyle{Color: colourComparison, Width: 2, Type: "dashed"}),
		charts.WithSeriesOpts(func(s *charts.SingleSeries) { s.Symbol = "triangle"; s.SymbolSize = 10; s.Color = colourComparison }))
	return optionOf(line)
}

// columnChart compares the two groups' distributions of one column as
// side-by-side bars of the share of records (percent) per histogram bin or
// level; a share that small-cell suppression withholds has no bar ("-").
// Bin labels come from binLabels; i is the column's position in Details.
func columnChart(res *fairness.Result, i int, c fairness.ColumnDetails) chartOption {
	bar := charts.NewBar()
	bar.SetGlobalOptions(
		charts.WithTooltipOpts(opts.Tooltip{Show: opts.Bool(true), Trigger: "axis", BackgroundColor: "#FFFFFF", BorderColor: colourRule}),
		charts.WithLegendOpts(opts.Legend{Show: opts.Bool(true), Top: "0"}),
		charts.WithGridOpts(opts.Grid{Left: "8", Right: "8", Top: "32", Bottom: "8", ContainLabel: opts.Bool(true)}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Min: 0, Max: shareAxisMax(c), AxisLabel: &opts.AxisLabel{Formatter: types.FuncStr("{value}%")},
			SplitLine: &opts.SplitLine{Show: opts.Bool(true), LineStyle: &opts.LineStyle{Color: colourRule, Type: "dashed"}}}),
		charts.WithXAxisOpts(opts.XAxis{Type: "category", AxisLabel: &opts.AxisLabel{Interval: "0", Rotate: rotateFor(len(c.Reference))}}),
	)
	bar.SetXAxis(binLabels(res, c))
	shares := func(role string, xs []float64) []opts.BarData {
		var out []opts.BarData
		for j, v := range xs {
			if _, ok := withheldText(res, fairness.SharePath(i, role, j)); ok {
				out = append(out, opts.BarData{Value: "-"})
				continue
			}
			out = append(out, opts.BarData{Value: round6(100 * v)})
		}
		return out
	}
	bar.AddSeries(refName(res), shares("reference", c.Reference), charts.WithItemStyleOpts(opts.ItemStyle{Color: colourReference}))
	bar.AddSeries(cmpName(res), shares("comparison", c.Comparison), charts.WithItemStyleOpts(opts.ItemStyle{Color: colourComparison, BorderColor: colourInk, BorderWidth: 0.5}))
	return optionOf(bar)
}

// shareAxisMax is the top of a column chart's axis in percent: the
// largest share rounded up to a 1-2-5 step, never above 100%.
func shareAxisMax(c fairness.ColumnDetails) float64 {
	top := 0.0
	for _, v := range append(append([]float64{}, c.Reference...), c.Comparison...) {
		top = max(top, 100*v)
	}
	if top <= 0 {
		return 100
	}
	step := niceStep(top / 5)
	return min(100, math.Ceil(top/step)*step)
}

// rotateFor tilts category labels when there are many of them.
func rotateFor(n int) float64 {
	if n > 6 {
		return 35
	}
	return 0
}

// binLabels names a column's histogram bins "lo–hi" with the edges printed
// to three significant digits, or returns its levels (levelLabels).
func binLabels(res *fairness.Result, c fairness.ColumnDetails) []string {
	if c.Levels != nil {
		return levelLabels(res, c)
	}
	var out []string
	for j := 0; j+1 < len(c.Edges); j++ {
		out = append(out, formatEdge(c.Edges[j])+"–"+formatEdge(c.Edges[j+1]))
	}
	return out
}

// levelLabels names the levels of a column described by levels: by the
// display names of the spec's names key (fairness.Names.LevelName), else
// the label's 0 and 1 by the label's words when the spec named them
// (fairness.LabelValues), else as they are.
func levelLabels(res *fairness.Result, c fairness.ColumnDetails) []string {
	lv := res.LabelValues
	out := make([]string, len(c.Levels))
	for j, l := range c.Levels {
		out[j] = res.Names.LevelName(c.Name, l)
		if out[j] != l || c.Name != res.Label || lv == nil || !c.Binary {
			continue
		}
		switch {
		case l == "1":
			out[j] = lv.Positive
		case l == "0" && lv.Negative != "":
			out[j] = lv.Negative
		}
	}
	return out
}
