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
	s := formatMagnitude(metric, v)
	switch {
	case isZeroText(s):
	case v > 0:
		s = "+" + s
	default:
		s = "−" + s
	}
	if isProportion(metric) {
		s += " pts"
	}
	return s
}

// formatMagnitude prints |v| in the metric's unit without sign or unit
// suffix: points for proportions ("9.0"), three decimals otherwise.
func formatMagnitude(metric string, v float64) string {
	if isProportion(metric) {
		return fmt.Sprintf("%.1f", 100*math.Abs(v))
	}
	return fmt.Sprintf("%.3f", math.Abs(v))
}

// formatSigned prints v in the metric's delta unit with a leading minus
// sign (U+2212) when negative and no unit suffix, for interval bounds.
func formatSigned(metric string, v float64) string {
	s := formatMagnitude(metric, v)
	if v < 0 && !isZeroText(s) {
		s = "−" + s
	}
	return s
}

// formatValueInterval prints a bootstrap interval of a metric value, e.g.
// "[10.9%, 13.2%]"; a nil interval prints as "".
func formatValueInterval(metric string, ci *fairness.Interval) string {
	if ci == nil {
		return ""
	}
	return "[" + formatValue(metric, ci.Low) + ", " + formatValue(metric, ci.High) + "]"
}

// formatDeltaInterval prints a bootstrap interval of a difference, e.g.
// "[4.8, 7.3] pts"; it prints "" unless both bounds are present.
func formatDeltaInterval(metric string, lo, hi *float64) string {
	if lo == nil || hi == nil {
		return ""
	}
	s := "[" + formatSigned(metric, *lo) + ", " + formatSigned(metric, *hi) + "]"
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

// mechanismPhrase describes a mechanism in words: the distribution of a
// root node, or a node given its parents; the label is read as how often
// it occurs.
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
		qp = append(qp, q(p))
	}
	given := ""
	if len(qp) > 0 {
		given = " given " + joinWords(qp)
	}
	switch {
	case node == res.Label:
		return "how often " + q(node) + " occurs" + given
	case node == res.Score:
		return "how the score " + q(node) + " is assigned" + given
	case len(qp) == 0:
		return "the mix of " + q(node)
	}
	return "how " + q(node) + " presents" + given
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

// summaryMentions is the largest number of contributions the summary names
// one by one; the rest are added up in one clause.
const summaryMentions = 4

// Summary returns a plain-language paragraph for one metric of the Result,
// in Markdown-style text (node names in backticks). It states the gap,
// names the largest contributions with their intervals when present, says
// which ones narrow rather than widen the gap, calls unreliable ones so,
// and states the residual.
func Summary(res *fairness.Result, m fairness.MetricResult) string {
	return summaryText(res, m, plainInline)
}

// summaryText is Summary with user text (group values, node names, the
// metric's title) written in the style st.
func summaryText(res *fairness.Result, m fairness.MetricResult, st inlineStyle) string {
	title := st.text(MetricTitle(m.Metric))
	unit := "points"
	if !isProportion(m.Metric) {
		unit = ""
	}
	amount := func(v float64) string {
		s := formatMagnitude(m.Metric, v)
		if unit != "" {
			return s + " " + unit
		}
		return s
	}
	verb := " come from "
	if unit == "" {
		verb = " comes from "
	}
	var b strings.Builder
	ref, cmp := st.text(res.Groups.Reference), st.text(res.Groups.Comparison)
	gapWord := "gap"
	if isProportion(m.Metric) {
		gapWord = formatMagnitude(m.Metric, m.Gap) + "-point gap"
	} else {
		gapWord = "gap of " + formatMagnitude(m.Metric, m.Gap)
	}
	fmt.Fprintf(&b, "The %s is %s for %s and %s for %s (reference group). ", title,
		formatValue(m.Metric, m.Comparison), cmp, formatValue(m.Metric, m.Reference), ref)
	if isZeroText(formatMagnitude(m.Metric, m.Gap)) {
		fmt.Fprintf(&b, "The two groups do not differ at the precision shown")
		if ci := formatGapInterval(m); ci != "" {
			fmt.Fprintf(&b, " (%s of the gap %s)", intervalName(res), ci)
		}
		b.WriteString(".")
		return b.String()
	}
	higher := "higher"
	if m.Gap < 0 {
		higher = "lower"
	}
	fmt.Fprintf(&b, "Of the %s (%s for %s", gapWord, higher, cmp)
	if ci := formatGapInterval(m); ci != "" {
		fmt.Fprintf(&b, "; %s %s", intervalName(res), ci)
	}
	b.WriteString("), ")

	order := make([]int, len(m.Contributions))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool {
		return math.Abs(m.Contributions[order[a]].Value) > math.Abs(m.Contributions[order[b]].Value)
	})
	flags := unreliable(res)
	var widen, narrow []string
	var rest float64
	nRest := 0
	var unestimable []string
	rank := 0
	for _, i := range order {
		c := m.Contributions[i]
		if c.NotEstimable {
			unestimable = append(unestimable, mechanismPhrase(res, c.Node, st))
			continue
		}
		rank++
		if rank > summaryMentions || isZeroText(formatMagnitude(m.Metric, c.Value)) {
			rest += c.Value
			nRest++
			continue
		}
		ci := ""
		if s := formatDeltaInterval(m.Metric, c.CILow, c.CIHigh); s != "" {
			ci = " (" + intervalName(res) + " " + s + ")"
		}
		caution := ""
		if why, ok := flags[c.Node]; ok {
			caution = " — unreliable: " + why
		}
		if (c.Value > 0) == (m.Gap > 0) {
			widen = append(widen, amount(c.Value)+ci+verb+mechanismPhrase(res, c.Node, st)+caution)
		} else {
			narrow = append(narrow, mechanismPhrase(res, c.Node, st)+" narrows it by "+amount(c.Value)+ci+caution)
		}
	}
	switch {
	case len(widen) > 0:
		b.WriteString(strings.Join(widen, "; "))
	default:
		b.WriteString("no single mechanism widens it")
	}
	if len(narrow) > 0 {
		b.WriteString("; " + strings.Join(narrow, "; "))
	}
	b.WriteString(".")
	if len(unestimable) > 0 {
		fmt.Fprintf(&b, " The data cannot estimate the contribution of %s (see the warnings).", strings.Join(unestimable, " or of "))
	}
	if nRest > 0 {
		if nRest == 1 {
			fmt.Fprintf(&b, " The remaining mechanism contributes %s.", formatDelta(m.Metric, rest))
		} else {
			fmt.Fprintf(&b, " The other %d mechanisms together contribute %s.", nRest, formatDelta(m.Metric, rest))
		}
	}
	fmt.Fprintf(&b, " The contributions add up to %s; the remaining %s (residual) is estimation error or the effect of something outside the graph, which the method cannot assign.",
		formatDelta(m.Metric, m.Estimated), formatDelta(m.Metric, m.Residual))
	return b.String()
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
