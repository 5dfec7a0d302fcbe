package classify

import (
	"math"
	"testing"
)

// TestLogLossFromLogOdds checks closed forms (analytic): ℓ(y, 0) = log 2;
// ℓ(1, z) = log(1 + e^{−z}), which for z = −800 is 800 to within e^{−800}
// and for z = 40 is e^{−40} to within its square; weights give a weighted
// mean; zero total weight gives NaN.
func TestLogLossFromLogOdds(t *testing.T) {
	for _, tc := range []struct {
		name    string
		y, z, w []float64
		want    float64
	}{
		{"zero log-odds", []float64{1, 0}, []float64{0, 0}, nil, math.Ln2},
		{"confident wrong", []float64{1}, []float64{-800}, nil, 800},
		{"confident wrong, negative", []float64{0}, []float64{800}, nil, 800},
		{"confident right", []float64{1}, []float64{40}, nil, math.Exp(-40)},
		{"weighted", []float64{1, 0}, []float64{0, -800}, []float64{3, 1}, 3 * math.Ln2 / 4},
		{"zero weight ignored", []float64{1, 1}, []float64{0, math.Inf(-1)}, []float64{1, 0}, math.Ln2},
		{"no weight", []float64{1}, []float64{0}, []float64{0}, math.NaN()},
		{"no rows", nil, nil, nil, math.NaN()},
	} {
		got := LogLossFromLogOdds(tc.y, tc.z, tc.w)
		if math.IsNaN(tc.want) {
			if !math.IsNaN(got) {
				t.Errorf("%s: got %v, want NaN", tc.name, got)
			}
			continue
		}
		if math.Abs(got-tc.want) > 1e-15*math.Max(1, tc.want) {
			t.Errorf("%s: got %v, want %v", tc.name, got, tc.want)
		}
	}
}

func TestLogLossFromLogOddsPanics(t *testing.T) {
	defer func() {
		if r := recover(); r == nil {
			t.Error("no panic on mismatched lengths")
		}
	}()
	LogLossFromLogOdds([]float64{1, 0}, []float64{0}, nil)
}

// BenchmarkLogLossFromLogOdds: 160k rows.
func BenchmarkLogLossFromLogOdds(b *testing.B) {
	_, y, z := interactionData(160000, 3, 1)
	for b.Loop() {
		LogLossFromLogOdds(y, z, nil)
	}
}
