package report

import (
	"bytes"
	_ "embed"
	"fmt"
	"html/template"
	"io"

	"github.com/gapwise/gapwise/fairness"
)

//go:embed templates/groups.html.tmpl
var groupsTemplateText string

var groupsTemplate = template.Must(template.New("groups").Parse(groupsTemplateText))

// groupsPage is the view of the summary page.
type groupsPage struct {
	Title, Heading, Note, PolicyLine string
	Synthetic                        bool
	Rows                             []groupsRow
	Links                            map[string]string // comparison value → its report file; absent: no link
	Skipped, Assumptions             []string
	Version, SpecFile, SpecSHA       string
	DataFile, DataSHA                string
	CSS                              template.CSS
	Policy                           template.HTMLAttr
}

// WriteGroupsHTML writes the summary of an audit of several comparison
// groups as one standalone page in the report's style (its stylesheet,
// palette and Content-Security-Policy, no script): the summary matrix,
// each comparison linked to its report file where the summary names one
// (fairness.ComparisonSummary.ReportFile), the groups skipped with the
// reason, and the assumptions. It returns w's error.
func WriteGroupsHTML(w io.Writer, g *fairness.GroupsResult) error {
	s := g.Summary
	p := groupsPage{Title: "Audit of several groups", Heading: groupsHeading(g), Note: groupsNote, PolicyLine: groupsPolicyLine(s),
		Synthetic: s.Synthetic, Rows: groupsRows(g), Links: map[string]string{}, Skipped: groupsSkipped(s), Assumptions: s.Assumptions,
		Version: s.Tool.Version, SpecFile: s.Inputs.SpecFile, SpecSHA: s.Inputs.SpecSHA256, DataFile: s.Inputs.DataFile, DataSHA: s.Inputs.DataSHA256}
	if s.Title != "" {
		p.Title = s.Title + ": several groups"
	}
	for _, c := range s.Comparisons {
		if c.ReportFile != "" {
			p.Links[Printable(c.Value)] = c.ReportFile
		}
	}
	for i := range p.Rows { // user text as every output prints it
		r := &p.Rows[i]
		r.Comparison, r.ComparisonID, r.Lead = Printable(r.Comparison), Printable(r.ComparisonID), Printable(r.Lead)
	}
	for i, x := range p.Skipped {
		p.Skipped[i] = Printable(x)
	}
	css := reportCSS
	inlineText(css, "style")
	p.CSS = template.CSS(css)
	p.Policy = template.HTMLAttr(`content="` + pagePolicy(nil, []string{css}) + `"`)
	var buf bytes.Buffer
	if err := groupsTemplate.Execute(&buf, p); err != nil {
		return fmt.Errorf("report: rendering HTML: %w", err)
	}
	_, err := w.Write(buf.Bytes())
	return err
}
