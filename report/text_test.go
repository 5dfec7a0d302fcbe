package report

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// The expected strings below are handResult's numbers rounded by hand to
// four decimals.
func TestWriteTextContent(t *testing.T) {
	var b bytes.Buffer
	if err := WriteText(&b, handResult()); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{
		"gapwise 0.1.0-test: audit of \"risk\" against label \"anaemia\", positive when score >= 0.35",
		"SYNTHETIC DATA",
		"Groups (column \"sex\")",
		"fnr (false-negative rate)",
		"0.1200",                      // reference FNR
		"0.2100",                      // comparison FNR
		"+0.0900  [+0.0610, +0.1180]", // gap and its interval
		"[0.1010, 0.1390]",            // reference interval
		"residual (gap - sum)",        // residual row
		"+0.0110",                     // FNR residual
		"+0.0790",                     // Σ contributions
		"-0.0120  -0.0100",            // age: contribution, alone
		"[-0.0200, -0.0040]",          // age interval
		"-0.0007",                     // Brier residual
		"ferritin | anaemia, hb",      // mechanism label
		"mechanism ferritin: largest weight carries 11% of the total",
		"There is no hidden confounding.",
		"cohort.csv  sha256 cd34",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("missing %q in\n%s", want, out)
		}
	}
}

// TestWriteTextAligned checks that every number of the FNR contribution
// table ends in the same column as its header.
func TestWriteTextAligned(t *testing.T) {
	var b bytes.Buffer
	_ = WriteText(&b, handResult())
	lines := strings.Split(b.String(), "\n")
	start := -1
	for i, l := range lines {
		if strings.HasPrefix(strings.TrimSpace(l), "mechanism ") && strings.Contains(l, "contribution") {
			start = i
			break
		}
	}
	if start < 0 {
		t.Fatal("no contribution table")
	}
	head := lines[start]
	end := strings.Index(head, "contribution") + len("contribution")
	for _, want := range []string{"-0.0120", "+0.0300", "+0.0610", "+0.0002", "+0.0790", "+0.0110"} {
		found := false
		for _, l := range lines[start+1 : start+7] {
			if i := strings.Index(l, want); i >= 0 && i+len(want) == end {
				found = true
			}
		}
		if !found {
			t.Errorf("%s does not end at column %d:\n%s", want, end, strings.Join(lines[start:start+7], "\n"))
		}
	}
}

func TestWriteTextNumberFormats(t *testing.T) {
	cases := []struct {
		v             float64
		fixed, signed string
	}{
		{0.12345, "0.1235", "+0.1235"}, // round half away at 4 decimals: fmt's %.4f
		{-0.00004, "0.0000", "0.0000"}, // rounds to zero: no sign
		{math.NaN(), "n/a", "n/a"},
		{-1.5, "-1.5000", "-1.5000"},
	}
	for _, c := range cases {
		if got := fixed(c.v); got != c.fixed {
			t.Errorf("fixed(%g) = %q, want %q", c.v, got, c.fixed)
		}
		if got := signed(c.v); got != c.signed {
			t.Errorf("signed(%g) = %q, want %q", c.v, got, c.signed)
		}
	}
}

func TestWriteTextNoIntervalsNoWarnings(t *testing.T) {
	res := handResult()
	res.Synthetic = false
	res.Warnings = nil
	for i := range res.Metrics {
		res.Metrics[i].ReferenceCI, res.Metrics[i].GapCI = nil, nil
		for j := range res.Metrics[i].Contributions {
			res.Metrics[i].Contributions[j].CILow = nil
			res.Metrics[i].Contributions[j].CIHigh = nil
		}
	}
	var b bytes.Buffer
	_ = WriteText(&b, res)
	out := b.String()
	for _, bad := range []string{"SYNTHETIC", "% interval", "[", "]"} {
		if strings.Contains(out, bad) {
			t.Errorf("unexpected %q in\n%s", bad, out)
		}
	}
	if !strings.Contains(out, "intervals       "+noIntervals) {
		t.Errorf("the settings do not say there are no intervals:\n%s", out)
	}
	if !strings.Contains(out, "Warnings (most serious first)\n  none") {
		t.Errorf("no 'none' under Warnings:\n%s", out)
	}
}

// TestWriteTextSampledShapley: sampled Shapley values show their standard
// error, and the effective records behind the estimate are printed.
func TestWriteTextSampledShapley(t *testing.T) {
	res := handResult()
	res.Metrics[0].EffectiveRecords = 812.4
	for j := range res.Metrics[0].Contributions {
		res.Metrics[0].Contributions[j].StdError = ptr(0.0012 * float64(j+1))
	}
	var b bytes.Buffer
	_ = WriteText(&b, res)
	out := b.String()
	for _, want := range []string{"std error", "+0.0610  +0.0580           +0.0200     0.0036", "effective records behind the estimated gap: 812.4"} {
		if !strings.Contains(out, want) {
			t.Errorf("missing %q in\n%s", want, out)
		}
	}
	if strings.Count(out, "std error") != 1 {
		t.Errorf("std error column shown for a metric without sampled values:\n%s", out)
	}
}

// textFailWriter fails every write.
type textFailWriter struct{}

func (textFailWriter) Write([]byte) (int, error) { return 0, errors.New("disk full") }

func TestWriteTextReportsWriteError(t *testing.T) {
	if err := WriteText(textFailWriter{}, handResult()); err == nil || !strings.Contains(err.Error(), "disk full") {
		t.Errorf("got %v, want the writer's error", err)
	}
}

