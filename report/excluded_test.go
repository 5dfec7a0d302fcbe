package report

import (
	"bytes"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// excludedGroups has rows of other groups (more values than a report
// names, one a near-miss with a zero-width space) and rows without a group
// value.
func excludedGroups() fairness.GroupInfo {
	g := handResult().Groups
	g.Excluded = []fairness.ExcludedValue{
		{Value: "Female", Rows: 40, Resembles: g.Comparison}, {Value: "unknown", Rows: 9},
		{Value: "x\u200b", Rows: 3}, {Value: "a", Rows: 1}, {Value: "b", Rows: 1}, {Value: "c", Rows: 1}, {Value: "d", Rows: 1},
	}
	g.ExcludedRows, g.MissingGroupRows = 57, 2
	return g
}

// TestExcludedSentence: the five largest values with their rows, the rest
// summed (2 listed rows plus 1 beyond the list), the near-miss marked,
// invisible characters shown, and rows without a group value.
func TestExcludedSentence(t *testing.T) {
	g := excludedGroups()
	got := excludedSentence(&fairness.Result{Groups: g})
	want := `Not audited: 57 rows whose "` + g.Column + `" value is neither "` + g.Reference + `" nor "` + g.Comparison + `": ` +
		`"Female" 40 (like "` + g.Comparison + `"), "unknown" 9, "x\u200b" 3, "a" 1, "b" 1, other values 3 rows; 2 rows without a group value.`
	if got != want {
		t.Errorf("got  %s\nwant %s", got, want)
	}
	if s := excludedSentence(handResult()); s != "" {
		t.Errorf("no excluded rows: %q", s)
	}
}

// TestExcludedInEveryOutput: text, Markdown, HTML and the check plan all
// say which rows were left out.
func TestExcludedInEveryOutput(t *testing.T) {
	res := handResult()
	res.Groups = excludedGroups()
	var text, md, page bytes.Buffer
	if err := WriteText(&text, res); err != nil {
		t.Fatal(err)
	}
	if err := WriteMarkdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if err := WriteHTML(&page, res); err != nil {
		t.Fatal(err)
	}
	var plan strings.Builder
	p := &fairness.PlanInfo{Groups: res.Groups, Metrics: []string{"fnr"}}
	if err := Plan(&plan, &fairness.Spec{File: "a.yaml"}, p); err != nil {
		t.Fatal(err)
	}
	for name, out := range map[string]string{
		"text":     text.String(),
		"markdown": md.String(),
		"html":     page.String(),
		"plan":     plan.String(),
	} {
		if !strings.Contains(out, "Not audited: 57 rows") || !strings.Contains(out, "2 rows without a group value") {
			t.Errorf("%s output does not report the excluded rows", name)
		}
	}
	if !strings.Contains(page.String(), `&#34;Female&#34; 40`) {
		t.Error("HTML does not show the quoted value escaped")
	}
}

// TestDemoSummaryWarningsAndCommand: the demo summary lists the warnings,
// most serious first with their severity, and hints the command the user
// ran, each word quoted for the shell where it needs it.
func TestDemoSummaryWarningsAndCommand(t *testing.T) {
	res := handResult()
	res.Warnings = append(res.Warnings, fairness.Warning{Kind: fairness.KindSmallGroup, Severity: fairness.SeverityNote, Message: "group \"men\" is small"})
	res.Warnings[0], res.Warnings[2] = res.Warnings[2], res.Warnings[0] // the note first: the summary reorders
	cases := []struct {
		name    string
		command []string
		dir     string
		want    string
	}{
		{"go run", []string{"go", "run", "./cmd/gapwise"}, "d", "or run next:\n  go run ./cmd/gapwise decompose --spec d/s.yaml\n"},
		{"binary on PATH", nil, "d", "or run next:\n  gapwise decompose --spec d/s.yaml\n"},
		{"paths with spaces and quotes", []string{"/opt/my tools/gapwise"}, "it's here", `or run next:` + "\n" + `  '/opt/my tools/gapwise' decompose --spec 'it'\''s here/s.yaml'` + "\n"},
	}
	for _, c := range cases {
		var b strings.Builder
		if err := DemoSummary(&b, res, DemoOutputs{Dir: c.dir, Data: "c.csv", Spec: "s.yaml", Result: "r.json", Report: "r.html", Command: c.command}); err != nil {
			t.Fatal(err)
		}
		for _, want := range []string{
			"Warnings (most serious first):\n  1. unreliable: the contribution of `ferritin` rests on 96 effective records",
			"\n  2. caution: mechanism ferritin: largest weight carries 11% of the total\n  3. note: group \"men\" is small\n",
			c.want,
		} {
			if !strings.Contains(b.String(), want) {
				t.Errorf("%s: summary lacks %q:\n%s", c.name, want, b.String())
			}
		}
	}
}
