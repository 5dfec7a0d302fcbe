package attribution_test

import (
	"math"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
)

// TestFixedRatioSEMatchesFastBootstrap: the delta-method standard errors
// with the ratios held fixed and the bootstrap that resamples the records
// with their fitted log-ratios (fast mode, one fold split) estimate the
// same variance, by linearisation and by resampling (Efron & Tibshirani
// 1993, ch. 21, the delta method as the infinitesimal jackknife, from
// memory); with 400 replicates the bootstrap SD has a relative error of
// about 1/√800 ≈ 4%, so the two must agree within 25% for the gap and
// every contribution of the prevalence case's FNR and Brier score.
func TestFixedRatioSEMatchesFastBootstrap(t *testing.T) {
	c := scm.Cases()[3]
	s, mechs, err := scm.Pooled(c.Model, 3000, 3000, 11)
	if err != nil {
		t.Fatal(err)
	}
	const B = 400
	names := []string{"fnr", "brier"}
	reps := make([][][]float64, B)
	dec, _, err := attribution.DecomposeWithIntervals(s, mechs, names,
		attribution.Options{Threshold: scm.ScreeningThreshold, Seed: 3, FoldSplits: 1, Learners: []classify.Learner{classify.NewExpanded()}},
		attribution.BootstrapOptions{Intervals: attribution.Intervals{Replicates: B, KeepRatios: true},
			Replicate: func(b int, md []attribution.MetricDecomposition) {
				for _, d := range md {
					reps[b] = append(reps[b], append([]float64{d.Gap}, d.Contributions...))
				}
			}})
	if err != nil {
		t.Fatal(err)
	}
	for m, md := range dec.Metrics {
		se := md.FixedRatioSE
		if se == nil || len(se.Contributions) != len(mechs) {
			t.Fatalf("%s: FixedRatioSE %+v", md.Metric, se)
		}
		want := append([]float64{se.Gap}, se.Contributions...)
		for q, w := range want {
			x := make([]float64, B)
			for b := range reps {
				x[b] = reps[b][m][q]
			}
			sd := sdOf(x)
			if w < 1e-4 && sd < 1e-4 {
				continue // a null mechanism the metric does not read: both ≈ 0
			}
			if r := w / sd; !(r > 0.75 && r < 1.25) {
				t.Errorf("%s quantity %d: delta SE %.5f, fast bootstrap SD %.5f (ratio %.2f)", md.Metric, q, w, sd, r)
			}
		}
	}
}

func sdOf(x []float64) float64 {
	var mean, ss float64
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	return math.Sqrt(ss / float64(len(x)-1))
}
