package fairness

import (
	"errors"
	"slices"
	"strings"
	"testing"
)

// The hidden_factor key: off, a mapping, and each mistake naming its line
// and key.
func TestHiddenFactorSpec(t *testing.T) {
	tests := []struct {
		name, add string
		want      HiddenFactorSpec
		line      int
		key, msg  string
	}{
		{"absent", "", HiddenFactorSpec{}, 0, "", ""},
		{"off", "hidden_factor: off\n", HiddenFactorSpec{Off: true}, 0, "", ""},
		{"factors sorted", "hidden_factor: {factors: [2, 1.5, 1.5], max_factor: 4}\n", HiddenFactorSpec{Factors: []float64{1.5, 2}, MaxFactor: 4}, 0, "", ""},
		{"factor below 1", "hidden_factor: {factors: [0.9]}\n", HiddenFactorSpec{}, 18, "hidden_factor.factors", "at least 1"},
		{"max not above 1", "hidden_factor: {max_factor: 1}\n", HiddenFactorSpec{}, 18, "hidden_factor.max_factor", "above 1"},
		{"empty list", "hidden_factor: {factors: []}\n", HiddenFactorSpec{}, 18, "hidden_factor.factors", "1 to 10"},
		{"scalar", "hidden_factor: 2\n", HiddenFactorSpec{}, 18, "hidden_factor", "off or a mapping"},
		{"misspelt", "hidden_factor: {factor: [2]}\n", HiddenFactorSpec{}, 18, "hidden_factor.factor", `did you mean "factors"`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := ParseSpec("spec.yaml", []byte(exampleSpec+tc.add))
			if tc.msg == "" {
				if err != nil {
					t.Fatal(err)
				}
				if s.HiddenFactor.Off != tc.want.Off || !slices.Equal(s.HiddenFactor.Factors, tc.want.Factors) || s.HiddenFactor.MaxFactor != tc.want.MaxFactor {
					t.Fatalf("got %+v, want %+v", s.HiddenFactor, tc.want)
				}
				return
			}
			var se *SpecError
			if !errors.As(err, &se) || !errors.Is(err, ErrBadValue) && !errors.Is(err, ErrUnknownKey) {
				t.Fatalf("error %v, want a *SpecError", err)
			}
			if se.Line != tc.line || se.Key != tc.key || !strings.Contains(err.Error(), tc.msg) {
				t.Fatalf("error %q (line %d, key %q), want line %d, key %q, %q", err, se.Line, se.Key, tc.line, tc.key, tc.msg)
			}
		})
	}
}

// An audit carries the section by default, with the default factors; a
// factor of 1 gives the reported values exactly (no unrecorded factor:
// the point estimate, by definition of the model); off removes it.
func TestRunHiddenFactor(t *testing.T) {
	spec := writeAudit(t, smallSpec+"hidden_factor: {factors: [1, 1.25]}\n", smallData(400))
	r, err := Run(spec, RunOptions{})
	if err != nil {
		t.Fatal(err)
	}
	hf := r.HiddenFactor
	if hf == nil || !slices.Equal(hf.Factors, []float64{1, 1.25}) || len(hf.Metrics) != len(r.Metrics) {
		t.Fatalf("section %+v", hf)
	}
	for m, hm := range hf.Metrics {
		mr := r.Metrics[m]
		if hm.Skipped != "" {
			t.Fatalf("%s skipped: %s", hm.Metric, hm.Skipped)
		}
		if b := hm.EstimatedGap.Bounds[0]; b.Low != mr.Estimated || b.High != mr.Estimated {
			t.Errorf("%s: gap at Λ = 1 [%v, %v], estimate %v", hm.Metric, b.Low, b.High, mr.Estimated)
		}
		for i, c := range hm.Contributions {
			if c.Node != mr.Contributions[i].Node || c.Bounds[0].Low != mr.Contributions[i].Value || c.Bounds[0].High != mr.Contributions[i].Value {
				t.Errorf("%s %s: Λ = 1 gives %+v, contribution %v", hm.Metric, c.Node, c.Bounds[0], mr.Contributions[i].Value)
			}
			if c.Bounds[1].Low > c.Value || c.Bounds[1].High < c.Value {
				t.Errorf("%s %s: Λ = 1.25 gives %+v, not around %v", hm.Metric, c.Node, c.Bounds[1], c.Value)
			}
		}
	}
	spec.HiddenFactor = HiddenFactorSpec{Off: true}
	if r, err = Run(spec, RunOptions{}); err != nil || r.HiddenFactor != nil {
		t.Fatalf("off: section %+v, error %v", r.HiddenFactor, err)
	}
}

// The warning fires for a clear lead whose sign a factor of at most 1.25
// could reverse, and not for one whose interval already includes zero.
func TestHiddenFactorWarning(t *testing.T) {
	f := func(x float64) *float64 { return &x }
	base := func(ciLow float64, rev float64) *Result {
		return &Result{
			Mechanisms: []MechanismResult{{Node: "hb", Mechanism: "hb"}, {Node: "age", Mechanism: "age"}},
			Metrics: []MetricResult{{Metric: "fnr", Gap: 0.1, Estimated: 0.1, GapCI: &Interval{Low: -0.01, High: 0.2},
				Contributions: []Contribution{{Node: "hb", Value: 0.08, CILow: f(ciLow), CIHigh: f(0.12)}, {Node: "age", Value: 0.02}}}},
			HiddenFactor: &HiddenFactor{Metrics: []HiddenFactorMetric{{Metric: "fnr", LeadNode: "hb",
				EstimatedGap:  &HiddenFactorValue{Value: 0.1, ReversalFactor: f(1.1)},
				Contributions: []HiddenFactorValue{{Node: "hb", Value: 0.08, ReversalFactor: f(rev)}, {Node: "age", Value: 0.02, ReversalFactor: f(1.01)}}}}},
		}
	}
	tests := []struct {
		name      string
		r         *Result
		fires     bool
		wantNodes []string
	}{
		{"clear lead, fragile", base(0.03, 1.2), true, []string{"hb"}},
		{"clear lead, robust", base(0.03, 1.6), false, nil},
		{"lead interval includes zero", base(-0.01, 1.2), false, nil},
	}
	for _, tc := range tests {
		ws := hiddenFactorWarnings(tc.r)
		if (len(ws) == 1) != tc.fires {
			t.Fatalf("%s: warnings %v", tc.name, ws)
		}
		if tc.fires && (!slices.Equal(ws[0].Nodes, tc.wantNodes) || ws[0].Kind != KindHiddenFactor || !strings.Contains(ws[0].Message, "up to 25%")) {
			t.Errorf("%s: %+v", tc.name, ws[0])
		}
	}
}
