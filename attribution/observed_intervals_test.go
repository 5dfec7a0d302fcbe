package attribution_test

import (
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
)

// TestObservedIntervalsMatchBootstrap: the observed values' intervals
// need no fitting, and ObservedIntervals gives the very numbers the full
// bootstrap gives them (same seed, replicates, level and form), in both
// forms.
func TestObservedIntervalsMatchBootstrap(t *testing.T) {
	s, mechs := independentPooled(t, scm.Cases()[3].Model, 300, 250, 21)
	names := []string{"fnr", "fpr", "brier"}
	opt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: 9, FoldSplits: 1, Learners: []classify.Learner{classify.NewLinear()}}
	for _, form := range []attribution.IntervalForm{attribution.FormNormal, attribution.FormPercentile} {
		iv := attribution.Intervals{Replicates: 30, Level: 0.9, KeepRatios: true, Form: form}
		full, _, err := attribution.DecomposeWithIntervals(s, mechs, names, opt, attribution.BootstrapOptions{Intervals: iv})
		if err != nil {
			t.Fatal(err)
		}
		obs, err := attribution.ObservedIntervals(s, names, opt, attribution.BootstrapOptions{Intervals: iv})
		if err != nil {
			t.Fatal(err)
		}
		for m, md := range full.Metrics {
			o := obs[m]
			if md.Gap != o.Gap || *md.GapCI != *o.GapCI || *md.ReferenceCI != *o.ReferenceCI || *md.ComparisonCI != *o.ComparisonCI {
				t.Errorf("%s %s: observed intervals %+v %+v %+v differ from the bootstrap's %+v %+v %+v",
					form, md.Metric, *o.ReferenceCI, *o.ComparisonCI, *o.GapCI, *md.ReferenceCI, *md.ComparisonCI, *md.GapCI)
			}
		}
	}
}
