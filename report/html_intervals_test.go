package report

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// pageData decodes the chart data embedded in a rendered page.
func pageData(t *testing.T, page string) map[string]any {
	t.Helper()
	const open = "window.gapwiseData = "
	i := strings.Index(page, open)
	if i < 0 {
		t.Fatal("page has no chart data")
	}
	rest := page[i+len(open):]
	var data map[string]any
	if err := json.NewDecoder(strings.NewReader(rest)).Decode(&data); err != nil {
		t.Fatalf("chart data does not decode: %v", err)
	}
	return data
}

// forestItems returns the items of a metric's contribution chart.
func forestItems(t *testing.T, data map[string]any, metric string) []map[string]any {
	t.Helper()
	chart, ok := data["forest"].(map[string]any)[metric].(map[string]any)
	if !ok {
		t.Fatalf("no contribution chart for %s", metric)
	}
	for _, s := range chart["series"].([]any) {
		if sm := s.(map[string]any); sm["id"] == "gw-forest" {
			var out []map[string]any
			for _, it := range sm["data"].([]any) {
				out = append(out, it.(map[string]any))
			}
			return out
		}
	}
	t.Fatalf("%s: no gw-forest series", metric)
	return nil
}

// TestWriteHTMLIntervals: when the Result has bootstrap intervals, the
// contribution chart draws each interval around its value, and the
// tables print them with the level of settings.intervals; without them
// no row has an interval. handResult's FNR has intervals for two
// contributions (age, hb) and the gap; Brier has none.
func TestWriteHTMLIntervals(t *testing.T) {
	page := renderHTML(t, true, func(r *fairness.Result) {
		r.Settings.Intervals = &fairness.IntervalSettings{Intervals: fairness.Intervals{Replicates: 200, Level: 0.9, Form: fairness.FormPercentile}}
	})
	data := pageData(t, page)
	// Rows in graph order: age, anaemia, hb, ferritin, then the residual
	// and the gap. Values and intervals are in points (the fixture's
	// numbers times 100, by hand).
	want := map[float64][3]float64{0: {-1.2, -2.0, -0.4}, 2: {6.1, 4.8, 7.3}, 5: {9.0, 6.1, 11.8}}
	n := 0
	for _, item := range forestItems(t, data, "fnr") {
		v := item["value"].([]any)
		row := v[3].(float64)
		if item["gwInterval"] != true {
			continue
		}
		n++
		if w, ok := want[row]; !ok || !near(v[0].(float64), w[0]) || !near(v[1].(float64), w[1]) || !near(v[2].(float64), w[2]) {
			t.Errorf("row %v: value and interval %v, want %v", row, v[:3], w)
		}
	}
	if n != 3 {
		t.Errorf("%d FNR rows with an interval, want 3 (age, hb, gap)", n)
	}
	// The axis ticks fall on multiples of the step, both ends included.
	x := data["forest"].(map[string]any)["fnr"].(map[string]any)["xAxis"].([]any)[0].(map[string]any)
	lo, hi, step := x["min"].(float64), x["max"].(float64), x["interval"].(float64)
	if n := (hi - lo) / step; step <= 0 || math.Abs(n-math.Round(n)) > 1e-9 || math.Abs(lo/step-math.Round(lo/step)) > 1e-9 {
		t.Errorf("axis [%v, %v] is not a whole number of steps %v", lo, hi, step)
	}
	for _, item := range forestItems(t, data, "brier") {
		if item["gwInterval"] == true {
			t.Errorf("Brier row %v has an interval but the result has none", item["value"])
		}
	}
	for _, want := range []string{
		`<th class="num">90% interval</th>`,
		"its 90% interval from the bootstrap (200 bootstrap replicates, classifiers refitted in each, percentile form (the replicates&#39; quantiles), level 90%)",
		`<span class="gw-ci">[10.1%, 13.9%]</span>`,
		"<dt>Intervals</dt><dd>200 bootstrap replicates",
	} {
		if !strings.Contains(page, want) {
			t.Errorf("page lacks %q", want)
		}
	}

	none := renderHTML(t, true, func(r *fairness.Result) {
		for i := range r.Metrics {
			r.Metrics[i].ReferenceCI, r.Metrics[i].GapCI = nil, nil
			for j := range r.Metrics[i].Contributions {
				r.Metrics[i].Contributions[j].CILow, r.Metrics[i].Contributions[j].CIHigh = nil, nil
			}
		}
	})
	noData := pageData(t, none)
	for _, m := range []string{"fnr", "brier"} {
		for _, item := range forestItems(t, noData, m) {
			if item["gwInterval"] == true {
				t.Errorf("%s: an interval without intervals: %v", m, item["value"])
			}
		}
	}
}

