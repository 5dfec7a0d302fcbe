package metrics

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/integrate"
	"gonum.org/v1/gonum/stat"
)

func TestAUCHand(t *testing.T) {
	// Hand example (hand_test.go). Events: s=0.9 (w 2), 0.4 (w 1), 0.5 (w 1),
	// W₊ = 4. Non-events: 0.7 (w 1), 0.2 (w 5), 0.5 (w 2), W₋ = 8.
	//   0.9 beats all non-events:         2·8           = 16
	//   0.4 beats 0.2:                    1·5           =  5
	//   0.5 beats 0.2, ties 0.5 (½·2):    1·(5 + 1)     =  6
	// AUC = 27 / (4·8) = 0.84375.
	got, err := AUC(handLabels, handScores, handWeights)
	if err != nil {
		t.Fatal(err)
	}
	if got != 27.0/32 {
		t.Errorf("AUC = %v, want %v", got, 27.0/32)
	}
	// Unweighted: pairs (pos, neg) = 3·3 = 9; 0.9 beats 3, 0.4 beats 1,
	// 0.5 beats 1 and ties 1 → 3 + 1 + 1.5 = 5.5; AUC = 5.5/9.
	got, err = AUC(handLabels, handScores, nil)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(got-5.5/9) > 1e-15 {
		t.Errorf("unweighted AUC = %v, want %v", got, 5.5/9)
	}
}

// mannWhitney is the weighted Mann–Whitney statistic by its O(n²)
// definition: Σ_{i pos} Σ_{j neg} w_i w_j ([s_i>s_j] + ½[s_i=s_j]) / (W₊W₋).
func mannWhitney(labels, scores, w []float64) float64 {
	var num, wp, wn float64
	for i := range labels {
		if labels[i] == 1 {
			wp += w[i]
		} else {
			wn += w[i]
		}
		if labels[i] != 1 {
			continue
		}
		for j := range labels {
			if labels[j] == 1 {
				continue
			}
			switch {
			case scores[i] > scores[j]:
				num += w[i] * w[j]
			case scores[i] == scores[j]:
				num += 0.5 * w[i] * w[j]
			}
		}
	}
	return num / (wp * wn)
}

func TestAUCEqualsMannWhitney(t *testing.T) {
	for seed := uint64(1); seed <= 5; seed++ {
		labels, scores, w := randomRecords(seed, 400) // a third of the scores tied on a grid
		got, err := AUC(labels, scores, w)
		if err != nil {
			t.Fatal(err)
		}
		if want := mannWhitney(labels, scores, w); math.Abs(got-want) > 1e-12 {
			t.Errorf("seed %d: AUC = %v, Mann–Whitney = %v", seed, got, want)
		}
	}
}

func TestAUCMatchesGonumROC(t *testing.T) {
	// Reference: gonum stat.ROC (weighted ROC curve) integrated with
	// integrate.Trapezoidal, as in gonum's ExampleROC_aUC_weighted.
	r := rand.New(rand.NewPCG(11, 12))
	n := 300
	labels, scores, w := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range labels {
		if r.Float64() < 0.35 {
			labels[i] = 1
		}
		scores[i] = r.Float64() + 0.3*labels[i] // continuous: no ties
		w[i] = 0.2 + r.Float64()
	}
	for _, weights := range [][]float64{nil, w} {
		got, err := AUC(labels, scores, weights)
		if err != nil {
			t.Fatal(err)
		}
		ys := append([]float64(nil), scores...)
		classes := make([]bool, n)
		for i := range classes {
			classes[i] = labels[i] == 1
		}
		var ws []float64
		if weights != nil {
			ws = append([]float64(nil), weights...)
		}
		stat.SortWeightedLabeled(ys, classes, ws)
		tpr, fpr, _ := stat.ROC(nil, ys, classes, ws)
		want := integrate.Trapezoidal(fpr, tpr)
		if math.Abs(got-want) > 1e-12 {
			t.Errorf("weighted=%v: AUC = %v, gonum ROC+trapezoid = %v", weights != nil, got, want)
		}
	}
}

