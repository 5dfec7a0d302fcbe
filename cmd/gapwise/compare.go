package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/compare"
	"github.com/gapwise/gapwise/fairness/policy"
	"github.com/gapwise/gapwise/report"
)

// formatHTML is the standalone page, a format of compare.
const formatHTML = "html"

// compareOptions are the flags of `gapwise compare`.
type compareOptions struct {
	format      string
	out         string
	shared      bool
	independent bool
	leading     int
	policy      policyOptions
}

func newCompareCmd(stdout, stderr io.Writer) *cobra.Command {
	var o compareOptions
	cmd := &cobra.Command{
		Use:   "compare BEFORE AFTER | compare RESULT1 RESULT2 RESULT3 ...",
		Short: "Review how each gap and contribution changed between runs (a release review, or a history)",
		Long: `compare reads result files (decompose --format json, or result.json of an
output folder). With two files it reviews the change from BEFORE to AFTER
(model v3 and v4 on one cohort, or one model over two periods): per metric
the groups' values, the gap and every mechanism's contribution in both runs,
the change and, where both runs have intervals, an interval for the change.

The runs of one cohort share records, so their estimates are dependent: the
change interval then goes from the later run's lower bound minus the earlier
run's upper bound to the later upper minus the earlier lower bound, which
covers the true change with probability at least 2*level - 1 (90% for two 95%
intervals) whatever the dependence (Bonferroni). --independent declares the
runs to be on disjoint cohorts and combines the intervals as for independent
estimates (MOVER, about the runs' level).

With three or more files, in time order, it shows the history of each gap
and of its --leading largest contributions over the runs (a chart per metric
in HTML).

Runs with different labels or groups are refused; runs whose metrics or
graphs differ are refused unless --shared asks to compare what they share.

--policy FILE judges the latest run against a policy file and exits with
status 3 when a check breaches, after writing the outputs.`,
		Args: cobra.MinimumNArgs(2),
		RunE: func(cmd *cobra.Command, args []string) error {
			return wrapRun(runCompare(o, args, stdout))
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.format, "format", formatText, "output: `text|json|markdown|html`")
	f.StringVar(&o.out, "out", "", "write the output into `FILE` instead of stdout (atomically)")
	f.BoolVar(&o.shared, "shared", false, "compare the metrics and mechanisms the runs share instead of refusing runs that differ")
	f.BoolVar(&o.independent, "independent", false, "the runs are on disjoint cohorts: change intervals for independent estimates")
	f.IntVar(&o.leading, "leading", 3, "`N` largest contributions per metric to follow in a history")
	bindPolicyFlag(cmd, &o.policy)
	return cmd
}

// runCompare is `gapwise compare`.
func runCompare(o compareOptions, files []string, stdout io.Writer) error {
	switch o.format {
	case formatText, formatJSON, formatMarkdown, formatHTML:
	default:
		return &usageError{fmt.Sprintf("--format must be text, json, markdown or html, got %q", o.format)}
	}
	if o.leading < 1 || o.leading > 50 {
		return &usageError{fmt.Sprintf("--leading must be between 1 and 50, got %d", o.leading)}
	}
	if o.independent && len(files) > 2 {
		return &usageError{"--independent applies to a review of two runs"}
	}
	var pol *policy.Policy
	if o.policy.file != "" {
		p, err := policy.Load(o.policy.file)
		if err != nil {
			return err
		}
		pol = p
	}
	rs := make([]*fairness.Result, len(files))
	for i, f := range files {
		r, err := compare.Load(f)
		if err != nil {
			return err
		}
		rs[i] = r
	}
	var outcome *policy.Outcome
	if pol != nil {
		out, err := policy.Evaluate(pol, fairness.PolicySubjects(rs[len(rs)-1]))
		if err != nil {
			return err
		}
		outcome = out
	}
	opt := compare.Options{Shared: o.shared, Independent: o.independent, Leading: o.leading}
	var buf bytes.Buffer
	if len(files) == 2 {
		rv, err := compare.NewReview(files[0], rs[0], files[1], rs[1], opt)
		if err != nil {
			return err
		}
		rv.Policy = outcome
		if err := renderReview(&buf, rv, o.format); err != nil {
			return err
		}
	} else {
		h, err := compare.NewHistory(files, rs, opt)
		if err != nil {
			return err
		}
		h.Policy = outcome
		if err := renderHistory(&buf, h, o.format); err != nil {
			return err
		}
	}
	if o.out != "" {
		if err := writeFileAtomic(o.out, buf.Bytes(), inputFiles(append(files, o.policy.file)...)); err != nil {
			return err
		}
	} else if _, err := stdout.Write(buf.Bytes()); err != nil {
		return err
	}
	if outcome != nil && !outcome.Passed {
		return &policyBreachError{outcome: outcome}
	}
	return nil
}

func renderReview(w io.Writer, rv *compare.Review, format string) error {
	switch format {
	case formatJSON:
		return writeJSON(w, rv)
	case formatMarkdown:
		return report.WriteReviewMarkdown(w, rv)
	case formatHTML:
		return report.WriteReviewHTML(w, rv)
	}
	return report.WriteReviewText(w, rv)
}

func renderHistory(w io.Writer, h *compare.History, format string) error {
	switch format {
	case formatJSON:
		return writeJSON(w, h)
	case formatMarkdown:
		return report.WriteHistoryMarkdown(w, h)
	case formatHTML:
		return report.WriteHistoryHTML(w, h)
	}
	return report.WriteHistoryText(w, h)
}

// writeJSON writes v as indented JSON with a final newline.
func writeJSON(w io.Writer, v any) error {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return fmt.Errorf("encoding JSON: %w", err)
	}
	_, err = w.Write(append(b, '\n'))
	return err
}
