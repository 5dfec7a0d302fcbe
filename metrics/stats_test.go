package metrics

import (
	"math"
	"testing"
)

// TestStatsMatchesDirect checks that every metric computed from the
// sufficient statistics of Stats equals the direct function to 1e-12.
// (Internal consistency; the direct functions are checked against
// scikit-learn in reference_test.go.)
func TestStatsMatchesDirect(t *testing.T) {
	tests := []struct {
		seed      uint64
		n         int
		threshold float64
		bins      int
		unit      bool
	}{
		{1, 1000, 0.5, 10, false},
		{2, 1000, 0.3, 7, false},
		{3, 500, 0.05, 1, true},
		{4, 2000, 0.95, 20, false},
		{5, 37, 0.5, 3, true},
	}
	for _, tt := range tests {
		labels, scores, w := randomRecords(tt.seed, tt.n)
		if tt.unit {
			w = nil
		}
		st := NewStats(tt.bins)
		for i := range labels {
			st.Add(labels[i], scores[i], tt.threshold, weightAt(w, i))
		}
		for _, name := range Names() {
			if name == NameAUC {
				continue
			}
			got, err := st.Value(name)
			if err != nil {
				t.Fatal(err)
			}
			want, err := Compute(name, labels, scores, tt.threshold, tt.bins, w)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(got-want) > 1e-12 {
				t.Errorf("seed %d %s: Stats %v, direct %v", tt.seed, name, got, want)
			}
		}
	}
}

func TestCellMatchesScoreBin(t *testing.T) {
	labels, scores, _ := randomRecords(9, 300)
	for _, bins := range []int{1, 3, 10} {
		for i := range scores {
			c := Cell(labels[i], scores[i], 0.5, bins)
			if b := c / 4; b != ScoreBin(scores[i], bins) {
				t.Fatalf("score %v bins %d: Cell bin %d, ScoreBin %d", scores[i], bins, b, ScoreBin(scores[i], bins))
			}
		}
	}
}
