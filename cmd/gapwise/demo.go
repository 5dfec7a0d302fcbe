package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/synth"
	"github.com/gapwise/gapwise/report"
)

// Files of the demo folder besides the outputs of decompose.
const (
	demoData     = "cohort.csv"
	demoSpec     = "spec.yaml"
	demoAltGraph = "alt-graph.yaml" // synth.AnaemiaAltGraph
)

// The demo's defaults: demoRows records, with intervals from
// demoIntervals bootstrap replicates that refit the classifiers (the fast
// mode's intervals leave out the classifiers' error and are too narrow).
// At 100 refitting replicates the accuracy study measured 0.92–0.93
// coverage of 95% intervals, against 0.93–0.94 at the bootstrap's default
// of 200 and 0.89–0.92 at 40 (README, Accuracy); 5,000 records and 100
// replicates keep the run at a few seconds on two cores (README,
// Performance).
const (
	demoRows      = 5000
	demoIntervals = 100
)

// demoOptions are the flags of `gapwise demo`.
type demoOptions struct {
	out     string
	rows    int
	seed    uint64
	workers int
	force   bool
	date    string // --audit-date
	parquet bool   // --parquet: the cohort as cohort.parquet
	model   int    // --model: the screening model's version (synth.DemoModel)
	clinics bool   // --clinics: the cohort by clinic, every clinic against central (demo_clinics.go)
	// noAltGraphs (--alt-graphs=false) skips the reruns under other
	// graphs: the demo's alt-graph.yaml, independent roots and the label
	// as only parent.
	noAltGraphs bool

	intervals intervalOptions
	suppress  suppressOption
}

