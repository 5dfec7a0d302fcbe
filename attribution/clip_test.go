package attribution

import (
	"math"
	"testing"
)

func TestClipAtQuantiles(t *testing.T) {
	x := []float64{0.3, -1.2, 4.5, 0.0, 2.2, -3.1, 0.7, 1.1, -0.4, 9.0, -7.5, 0.05}
	// Bounds from numpy 1.24.2 (Debian python3-numpy, /usr/bin/python3):
	// np.quantile(x, [(1-q)/2, (1+q)/2]) with the default linear method,
	// and the count of values outside them.
	tests := []struct {
		q       float64
		lo, hi  float64
		clipped int
	}{
		{0.8, -2.9100000000000006, 4.2700000000000005, 4},
		{0.5, -0.6, 1.375, 6},
	}
	for _, tc := range tests {
		got, n, err := ClipAtQuantiles(x, tc.q)
		if err != nil {
			t.Fatal(err)
		}
		if n != tc.clipped {
			t.Errorf("q=%v: %d clipped, want %d", tc.q, n, tc.clipped)
		}
		for r, v := range got {
			want := math.Max(tc.lo, math.Min(tc.hi, x[r]))
			if math.Abs(v-want) > 1e-12 {
				t.Errorf("q=%v: value %d = %v, want %v", tc.q, r, v, want)
			}
		}
	}
	if x[2] != 4.5 {
		t.Error("input modified")
	}
	for _, q := range []float64{0, 1, -0.5, math.NaN()} {
		if _, _, err := ClipAtQuantiles(x, q); err == nil {
			t.Errorf("q=%v accepted", q)
		}
	}
}
