package main

import (
	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
)

// altGraphOptions are the flags that rerun decompose under alternative
// graphs (fairness.RunOptions.AltGraphs).
type altGraphOptions struct {
	files       []string // --alt-graph, in the order given
	independent bool     // --alt-graph-independent (implied by files)
	labelParent bool     // --alt-graph-label-parent
}

// bindAltGraphFlags adds the alternative-graph flags to cmd.
func bindAltGraphFlags(cmd *cobra.Command, o *altGraphOptions) {
	f := cmd.Flags()
	f.StringArrayVar(&o.files, "alt-graph", nil, "also decompose under the graph of YAML `FILE` (one key, graph, as in a spec, over the same columns); repeatable; adds the independent-roots reading")
	f.BoolVar(&o.independent, "alt-graph-independent", false, "also decompose with every node a root (the no-structure reading); implied by --alt-graph")
	f.BoolVar(&o.labelParent, "alt-graph-label-parent", false, "also decompose with the label as the only parent of every node below it in the spec's graph")
}

// load reads the graph files against spec and adds the automatic
// readings: the files in order, then the independent roots, then the
// label as only parent.
func (o altGraphOptions) load(spec *fairness.Spec) ([]fairness.AltGraph, error) {
	var out []fairness.AltGraph
	for _, path := range o.files {
		g, err := fairness.LoadAltGraph(spec, path)
		if err != nil {
			return nil, err
		}
		out = append(out, *g)
	}
	if o.independent || len(o.files) > 0 {
		out = append(out, fairness.IndependentGraph(spec))
	}
	if o.labelParent {
		out = append(out, fairness.LabelParentGraph(spec))
	}
	return out, nil
}
