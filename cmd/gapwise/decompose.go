package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/report"
)

// Output formats of decompose.
const (
	formatText     = "text"
	formatJSON     = "json"
	formatMarkdown = "markdown"
)

// Files written into --out.
const (
	resultFile = "result.json"
	reportFile = "report.html"
)

// decomposeOptions are the flags of `gapwise decompose`.
type decomposeOptions struct {
	spec    string
	out     string
	format  string
	workers int
	force   bool
	date    string // --audit-date
	// estimator is --estimator ("": the spec's key).
	estimator string

	suppress suppressOption

	intervals  intervalOptions
	coalitions coalitionOptions
	policy     policyOptions
	alt        altGraphOptions
}

func newDecomposeCmd(stdout, stderr io.Writer) *cobra.Command {
	var o decomposeOptions
	cmd := &cobra.Command{
		Use:   "decompose --spec FILE | decompose FILE",
		Short: "Split each metric's gap between the groups into mechanism contributions",
		Long: `decompose runs the audit described by a spec file and prints, per metric,
the two groups' values, the gap and its split into the contributions of the
graph's mechanisms, with diagnostics, warnings and assumptions.

With --out DIR it also writes result.json (the machine-readable result) and
report.html (a standalone page) into DIR. DIR appears only when both files are
complete; an existing non-empty DIR is refused unless --force is given, and
then the two files are replaced together. An output that is the same file as
the spec or the data is refused.

Intervals are on by default: 95% bootstrap intervals from 50 replicates that
refit the classifiers, in the normal form (estimate ± t × bootstrap standard
error), the form and count that held their level in the coverage study.
--intervals N sets the replicates (0: no intervals), --level the level,
--interval-form percentile reads the replicates' quantiles instead (default
200 replicates then), and --fast-intervals keeps the fitted ratios (faster,
but the contributions' intervals are then too narrow). Every output names how
its intervals were made. The flags override the spec's intervals key one by
one.

The report's what-if panel reads the values of all coalitions of the
mechanisms, kept for up to --coalition-limit mechanisms (default 12, at most
16); --coalitions also writes them into the JSON output.

--estimator robust|both|weighting replaces the spec's estimator key: robust
estimates the coalition values by regressions corrected by the density ratios
(with influence-function intervals and a check against the weighting
estimate), both keeps the weighting numbers and checks them against robust.

--audit-date YYYY-MM-DD (or today) dates the audit in the outputs, in place
of the spec's audit_date key; without either the outputs hold no date, so
the same inputs give the same bytes on any day.

--policy FILE judges the result against a policy file of limits on the gaps
(and on the ratio between the groups for rates), lists every check in each
output and exits with status 3 when one breaches, after writing the
outputs; see the README's "Policy gate" section.

--alt-graph FILE (repeatable) reruns the decomposition under the graph in
FILE (a YAML file with one key, graph, written as in a spec, over the same
columns) and under the independent-roots reading (every node a root);
--alt-graph-independent asks for that reading alone, --alt-graph-label-parent
adds one with the label as the only parent of every node below it. Each
output then shows every graph's contributions side by side with what holds
under all of them and what changes, and warns (graph_dependent) when the
leading mechanism or a clear sign changes. The data cannot tell which graph
is right: agreement is reassurance, not proof.`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := specFromArgs(cmd, args, &o.spec); err != nil {
				return wrapRun(err)
			}
			o.intervals.markSet(cmd)
			o.suppress.markSet(cmd)
			return wrapRun(runDecompose(o, stdout, stderr))
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.spec, "spec", "", "audit spec (YAML) `FILE`; may also be given as the one argument")
	f.StringVar(&o.out, "out", "", "also write result.json and report.html into `DIR`")
	f.StringVar(&o.format, "format", formatText, "output on stdout: `text|json|markdown`")
	f.IntVar(&o.workers, "workers", 0, "`N` goroutines for estimation (0: one per CPU); results do not depend on it")
	f.BoolVar(&o.force, "force", false, "write into a non-empty --out folder, replacing result.json and report.html")
	o.intervals.byDefault = true
	bindIntervalFlags(cmd, &o.intervals, fairness.DefaultIntervals.Replicates, false, fairness.DefaultIntervals.Form)
	bindCoalitionFlags(cmd, &o.coalitions)
	bindAuditDateFlag(cmd, &o.date)
	bindPolicyFlag(cmd, &o.policy)
	bindEstimatorFlag(cmd, &o.estimator)
	bindSuppressFlag(cmd, &o.suppress)
	bindAltGraphFlags(cmd, &o.alt)
	return cmd
}

