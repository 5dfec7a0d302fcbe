package report

import (
	"bufio"
	"io"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// WriteGroupsText writes the audit of several comparison groups as plain
// text: the summary matrix (one row per comparison and metric: the
// groups' values, the gap and its interval, the lead mechanism with its
// contribution and the verdict), the groups skipped with the reason, and
// then each comparison's own report (WriteText). It returns w's error.
func WriteGroupsText(w io.Writer, g *fairness.GroupsResult) error {
	if err := WriteGroupsSummaryText(w, g); err != nil {
		return err
	}
	for _, r := range g.Results {
		if _, err := io.WriteString(w, "\n"+Printable(strings.Repeat("=", 8)+" Comparison "+quoted(r.Groups.Comparison)+" vs "+quoted(r.Groups.Reference)+" "+strings.Repeat("=", 8))+"\n\n"); err != nil {
			return err
		}
		if err := WriteText(w, r); err != nil {
			return err
		}
	}
	return nil
}

// WriteGroupsSummaryText writes the summary part of WriteGroupsText: the
// matrix, the policy's verdict, the groups skipped and the assumptions.
func WriteGroupsSummaryText(w io.Writer, g *fairness.GroupsResult) error {
	bw := bufio.NewWriter(w)
	tw := &textWriter{w: bw}
	s := g.Summary
	if s.Title != "" {
		tw.line("%s", strings.Join(strings.Fields(s.Title), " "))
	}
	tw.line("Summary: %s", groupsHeading(g))
	if s.Synthetic {
		tw.line("Synthetic data: the numbers describe no real patients.")
	}
	tw.line("")
	t := &textTable{header: []string{"Comparison", "Metric", "Reference", "Comparison value", "Gap", "Gap interval", "Lead mechanism", "Contribution", "Share", "Verdict"},
		right: []bool{false, false, true, true, true, false, false, false, false, false}}
	for _, r := range groupsRows(g) {
		t.add(r.Comparison, r.Metric, r.Reference, r.Value, r.Gap, r.GapInterval, r.Lead, r.LeadContribution, r.LeadShare, r.Verdict)
	}
	t.dropEmpty()
	t.write(bw, "  ")
	tw.line("")
	tw.line("%s", groupsNote)
	if p := groupsPolicyLine(s); p != "" {
		tw.line("%s", p)
	}
	tw.line("")
	tw.list("Comparison groups not audited", groupsSkipped(s), "")
	tw.list("Assumptions and cautions", s.Assumptions, "")
	return bw.Flush()
}

// WriteGroupsMarkdown writes the audit of several comparison groups as
// Markdown: the summary matrix as a table, the groups skipped, then each
// comparison's report (WriteMarkdown) under its own heading level.
func WriteGroupsMarkdown(w io.Writer, g *fairness.GroupsResult) error {
	bw := bufio.NewWriter(w)
	s := g.Summary
	bw.WriteString("# Audit of several groups: summary\n\n")
	if s.Title != "" {
		bw.WriteString(mdText(s.Title) + "\n\n")
	}
	bw.WriteString(mdText(groupsHeading(g)) + ".\n\n")
	if s.Synthetic {
		bw.WriteString("**Synthetic data:** the numbers describe no real patients.\n\n")
	}
	bw.WriteString("| Comparison | Metric | Reference | Comparison value | Gap | Gap interval | Lead mechanism | Contribution | Share | Verdict |\n")
	bw.WriteString("| --- | --- | ---: | ---: | ---: | --- | --- | --- | --- | --- |\n")
	for _, r := range groupsRows(g) {
		cells := []string{mdText(r.Comparison), mdCodeCell(r.Metric), r.Reference, r.Value, r.Gap, r.GapInterval, mdText(r.Lead), r.LeadContribution, r.LeadShare, r.Verdict}
		bw.WriteString("| " + strings.Join(cells, " | ") + " |\n")
	}
	bw.WriteString("\n" + groupsNote + "\n\n")
	if p := groupsPolicyLine(s); p != "" {
		bw.WriteString(mdText(p) + "\n\n")
	}
	if sk := groupsSkipped(s); len(sk) > 0 {
		bw.WriteString("Comparison groups not audited:\n\n")
		for _, x := range sk {
			bw.WriteString("- " + mdText(x) + "\n")
		}
		bw.WriteString("\n")
	}
	if err := bw.Flush(); err != nil {
		return err
	}
	for _, r := range g.Results {
		if _, err := io.WriteString(w, "\n---\n\n"); err != nil {
			return err
		}
		if err := WriteMarkdown(w, r); err != nil {
			return err
		}
	}
	return nil
}
