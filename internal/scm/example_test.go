package scm_test

import (
	"fmt"

	"github.com/gapwise/gapwise/internal/scm"
	"github.com/gapwise/gapwise/metrics"
)

// The prevalence case shifts only the disease mechanism, so it carries the
// whole simulated FNR gap and every other node gets exactly 0.
func ExampleGroundTruth() {
	m := scm.Screening("prevalence only", scm.Shift{Prevalence: 0.7})
	truth, err := scm.GroundTruth(m, []string{metrics.NameFNR}, 1<<16, 1, scm.ScreeningThreshold, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	t := truth[0]
	for i, phi := range t.Shapley {
		fmt.Printf("%-8s %+.4f\n", m.Nodes[i].Name, phi)
	}
	fmt.Printf("gap      %+.4f\n", t.Gap)
	// Output:
	// age      +0.0000
	// site     +0.0000
	// disease  +0.0074
	// marker_a +0.0000
	// marker_b +0.0000
	// unread   +0.0000
	// gap      +0.0074
}

// The glove game: player 0 holds a left glove, players 1 and 2 a right glove
// each, and a pair is worth 1. v is indexed by coalition bit set.
func ExampleShapley() {
	v := []float64{0, 0, 0, 1, 0, 1, 0, 1}
	fmt.Printf("%.4f\n", scm.Shapley(v))
	// Output: [0.6667 0.1667 0.1667]
}
