package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestEstimatorFlag: an unknown --estimator is a usage error (exit 2),
// and the flag replaces the spec's estimator key (here on the small real
// PBC cohort, whose spec gets estimator: both): the result names the
// estimator of the run and of every metric.
func TestEstimatorFlag(t *testing.T) {
	var so, se bytes.Buffer
	if code := execute([]string{"decompose", "--estimator", "regression", "--spec", "none.yaml"}, &so, &se); code != exitInput || !strings.Contains(se.String(), `--estimator "regression": want weighting, robust or both`) {
		t.Errorf("--estimator regression: exit %d, want %d (stderr %q)", code, exitInput, se.String())
	}
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "real", "pbc", "spec.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	data, err := filepath.Abs(filepath.Join("..", "..", "testdata", "real", "pbc", "pbc.csv"))
	if err != nil {
		t.Fatal(err)
	}
	spec := filepath.Join(t.TempDir(), "spec.yaml")
	text := strings.Replace(string(src), "data: pbc.csv", "data: "+data, 1) + "estimator: both\n"
	if err := os.WriteFile(spec, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	out := decompose(t, decomposeOptions{spec: spec, format: formatJSON, estimator: "robust"})
	var res fairness.Result
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatal(err)
	}
	if res.Settings.Estimator != "robust" {
		t.Errorf("settings.estimator %q, want robust (the flag over the key)", res.Settings.Estimator)
	}
	// With 39 men, the robust estimate of the FNR's positives can fall to
	// 0 under some coalition: that metric keeps the weighting estimate and
	// says why.
	robust := 0
	for _, m := range res.Metrics {
		want := "robust"
		if m.Metric == "auc" || m.RobustUnavailable != "" {
			want = "weighting"
		}
		if m.Estimator != want {
			t.Errorf("%s: estimator %q, want %q", m.Metric, m.Estimator, want)
		}
		if m.Estimator == "robust" {
			robust++
		}
	}
	if robust == 0 {
		t.Error("no metric was estimated robustly")
	}
}
