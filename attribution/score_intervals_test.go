package attribution_test

import (
	"math"
	"testing"

	"github.com/gapwise/gapwise/attribution"
)

// TestScoreIntervals checks the Wilson and Newcombe intervals against
// published and hand-computed values (95%). Newcombe (1998), Table II,
// method 10: 56/70 − 48/80 gives (0.0524, 0.3339) and 9/10 − 3/10 gives
// (0.1705, 0.8090) (from memory of the published table); by hand from the
// formulas, 6/7 gives the Wilson interval (0.4869, 0.9743), 2/7 gives
// (0.0822, 0.6411) and their difference (0.0582, 0.8062); 0/10 gives
// (0, 0.2775), the Wilson interval of no events (Newcombe 1998, Table I,
// from memory).
func TestScoreIntervals(t *testing.T) {
	near := func(name string, iv attribution.Interval, lo, hi float64) {
		t.Helper()
		if math.Abs(iv.Low-lo) > 6e-4 || math.Abs(iv.High-hi) > 6e-4 {
			t.Errorf("%s: (%.4f, %.4f), want (%.4f, %.4f)", name, iv.Low, iv.High, lo, hi)
		}
	}
	near("56/70 − 48/80", attribution.NewcombeInterval(56, 70, 48, 80, 0.95), 0.0524, 0.3339)
	near("9/10 − 3/10", attribution.NewcombeInterval(9, 10, 3, 10, 0.95), 0.1705, 0.8090)
	near("6/7 − 2/7", attribution.NewcombeInterval(6, 7, 2, 7, 0.95), 0.0582, 0.8062)
	near("6/7", attribution.WilsonInterval(6, 7, 0.95), 0.4869, 0.9743)
	near("2/7", attribution.WilsonInterval(2, 7, 0.95), 0.0822, 0.6411)
	near("0/10", attribution.WilsonInterval(0, 10, 0.95), 0, 0.2775)
}
