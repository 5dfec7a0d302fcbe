package policy

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func mustParse(t *testing.T, src string) *Policy {
	t.Helper()
	p, err := Parse("p.yaml", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// TestFourFifthsWorkedExample checks the preset on the worked example of
// the agencies' Questions and Answers on the Uniform Guidelines (1979;
// question 12, its number from memory, the figures as quoted from its
// answer): selection rates of 60 % for whites, 45 % for American Indians,
// 48 % for Hispanics and 51 % for Blacks give impact ratios 45/60 = 75 %,
// 48/60 = 80 % and 51/60 = 85 % against the highest group, and "adverse
// impact is indicated for American Indians but not for Hispanics or
// Blacks": 80 % is not below four-fifths (29 CFR 1607.4(D) speaks of a
// rate "less than four-fifths"). The rates are built from counts of 100
// applicants, as a run computes them.
func TestFourFifthsWorkedExample(t *testing.T) {
	p := mustParse(t, "rules: [{preset: four-fifths}]\n")
	white := 60.0 / 100
	var subjects []Subject
	for _, g := range []struct {
		name     string
		selected float64
	}{{"American Indian", 45}, {"Hispanic", 48}, {"Black", 51}} {
		subjects = append(subjects, Subject{Metric: "selection_rate", Reference: "White", Comparison: g.name,
			ReferenceValue: white, ComparisonValue: g.selected / 100})
	}
	out, err := Evaluate(p, subjects)
	if err != nil {
		t.Fatal(err)
	}
	want := []struct {
		cmp    string
		ratio  float64
		status string
	}{{"American Indian", 0.75, StatusBreach}, {"Hispanic", 0.80, StatusPass}, {"Black", 0.85, StatusPass}}
	if len(out.Checks) != len(want) || out.Passed || out.Breaches != 1 {
		t.Fatalf("outcome %+v", out)
	}
	for i, w := range want {
		c := out.Checks[i]
		if c.Comparison != w.cmp || c.Status != w.status || math.Abs(*c.Value-w.ratio) > 1e-12 || c.Limit != LimitMinRatio || c.LimitValue != 0.8 {
			t.Errorf("%s: %+v, want ratio %v %s", w.cmp, c, w.ratio, w.status)
		}
		if c.Preset != PresetFourFifths || !strings.Contains(c.Note, "analogy") || !strings.Contains(c.Note, "29 CFR 1607.4(D)") {
			t.Errorf("%s: preset %q note %q", w.cmp, c.Preset, c.Note)
		}
	}
}

// TestFourFifthsSymmetric: with two groups the ratio is lower ÷ higher, so
// a comparison group flagged more often than the reference is judged
// against its own rate (the rule compares with the highest group).
func TestFourFifthsSymmetric(t *testing.T) {
	p := mustParse(t, "rules: [{preset: four-fifths}]\n")
	out, err := Evaluate(p, []Subject{{Metric: "selection_rate", Reference: "A", Comparison: "B", ReferenceValue: 0.30, ComparisonValue: 0.50}})
	if err != nil {
		t.Fatal(err)
	}
	if c := out.Checks[0]; c.Status != StatusBreach || math.Abs(*c.Value-0.6) > 1e-12 {
		t.Errorf("check %+v, want 0.3/0.5 = 0.6 breach", c)
	}
}

// TestJudgeBounds: the judged value on the estimate and on each interval
// bound, worked by hand from the definitions in Evaluate's comment.
func TestJudgeBounds(t *testing.T) {
	gapRule := "unjudged: breach\nrules:\n  - {metric: fnr, max_gap: 0.05, judge: %s}\n"
	ratioRule := "unjudged: breach\nrules:\n  - {metric: fnr, min_ratio: 0.8, judge: %s}\n"
	s := Subject{Metric: "fnr", Reference: "M", Comparison: "F", ReferenceValue: 0.10, ComparisonValue: 0.14,
		GapCI: &Interval{0.01, 0.07}, LowerToHigherCI: &Interval{0.6, 0.95}, Level: 0.95}
	straddle := s
	straddle.GapCI = &Interval{-0.02, 0.07}
	for _, tc := range []struct {
		name, rule, judge string
		s                 Subject
		value             float64
		status            string
	}{
		{"gap estimate", gapRule, "estimate", s, 0.04, StatusPass},
		{"gap worst", gapRule, "worst_bound", s, 0.07, StatusBreach},
		{"gap best", gapRule, "best_bound", s, 0.01, StatusPass},
		{"gap best holding 0", gapRule, "best_bound", straddle, 0, StatusPass},
		{"ratio estimate", ratioRule, "estimate", s, 0.10 / 0.14, StatusBreach},
		{"ratio worst", ratioRule, "worst_bound", s, 0.6, StatusBreach},
		{"ratio best", ratioRule, "best_bound", s, 0.95, StatusPass},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out, err := Evaluate(mustParse(t, strings.Replace(tc.rule, "%s", tc.judge, 1)), []Subject{tc.s})
			if err != nil {
				t.Fatal(err)
			}
			c := out.Checks[0]
			if c.Status != tc.status || c.Value == nil || math.Abs(*c.Value-tc.value) > 1e-12 {
				t.Errorf("check %+v, want value %v %s", c, tc.value, tc.status)
			}
			if (tc.judge == "estimate") != (c.Level == 0) {
				t.Errorf("level %v for judge %s", c.Level, tc.judge)
			}
			if out.Passed != (tc.status == StatusPass) {
				t.Errorf("passed %v", out.Passed)
			}
		})
	}
}

