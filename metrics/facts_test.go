package metrics

import (
	"errors"
	"slices"
	"testing"
)

// TestFactsMatchComputation: the facts table lists exactly the metrics
// Compute supports, each with a title, and its Counts field says exactly
// when Compute finds the metric undefined: on a sample without the
// records it counts the metric is undefined, on a mixed sample it is not.
// Threshold agrees with Confusion.Rate accepting the name.
func TestFactsMatchComputation(t *testing.T) {
	mixedY, mixedS := []float64{0, 1, 0, 1}, []float64{0.2, 0.8, 0.7, 0.3}
	without := map[Records][2][]float64{
		AllRecords:      {{}, {}},
		Negatives:       {{1, 1}, {0.2, 0.8}},
		Positives:       {{0, 0}, {0.2, 0.8}},
		DecidedPositive: {{0, 1}, {0.1, 0.2}},
		DecidedNegative: {{0, 1}, {0.7, 0.9}},
		BothClasses:     {{1, 1}, {0.2, 0.8}},
	}
	var names []string
	for _, f := range Facts() {
		names = append(names, f.Name)
		if f.Title == "" || f.UndefinedReason() == "" {
			t.Errorf("%s: empty title or reason", f.Name)
		}
		if _, err := Compute(f.Name, mixedY, mixedS, 0.5, 2, nil); err != nil {
			t.Errorf("%s on a mixed sample: %v", f.Name, err)
		}
		ys := without[f.Counts]
		if _, err := Compute(f.Name, ys[0], ys[1], 0.5, 2, nil); !errors.Is(err, ErrUndefined) {
			t.Errorf("%s without the records it counts: error %v, want ErrUndefined", f.Name, err)
		}
		_, err := Confusion{TP: 1, FP: 1, TN: 1, FN: 1}.Rate(f.Name)
		if (err == nil) != f.Threshold {
			t.Errorf("%s: Threshold %v but Rate error %v", f.Name, f.Threshold, err)
		}
	}
	if !slices.Equal(names, Names()) {
		t.Errorf("facts %v, names %v", names, Names())
	}
	if _, ok := FactOf("youden"); ok || Known("youden") {
		t.Error("an unknown metric has facts")
	}
}
