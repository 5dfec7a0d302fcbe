package attribution

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

// BenchmarkDiagnostics times the per-mechanism diagnostics that read every
// reference record (mechanismReport) at 1,000,000 records: the
// worst-stratum mean ratio, the out-of-fold AUC, the tail shape and the
// weight summary.
//
//	go test ./attribution -run '^$' -bench Diagnostics -benchtime 5x
func BenchmarkDiagnostics(b *testing.B) {
	const n = 1_000_000
	rng := rand.New(rand.NewPCG(7, 7))
	logr, key, member := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range logr {
		logr[i] = 0.5 * rng.NormFloat64()
		key[i] = math.Round(100*rng.NormFloat64()) / 100 // ties, as a coarse learner gives
		if rng.Float64() < 0.5 {
			member[i] = 1
		}
	}
	b.Run("WorstStratumMean", func(b *testing.B) {
		for b.Loop() {
			WorstStratumMean(logr, key)
		}
	})
	b.Run("AUC", func(b *testing.B) {
		for b.Loop() {
			if _, err := metrics.AUC(member, logr, nil); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("TailShape", func(b *testing.B) {
		for b.Loop() {
			TailShape(logr)
		}
	})
	b.Run("SummariseLogWeights", func(b *testing.B) {
		for b.Loop() {
			SummariseLogWeights(logr)
		}
	})
}
