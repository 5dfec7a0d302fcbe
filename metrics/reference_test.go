package metrics

import (
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"testing"
)

// referenceFile holds values computed by scikit-learn 1.2.1 (Debian
// python3-sklearn; CITL and ECE by numpy) in
// testdata/metrics/make_reference.py. See testdata/metrics/README.md.
type referenceFile struct {
	SklearnVersion string  `json:"sklearn_version"`
	NumpyVersion   string  `json:"numpy_version"`
	LogLossEps     float64 `json:"log_loss_eps"`
	Cases          []struct {
		Name      string              `json:"name"`
		Labels    []float64           `json:"labels"`
		Scores    []float64           `json:"scores"`
		Weights   []float64           `json:"weights"`
		Threshold float64             `json:"threshold"`
		Bins      int                 `json:"bins"`
		Expected  map[string]*float64 `json:"expected"`
	} `json:"cases"`
}

func loadReference(t *testing.T) referenceFile {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "testdata", "metrics", "reference.json"))
	if err != nil {
		t.Fatal(err)
	}
	var ref referenceFile
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	if len(ref.Cases) == 0 || ref.SklearnVersion == "" {
		t.Fatal("reference.json has no cases or no sklearn version")
	}
	return ref
}

func TestAgainstSklearn(t *testing.T) {
	ref := loadReference(t)
	if ref.LogLossEps != LogLossEps {
		t.Fatalf("fixture log-loss eps %v, package %v", ref.LogLossEps, LogLossEps)
	}
	for _, c := range ref.Cases {
		t.Run(c.Name, func(t *testing.T) {
			// Confusion counts: sklearn.metrics.confusion_matrix(sample_weight=w).
			conf := ConfusionAt(c.Labels, c.Scores, c.Threshold, c.Weights)
			for key, got := range map[string]float64{"tp": conf.TP, "fp": conf.FP, "tn": conf.TN, "fn": conf.FN} {
				if want := *c.Expected[key]; math.Abs(got-want) > 1e-12*math.Max(1, want) {
					t.Errorf("%s = %v, sklearn %v", key, got, want)
				}
			}
			// Metrics: sklearn recall_score (tpr), precision_score (ppv;
			// npv with pos_label=0), accuracy_score, brier_score_loss,
			// log_loss(eps=1e-15), roc_auc_score, rates from confusion_matrix;
			// CITL and ECE from numpy in the script. null = sklearn's zero
			// denominator (UndefinedMetricWarning or 0/0).
			for _, name := range Names() {
				want, ok := c.Expected[name]
				if !ok {
					t.Fatalf("fixture lacks %s", name)
				}
				got, err := Compute(name, c.Labels, c.Scores, c.Threshold, c.Bins, c.Weights)
				if want == nil {
					if !errors.Is(err, ErrUndefined) {
						t.Errorf("%s = %v, %v; sklearn: undefined", name, got, err)
					}
					continue
				}
				if err != nil {
					t.Errorf("%s: %v; sklearn %v", name, err, *want)
					continue
				}
				if math.Abs(got-*want) > 1e-12 {
					t.Errorf("%s = %.17g, sklearn %.17g (diff %.3g)", name, got, *want, got-*want)
				}
			}
		})
	}
}
