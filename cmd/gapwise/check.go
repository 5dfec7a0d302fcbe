package main

import (
	"io"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/report"
)

// checkOptions are the flags of `gapwise check`.
type checkOptions struct {
	spec string
}

func newCheckCmd(stdout, stderr io.Writer) *cobra.Command {
	var o checkOptions
	cmd := &cobra.Command{
		Use:   "check --spec FILE",
		Short: "Validate a spec and its data and show what decompose would estimate",
		Args:  cobra.NoArgs,
		RunE: func(*cobra.Command, []string) error {
			return wrapRun(runCheck(o, stdout, stderr))
		},
	}
	cmd.Flags().StringVar(&o.spec, "spec", "", "audit spec (YAML) `file`")
	_ = cmd.MarkFlagRequired("spec")
	return cmd
}

// runCheck is `gapwise check`: it validates the spec and the data without
// fitting anything and prints the plan.
func runCheck(o checkOptions, stdout, _ io.Writer) error {
	spec, err := fairness.LoadSpec(o.spec)
	if err != nil {
		return err
	}
	p, err := fairness.Plan(spec)
	if err != nil {
		return err
	}
	return report.Plan(stdout, spec, p)
}
