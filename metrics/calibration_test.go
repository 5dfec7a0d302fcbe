package metrics

import (
	"errors"
	"math"
	"testing"
)

func TestCalibrationHand(t *testing.T) {
	// CITL: Σ w·s = 1.8+0.4+0.7+1.0+0.5+1.0 = 5.4, Σ w·y = 2+1+1 = 4, W = 12,
	// so 5.4/12 − 4/12 = 1.4/12.
	got, err := CalibrationInTheLarge(handLabels, handScores, handWeights)
	if err != nil {
		t.Fatal(err)
	}
	if want := 1.4 / 12; math.Abs(got-want) > 1e-15 {
		t.Errorf("CITL = %v, want %v", got, want)
	}

	// ECE, per bin Σ w·(s−y):
	//   4 bins: [0,.25): 5·0.2 = 1.0; [.25,.5): 1·(0.4−1) = −0.6;
	//           [.5,.75): 0.7 − 0.5 + 2·0.5 = 1.2; [.75,1]: 2·(0.9−1) = −0.2;
	//           ECE = (1.0+0.6+1.2+0.2)/12 = 3/12.
	//   2 bins: [0,.5): 1.0 − 0.6 = 0.4; [.5,1]: 1.2 − 0.2 = 1.0; ECE = 1.4/12.
	//   1 bin:  |Σ w(s−y)| / W = |CITL| = 1.4/12.
	tests := []struct {
		bins int
		want float64
	}{{4, 3.0 / 12}, {2, 1.4 / 12}, {1, 1.4 / 12}}
	for _, tt := range tests {
		got, err := ExpectedCalibrationError(handLabels, handScores, tt.bins, handWeights)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-tt.want) > 1e-15 {
			t.Errorf("ECE(%d bins) = %v, want %v", tt.bins, got, tt.want)
		}
	}
}

func TestECEErrors(t *testing.T) {
	if _, err := ExpectedCalibrationError([]float64{1}, []float64{0.5}, 0, nil); err == nil || errors.Is(err, ErrUndefined) {
		t.Errorf("bins=0: err = %v, want a non-ErrUndefined error", err)
	}
	if _, err := ExpectedCalibrationError(nil, nil, 10, nil); !errors.Is(err, ErrUndefined) {
		t.Errorf("no records: err = %v, want ErrUndefined", err)
	}
}

func TestScoreBin(t *testing.T) {
	// bin = min(⌊s·bins⌋, bins−1), clamped at 0 (definition in DESIGN/brief).
	tests := []struct {
		s    float64
		bins int
		want int
	}{
		{0, 10, 0}, {0.05, 10, 0}, {0.1, 10, 1}, {0.99, 10, 9}, {1, 10, 9},
		{1.2, 10, 9}, {-0.3, 10, 0}, {0.5, 2, 1}, {0.4999, 2, 0}, {0.7, 1, 0},
	}
	for _, tt := range tests {
		if got := ScoreBin(tt.s, tt.bins); got != tt.want {
			t.Errorf("ScoreBin(%v, %d) = %d, want %d", tt.s, tt.bins, got, tt.want)
		}
	}
}
