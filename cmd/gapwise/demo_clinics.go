package main

import (
	"bytes"
	"fmt"
	"io"
	"path/filepath"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/synth"
	"github.com/gapwise/gapwise/report"
)

// runDemoClinics is `gapwise demo --clinics`: the clinics cohort
// (synth.GenerateClinics) and its spec (synth.ClinicsSpec) are written
// first, then every clinic is audited against central (fairness.RunGroups)
// and the per-clinic files and the summary are added; it prints the
// summary matrix and the command to run next.
func runDemoClinics(o demoOptions, model synth.ScreeningModel, date string, stdout, stderr io.Writer) error {
	if o.parquet {
		return &usageError{"--clinics writes a CSV cohort; leave out --parquet"}
	}
	dir := outDir{path: o.out, force: o.force}
	if err := dir.check(demoData, demoSpec, summaryFile, summaryHTMLFile); err != nil {
		return err
	}
	line := newProgressLine(stderr)
	defer line.clear()
	line.show("gapwise: generating %d synthetic records ...", o.rows)
	recs, clinic := synth.GenerateClinics(o.rows, o.seed, model)
	var csv bytes.Buffer
	if err := synth.ClinicsTable(recs, clinic).WriteCSV(&csv); err != nil {
		return err
	}
	if err := dir.write([]outFile{{demoData, csv.Bytes()}, {demoSpec, synth.ClinicsSpec(demoData)}}, summaryFile, summaryHTMLFile); err != nil {
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
	ro := fairness.RunOptions{Workers: o.workers, Version: version, Intervals: o.intervals.override(spec), Progress: line.bootstrap()}
	line.show("gapwise: auditing every clinic against central ...")
	g, err := fairness.RunGroups(spec, ro)
	if err != nil {
		return err
	}
	files, err := groupsOutputFiles(g, false)
	if err != nil {
		return err
	}
	if err := (outDir{path: o.out, force: true, inputs: []string{specPath, spec.DataPath}}).write(files); err != nil {
		return err
	}
	line.clear()
	if err := report.WriteGroupsSummaryText(stdout, g); err != nil {
		return err
	}
	_, err = fmt.Fprintf(stdout, "Wrote %s: the cohort and spec, summary.json and summary.html, and a result and report per clinic.\nRun it again with: gapwise decompose %s --out DIR\n",
		report.Printable(o.out), report.Printable(specPath))
	return err
}
