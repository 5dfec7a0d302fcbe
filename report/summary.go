// Package report renders a fairness.Result for people: a standalone
// interactive HTML page (WriteHTML) and Markdown for pasting into a pull
// request (WriteMarkdown). It formats and lays out numbers that the fairness
// package computed; it computes no statistics of its own.
package report

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/metrics"
)

// This file holds the wording of numbers: how every value, gap and interval
// is printed (shared by HTML and Markdown so that both show the same text),
// and the plain-language summary paragraph built from a Result.

// MetricTitle returns the plain-language name of a metric, or the metric's
// own name when it has none.
func MetricTitle(name string) string {
	if f, ok := metrics.FactOf(name); ok {
		return f.Title
	}
	return name
}

// isProportion reports whether a metric is a share of records, printed as a
// percentage with gaps in percentage points.
func isProportion(name string) bool {
	f, _ := metrics.FactOf(name)
	return f.Proportion
}

// formatValue prints a metric value: proportions as "12.3%", other metrics
// with three decimals. NaN prints as "n/a".
func formatValue(metric string, v float64) string {
	if math.IsNaN(v) {
		return "n/a"
	}
	if isProportion(metric) {
		return trimNegZero(fmt.Sprintf("%.1f", 100*v)) + "%"
	}
	return trimNegZero(fmt.Sprintf("%.3f", v))
}

// formatDelta prints a difference in a metric with its sign: proportions in
// percentage points ("+9.0 pts"), other metrics with three decimals
// ("−0.012"). A difference that rounds to zero prints without a sign.
func formatDelta(metric string, v float64) string {
	if math.IsNaN(v) {
		return "n/a"
	}
	return deltaAt(metric, v, baseDecimals(metric))
}

// deltaAt prints v as formatDelta does, with dec decimals.
func deltaAt(metric string, v float64, dec int) string {
	s := signedAt(metric, v, dec)
	if isProportion(metric) {
		s += " pts"
	}
	return s
}

// formatSpread prints a standard error or deviation in the metric's delta
// unit without sign: "3.1 pts" for proportions, "0.012" otherwise.
func formatSpread(metric string, v float64) string {
	s := formatMagnitude(metric, v)
	if isProportion(metric) {
		s += " pts"
	}
	return s
}

// formatMagnitude prints |v| in the metric's unit without sign or unit
// suffix: points for proportions ("9.0"), three decimals otherwise.
func formatMagnitude(metric string, v float64) string {
	return magnitudeAt(metric, v, baseDecimals(metric))
}

// baseDecimals is how many decimals a difference in the metric prints
// with: one for proportions (in points), three otherwise.
func baseDecimals(metric string) int {
	if isProportion(metric) {
		return 1
	}
	return 3
}

// magnitudeAt prints |v| in the metric's delta unit with dec decimals.
func magnitudeAt(metric string, v float64, dec int) string {
	return strconv.FormatFloat(scaleOf(metric)*math.Abs(v), 'f', dec, 64)
}

// signedAt prints v in the metric's delta unit with dec decimals and its
// sign ("+" or U+2212), no sign when it prints as zero, and no unit.
func signedAt(metric string, v float64, dec int) string {
	s := magnitudeAt(metric, v, dec)
	switch {
	case isZeroText(s):
	case v > 0:
		s = "+" + s
	default:
		s = "−" + s
	}
	return s
}

// maxExtraDecimals is how many decimals beyond baseDecimals an interval
// may take so that its two ends print apart.
const maxExtraDecimals = 3

// intervalDecimals returns the decimals at which the ends of [lo, hi]
// print apart: baseDecimals, or up to maxExtraDecimals more when lo < hi
// would otherwise print as the same number ("[+0.1, +0.1]").
func intervalDecimals(metric string, lo, hi float64) int {
	dec := baseDecimals(metric)
	for extra := 0; extra < maxExtraDecimals && lo != hi && signedAt(metric, lo, dec) == signedAt(metric, hi, dec); extra++ {
		dec++
	}
	return dec
}

// formatValueInterval prints a bootstrap interval of a metric value, e.g.
// "[10.9%, 13.2%]"; a nil interval prints as "".
func formatValueInterval(metric string, ci *fairness.Interval) string {
	if ci == nil {
		return ""
	}
	return "[" + formatValue(metric, ci.Low) + ", " + formatValue(metric, ci.High) + "]"
}

