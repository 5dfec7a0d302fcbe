package scm

import (
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

// TestGroundTruthSEShrinks: the batch-means Monte Carlo error of the
// simulated gap falls like 1/√n (common practice for a mean of independent
// draws); quadrupling n should roughly halve it.
func TestGroundTruthSEShrinks(t *testing.T) {
	m := caseNamed(t, "prevalence").Model
	names := []string{metrics.NameFNR}
	small, err := GroundTruth(m, names, 1<<15, 2, ScreeningThreshold, 1)
	if err != nil {
		t.Fatal(err)
	}
	large, err := GroundTruth(m, names, 1<<17, 2, ScreeningThreshold, 1)
	if err != nil {
		t.Fatal(err)
	}
	// With 32 batches the SE estimate itself has ~13 % relative error, so
	// accept a ratio between 1.3 and 3 around the expected 2.
	if r := small[0].GapSE / large[0].GapSE; r < 1.3 || r > 3 {
		t.Errorf("SE ratio for 4× records = %.2f (SE %.5f → %.5f), want ≈ 2", r, small[0].GapSE, large[0].GapSE)
	}
}

func TestGroundTruthRejectsBadInput(t *testing.T) {
	m := caseNamed(t, "prevalence").Model
	for _, tc := range []struct {
		name   string
		metric string
		n      int
		bins   int
	}{
		{"no records", metrics.NameFNR, 0, 1},
		{"no bins", metrics.NameFNR, 100, 0},
		{"unknown metric", "nope", 100, 1},
		{"auc", metrics.NameAUC, 100, 1},
	} {
		if _, err := GroundTruth(m, []string{tc.metric}, tc.n, 1, ScreeningThreshold, tc.bins); err == nil {
			t.Errorf("%s: GroundTruth accepted bad input", tc.name)
		}
	}
}

func BenchmarkGroundTruth(b *testing.B) {
	m := caseNamed(b, "combined").Model
	names := []string{metrics.NameFNR, metrics.NameFPR, metrics.NameCalibrationInTheLarge, metrics.NameBrier}
	for i := 0; i < b.N; i++ {
		if _, err := GroundTruth(m, names, 1<<16, 1, ScreeningThreshold, 1); err != nil {
			b.Fatal(err)
		}
	}
}
