package fairness_test

import (
	"fmt"
	"math"
	"os"
	"path/filepath"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/synth"
)

// An audit of the invented anaemia screening cohort (SYNTHETIC data from
// fairness/synth): write the cohort and its spec, run the audit and read
// the gap in the false-negative rate. The observed rates are exact counts
// on the records; for every metric the contributions and the residual add
// up to the observed gap.
func ExampleRun() {
	dir, err := os.MkdirTemp("", "gapwise-example")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)
	f, err := os.Create(filepath.Join(dir, "cohort.csv"))
	if err != nil {
		fmt.Println(err)
		return
	}
	err = synth.AnaemiaTable(synth.DefaultScenario().Generate(3000, 1)).WriteCSV(f)
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.WriteFile(filepath.Join(dir, "spec.yaml"), synth.AnaemiaSpec("cohort.csv"), 0o644)
	}
	if err != nil {
		fmt.Println(err)
		return
	}
	spec, err := fairness.LoadSpec(filepath.Join(dir, "spec.yaml"))
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := fairness.Run(spec, fairness.RunOptions{Workers: 2})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, m := range r.Metrics {
		if m.Metric != "fnr" {
			continue
		}
		var sum float64
		for _, c := range m.Contributions {
			sum += c.Value
		}
		fmt.Printf("fnr: %s %.4f, %s %.4f, gap %+.4f\n", r.Groups.Reference, m.Reference, r.Groups.Comparison, m.Comparison, m.Gap)
		fmt.Println("contributions + residual = gap:", math.Abs(sum+m.Residual-m.Gap) < 1e-12)
	}
	// Output:
	// fnr: male 0.0250, female 0.0091, gap -0.0159
	// contributions + residual = gap: true
}
