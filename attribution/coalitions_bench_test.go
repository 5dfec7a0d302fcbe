package attribution

import (
	"strconv"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

func benchName(key string, v int) string { return key + "=" + strconv.Itoa(v) }

func BenchmarkEvaluateCoalitions(b *testing.B) {
	cases := []struct {
		name    string
		k, n    int
		metrics []string
	}{
		{"k=16/n=100k/fnr", 16, 100_000, []string{metrics.NameFNR}},
		{"k=20/n=100k/fnr", 20, 100_000, []string{metrics.NameFNR}},
		{"k=20/n=100k/fpr+fnr", 20, 100_000, []string{metrics.NameFPR, metrics.NameFNR}},
		{"k=6/n=200k/4 metrics", 6, 200_000, []string{metrics.NameFPR, metrics.NameFNR, metrics.NameBrier, metrics.NameCalibrationInTheLarge}},
		{"k=12/n=100k/all but auc", 12, 100_000, metrics.Names()[:11]},
		{"k=10/n=20k/auc", 10, 20_000, []string{metrics.NameAUC}},
	}
	for _, c := range cases {
		labels, scores, logr := randomReference(42, c.n, c.k, 0.5)
		b.Run(c.name, func(b *testing.B) {
			cpu0 := cpuSeconds()
			for b.Loop() {
				if _, err := EvaluateCoalitions(labels, scores, 0.5, logr, c.metrics, EngineOptions{}); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric((cpuSeconds()-cpu0)/float64(b.N), "cpu-s/op")
		})
	}
}
