package report

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// namedResult is handResult (with details) with display names for its
// groups, nodes and columns, the model and an audit date.
func namedResult() *fairness.Result {
	r := handResult()
	r.Details = handDetails()
	r.Names = &fairness.Names{
		Groups: &fairness.GroupNames{Reference: "adult men", Comparison: "adult women"},
		Nodes: map[string]fairness.DisplayName{
			"hb": {Name: "haemoglobin", Unit: "g/dL"}, "ferritin": {Name: "serum ferritin", Unit: "µg/L"}, "age": {Name: "age", Unit: "years"},
		},
		Columns: map[string]fairness.DisplayName{
			"hb": {Name: "haemoglobin", Unit: "g/dL"}, "ferritin": {Name: "serum ferritin", Unit: "µg/L"}, "age": {Name: "age", Unit: "years"},
			"risk": {Name: "risk score"}, "sex": {Name: "sex at birth"},
		},
	}
	// A game over the 2^4 coalitions, so that the what-if panel shows.
	for S := range 16 {
		r.Metrics[0].Coalitions = append(r.Metrics[0].Coalitions, fairness.Coalition{ComparisonNodes: []string{}, ChangeFromReference: float64(S) / 200})
	}
	r.Model = &fairness.ModelInfo{Name: "ScreenRisk", Version: "2.1"}
	r.AuditDate = "2026-12-03"
	return r
}

// rawMechanisms are handResult's mechanisms with a renamed node, which no
// output may print once the nodes have display names.
var rawMechanisms = []string{"hb | anaemia", "ferritin | anaemia, hb"}

// TestNamesInText: the text report names the model, the date, the score,
// the groups and every mechanism by their display names.
func TestNamesInText(t *testing.T) {
	var b bytes.Buffer
	if err := WriteText(&b, namedResult()); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{
		`audit of "risk score" (risk) against label "anaemia"`,
		"model audited: ScreenRisk (version 2.1)", "audit date: 2026-12-03",
		"Overview: gap = adult women − adult men",
		`Groups (column "sex at birth" (sex))`, "reference   adult men    men", "comparison  adult women  women",
		"haemoglobin | anaemia ", "serum ferritin | anaemia, haemoglobin ",
		"how `haemoglobin` presents given `anaemia`",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("text report lacks %q", want)
		}
	}
	for _, raw := range rawMechanisms {
		if strings.Contains(out, raw) {
			t.Errorf("text report prints the raw mechanism %q", raw)
		}
	}
}

// TestNamesInMarkdown: the same for Markdown, where the names pass
// through its escaping (mdText, mdCode, mdCodeCell).
func TestNamesInMarkdown(t *testing.T) {
	var b bytes.Buffer
	if err := WriteMarkdown(&b, namedResult()); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{
		"## Performance audit of ScreenRisk \\(version 2.1\\): adult women compared with adult men",
		"Score of the model: `risk score` (`risk`). Audit date: 2026-12-03.",
		"| Metric | adult men (reference) | adult women (comparison) |",
		"Groups by `sex at birth` (`sex`): reference adult men \\(men\\)",
		"| `haemoglobin \\| anaemia` |", "| `serum ferritin \\| anaemia, haemoglobin` (unreliable) |",
		"The false-negative rate is 21.0% for adult women and 12.0% for adult men",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("Markdown report lacks %q", want)
		}
	}
	for _, raw := range rawMechanisms {
		if strings.Contains(out, raw) {
			t.Errorf("Markdown report prints the raw mechanism %q", raw)
		}
	}
}

// TestNamesInHTML: the page's question, facts, tables, charts, graph,
// what-if panel, column cards, diagnostics and footer use the display
// names, while the page script's keys stay the identifiers.
func TestNamesInHTML(t *testing.T) {
	var b bytes.Buffer
	if err := WriteHTML(&b, namedResult()); err != nil {
		t.Fatal(err)
	}
	page := b.String()
	for _, want := range []string{
		"<title>Performance audit of ScreenRisk (version 2.1): adult women compared with adult men</title>",
		"<h1>How does ScreenRisk (version 2.1) perform for adult women compared with adult men?</h1>",
		`<dd id="audit-model">ScreenRisk (version 2.1)</dd>`, `<dd id="audit-date">2026-12-03</dd>`,
		`<code>sex at birth</code> (<code>sex</code>): <span class="gw-ref">adult men (men)</span>`,
		`<dd><code>risk score</code> (<code>risk</code>), positive when`,
		`<th class="num">adult men (reference)</th>`,
		`<code>haemoglobin | anaemia</code>`, `<code>serum ferritin | anaemia, haemoglobin</code>`,
		`<h3><code>haemoglobin, g/dL</code> (<code>hb</code>)`, `<h3><code>age, years</code> <span`,
		`<td data-label="Columns">serum ferritin, µg/L (ferritin)</td>`,
		`<li><code>serum ferritin</code> ← anaemia, haemoglobin</li>`,
		`value="ferritin"> <code>serum ferritin | anaemia, haemoglobin</code>`,
		`the reference group's (adult men)`,
		"<dt>Audit date</dt><dd>2026-12-03</dd>", "<dt>Model audited</dt><dd>ScreenRisk (version 2.1)</dd>",
		`data-column="hb"`, // the script's key
	} {
		if !strings.Contains(page, want) {
			t.Errorf("page lacks %q", want)
		}
	}
	for _, raw := range rawMechanisms {
		if strings.Contains(page, raw) {
			t.Errorf("page prints the raw mechanism %q", raw)
		}
	}
	data := pageData(t, page)
	var labels []string
	forest := data["forest"].(map[string]any)["fnr"].(map[string]any)
	for _, l := range forest["yAxis"].([]any)[0].(map[string]any)["data"].([]any) {
		labels = append(labels, l.(string))
	}
	if strings.Join(labels, "; ") != "age; anaemia | age; haemoglobin | anaemia; serum ferritin | anaemia, haemoglobin; residual (not assigned); observed gap" {
		t.Errorf("contribution chart rows %q", labels)
	}
	graph := data["graph"].(map[string]any)["fnr"].(map[string]any)
	js := mustJSON(t, graph)
	if !strings.Contains(js, "serum ferritin\\n") || !strings.Contains(js, `"name":"ferritin"`) {
		t.Errorf("graph labels lack the display name, or its nodes lost their identifiers: %.400s", js)
	}
	col := mustJSON(t, data["columns"].(map[string]any)["hb"])
	if !strings.Contains(col, `"name":"adult men"`) || !strings.Contains(col, `"name":"adult women"`) {
		t.Errorf("column chart series are not named by the groups: %.300s", col)
	}
}

// mustJSON encodes v for a substring check.
func mustJSON(t *testing.T, v any) string {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestNamesInPolicy: the policy section names the comparison group by
// its display name in every report.
func TestNamesInPolicy(t *testing.T) {
	res := policyResult(t)
	res.Names = &fairness.Names{Groups: &fairness.GroupNames{Comparison: "adult women"}}
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
	for name, tc := range map[string]struct{ out, want string }{
		"text":     {text.String(), "  1 (line 4)  fnr             adult women  |gap| <= 5.00 pts"},
		"Markdown": {md.String(), "| 1 (line 4) | `fnr` | adult women | \\|gap\\| ≤ 5.00 pts |"},
		"HTML":     {page.String(), `<td data-label="Metric"><code>fnr</code></td><td data-label="Group">adult women</td>`},
	} {
		if !strings.Contains(tc.out, tc.want) {
			t.Errorf("%s: the policy section lacks %q", name, tc.want)
		}
	}
}
