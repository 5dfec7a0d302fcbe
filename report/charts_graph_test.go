package report

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

func TestRampColour(t *testing.T) {
	for _, tt := range []struct {
		t    float64
		want string
	}{{0, colourNeutral}, {1, colourWidens}, {-1, colourNarrows}, {2, colourWidens}} {
		if got := rampColour(tt.t); got != tt.want {
			t.Errorf("rampColour(%v) = %s, want %s", tt.t, got, tt.want)
		}
	}
	// Halfway between #F3F0E8 and #E69F00, rounded half away from zero:
	// (243 − 6.5, 240 − 40.5, 232 − 116) → (237, 200, 116).
	if got, want := rampColour(0.5), fmt.Sprintf("#%02X%02X%02X", 237, 200, 116); got != want {
		t.Errorf("rampColour(0.5) = %s, want %s", got, want)
	}
}

// TestGapShade: a node's shade is positive when its contribution has the
// gap's sign (widens it) and negative otherwise, relative to the largest
// |φ|, and 0 when the gap prints as zero or the contribution is not
// estimable (by hand: −0.03 of a −0.05 gap with largest 0.06 is +0.5).
func TestGapShade(t *testing.T) {
	for _, tt := range []struct {
		gap  float64
		c    fairness.Contribution
		want float64
	}{
		{-0.05, fairness.Contribution{Value: -0.03}, 0.5},
		{-0.05, fairness.Contribution{Value: 0.06}, -1},
		{0.05, fairness.Contribution{Value: 0.03}, 0.5},
		{0.0002, fairness.Contribution{Value: 0.03}, 0},
		{0.05, fairness.Contribution{Value: 0.03, NotEstimable: true}, 0},
	} {
		if got := gapShade(fairness.MetricResult{Metric: "fnr", Gap: tt.gap}, tt.c, 0.06); math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("gap %v, %+v: shade %v, want %v", tt.gap, tt.c, got, tt.want)
		}
	}
}

// TestGraphLabelsNoTemplateFields: a node's label is an ECharts formatter
// string, in which ECharts replaces {a}…{e} and {@dimension} (its
// formatTpl, read in the vendored assets/echarts.min.js), so a node named
// with braces must reach it with the braces replaced, as tooltips have
// them, or the label would show something other than the name.
func TestGraphLabelsNoTemplateFields(t *testing.T) {
	res := hostileResult("{b}{@x}{c|y}")
	labels := 0
	for _, m := range res.Metrics {
		o := graphChart(res, m)
		items := o["series"].([]any)[0].(map[string]any)["data"].([]any)
		for _, it := range items {
			l, _ := it.(map[string]any)["label"].(map[string]any)
			f, ok := l["formatter"].(string)
			if !ok {
				continue
			}
			labels++
			if strings.ContainsAny(f, "{}") || !strings.Contains(f, "(b)(@x)(c|y)") {
				t.Errorf("%s: label formatter %q, want the name with braces as parentheses", m.Metric, f)
			}
		}
	}
	if labels == 0 {
		t.Fatal("no node label has a formatter")
	}
}
