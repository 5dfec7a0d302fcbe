package report

import (
	"fmt"
	"slices"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// overviewRow is one metric in the overview that opens every report: both
// groups' values, the gap with its interval, the mechanism of the largest
// contribution with its value and share of the gap, and the verdict of
// fairness.Headline with its reasons. Strings holding user text are
// written in the style the row was built with (overviewRows).
type overviewRow struct {
	Metric, Title         string
	Reference, Comparison string
	Gap                   string // the gap with its interval, and whether that holds 0
	Lead                  string // "how `hb` presents given `anaemia`: −5.1 pts (…)", or why there is none
	Share                 string // the lead's share of the gap in words, or ""
	Level                 string // the verdict's severity: sound, note, caution or unreliable
	Verdict               string // "Reliable", "Use with caution" or "Not reliable"
	Because               string // why, with the numbers of the warnings behind it
	Refs                  []int  // numbers of those warnings in warningOrder
}

// overviewRows builds the overview of every metric of res, user text in
// style st.
func overviewRows(res *fairness.Result, st inlineStyle) []overviewRow {
	numbers := warningNumbers(res.Warnings)
	var rows []overviewRow
	for _, m := range res.Metrics {
		row := overviewRow{Metric: m.Metric, Title: st.text(MetricTitle(m.Metric)),
			Reference: formatValue(m.Metric, m.Reference), Comparison: formatValue(m.Metric, m.Comparison),
			Gap: overviewGap(m), Level: string(m.Headline.Verdict)}
		row.Lead, row.Share = overviewLead(res, m, st)
		row.Verdict, row.Because, row.Refs = verdictWords(res, m.Headline, numbers, st)
		rows = append(rows, row)
	}
	return rows
}

// overviewGap prints a metric's gap with its interval, saying when the
// interval holds 0 or the gap prints as zero.
func overviewGap(m fairness.MetricResult) string {
	s := formatDelta(m.Metric, m.Gap)
	if ci := formatGapInterval(m); ci != "" {
		s += " " + ci
		if m.GapCI.Low <= 0 && m.GapCI.High >= 0 {
			s += ", interval includes 0"
		}
	}
	if isZeroText(formatMagnitude(m.Metric, m.Gap)) {
		s += ": no difference at the precision shown"
	}
	return s
}

// overviewLead words the headline's lead mechanism with its contribution
// and interval, and its share of the gap ("" when the gap prints as zero
// or has no share).
func overviewLead(res *fairness.Result, m fairness.MetricResult, st inlineStyle) (lead, share string) {
	h := m.Headline
	var c *fairness.Contribution
	for i := range m.Contributions {
		if m.Contributions[i].Node == h.Lead {
			c = &m.Contributions[i]
		}
	}
	switch {
	case h.Verdict == "":
		return "not in this result", ""
	case h.Lead == "" || c == nil:
		return "no contribution can be estimated", ""
	}
	lead = mechanismPhrase(res, c.Node, st) + ": " + contributionWords(res, m.Metric, *c, true)
	if h.LeadShare == nil || isZeroText(formatMagnitude(m.Metric, m.Gap)) {
		return lead, ""
	}
	return lead, shareWords(*h.LeadShare)
}

// shareWords describes a lead's share of the gap: "72% of the gap", more
// than the whole gap when others offset part of it, or a narrowing.
func shareWords(share float64) string {
	pct := fmt.Sprintf("%.0f%%", 100*share)
	switch {
	case share < 0:
		return fmt.Sprintf("it narrows the gap, by %.0f%% of the gap's size", -100*share)
	case pct != "100%" && share > 1:
		return pct + " of the gap (others offset part)"
	}
	return pct + " of the gap"
}

// verdictWords words a headline's verdict: the verdict, why (the reasons
// of its warnings of caution or worse, or that only notes or none concern
// it) and the numbers of those warnings.
func verdictWords(res *fairness.Result, h fairness.Headline, numbers map[int]int, st inlineStyle) (verdict, because string, refs []int) {
	var reasons []string
	var notes []int
	for _, i := range h.Warnings {
		w := res.Warnings[i]
		if !w.Severity.AtLeast(fairness.SeverityCaution) {
			notes = append(notes, numbers[i])
			continue
		}
		refs = append(refs, numbers[i])
		if r := warningReason(res, w, st); !slices.Contains(reasons, r) {
			reasons = append(reasons, r)
		}
	}
	switch h.Verdict {
	case fairness.SeverityUnreliable:
		return "Not reliable", "because " + joinWords(reasons), refs
	case fairness.SeverityCaution:
		return "Use with caution", "because " + joinWords(reasons), refs
	case fairness.SeverityNote:
		return "Reliable", "only notes concern it", notes
	case fairness.VerdictSound:
		return "Reliable", "no warning concerns it", nil
	}
	return "Not assessed", "the result holds no verdict", nil
}

// warningRefs prints the numbers of warnings as "warning 2" or
// "warnings 1, 3", or "".
func warningRefs(refs []int) string {
	if len(refs) == 0 {
		return ""
	}
	nums := make([]string, len(refs))
	for i, n := range refs {
		nums[i] = fmt.Sprint(n)
	}
	if len(refs) == 1 {
		return "warning " + nums[0]
	}
	return "warnings " + strings.Join(nums, ", ")
}