// TestAtLimit: a value exactly at its limit in decimal arithmetic keeps
// it although float64 puts it a hair beyond (0.14 − 0.09 =
// 0.05000000000000002; 8 of 100 against 10 of 100 flagged, exactly
// four-fifths, gives 0.08 ÷ 0.10 = 0.7999999999999999); a value just
// beyond breaches.
func TestAtLimit(t *testing.T) {
	eight, ten := 8.0, 10.0 // variables: a constant expression would be exact
	if q := (eight / 100) / (ten / 100); q >= 0.8 {
		t.Fatalf("the example no longer shows the rounding it guards against: %v", q)
	}
	ff := mustParse(t, "rules: [{preset: four-fifths}]\n")
	for _, tc := range []struct {
		flagged float64
		status  string
	}{{8, StatusPass}, {7.99, StatusBreach}} {
		out, err := Evaluate(ff, []Subject{{Metric: "selection_rate", Comparison: "F", ReferenceValue: 10.0 / 100, ComparisonValue: tc.flagged / 100}})
		if err != nil || out.Checks[0].Status != tc.status {
			t.Errorf("%v of 100 flagged: %+v, %v; want %s", tc.flagged, out.Checks, err, tc.status)
		}
	}
	p := mustParse(t, "rules: [{metric: fnr, max_gap: 0.05}]\n")
	for _, tc := range []struct {
		cmp    float64
		status string
	}{{0.14, StatusPass}, {0.1401, StatusBreach}} {
		out, err := Evaluate(p, []Subject{{Metric: "fnr", Comparison: "F", ReferenceValue: 0.09, ComparisonValue: tc.cmp}})
		if err != nil || out.Checks[0].Status != tc.status {
			t.Errorf("comparison %v: %+v, %v; want %s", tc.cmp, out, err, tc.status)
		}
	}
}

