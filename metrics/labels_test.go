package metrics

import (
	"errors"
	"math"
	"testing"
)

func TestCheckLabels(t *testing.T) {
	tests := []struct {
		labels []float64
		index  int // −1: valid
	}{
		{nil, -1},
		{[]float64{0, 1, 1, 0}, -1},
		{[]float64{0, 1, 2}, 2},
		{[]float64{0.5}, 0},
		{[]float64{1, math.NaN()}, 1},
		{[]float64{-1, 0}, 0},
	}
	for _, tt := range tests {
		err := CheckLabels(tt.labels)
		if tt.index < 0 {
			if err != nil {
				t.Errorf("CheckLabels(%v) = %v, want nil", tt.labels, err)
			}
			continue
		}
		var le *LabelError
		if !errors.As(err, &le) || le.Index != tt.index || !errors.Is(err, ErrNotBinary) {
			t.Errorf("CheckLabels(%v) = %v, want LabelError at %d wrapping ErrNotBinary", tt.labels, err, tt.index)
		}
	}
}