// formatDeltaInterval prints a bootstrap interval of a difference with
// signed ends, e.g. "[+4.8, +7.3] pts" or "[−0.1, +1.7] pts", with more
// decimals when its ends would otherwise print the same
// (intervalDecimals); it prints "" unless both bounds are present.
func formatDeltaInterval(metric string, lo, hi *float64) string {
	if lo == nil || hi == nil {
		return ""
	}
	return deltaIntervalAt(metric, *lo, *hi, intervalDecimals(metric, *lo, *hi))
}

// deltaIntervalAt prints [lo, hi] as formatDeltaInterval does, with dec
// decimals.
func deltaIntervalAt(metric string, lo, hi float64, dec int) string {
	s := "[" + signedAt(metric, lo, dec) + ", " + signedAt(metric, hi, dec) + "]"
	if isProportion(metric) {
		s += " pts"
	}
	return s
}

// formatGapInterval prints the interval of a metric's gap, or "".
func formatGapInterval(m fairness.MetricResult) string {
	if m.GapCI == nil {
		return ""
	}
	return formatDeltaInterval(m.Metric, &m.GapCI.Low, &m.GapCI.High)
}

// formatCount prints a record count or a weighted count: integers without
// decimals, other values with one.
func formatCount(v float64) string {
	if v == math.Trunc(v) && math.Abs(v) < 1e15 {
		return fmt.Sprintf("%.0f", v)
	}
	return fmt.Sprintf("%.1f", v)
}

// formatDiag prints a diagnostic ratio (AUC, mean ratio, shares) with
// three decimals.
func formatDiag(v float64) string {
	if math.IsNaN(v) {
		return "n/a"
	}
	return trimNegZero(fmt.Sprintf("%.3f", v))
}

func isZeroText(s string) bool { return strings.Trim(s, "0.") == "" }

func trimNegZero(s string) string {
	if strings.HasPrefix(s, "-") && isZeroText(s[1:]) {
		return s[1:]
	}
	if strings.HasPrefix(s, "-") {
		return "−" + s[1:]
	}
	return s
}

// mechanismPhrase describes a mechanism in words, naming the node and its
// parents by their display names: the distribution of a root node, or a
// node given its parents; the label is read as how often it occurs.
func mechanismPhrase(res *fairness.Result, node string, st inlineStyle) string {
	var parents []string
	for _, m := range res.Mechanisms {
		if m.Node == node {
			parents = m.Parents
		}
	}
	q := st.code
	var qp []string
	for _, p := range parents {
		qp = append(qp, q(nodeName(res, p)))
	}
	given := ""
	if len(qp) > 0 {
		given = " given " + joinWords(qp)
	}
	name := q(nodeName(res, node))
	switch {
	case node == res.Label:
		return "how often " + name + " occurs" + given
	case node == res.Score:
		return "how the score " + name + " is assigned" + given
	case len(qp) == 0:
		return "the mix of " + name
	}
	return "how " + name + " presents" + given
}

// joinWords joins items as "a", "a and b" or "a, b and c".
func joinWords(items []string) string {
	switch len(items) {
	case 0:
		return ""
	case 1:
		return items[0]
	}
	return strings.Join(items[:len(items)-1], ", ") + " and " + items[len(items)-1]
}

// summaryMentions is how many of the largest contributions the summary
// gives with their intervals; every other mechanism is named with its
// value alone.
const summaryMentions = 4

// Summary returns a plain-language paragraph for one metric of the Result,
// in Markdown-style text (node names in backticks). It states both groups'
// values and the gap with its interval, then names every mechanism: those
// that widen the gap, those that narrow it and those too small to show,
// each with its contribution (the summaryMentions largest also with their
// intervals) and a caution when it is unreliable; then the mechanisms the
// data cannot estimate and the residual. A number and its interval are
// written with their signs and the same decimals (intervalDecimals), so
// that they read alike and no interval prints as one number twice.
func Summary(res *fairness.Result, m fairness.MetricResult) string {
	return summaryText(res, m, plainInline)
}

// summaryText is Summary with user text (group values, node names, the
// metric's title) written in the style st.
func summaryText(res *fairness.Result, m fairness.MetricResult, st inlineStyle) string {
	var b strings.Builder
	b.WriteString(gapSentence(res, m, st))
	if isZeroText(formatMagnitude(m.Metric, m.Gap)) {
		return b.String()
	}
	parts := summaryParts(res, m, st)
	switch {
	case len(parts.widen) > 0:
		b.WriteString(" Widening the gap: " + strings.Join(parts.widen, "; ") + ".")
	case len(parts.narrow)+len(parts.small) > 0:
		b.WriteString(" No mechanism widens the gap.")
	}
	if len(parts.narrow) > 0 {
		b.WriteString(" Narrowing it: " + strings.Join(parts.narrow, "; ") + ".")
	}
	if len(parts.small) > 0 {
		b.WriteString(" Too small to widen or narrow it at the precision shown: " + strings.Join(parts.small, "; ") + ".")
	}
	if len(parts.unestimable) > 0 {
		fmt.Fprintf(&b, " The data cannot estimate the contribution of %s (see the warnings).", strings.Join(parts.unestimable, " or of "))
	}
	fmt.Fprintf(&b, " The contributions add up to %s; the residual, %s, is estimation error or the effect of something outside the graph, which the method cannot assign.",
		formatDelta(m.Metric, m.Estimated), formatDelta(m.Metric, m.Residual))
	return b.String()
}

