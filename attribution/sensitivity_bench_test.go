package attribution_test

import (
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
)

// BenchmarkSensitivity times Decomposition.Sensitivity alone (default
// factors, the bisections included) beside the Decompose it follows, on
// the three-mechanism sample with 20,000 records per group.
func BenchmarkSensitivity(b *testing.B) {
	s, mechs := threeNodeSample(20000, 5)
	opt := attribution.Options{Threshold: 0.5, Seed: 1, FoldSplits: 1, Learners: []classify.Learner{classify.NewLinear()}}
	names := []string{"fnr", "fpr", "brier", "log_loss"}
	b.Run("decompose", func(b *testing.B) {
		for b.Loop() {
			if _, err := attribution.Decompose(s, mechs, names, opt); err != nil {
				b.Fatal(err)
			}
		}
	})
	d, err := attribution.Decompose(s, mechs, names, opt)
	if err != nil {
		b.Fatal(err)
	}
	b.Run("sensitivity", func(b *testing.B) {
		for b.Loop() {
			if _, err := d.Sensitivity(attribution.SensitivityOptions{}); err != nil {
				b.Fatal(err)
			}
		}
	})
}
