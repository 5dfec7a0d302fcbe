package attribution

import "github.com/gapwise/gapwise/internal/workers"

// fillOracle evaluates the injected regressions (robustHooks.Regression)
// at every record: step r's design gets one column per suffix key (the
// groups of steps r … R−1) and term, column key·T + t.
func (fam *robustFamily) fillOracle(in *robustInput) {
	R := len(fam.chain.steps)
	T := len(fam.terms)
	n := len(in.y)
	fam.oracle = make([][][]float64, R)
	for r := 1; r < R; r++ {
		cols := make([][]float64, (1<<(R-r))*T)
		workers.For(in.workers, len(cols), func(_, c int) {
			key, t := c/T, c%T
			group := func(j int) int {
				p, ok := fam.pos[j]
				if !ok || p < r {
					panic("attribution: robust hook asked for the group of an earlier or irrelevant step")
				}
				return key >> (p - r) & 1
			}
			col := make([]float64, n)
			for i := range col {
				col[i] = in.hooks.Regression(fam.terms[t].id, fam.chain.steps[r].mech, group, i)
			}
			cols[c] = col
		})
		fam.oracle[r] = cols
	}
}

// oracleNode is fitNode with injected regressions: term t's coefficients
// select its column of the oracle design, on every fold.
func (fam *robustFamily) oracleNode(in *robustInput, r, key int) *treeNode {
	T := len(fam.terms)
	suffix := key // the node's own key: bit 0 its group, then the later steps'
	node := &treeNode{beta: make([][][]float64, T), learner: make([]int, T)}
	for t := 0; t < T; t++ {
		node.beta[t] = make([][]float64, in.k)
		for j := range node.beta[t] {
			b := make([]float64, fam.bases[r].d)
			b[suffix*T+t] = 1
			node.beta[t][j] = b
		}
	}
	return node
}