func TestAUCSorterReweighting(t *testing.T) {
	labels, scores, w := randomRecords(21, 1000)
	s := NewAUCSorter(labels, scores)
	if s.Len() != 1000 {
		t.Fatalf("Len = %d", s.Len())
	}
	r := rand.New(rand.NewPCG(5, 6))
	for k := 0; k < 20; k++ {
		for i := range w {
			w[i] = math.Exp(r.NormFloat64())
			if r.Float64() < 0.05 {
				w[i] = 0
			}
		}
		got, err := s.Value(w)
		if err != nil {
			t.Fatal(err)
		}
		want, _ := AUC(labels, scores, w)
		if got != want {
			t.Errorf("reweighting %d: sorter %v, AUC %v", k, got, want)
		}
		if mw := mannWhitney(labels, scores, w); math.Abs(got-mw) > 1e-12 {
			t.Errorf("reweighting %d: sorter %v, Mann–Whitney %v", k, got, mw)
		}
	}
}

func TestAUCUndefined(t *testing.T) {
	tests := []struct {
		name           string
		labels, scores []float64
		w              []float64
	}{
		{"empty", nil, nil, nil},
		{"only events", []float64{1, 1}, []float64{0.1, 0.2}, nil},
		{"only non-events", []float64{0, 0}, []float64{0.1, 0.2}, nil},
		{"events weigh zero", []float64{1, 0}, []float64{0.1, 0.2}, []float64{0, 1}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := AUC(tt.labels, tt.scores, tt.w)
			if !errors.Is(err, ErrUndefined) || !math.IsNaN(got) {
				t.Errorf("AUC = %v, %v; want NaN, ErrUndefined", got, err)
			}
		})
	}
}

func TestAUCAllTied(t *testing.T) {
	// Every pair ties, so AUC = ½ whatever the weights (definition).
	got, err := AUC([]float64{1, 0, 1, 0}, []float64{0.3, 0.3, 0.3, 0.3}, []float64{1, 2, 3, 4})
	if err != nil || got != 0.5 {
		t.Errorf("AUC = %v, %v; want 0.5", got, err)
	}
}

func BenchmarkAUC(b *testing.B) {
	labels, scores, w := randomRecords(1, 100_000)
	b.ResetTimer()
	for b.Loop() {
		AUC(labels, scores, w)
	}
}

func BenchmarkAUCSorterValue(b *testing.B) {
	labels, scores, w := randomRecords(1, 100_000)
	s := NewAUCSorter(labels, scores)
	b.ResetTimer()
	for b.Loop() {
		s.Value(w)
	}
}

func TestAUCSorterConcurrentUse(t *testing.T) {
	// A built sorter is read-only: goroutines evaluating different weight
	// vectors get the same values as a sequential loop.
	labels, scores, _ := randomRecords(31, 2000)
	s := NewAUCSorter(labels, scores)
	ws := make([][]float64, 8)
	want := make([]float64, len(ws))
	for k := range ws {
		_, _, ws[k] = randomRecords(uint64(100+k), 2000)
		want[k], _ = s.Value(ws[k])
	}
	got := make([]float64, len(ws))
	done := make(chan struct{})
	for k := range ws {
		go func() {
			got[k], _ = s.Value(ws[k])
			done <- struct{}{}
		}()
	}
	for range ws {
		<-done
	}
	for k := range ws {
		if got[k] != want[k] {
			t.Errorf("vector %d: concurrent %v, sequential %v", k, got[k], want[k])
		}
	}
}

func TestAUCSorterValueSorted(t *testing.T) {
	labels, scores, w := randomRecords(41, 3000)
	s := NewAUCSorter(labels, scores)
	order := s.Order()
	ws := make([]float64, len(w))
	for k, i := range order {
		ws[k] = w[i]
		if k > 0 && scores[order[k-1]] > scores[i] {
			t.Fatalf("Order not ascending at %d", k)
		}
	}
	a, err1 := s.Value(w)
	b, err2 := s.ValueSorted(ws)
	if err1 != nil || err2 != nil || a != b {
		t.Errorf("Value %v (%v), ValueSorted %v (%v): want identical", a, err1, b, err2)
	}
}

func BenchmarkAUCSorterValueSorted(b *testing.B) {
	labels, scores, w := randomRecords(1, 100_000)
	s := NewAUCSorter(labels, scores)
	ws := make([]float64, len(w))
	for k, i := range s.Order() {
		ws[k] = w[i]
	}
	b.ResetTimer()
	for b.Loop() {
		s.ValueSorted(ws)
	}
}
