package synth_test

import (
	"fmt"
	"os"

	"github.com/gapwise/gapwise/fairness/synth"
)

// The demo cohort: the same seed always gives the same rows.
func Example() {
	recs := synth.DefaultScenario().Generate(4, 1)
	if err := synth.AnaemiaTable(recs).WriteCSV(os.Stdout); err != nil {
		fmt.Println(err)
	}
	// Output:
	// sex,age,anaemia,hb,mcv,rdw,bmi,score
	// male,63,0,16.1,92.7,12.6,35.8,0.000536
	// male,69,0,14.3,95.5,13.8,20.4,0.025456
	// female,57,1,11.4,79.4,12.8,23.6,0.951800
	// male,58,0,14.5,89.7,13.2,16.8,0.020312
}

func ExampleBenchTable() {
	tab, err := synth.BenchTable(2, 3, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := tab.WriteCSV(os.Stdout); err != nil {
		fmt.Println(err)
	}
	// Output:
	// group,y,x1,x2,score
	// a,0,1.2924,1.5988,0.827296
	// a,0,1.6551,0.9469,0.778998
}
