package report

import (
	"fmt"
	"regexp"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// suppressedResult is handResult with its details, three excluded group
// values (two small) and 3 dropped rows, suppressed at threshold t with
// fairness.Suppress; plain is the same before suppression.
func suppressedResult(t *testing.T, th int) (res, plain *fairness.Result) {
	t.Helper()
	build := func() *fairness.Result {
		r := handResult()
		r.Details = handDetails()
		r.Groups.Excluded = []fairness.ExcludedValue{{Value: "unknown", Rows: 40}, {Value: "other", Rows: 4}, {Value: "n/a", Rows: 2}}
		r.Groups.ExcludedRows = 46
		return r
	}
	res, plain = build(), build()
	if err := fairness.Suppress(res, th); err != nil {
		t.Fatal(err)
	}
	if len(res.Suppression.Cells) == 0 {
		t.Fatal("nothing withheld")
	}
	return res, plain
}

// TestSuppressionInReports: with small-cell suppression every output says
// it is on and what it does; the HTML page shows each withheld count of
// the confusion tables, reliability table and column cards as "<T" or
// "withheld" (never its value), draws no bar or point for it (breaking
// the calibration curve there) and gives
// its confusion cell no shade; text, Markdown and HTML show the small
// dropped rows and excluded values as "<T"; without suppression none of
// it appears. The counts are handDetails' (analytic: described by
// fairness.Describe from a fixed sequence), the dropped rows handResult's.
func TestSuppressionInReports(t *testing.T) {
	const th = 10
	res, plain := suppressedResult(t, th)
	outs := renderAll(t, res)
	plainOuts := renderAll(t, plain)
	for name, out := range outs {
		if !strings.Contains(out, "Small-cell suppression is on: counts from 1 to 9 are shown as “<10”") &&
			!strings.Contains(out, "Small-cell suppression is on: counts from 1 to 9 are shown as “&lt;10”") {
			t.Errorf("%s output does not say suppression is on", name)
		}
		if strings.Contains(plainOuts[name], "Small-cell suppression") {
			t.Errorf("%s output without suppression mentions it", name)
		}
	}
	// Text: the dropped rows and the excluded values.
	text := strings.Join(strings.Fields(outs["text"]), " ")
	for _, want := range []string{
		"reference men 1200 200 <10",
		`Not audited: 46 rows whose "sex" value is neither "men" nor "women": "unknown" withheld, "other" <10, "n/a" <10.`, // 40 would give 4 + 2 = 46 − 40 away
		"small cells counts from 1 to 9 withheld",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("text lacks %q", want)
		}
	}
	if !strings.Contains(outs["markdown"], `&quot;other&quot; &lt;10`) {
		t.Error("Markdown does not withhold the small excluded value")
	}

	if !strings.Contains(outs["html"], `<td class="num" data-label="Dropped (missing values)">&lt;10</td>`) {
		t.Error("page shows the small dropped rows")
	}

	// The details at a threshold above some of handDetails' counts (its
	// 200 records per group have 28 and 38 true positives, bins of 6 to
	// 36 records).
	const high = 40
	res, plain = suppressedResult(t, high)
	page := renderAll(t, res)["html"]
	// Confusion tables: each cell's text and shade.
	cells := regexp.MustCompile(`<td class="num (gw-tint-\d+)">([^<]*)<small>(true positives|false negatives|false positives|true negatives)</small>`)
	names := map[string]string{"true positives": "tp", "false negatives": "fn", "false positives": "fp", "true negatives": "tn"}
	found := 0
	for k, m := range cells.FindAllStringSubmatch(page, -1) {
		role := "reference"
		if k >= 4 {
			role = "comparison"
		}
		gd := plain.Details.Reference
		if role == "comparison" {
			gd = plain.Details.Comparison
		}
		v := map[string]float64{"tp": gd.Confusion.TP, "fn": gd.Confusion.FN, "fp": gd.Confusion.FP, "tn": gd.Confusion.TN}[names[m[3]]]
		want, held := withheldText(res, fairness.ConfusionPath(role, names[m[3]]))
		found++
		switch {
		case held && (m[2] != strings.ReplaceAll(want, "<", "&lt;") || m[1] != "gw-tint-0"):
			t.Errorf("%s %s: withheld (%s) but shows %q with %s", role, m[3], want, m[2], m[1])
		case !held && m[2] != formatCount(v):
			t.Errorf("%s %s: shows %q, want %v", role, m[3], m[2], v)
		case !held && v >= 1 && v < high:
			t.Errorf("%s %s: small count %v shown", role, m[3], v)
		}
	}
	if found != 8 {
		t.Fatalf("found %d confusion cells, want 8", found)
	}
	// Reliability table and chart.
	rows := tableRows(t, page, "reliability-table")
	data := pageData(t, page)
	series := data["reliability"].(map[string]any)["series"].([]any)
	points := func(s any) int { // drawn points: not the "-" that breaks the curve
		d, _ := s.(map[string]any)["data"].([]any)
		n := 0
		for _, p := range d {
			if p.(map[string]any)["value"] != "-" {
				n++
			}
		}
		return n
	}
	drawn := [2]int{points(series[1]), points(series[2])}
	k := 0
	for g, gd := range [2]fairness.GroupDetails{plain.Details.Reference, plain.Details.Comparison} {
		role := []string{"reference", "comparison"}[g]
		hidden := 0
		for j, b := range gd.Curve {
			row := rows[k]
			k++
			text, held := withheldText(res, fairness.ReliabilityPath(role, j, "count"))
			if held {
				hidden++
				if row[2] != text || row[3] == fmt.Sprintf("%.1f%%", 100*b.MeanScore) || row[4] == fmt.Sprintf("%.1f%%", 100*b.EventRate) {
					t.Errorf("%s bin %d withheld but the row reads %v", role, j, row)
				}
			} else if row[2] != fmt.Sprint(b.Count) {
				t.Errorf("%s bin %d: %v, want %d records", role, j, row, b.Count)
			}
		}
		if drawn[g] != len(gd.Curve)-hidden {
			t.Errorf("%s: %d points drawn, want %d (%d bins withheld)", role, drawn[g], len(gd.Curve)-hidden, hidden)
		}
	}
	// Column charts: a withheld share has no bar.
	for i, c := range plain.Details.Columns {
		chart := data["columns"].(map[string]any)[c.Name].(map[string]any)
		for g, s := range chart["series"].([]any)[:2] {
			for j, item := range s.(map[string]any)["data"].([]any) {
				v := item.(map[string]any)["value"]
				_, held := withheldText(res, fairness.SharePath(i, []string{"reference", "comparison"}[g], j))
				if held != (v == "-") {
					t.Errorf("column %s group %d bin %d: bar %v, withheld %v", c.Name, g, j, v, held)
				}
			}
		}
	}
	if !strings.Contains(page, "<dt>Small-cell suppression</dt><dd>counts from 1 to 39 withheld") {
		t.Error("page settings lack the suppression")
	}
	if hidden := len(res.Suppression.Cells); hidden < 20 {
		t.Errorf("only %d values withheld at %d", hidden, high)
	}
}
