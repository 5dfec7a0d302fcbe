package fairness

// Assumptions lists, in a fixed order, the assumptions every audit's numbers
// rest on and the limits of what they mean. scoreIsNode drops the sentence
// about the score being a fixed function of recorded columns (a score node
// has its own mechanism instead); synthetic adds a sentence saying the data
// is invented.
func Assumptions(scoreIsNode, synthetic bool) []string {
	out := []string{
		"The causal graph is right: every direct influence between the recorded variables is drawn, and the arrows point the right way.",
		"There is no hidden confounding: no unrecorded variable drives two or more of the recorded ones.",
		"The mechanisms change independently between the groups: shifting how one node depends on its parents leaves the others as they are.",
		"Overlap: every combination of values seen in one group is possible in the other, so the density ratios are finite.",
	}
	if !scoreIsNode {
		out = append(out, "The model's score is a fixed function of the recorded columns; shifts in inputs the table does not hold are not seen (declare the score as a node to capture them).")
	} else {
		out = append(out, "The score is a node: its mechanism absorbs shifts in any model inputs the table does not hold.")
	}
	out = append(out,
		"The contributions are statistical estimates from finite samples, not clinical or legal findings.",
		"Whether a gap is acceptable is a matter for local regulation and institutional review, not for this tool.",
	)
	if synthetic {
		out = append(out, "The data is synthetic (invented for demonstration); no conclusion about real patients can be drawn from it.")
	}
	return out
}
