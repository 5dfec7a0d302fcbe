package report

import (
	"encoding/json"
	"fmt"
	"html"
	"math"
	"strconv"
	"strings"

	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/go-echarts/go-echarts/v2/types"
)

// The report's palette. Group and contribution colours are taken from the
// eight-colour set of Okabe & Ito (2008), "Color Universal Design (CUD):
// how to make figures and presentations that are friendly to colorblind
// people", chosen so that every pair stays distinguishable under the common
// colour-vision deficiencies; shapes and dash styles repeat the group
// distinction for print in grey.
const (
	colourReference  = "#009E73" // Okabe–Ito bluish green
	colourComparison = "#CC79A7" // Okabe–Ito reddish purple
	colourWidens     = "#E69F00" // Okabe–Ito orange: a contribution that widens the gap
	colourNarrows    = "#56B4E9" // Okabe–Ito sky blue: one that narrows it
	colourFlag       = "#D55E00" // Okabe–Ito vermillion: the outline of an unreliable estimate
	colourResidual   = "#9A9A9A"
	colourNeutral    = "#F3F0E8" // the page's paper tone, the middle of the node ramp
	colourInk        = "#22252B"
	colourMuted      = "#6B6F76"
	colourRule       = "#D9D4C7"
	chartFont        = `"Segoe UI", system-ui, -apple-system, "Helvetica Neue", Arial, sans-serif`
)

// chartOption is one chart's ECharts option, ready to encode.
type chartOption map[string]any

// optionOf returns the ECharts option of a go-echarts chart: the same map
// go-echarts would embed in its own page, which we encode ourselves so that
// the page carries the library inline instead of fetching it.
func optionOf(c interface {
	Validate()
	JSON() map[string]any
}) chartOption {
	c.Validate()
	// A JSON round trip turns go-echarts' typed series into plain maps
	// that the builders can extend with options go-echarts lacks.
	raw, err := json.Marshal(c.JSON())
	if err != nil {
		panic("report: go-echarts option does not encode: " + err.Error())
	}
	var o chartOption
	if err := json.Unmarshal(raw, &o); err != nil {
		panic("report: go-echarts option does not decode: " + err.Error())
	}
	// go-echarts always emits an empty toolbox and title; they only take
	// room in our layout.
	delete(o, "toolbox")
	delete(o, "title")
	o["color"] = []string{colourReference, colourComparison, colourNarrows, colourWidens, colourResidual}
	o["animation"] = false // charts must be final when printed or captured
	// A concrete font list, not "inherit": ECharts measures text on a canvas
	// with this font, and an unknown family would skew label widths.
	o["textStyle"] = map[string]any{"fontFamily": chartFont, "color": colourInk}
	return o
}

// encodeOptions encodes chart options as JSON for a <script> element. HTML
// characters are escaped (\u003c…), so no string in the data can close
// the element.
func encodeOptions(v any) (string, error) {
	b, err := json.Marshal(v)
	if err != nil {
		return "", fmt.Errorf("report: encoding chart data: %w", err)
	}
	return string(b), nil
}

// itemTooltip is a data item's tooltip showing fixed HTML lines; text is
// escaped here, and passed through formatterText.
func itemTooltip(lines ...string) *opts.Tooltip {
	for i, l := range lines {
		lines[i] = html.EscapeString(formatterText(l))
	}
	return &opts.Tooltip{Formatter: types.FuncStr(strings.Join(lines, "<br>"))}
}

// formatterText makes text safe to show as an ECharts formatter string
// (labels and tooltips): ECharts reads {a} to {e}, {@dimension} and, in
// labels, {style|text} in such a string as template fields and rich-text
// styles (its formatTpl and rich text), so braces are replaced by
// parentheses, which show the name all the same.
func formatterText(text string) string {
	return strings.NewReplacer("{", "(", "}", ")").Replace(text)
}

// plainTooltip is an item-triggered tooltip in the report's style.
func plainTooltip() opts.Tooltip {
	return opts.Tooltip{Show: opts.Bool(true), Trigger: "item", BackgroundColor: "#FFFFFF", BorderColor: colourRule}
}

// scaleOf returns the factor by which a metric's values are multiplied in
// charts: percentages for proportions, the raw value otherwise.
func scaleOf(metric string) float64 {
	if isProportion(metric) {
		return 100
	}
	return 1
}

// axisUnit is the axis label suffix of a metric's charts.
func axisUnit(metric string) string {
	if isProportion(metric) {
		return "%"
	}
	return ""
}

// niceAxis widens [lo, hi] by a margin and rounds it outwards to a
// multiple of a 1-2-5 step, so that axis ends fall on readable numbers,
// and returns the step, so that a chart can put its ticks on multiples of
// it (both ends then carry a label).
func niceAxis(lo, hi float64) (float64, float64, float64) {
	span := hi - lo
	if !(span > 0) {
		span = math.Max(math.Abs(hi), 1) * 0.1
	}
	lo, hi = lo-0.08*span, hi+0.08*span
	step := niceStep((hi - lo) / 5)
	return math.Floor(lo/step) * step, math.Ceil(hi/step) * step, step
}

// niceStep returns the smallest number of the form {1, 2, 5}·10^k at least x.
func niceStep(x float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(x)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*p >= x {
			return m * p
		}
	}
	return 10 * p
}

// round6 rounds chart coordinates to six significant decimals so the
// embedded data stays short; tables carry the exact formatted values.
func round6(v float64) float64 {
	f, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 6, 64), 64)
	return f
}
