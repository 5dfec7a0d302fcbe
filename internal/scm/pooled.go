package scm

import (
	"fmt"
	"strconv"

	"github.com/gapwise/gapwise/attribution"
	"gonum.org/v1/gonum/mat"
)

// Columns returns, for every node, its columns in the feature matrix built
// by Pooled: one column for a continuous or binary node, Levels−1 indicator
// columns for a categorical node (level 0 is the baseline), in node order.
// p is the total number of columns.
func (m *Model) Columns() (cols [][]int, p int) {
	cols = make([][]int, len(m.Nodes))
	for i, n := range m.Nodes {
		width := 1
		if n.Kind == Categorical {
			width = n.Levels - 1
		}
		for c := 0; c < width; c++ {
			cols[i] = append(cols[i], p)
			p++
		}
	}
	return cols, p
}

// ColumnNames names the columns of Columns: the node name, or
// "node=level" for the indicators of a categorical node.
func (m *Model) ColumnNames() []string {
	var names []string
	for _, n := range m.Nodes {
		if n.Kind != Categorical {
			names = append(names, n.Name)
			continue
		}
		for l := 1; l < n.Levels; l++ {
			names = append(names, n.Name+"="+strconv.Itoa(l))
		}
	}
	return names
}

// Mechanisms returns one attribution.Mechanism per node, in node order, with
// column indices of Columns.
func (m *Model) Mechanisms() []attribution.Mechanism {
	cols, _ := m.Columns()
	mechs := make([]attribution.Mechanism, len(m.Nodes))
	for i, n := range m.Nodes {
		mech := attribution.Mechanism{Node: n.Name, NodeCols: append([]int(nil), cols[i]...)}
		for _, p := range n.Parents {
			mech.Parents = append(mech.Parents, m.Nodes[p].Name)
			mech.ParentCols = append(mech.ParentCols, cols[p]...)
		}
		mechs[i] = mech
	}
	return mechs
}

// Pooled draws nRef reference and nCmp comparison records (Sample with the
// same seed) and packs them as the engine's input: reference rows first,
// then comparison rows, features encoded as in Columns; the columns of
// Probability nodes are the Sample's ProbabilityCols.
func Pooled(m *Model, nRef, nCmp int, seed uint64) (*attribution.Sample, []attribution.Mechanism, error) {
	if nRef < 1 || nCmp < 1 {
		return nil, nil, fmt.Errorf("scm: Pooled needs records in both groups, got %d reference and %d comparison", nRef, nCmp)
	}
	ref, err := Sample(m, Reference, nRef, seed)
	if err != nil {
		return nil, nil, err
	}
	cmp, err := Sample(m, Comparison, nCmp, seed)
	if err != nil {
		return nil, nil, err
	}
	cols, p := m.Columns()
	n := nRef + nCmp
	s := &attribution.Sample{
		X:          mat.NewDense(n, p, nil),
		Comparison: make([]bool, n),
		Labels:     append(append([]float64(nil), ref.Labels...), cmp.Labels...),
		Scores:     append(append([]float64(nil), ref.Scores...), cmp.Scores...),
	}
	for i, node := range m.Nodes {
		if node.Kind == Probability {
			s.ProbabilityCols = append(s.ProbabilityCols, cols[i][0])
		}
	}
	for j := 0; j < n; j++ {
		v := ref.Values
		jj := j
		if j >= nRef {
			v, jj = cmp.Values, j-nRef
			s.Comparison[j] = true
		}
		for i, node := range m.Nodes {
			x := v[jj][i]
			if node.Kind != Categorical {
				s.X.Set(j, cols[i][0], x)
				continue
			}
			if l := int(x); l > 0 {
				s.X.Set(j, cols[i][l-1], 1)
			}
		}
	}
	return s, m.Mechanisms(), nil
}
