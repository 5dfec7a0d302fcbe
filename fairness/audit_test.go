package fairness

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/metrics"
)

// badSentinels gives the sentinel each fixture under testdata/bad must wrap.
var badSentinels = map[string]error{
	"classifier_unknown":   ErrUnknownClassifier,
	"column_in_two_nodes":  ErrColumnReuse,
	"cycle":                ErrCycle,
	"data_not_found":       ErrFileNotFound,
	"duplicate_header":     ErrDuplicateHeader,
	"duplicate_key":        ErrDuplicateKey,
	"duplicate_node":       ErrDuplicateNode,
	"empty_file":           ErrEmptyFile,
	"estimator_unknown":    ErrBadValue,
	"fold_splits_too_many": ErrBadValue,
	"folds_too_small":      ErrBadValue,
	"group_absent":         ErrGroupAbsent,
	"hex_number":           ErrNotNumeric,
	"group_in_graph":       ErrGroupInGraph,
	"label_not_binary":     ErrNotBinary,
	"label_not_node":       ErrLabelNotNode,
	"metric_undefined":     metrics.ErrUndefined,
	"missing_column":       ErrMissingColumn,
	"missing_key":          ErrMissingKey,
	"missing_value":        ErrMissingValue,
	"names_unknown_level":  ErrBadValue,
	"names_unknown_node":   ErrUnknownKey,
	"not_utf8":             ErrEncoding,
	"not_numeric":          ErrNotNumeric,
	"ragged_row":           ErrRaggedRow,
	"score_in_vector_node": ErrScoreInGraph,
	"score_nan":            ErrMissingValue,
	"score_out_of_range":   ErrScoreRange,
	"threshold_range":      ErrThresholdRange,
	"threshold_zero":       ErrThresholdRange,
	"too_few_records":      ErrTooFewRecords,
	"unknown_key":          ErrUnknownKey,
	"unknown_metric":       ErrUnknownMetric,
	"unknown_parent":       ErrUnknownNode,
	"unnamed_column":       ErrUnnamedColumn,
	"utf16":                ErrEncoding,
	"yaml_mapping":         ErrSyntax,
	"yaml_syntax":          ErrSyntax,
}

// readCases parses testdata/bad/cases.tsv (hand-made fixtures, see its
// README) into case → expected message substring.
func readCases(t *testing.T) map[string]string {
	t.Helper()
	f, err := os.Open("../testdata/bad/cases.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	cases := map[string]string{}
	sc := bufio.NewScanner(f)
	for first := true; sc.Scan(); first = false {
		if first || sc.Text() == "" {
			continue
		}
		name, want, ok := strings.Cut(sc.Text(), "\t")
		if !ok {
			t.Fatalf("cases.tsv: line %q has no tab", sc.Text())
		}
		cases[name] = want
	}
	return cases
}

// TestBadInputs runs every fixture under testdata/bad through LoadSpec and
// Run and checks that the error is an input error wrapping the expected
// sentinel whose message names the culprit (file:line plus key or column,
// as listed in cases.tsv).
func TestBadInputs(t *testing.T) {
	cases := readCases(t)
	dirs, err := os.ReadDir("../testdata/bad")
	if err != nil {
		t.Fatal(err)
	}
	nDirs := 0
	for _, d := range dirs {
		if !d.IsDir() {
			continue
		}
		nDirs++
		name := d.Name()
		t.Run(name, func(t *testing.T) {
			want, ok := cases[name]
			if !ok {
				t.Fatalf("no line for %s in cases.tsv", name)
			}
			sentinel, ok := badSentinels[name]
			if !ok {
				t.Fatalf("no sentinel for %s in badSentinels", name)
			}
			spec, err := LoadSpec(filepath.Join("../testdata/bad", name, "spec.yaml"))
			if err == nil {
				_, err = Run(spec, RunOptions{Workers: 1})
			}
			if err == nil {
				t.Fatal("no error")
			}
			if !errors.Is(err, sentinel) {
				t.Errorf("error %q does not wrap %q", err, sentinel)
			}
			if !IsInputError(err) {
				t.Errorf("IsInputError(%q) = false", err)
			}
			if !strings.Contains(err.Error(), want) {
				t.Errorf("error\n  %s\ndoes not contain\n  %s", err, want)
			}
		})
	}
	if nDirs != len(cases) {
		t.Errorf("%d fixture folders but %d lines in cases.tsv", nDirs, len(cases))
	}
}

// writeAudit writes spec and data files into a temporary folder and
// parses the spec.
func writeAudit(t testing.TB, spec, data string) *Spec {
	t.Helper()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "cohort.csv"), []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "spec.yaml")
	if err := os.WriteFile(path, []byte(spec), 0o644); err != nil {
		t.Fatal(err)
	}
	s, err := LoadSpec(path)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

