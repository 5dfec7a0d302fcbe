package classify

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// boostBenchData draws n rows of p features for a group-membership problem
// shaped like the engine's: y ~ Bernoulli(0.5); the class-1 rows have a
// shifted mean in feature 0, a wider spread in feature 1, a 0/1 feature 2
// whose rate differs, and an interaction between features 0 and 2; the
// remaining features are noise.
func boostBenchData(n, p int, seed uint64) (*mat.Dense, []float64) {
	rng := rand.New(rand.NewPCG(seed, 1))
	x := mat.NewDense(n, p, nil)
	y := make([]float64, n)
	for i := range n {
		c := rng.IntN(2)
		y[i] = float64(c)
		row := x.RawRowView(i)
		for j := range row {
			row[j] = rng.NormFloat64()
		}
		if p > 2 {
			rate := 0.3 + 0.3*float64(c)
			if rng.Float64() < rate {
				row[2] = 1
			} else {
				row[2] = 0
			}
		}
		if c == 1 {
			row[0] += 0.3 + 0.5*boostAt(row, 2)
			if p > 1 {
				row[1] *= 1.5
			}
		}
	}
	return x, y
}

func boostAt(row []float64, j int) float64 {
	if j < len(row) {
		return row[j]
	}
	return 0
}

// BenchmarkBoostedFit fits the default learner on 160 000 rows × 6 features.
func BenchmarkBoostedFit(b *testing.B) {
	x, y := boostBenchData(160_000, 6, 7)
	l := NewBoosted()
	b.ResetTimer()
	var trees int
	for b.Loop() {
		m, err := l.Fit(x, y, nil, 1)
		if err != nil {
			b.Fatal(err)
		}
		trees = m.(*BoostedModel).Trees()
	}
	b.ReportMetric(float64(trees), "trees")
}

// BenchmarkBoostedFitFixedRounds fits exactly 150 rounds (no early stopping)
// on 160 000 rows × 6 features, to time the tree growth itself.
func BenchmarkBoostedFitFixedRounds(b *testing.B) {
	x, y := boostBenchData(160_000, 6, 7)
	l := NewBoosted()
	l.Rounds = 150
	l.ValidationFraction = 0
	b.ResetTimer()
	for b.Loop() {
		if _, err := l.Fit(x, y, nil, 1); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkBoostedLogOdds predicts 200 000 rows × 10 features with a model
// of 100 trees.
func BenchmarkBoostedLogOdds(b *testing.B) {
	x, y := boostBenchData(200_000, 10, 8)
	l := NewBoosted()
	l.Rounds = 100
	l.ValidationFraction = 0
	m, err := l.Fit(x, y, nil, 1)
	if err != nil {
		b.Fatal(err)
	}
	dst := make([]float64, len(y))
	b.ResetTimer()
	for b.Loop() {
		m.LogOdds(x, dst)
	}
	if math.IsNaN(dst[0]) {
		b.Fatal("NaN log-odds")
	}
}

// BenchmarkBoostedFitSmall fits 100 rounds (no early stopping) on 16 000
// rows × 6 features on one goroutine: the shape of one fit inside a
// bootstrap replicate (20k records, 4/5 of them in the training folds).
func BenchmarkBoostedFitSmall(b *testing.B) {
	x, y := boostBenchData(16_000, 6, 7)
	l := NewBoosted()
	l.Rounds = 100
	l.ValidationFraction = 0
	l.Threads = 1
	for b.Loop() {
		if _, err := l.Fit(x, y, nil, 1); err != nil {
			b.Fatal(err)
		}
	}
}
