package attribution_test

import (
	"fmt"
	"math"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/metrics"
)

// The weighted voting game [51; 50, 49, 1]: a coalition wins with at least
// 51 votes. The large party is pivotal in four of the six voting orders.
func ExampleExactShapley() {
	votes := []float64{50, 49, 1}
	v := make([]float64, 1<<len(votes))
	for S := range v {
		var sum float64
		for i, x := range votes {
			if S&(1<<i) != 0 {
				sum += x
			}
		}
		if sum >= 51 {
			v[S] = 1
		}
	}
	fmt.Printf("%.4f\n", attribution.ExactShapley(v, len(votes)))
	// Output: [0.6667 0.1667 0.1667]
}

// Four synthetic reference records and one mechanism whose comparison form
// makes the missed case (score 0.2) four times as likely.
func ExampleEvaluateCoalitions() {
	labels := []float64{1, 1, 1, 0}
	scores := []float64{0.2, 0.7, 0.9, 0.1}
	logr := [][]float64{{math.Log(4), 0, 0, 0}}
	g, err := attribution.EvaluateCoalitions(labels, scores, 0.5, logr, []string{metrics.NameFNR}, attribution.EngineOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	v := g.Values[0]
	fmt.Printf("FNR under reference form %.4f, comparison form %.4f\n", v[0], v[1])
	fmt.Printf("Shapley share of the gap: %.4f\n", attribution.ExactShapley([]float64{0, v[1] - v[0]}, 1))
	// Output:
	// FNR under reference form 0.3333, comparison form 0.6667
	// Shapley share of the gap: [0.3333]
}
