package report

import (
	"bytes"
	"encoding/json"
	"regexp"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

func renderHTML(t *testing.T, withDetails bool, edit func(r *fairness.Result)) string {
	t.Helper()
	res := handResult()
	if withDetails {
		res.Details = handDetails()
	}
	if edit != nil {
		edit(res)
	}
	var buf bytes.Buffer
	if err := WriteHTML(&buf, res); err != nil {
		t.Fatal(err)
	}
	return buf.String()
}

// tableRows returns the text of the cells of every body row of the table
// with the given id, tags stripped and whitespace collapsed.
func tableRows(t *testing.T, page, id string) [][]string {
	t.Helper()
	start := strings.Index(page, `id="`+id+`"`)
	if start < 0 {
		t.Fatalf("no table with id %q", id)
	}
	end := start + strings.Index(page[start:], "</table>")
	body := page[start:end]
	body = body[strings.Index(body, "<tbody>"):]
	var rows [][]string
	for _, tr := range strings.Split(body, "<tr")[1:] {
		var cells []string
		for _, td := range regexp.MustCompile(`(?s)<t[dh][^>]*>(.*?)</t[dh]>`).FindAllStringSubmatch(tr, -1) {
			cells = append(cells, cellText(td[1]))
		}
		rows = append(rows, cells)
	}
	return rows
}

var tagRE = regexp.MustCompile(`<[^>]*>`)

func cellText(s string) string {
	s = tagRE.ReplaceAllString(s, " ")
	s = strings.NewReplacer("&#43;", "+", "&amp;", "&", "&lt;", "<", "&gt;", ">", "&#34;", `"`, "&#39;", "'").Replace(s)
	return strings.Join(strings.Fields(s), " ")
}

func TestWriteHTMLSections(t *testing.T) {
	page := renderHTML(t, true, nil)
	for _, id := range []string{"overview", "overview-table", "overview-caution", "warnings-section", "warnings", "summary", "groups", "decomposition", "graph", "drilldown", "diagnostics", "assumptions", "reproducibility", "synthetic",
		"chart-forest", "chart-graph", "chart-reliability", "column-cards", "gw-metric"} {
		if !strings.Contains(page, `id="`+id+`"`) {
			t.Errorf("page lacks element #%s", id)
		}
	}
	for _, want := range []string{
		"not clinical or legal findings",
		"Local regulation and institutional review govern",
		"The causal graph is right enough.",
		`<option value="fnr" selected>false-negative rate</option>`,
		`<option value="brier">Brier score</option>`,
		`<li id="warning-2"><span class="gw-sev gw-sev-caution">caution</span> mechanism ferritin: largest weight carries 11% of the total</li>`,
	} {
		if !strings.Contains(page, want) {
			t.Errorf("page lacks %q", want)
		}
	}
	// The overview opens the page, the warnings follow it.
	main := page[strings.Index(page, "<main>"):]
	if !strings.HasPrefix(strings.TrimSpace(strings.TrimPrefix(main, "<main>")), `<section id="overview">`) ||
		strings.Index(main, `id="warnings-section"`) > strings.Index(main, `id="summary"`) {
		t.Errorf("the overview and then the warnings do not open the page")
	}
	if n := strings.Count(page, `data-chart="column"`); n != 4 {
		t.Errorf("%d column charts, want one per Details column (4)", n)
	}
}

// TestWriteHTMLTables checks that the tables show the Result's numbers,
// rounded by hand from the fixture (the same strings the Markdown shows).
func TestWriteHTMLTables(t *testing.T) {
	page := renderHTML(t, true, nil)
	tests := []struct {
		table string
		row   int
		want  []string
	}{
		// (Text is read with a space where a tag was.)
		{"overview-table", 0, []string{"false-negative rate", "12.0%", "21.0%", "+9.0 pts [+6.1, +11.8] pts",
			"how hb presents given anaemia : +6.1 pts (95% interval [+4.8, +7.3] pts); 68% of the gap", "Reliable , no warning concerns it"}},
		{"overview-table", 1, []string{"Brier score", "0.081", "0.074", "−0.007",
			"how often anaemia occurs given age : −0.004; 60% of the gap", "Reliable , no warning concerns it"}},
		{"metric-table", 0, []string{"false-negative rate", "12.0% [10.1%, 13.9%]", "21.0%", "+9.0 pts [+6.1, +11.8] pts", "200 / 190 positives"}},
		{"metric-table", 1, []string{"Brier score", "0.081", "0.074", "−0.007", "1,200 / 1,100 records"}},
		{"decomp-fnr", 0, []string{"age", "−1.2 pts", "[−2.0, −0.4] pts", "−1.0 pts", "+9.3 pts"}},
		{"decomp-fnr", 2, []string{"hb | anaemia", "+6.1 pts", "[+4.8, +7.3] pts", "+5.8 pts", "+2.0 pts"}},
		{"decomp-fnr", 3, []string{"ferritin | anaemia, hb unreliable", "0.0 pts", "–", "0.0 pts", "+7.9 pts"}},
		{"decomp-fnr", 4, []string{"Sum of contributions", "+7.9 pts", "", "", ""}},
		{"decomp-fnr", 5, []string{"Residual (not assigned)", "+1.1 pts", "", "", ""}},
		{"decomp-fnr", 6, []string{"Observed gap", "+9.0 pts", "[+6.1, +11.8] pts", "", ""}},
		{"decomp-brier", 1, []string{"anaemia | age", "−0.004", "–", "−0.004", "−0.002"}},
		{"diagnostics-table", 2, []string{"hb | anaemia", "hb", "quadratic", "linear", "0.810", "400", "33.3%", "2.00%", "1.012", "0.000", "0.0%", "n/a"}},
		{"group-sizes", 0, []string{"men", "reference", "1200", "200", "3"}},
	}
	for _, tt := range tests {
		rows := tableRows(t, page, tt.table)
		if tt.row >= len(rows) {
			t.Errorf("%s has %d rows, want row %d", tt.table, len(rows), tt.row)
			continue
		}
		if got := strings.Join(rows[tt.row], " ‖ "); got != strings.Join(tt.want, " ‖ ") {
			t.Errorf("%s row %d:\n got %s\nwant %s", tt.table, tt.row, got, strings.Join(tt.want, " ‖ "))
		}
	}
	// The confusion counts are Details' counts: the reference group's 200
	// records split as in handDetails (TP+FN = its events).
	d := handDetails()
	rows := tableRows(t, page, "reliability-table")
	if len(rows) != len(d.Reference.Curve)+len(d.Comparison.Curve) {
		t.Errorf("reliability table has %d rows, want %d", len(rows), len(d.Reference.Curve)+len(d.Comparison.Curve))
	}
	if !strings.Contains(page, "200 records, "+itoa(d.Reference.Events)+" with the outcome") {
		t.Errorf("reference group caption lacks its counts")
	}
}

func itoa(n int) string { b, _ := json.Marshal(n); return string(b) }

func TestWriteHTMLOptional(t *testing.T) {
	page := renderHTML(t, false, func(r *fairness.Result) {
		r.Synthetic = false
		r.Metrics[0].ReferenceCI, r.Metrics[0].GapCI = nil, nil
		for i := range r.Metrics[0].Contributions {
			r.Metrics[0].Contributions[i].CILow, r.Metrics[0].Contributions[i].CIHigh = nil, nil
		}
	})
	for _, absent := range []string{`id="synthetic"`, "Synthetic data", "interval [4.8", `class="gw-ci"`, `id="chart-reliability"`, `data-chart="column"`} {
		if strings.Contains(page, absent) {
			t.Errorf("page shows %q although the Result lacks it", absent)
		}
	}
	for _, want := range []string{"No bootstrap was run", "not in this result"} {
		if !strings.Contains(page, want) {
			t.Errorf("page lacks %q", want)
		}
	}
}

// TestWriteHTMLNoNetwork checks that nothing in the page refers to a
// resource on the network: no src/href/action/srcset/poster attribute, CSS
// url() or @import, and no script call that fetches, with an absolute or
// protocol-relative URL. The vendored echarts.min.js is checked apart: it
// builds markup strings such as `<img src="'+s+'"` for features we do not
// use (the image is a data URL it makes itself) and contains URL strings
// that are not resources (its licence header and XML namespace names such
// as "http://www.w3.org/2000/svg", which identify a namespace and are never
// fetched). So the page is scanned for resource references with the
// library's text cut out, and every URL string in the library must be one
// of those known non-resources. The page also carries a
// Content-Security-Policy that forbids any fetch; the browser test checks
// the behaviour.
func TestWriteHTMLNoNetwork(t *testing.T) {
	full := renderHTML(t, true, nil)
	if strings.Count(full, echartsJS) != 1 {
		t.Fatal("the page does not inline echarts.min.js exactly once")
	}
	page := strings.Replace(full, echartsJS, "", 1)
	known := map[string]bool{
		"http://www.apache.org/licenses/LICENSE-2.0":            true, // licence header comment
		"http://www.w3.org/1999/xlink":                          true, // XML namespace names
		"http://www.w3.org/2000/svg":                            true,
		"http://www.w3.org/2000/xmlns/":                         true,
		"http://www.w3.org/XML/1998/namespace":                  true,
		"https://github.com/ecomfe/zrender/blob/master/LICENSE": true, // licence comment
	}
	for _, u := range regexp.MustCompile(`https?://[^\s"'()<>]*`).FindAllString(echartsJS, -1) {
		if !known[u] {
			t.Errorf("echarts.min.js holds an unexpected URL %q: check whether it is fetched", u)
		}
	}
	patterns := []*regexp.Regexp{
		regexp.MustCompile(`(?i)\b(src|href|action|srcset|poster|data|formaction)\s*=\s*["']?\s*(https?:)?//`),
		regexp.MustCompile(`(?i)url\(\s*["']?\s*(https?:)?//`),
		regexp.MustCompile(`(?i)@import`),
		regexp.MustCompile(`(?i)<(link|iframe|img|object|embed|base)\b`),
		regexp.MustCompile(`(?i)\b(fetch|importScripts)\(\s*["'](https?:)?//`),
		regexp.MustCompile(`(?i)<script[^>]+src=`),
	}
	for _, re := range patterns {
		if loc := re.FindStringIndex(page); loc != nil {
			t.Errorf("network reference %q at byte %d", page[loc[0]:min(loc[1]+40, len(page))], loc[0])
		}
	}
	if !strings.Contains(page, `content="default-src 'none';`) {
		t.Error("page lacks its Content-Security-Policy")
	}
	// The test itself must be able to fail: a remote script is caught.
	if !patterns[0].MatchString(`<script src="https://example.org/x.js">`) {
		t.Error("pattern misses a remote script")
	}
}

// TestWriteHTMLEscapes checks that names from the data cannot inject
// markup into the page.
func TestWriteHTMLEscapes(t *testing.T) {
	page := renderHTML(t, false, func(r *fairness.Result) {
		r.Groups.Comparison = `<img src=x onerror=alert(1)>`
		r.Warnings = append(r.Warnings, fairness.Warning{Message: "`</script><b>x`"})
	})
	if strings.Contains(page, "<img src=x") || strings.Contains(page, "</script><b>") {
		t.Error("unescaped markup from the Result reached the page")
	}
}

func TestWriteHTMLDeterministic(t *testing.T) {
	a := renderHTML(t, true, nil)
	b := renderHTML(t, true, nil)
	if a != b {
		t.Error("two renderings of the same Result differ")
	}
}
