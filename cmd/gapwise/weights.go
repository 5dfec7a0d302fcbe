package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/internal/didyoumean"
	"github.com/gapwise/gapwise/report"
)

// weightsOptions are the flags of `gapwise weights`.
type weightsOptions struct {
	spec      string
	mechanism string
	toward    string
	out       string
	workers   int
}

func newWeightsCmd(stdout, stderr io.Writer) *cobra.Command {
	var o weightsOptions
	cmd := &cobra.Command{
		Use:   "weights --spec FILE --mechanism NODE --out FILE.csv",
		Short: "Write per-record weights that make one group follow the other group's mechanism of a node",
		Long: `weights estimates the density ratio of one node's mechanism (the node given
its parents) between the groups with the spec's cross-fitted group
classifiers, and writes a CSV file with a weight per record of one group that
makes those records follow the other group's mechanism: with --toward
comparison (the default) the reference group's records, weighted by the
ratio; with --toward reference the comparison group's records, weighted by
its inverse. The spec's clip_ratios clips the log-ratios as decompose does.
Weights have mean 1 over the weighted records; the other group's records have
no row. The columns are line (the record's line in a CSV file; row for a
Parquet file), group, weight and clipped.

It prints the records weighted, the effective sample size (Kish), the
clipped records and the learners chosen. The weights move only that
mechanism and rest on the graph's assumptions; they are a starting point for
targeted reweighting or for planning which records to collect more of, not a
clinical intervention.`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := specFromArgs(cmd, args, &o.spec); err != nil {
				return wrapRun(err)
			}
			return wrapRun(runWeights(o, stdout, stderr))
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.spec, "spec", "", "audit spec (YAML) `FILE`; may also be given as the one argument")
	f.StringVar(&o.mechanism, "mechanism", "", "graph `NODE` whose mechanism the weights move")
	f.StringVar(&o.toward, "toward", fairness.TowardComparison, "the group whose mechanism the other follows: `comparison|reference`")
	f.StringVar(&o.out, "out", "", "CSV `FILE` to write (atomically)")
	f.IntVar(&o.workers, "workers", 0, "`N` goroutines for estimation (0: one per CPU); results do not depend on it")
	return cmd
}

// runWeights is `gapwise weights`.
func runWeights(o weightsOptions, stdout, _ io.Writer) error {
	if o.spec == "" {
		return &usageError{"give the spec: --spec FILE"}
	}
	if o.mechanism == "" {
		return &usageError{"give the node: --mechanism NODE"}
	}
	if o.out == "" {
		return &usageError{"give the output file: --out FILE.csv"}
	}
	if o.toward != fairness.TowardComparison && o.toward != fairness.TowardReference {
		return &usageError{fmt.Sprintf("--toward must be %s or %s, got %q", fairness.TowardComparison, fairness.TowardReference, report.Printable(o.toward))}
	}
	if err := checkWorkers(o.workers); err != nil {
		return err
	}
	spec, err := fairness.LoadSpec(o.spec)
	if err != nil {
		return err
	}
	nodes := spec.NodeNames()
	known := false
	for _, n := range nodes {
		known = known || n == o.mechanism
	}
	if !known {
		msg := fmt.Sprintf("--mechanism %s: no such node in the graph of %s (nodes: %s)", report.Printable(o.mechanism), report.Printable(o.spec), report.Printable(strings.Join(nodes, ", ")))
		if s, ok := didyoumean.Nearest(o.mechanism, nodes); ok {
			msg += fmt.Sprintf("; did you mean %s?", report.Printable(s))
		}
		return &usageError{msg}
	}
	w, err := fairness.Weights(spec, fairness.WeightsOptions{Node: o.mechanism, Toward: o.toward, Workers: o.workers})
	if err != nil {
		return err
	}
	position := "line"
	if fairness.IsParquet(spec.DataPath) {
		position = "row"
	}
	if err := writeFileAtomic(o.out, report.WeightsCSV(w, position), []string{o.spec, spec.DataPath}); err != nil {
		return err
	}
	return report.WeightsSummary(stdout, w, o.out)
}
