package fairness

import (
	"errors"
	"math"
	"testing"
)

// TestCheckFinite: the walk finds a non-finite number anywhere in a
// result and names its JSON path and owner; a finite result passes.
func TestCheckFinite(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	cases := []struct {
		name  string
		set   func(r *Result)
		field string
		about string
	}{
		{"finite", func(*Result) {}, "", ""},
		{"gap", func(r *Result) { r.Metrics[0].Gap = nan }, "metrics[0].gap", "metric fnr"},
		{"contribution", func(r *Result) { r.Metrics[0].Contributions[1].Value = inf }, "metrics[0].contributions[1].value", "metric fnr, contribution of hb | age"},
		{"pointer", func(r *Result) { r.Metrics[0].Contributions[0].CIHigh = &inf }, "metrics[0].contributions[0].ci_high", "metric fnr, contribution of age"},
		{"mechanism", func(r *Result) { r.Mechanisms[1].MeanRatio = inf }, "mechanisms[1].mean_ratio", "mechanism hb | age"},
		{"column", func(r *Result) { r.Details.Columns[0].SDRef = -inf }, "details.columns[0].sd_reference", "column hb"},
		{"threshold", func(r *Result) { r.Threshold = nan }, "threshold", ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := &Result{
				Metrics:    []MetricResult{{Metric: "fnr", Contributions: []Contribution{{Mechanism: "age"}, {Mechanism: "hb | age"}}}},
				Mechanisms: []MechanismResult{{Mechanism: "age"}, {Mechanism: "hb | age"}},
				Details:    &Details{Columns: []ColumnDetails{{Name: "hb"}}},
			}
			c.set(r)
			err := checkFinite(r)
			var ne *NonFiniteError
			if c.field == "" {
				if err != nil {
					t.Fatalf("finite result: %v", err)
				}
				return
			}
			if !errors.As(err, &ne) {
				t.Fatalf("got %v, want a *NonFiniteError", err)
			}
			if ne.Field != c.field || ne.About != c.about {
				t.Errorf("field %q about %q, want %q about %q", ne.Field, ne.About, c.field, c.about)
			}
			if IsInputError(err) {
				t.Error("a non-finite estimate is a failure of the tool, not bad input")
			}
		})
	}
}
