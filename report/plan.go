package report

import (
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

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

// writePlan builds the text of Plan. Every string from the spec or the
// data is printed through Printable.
func writePlan(b *strings.Builder, spec *fairness.Spec, p *fairness.PlanInfo) {
	pt, list := Printable, func(items []string) string { return Printable(strings.Join(items, ", ")) }
	title := p.Title
	if title == "" {
		title = spec.File
	}
	fmt.Fprintf(b, "%s: spec and data are valid\n", pt(title))
	if p.Synthetic {
		fmt.Fprintln(b, "SYNTHETIC DATA: the records are invented and describe no real patients.")
	}
	g, names := p.Groups, p.Names
	fmt.Fprintf(b, "\n  data        %s\n", pt(spec.DataPath))
	if m := p.Model; m != nil {
		fmt.Fprintf(b, "  model       %s\n", pt(modelLabel(&fairness.Result{Model: m})))
	}
	if spec.AuditDate != "" {
		fmt.Fprintf(b, "  audit date  %s\n", pt(spec.AuditDate))
	}
	fmt.Fprintf(b, "  label       %s%s\n", pt(withID(names.NodeName(p.Label), p.Label)), pt(labelWords(p.LabelValues)))
	fmt.Fprintf(b, "  score       %s (positive when >= %v)\n", pt(columnWithID(names, p.Score)), p.Threshold)
	fmt.Fprintf(b, "  groups      column %s: reference %s (%d records, %d events, %d dropped), comparison %s (%d records, %d events, %d dropped)\n",
		pt(columnWithID(names, g.Column)), pt(withID(names.GroupName(g.Reference, false), g.Reference)), g.NReference, g.EventsReference, g.DroppedReference,
		pt(withID(names.GroupName(g.Comparison, true), g.Comparison)), g.NComparison, g.EventsComparison, g.DroppedComparison)
	if s := excludedSentence(&fairness.Result{Groups: g}); s != "" {
		fmt.Fprintf(b, "  excluded    %s\n", pt(s))
	}
	if mi := p.ModelInputs; mi != nil {
		outside := "all in the graph"
		if len(mi.OutsideGraph) > 0 {
			outside = "outside the graph: " + list(mi.OutsideGraph)
		}
		fmt.Fprintf(b, "  inputs      %s (%s)\n", list(mi.Declared), outside)
	}
	fmt.Fprintf(b, "  metrics     %s\n", list(p.Metrics))
	fmt.Fprintf(b, "  classifier  %s (candidates: %s), %d folds, %s, seed %d\n", pt(p.Classifier), list(p.Learners), p.Folds, foldSplitsPhrase(p.FoldSplits), spec.Seed)
	fmt.Fprintf(b, "  features    %d encoded columns\n", p.Features)
	if iv := spec.IntervalsByDefault(); iv.Replicates > 0 {
		mode := "refitting the classifiers"
		if iv.KeepRatios {
			mode = "keeping the fitted ratios"
		}
		from := "spec key intervals"
		if !spec.IntervalReplicatesGiven {
			from = "decompose's default; --intervals 0 for none"
		}
		fmt.Fprintf(b, "  intervals   %d bootstrap replicates %s, %s, level %v (%s)\n", iv.Replicates, mode, formPhrase(iv.Form), iv.Level, from)
	} else if !spec.IntervalReplicatesGiven {
		fmt.Fprintf(b, "  intervals   influence-function Wald intervals of the robust estimator, no refits (decompose's default with estimator robust; --intervals N for the bootstrap)\n")
	} else {
		fmt.Fprintf(b, "  intervals   none (intervals.replicates: 0; decompose --intervals N adds them)\n")
	}
	writePlanNodes(b, p.Nodes, names)
	if len(p.Warnings) > 0 {
		fmt.Fprintln(b, "\nWarnings:")
		for _, w := range p.Warnings {
			fmt.Fprintf(b, "  - %s\n", pt(w.String()))
		}
	}
}

// writePlanNodes prints the mechanisms, their columns and their encoded
// features as aligned columns, widths counted after escaping; names gives
// the display names (nil: none), each column followed by its identifier.
func writePlanNodes(b *strings.Builder, nodes []fairness.PlanNode, names *fairness.Names) {
	fmt.Fprintf(b, "\n%d mechanisms:\n", len(nodes))
	mech, cols := make([]string, len(nodes)), make([]string, len(nodes))
	wMech, wCols := len("mechanism"), len("columns")
	for i, n := range nodes {
		mech[i] = Printable(n.Mechanism)
		if names != nil {
			mech[i] = Printable(names.Mechanism(n.Node, n.Parents))
		}
		cols[i] = Printable(columnsWithID(names, n.Columns))
		wMech = max(wMech, utf8.RuneCountInString(mech[i]))
		wCols = max(wCols, utf8.RuneCountInString(cols[i]))
	}
	fmt.Fprintf(b, "  %-*s  %-*s  %s\n", wMech, "mechanism", wCols, "columns", "features")
	for i, n := range nodes {
		fmt.Fprintf(b, "  %-*s  %-*s  %8d\n", wMech, mech[i], wCols, cols[i], n.Features)
	}
}
