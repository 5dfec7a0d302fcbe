package attribution_test

import (
	"reflect"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
)

// Replicates are seeded by their index and stored in their own slot, so the
// intervals must not depend on the number of workers (determinism is a
// product requirement; no outside source needed).
func TestBootstrapDeterministicAcrossWorkers(t *testing.T) {
	s, mechs := twoNodeSample(1500, 0.5, 4)
	for _, keep := range []bool{true, false} {
		var got []*attribution.Decomposition
		for _, w := range []int{1, 2} {
			opt := attribution.Options{Threshold: 0.5, Seed: 9, Learners: []classify.Learner{classify.NewLinear()}, Workers: w}
			d, sum, err := attribution.DecomposeWithIntervals(s, mechs, []string{"fnr", "brier"}, opt, attribution.BootstrapOptions{Intervals: attribution.Intervals{Replicates: 20, KeepRatios: keep}})
			if err != nil {
				t.Fatal(err)
			}
			if sum.Failed != 0 {
				t.Errorf("keep=%v: %d failed replicates", keep, sum.Failed)
			}
			got = append(got, d)
		}
		if !reflect.DeepEqual(got[0].Metrics, got[1].Metrics) {
			t.Errorf("keep=%v: intervals differ between 1 and 2 workers", keep)
		}
		for _, md := range got[0].Metrics {
			if md.GapCI == nil || md.GapCI.Low > md.GapCI.High || len(md.ContributionCIs) != len(mechs) {
				t.Fatalf("keep=%v %s: bad intervals %+v", keep, md.Metric, md.GapCI)
			}
			// The observed gap is the statistic the bootstrap resamples; a
			// 95% percentile interval from 20 replicates that excludes it
			// would point at a resampling bug (Efron & Tibshirani 1993).
			if md.Gap < md.GapCI.Low-0.05 || md.Gap > md.GapCI.High+0.05 {
				t.Errorf("keep=%v %s: gap %v far outside [%v, %v]", keep, md.Metric, md.Gap, md.GapCI.Low, md.GapCI.High)
			}
		}
	}
}
