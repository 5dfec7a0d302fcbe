package attribution

import "math/rand/v2"

// assignFolds splits records into k cross-fitting folds, stratified by
// group: within each group the records are shuffled with a PCG stream seeded
// by seed and dealt round-robin, so every fold holds about 1/k of each group.
func assignFolds(comparison []bool, k int, seed uint64) []int {
	folds := make([]int, len(comparison))
	for g, isCmp := range []bool{false, true} {
		var idx []int
		for i, c := range comparison {
			if c == isCmp {
				idx = append(idx, i)
			}
		}
		rng := rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15^uint64(g)))
		rng.Shuffle(len(idx), func(a, b int) { idx[a], idx[b] = idx[b], idx[a] })
		for pos, i := range idx {
			folds[i] = pos % k
		}
	}
	return folds
}
