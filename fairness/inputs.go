package fairness

import (
	"fmt"
	"math"
)

// ModelInputs records the spec's model_inputs: the columns the model
// reads, those of them in no graph node, and whether the model reads the
// group column itself.
type ModelInputs struct {
	Declared     []string `json:"declared"`
	OutsideGraph []string `json:"outside_graph"`
	ReadsGroup   bool     `json:"reads_group"`
}

// modelInputs returns the ModelInputs of spec, or nil when it declares
// none.
func modelInputs(spec *Spec) *ModelInputs {
	if len(spec.ModelInputs) == 0 {
		return nil
	}
	return &ModelInputs{
		Declared:     append([]string{}, spec.ModelInputs...),
		OutsideGraph: append([]string{}, spec.OutsideInputs()...),
		ReadsGroup:   readsGroup(spec),
	}
}

// modelInputWarnings reports each model input in no graph node, with the
// standardised difference of its groups when details describe it, and a
// model that reads the group column. The graph's mechanisms carry a
// difference between the groups only through their nodes: an input
// outside the graph reaches the gap through none of them unless the score
// is itself a node, whose mechanism P(score | parents) then absorbs it
// together with how the model scores. Never nil.
func modelInputWarnings(mi *ModelInputs, group, score string, scoreIsNode bool, details *Details, names *Names) []Warning {
	out := []Warning{}
	if mi == nil {
		return out
	}
	remedy, sev := "; add it to the graph, or declare the score as a node with parents so that the score's mechanism carries it", SeverityCaution
	if scoreIsNode {
		remedy, sev = fmt.Sprintf("; the mechanism of the score node %s carries it, mixed with how the model scores; add it to the graph to tell them apart", columnWords(names, score)), SeverityNote
	}
	for _, c := range mi.OutsideGraph {
		msg := fmt.Sprintf("the model reads %s, which is in no graph node", columnWords(names, c))
		if d := stdDiffOf(details, c); !math.IsNaN(d) {
			msg += fmt.Sprintf(" (its groups differ by a standardised difference of %.2f)", d)
		}
		msg += ": a shift in it reaches the gap through no mechanism of the graph, so it is attributed to another mechanism or left in the residual" + remedy
		out = append(out, Warning{Kind: KindModelInputOutside, Severity: sev, Nodes: []string{}, Message: msg})
	}
	if mi.ReadsGroup && !scoreIsNode {
		out = append(out, Warning{Kind: KindModelReadsGroup, Severity: SeverityCaution, Nodes: []string{},
			Message: fmt.Sprintf("the model reads the group column %s itself: for equal inputs it can score the groups differently, and no mechanism of the graph carries that part of the gap; declare the score as a node with parents so that its mechanism does", columnWords(names, group))})
	}
	return out
}

// stdDiffOf returns the standardised difference of column c outside the
// graph in details, or NaN when it is not described or undefined.
func stdDiffOf(details *Details, c string) float64 {
	if details == nil {
		return math.NaN()
	}
	for _, cd := range details.Columns {
		if cd.Name == c && cd.OutsideGraph && cd.StdDiff != nil {
			return *cd.StdDiff
		}
	}
	return math.NaN()
}
