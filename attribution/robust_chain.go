package attribution

import (
	"fmt"
	"sort"
	"strconv"
	"strings"
)

// NodeReads says which mechanisms' nodes the label and the score are
// functions of. The robust estimator uses it to skip the steps a metric's
// terms do not depend on; the weighting estimator ignores it.
type NodeReads struct {
	// Label lists the mechanisms whose node holds the label (normally
	// one); nil means every mechanism.
	Label []int
	// Score lists the mechanisms whose nodes the audited score is a
	// function of (the score's node when the score is a node, or the
	// nodes of the model's declared inputs); nil means every mechanism.
	Score []int
}

// robustChain is the sequence of regression steps of the robust
// estimator for terms that depend on the nodes F (the label's node, the
// score's inputs, or both), in topological order V_{k_1}, …, V_{k_R} of
// the relevant nodes An(F), F and its ancestors. Going backwards from
// D_{R+1} = F, step r regresses μ_{r+1}(D_{r+1}) on
//
//	D_r = (D_{r+1} ∖ {V_{k_r}}) ∪ pa(V_{k_r}):
//
// within a group, V_{k_r} given every earlier node follows that group's
// mechanism given its parents alone (the graph's Markov property), so
// E[μ_{r+1} | V_{<k_r}] is a function of D_r. A node outside An(F) never
// enters D, its step would regress μ on itself (μ_r = μ_{r+1}, a zero
// correction), and the estimate does not depend on its group at all: a
// mechanism nothing reads gets exactly zero. D_1 is empty (V_{k_1} is a
// root), so μ_1 is the constant θ.
type robustChain struct {
	key   string // identifies F
	steps []chainStep
}

// chainStep is step r of a chain.
type chainStep struct {
	mech int   // mechanism k_r
	regs []int // mechanisms of D_r, ascending (empty for r = 1)
	// weights lists the mechanisms of An(D_{r+1}) ∖ {k_r}: ω_r, which
	// carries group c_{k_r}'s records to the hybrid's distribution of
	// those nodes, is the product of their ratios (or inverse ratios)
	// over those whose group differs from c_{k_r}.
	weights []int
}

// mechanismGraph holds the parents of every mechanism as indices and a
// topological order.
type mechanismGraph struct {
	parents [][]int
	order   []int // topological order, ties by mechanism index
	rank    []int // rank[i] = position of mechanism i in order
}

// newMechanismGraph resolves the Parents names of mechs to indices and
// orders them topologically (Kahn's algorithm, taking the lowest index
// first). It returns an error for an unknown parent or a cycle.
func newMechanismGraph(mechs []Mechanism) (*mechanismGraph, error) {
	index := map[string]int{}
	for i, m := range mechs {
		index[m.Node] = i
	}
	g := &mechanismGraph{parents: make([][]int, len(mechs)), rank: make([]int, len(mechs))}
	indeg := make([]int, len(mechs))
	children := make([][]int, len(mechs))
	for i, m := range mechs {
		for _, p := range m.Parents {
			j, ok := index[p]
			if !ok {
				return nil, fmt.Errorf("attribution: mechanism %q has parent %q, which is no mechanism", m.Node, p)
			}
			g.parents[i] = append(g.parents[i], j)
			children[j] = append(children[j], i)
			indeg[i]++
		}
	}
	done := make([]bool, len(mechs))
	for len(g.order) < len(mechs) {
		next := -1
		for i := range mechs {
			if !done[i] && indeg[i] == 0 {
				next = i
				break
			}
		}
		if next < 0 {
			return nil, fmt.Errorf("attribution: the mechanisms' parents form a cycle")
		}
		done[next] = true
		g.rank[next] = len(g.order)
		g.order = append(g.order, next)
		for _, c := range children[next] {
			indeg[c]--
		}
	}
	return g, nil
}

// ancestors returns set and all its ancestors, as a membership slice.
func (g *mechanismGraph) ancestors(set []int) []bool {
	in := make([]bool, len(g.parents))
	stack := append([]int(nil), set...)
	for len(stack) > 0 {
		i := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if in[i] {
			continue
		}
		in[i] = true
		stack = append(stack, g.parents[i]...)
	}
	return in
}

// chain builds the robust chain of terms that depend on the nodes f.
func (g *mechanismGraph) chain(f []int) robustChain {
	relevant := g.ancestors(f)
	var rel []int // relevant mechanisms in topological order
	for _, i := range g.order {
		if relevant[i] {
			rel = append(rel, i)
		}
	}
	d := map[int]bool{}
	for _, i := range f {
		d[i] = true
	}
	steps := make([]chainStep, len(rel))
	for r := len(rel) - 1; r >= 0; r-- {
		k := rel[r]
		anc := g.ancestors(setOf(d))
		st := chainStep{mech: k}
		for i, in := range anc {
			if in && i != k {
				st.weights = append(st.weights, i)
			}
		}
		delete(d, k)
		for _, p := range g.parents[k] {
			d[p] = true
		}
		st.regs = setOf(d)
		steps[r] = st
	}
	return robustChain{key: chainKey(f), steps: steps}
}

// setOf returns the members of d in ascending order.
func setOf(d map[int]bool) []int {
	out := make([]int, 0, len(d))
	for i := range d {
		out = append(out, i)
	}
	sort.Ints(out)
	return out
}

// chainKey names a node set.
func chainKey(f []int) string {
	c := append([]int(nil), f...)
	sort.Ints(c)
	parts := make([]string, len(c))
	for i, v := range c {
		parts[i] = strconv.Itoa(v)
	}
	return strings.Join(parts, ",")
}

// termNodes returns the mechanisms term t depends on under reads (every
// mechanism for an unknown side); k is the number of mechanisms.
func termNodes(t meanTerm, reads NodeReads, k int) []int {
	all := func(x []int) []int {
		if x != nil {
			return x
		}
		out := make([]int, k)
		for i := range out {
			out[i] = i
		}
		return out
	}
	seen := map[int]bool{}
	if t.readsLabel {
		for _, i := range all(reads.Label) {
			seen[i] = true
		}
	}
	if t.readsScore {
		for _, i := range all(reads.Score) {
			seen[i] = true
		}
	}
	return setOf(seen)
}
