package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"os"

	"github.com/spf13/cobra"
	"golang.org/x/term"

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
}

func newDecomposeCmd(stdout, stderr io.Writer) *cobra.Command {
	var o decomposeOptions
	cmd := &cobra.Command{
		Use:   "decompose --spec FILE",
		Short: "Split each metric's gap between the groups into mechanism contributions",
		Long: `decompose runs the audit described by a spec file and prints, per metric,
the two groups' values, the gap and its split into the contributions of the
graph's mechanisms, with diagnostics, warnings and assumptions.

With --out DIR it also writes result.json (the machine-readable result) and
report.html (a standalone page) into DIR. DIR appears only when both files are
complete; an existing non-empty DIR is refused unless --force is given.`,
		Args: cobra.NoArgs,
		RunE: func(*cobra.Command, []string) error {
			return wrapRun(runDecompose(o, stdout, stderr))
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.spec, "spec", "", "audit spec (YAML) `file`")
	f.StringVar(&o.out, "out", "", "also write result.json and report.html into `folder`")
	f.StringVar(&o.format, "format", formatText, "output on stdout: text, json or markdown")
	f.IntVar(&o.workers, "workers", 0, "goroutines for estimation (0: one per CPU); results do not depend on it")
	f.BoolVar(&o.force, "force", false, "write into a non-empty --out folder, replacing result.json and report.html")
	_ = cmd.MarkFlagRequired("spec")
	return cmd
}

// runDecompose is `gapwise decompose`: load the spec, run the audit, print
// the result on stdout in o.format and, with o.out, write the output folder.
func runDecompose(o decomposeOptions, stdout, stderr io.Writer) error {
	if err := checkFormat(o.format); err != nil {
		return err
	}
	if o.workers < 0 {
		return &usageError{fmt.Sprintf("--workers must be 0 or more, got %d", o.workers)}
	}
	if o.out != "" {
		if err := checkOutDir(o.out, o.force); err != nil {
			return err
		}
	}
	spec, err := fairness.LoadSpec(o.spec)
	if err != nil {
		return err
	}
	progress(stderr, "gapwise: estimating %d mechanisms for %d metrics ...\n", len(spec.Graph), len(spec.Metrics))
	res, err := fairness.Run(spec, fairness.RunOptions{Workers: o.workers, Version: version})
	if err != nil {
		return err
	}
	var files []outFile
	if o.out != "" {
		if files, err = outputFiles(res); err != nil {
			return err
		}
	}
	var buf bytes.Buffer
	if err := render(&buf, res, o.format); err != nil {
		return err
	}
	if o.out != "" {
		if err := writeOutDir(o.out, files, o.force); err != nil {
			return err
		}
	}
	_, err = stdout.Write(buf.Bytes())
	return err
}

// checkFormat rejects an unknown --format.
func checkFormat(format string) error {
	switch format {
	case formatText, formatJSON, formatMarkdown:
		return nil
	}
	return &usageError{fmt.Sprintf("--format must be text, json or markdown, got %q", format)}
}

// render writes res in the given format.
func render(w io.Writer, res *fairness.Result, format string) error {
	switch format {
	case formatJSON:
		b, err := resultJSON(res)
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
// the content of result.json and of --format json.
func resultJSON(res *fairness.Result) ([]byte, error) {
	b, err := json.MarshalIndent(res, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("encoding the result as JSON: %w", err)
	}
	return append(b, '\n'), nil
}

// outputFiles renders the files of an output folder.
func outputFiles(res *fairness.Result) ([]outFile, error) {
	js, err := resultJSON(res)
	if err != nil {
		return nil, err
	}
	var html bytes.Buffer
	if err := report.WriteHTML(&html, res); err != nil {
		return nil, fmt.Errorf("rendering the HTML report: %w", err)
	}
	return []outFile{{resultFile, js}, {reportFile, html.Bytes()}}, nil
}

// progress prints a progress message to stderr only when it is a terminal.
func progress(stderr io.Writer, format string, args ...any) {
	if f, ok := stderr.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		fmt.Fprintf(stderr, format, args...)
	}
}
