package attribution

import (
	"math"
	"testing"
)

// TestOddsMaxShare: odds 1, 1, 2 over the reference records (y = 0) give
// the largest record half of the total, 2/4 (by hand); comparison records
// do not count.
func TestOddsMaxShare(t *testing.T) {
	y := []float64{0, 0, 0, 1}
	z := []float64{0, 0, math.Log(2), math.Log(100)}
	if got := oddsMaxShare(y, z); math.Abs(got-0.5) > 1e-12 {
		t.Errorf("oddsMaxShare = %v, want 0.5", got)
	}
	if got := oddsMaxShare([]float64{1}, []float64{0}); !math.IsNaN(got) {
		t.Errorf("without reference records: %v, want NaN", got)
	}
}

// TestSelectLearner: the learner with the lowest loss is chosen only when
// it passes both self-checks; a degenerate one (one record holding half
// the weight, or mean odds far from 1) loses to any sound candidate, and
// when none is sound the one with mean odds closest to 1 is used.
func TestSelectLearner(t *testing.T) {
	tests := []struct {
		name                string
		losses, odds, share []float64
		want                int
	}{
		{"lowest sound", []float64{0.60, 0.62}, []float64{1.0, 1.0}, []float64{0.01, 0.01}, 0},
		{"degenerate share", []float64{0.55, 0.62}, []float64{1.05, 1.0}, []float64{0.8, 0.01}, 1},
		{"degenerate odds", []float64{0.55, 0.62}, []float64{3.0, 1.0}, []float64{0.01, 0.01}, 1},
		{"share at the limit", []float64{0.55, 0.62}, []float64{1.0, 1.0}, []float64{ShareTolerance, 0.01}, 0},
		{"none sound", []float64{0.55, 0.62, 0.7}, []float64{3.0, 1.5, 0.5}, []float64{0.9, 0.9, 0.9}, 1},
	}
	for _, tc := range tests {
		if got := selectLearner(tc.losses, tc.odds, tc.share); got != tc.want {
			t.Errorf("%s: chose %d, want %d", tc.name, got, tc.want)
		}
	}
}