func near(a, b float64) bool { return a-b < 1e-6 && b-a < 1e-6 }

// TestWriteHTMLDiagnostics: the title heads the page, and the weight
// diagnostics of the Result appear in the diagnostics tables (numbers from
// withDiagnostics, rounded by hand).
func TestWriteHTMLDiagnostics(t *testing.T) {
	page := renderHTML(t, true, withDiagnostics)
	for _, want := range []string{
		"<title>Anaemia screening, spring audit</title>",
		`<dd id="audit-title">Anaemia screening, spring audit</dd>`,
		"<dt>Hybrids estimated from</dt><dd>both</dd>",
		"<dt>Log-ratios clipped to</dt><dd>central 99% of each mechanism&#39;s log-ratios</dd>",
		"<dt>Exact Shapley values up to</dt><dd>16 mechanisms (sampled above)</dd>",
		"searched here only among the empty, full, single and all-but-one coalitions",
	} {
		if !strings.Contains(page, want) {
			t.Errorf("page lacks %q", want)
		}
	}
	if strings.Contains(page, "<dt>Cohort</dt>") {
		t.Error("the header shows the data file although the Result has a title")
	}
	cases := []struct {
		table string
		row   int
		want  []string
	}{
		{"diagnostics-table", 2, []string{"hb | anaemia", "hb", "quadratic", "linear", "0.810", "400", "33.3%", "2.00%", "1.012", "1.100", "0.2%", "0.50", "700", "0.3%", "0.25", "14", "13"}},
		{"candidates-table", 0, []string{"ferritin | anaemia, hb", "linear", "0.6890", "1.020", "yes"}},
		{"candidates-table", 1, []string{"ferritin | anaemia, hb", "quadratic", "0.6910", "1.030", ""}},
		{"hybrids-table", 0, []string{"reference", "1200", "farthest", "age, anaemia, hb, ferritin", "300", "25.0%", "3.10%"}},
		{"hybrids-table", 2, []string{"comparison", "1100", "farthest", "none", "500", "45.5%", "1.20%"}},
		{"effective-table", 0, []string{"false-negative rate", "812"}},
		{"effective-table", 1, []string{"Brier score", "1503"}},
	}
	for _, c := range cases {
		rows := tableRows(t, page, c.table)
		if c.row >= len(rows) || strings.Join(rows[c.row], " ‖ ") != strings.Join(c.want, " ‖ ") {
			got := []string{}
			if c.row < len(rows) {
				got = rows[c.row]
			}
			t.Errorf("%s row %d:\n got %s\nwant %s", c.table, c.row, strings.Join(got, " ‖ "), strings.Join(c.want, " ‖ "))
		}
	}
}

// TestWriteHTMLStdError: sampled Shapley values add a standard error
// column to the decomposition table.
func TestWriteHTMLStdError(t *testing.T) {
	page := renderHTML(t, false, func(r *fairness.Result) {
		r.Metrics[0].Contributions[2].StdError = ptr(0.0036)
	})
	rows := tableRows(t, page, "decomp-fnr")
	if got := strings.Join(rows[2], " ‖ "); got != "hb | anaemia ‖ +6.1 pts ‖ 0.4 pts ‖ [+4.8, +7.3] pts ‖ +5.8 pts ‖ +2.0 pts" {
		t.Errorf("hb row: %s", got)
	}
	if !strings.Contains(page, "Monte Carlo standard error") {
		t.Error("no explanation of the standard error")
	}
}
