// Package scm defines structural causal models with known mechanisms for
// testing the attribution engine against ground truth.
//
// A Model is a list of nodes in topological order. Node i has one structural
// equation per group,
//
//	x_i = f_i^g(pa_i, u_i, z_i),   g ∈ {reference, comparison},
//
// driven by its own noise pair: u_i ~ Uniform[0, 1) and z_i ~ N(0, 1). The
// noise is the same for both equations, so the hybrid distribution P_S (node
// i follows the comparison group's equation when i ∈ S, the reference's
// otherwise) can be simulated for every coalition S from the same draws
// (common random numbers): v(S) − v(S') then has far less Monte Carlo error
// than either value alone, and a mechanism whose equations agree, or whose
// output nothing downstream reads, changes no record at all and gets a
// Shapley value of exactly 0.
//
// Everything here is synthetic and exists to test the estimator.
package scm

import "fmt"

// Kind says how a node's value is encoded.
type Kind int

const (
	// Continuous nodes take any real value; one column.
	Continuous Kind = iota
	// Binary nodes take 0 or 1; one column.
	Binary
	// Categorical nodes take levels 0..Levels−1; Levels−1 indicator columns
	// (level 0 is the baseline).
	Categorical
	// Probability nodes take values in [0, 1], such as a model's score;
	// one column, listed in the Sample's ProbabilityCols (Pooled).
	Probability
)

// Equation is one group's structural equation of a node: it maps the
// parents' values (in Node.Parents order; categorical parents as level
// indices) and the node's noise pair u ~ Uniform[0,1), z ~ N(0,1) to the
// node's value.
type Equation func(pa []float64, u, z float64) float64

// Node is one variable of a Model.
type Node struct {
	Name    string
	Kind    Kind
	Levels  int   // number of levels of a Categorical node
	Parents []int // indices of earlier nodes
	// Reference is the reference group's equation. Comparison is the
	// comparison group's, or nil when the mechanism does not differ: the
	// node then uses Reference in every coalition and the simulation does
	// not branch on it (its Shapley value is exactly 0).
	Reference  Equation
	Comparison Equation
}

// Shifted reports whether the node's mechanism differs between groups.
func (n *Node) Shifted() bool { return n.Comparison != nil }

// Model is a structural causal model over Nodes (topological order) with a
// binary label node and a fixed scoring model.
type Model struct {
	Name  string
	Nodes []Node
	Label int // index of the Binary label node
	// Score is the audited model's probability for a record whose node
	// values are v (indexed like Nodes). It must be a fixed function of v.
	Score func(v []float64) float64
	// ScoreInputs optionally lists the nodes Score reads; nil means any.
	// The hybrid simulation reuses the previous score when the label and
	// these nodes are unchanged, which saves the score's cost on branches of
	// nodes the model does not read. A wrong list gives wrong scores.
	ScoreInputs []int
}

// MaxNodes bounds the number of nodes, so that every coalition fits in a
// Coalition bit set and 2^k statistics fit in memory.
const MaxNodes = 16

// Coalition is a set of node indices: bit i set means node i follows the
// comparison group's equation.
type Coalition uint64

// Has reports whether node i is in the coalition.
func (s Coalition) Has(i int) bool { return s&(1<<uint(i)) != 0 }

// All is the coalition of all k nodes.
func All(k int) Coalition { return Coalition(1)<<uint(k) - 1 }

// Validate checks the model's structure. It returns an error naming the
// offending node.
func (m *Model) Validate() error {
	k := len(m.Nodes)
	if k == 0 || k > MaxNodes {
		return fmt.Errorf("scm: model %q has %d nodes, want 1..%d", m.Name, k, MaxNodes)
	}
	if m.Score == nil {
		return fmt.Errorf("scm: model %q has no score function", m.Name)
	}
	if m.Label < 0 || m.Label >= k || m.Nodes[m.Label].Kind != Binary {
		return fmt.Errorf("scm: model %q: label index %d is not a binary node", m.Name, m.Label)
	}
	for _, i := range m.ScoreInputs {
		if i < 0 || i >= k {
			return fmt.Errorf("scm: model %q: score input index %d out of range", m.Name, i)
		}
	}
	seen := map[string]bool{}
	for i, n := range m.Nodes {
		if n.Name == "" || seen[n.Name] {
			return fmt.Errorf("scm: model %q: node %d has an empty or repeated name %q", m.Name, i, n.Name)
		}
		seen[n.Name] = true
		if n.Reference == nil {
			return fmt.Errorf("scm: model %q: node %q lacks a reference equation", m.Name, n.Name)
		}
		if n.Kind == Categorical && n.Levels < 2 {
			return fmt.Errorf("scm: model %q: categorical node %q needs at least 2 levels", m.Name, n.Name)
		}
		for _, p := range n.Parents {
			if p < 0 || p >= i {
				return fmt.Errorf("scm: model %q: node %q has parent index %d, want an earlier node", m.Name, n.Name, p)
			}
		}
	}
	return nil
}

// ShiftedSet is the coalition of nodes whose mechanisms differ.
func (m *Model) ShiftedSet() Coalition {
	var s Coalition
	for i := range m.Nodes {
		if m.Nodes[i].Shifted() {
			s |= 1 << uint(i)
		}
	}
	return s
}
