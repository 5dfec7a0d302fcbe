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
	// sex,age,anaemia,hb,mcv,ferritin,bmi,score
	// male,63,0,16.1,92.7,88.0,35.8,0.000707
	// male,69,0,14.3,95.5,181.9,20.4,0.014619
	// female,57,1,11.4,79.4,4.0,23.6,0.991215
	// male,58,0,14.5,89.7,121.1,16.8,0.018016
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