// TestUnjudged: a check without the numbers it needs is an error under
// unjudged: error (naming the rule's line) and a counted breach under
// unjudged: breach; a rule for other groups is skipped and counts nothing.
func TestUnjudged(t *testing.T) {
	noCI := Subject{Metric: "fnr", Comparison: "F", Reference: "M", ReferenceValue: 0.1, ComparisonValue: 0.11}
	zeros := Subject{Metric: "tpr", Comparison: "F", Reference: "M"}
	zerosCI := zeros
	zerosCI.GapCI = &Interval{-0.01, 0.01}
	rules := "rules:\n  - {metric: fnr, max_gap: 0.05, judge: worst_bound}\n  - {metric: tpr, min_ratio: 0.8}\n  - {metric: ppv, max_gap: 0.1}\n  - {metric: fnr, max_gap: 0.0001, groups: [X]}\n"
	for _, tc := range []struct {
		name, rules string
		line        int
		reason      string
	}{
		{"no intervals", rules, 2, "judge: worst_bound needs bootstrap intervals"},
		{"ratio of zeros", "rules:\n  - {metric: tpr, min_ratio: 0.8}\n", 2, "both groups' values are 0"},
		{"metric not audited", "rules:\n  - {preset: four-fifths}\n", 2, "the run did not audit selection_rate"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Evaluate(mustParse(t, tc.rules), []Subject{noCI, zeros})
			var pe *Error
			if !errors.As(err, &pe) || !errors.Is(err, ErrUnjudged) || pe.Line != tc.line || !strings.Contains(err.Error(), tc.reason) || !strings.Contains(err.Error(), "set unjudged: breach") {
				t.Errorf("error %v, want line %d: %s", err, tc.line, tc.reason)
			}
		})
	}
	_, err := Evaluate(mustParse(t, "rules: [{metric: tpr, min_ratio: 0.8, judge: worst_bound}]\n"), []Subject{zerosCI})
	if !errors.Is(err, ErrUnjudged) || !strings.Contains(err.Error(), "no interval of the ratio") {
		t.Errorf("gap interval without a ratio interval: %v", err)
	}
	out, err := Evaluate(mustParse(t, "unjudged: breach\n"+rules), []Subject{noCI, zeros})
	if err != nil {
		t.Fatal(err)
	}
	status := map[int]string{}
	for _, c := range out.Checks {
		status[c.Rule] = c.Status
	}
	if status[1] != StatusUnjudged || status[2] != StatusUnjudged || status[3] != StatusUnjudged || status[4] != StatusSkipped || out.Breaches != 3 || out.Passed {
		t.Errorf("outcome %+v", out)
	}
	for _, c := range out.Checks {
		if c.Rule == 3 && !strings.Contains(c.Reason, "did not audit ppv") {
			t.Errorf("rule 3 reason %q", c.Reason)
		}
	}
}

// TestPreflight: under unjudged: error a bound without intervals and a
// metric the run lacks are refused before the run; rules for other
// groups, and any rule under unjudged: breach, are not.
func TestPreflight(t *testing.T) {
	run := Run{Metrics: []string{"fnr", "selection_rate"}, Comparisons: []string{"F"}}
	for _, tc := range []struct {
		src, want string
	}{
		{"rules: [{preset: four-fifths}]\n", ""},
		{"rules: [{metric: fnr, max_gap: 0.1, judge: best_bound}]\n", "p.yaml:1: key rules[1]: judge: best_bound needs bootstrap intervals"},
		{"rules:\n  - {preset: four-fifths}\n  - {metric: fpr, max_gap: 0.1}\n", "p.yaml:3: key rules[2]: the rule is on fpr, which the run does not audit"},
		{"rules: [{metric: fpr, max_gap: 0.1, groups: [M]}]\n", ""},
		{"unjudged: breach\nrules: [{metric: fpr, max_gap: 0.1, judge: worst_bound}]\n", ""},
	} {
		err := Preflight(mustParse(t, tc.src), run)
		if tc.want == "" && err != nil || tc.want != "" && (!errors.Is(err, ErrUnjudged) || !strings.Contains(err.Error(), tc.want)) {
			t.Errorf("%q: %v, want %q", tc.src, err, tc.want)
		}
	}
	withCI := run
	withCI.Intervals = true
	if err := Preflight(mustParse(t, "rules: [{metric: fnr, max_gap: 0.1, judge: best_bound}]\n"), withCI); err != nil {
		t.Errorf("with intervals: %v", err)
	}
}
