package fairness_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/synth"
)

// BenchmarkRunScale times a whole audit (CSV parse, cross-fitted classifiers,
// all coalitions, Shapley values, details) on the synthetic benchmark
// cohort: 200k records, 6 mechanisms, 4 metrics. Run with
//
//	go test ./fairness -run '^$' -bench RunScale -benchtime 1x
func BenchmarkRunScale(b *testing.B) {
	const rows, k = 200_000, 6
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
	for _, c := range []string{"linear", "expanded", "boosted", "auto"} {
		b.Run(c, func(b *testing.B) {
			path := filepath.Join(dir, c+".yaml")
			if err := os.WriteFile(path, []byte(base+"classifier: "+c+"\n"), 0o644); err != nil {
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
