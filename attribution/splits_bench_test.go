package attribution_test

import (
	"fmt"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
)

// BenchmarkDecomposeFoldSplits times Decompose with one fold split and with
// the default number for the size (DefaultFoldSplits) on small samples of
// the combined-shift screening model (6 mechanisms, 4 metrics, auto
// learners):
//
//	go test ./attribution -run '^$' -bench DecomposeFoldSplits -benchtime 5x
func BenchmarkDecomposeFoldSplits(b *testing.B) {
	c := scm.Cases()[5]
	learners, err := classify.Learners(classify.Auto)
	if err != nil {
		b.Fatal(err)
	}
	for _, n := range []int{200, 1000} {
		s, mechs, err := scm.Pooled(c.Model, n, n, 1)
		if err != nil {
			b.Fatal(err)
		}
		for _, R := range []int{1, attribution.DefaultFoldSplits(n, n)} {
			opt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: 1, Learners: learners, FoldSplits: R}
			b.Run(fmt.Sprintf("n=%d/splits=%d", n, R), func(b *testing.B) {
				for b.Loop() {
					if _, err := attribution.Decompose(s, mechs, gtMetrics, opt); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}