const smallSpec = `data: cohort.csv
label: dx
score: score
threshold: 0.5
groups: {column: site, reference: a, comparison: b}
metrics: [fpr, fnr, brier]
graph:
  - node: x
  - node: dx
    parents: [x]
  - node: z
    parents: [dx]
folds: 2
seed: 7
classifier: linear
`

// smallData builds a deterministic two-group table: x and z are numeric,
// dx depends on x, z on dx, and group b has a shifted x.
func smallData(n int) string {
	var b strings.Builder
	b.WriteString("site,x,dx,z,score\n")
	for i := range n {
		site := "a"
		shift := 0.0
		if i%2 == 1 {
			site, shift = "b", 0.5
		}
		x := math.Sin(float64(i)*1.7) + shift
		dx := 0
		if math.Cos(float64(i)*2.3)+x > 0.6 {
			dx = 1
		}
		z := float64(dx) + 0.8*math.Sin(float64(i)*0.9)
		score := 1 / (1 + math.Exp(-(x + z - 1)))
		fmt.Fprintf(&b, "%s,%.4f,%d,%.4f,%.4f\n", site, x, dx, z, score)
	}
	return b.String()
}

// TestRunSumsAndObserved checks the mapping of a decomposition into the
// Result on a small table: the observed per-group metrics equal direct
// counts on the file's rows (analytic ground truth: FPR = FP/(FP+TN) and
// FNR = FN/(FN+TP), common practice), and Σ contributions + residual = gap
// up to rounding.
func TestRunSumsAndObserved(t *testing.T) {
	spec := writeAudit(t, smallSpec, smallData(200))
	r, err := Run(spec, RunOptions{Workers: 2, Version: "test"})
	if err != nil {
		t.Fatal(err)
	}
	if r.Settings.Intervals != nil || r.Title != "" {
		t.Errorf("no bootstrap and no title asked for, got intervals %+v, title %q", r.Settings.Intervals, r.Title)
	}
	d, err := LoadData(spec)
	if err != nil {
		t.Fatal(err)
	}
	// Direct counts per group.
	var fp, neg, fn, pos [2]float64
	for i, c := range d.Comparison {
		g := 0
		if c {
			g = 1
		}
		dec := d.Scores[i] >= spec.Threshold
		if d.Labels[i] == 1 {
			pos[g]++
			if !dec {
				fn[g]++
			}
		} else {
			neg[g]++
			if dec {
				fp[g]++
			}
		}
	}
	want := map[string][2]float64{
		"fpr": {fp[0] / neg[0], fp[1] / neg[1]},
		"fnr": {fn[0] / pos[0], fn[1] / pos[1]},
	}
	if len(r.Metrics) != 3 || len(r.Mechanisms) != 3 {
		t.Fatalf("got %d metrics and %d mechanisms, want 3 and 3", len(r.Metrics), len(r.Mechanisms))
	}
	for _, m := range r.Metrics {
		if w, ok := want[m.Metric]; ok && (m.Reference != w[0] || m.Comparison != w[1]) {
			t.Errorf("%s: reference %v comparison %v, want %v %v", m.Metric, m.Reference, m.Comparison, w[0], w[1])
		}
		if m.Gap != m.Comparison-m.Reference {
			t.Errorf("%s: gap %v != comparison − reference %v", m.Metric, m.Gap, m.Comparison-m.Reference)
		}
		sum := m.Residual
		for _, c := range m.Contributions {
			sum += c.Value
		}
		if math.Abs(sum-m.Gap) > 1e-12 {
			t.Errorf("%s: Σ contributions + residual = %v, gap %v", m.Metric, sum, m.Gap)
		}
		if got := []string{m.Contributions[0].Mechanism, m.Contributions[1].Mechanism, m.Contributions[2].Mechanism}; strings.Join(got, ";") != "x;dx | x;z | dx" {
			t.Errorf("%s: mechanisms %v", m.Metric, got)
		}
	}
	if r.Groups.NReference != 100 || r.Groups.NComparison != 100 {
		t.Errorf("groups %+v", r.Groups)
	}
	if r.Inputs.SpecSHA256 != spec.SHA256 || len(r.Inputs.DataSHA256) != 64 {
		t.Errorf("inputs %+v", r.Inputs)
	}
	if r.Tool.Name != ToolName || r.Tool.Version != "test" || r.Settings.Folds != 2 || r.Seed != 7 {
		t.Errorf("tool %+v settings %+v seed %d", r.Tool, r.Settings, r.Seed)
	}
	for _, m := range r.Mechanisms {
		if m.Classifier != "linear" || math.Abs(m.ESSShare-m.ESS/100) > 1e-12 {
			t.Errorf("mechanism %+v", m)
		}
	}
}