func newDemoCmd(stdout, stderr io.Writer) *cobra.Command {
	var o demoOptions
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Write a synthetic anaemia-screening cohort and its spec, and audit it",
		Long: `demo writes an invented cohort (cohort.csv) of adults screened for anaemia,
with a spec (spec.yaml) comparing women with men, into the output folder, then
runs decompose on them, writing result.json and report.html beside them.

The data are SYNTHETIC: generated from hand-picked mechanisms, they describe no
real patients and must not be used for anything but trying gapwise out.

--model 2 scores the same invented records with the demo model's second
version (a haemoglobin cut-off of 12.5 instead of 13 g/dL), for trying out
gapwise compare on two releases of a model.

By default the audit adds 95% intervals from 100 bootstrap replicates, each
refitting the classifiers; --intervals 0 turns them off, and --fast-intervals
keeps the fitted density ratios instead (faster, but the contributions'
intervals are then approximate: too narrow, and labelled so).

The audit is also rerun under three other causal graphs: alt-graph.yaml,
which the demo writes beside the spec (haemoglobin depending on anaemia
alone, the red-cell indices on age too), every node a root, and the label
as the only parent of every finding; the report shows what holds under
every graph and what changes. --alt-graphs=false skips them.

--parquet writes the cohort as cohort.parquet (Parquet) instead of
cohort.csv; the data, and so the result, are the same.

--clinics writes another invented cohort instead: the same screening run by
four clinics, with a spec that compares every clinic with central
(groups.comparison: every-other); the outputs are one result and report per
clinic, summary.json and summary.html. The outreach unit is too small to
audit and is listed as skipped.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			o.suppress.markSet(cmd)
			return wrapRun(runDemo(o, stdout, stderr))
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.out, "out", "gapwise-demo", "`DIR` for the cohort, spec and outputs")
	f.IntVar(&o.rows, "rows", demoRows, "`N` screened adults to generate")
	f.Uint64Var(&o.seed, "seed", 1, "seed `S` of the cohort generator")
	f.IntVar(&o.workers, "workers", 0, "`N` goroutines for estimation (0: one per CPU); results do not depend on it")
	f.BoolVar(&o.force, "force", false, "write into a non-empty folder, replacing the demo's files")
	f.IntVar(&o.model, "model", 1, "`VERSION` of the invented screening model that writes the score: 1 or 2")
	bindIntervalFlags(cmd, &o.intervals, demoIntervals, false, fairness.FormPercentile)
	bindAuditDateFlag(cmd, &o.date)
	f.BoolVar(&o.parquet, "parquet", false, "write the cohort as "+demoParquetData+" (Parquet) instead of "+demoData)
	bindSuppressFlag(cmd, &o.suppress)
	f.BoolFunc("alt-graphs", "also decompose under the demo's alt-graph.yaml, independent roots and the label as only parent (default true; --alt-graphs=false skips them)", func(v string) error {
		on, err := strconv.ParseBool(v)
		o.noAltGraphs = !on
		return err
	})
	f.BoolVar(&o.clinics, "clinics", false, "write the cohort of four invented clinics instead and audit every clinic against central (several comparison groups)")
	return cmd
}

// runDemo is `gapwise demo`. The cohort and spec are written first (as one
// write, see outDir); decompose then adds result.json and report.html. A
// failed audit therefore leaves the inputs in place to inspect. The demo's
// inputs are files it makes itself: with --force the folder's cohort.csv
// and spec.yaml are replaced (by rename, so a file linked to them
// elsewhere keeps its content; a symbolic link of those names is refused).
func runDemo(o demoOptions, stdout, stderr io.Writer) error {
	if o.rows < 100 {
		return &usageError{fmt.Sprintf("--rows must be at least 100, got %d", o.rows)}
	}
	if o.rows > maxDemoRows {
		return &usageError{fmt.Sprintf("--rows must be at most %d, got %d", maxDemoRows, o.rows)}
	}
	if err := checkWorkers(o.workers); err != nil {
		return err
	}
	if o.model == 0 { // options made in code: the flag's default
		o.model = 1
	}
	model, version, ok := synth.DemoModel(o.model)
	if !ok {
		return &usageError{fmt.Sprintf("--model must be 1 or 2, got %d", o.model)}
	}
	// The demo's spec has no intervals key: the flags decide.
	o.intervals = o.intervals.allSet()
	if err := o.intervals.check(); err != nil {
		return err
	}
	date, err := auditDate(o.date)
	if err != nil {
		return err
	}
	if err := o.suppress.check(); err != nil {
		return err
	}
	if o.clinics {
		return runDemoClinics(o, model, date, stdout, stderr)
	}
	data := demoData
	if o.parquet {
		data = demoParquetData
	}
	if err := (outDir{path: o.out, force: o.force}).check(data, demoSpec, demoAltGraph, resultFile, reportFile); err != nil {
		return err
	}
	line := newProgressLine(stderr)
	defer line.clear()
	line.show("gapwise: generating %d synthetic records ...", o.rows)
	var csv bytes.Buffer
	sc := synth.DefaultScenario()
	sc.Model = model
	recs := sc.Generate(o.rows, o.seed)
	table := synth.AnaemiaTable(recs)
	if err := table.WriteCSV(&csv); err != nil {
		return err
	}
	cohort := csv.Bytes()
	if o.parquet {
		if cohort, err = demoParquet(table); err != nil {
			return err
		}
	}
	inputs := []outFile{{data, cohort}, {demoSpec, synth.AnaemiaSpecVersion(data, version)}, {demoAltGraph, synth.AnaemiaAltGraph()}}
	// Outputs of an earlier demo in a forced folder would not match the new
	// cohort: they leave with the old inputs, so a failed audit leaves only
	// the new inputs.
	if err := (outDir{path: o.out, force: o.force}).write(inputs, resultFile, reportFile); err != nil {
		return err
	}
	specPath := filepath.Join(o.out, demoSpec)
	spec, err := fairness.LoadSpec(specPath)
	if err != nil {
		return err
	}
	if date != "" {
		spec.AuditDate = date
	}
	o.suppress.apply(spec)
	altPath := filepath.Join(o.out, demoAltGraph)
	var alts []fairness.AltGraph
	if !o.noAltGraphs {
		if alts, err = (altGraphOptions{files: []string{altPath}, labelParent: true}).load(spec); err != nil {
			return err
		}
	}
	res, err := audit(spec, o.workers, o.intervals, 0, alts, line)
	if err != nil {
		return err
	}
	files, err := outputFiles(res, false)
	if err != nil {
		return err
	}
	if err := (outDir{path: o.out, force: true, inputs: []string{specPath, spec.DataPath, altPath}}).write(files); err != nil {
		return err
	}
	return report.DemoSummary(stdout, res, report.DemoOutputs{
		Dir: o.out, Data: data, Spec: demoSpec, Result: resultFile, Report: reportFile, AltGraph: demoAltGraph,
		Command: invokedAs(os.Args[0]),
	})
}
