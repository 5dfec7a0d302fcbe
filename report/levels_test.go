package report

import (
	"fmt"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// levelDetails describes 300 invented records (no source) with the label
// anaemia as a numeric 0/1 column, a categorical site and a numeric hb.
func levelDetails() *fairness.Details {
	ds := &fairness.Dataset{Columns: []fairness.Column{
		{Name: "anaemia"}, {Name: "site", Categorical: true, Levels: []string{"north", "south"}}, {Name: "hb"},
	}}
	for i := range 300 {
		cmp := i%3 == 0
		y := float64(i % 4 / 3) // 1 for i ≡ 3 (mod 4)
		ds.Labels = append(ds.Labels, y)
		ds.Scores = append(ds.Scores, 0.2+0.6*y)
		ds.Comparison = append(ds.Comparison, cmp)
		ds.Columns[0].Values = append(ds.Columns[0].Values, y)
		ds.Columns[1].Values = append(ds.Columns[1].Values, float64(i%5/4))
		ds.Columns[2].Values = append(ds.Columns[2].Values, 12+float64(i%7)/2-y)
	}
	return fairness.Describe(ds, 0.5, 10)
}

// cardRows returns the cells of the body rows of the column card of col,
// tags stripped.
func cardRows(t *testing.T, page, col string) (head []string, rows [][]string) {
	t.Helper()
	start := strings.Index(page, `<article class="gw-card" data-column="`+col+`">`)
	if start < 0 {
		t.Fatalf("no card for %s", col)
	}
	card := page[start : start+strings.Index(page[start:], "</article>")]
	cell := regexp.MustCompile(`<t[hd][^>]*>(.*?)</t[hd]>`)
	strip := regexp.MustCompile(`<[^>]+>`)
	for i, tr := range regexp.MustCompile(`(?s)<tr>(.*?)</tr>`).FindAllStringSubmatch(card, -1) {
		var cells []string
		for _, m := range cell.FindAllStringSubmatch(tr[1], -1) {
			cells = append(cells, strings.TrimSpace(strip.ReplaceAllString(m[1], "")))
		}
		if i == 0 {
			head = cells
		} else {
			rows = append(rows, cells)
		}
	}
	return head, rows
}

// TestColumnCardLevels: a 0/1 column is drawn and tabled by its two
// values, with each group's share and records (fairness.Describe's
// counts), and the label's values by the label's words; a categorical
// column likewise by its levels; a numeric one by its bins.
func TestColumnCardLevels(t *testing.T) {
	d := levelDetails()
	page := renderHTML(t, false, func(r *fairness.Result) {
		r.Details = d
		r.LabelValues = &fairness.LabelValues{Positive: "anaemic", Negative: "not anaemic"}
	})
	an := d.Columns[0]
	if !an.Binary {
		t.Fatalf("anaemia not described by its values: %+v", an)
	}
	head, rows := cardRows(t, page, "anaemia")
	if !slices.Equal(head, []string{"Level", "men", "men records", "women", "women records"}) {
		t.Errorf("anaemia table head %q", head)
	}
	for j, word := range []string{"not anaemic", "anaemic"} {
		want := []string{word, fmt.Sprintf("%.1f%%", 100*an.Reference[j]), fmt.Sprint(an.CountsReference[j]),
			fmt.Sprintf("%.1f%%", 100*an.Comparison[j]), fmt.Sprint(an.CountsComparison[j])}
		if j >= len(rows) || !slices.Equal(rows[j], want) {
			t.Errorf("anaemia row %d: %q, want %q", j, rows, want)
		}
	}
	if len(rows) != 2 || !strings.Contains(page, "numeric, two values") {
		t.Errorf("anaemia: %d rows, or the card does not call it numeric with two values", len(rows))
	}
	cols := pageData(t, page)["columns"].(map[string]any)
	labels := func(col string) []any {
		return cols[col].(map[string]any)["xAxis"].([]any)[0].(map[string]any)["data"].([]any)
	}
	if got := labels("anaemia"); !slices.Equal(got, []any{"not anaemic", "anaemic"}) {
		t.Errorf("anaemia chart categories %v", got)
	}
	if got := labels("site"); !slices.Equal(got, []any{"north", "south"}) {
		t.Errorf("site chart categories %v", got)
	}
	if _, rows := cardRows(t, page, "site"); len(rows) != 2 || rows[0][2] != fmt.Sprint(d.Columns[1].CountsReference[0]) {
		t.Errorf("site rows %q", rows)
	}
	if head, rows := cardRows(t, page, "hb"); head[0] != "Bin" || len(rows) != 10 || len(labels("hb")) != 10 {
		t.Errorf("hb: head %q, %d rows, %d chart bins; want 10 numeric bins", head, len(rows), len(labels("hb")))
	}
}

// TestColumnCardLevelNames: the level names of the spec's names key
// (fairness.Names.Levels) name the levels in the card's table and chart,
// before the label's words; a level without one is shown as it is.
func TestColumnCardLevelNames(t *testing.T) {
	page := renderHTML(t, false, func(r *fairness.Result) {
		r.Details = levelDetails()
		r.LabelValues = &fairness.LabelValues{Positive: "anaemic", Negative: "not anaemic"}
		r.Names = &fairness.Names{Levels: map[string]map[string]string{
			"anaemia": {"1": "anaemia present"}, "site": {"north": "North clinic", "south": "South clinic"}}}
	})
	cols := pageData(t, page)["columns"].(map[string]any)
	for col, want := range map[string][]any{"anaemia": {"not anaemic", "anaemia present"}, "site": {"North clinic", "South clinic"}} {
		got := cols[col].(map[string]any)["xAxis"].([]any)[0].(map[string]any)["data"].([]any)
		if !slices.Equal(got, want) {
			t.Errorf("%s chart categories %v, want %v", col, got, want)
		}
		_, rows := cardRows(t, page, col)
		for j, w := range want {
			if j >= len(rows) || rows[j][0] != w {
				t.Errorf("%s table rows %q, want level %q", col, rows, w)
			}
		}
	}
}
