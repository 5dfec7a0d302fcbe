package classify

import (
	"math"
	"testing"
)

// TestThreadsDeterministic: every learner gives bit-identical log-odds with
// Threads = 1 and Threads = 3 (fixed row blocks reduced in block order), and
// WithThreads keeps the learner's name. The data are large enough for
// several histogram chunks (boosted) and the subsample warm start
// (logistic).
func TestThreadsDeterministic(t *testing.T) {
	if testing.Short() {
		t.Skip("70k-row fits")
	}
	x, y := boostBenchData(70_000, 5, 3)
	boosted := NewBoosted()
	boosted.Rounds = 30
	for _, l := range []Threaded{NewLinear(), NewExpanded(), boosted} {
		var out [2][]float64
		for k, threads := range []int{1, 3} {
			lt := l.WithThreads(threads)
			if lt.Name() != l.Name() {
				t.Fatalf("%s.WithThreads(%d) is named %q", l.Name(), threads, lt.Name())
			}
			m, err := lt.Fit(x, y, nil, 1)
			if err != nil {
				t.Fatal(err)
			}
			out[k] = make([]float64, len(y))
			m.LogOdds(x, out[k])
		}
		for i := range out[0] {
			if math.Float64bits(out[0][i]) != math.Float64bits(out[1][i]) {
				t.Fatalf("%s: row %d: %v with Threads=1, %v with 3", l.Name(), i, out[0][i], out[1][i])
			}
		}
	}
}
