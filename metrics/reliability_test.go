package metrics

import (
	"math"
	"testing"
)

func TestReliabilityCurveHand(t *testing.T) {
	// 4 bins over the hand example (hand_test.go):
	//   [0,.25):   record 4          W=5, mean s 0.2, events 0/5
	//   [.25,.5):  record 2          W=1, mean s 0.4, events 1/1
	//   [.5,.75):  records 3,5,6     W=4, mean s (0.7+0.5+1.0)/4 = 0.55, events 1/4
	//   [.75,1]:   record 1          W=2, mean s 0.9, events 2/2
	want := []ReliabilityBin{
		{Lower: 0, Upper: 0.25, Count: 1, Weight: 5, MeanScore: 0.2, EventRate: 0},
		{Lower: 0.25, Upper: 0.5, Count: 1, Weight: 1, MeanScore: 0.4, EventRate: 1},
		{Lower: 0.5, Upper: 0.75, Count: 3, Weight: 4, MeanScore: 0.55, EventRate: 0.25},
		{Lower: 0.75, Upper: 1, Count: 1, Weight: 2, MeanScore: 0.9, EventRate: 1},
	}
	got := ReliabilityCurve(handLabels, handScores, 4, handWeights)
	if len(got) != len(want) {
		t.Fatalf("got %d bins, want %d: %+v", len(got), len(want), got)
	}
	for i := range want {
		g, w := got[i], want[i]
		if g.Lower != w.Lower || g.Upper != w.Upper || g.Count != w.Count || g.Weight != w.Weight ||
			math.Abs(g.MeanScore-w.MeanScore) > 1e-15 || math.Abs(g.EventRate-w.EventRate) > 1e-15 {
			t.Errorf("bin %d = %+v, want %+v", i, g, w)
		}
	}
}

func TestReliabilityCurveSkipsEmptyAndMatchesECE(t *testing.T) {
	labels, scores, w := randomRecords(3, 500)
	w[0] = 0
	for _, bins := range []int{1, 7, 10, 40, 1000} {
		curve := ReliabilityCurve(labels, scores, bins, w)
		var num, den float64
		for _, b := range curve {
			if !(b.Weight > 0) || b.Count == 0 {
				t.Fatalf("bins=%d: empty bin returned: %+v", bins, b)
			}
			num += b.Weight * math.Abs(b.MeanScore-b.EventRate)
			den += b.Weight
		}
		ece, err := ExpectedCalibrationError(labels, scores, bins, w)
		if err != nil {
			t.Fatal(err)
		}
		// Identity Σ_b W_b·|mean s_b − mean y_b| / W = ECE (definition of ECE).
		if math.Abs(num/den-ece) > 1e-12 {
			t.Errorf("bins=%d: curve gives %v, ECE = %v", bins, num/den, ece)
		}
		if bins == 1000 && len(curve) >= bins {
			t.Errorf("bins=1000 over 500 records: %d bins returned, expected empty ones skipped", len(curve))
		}
	}
}
