package policy_test

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness/policy"
)

// Judging a run's selection rates with the four-fifths preset and a limit
// on the false-negative rate's gap judged on the worst bound of its
// interval.
func ExampleEvaluate() {
	p, err := policy.Parse("gate.yaml", []byte(`rules:
  - preset: four-fifths
  - metric: fnr
    max_gap: 0.05
    judge: worst_bound
`))
	if err != nil {
		fmt.Println(err)
		return
	}
	out, err := policy.Evaluate(p, []policy.Subject{
		{Metric: "selection_rate", Reference: "men", Comparison: "women", ReferenceValue: 0.30, ComparisonValue: 0.27},
		{Metric: "fnr", Reference: "men", Comparison: "women", ReferenceValue: 0.12, ComparisonValue: 0.15,
			GapCI: &policy.Interval{Low: 0.01, High: 0.06}, Level: 0.95},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range out.Checks {
		fmt.Printf("rule %d %s %s %v: %.2f %s\n", c.Rule, c.Metric, c.Limit, c.LimitValue, *c.Value, c.Status)
	}
	fmt.Println("passed:", out.Passed)
	// Output:
	// rule 1 selection_rate min_ratio 0.8: 0.90 pass
	// rule 2 fnr max_gap 0.05: 0.06 breach
	// passed: false
}
