package metrics

import (
	"math/rand/v2"
	"testing"
)

func TestConfusionAtHand(t *testing.T) {
	// Worked by hand in hand_test.go.
	tests := []struct {
		name string
		w    []float64
		want Confusion
	}{
		{"weighted", handWeights, Confusion{TP: 3, FP: 3, TN: 5, FN: 1}},
		// Unit weights: TP = records 1,5; FN = 2; FP = 3,6; TN = 4.
		{"unweighted", nil, Confusion{TP: 2, FP: 2, TN: 1, FN: 1}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := ConfusionAt(handLabels, handScores, handThreshold, tt.w)
			if got != tt.want {
				t.Errorf("ConfusionAt = %+v, want %+v", got, tt.want)
			}
		})
	}
}

func TestConfusionRateUnknown(t *testing.T) {
	if _, err := (Confusion{TP: 1, TN: 1}).Rate(NameBrier); err == nil {
		t.Error("Rate(brier) returned no error")
	}
}

func TestLengthMismatchPanics(t *testing.T) {
	calls := map[string]func(){
		"ConfusionAt scores": func() { ConfusionAt([]float64{1}, []float64{1, 0}, 0.5, nil) },
		"ConfusionAt w":      func() { ConfusionAt([]float64{1}, []float64{1}, 0.5, []float64{1, 2}) },
		"BrierScore":         func() { BrierScore([]float64{1}, nil, nil) },
		"LogLoss":            func() { LogLoss([]float64{1}, []float64{1}, []float64{}) },
		"CITL":               func() { CalibrationInTheLarge(nil, []float64{1}, nil) },
		"ECE":                func() { ExpectedCalibrationError([]float64{1}, nil, 2, nil) },
		"ReliabilityCurve":   func() { ReliabilityCurve([]float64{1}, nil, 2, nil) },
		"ReliabilityBins":    func() { ReliabilityCurve(nil, nil, 0, nil) },
		"AUC":                func() { AUC([]float64{1, 0}, []float64{1}, nil) },
		"AUCSorter.Value":    func() { NewAUCSorter([]float64{1, 0}, []float64{1, 0}).Value([]float64{1}) },
		"Compute unknown":    func() { Compute("nope", []float64{1}, nil, 0.5, 1, nil) },
	}
	for name, f := range calls {
		t.Run(name, func(t *testing.T) {
			defer func() {
				r := recover()
				msg, ok := r.(string)
				if !ok || len(msg) < 9 || msg[:9] != "metrics: " {
					t.Errorf("panic = %v, want a \"metrics: ...\" message", r)
				}
			}()
			f()
		})
	}
}

// randomRecords returns n records with coarse (tied) and fine scores in
// [0, 1], 0/1 labels and positive weights.
func randomRecords(seed uint64, n int) (labels, scores, w []float64) {
	r := rand.New(rand.NewPCG(seed, 7))
	labels = make([]float64, n)
	scores = make([]float64, n)
	w = make([]float64, n)
	for i := range labels {
		if r.Float64() < 0.4 {
			labels[i] = 1
		}
		s := r.Float64()
		if i%3 == 0 {
			s = float64(int(s*20)) / 20 // ties on a 0.05 grid, including exact bin edges
		}
		scores[i] = s
		w[i] = r.ExpFloat64()
	}
	return
}

func BenchmarkConfusionAt(b *testing.B) {
	labels, scores, w := randomRecords(1, 100_000)
	b.ResetTimer()
	for b.Loop() {
		ConfusionAt(labels, scores, 0.5, w)
	}
}

// TestRateCounts: every threshold rate is its events over its records,
// Rate's own ratio (the definitions in Rate's doc comment), and other
// metrics have none.
func TestRateCounts(t *testing.T) {
	c := Confusion{TP: 3, FP: 2, TN: 7, FN: 5}
	for _, f := range Facts() {
		x, n, ok := c.RateCounts(f.Name)
		if ok != f.Proportion {
			t.Errorf("%s: ok %v, proportion %v", f.Name, ok, f.Proportion)
			continue
		}
		if !ok {
			continue
		}
		want, err := c.Rate(f.Name)
		if err != nil || x/n != want {
			t.Errorf("%s: %v/%v, Rate %v (%v)", f.Name, x, n, want, err)
		}
	}
}
