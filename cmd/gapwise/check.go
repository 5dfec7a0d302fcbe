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
		Use:   "check --spec FILE | check FILE",
		Short: "Validate a spec and its data and show what decompose would estimate",
		Long: `check reads the spec and the data file, validates every key, the graph and
every record, and prints what decompose would run: the groups with their
records, events and rows not audited, the metrics, the learners and folds,
the mechanisms with their columns and encoded features, and the warnings
that can be judged without fitting (dropped rows, group-value near-misses,
model inputs outside the graph). It fits nothing, so it is fast; problems
exit with status 2 and a message naming the file, line and key or column.`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := specFromArgs(cmd, args, &o.spec); err != nil {
				return wrapRun(err)
			}
			return wrapRun(runCheck(o, stdout, stderr))
		},
	}
	cmd.Flags().StringVar(&o.spec, "spec", "", "audit spec (YAML) `FILE`; may also be given as the one argument")
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