// TestRunDeterministic checks that the result does not depend on the
// number of workers.
func TestRunDeterministic(t *testing.T) {
	spec := writeAudit(t, smallSpec, smallData(120))
	r1, err := Run(spec, RunOptions{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	r4, err := Run(spec, RunOptions{Workers: 4})
	if err != nil {
		t.Fatal(err)
	}
	for i := range r1.Metrics {
		for j := range r1.Metrics[i].Contributions {
			if a, b := r1.Metrics[i].Contributions[j], r4.Metrics[i].Contributions[j]; !reflect.DeepEqual(a, b) {
				t.Errorf("metric %s mechanism %d: %+v with 1 worker, %+v with 4", r1.Metrics[i].Metric, j, a, b)
			}
		}
	}
	// The contract promises byte-identical JSON at any number of workers.
	j1, err1 := json.Marshal(r1)
	j4, err4 := json.Marshal(r4)
	if err1 != nil || err4 != nil || !bytes.Equal(j1, j4) {
		t.Errorf("JSON differs between 1 and 4 workers (errors %v, %v)", err1, err4)
	}
}

// TestRunAutoAndBootstrap checks that "auto" offers every learner to each
// mechanism (one out-of-fold loss per candidate) and that bootstrap
// intervals asked for by the spec's intervals key reach the result (no
// RunOptions needed): an interval for every quantity, Low ≤ High.
func TestRunAutoAndBootstrap(t *testing.T) {
	spec := writeAudit(t, strings.Replace(smallSpec, "classifier: linear", "classifier: auto", 1)+
		"title: Small audit\nintervals: {replicates: 20, level: 0.9, keep_ratios: true}\n", smallData(160))
	r, err := Run(spec, RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if r.Title != "Small audit" {
		t.Errorf("title %q", r.Title)
	}
	if got, want := r.Settings.Intervals, (IntervalSettings{Intervals: Intervals{Replicates: 20, Level: 0.9, KeepRatios: true, Form: FormNormal}, Method: attribution.MethodFast}); got == nil || *got != want {
		t.Errorf("settings.intervals %+v, want %+v", got, want)
	}
	want := strings.Join(r.Settings.Learners, ",")
	if want != "linear,expanded,boosted" {
		t.Errorf("learners %s", want)
	}
	for _, m := range r.Mechanisms {
		var got []string
		for _, l := range m.Losses {
			got = append(got, l.Classifier)
		}
		if strings.Join(got, ",") != want {
			t.Errorf("%s: losses for %v", m.Node, got)
		}
	}
	for _, m := range r.Metrics {
		if m.ReferenceCI == nil || m.ComparisonCI == nil || m.GapCI == nil || m.GapCI.Low > m.GapCI.High {
			t.Errorf("%s: intervals %+v %+v %+v", m.Metric, m.ReferenceCI, m.ComparisonCI, m.GapCI)
		}
		for _, c := range m.Contributions {
			if c.CILow == nil || c.CIHigh == nil || *c.CILow > *c.CIHigh {
				t.Errorf("%s %s: interval %v %v", m.Metric, c.Node, c.CILow, c.CIHigh)
			}
		}
	}
	if r.Details == nil {
		t.Error("no details")
	}
}

// TestRunIntervalsOverride: RunOptions.Intervals wins over the spec's
// intervals key, both for other settings and for none at all, and leaves
// the spec as it was.
func TestRunIntervalsOverride(t *testing.T) {
	spec := writeAudit(t, smallSpec+"intervals: {replicates: 20, level: 0.9, keep_ratios: true}\n", smallData(160))
	asked := spec.Intervals
	cases := []struct {
		name     string
		override Intervals
		want     *IntervalSettings // nil: no bootstrap ran
	}{
		{"other settings", Intervals{Replicates: 6, Level: 0.8, KeepRatios: true},
			&IntervalSettings{Intervals: Intervals{Replicates: 6, Level: 0.8, KeepRatios: true, Form: FormNormal}, Method: attribution.MethodFast}},
		{"percentile", Intervals{Replicates: 6, Level: 0.8, Form: FormPercentile},
			&IntervalSettings{Intervals: Intervals{Replicates: 6, Level: 0.8, Form: FormPercentile}, Method: attribution.MethodRefit}},
		{"none", Intervals{Replicates: 0, Level: 0.9, KeepRatios: true}, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r, err := Run(spec, RunOptions{Workers: 2, Intervals: &c.override})
			if err != nil {
				t.Fatal(err)
			}
			if got := r.Settings.Intervals; (got == nil) != (c.want == nil) || got != nil && *got != *c.want {
				t.Errorf("settings.intervals %+v, want %+v", got, c.want)
			}
			if hasCI := r.Metrics[0].GapCI != nil; hasCI != (c.want != nil) {
				t.Errorf("gap interval present %v, want %v", hasCI, c.want != nil)
			}
			if spec.Intervals != asked {
				t.Errorf("Run changed spec.Intervals to %+v", spec.Intervals)
			}
		})
	}
}

func TestDecomposeError(t *testing.T) {
	spec, err := ParseSpec("spec.yaml", []byte(exampleSpec))
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		in   error
		want string
	}{
		{&attribution.MetricError{Metric: "fpr", Group: attribution.GroupComparison, Err: metrics.ErrUndefined}, `metric fpr is undefined in group "south" (clinic): it has no negatives`},
		{fmt.Errorf("wrapped: %w", &attribution.MetricError{Metric: "tpr", Group: attribution.GroupReference, Err: metrics.ErrUndefined}), `metric tpr is undefined in group "north" (clinic): it has no positives`},
		{errors.New("classifier failed"), "classifier failed"},
	}
	for _, tc := range tests {
		got := decomposeError(spec, tc.in)
		if got.Error() != tc.want {
			t.Errorf("got %q, want %q", got, tc.want)
		}
		if isMetric := strings.HasPrefix(tc.want, "metric"); IsInputError(got) != isMetric || errors.Is(got, metrics.ErrUndefined) != isMetric {
			t.Errorf("%q: IsInputError %v", got, IsInputError(got))
		}
	}
}

// BenchmarkRun times a whole audit (load, three mechanisms, three metrics)
// of 4,000 records with each classifier setting.
func BenchmarkRun(b *testing.B) {
	for _, c := range []string{ClassifierLinear, ClassifierAuto} {
		b.Run(c, func(b *testing.B) {
			spec := writeAudit(b, strings.Replace(smallSpec, "classifier: linear", "classifier: "+c, 1), smallData(4000))
			for b.Loop() {
				if _, err := Run(spec, RunOptions{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestRunSidesClippingSampling checks the mapping of the estimation side,
// clipping, sampled Shapley values and weight diagnostics into the Result.
// With 100 records per group and clip_ratios 0.9, each side's log-ratios
// are clipped below the 5% and above the 95% quantile (Hyndman & Fan
// definition 7: order statistics 4.95 and 94.05 of 0..99), so 5 + 5 = 10
// distinct values per mechanism and side change (by hand).
func TestRunSidesClippingSampling(t *testing.T) {
	src := smallSpec + "estimate_from: both\nclip_ratios: 0.9\nexact_limit: 1\n"
	spec := writeAudit(t, src, smallData(200))
	r, err := Run(spec, RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if s := r.Settings; s.EstimateFrom != "both" || s.ClipRatios != 0.9 || s.ExactLimit != 1 {
		t.Errorf("settings %+v", s)
	}
	if len(r.Weights) != 2 || r.Weights[0].Side != "reference" || r.Weights[1].Side != "comparison" ||
		r.Weights[0].Records != 100 || r.Weights[0].AllCoalitions {
		t.Fatalf("weights %+v", r.Weights)
	}
	if n := r.Weights[0].Far.ComparisonNodes; len(n) != 3 {
		t.Errorf("reference side's far hybrid has comparison nodes %v, want all 3", n)
	}
	if n := r.Weights[1].Far.ComparisonNodes; len(n) != 0 {
		t.Errorf("comparison side's far hybrid has comparison nodes %v, want none", n)
	}
	for _, m := range r.Mechanisms {
		if m.ClippedReference != 10 || m.ClippedComparison != 10 {
			t.Errorf("%s: clipped %d reference and %d comparison records, want 10 and 10", m.Node, m.ClippedReference, m.ClippedComparison)
		}
		if !(m.ComparisonESS > 0 && m.WorstStratumMean > 0) {
			t.Errorf("%s: comparison ESS %v, worst stratum mean %v", m.Node, m.ComparisonESS, m.WorstStratumMean)
		}
		for _, l := range m.Losses {
			if !(l.OddsCheck > 0) {
				t.Errorf("%s: odds check %v", m.Node, l.OddsCheck)
			}
		}
	}
	for _, m := range r.Metrics {
		sum := m.Residual
		for _, c := range m.Contributions {
			sum += c.Value
			if c.StdError == nil || *c.StdError < 0 {
				t.Errorf("%s/%s: std error %v", m.Metric, c.Node, c.StdError)
			}
		}
		if math.Abs(sum-m.Gap) > 1e-12 {
			t.Errorf("%s: Σ contributions + residual = %v, gap %v", m.Metric, sum, m.Gap)
		}
		if !(m.EffectiveRecords > 0) {
			t.Errorf("%s: effective records %v", m.Metric, m.EffectiveRecords)
		}
	}
	js, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	for _, key := range []string{`"estimate_from":"both"`, `"clip_ratios":0.9`, `"exact_limit":1`, `"effective_records":`, `"std_error":`, `"odds_check":`,
		`"extreme_ratio_share":`, `"worst_stratum_mean_ratio":`, `"comparison_ess":`, `"clipped_reference":10`, `"far_hybrid":`, `"worst_hybrid":`, `"comparison_nodes":`} {
		if !strings.Contains(string(js), key) {
			t.Errorf("JSON lacks %s", key)
		}
	}
}
