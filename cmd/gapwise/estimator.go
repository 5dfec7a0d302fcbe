package main

import (
	"fmt"

	"github.com/gapwise/gapwise/attribution"
	"github.com/spf13/cobra"
)

// flagEstimator names the flag that replaces the spec's estimator key.
const flagEstimator = "estimator"

// bindEstimatorFlag adds --estimator to cmd.
func bindEstimatorFlag(cmd *cobra.Command, dst *string) {
	cmd.Flags().StringVar(dst, flagEstimator, "",
		"estimator of the coalition values `weighting|robust|both`, replacing the spec's estimator key: robust corrects regressions by the density ratios and gives influence-function intervals; both keeps the weighting numbers and checks them against robust")
}

// checkEstimator checks --estimator ("" when not given).
func checkEstimator(name string) error {
	if name == "" {
		return nil
	}
	if _, err := attribution.ParseEstimator(name); err != nil {
		return &usageError{fmt.Sprintf("--%s %q: want weighting, robust or both", flagEstimator, name)}
	}
	return nil
}
