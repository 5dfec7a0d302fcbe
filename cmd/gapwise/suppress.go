package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
)

// flagSuppressBelow names the flag of small-cell suppression.
const flagSuppressBelow = "suppress-below"

// suppressOption is --suppress-below: the threshold, and whether it was
// given (then it replaces the spec's suppress_below, 0 turning it off).
type suppressOption struct {
	below int
	set   bool
}

// bindSuppressFlag adds --suppress-below to cmd.
func bindSuppressFlag(cmd *cobra.Command, o *suppressOption) {
	cmd.Flags().IntVar(&o.below, flagSuppressBelow, 0,
		"withhold counts from 1 to `T`−1 (confusion counts, score bins, column bins and levels, excluded group values) in every output, replacing the spec's suppress_below; 0 turns it off")
}

// markSet records whether --suppress-below was given.
func (o *suppressOption) markSet(cmd *cobra.Command) { o.set = cmd.Flags().Changed(flagSuppressBelow) }

// check rejects a threshold the audit cannot use (fairness.CheckSuppressBelow).
func (o suppressOption) check() error {
	if !o.set {
		return nil
	}
	if err := fairness.CheckSuppressBelow(o.below); err != nil {
		return &usageError{fmt.Sprintf("--%s %v", flagSuppressBelow, err)}
	}
	return nil
}

// apply puts the flag's threshold into spec when it was given.
func (o suppressOption) apply(spec *fairness.Spec) {
	if o.set {
		spec.SuppressBelow = o.below
	}
}
