package main

import (
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestIntervalOptionsOverride: a flag that was given overrides the spec's
// intervals key; one that was not leaves the spec's value; no flag at all
// leaves the spec to fairness.Run (nil override), except with byDefault
// (decompose), where a spec without intervals.replicates gets the default
// replicates of its form and a spec without intervals.form the flag's.
func TestIntervalOptionsOverride(t *testing.T) {
	type iv = fairness.Intervals
	asked := &fairness.Spec{Intervals: iv{Replicates: 200, Level: 0.9}, IntervalReplicatesGiven: true}
	silent := &fairness.Spec{Intervals: iv{Level: 0.95}}
	off := &fairness.Spec{Intervals: iv{Level: 0.95}, IntervalReplicatesGiven: true}
	pct := &fairness.Spec{Intervals: iv{Level: 0.95, Form: fairness.FormPercentile}}
	flags := func(replicates int, level float64, fast bool) iv {
		return iv{Replicates: replicates, Level: level, KeepRatios: fast, Form: fairness.FormNormal}
	}
	def := func(o intervalOptions) intervalOptions { o.byDefault = true; return o }
	cases := []struct {
		name string
		spec *fairness.Spec
		o    intervalOptions
		want *iv
	}{
		{"no flags", asked, intervalOptions{flags: flags(0, 0.95, false)}, nil},
		{"replicates", asked, intervalOptions{flags: flags(50, 0.95, false), replicatesSet: true}, &iv{Replicates: 50, Level: 0.9}},
		{"off", asked, intervalOptions{flags: flags(0, 0, false), replicatesSet: true}, &iv{Replicates: 0, Level: 0.9}},
		{"level", asked, intervalOptions{flags: flags(0, 0.8, false), levelSet: true}, &iv{Replicates: 200, Level: 0.8}},
		{"fast", asked, intervalOptions{flags: flags(0, 0, true), fastSet: true}, &iv{Replicates: 200, Level: 0.9, KeepRatios: true}},
		{"form", asked, intervalOptions{flags: flags(0, 0, false), formSet: true}, &iv{Replicates: 200, Level: 0.9, Form: fairness.FormNormal}},
		{"all", asked, intervalOptions{flags: flags(30, 0.5, true)}.allSet(), &iv{Replicates: 30, Level: 0.5, KeepRatios: true, Form: fairness.FormNormal}},
		// decompose: intervals on by default.
		{"default, spec silent", silent, def(intervalOptions{flags: flags(50, 0.95, false)}), &iv{Replicates: 50, Level: 0.95, Form: fairness.FormNormal}},
		{"default, spec asks", asked, def(intervalOptions{flags: flags(50, 0.95, false)}), &iv{Replicates: 200, Level: 0.9, Form: fairness.FormNormal}},
		{"default, spec off", off, def(intervalOptions{flags: flags(50, 0.95, false)}), &iv{Replicates: 0, Level: 0.95, Form: fairness.FormNormal}},
		{"default, --intervals 0", silent, def(intervalOptions{flags: flags(0, 0.95, false), replicatesSet: true}), &iv{Replicates: 0, Level: 0.95, Form: fairness.FormNormal}},
		{"default, estimator robust", &fairness.Spec{Intervals: iv{Level: 0.95}, Estimator: "robust"}, def(intervalOptions{flags: flags(50, 0.95, false)}), &iv{Replicates: 0, Level: 0.95, Form: fairness.FormNormal}},
		{"default, estimator robust, --intervals 20", &fairness.Spec{Intervals: iv{Level: 0.95}, Estimator: "robust"}, def(intervalOptions{flags: flags(20, 0.95, false), replicatesSet: true}), &iv{Replicates: 20, Level: 0.95, Form: fairness.FormNormal}},
		{"default, spec percentile", pct, def(intervalOptions{flags: flags(50, 0.95, false)}), &iv{Replicates: 200, Level: 0.95, Form: fairness.FormPercentile}},
		{"default, --interval-form percentile", silent, def(intervalOptions{flags: iv{Replicates: 50, Level: 0.95, Form: fairness.FormPercentile}, formSet: true}), &iv{Replicates: 200, Level: 0.95, Form: fairness.FormPercentile}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := c.o.override(c.spec)
			if (got == nil) != (c.want == nil) || got != nil && *got != *c.want {
				t.Errorf("got %+v, want %+v", got, c.want)
			}
		})
	}
}

// TestIntervalFormFlag: --interval-form takes normal or percentile and
// rejects anything else with a usage error naming the flag.
func TestIntervalFormFlag(t *testing.T) {
	for _, c := range []struct {
		form string
		ok   bool
	}{{"normal", true}, {"percentile", true}, {"bca", false}, {"Normal", false}} {
		o := intervalOptions{form: c.form}
		err := o.check()
		if (err == nil) != c.ok {
			t.Errorf("--interval-form %q: error %v", c.form, err)
		}
		if err != nil && !strings.Contains(err.Error(), "--interval-form") {
			t.Errorf("--interval-form %q: message %q does not name the flag", c.form, err)
		}
	}
}
