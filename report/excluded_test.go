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
	got := excludedSentence(g)
	want := `Not audited: 57 rows whose "` + g.Column + `" value is neither "` + g.Reference + `" nor "` + g.Comparison + `": ` +
		`"Female" 40 (like "` + g.Comparison + `"), "unknown" 9, "x\u200b" 3, "a" 1, "b" 1, other values 3 rows; 2 rows without a group value.`
	if got != want {
		t.Errorf("got  %s\nwant %s", got, want)
	}
	if s := excludedSentence(handResult().Groups); s != "" {
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

// TestDemoSummaryWarningsAndCommand: the demo summary lists the warnings
// with their severity and hints the command the user ran.
func TestDemoSummaryWarningsAndCommand(t *testing.T) {
	res := handResult()
	res.Warnings = []fairness.Warning{{Kind: fairness.KindSmallGroup, Severity: fairness.SeverityNote, Message: "group \"men\" is small"}}
	var b strings.Builder
	if err := DemoSummary(&b, res, DemoOutputs{Dir: "d", Data: "c.csv", Spec: "s.yaml", Result: "r.json", Report: "r.html", Command: "go run ./cmd/gapwise"}); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Warnings:\n  - note: group \"men\" is small\n", "or run: go run ./cmd/gapwise decompose --spec d/s.yaml"} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("summary lacks %q:\n%s", want, b.String())
		}
	}
}
