package report

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// DemoOutputs names the files the demo wrote: the folder and the base
// names of the cohort, the spec, the result and the report in it, and
// Command, the words of how the user runs gapwise ("gapwise", or "go",
// "run", "./cmd/gapwise"; none means "gapwise"), for the hint of what to
// run next, in which every word is quoted for the shell as needed.
type DemoOutputs struct {
	Dir, Data, Spec, Result, Report string
	// AltGraph is the alternative graph file the demo wrote, "" for
	// none.
	AltGraph string
	Command  []string
}

// DemoSummary writes what `gapwise demo` prints after its audit: per
// metric, the two groups' values, the gap (with its interval when there is
// one) and the largest contribution; how the intervals were made (and why
// the contributions' intervals are approximate when they came from the
// fast bootstrap); whether small cells are suppressed; the warnings, most
// serious first, with their
// severities; then where the files are and the command to run next.
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
	if iv := intervalSetting(res); iv != "" {
		fmt.Fprintf(w, "\nIntervals in brackets: %s.\n", iv)
		if n := approximateNote(res); n != "" {
			fmt.Fprintln(w, n)
		}
	}
	if ss := suppressionSentences(res); len(ss) > 0 {
		fmt.Fprintln(w)
		for _, s := range ss {
			fmt.Fprintln(w, pt(s))
		}
	}
	if len(res.Warnings) > 0 {
		fmt.Fprintln(w, "\nWarnings (most serious first):")
		for n, i := range warningOrder(res.Warnings) {
			wr := res.Warnings[i]
			fmt.Fprintf(w, "  %d. %s: %s\n", n+1, severityWord(wr.Severity), pt(wr.Message))
		}
	} else {
		fmt.Fprintln(w, "\nNo warnings.")
	}
	command := out.Command
	if len(command) == 0 {
		command = []string{"gapwise"}
	}
	inputs := pt(out.Data) + ", " + pt(out.Spec)
	if out.AltGraph != "" {
		inputs += ", " + pt(out.AltGraph)
	}
	fmt.Fprintf(w, "\nWrote %s, %s and %s in %s\n", inputs, pt(out.Result), pt(out.Report), pt(out.Dir))
	next := shellCommand(append(command, "decompose", "--spec", filepath.Join(out.Dir, out.Spec))...)
	if out.AltGraph != "" {
		next = shellCommand(append(command, "decompose", "--spec", filepath.Join(out.Dir, out.Spec), "--alt-graph", filepath.Join(out.Dir, out.AltGraph))...)
	}
	fmt.Fprintf(w, "Open %s in a browser, or run next:\n  %s\n", pt(filepath.Join(out.Dir, out.Report)), pt(next))
}

// shellWord quotes s for a POSIX shell when it holds anything but
// letters, digits and -_./:@+=,%: in single quotes, a quote inside
// closing the quoted part, escaped with a backslash, and reopening it.
func shellWord(s string) string {
	safe := s != ""
	for _, r := range s {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || strings.ContainsRune("-_./:@+=,%", r)) {
			safe = false
		}
	}
	if safe {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}

// shellCommand joins words into a command line, each word quoted by
// shellWord.
func shellCommand(words ...string) string {
	q := make([]string, len(words))
	for i, w := range words {
		q[i] = shellWord(w)
	}
	return strings.Join(q, " ")
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
