package fairness

import (
	"fmt"
	"slices"
	"strings"
)

// validateGraph checks that the graph of s is a DAG over disjoint column
// sets and that it agrees with the label, score, group and categorical
// keys:
//
//   - node names are unique and every parent names a node;
//   - every column belongs to one node only;
//   - following parent → child edges never returns to a node (acyclic);
//   - the label column belongs to a node;
//   - the group column is not a graph column (it indexes the two
//     distributions instead);
//   - the score column is either absent from the graph or a node of its own;
//   - categorical columns are graph columns other than label and score;
//   - probability columns are numeric graph columns other than the label.
func validateGraph(s *Spec) error {
	f := s.File
	index := map[string]int{}
	owner := map[string]string{} // column → node
	for i, n := range s.Graph {
		key := fmt.Sprintf("graph[%d]", i)
		if j, dup := index[n.Node]; dup {
			return specErr(f, n.Line, key+".node", ErrDuplicateNode, "node %q is already defined by graph[%d] on line %d", n.Node, j, s.Graph[j].Line)
		}
		index[n.Node] = i
		for c, col := range n.Columns {
			if other, dup := owner[col]; dup {
				return specErr(f, n.columnLines[c], key+".columns", ErrColumnReuse, "column %q already belongs to node %q", col, other)
			}
			owner[col] = n.Node
		}
	}
	for i, n := range s.Graph {
		key := fmt.Sprintf("graph[%d].parents", i)
		seen := map[string]bool{}
		for j, par := range n.Parents {
			if _, ok := index[par]; !ok {
				return specErr(f, n.parentLines[j], key, ErrUnknownNode, "unknown node %q", par)
			}
			if par == n.Node {
				return specErr(f, n.parentLines[j], key, ErrCycle, "node %q lists itself as a parent", par)
			}
			if seen[par] {
				return specErr(f, n.parentLines[j], key, ErrBadValue, "parent %q is listed twice", par)
			}
			seen[par] = true
		}
	}
	if cyc := findCycle(s.Graph, index); cyc != nil {
		first := s.Graph[index[cyc[0]]]
		return specErr(f, first.Line, "graph", ErrCycle, "the graph has a cycle: %s", strings.Join(cyc, " → "))
	}
	if _, ok := owner[s.Label]; !ok {
		return specErr(f, s.lines["label"], "label", ErrLabelNotNode, "label column %q is not a column of any graph node; add it as a node", s.Label)
	}
	if s.Score == s.Label {
		return specErr(f, s.lines["score"], "score", ErrBadValue, "score and label name the same column %q", s.Score)
	}
	if err := checkGroupColumns(s, owner); err != nil {
		return err
	}
	if node, ok := owner[s.Score]; ok {
		n := s.Graph[index[node]]
		if len(n.Columns) != 1 {
			return specErr(f, n.Line, fmt.Sprintf("graph[%d].columns", index[node]), ErrScoreInGraph, "score column %q must be a node of its own, not part of node %q", s.Score, node)
		}
	}
	seen := map[string]bool{}
	for i, c := range s.Categorical {
		key := fmt.Sprintf("categorical[%d]", i)
		switch {
		case seen[c]:
			return specErr(f, s.catLines[i], key, ErrBadValue, "column %q is listed twice", c)
		case c == s.Label || c == s.Score:
			return specErr(f, s.catLines[i], key, ErrBadValue, "column %q is the label or score and cannot be categorical", c)
		case owner[c] == "" && !slices.Contains(s.OutsideInputs(), c):
			return specErr(f, s.catLines[i], key, ErrBadValue, "column %q is not a column of any graph node (nor a model input outside the graph)", c)
		}
		seen[c] = true
	}
	if err := validateProbabilities(s, owner); err != nil {
		return err
	}
	return validateInputs(s)
}

// validateProbabilities checks probabilities: each entry once, a numeric
// graph column, and not the label (a 0/1 outcome, not a probability).
// owner maps each graph column to its node.
func validateProbabilities(s *Spec, owner map[string]string) error {
	seen := map[string]bool{}
	for i, c := range s.Probabilities {
		key := fmt.Sprintf("probabilities[%d]", i)
		switch {
		case seen[c]:
			return specErr(s.File, s.probLines[i], key, ErrBadValue, "column %q is listed twice", c)
		case owner[c] == "":
			return specErr(s.File, s.probLines[i], key, ErrBadValue, "column %q is not a column of any graph node", c)
		case c == s.Label:
			return specErr(s.File, s.probLines[i], key, ErrBadValue, "column %q is the label, a 0/1 outcome rather than a probability", c)
		case slices.Contains(s.Categorical, c):
			return specErr(s.File, s.probLines[i], key, ErrBadValue, "column %q is categorical; a probability column holds numbers in [0, 1]", c)
		}
		seen[c] = true
	}
	return nil
}

// validateInputs checks model_inputs: each column once, and neither the
// label (a model that reads the outcome is not a screening model) nor the
// score (the model's output).
func validateInputs(s *Spec) error {
	seen := map[string]bool{}
	for i, c := range s.ModelInputs {
		key := fmt.Sprintf("model_inputs[%d]", i)
		switch {
		case seen[c]:
			return specErr(s.File, s.inputLines[i], key, ErrBadValue, "column %q is listed twice", c)
		case c == s.Label:
			return specErr(s.File, s.inputLines[i], key, ErrBadValue, "column %q is the label; a model that reads the outcome cannot be audited", c)
		case c == s.Score:
			return specErr(s.File, s.inputLines[i], key, ErrBadValue, "column %q is the score, the model's output", c)
		}
		seen[c] = true
	}
	return nil
}

// findCycle returns the nodes of a directed cycle, starting and ending with
// the same node, or nil when the graph is acyclic. Edges run parent → child.
// The search visits nodes in spec order and the cycle starts at its node
// listed first, so the cycle reported is deterministic.
func findCycle(graph []NodeSpec, index map[string]int) []string {
	const (
		unvisited = iota
		onStack
		done
	)
	state := make([]int, len(graph))
	var stack []int
	var cycle []string
	// visit walks from node i towards its parents; a parent already on the
	// stack closes a cycle (reversed to read parent → child).
	var visit func(i int) bool
	visit = func(i int) bool {
		state[i] = onStack
		stack = append(stack, i)
		for _, par := range graph[i].Parents {
			j := index[par]
			switch state[j] {
			case onStack:
				k := len(stack) - 1
				for stack[k] != j {
					k--
				}
				for m := k; m < len(stack); m++ {
					cycle = append(cycle, graph[stack[m]].Node)
				}
				// stack[k:] reads child ← parent; reverse to parent → child.
				for a, b := 0, len(cycle)-1; a < b; a, b = a+1, b-1 {
					cycle[a], cycle[b] = cycle[b], cycle[a]
				}
				// Start at the node listed first in the spec.
				first := 0
				for m := range cycle {
					if index[cycle[m]] < index[cycle[first]] {
						first = m
					}
				}
				cycle = append(cycle[first:], cycle[:first]...)
				cycle = append(cycle, cycle[0])
				return true
			case unvisited:
				if visit(j) {
					return true
				}
			}
		}
		stack = stack[:len(stack)-1]
		state[i] = done
		return false
	}
	for i := range graph {
		if state[i] == unvisited && visit(i) {
			return cycle
		}
	}
	return nil
}
