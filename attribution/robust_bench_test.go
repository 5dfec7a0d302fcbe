package attribution_test

import (
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
)

// BenchmarkDecomposeEstimators times Decompose with each estimator at
// 200k records (100k per group) of the combined-shift screening model: 6
// mechanisms, 4 metrics, auto learners, one fold split; the robust runs
// report the regressions fitted (every fold and candidate learner):
//
//	go test ./attribution -run '^$' -bench DecomposeEstimators -benchtime 1x
func BenchmarkDecomposeEstimators(b *testing.B) {
	c := scm.Cases()[5]
	s, mechs, err := scm.Pooled(c.Model, 100_000, 100_000, 1)
	if err != nil {
		b.Fatal(err)
	}
	learners, err := classify.Learners(classify.Auto)
	if err != nil {
		b.Fatal(err)
	}
	for _, est := range attribution.Estimators() {
		opt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: 1, Learners: learners, FoldSplits: 1, Estimator: est, Reads: c.Model.Reads()}
		b.Run(est.String(), func(b *testing.B) {
			var regs int
			for b.Loop() {
				d, err := attribution.Decompose(s, mechs, gtMetrics, opt)
				if err != nil {
					b.Fatal(err)
				}
				regs = d.Regressions
			}
			b.ReportMetric(float64(regs), "regressions")
		})
	}
}
