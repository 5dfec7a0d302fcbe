package report

import (
	"fmt"
	"io"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// Plan writes what `gapwise check` shows of a validated spec and its plan
// (fairness.Plan) as aligned text: the inputs, the settings, the
// mechanisms with their columns and encoded features, and any warnings.
func Plan(w io.Writer, spec *fairness.Spec, p *fairness.PlanInfo) error {
	var b strings.Builder
	writePlan(&b, spec, p)
	_, err := io.WriteString(w, b.String())
	return err
}

// writePlan builds the text of Plan.
func writePlan(b *strings.Builder, spec *fairness.Spec, p *fairness.PlanInfo) {
	title := p.Title
	if title == "" {
		title = spec.File
	}
	fmt.Fprintf(b, "%s: spec and data are valid\n", title)
	if p.Synthetic {
		fmt.Fprintln(b, "SYNTHETIC DATA: the records are invented and describe no real patients.")
	}
	g := p.Groups
	fmt.Fprintf(b, "\n  data        %s\n", spec.DataPath)
	fmt.Fprintf(b, "  label       %s\n", p.Label)
	fmt.Fprintf(b, "  score       %s (positive when >= %v)\n", p.Score, p.Threshold)
	fmt.Fprintf(b, "  groups      column %s: reference %s (%d records, %d dropped), comparison %s (%d records, %d dropped)\n",
		g.Column, g.Reference, g.NReference, g.DroppedReference, g.Comparison, g.NComparison, g.DroppedComparison)
	fmt.Fprintf(b, "  metrics     %s\n", strings.Join(p.Metrics, ", "))
	fmt.Fprintf(b, "  classifier  %s (candidates: %s), %d folds, seed %d\n", p.Classifier, strings.Join(p.Learners, ", "), p.Folds, spec.Seed)
	fmt.Fprintf(b, "  features    %d encoded columns\n", p.Features)
	if iv := spec.Intervals; iv.Replicates > 0 {
		mode := "refitting the classifiers"
		if iv.KeepRatios {
			mode = "keeping the fitted ratios"
		}
		fmt.Fprintf(b, "  intervals   %d bootstrap replicates at level %v, %s\n", iv.Replicates, iv.Level, mode)
	} else {
		fmt.Fprintf(b, "  intervals   none (spec key intervals or decompose --intervals N)\n")
	}

	fmt.Fprintf(b, "\n%d mechanisms:\n", len(p.Nodes))
	wMech, wCols := len("mechanism"), len("columns")
	for _, n := range p.Nodes {
		wMech = max(wMech, len([]rune(n.Mechanism)))
		wCols = max(wCols, len(strings.Join(n.Columns, ", ")))
	}
	fmt.Fprintf(b, "  %-*s  %-*s  %s\n", wMech, "mechanism", wCols, "columns", "features")
	for _, n := range p.Nodes {
		fmt.Fprintf(b, "  %-*s  %-*s  %8d\n", wMech, n.Mechanism, wCols, strings.Join(n.Columns, ", "), n.Features)
	}
	if len(p.Warnings) > 0 {
		fmt.Fprintln(b, "\nWarnings:")
		for _, w := range p.Warnings {
			fmt.Fprintf(b, "  - %s\n", w)
		}
	}
}
