package metrics

import (
	"errors"
	"math"
	"testing"
)

type rateFunc func(labels, scores []float64, threshold float64, w []float64) (float64, error)

func TestRatesHand(t *testing.T) {
	// Hand-worked from TP = 3, FP = 3, TN = 5, FN = 1, total = 12 (hand_test.go).
	tests := []struct {
		name string
		f    rateFunc
		want float64
	}{
		{NameFPR, FalsePositiveRate, 3.0 / 8},        // FP/(FP+TN) = 3/8 = 0.375
		{NameTPR, TruePositiveRate, 3.0 / 4},         // TP/(TP+FN) = 3/4
		{NameFNR, FalseNegativeRate, 1.0 / 4},        // FN/(TP+FN) = 1/4
		{NamePPV, PositivePredictiveValue, 3.0 / 6},  // TP/(TP+FP) = 3/6
		{NameNPV, NegativePredictiveValue, 5.0 / 6},  // TN/(TN+FN) = 5/6
		{NameSelectionRate, SelectionRate, 6.0 / 12}, // (TP+FP)/12
		{NameAccuracy, Accuracy, 8.0 / 12},           // (TP+TN)/12
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := tt.f(handLabels, handScores, handThreshold, handWeights)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(got-tt.want) > 1e-15 {
				t.Errorf("%s = %v, want %v", tt.name, got, tt.want)
			}
		})
	}
}

func TestRatesUndefined(t *testing.T) {
	onlyPos := []float64{1, 1}
	onlyNeg := []float64{0, 0}
	scores := []float64{0.2, 0.8}
	tests := []struct {
		name      string
		f         rateFunc
		labels    []float64
		threshold float64
		w         []float64
	}{
		{NameFPR, FalsePositiveRate, onlyPos, 0.5, nil},                   // no negatives
		{NameTPR, TruePositiveRate, onlyNeg, 0.5, nil},                    // no positives
		{NameFNR, FalseNegativeRate, onlyNeg, 0.5, nil},                   // no positives
		{NamePPV, PositivePredictiveValue, onlyPos, 0.9, nil},             // no positive decisions
		{NameNPV, NegativePredictiveValue, onlyPos, 0.1, nil},             // no negative decisions
		{NameSelectionRate, SelectionRate, onlyPos, 0.5, []float64{0, 0}}, // zero weight
		{NameAccuracy, Accuracy, nil, 0.5, nil},                           // no records
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := scores
			if tt.labels == nil {
				s = nil
			}
			got, err := tt.f(tt.labels, s, tt.threshold, tt.w)
			if !errors.Is(err, ErrUndefined) {
				t.Fatalf("err = %v, want ErrUndefined", err)
			}
			if !math.IsNaN(got) {
				t.Errorf("value = %v, want NaN", got)
			}
			if !containsWord(err.Error(), tt.name) {
				t.Errorf("error %q does not name %s", err, tt.name)
			}
		})
	}
}

func containsWord(s, w string) bool {
	for i := 0; i+len(w) <= len(s); i++ {
		if s[i:i+len(w)] == w {
			return true
		}
	}
	return false
}