func BenchmarkWriteText(b *testing.B) {
	res := handResult()
	for b.Loop() {
		var buf bytes.Buffer
		if err := WriteText(&buf, res); err != nil {
			b.Fatal(err)
		}
	}
}

func ExampleWriteText() {
	res := &fairness.Result{
		Tool:      fairness.ToolInfo{Name: "gapwise", Version: "v1.0.0"},
		Groups:    fairness.GroupInfo{Column: "clinic", Reference: "north", Comparison: "south", NReference: 800, NComparison: 700, EventsReference: 120, EventsComparison: 90},
		Label:     "dx",
		Score:     "risk",
		Threshold: 0.5,
		Metrics: []fairness.MetricResult{{
			Metric: "fpr", Reference: 0.10, Comparison: 0.16, Gap: 0.06, Estimated: 0.055, Residual: 0.005, RecordsReference: 680, RecordsComparison: 610,
			Contributions: []fairness.Contribution{
				{Node: "age", Mechanism: "age", Value: 0.015, Alone: 0.01, IfEqualised: 0.045},
				{Node: "lab", Mechanism: "lab | dx, age", Value: 0.04, Alone: 0.035, IfEqualised: 0.02},
			},
			Headline: fairness.Headline{Lead: "lab", LeadShare: ptr(0.04 / 0.06), Verdict: fairness.VerdictSound, Warnings: []int{}},
		}},
		Mechanisms: []fairness.MechanismResult{
			{Node: "age", Mechanism: "age", Classifier: "linear", ParentClassifier: "prior", AUC: 0.55, ESS: 760, ESSShare: 0.95, MaxShare: 0.002, MeanRatio: 1, WorstStratumMean: 1.01},
			{Node: "lab", Mechanism: "lab | dx, age", Parents: []string{"dx", "age"}, Classifier: "linear", ParentClassifier: "linear", AUC: 0.61, ESS: 640, ESSShare: 0.8, MaxShare: 0.004, MeanRatio: 0.99, WorstStratumMean: 0.97},
		},
		Assumptions: []string{"The causal graph is right."},
	}
	if err := WriteText(os.Stdout, res); err != nil {
		fmt.Println(err)
	}
	// Output:
	// gapwise v1.0.0: audit of "risk" against label "dx", positive when score >= 0.5
	//
	// Overview: gap = south − north
	//   false-positive rate: south 16.0%, north 10.0%; gap +6.0 pts
	//     largest contribution: how `lab` presents given `dx` and `age`: +4.0 pts; 67% of the gap
	//     reliable: no warning concerns it
	//   These are statistical estimates that hold under the causal assumptions listed in this report (the graph is right, no hidden confounders, overlap between the groups); they are not clinical or legal findings. Local regulation and institutional review govern how a model may be used and changed.
	//
	// Warnings (most serious first)
	//   none
	//
	// Groups (column "clinic")
	//   role        value  records  events  dropped
	//   reference   north      800     120        0
	//   comparison  south      700      90        0
	//
	// fpr (false-positive rate)
	//                                   value           from
	//   reference                      0.1000  680 negatives
	//   comparison                     0.1600  610 negatives
	//   gap (comparison - reference)  +0.0600
	//
	//   mechanism             contribution    alone  gap if equalised
	//   age                        +0.0150  +0.0100           +0.0450
	//   lab | dx, age              +0.0400  +0.0350           +0.0200
	//   sum of contributions       +0.0550
	//   residual (gap - sum)       +0.0050
	//   The residual holds estimation error and the effect of anything outside the graph that differs between the groups.
	//
	// Mechanism diagnostics (reference records reweighted by one mechanism's ratio)
	//   mechanism      classifier  parents by  oof AUC    ESS  ESS share  max weight share  mean ratio  worst-fifth mean ratio  weights > 20  tail shape
	//   age            linear      prior        0.5500  760.0     0.9500            0.0020      1.0000                  1.0100        0.0000         n/a
	//   lab | dx, age  linear      linear       0.6100  640.0     0.8000            0.0040      0.9900                  0.9700        0.0000         n/a
	//   oof AUC: out-of-fold AUC of the group classifier on (node, parents); near 0.5 the groups barely differ on this mechanism.
	//   ESS: effective sample size (sum w)^2 / sum w^2 of the reweighted reference records; ESS share divides it by their number.
	//   max weight share: the largest single record's share of the total weight.
	//   mean ratio: average ratio over the reference records, near 1 when the ratios are right.
	//   worst-fifth mean ratio: the same average in the fifth of the records (ranked by the parents' classifier) farthest from 1; near 1 when right.
	//   weights > 20: share of reference records whose weight (ratio) is above 20; a few such records can dominate the estimate, a sign of poor overlap.
	//   tail shape: Pareto shape of the largest ratios; above 0.5 the weights have infinite variance, above 0.7 the estimate is unreliable.
	//
	// Assumptions and cautions
	//   - The causal graph is right.
	//
	// Inputs and settings
	//   seed            0
	//   intervals       none (decompose adds them unless --intervals 0 or intervals.replicates: 0 turns them off); no value here shows its sampling error
	//   missing values  an error
	//
	// Reporting items (TRIPOD+AI, model cards, EU AI Act Article 10): the appendix of the Markdown and HTML reports (--format markdown, or report.html with --out) lists which this report supplies, partly supplies or does not supply; it is not a compliance statement.
}
