package scm

// evaluator computes node values for one record. It holds scratch buffers
// and is not safe for concurrent use.
type evaluator struct {
	m    *Model
	pa   [][]float64 // per node, its parents' values
	v    []float64   // node values
	u, z []float64   // noise
}

func newEvaluator(m *Model) *evaluator {
	k := len(m.Nodes)
	e := &evaluator{m: m, pa: make([][]float64, k), v: make([]float64, k), u: make([]float64, k), z: make([]float64, k)}
	for i, n := range m.Nodes {
		e.pa[i] = make([]float64, len(n.Parents))
	}
	return e
}

// node sets v[i] from the equation chosen by s, given earlier nodes' values.
func (e *evaluator) node(i int, s Coalition) {
	n := &e.m.Nodes[i]
	pa := e.pa[i]
	for j, p := range n.Parents {
		pa[j] = e.v[p]
	}
	eq := n.Reference
	if s.Has(i) && n.Comparison != nil {
		eq = n.Comparison
	}
	e.v[i] = eq(pa, e.u[i], e.z[i])
}

// record computes all node values of the current noise under coalition s.
func (e *evaluator) record(s Coalition) {
	for i := range e.m.Nodes {
		e.node(i, s)
	}
}

// everyCoalition calls visit(s, v) for every coalition s of shifted nodes
// (s ⊆ Model.ShiftedSet) with the node values v of the current noise under
// s; coalitions with unshifted nodes give the same values as s without them.
// Node i depends only on s ∩ {0..i}, so the coalitions are walked as a
// binary tree over nodes in topological order, costing at most
// 2^(k+1) − 2 equation calls instead of k·2^k. v is only valid during the
// call.
func (e *evaluator) everyCoalition(visit func(s Coalition, v []float64)) {
	e.walk(0, 0, visit)
}

func (e *evaluator) walk(i int, s Coalition, visit func(Coalition, []float64)) {
	if i == len(e.m.Nodes) {
		visit(s, e.v)
		return
	}
	e.node(i, s)
	e.walk(i+1, s, visit)
	if !e.m.Nodes[i].Shifted() {
		return
	}
	s |= 1 << uint(i)
	e.node(i, s)
	e.walk(i+1, s, visit)
}