// runDecompose is `gapwise decompose`: load the spec, run the audit, print
// the result on stdout in o.format and, with o.out, write the output folder.
func runDecompose(o decomposeOptions, stdout, stderr io.Writer) error {
	if err := checkFormat(o.format); err != nil {
		return err
	}
	if err := checkWorkers(o.workers); err != nil {
		return err
	}
	if err := o.intervals.check(); err != nil {
		return err
	}
	if err := o.coalitions.check(); err != nil {
		return err
	}
	if err := checkEstimator(o.estimator); err != nil {
		return err
	}
	date, err := auditDate(o.date)
	if err != nil {
		return err
	}
	if err := o.suppress.check(); err != nil {
		return err
	}
	out := outDir{path: o.out, force: o.force, inputs: append(inputFiles(o.spec, o.policy.file), o.alt.files...)}
	if o.out != "" {
		if err := out.check(resultFile, reportFile); err != nil {
			return err
		}
	}
	spec, err := fairness.LoadSpec(o.spec)
	if err != nil {
		return err
	}
	if date != "" {
		spec.AuditDate = date
	}
	if o.estimator != "" {
		spec.Estimator = o.estimator
	}
	o.suppress.apply(spec)
	out.inputs = append(inputFiles(o.spec, o.policy.file, spec.DataPath), o.alt.files...)
	alts, err := o.alt.load(spec)
	if err != nil {
		return err
	}
	pol, err := o.policy.load(spec, o.intervals.runIntervals(spec))
	if err != nil {
		return err
	}
	if spec.Groups.Several() {
		if len(alts) > 0 {
			return &usageError{"--alt-graph and --alt-graph-* are not available with several comparison groups (groups.comparison is a list or every-other): audit one comparison at a time"}
		}
		return runDecomposeGroups(o, spec, out, pol, stdout, stderr)
	}
	if o.out != "" {
		if err := out.checkInputs(resultFile, reportFile); err != nil {
			return err
		}
	}
	line := newProgressLine(stderr)
	defer line.clear()
	res, err := audit(spec, o.workers, o.intervals, o.coalitions.runLimit(), alts, line)
	if err != nil {
		return err
	}
	if err := fairness.ApplyPolicy(res, pol); err != nil {
		return err
	}
	var files []outFile
	if o.out != "" {
		if files, err = outputFiles(res, o.coalitions.json); err != nil {
			return err
		}
	}
	var buf bytes.Buffer
	if err := render(&buf, res, o.format, o.coalitions.json); err != nil {
		return err
	}
	if o.out != "" {
		if err := out.write(files); err != nil {
			return err
		}
	}
	if _, err = stdout.Write(buf.Bytes()); err != nil {
		return err
	}
	return policyVerdict(res)
}

// inputFiles lists the input files an output must not overwrite, leaving
// out those not given ("").
func inputFiles(paths ...string) []string {
	var out []string
	for _, p := range paths {
		if p != "" {
			out = append(out, p)
		}
	}
	return out
}

// checkFormat rejects an unknown --format.
func checkFormat(format string) error {
	switch format {
	case formatText, formatJSON, formatMarkdown:
		return nil
	}
	return &usageError{fmt.Sprintf("--format must be text, json or markdown, got %q", format)}
}

// render writes res in the given format; JSON holds the coalitions only
// when coalitions is set.
func render(w io.Writer, res *fairness.Result, format string, coalitions bool) error {
	switch format {
	case formatJSON:
		b, err := resultJSON(res, coalitions)
		if err != nil {
			return err
		}
		_, err = w.Write(b)
		return err
	case formatMarkdown:
		return report.WriteMarkdown(w, res)
	default:
		return report.WriteText(w, res)
	}
}

// resultJSON is the indented JSON encoding of res with a final newline:
// the content of result.json and of --format json, with the coalitions
// only when coalitions is set (withoutCoalitions).
func resultJSON(res *fairness.Result, coalitions bool) ([]byte, error) {
	b, err := json.MarshalIndent(withoutCoalitions(res, coalitions), "", "  ")
	if err != nil {
		return nil, fmt.Errorf("encoding the result as JSON: %w", err)
	}
	return append(b, '\n'), nil
}

// outputFiles renders the files of an output folder; result.json holds
// the coalitions only when coalitions is set, the page always.
func outputFiles(res *fairness.Result, coalitions bool) ([]outFile, error) {
	js, err := resultJSON(res, coalitions)
	if err != nil {
		return nil, err
	}
	var html bytes.Buffer
	if err := report.WriteHTML(&html, res); err != nil {
		return nil, fmt.Errorf("rendering the HTML report: %w", err)
	}
	return []outFile{{resultFile, js}, {reportFile, html.Bytes()}}, nil
}

// audit runs fairness.Run on spec with the bootstrap settings of the spec
// and the flags and the coalition limit (fairness.RunOptions.CoalitionLimit),
// showing progress on line.
func audit(spec *fairness.Spec, workers int, iv intervalOptions, coalitionLimit int, alts []fairness.AltGraph, line *progressLine) (*fairness.Result, error) {
	ro := fairness.RunOptions{Workers: workers, Version: version, Intervals: iv.override(spec),
		Progress: line.bootstrap(), SamplingProgress: line.sampling(), CoalitionLimit: coalitionLimit, AltGraphs: alts}
	if len(alts) > 0 {
		line.show("gapwise: estimating %d mechanisms for %d metrics under %d graphs ...", len(spec.Graph), len(spec.Metrics), 1+len(alts))
	} else {
		line.show("gapwise: estimating %d mechanisms for %d metrics ...", len(spec.Graph), len(spec.Metrics))
	}
	return fairness.Run(spec, ro)
}
