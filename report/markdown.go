package report

import (
	"bufio"
	"fmt"
	"io"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// WriteMarkdown writes a compact Markdown report of res to w, for pasting
// into a pull request or an issue: a title; the overview of every metric
// (gap, largest contribution and its share, verdict) with a caution; the
// warnings with their severities, most serious first; the groups and the
// plain-language summary of every metric; a table of the two groups'
// metric values and one table per metric with its decomposition
// (contributions, intervals as "[low, high]" when the bootstrap ran, the
// residual); the assumptions and cautions; the appendix of reporting items
// (crosswalk.go). The spec's title, when given,
// is the heading. Numbers are formatted exactly as in the HTML report. It
// returns the first write error.
func WriteMarkdown(w io.Writer, res *fairness.Result) error {
	bw := bufio.NewWriter(w)
	p := func(format string, args ...any) { fmt.Fprintf(bw, format, args...) }
	mdHeader(p, res)
	mdOverview(p, res)
	mdWarnings(p, res)
	mdPolicy(p, res)
	mdSummaries(p, res)
	mdGroupTable(p, res)
	flags := unreliable(res)
	for _, m := range res.Metrics {
		mdDecomposition(p, res, m, flags)
	}
	mdHiddenFactor(p, res)
	mdAltGraphs(p, res)
	if len(res.Assumptions) > 0 {
		p("### Assumptions and cautions\n\n")
		for _, a := range res.Assumptions {
			p("- %s\n", mdText(a))
		}
		p("\n")
	}
	mdCrosswalk(p)
	p("_Statistical estimates under the stated causal assumptions, not clinical or legal findings. %s %s, seed %d._\n",
		mdText(res.Tool.Name), mdText(res.Tool.Version), res.Seed)
	return bw.Flush()
}

// mdPrinter prints formatted Markdown; every string argument that comes
// from the Result has passed through mdText, mdCode, mdCodeCell or
// mdSentence (markdown_escape.go).
type mdPrinter func(format string, args ...any)

// mdHeader prints the heading, the audited model and the audit date when
// the Result names them, and the synthetic-data note.
func mdHeader(p mdPrinter, res *fairness.Result) {
	what := subject(res, markdownInline)
	if res.Title != "" {
		p("## %s\n\n", mdText(res.Title))
		p("Performance audit of %s: %s compared with %s.\n\n", what, mdText(cmpName(res)), mdText(refName(res)))
	} else {
		p("## Performance audit of %s: %s compared with %s\n\n", what, mdText(cmpName(res)), mdText(refName(res)))
	}
	var facts []string
	if modelLabel(res) != "" {
		facts = append(facts, "Score of the model: "+mdCodeWithID(colLabel(res, res.Score), res.Score))
	}
	if res.AuditDate != "" {
		facts = append(facts, "Audit date: "+mdText(res.AuditDate))
	}
	if len(facts) > 0 {
		p("%s.\n\n", strings.Join(facts, ". "))
	}
	if res.Synthetic {
		p("> **Synthetic data.** These numbers come from an invented cohort and describe no real patients.\n\n")
	}
}

// mdSummaries prints the groups, the summary of every metric and how the
// intervals were made.
func mdSummaries(p mdPrinter, res *fairness.Result) {
	g := res.Groups
	p("Groups by %s: reference %s (%d records, %d events), comparison %s (%d records, %d events). Label %s%s, decision threshold %s.\n\n",
		mdCodeWithID(colLabel(res, g.Column), g.Column), mdText(withID(refName(res), g.Reference)), g.NReference, g.EventsReference,
		mdText(withID(cmpName(res), g.Comparison)), g.NComparison, g.EventsComparison, mdCodeWithID(nodeName(res, res.Label), res.Label),
		mdText(labelWords(res.LabelValues)), formatThreshold(res.Threshold))
	if s := excludedSentence(res); s != "" {
		p("%s\n\n", mdText(s))
	}
	for _, m := range res.Metrics {
		p("%s\n\n", summaryText(res, m, markdownInline))
	}
	if iv := intervalSetting(res); iv != "" {
		p("Intervals in brackets: %s.\n\n", mdText(iv))
	} else {
		p("Intervals: %s.\n\n", mdText(noIntervals))
	}
}

// mdGroupTable prints the two groups' metric values and the gaps.
func mdGroupTable(p mdPrinter, res *fairness.Result) {
	p("### Metrics by group\n\n")
	p("| Metric | %s (reference) | %s (comparison) | Gap | From |\n", mdText(refName(res)), mdText(cmpName(res)))
	p("| --- | ---: | ---: | ---: | --- |\n")
	for _, m := range res.Metrics {
		p("| %s | %s | %s | %s | %s |\n", mdText(MetricTitle(m.Metric)),
			withInterval(formatValue(m.Metric, m.Reference), formatValueInterval(m.Metric, m.ReferenceCI)),
			withInterval(formatValue(m.Metric, m.Comparison), formatValueInterval(m.Metric, m.ComparisonCI)),
			withInterval(formatDelta(m.Metric, m.Gap), formatGapInterval(m))+mdImpact(m)+mdText(allRecordsSuffix(m)),
			mdText(basisPair(m.Metric, m.RecordsReference, m.RecordsComparison)))
	}
	p("\n")
	if note := impactNote(res); note != "" {
		p("%s\n\n", mdText(note))
	}
}

// mdDecomposition prints one metric's contributions, their sum, the
// residual and the observed gap; flags marks unreliable mechanisms.
func mdDecomposition(p mdPrinter, res *fairness.Result, m fairness.MetricResult, flags map[string]string) {
	p("### Decomposition of the %s gap\n\n", mdText(MetricTitle(m.Metric)))
	extra := mdExtraColumns(m)
	head, rule, blank := "", "", ""
	for _, col := range extra {
		head += " " + col.head + " |"
		rule += " ---: |"
		blank += " |"
	}
	p("| Mechanism | Contribution | %s | Alone | Gap if equalised |%s\n", mdText(estimateIntervalName(res)), head)
	p("| --- | ---: | ---: | ---: | ---: |%s\n", rule)
	for i, c := range m.Contributions {
		name := mdCodeCell(contribMech(res, c))
		if _, ok := flags[c.Node]; ok {
			name += " (unreliable)"
		}
		if c.NotEstimable {
			p("| %s | %s | – | – | – |%s\n", name, notEstimable, strings.Repeat(" – |", len(extra)))
			continue
		}
		cells := ""
		for _, col := range extra {
			cells += " " + col.cells[i] + " |"
		}
		p("| %s | %s | %s | %s | %s |%s\n", name, formatDelta(m.Metric, c.Value),
			orDash(formatDeltaInterval(m.Metric, c.CILow, c.CIHigh)),
			formatDelta(m.Metric, c.Alone), formatDelta(m.Metric, c.IfEqualised), cells)
	}
	p("| %s | %s | | | |%s\n", sumLabel(m, "Sum of contributions"), formatDelta(m.Metric, m.Estimated), blank)
	p("| Residual (not assigned) | %s | | | |%s\n", residualDelta(m), blank)
	p("| Observed gap | %s | %s | | |%s\n\n", formatDelta(m.Metric, m.Gap), orDash(formatGapInterval(m)), blank)
	if s := checksLines(m, reportUnits); s != "" {
		p("%s\n\n", mdText(s))
	}
	p("%s\n\n", mdText(residualNote(res, m)))
}

// mdColumn is an optional column of the decomposition table: its heading
// and one cell per contribution.
type mdColumn struct {
	head  string
	cells []string
}

// mdExtraColumns returns the decomposition table's optional columns, in
// order: "Split SD" (each contribution's standard deviation over the fold
// splits) when some contribution has one, and "Sides differ" when some
// contribution has a difference between the two sides' estimates; a
// contribution without the value gets a dash.
func mdExtraColumns(m fairness.MetricResult) []mdColumn {
	n := len(m.Contributions)
	sd := mdColumn{head: "Split SD", cells: make([]string, n)}
	sides := mdColumn{head: "Sides differ", cells: make([]string, n)}
	hasSD, hasSides := false, false
	for i, c := range m.Contributions {
		sd.cells[i] = "–"
		if c.SplitSD != nil {
			hasSD = true
			sd.cells[i] = formatSpread(m.Metric, *c.SplitSD)
		}
		hasSides = hasSides || c.SideDifference != nil
		sides.cells[i] = orDash(contributionSides(m.Metric, c, reportUnits))
	}
	var out []mdColumn
	if hasSD {
		out = append(out, sd)
	}
	if hasSides {
		out = append(out, sides)
	}
	return out
}

// formatThreshold prints the decision threshold with up to four decimals.
func formatThreshold(t float64) string {
	s := strings.TrimRight(strings.TrimRight(fmt.Sprintf("%.4f", t), "0"), ".")
	return s
}

// withInterval appends an interval ("[low, high]") to a value when there
// is one.
func withInterval(v, ci string) string {
	if ci == "" {
		return v
	}
	return v + " " + ci
}

func orDash(s string) string {
	if s == "" {
		return "–"
	}
	return s
}

// mdCodeWithID writes a display name as code followed by the identifier
// it stands for, "`haemoglobin` (`hb`)", when they differ; the identifier
// as code otherwise.
func mdCodeWithID(display, id string) string {
	if display == id {
		return mdCode(id)
	}
	return mdCode(display) + " (" + mdCode(id) + ")"
}
