package report

import (
	"fmt"
	"strings"
	"testing"
)

func TestRampColour(t *testing.T) {
	for _, tt := range []struct {
		t    float64
		want string
	}{{0, colourNeutral}, {1, colourUp}, {-1, colourDown}, {2, colourUp}} {
		if got := rampColour(tt.t); got != tt.want {
			t.Errorf("rampColour(%v) = %s, want %s", tt.t, got, tt.want)
		}
	}
	// Halfway between #F3F0E8 and #D55E00: ((243+213)/2, (240+94)/2, (232+0)/2).
	if got, want := rampColour(0.5), fmt.Sprintf("#%02X%02X%02X", 228, 167, 116); got != want {
		t.Errorf("rampColour(0.5) = %s, want %s", got, want)
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
