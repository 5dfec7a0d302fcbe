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
	flagIntervalForm  = "interval-form"
)

// intervalOptions are the bootstrap flags shared by decompose and demo. A
// flag that was given overrides the spec's intervals key; one left at its
// default gives way to the spec (the *Set fields say which were given).
type intervalOptions struct {
	// flags holds --intervals (replicates, 0 for none), --level,
	// --fast-intervals (keep the fitted ratios) and --interval-form.
	flags fairness.Intervals
	// form is --interval-form as typed, checked by check.
	form string
	// byDefault: without --intervals and without the spec's
	// intervals.replicates, the run still computes intervals
	// (fairness.DefaultIntervals); decompose sets it.
	byDefault bool

	replicatesSet, levelSet, fastSet, formSet bool
}

// bindIntervalFlags adds --intervals, --level, --fast-intervals and
// --interval-form to cmd with the given defaults; replicates is the
// number --intervals shows as its default.
func bindIntervalFlags(cmd *cobra.Command, o *intervalOptions, replicates int, fast bool, form fairness.IntervalForm) {
	f := cmd.Flags()
	f.IntVar(&o.flags.Replicates, flagIntervals, replicates, "`N` bootstrap replicates for the intervals (0: no intervals)")
	f.Float64Var(&o.flags.Level, flagLevel, fairness.DefaultIntervalLevel, "level `L` of the bootstrap intervals, strictly between 0 and 1")
	f.BoolVar(&o.flags.KeepRatios, flagFastIntervals, fast, "bootstrap with the fitted density ratios instead of refitting the classifiers (faster; contribution intervals too narrow)")
	f.StringVar(&o.form, flagIntervalForm, string(form), "`FORM` of the intervals: normal (estimate ± t × bootstrap standard error) or percentile (the replicates' quantiles)")
}

// markSet records which bootstrap flags were given on the command line.
func (o *intervalOptions) markSet(cmd *cobra.Command) {
	f := cmd.Flags()
	o.replicatesSet = f.Changed(flagIntervals)
	o.levelSet = f.Changed(flagLevel)
	o.fastSet = f.Changed(flagFastIntervals)
	o.formSet = f.Changed(flagIntervalForm)
}

// check rejects flag values the bootstrap cannot use and sets the form.
func (o *intervalOptions) check() error {
	if o.replicatesSet && (o.flags.Replicates < 0 || o.flags.Replicates == 1) {
		return &usageError{fmt.Sprintf("--%s must be 0 (no intervals) or at least 2, got %d", flagIntervals, o.flags.Replicates)}
	}
	if o.replicatesSet && o.flags.Replicates > fairness.MaxReplicates {
		return &usageError{fmt.Sprintf("--%s must be at most %d, got %d", flagIntervals, fairness.MaxReplicates, o.flags.Replicates)}
	}
	if o.levelSet && !(o.flags.Level > 0 && o.flags.Level < 1) {
		return &usageError{fmt.Sprintf("--%s must be strictly between 0 and 1 (e.g. 0.95), got %v", flagLevel, o.flags.Level)}
	}
	// "" (options built without the flag, as in tests) leaves the form
	// to the engine's default.
	o.flags.Form = fairness.IntervalForm(o.form)
	if o.form != "" && !o.flags.Form.Known() {
		return &usageError{fmt.Sprintf("--%s must be %s or %s, got %q", flagIntervalForm, fairness.FormNormal, fairness.FormPercentile, o.form)}
	}
	return nil
}

// override returns the settings for fairness.RunOptions.Intervals: the
// spec's intervals key with each bootstrap flag that was given in its
// place. With byDefault, a run whose spec does not give
// intervals.replicates and whose --intervals was not given gets
// spec.ReplicatesByDefault for its form (50 for normal, 200 for
// percentile; none with estimator robust, whose influence-function
// intervals then stand), and a spec without intervals.form the default
// form.
// Without byDefault and without any flag it returns nil (Run then reads
// the spec).
func (o intervalOptions) override(spec *fairness.Spec) *fairness.Intervals {
	if !o.byDefault && !o.replicatesSet && !o.levelSet && !o.fastSet && !o.formSet {
		return nil
	}
	iv := spec.Intervals
	if o.levelSet {
		iv.Level = o.flags.Level
	}
	if o.fastSet {
		iv.KeepRatios = o.flags.KeepRatios
	}
	if o.formSet || (iv.Form == "" && o.byDefault) {
		iv.Form = o.flags.Form
	}
	switch {
	case o.replicatesSet:
		iv.Replicates = o.flags.Replicates
	case o.byDefault && !spec.IntervalReplicatesGiven:
		iv.Replicates = spec.ReplicatesByDefault(iv.Form)
	}
	return &iv
}

// runIntervals returns the bootstrap settings a run will use: the
// override of the flags, or the spec's intervals key.
func (o intervalOptions) runIntervals(spec *fairness.Spec) fairness.Intervals {
	if iv := o.override(spec); iv != nil {
		return *iv
	}
	return spec.Intervals
}

// allSet treats every bootstrap flag as given, for commands (demo) whose
// spec never asks for intervals itself.
func (o intervalOptions) allSet() intervalOptions {
	o.replicatesSet, o.levelSet, o.fastSet, o.formSet = true, true, true, true
	return o
}
