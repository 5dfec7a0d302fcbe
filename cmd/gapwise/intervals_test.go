package main

import (
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestIntervalOptionsOverride: a flag that was given overrides the spec's
// intervals key; one that was not leaves the spec's value; no flag at all
// leaves the spec to fairness.Run (nil override).
func TestIntervalOptionsOverride(t *testing.T) {
	type iv = fairness.Intervals
	spec := iv{Replicates: 200, Level: 0.9, KeepRatios: false}
	flags := func(replicates int, level float64, fast bool) iv {
		return iv{Replicates: replicates, Level: level, KeepRatios: fast}
	}
	cases := []struct {
		name string
		o    intervalOptions
		want *iv
	}{
		{"no flags", intervalOptions{flags: flags(0, 0.95, false)}, nil},
		{"replicates", intervalOptions{flags: flags(50, 0.95, false), replicatesSet: true}, &iv{Replicates: 50, Level: 0.9}},
		{"off", intervalOptions{flags: flags(0, 0, false), replicatesSet: true}, &iv{Replicates: 0, Level: 0.9}},
		{"level", intervalOptions{flags: flags(0, 0.8, false), levelSet: true}, &iv{Replicates: 200, Level: 0.8}},
		{"fast", intervalOptions{flags: flags(0, 0, true), fastSet: true}, &iv{Replicates: 200, Level: 0.9, KeepRatios: true}},
		{"all", intervalOptions{flags: flags(30, 0.5, true)}.allSet(), &iv{Replicates: 30, Level: 0.5, KeepRatios: true}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := c.o.override(spec)
			if (got == nil) != (c.want == nil) || got != nil && *got != *c.want {
				t.Errorf("got %+v, want %+v", got, c.want)
			}
		})
	}
}
