package main

import (
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestIntervalOptionsApply: a flag that was given overrides the spec's
// intervals key; one that was not leaves the spec's value.
func TestIntervalOptionsApply(t *testing.T) {
	spec := &fairness.Spec{Intervals: fairness.IntervalSpec{Replicates: 200, Level: 0.9, KeepRatios: false}}
	cases := []struct {
		name string
		o    intervalOptions
		want fairness.RunOptions
	}{
		{"no flags", intervalOptions{replicates: 0, level: 0.95}, fairness.RunOptions{Bootstrap: 200, BootstrapLevel: 0.9}},
		{"replicates", intervalOptions{replicates: 50, level: 0.95, replicatesSet: true}, fairness.RunOptions{Bootstrap: 50, BootstrapLevel: 0.9}},
		{"off", intervalOptions{replicates: 0, replicatesSet: true}, fairness.RunOptions{Bootstrap: 0, BootstrapLevel: 0.9}},
		{"level", intervalOptions{level: 0.8, levelSet: true}, fairness.RunOptions{Bootstrap: 200, BootstrapLevel: 0.8}},
		{"fast", intervalOptions{fast: true, fastSet: true}, fairness.RunOptions{Bootstrap: 200, BootstrapLevel: 0.9, BootstrapKeepRatios: true}},
		{"all", intervalOptions{replicates: 30, level: 0.5, fast: true}.allSet(), fairness.RunOptions{Bootstrap: 30, BootstrapLevel: 0.5, BootstrapKeepRatios: true}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var got fairness.RunOptions
			c.o.apply(spec, &got)
			if got.Bootstrap != c.want.Bootstrap || got.BootstrapLevel != c.want.BootstrapLevel || got.BootstrapKeepRatios != c.want.BootstrapKeepRatios {
				t.Errorf("got %d/%v/%v, want %d/%v/%v", got.Bootstrap, got.BootstrapLevel, got.BootstrapKeepRatios,
					c.want.Bootstrap, c.want.BootstrapLevel, c.want.BootstrapKeepRatios)
			}
		})
	}
}
