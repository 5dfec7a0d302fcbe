package fairness_test

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/synth"
)

// BenchmarkRunScaleEstimators times a whole audit, as BenchmarkRunScale
// does (6 mechanisms, 4 metrics, classifier auto, no intervals), at 20k
// and 200k records with each estimator; the benchmark cohort's score
// reads every finding, so every mechanism is a step of the robust
// estimator's chains:
//
//	go test ./fairness -run '^$' -bench RunScaleEstimators -benchtime 1x
func BenchmarkRunScaleEstimators(b *testing.B) {
	for _, rows := range []int{20_000, 200_000} {
		b.Run(fmt.Sprintf("rows=%d", rows), func(b *testing.B) { benchEstimators(b, rows) })
	}
}

func benchEstimators(b *testing.B, rows int) {
	const k = 6
	dir := b.TempDir()
	tab, err := synth.BenchTable(rows, k, 1)
	if err != nil {
		b.Fatal(err)
	}
	f, err := os.Create(filepath.Join(dir, "cohort.csv"))
	if err != nil {
		b.Fatal(err)
	}
	if err := tab.WriteCSV(f); err != nil {
		b.Fatal(err)
	}
	f.Close()
	base := strings.Replace(string(synth.BenchSpec("cohort.csv", k)), "metrics: [fnr, fpr, brier]", "metrics: [fpr, fnr, brier, calibration_in_the_large]", 1)
	for _, est := range []string{"weighting", "robust", "both"} {
		b.Run(est, func(b *testing.B) {
			path := filepath.Join(dir, est+".yaml")
			if err := os.WriteFile(path, []byte(base+"classifier: auto\nestimator: "+est+"\n"), 0o644); err != nil {
				b.Fatal(err)
			}
			spec, err := fairness.LoadSpec(path)
			if err != nil {
				b.Fatal(err)
			}
			for b.Loop() {
				if _, err := fairness.Run(spec, fairness.RunOptions{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
