package metrics

import (
	"errors"
	"math"
	"testing"
)

func TestScoringHand(t *testing.T) {
	tests := []struct {
		name string
		f    func(labels, scores, w []float64) (float64, error)
		want float64
	}{
		// Σ w(s−y)² = 2·0.01 + 1·0.36 + 1·0.49 + 5·0.04 + 1·0.25 + 2·0.25
		//           = 0.02 + 0.36 + 0.49 + 0.20 + 0.25 + 0.50 = 1.82; /12.
		{NameBrier, BrierScore, 1.82 / 12},
		// Σ w·ℓ = −(2·ln 0.9 + ln 0.4 + ln 0.3 + 5·ln 0.8 + ln 0.5 + 2·ln 0.5)
		//       = 0.2107210 + 0.9162907 + 1.2039728 + 1.1157178 + 2.0794415
		//       = 5.5261438 (7 d.p.); /12 = 0.4605120.
		{NameLogLoss, LogLoss, 5.5261438 / 12},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := tt.f(handLabels, handScores, handWeights)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(got-tt.want) > 1e-8 {
				t.Errorf("%s = %.10f, want %.10f", tt.name, got, tt.want)
			}
		})
	}
}

func TestLogLossClips(t *testing.T) {
	// A confident miss costs −ln(1e−15) = 15·ln 10 = 34.538776... (analytic).
	tests := []struct {
		label, score float64
	}{{1, 0}, {0, 1}, {1, -0.5}, {0, 1.5}}
	for _, tt := range tests {
		got, err := LogLoss([]float64{tt.label}, []float64{tt.score}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if want := 15 * math.Ln10; math.Abs(got-want) > 1e-3 {
			// 1−1e−15 is not exact in float64, so log1p(−(1−1e−15)) is close, not equal.
			t.Errorf("LogLoss(y=%v, s=%v) = %v, want ≈ %v", tt.label, tt.score, got, want)
		}
	}
}

func TestScoringUndefined(t *testing.T) {
	for _, f := range []func(labels, scores, w []float64) (float64, error){BrierScore, LogLoss, CalibrationInTheLarge} {
		if _, err := f([]float64{1}, []float64{0.5}, []float64{0}); !errors.Is(err, ErrUndefined) {
			t.Errorf("zero total weight: err = %v, want ErrUndefined", err)
		}
	}
}
