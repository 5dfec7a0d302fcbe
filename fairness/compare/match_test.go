package compare

import (
	"errors"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

func mustParse(t *testing.T, text string) *fairness.Result {
	t.Helper()
	r, err := Parse("r.json", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func TestComparability(t *testing.T) {
	base := mustParse(t, minimal)
	tests := []struct {
		name   string
		edit   func(r *fairness.Result)
		shared bool
		refuse string // part of the refusal; "" when accepted
	}{
		{"same", func(*fairness.Result) {}, false, ""},
		{"groups", func(r *fairness.Result) { r.Groups.Comparison = "other" }, false, "the groups differ"},
		{"groups even shared", func(r *fairness.Result) { r.Groups.Reference = "x" }, true, "the groups differ"},
		{"label", func(r *fairness.Result) { r.Label = "z" }, true, "the label differs"},
		{"metrics", func(r *fairness.Result) { r.Metrics[0].Metric = "fpr" }, false, "the metrics differ"},
		{"metrics shared none", func(r *fairness.Result) { r.Metrics[0].Metric = "fpr" }, true, "share no metric"},
		{"graph", func(r *fairness.Result) { r.Mechanisms[1].Parents = nil }, false, `node "y" has parents [a] in one and [] in the other`},
		{"graph shared", func(r *fairness.Result) { r.Mechanisms[1].Parents = nil }, true, ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			after := mustParse(t, minimal)
			tc.edit(after)
			rv, err := NewReview("a.json", base, "b.json", after, Options{Shared: tc.shared})
			if tc.refuse == "" {
				if err != nil {
					t.Fatalf("refused: %v", err)
				}
				return
			}
			if !errors.Is(err, ErrNotComparable) || !strings.Contains(err.Error(), tc.refuse) {
				t.Fatalf("error %v, want a refusal holding %q", err, tc.refuse)
			}
			_ = rv
		})
	}
}

func TestSharedLeavesOut(t *testing.T) {
	before, after := mustParse(t, minimal), mustParse(t, minimal)
	after.Mechanisms[1].Parents = nil
	rv, err := NewReview("a.json", before, "b.json", after, Options{Shared: true})
	if err != nil {
		t.Fatal(err)
	}
	mc := rv.Comparisons[0].Metrics[0]
	if len(mc.Contributions) != 1 || mc.Contributions[0].Node != "a" {
		t.Fatalf("contributions %+v, want only a's", mc.Contributions)
	}
	if len(rv.Omitted) != 1 || rv.Omitted[0].Name != "y" || !strings.Contains(rv.Omitted[0].Reason, "parents") {
		t.Errorf("omitted %+v, want y for its parents", rv.Omitted)
	}
	if !strings.Contains(strings.Join(rv.Notes, " "), "graphs differ") {
		t.Errorf("notes %q do not say the graphs differ", rv.Notes)
	}
}

func TestReviewChanges(t *testing.T) {
	before, after := mustParse(t, minimal), mustParse(t, minimal)
	after.Metrics[0].Gap = -0.02
	after.Metrics[0].Contributions[1].Value = 0.03
	before.Metrics[0].GapCI = &fairness.Interval{Low: -0.15, High: -0.05}
	after.Metrics[0].GapCI = &fairness.Interval{Low: -0.06, High: 0.02}
	before.Settings.Intervals = &fairness.IntervalSettings{}
	before.Settings.Intervals.Level = 0.95
	after.Settings.Intervals = &fairness.IntervalSettings{}
	after.Settings.Intervals.Level = 0.95
	rv, err := NewReview("a.json", before, "b.json", after, Options{})
	if err != nil {
		t.Fatal(err)
	}
	mc := rv.Comparisons[0].Metrics[0]
	if got := mc.Gap.Change; got != -0.02-(-0.1) {
		t.Errorf("gap change %v, want 0.08", got)
	}
	if got := mc.Contributions[1].Change.Change; got != 0.03-(-0.05) {
		t.Errorf("y change %v, want 0.08", got)
	}
	// Bonferroni: [−0.06 − (−0.05), 0.02 − (−0.15)] = [−0.01, 0.17].
	if ci := mc.Gap.ChangeCI; ci == nil || abs(ci.Low+0.01) > 1e-12 || abs(ci.High-0.17) > 1e-12 {
		t.Errorf("gap change interval %+v, want [−0.01, 0.17]", ci)
	}
	if rv.Intervals.Level < 0.8999 || rv.Intervals.Level > 0.9001 {
		t.Errorf("guaranteed level %v, want 0.90", rv.Intervals.Level)
	}
	if mc.Contributions[1].ChangeCI != nil {
		t.Error("a contribution without intervals got a change interval")
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
