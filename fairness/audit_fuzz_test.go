package fairness

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Limits the audit fuzzer puts on a spec's costly settings, so that one
// execution takes milliseconds; every other key is used as parsed.
const (
	fuzzMaxFolds      = 3
	fuzzMaxReplicates = 3
	fuzzMaxExact      = 4
)

// fuzzAuditSpec is the seed spec of FuzzAudit: a categorical root, the
// label, a vector node and the score as a node, rows with a missing value
// dropped, and metrics whose estimation differs (a rate, the expected
// calibration error and the AUC).
const fuzzAuditSpec = `data: d.csv
label: y
score: s
threshold: 0.5
groups: {column: g, reference: a, comparison: b}
metrics: [fnr, ece, auc]
graph:
  - node: c
  - node: y
    parents: [c]
  - node: v
    columns: [v1, v2]
    parents: [y, c]
  - node: s
    parents: [v]
categorical: [c]
missing: drop
folds: 2
classifier: linear
`

// fuzzAuditData is a seed table for fuzzAuditSpec: n rows alternating
// between groups a and b, b's v1 shifted, the label depending on c and v1
// (0/1, or no/yes with words true), one row with a missing v2, and a
// column w outside the graph.
func fuzzAuditData(n int, words bool) []byte {
	var b strings.Builder
	b.WriteString("g,c,y,v1,v2,s,w\n")
	for i := range n {
		g, shift := "a", 0.0
		if i%2 == 1 {
			g, shift = "b", 0.7
		}
		c := []string{"x", "y", "z"}[i%3]
		v1 := math.Sin(float64(i)*1.3) + shift
		y := 0
		if v1+0.4*float64(i%3)+math.Cos(float64(i)*2.1) > 0.8 {
			y = 1
		}
		label := fmt.Sprint(y)
		if words {
			label = []string{"no", "yes"}[y]
		}
		v2 := fmt.Sprintf("%.3f", float64(y)+0.5*math.Cos(float64(i)*0.7))
		if i == 5 {
			v2 = "NA"
		}
		s := 1 / (1 + math.Exp(-(v1 + float64(y) - 1)))
		fmt.Fprintf(&b, "%s,%s,%s,%.3f,%s,%.3f,%d\n", g, c, label, v1, v2, s, i%7)
	}
	return []byte(b.String())
}

// FuzzAudit runs the whole audit (Run) on an arbitrary spec and data
// file. It must never panic; it must either fail with an input error
// (IsInputError: the CLI's exit status 2) or return a result that encodes
// as JSON holding only finite numbers, with Σ contributions + residual =
// gap for every metric, and the same bytes with one worker as with two
// (the determinism rule). The spec's data key is required but its path
// is ignored: the data bytes are always what is read. Folds, bootstrap
// replicates and exact_limit are capped (fuzzMax…) to keep executions
// fast.
func FuzzAudit(f *testing.F) {
	data := fuzzAuditData(40, false)
	f.Add([]byte(fuzzAuditSpec), data)
	f.Add([]byte(fuzzAuditSpec+"intervals: {replicates: 2, keep_ratios: true}\nestimate_from: both\nclip_ratios: 0.9\n"), data)
	f.Add([]byte(strings.Replace(fuzzAuditSpec, "  - node: s\n    parents: [v]\n", "", 1)+"exact_limit: 1\nece_bins: 3\n"), data)
	f.Add([]byte(strings.Replace(fuzzAuditSpec, "[fnr, ece, auc]", "[fpr, ppv, npv, selection_rate, accuracy, brier, log_loss, calibration_in_the_large]", 1)+"title: t\nsynthetic: true\nseed: 3\n"), data)
	f.Add([]byte(strings.Replace(fuzzAuditSpec, "missing: drop\n", "", 1)), data)
	f.Add([]byte(strings.Replace(fuzzAuditSpec, "classifier: linear", "classifier: auto", 1)), data)
	f.Add([]byte(strings.Replace(fuzzAuditSpec, "missing: drop", "missing: indicator", 1)+"model_inputs: [v1, v2, w]\n"), data)
	f.Add([]byte(fuzzAuditSpec+"positive: yes\n"), fuzzAuditData(40, true))
	f.Add([]byte(fuzzAuditSpec), []byte("g,c,y,v1,v2,s\na,x,1,0,0,1\na,x,0,0,0,0\nb,x,1,0,0,1\nb,x,0,0,0,0\n"))
	f.Fuzz(func(t *testing.T, spec, data []byte) {
		dir := t.TempDir()
		s, err := ParseSpec(filepath.Join(dir, "spec.yaml"), spec)
		if err != nil {
			if !IsInputError(err) {
				t.Fatalf("spec: not an input error: %v", err)
			}
			return
		}
		s.DataPath = filepath.Join(dir, "d.csv")
		if err := os.WriteFile(s.DataPath, data, 0o644); err != nil {
			t.Fatal(err)
		}
		s.Folds = min(s.Folds, fuzzMaxFolds)
		s.ExactLimit = min(s.ExactLimit, fuzzMaxExact)
		s.Intervals.Replicates = min(s.Intervals.Replicates, fuzzMaxReplicates)
		one := fuzzRun(t, s, 1)
		if one == nil {
			return
		}
		if two := fuzzRun(t, s, 2); !bytes.Equal(one, two) {
			t.Fatalf("one worker and two give different results:\n%s\n%s", one, two)
		}
	})
}

// fuzzRun runs the audit of s with the given workers and returns the
// result's JSON, or nil after an input error; any other outcome fails t.
func fuzzRun(t *testing.T, s *Spec, workers int) []byte {
	t.Helper()
	r, err := Run(s, RunOptions{Workers: workers})
	if err != nil {
		if !IsInputError(err) {
			t.Fatalf("not an input error: %T %v", err, err)
		}
		return nil
	}
	out, err := json.Marshal(r)
	if err != nil {
		t.Fatalf("result does not encode: %v", err)
	}
	dec := json.NewDecoder(bytes.NewReader(out))
	dec.UseNumber()
	var v any
	if err := dec.Decode(&v); err != nil {
		t.Fatalf("result JSON does not decode: %v", err)
	}
	if path, bad := nonFinite(v, ""); bad {
		t.Fatalf("%s is not a finite number in %s", path, out)
	}
	for _, m := range r.Metrics {
		sum := m.Residual
		for _, c := range m.Contributions {
			sum += c.Value
		}
		if len(m.Contributions) != len(s.Graph) || math.Abs(sum-m.Gap) > 1e-9*(1+math.Abs(m.Gap)+math.Abs(m.Residual)) {
			t.Fatalf("metric %s: %d contributions for %d nodes, contributions + residual = %v, gap %v", m.Metric, len(m.Contributions), len(s.Graph), sum, m.Gap)
		}
	}
	return out
}

// nonFinite returns the path of the first number in the decoded JSON v
// that does not parse as a finite float64.
func nonFinite(v any, path string) (string, bool) {
	switch x := v.(type) {
	case json.Number:
		f, err := x.Float64()
		return path, err != nil || math.IsNaN(f) || math.IsInf(f, 0)
	case []any:
		for i, e := range x {
			if p, bad := nonFinite(e, fmt.Sprintf("%s[%d]", path, i)); bad {
				return p, true
			}
		}
	case map[string]any:
		for k, e := range x {
			if p, bad := nonFinite(e, path+"."+k); bad {
				return p, true
			}
		}
	}
	return "", false
}