// gapSentence states both groups' values of m and the gap with its
// interval, or that the groups do not differ at the precision shown.
func gapSentence(res *fairness.Result, m fairness.MetricResult, st inlineStyle) string {
	title := st.text(MetricTitle(m.Metric))
	ref, cmp := st.text(refName(res)), st.text(cmpName(res))
	s := fmt.Sprintf("The %s is %s for %s and %s for %s (reference group).", title,
		formatValue(m.Metric, m.Comparison), cmp, formatValue(m.Metric, m.Reference), ref)
	ci := ""
	if m.GapCI != nil {
		ci = " (" + intervalName(res) + " " + formatDeltaInterval(m.Metric, &m.GapCI.Low, &m.GapCI.High) + ")"
	}
	if isZeroText(formatMagnitude(m.Metric, m.Gap)) {
		ci = strings.Replace(ci, " interval ", " interval of the gap ", 1)
		return s + " The two groups do not differ at the precision shown" + ci + "."
	}
	higher := "higher"
	if m.Gap < 0 {
		higher = "lower"
	}
	dec := baseDecimals(m.Metric)
	if m.GapCI != nil {
		dec = intervalDecimals(m.Metric, m.GapCI.Low, m.GapCI.High)
	}
	return s + fmt.Sprintf(" The gap, %s minus %s, is %s%s: the %s is %s for %s.", cmp, ref, deltaAt(m.Metric, m.Gap, dec), ci, title, higher, cmp)
}

// mentions is the summary's wording of every contribution of a metric,
// sorted by the part of the gap it plays.
type mentions struct {
	widen, narrow, small, unestimable []string
}

// summaryParts words every contribution of m, largest |φ| first: its
// mechanism, its value (with its interval for the summaryMentions largest)
// and why it is unreliable; not-estimable contributions by name alone.
func summaryParts(res *fairness.Result, m fairness.MetricResult, st inlineStyle) mentions {
	order := make([]int, len(m.Contributions))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool {
		return math.Abs(m.Contributions[order[a]].Value) > math.Abs(m.Contributions[order[b]].Value)
	})
	flags := unreliable(res)
	var out mentions
	rank := 0
	for _, i := range order {
		c := m.Contributions[i]
		if c.NotEstimable {
			out.unestimable = append(out.unestimable, mechanismPhrase(res, c.Node, st))
			continue
		}
		rank++
		item := mechanismPhrase(res, c.Node, st) + ", " + contributionWords(res, m.Metric, c, rank <= summaryMentions)
		if why, ok := flags[c.Node]; ok {
			item += " — unreliable: " + why
		}
		switch {
		case isZeroText(formatMagnitude(m.Metric, c.Value)):
			out.small = append(out.small, item)
		case (c.Value > 0) == (m.Gap > 0):
			out.widen = append(out.widen, item)
		default:
			out.narrow = append(out.narrow, item)
		}
	}
	return out
}

// contributionWords prints a contribution with its sign, followed by its
// interval when withCI and there is one, both with the interval's
// decimals: "+6.1 pts (95% interval [+4.8, +7.3] pts)".
func contributionWords(res *fairness.Result, metric string, c fairness.Contribution, withCI bool) string {
	if !withCI || c.CILow == nil || c.CIHigh == nil {
		return formatDelta(metric, c.Value)
	}
	dec := intervalDecimals(metric, *c.CILow, *c.CIHigh)
	return deltaAt(metric, c.Value, dec) + " (" + estimateIntervalName(res) + " " + deltaIntervalAt(metric, *c.CILow, *c.CIHigh, dec) + ")"
}

// formatEdge prints a histogram bin edge with three significant digits
// and no exponent (1234 prints as "1234").
func formatEdge(v float64) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return trimNegZero(fmt.Sprint(v))
	}
	dec := 2 - int(math.Floor(math.Log10(math.Abs(v))))
	if dec < 0 {
		dec = 0
	}
	return trimNegZero(strconv.FormatFloat(v, 'f', dec, 64))
}
