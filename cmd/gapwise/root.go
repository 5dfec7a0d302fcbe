package main

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/report"
)

// newRootCmd builds the gapwise command tree writing results to stdout and
// messages to stderr.
func newRootCmd(stdout, stderr io.Writer) *cobra.Command {
	root := &cobra.Command{
		Use:   "gapwise",
		Short: "Explain a performance gap of a diagnostic model between two patient groups",
		Long: `gapwise splits the gap in a performance metric (false-negative rate,
false-positive rate, calibration, ...) between a reference and a comparison
group into the contributions of the mechanisms of a causal graph over the
recorded variables (Shapley values over mechanism shifts). Each hybrid of
the two groups is estimated by reweighting records with density ratios from
cross-fitted group classifiers; by default from both groups' records
(two-sided estimation, estimate_from: both in the spec), so that neither
group's weights alone carry the estimate.

The numbers are statistical estimates under stated assumptions (the graph is
right, no hidden confounding, independent mechanisms, overlap). They are not
clinical or legal findings.`,
		Version:       version,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	root.SetVersionTemplate("gapwise {{.Version}}\n")
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error {
		return fmt.Errorf("%w (see '%s --help')", err, c.CommandPath())
	})
	root.CompletionOptions.DisableDefaultCmd = true
	root.AddCommand(newDecomposeCmd(stdout, stderr), newCheckCmd(stdout, stderr), newDemoCmd(stdout, stderr), newCompareCmd(stdout, stderr), newWeightsCmd(stdout, stderr), newCompletionCmd(stdout))
	return root
}

// execute runs the command line args and returns the exit status. It
// prints an error, once, to stderr. A panic (a bug in gapwise, never the
// user's input) is reported as an internal error with exit status 1,
// without a stack trace.
func execute(args []string, stdout, stderr io.Writer) (code int) {
	defer func() {
		if v := recover(); v != nil {
			fmt.Fprintf(stderr, "gapwise: internal error: %s\ngapwise: this is a bug in gapwise, not a problem with the input; please report it with the command line used\n", report.Printable(fmt.Sprint(v)))
			code = exitFailure
		}
	}()
	root := newRootCmd(stdout, stderr)
	root.SetArgs(args)
	err := root.Execute()
	code = exitCode(err)
	if err != nil {
		fmt.Fprintf(stderr, "gapwise: %s\n", errorText(err))
	}
	return code
}

// errorText is the message of err as printed on the terminal: control
// characters and bidirectional controls in it (from file names, keys and
// cells the message quotes) are shown escaped by report.Printable, the
// same function that the text reports use. Errors of the commands are one
// line and escaped whole; cobra's own parse errors keep the line breaks
// and indenting tabs of their layout ("Did you mean this?\n\tdecompose").
func errorText(err error) string {
	msg := err.Error()
	var re *runError
	if errors.As(err, &re) {
		return report.Printable(msg)
	}
	lines := strings.Split(msg, "\n")
	for i, l := range lines {
		rest := strings.TrimLeft(l, "\t")
		lines[i] = l[:len(l)-len(rest)] + report.Printable(rest)
	}
	return strings.Join(lines, "\n")
}
