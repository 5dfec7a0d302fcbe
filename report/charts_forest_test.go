package report

import (
	"math"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestForestRows: the contribution chart has one row per mechanism in
// graph order, then the residual and the gap; a contribution with the
// gap's sign widens it, one against it narrows it, one that prints as
// zero is neutral; an unreliable one is hollow and says so; a
// not-estimable one has no value. Expected roles are read off the
// fixture's signs by hand (gap +9.0 points).
func TestForestRows(t *testing.T) {
	res := handResult()
	res.Metrics[0].Contributions[1].NotEstimable = true // anaemia
	o := forestChart(res, res.Metrics[0])
	items := forestItemsOf(t, o)
	want := []struct{ kind, role, label, colour string }{
		{"mechanism", "narrows", "−1.2 pts", colourNarrows},
		{"unestimable", "neutral", "not estimable", colourResidual},
		{"mechanism", "widens", "+6.1 pts", colourWidens},
		{"mechanism", "neutral", "0.0 pts · unreliable", colourResidual},
		{"residual", "neutral", "+1.1 pts", colourResidual},
		{"gap", "neutral", "+9.0 pts", colourResidual},
	}
	if len(items) != len(want) {
		t.Fatalf("%d rows, want %d", len(items), len(want))
	}
	for i, w := range want {
		it := items[i]
		colour, _ := it["itemStyle"].(map[string]any)["color"].(string)
		if it["gwKind"] != w.kind || it["gwRole"] != w.role || it["name"] != w.label || colour != w.colour {
			t.Errorf("row %d: %v %v %q %v, want %+v", i, it["gwKind"], it["gwRole"], it["name"], colour, w)
		}
		if hollow := it["gwHollow"] == true; hollow != (i == 3) {
			t.Errorf("row %d: hollow %v", i, hollow)
		}
	}
	if items[1]["gwInterval"] == true {
		t.Error("a not-estimable contribution has an interval")
	}
	labels := o["yAxis"].([]any)[0].(map[string]any)["data"].([]any)
	if labels[0] != "age" || labels[4] != "residual (not assigned)" || labels[5] != "observed gap" {
		t.Errorf("row labels %v", labels)
	}
	if name := o["xAxis"].([]any)[0].(map[string]any)["name"]; name != "percentage points (pts), comparison − reference" {
		t.Errorf("axis name %v", name)
	}
	// A gap that prints as zero leaves nothing to widen or narrow.
	res.Metrics[0].Gap = 0.0004
	for i, it := range forestItemsOf(t, forestChart(res, res.Metrics[0])) {
		if it["gwRole"] != "neutral" {
			t.Errorf("row %d: role %v with no gap", i, it["gwRole"])
		}
	}
}

// TestForestAxis: the x axis holds 0 and every value and interval, on a
// 1-2-5 step, and never goes past the differences the metric can have:
// ±100 points for a rate, ±1 for the Brier score, ±2 for calibration-in-
// the-large (range [−1, 1]); the log loss has no bound. By hand:
// niceAxis(−99, 99) widens to ±114.8 and rounds to ±150 at step 50.
func TestForestAxis(t *testing.T) {
	row := func(v, lo, hi float64) forestRow { return forestRow{Kind: "mechanism", Value: v, Low: &lo, High: &hi} }
	tests := []struct {
		metric         string
		rows           []forestRow
		wantLo, wantHi float64
	}{
		{"fnr", []forestRow{row(0.5, -0.99, 0.99)}, -100, 100},
		{"brier", []forestRow{row(0.5, -0.99, 0.99)}, -1, 1},
		{"calibration_in_the_large", []forestRow{row(1, -1.98, 1.98)}, -2, 2},
		{"log_loss", []forestRow{row(1, -0.99, 0.99)}, -1.5, 1.5},
		{"fpr", []forestRow{row(0.05, 0.03, 0.07)}, -2, 8}, // 0 is on the axis: [0, 7] ± 0.56, step niceStep(1.62) = 2
	}
	for _, tc := range tests {
		lo, hi, step := forestAxis(tc.metric, tc.rows)
		if math.Abs(lo-tc.wantLo) > 1e-9 || math.Abs(hi-tc.wantHi) > 1e-9 || step <= 0 {
			t.Errorf("%s: axis [%v, %v] step %v, want [%v, %v]", tc.metric, lo, hi, step, tc.wantLo, tc.wantHi)
		}
	}
}

func forestItemsOf(t *testing.T, o chartOption) []map[string]any {
	t.Helper()
	for _, s := range o["series"].([]any) {
		if sm := s.(map[string]any); sm["id"] == "gw-forest" {
			var out []map[string]any
			for _, it := range sm["data"].([]any) {
				out = append(out, it.(map[string]any))
			}
			return out
		}
	}
	t.Fatal("no gw-forest series")
	return nil
}

// TestShareAxisMax: a column chart's share axis ends at the largest
// share rounded up to a 1-2-5 step, and never above 100% (by hand: 37%
// rounds up to 40% at step 10; 96% would round to 100 at step 20 and 99%
// to 100 too, not 120).
func TestShareAxisMax(t *testing.T) {
	for _, tc := range []struct {
		ref, cmp []float64
		want     float64
	}{
		{[]float64{0.37, 0.2}, []float64{0.3, 0.1}, 40},
		{[]float64{0.96, 0.04}, []float64{0.5, 0.5}, 100},
		{[]float64{0.99, 0.01}, []float64{0.98, 0.02}, 100},
	} {
		if got := shareAxisMax(fairness.ColumnDetails{Reference: tc.ref, Comparison: tc.cmp}); got != tc.want {
			t.Errorf("shares %v, %v: axis top %v, want %v", tc.ref, tc.cmp, got, tc.want)
		}
	}
}
