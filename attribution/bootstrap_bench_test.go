package attribution_test

import (
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
)

// benchReplicates is the bootstrap size of BenchmarkBootstrap.
var benchReplicates = 200

// BenchmarkBootstrap times 200 full bootstrap refits (and, for comparison,
// the fast mode that keeps the fitted ratios) at 20k records (10k per
// group) on the combined-shift screening model with 6 mechanisms and 4
// metrics, learners chosen among linear, expanded and boosted (auto) or among the
// two logistic learners:
//
//	go test ./attribution -run '^$' -bench Bootstrap -benchtime 1x
func BenchmarkBootstrap(b *testing.B) {
	c := scm.Cases()[5]
	s, mechs, err := scm.Pooled(c.Model, 10_000, 10_000, 1)
	if err != nil {
		b.Fatal(err)
	}
	names := []string{"fpr", "fnr", "brier", "calibration_in_the_large"}
	for _, bc := range []struct {
		name     string
		keep     bool
		learners []classify.Learner
	}{
		{"refit/auto", false, []classify.Learner{classify.NewLinear(), classify.NewExpanded(), classify.NewBoosted()}},
		{"refit/logistic", false, []classify.Learner{classify.NewLinear(), classify.NewExpanded()}},
		{"keep-ratios/auto", true, []classify.Learner{classify.NewLinear(), classify.NewExpanded(), classify.NewBoosted()}},
	} {
		keep := bc.keep
		opt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: 1, Learners: bc.learners}
		b.Run(bc.name, func(b *testing.B) {
			for b.Loop() {
				if _, _, err := attribution.DecomposeWithIntervals(s, mechs, names, opt, attribution.BootstrapOptions{Intervals: attribution.Intervals{Replicates: benchReplicates, KeepRatios: keep}}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
