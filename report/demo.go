package report

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"path/filepath"

	"github.com/gapwise/gapwise/fairness"
)

// DemoOutputs names the files the demo wrote: the folder and the base
// names of the cohort, the spec, the result and the report in it, and
// Command, how the user runs gapwise ("gapwise", or "go run ./cmd/gapwise";
// "" means "gapwise"), for the hint of what to run next.
type DemoOutputs struct {
	Dir, Data, Spec, Result, Report string
	Command                         string
}

// DemoSummary writes what `gapwise demo` prints after its audit: per
// metric, the two groups' values, the gap (with its interval when there is
// one) and the largest contribution, then where the files are.
func DemoSummary(w io.Writer, res *fairness.Result, out DemoOutputs) error {
	var b bytes.Buffer
	writeDemoSummary(&b, res, out)
	_, err := w.Write(b.Bytes())
	return err
}

// writeDemoSummary builds the text of DemoSummary; names and paths are
// printed through Printable.
func writeDemoSummary(w io.Writer, res *fairness.Result, out DemoOutputs) {
	g := res.Groups
	ref, cmp, pt := Printable(refName(res)), Printable(cmpName(res)), Printable
	fmt.Fprintf(w, "Anaemia screening (SYNTHETIC demo data): %s %d records, %s %d records\n\n",
		ref, g.NReference, cmp, g.NComparison)
	name := 0
	for _, m := range res.Metrics {
		name = max(name, len(m.Metric))
	}
	for _, m := range res.Metrics {
		line := fmt.Sprintf("  %-*s  %s %.4f  %s %.4f  gap %+.4f", name, pt(m.Metric), ref, m.Reference, cmp, m.Comparison, m.Gap)
		if m.GapCI != nil {
			line += fmt.Sprintf(" [%+.4f, %+.4f]", m.GapCI.Low, m.GapCI.High)
		}
		if top, ok := Largest(m.Contributions); ok {
			line += fmt.Sprintf("  largest: %s %+.4f", pt(contribMech(res, top)), top.Value)
		}
		fmt.Fprintln(w, line)
	}
	if len(res.Warnings) > 0 {
		fmt.Fprintln(w, "\nWarnings:")
		for _, wr := range res.Warnings {
			fmt.Fprintf(w, "  - %s: %s\n", wr.Severity, pt(wr.Message))
		}
	}
	command := out.Command
	if command == "" {
		command = "gapwise"
	}
	fmt.Fprintf(w, "\nWrote %s, %s, %s and %s in %s\n", pt(out.Data), pt(out.Spec), pt(out.Result), pt(out.Report), pt(out.Dir))
	fmt.Fprintf(w, "Open %s in a browser, or run: %s decompose --spec %s\n",
		pt(filepath.Join(out.Dir, out.Report)), pt(command), pt(filepath.Join(out.Dir, out.Spec)))
}

// Largest returns the estimable contribution of largest magnitude (the
// first on ties); ok is false when there is none.
func Largest(cs []fairness.Contribution) (fairness.Contribution, bool) {
	best, ok := fairness.Contribution{}, false
	for _, c := range cs {
		if c.NotEstimable {
			continue
		}
		if !ok || math.Abs(c.Value) > math.Abs(best.Value) {
			best, ok = c, true
		}
	}
	return best, ok
}
