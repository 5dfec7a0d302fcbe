package report

import (
	"bytes"
	"math"
	"regexp"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// withDiagnostics adds to handResult the settings and weight diagnostics
// that the reports show: a title, two-sided estimation with clipping, a
// 90% fast bootstrap with two failed replicates, per-mechanism overlap
// checks, candidate odds checks, hybrid weights and effective records. The
// numbers are invented; expected strings are their rounding by hand.
func withDiagnostics(r *fairness.Result) {
	r.Title = "Anaemia screening, spring audit"
	r.Settings.EstimateFrom = "both"
	r.Settings.ClipRatios = 0.99
	r.Settings.ExactLimit = 16
	r.Settings.Intervals = &fairness.IntervalSettings{Intervals: fairness.Intervals{Replicates: 100, Level: 0.9, KeepRatios: true, Form: fairness.FormPercentile}, Failed: 2}
	for i := range r.Mechanisms {
		m := &r.Mechanisms[i]
		m.ExtremeShare = 0.001 * float64(i)
		m.WorstStratumMean = 1 + 0.05*float64(i)
		m.ComparisonESS = 900 - 100*float64(i)
		ref, cmp, ext := 0.3+0.1*float64(i), 0.25, 0.003
		m.TailShape, m.ComparisonTailShape, m.ComparisonExtremeShare = &ref, &cmp, &ext
		m.ClippedReference, m.ClippedComparison = 12+i, 11+i
		for j := range m.Losses {
			m.Losses[j].OddsCheck = 1.02 + 0.01*float64(j)
		}
	}
	r.Weights = []fairness.WeightSide{
		{Side: "reference", Records: 1200, AllCoalitions: true,
			Far:   fairness.HybridWeight{ComparisonNodes: []string{"age", "anaemia", "hb", "ferritin"}, ESS: 300, MaxShare: 0.031},
			Worst: fairness.HybridWeight{ComparisonNodes: []string{"hb", "ferritin"}, ESS: 240, MaxShare: 0.045}},
		{Side: "comparison", Records: 1100, AllCoalitions: false,
			Far:   fairness.HybridWeight{ComparisonNodes: []string{}, ESS: 500, MaxShare: 0.012},
			Worst: fairness.HybridWeight{ComparisonNodes: []string{"age"}, ESS: 450, MaxShare: 0.013}},
	}
	r.Metrics[0].EffectiveRecords = 812.44
	r.Metrics[1].EffectiveRecords = 1503
}

func TestWriteTextDiagnostics(t *testing.T) {
	res := handResult()
	withDiagnostics(res)
	var b bytes.Buffer
	if err := WriteText(&b, res); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{
		"Anaemia screening, spring audit\ngapwise 0.1.0-test:", // title above the tool line
		"90% interval",           // the level of settings.intervals, not a fixed 95%
		"[0.1010, 0.1390]",       // reference interval
		"worst-fifth mean ratio", // column headings
		"weights > 20", "comparison ESS", "comparison > 20", "clipped ref", "clipped cmp",
		"hb | anaemia            quadratic   linear       0.8100   400.0     0.3330            0.0200      1.0120                  1.1000        0.0020        0.50           700.0           0.0030             0.25           14           13",
		"ferritin | anaemia, hb  linear           0.6890      1.0200", // candidate, log loss, odds check
		"ferritin | anaemia, hb  quadratic        0.6910      1.0300",
		"odds check: n_ref/n_cmp",
		"reference      1200  farthest  age, anaemia, hb, ferritin  300.0     0.2500            0.0310", // ESS share 300/1200
		"comparison     1100  farthest  none",
		"searched among the empty, full, single and all-but-one coalitions only", // comparison side was not searched fully
		"fnr                 812.4",
		"brier              1503.0",
		"estimated from       both records",
		"log-ratios clipped   to their central 99%",
		"exact Shapley up to  16 mechanisms",
		"intervals            100 bootstrap replicates, fitted density ratios kept (fast mode: contribution intervals approximate, too narrow), percentile form (the replicates' quantiles), level 90%; 2 could not be computed",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("missing %q in\n%s", want, out)
		}
	}
}

func TestWriteMarkdownTitleAndLevel(t *testing.T) {
	res := handResult()
	withDiagnostics(res)
	var b bytes.Buffer
	if err := WriteMarkdown(&b, res); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{
		"## Anaemia screening, spring audit\n\nPerformance audit of `risk`: women compared with men.",
		"| Mechanism | Contribution | approximate 90% interval | Alone | Gap if equalised |", // withDiagnostics keeps the ratios
		"Intervals in brackets: 100 bootstrap replicates",
		"is +9.0 pts (90% interval [+6.1, +11.8] pts)",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("missing %q in\n%s", want, out)
		}
	}
}

// TestHybridRows: one row per side and hybrid (farthest, then worst) with
// the share ESS / records done by hand (300/1200 = 0.25, 240/1200 = 0.2,
// 500/1100, 450/1100), no share for a side without records, and partial
// set by the comparison side's partial search.
func TestHybridRows(t *testing.T) {
	res := handResult()
	withDiagnostics(res)
	rows, partial := hybridRows(res)
	want := []struct {
		side, which string
		nodes       int
		ess, share  float64
	}{
		{"reference", "farthest", 4, 300, 0.25}, {"reference", "worst", 2, 240, 0.2},
		{"comparison", "farthest", 0, 500, 500.0 / 1100}, {"comparison", "worst", 1, 450, 450.0 / 1100},
	}
	if len(rows) != len(want) || !partial {
		t.Fatalf("rows %+v, partial %v; want %d rows, partial", rows, partial, len(want))
	}
	for i, w := range want {
		r := rows[i]
		if r.Side != w.side || r.Which != w.which || len(r.Nodes) != w.nodes || r.ESS != w.ess || r.ESSShare == nil || math.Abs(*r.ESSShare-w.share) > 1e-12 {
			t.Errorf("row %d = %+v, want %+v", i, r, w)
		}
	}
	res.Weights[0].Records, res.Weights[1].AllCoalitions = 0, true
	rows, partial = hybridRows(res)
	if rows[0].ESSShare != nil || rows[1].ESSShare != nil || partial {
		t.Errorf("no records: shares %v %v, partial %v; want none, not partial", rows[0].ESSShare, rows[1].ESSShare, partial)
	}
	var b bytes.Buffer
	if err := WriteText(&b, res); err != nil {
		t.Fatal(err)
	}
	page := diagnostics(res)
	if !regexp.MustCompile(`farthest +age, anaemia, hb, ferritin +300\.0 +n/a `).MatchString(b.String()) || page.Hybrids[0].ESSShare != "n/a" || page.Hybrids[2].ESSShare != "45.5%" {
		t.Errorf("text or HTML share of a side without records is not n/a (HTML rows %+v)", page.Hybrids)
	}
}
