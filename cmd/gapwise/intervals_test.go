package main

import (
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestIntervalOptionsApply: a flag that was given overrides the spec's
// intervals key; one that was not leaves the spec's value.
func TestIntervalOptionsApply(t *testing.T) {
	type iv = fairness.Intervals
	cases := []struct {
		name string
		o    intervalOptions
		want iv
	}{
		{"no flags", intervalOptions{replicates: 0, level: 0.95}, iv{Replicates: 200, Level: 0.9}},
		{"replicates", intervalOptions{replicates: 50, level: 0.95, replicatesSet: true}, iv{Replicates: 50, Level: 0.9}},
		{"off", intervalOptions{replicates: 0, replicatesSet: true}, iv{Replicates: 0, Level: 0.9}},
		{"level", intervalOptions{level: 0.8, levelSet: true}, iv{Replicates: 200, Level: 0.8}},
		{"fast", intervalOptions{fast: true, fastSet: true}, iv{Replicates: 200, Level: 0.9, KeepRatios: true}},
		{"all", intervalOptions{replicates: 30, level: 0.5, fast: true}.allSet(), iv{Replicates: 30, Level: 0.5, KeepRatios: true}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			spec := &fairness.Spec{Intervals: iv{Replicates: 200, Level: 0.9, KeepRatios: false}}
			c.o.apply(spec)
			if spec.Intervals != c.want {
				t.Errorf("got %+v, want %+v", spec.Intervals, c.want)
			}
		})
	}
}
