package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
)

// Flag names of the bootstrap settings.
const (
	flagIntervals     = "intervals"
	flagLevel         = "level"
	flagFastIntervals = "fast-intervals"
)

// intervalOptions are the bootstrap flags shared by decompose and demo. A
// flag that was given overrides the spec's intervals key; one left at its
// default gives way to the spec (the *Set fields say which were given).
type intervalOptions struct {
	// flags holds --intervals (replicates, 0 for none), --level and
	// --fast-intervals (keep the fitted ratios).
	flags fairness.Intervals

	replicatesSet, levelSet, fastSet bool
}

// bindIntervalFlags adds --intervals, --level and --fast-intervals to cmd
// with the given defaults.
func bindIntervalFlags(cmd *cobra.Command, o *intervalOptions, replicates int, fast bool) {
	f := cmd.Flags()
	f.IntVar(&o.flags.Replicates, flagIntervals, replicates, "`N` bootstrap replicates for percentile intervals (0: no intervals)")
	f.Float64Var(&o.flags.Level, flagLevel, fairness.DefaultIntervalLevel, "level `L` of the bootstrap intervals, strictly between 0 and 1")
	f.BoolVar(&o.flags.KeepRatios, flagFastIntervals, fast, "bootstrap with the fitted density ratios instead of refitting the classifiers (faster, narrower intervals)")
}

// markSet records which bootstrap flags were given on the command line.
func (o *intervalOptions) markSet(cmd *cobra.Command) {
	f := cmd.Flags()
	o.replicatesSet = f.Changed(flagIntervals)
	o.levelSet = f.Changed(flagLevel)
	o.fastSet = f.Changed(flagFastIntervals)
}

// check rejects flag values the bootstrap cannot use.
func (o intervalOptions) check() error {
	if o.replicatesSet && (o.flags.Replicates < 0 || o.flags.Replicates == 1) {
		return &usageError{fmt.Sprintf("--%s must be 0 (no intervals) or at least 2, got %d", flagIntervals, o.flags.Replicates)}
	}
	if o.replicatesSet && o.flags.Replicates > fairness.MaxReplicates {
		return &usageError{fmt.Sprintf("--%s must be at most %d, got %d", flagIntervals, fairness.MaxReplicates, o.flags.Replicates)}
	}
	if o.levelSet && !(o.flags.Level > 0 && o.flags.Level < 1) {
		return &usageError{fmt.Sprintf("--%s must be strictly between 0 and 1 (e.g. 0.95), got %v", flagLevel, o.flags.Level)}
	}
	return nil
}

// override returns the settings for fairness.RunOptions.Intervals: the
// spec's intervals key with each bootstrap flag that was given in its
// place, or nil when no flag was given (Run then reads the spec).
func (o intervalOptions) override(spec fairness.Intervals) *fairness.Intervals {
	if !o.replicatesSet && !o.levelSet && !o.fastSet {
		return nil
	}
	iv := spec
	if o.replicatesSet {
		iv.Replicates = o.flags.Replicates
	}
	if o.levelSet {
		iv.Level = o.flags.Level
	}
	if o.fastSet {
		iv.KeepRatios = o.flags.KeepRatios
	}
	return &iv
}

// runIntervals returns the bootstrap settings a run will use: the
// override of the flags, or the spec's intervals key.
func (o intervalOptions) runIntervals(spec fairness.Intervals) fairness.Intervals {
	if iv := o.override(spec); iv != nil {
		return *iv
	}
	return spec
}

// allSet treats every bootstrap flag as given, for commands (demo) whose
// spec never asks for intervals itself.
func (o intervalOptions) allSet() intervalOptions {
	o.replicatesSet, o.levelSet, o.fastSet = true, true, true
	return o
}
