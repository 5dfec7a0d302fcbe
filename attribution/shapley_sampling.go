package attribution

import (
	"fmt"
	"math"
	"math/rand/v2"
)

// SamplingOptions controls SampledShapley.
type SamplingOptions struct {
	Seed uint64 // drives the permutations
	// Tolerance stops sampling once the largest standard error is at most
	// Tolerance (after MinPairs pairs); 0 spends the whole budget.
	Tolerance float64
	MinPairs  int // antithetic pairs before the tolerance is checked; 0 means 16
	MaxPairs  int // budget of antithetic pairs; 0 means 500
	Batch     int // pairs whose coalitions are evaluated in one call; 0 means 8
	// Progress, if non-nil, is called after each batch with the pairs
	// spent and the budget, on the calling goroutine.
	Progress func(pairs, budget int)
}

// BatchValuer evaluates several games on a list of coalitions (bitmasks):
// it must write game g's value of coalitions[j] into dst[g][j], each dst[g]
// having len(coalitions). The list is made of chains: runs in which every
// coalition is a superset of the one before, which an evaluator can exploit
// (EvaluateSome does).
type BatchValuer func(coalitions []uint64, dst [][]float64) error

// SampledShapley estimates the Shapley values of a k-player game by
// permutation sampling (Castro, Gómez & Tejada 2009, "Polynomial
// calculation of the Shapley value based on sampling"): φ_i is the mean over
// random orders π of player i's marginal contribution
// v(Pre_π(i) ∪ {i}) − v(Pre_π(i)). Orders are drawn in antithetic pairs, π
// and its reverse, and the pair average is one sample, so every sample
// sums exactly to v(N) − v(∅) and the estimate is efficient like the exact
// value. The standard error of φ_i is the sample standard deviation of the
// pair averages over √pairs. Coalition values are memoised, and each batch
// of pairs is evaluated with one call to value (a single-game BatchValuer:
// dst has one row). Sampling is deterministic for a seed.
//
// It stops when the largest standard error is at most opt.Tolerance (after
// at least opt.MinPairs pairs) or opt.MaxPairs pairs are spent, and returns
// the first error of value.
func SampledShapley(k int, value BatchValuer, opt SamplingOptions) (phi, stderr []float64, err error) {
	p, s, err := SampledShapleyGames(k, 1, value, opt)
	if err != nil {
		return nil, nil, err
	}
	return p[0], s[0], nil
}

// SampledShapleyGames is SampledShapley for several games on the same
// players sharing the sampled orders (e.g. several metrics of one
// decomposition): phi[g][i] and stderr[g][i] belong to game g, and the
// tolerance applies to the largest standard error over all games.
func SampledShapleyGames(k, games int, value BatchValuer, opt SamplingOptions) (phi, stderr [][]float64, err error) {
	if k < 0 || k > 63 {
		return nil, nil, fmt.Errorf("attribution: SampledShapley needs 0 <= k <= 63, got %d", k)
	}
	if games < 1 {
		return nil, nil, fmt.Errorf("attribution: SampledShapley needs at least one game")
	}
	if opt.Tolerance < 0 || opt.MinPairs < 0 || opt.MaxPairs < 0 || opt.Batch < 0 {
		return nil, nil, fmt.Errorf("attribution: SamplingOptions must not be negative: %+v", opt)
	}
	minPairs, maxPairs, batch := opt.MinPairs, opt.MaxPairs, opt.Batch
	if minPairs == 0 {
		minPairs = 16
	}
	if maxPairs == 0 {
		maxPairs = 500
	}
	if batch == 0 {
		batch = 8
	}
	s := &shapleySampler{k: k, games: games, value: value, memo: map[uint64][]float64{}}
	s.mean = make([][]float64, games)
	s.m2 = make([][]float64, games)
	for g := range s.mean {
		s.mean[g] = make([]float64, k)
		s.m2[g] = make([]float64, k)
	}
	rng := rand.New(rand.NewPCG(opt.Seed, 0x5ab1ed))
	for s.pairs < maxPairs {
		perms := make([][]int, min(batch, maxPairs-s.pairs))
		for i := range perms {
			perms[i] = rng.Perm(k)
		}
		if err := s.addBatch(perms); err != nil {
			return nil, nil, err
		}
		if opt.Progress != nil {
			opt.Progress(s.pairs, maxPairs)
		}
		if s.pairs >= minPairs && opt.Tolerance > 0 && s.maxStderr() <= opt.Tolerance {
			break
		}
	}
	return s.mean, s.stderrs(), nil
}

// shapleySampler accumulates pair averages with Welford's running mean and
// variance, in the fixed order of the permutations.
type shapleySampler struct {
	k, games int
	value    BatchValuer
	memo     map[uint64][]float64
	pairs    int
	mean, m2 [][]float64
}

// chain returns the prefixes ∅, {π0}, {π0, π1}, …, N of an order.
func chain(perm []int) []uint64 {
	c := make([]uint64, len(perm)+1)
	for j, p := range perm {
		c[j+1] = c[j] | 1<<p
	}
	return c
}

func (s *shapleySampler) addBatch(perms [][]int) error {
	full := uint64(1)<<s.k - 1
	// Chains of π and of its reverse, whose prefixes are N∖(π's prefixes).
	var need []uint64
	seen := map[uint64]bool{}
	for _, p := range perms {
		c := chain(p)
		for pass := 0; pass < 2; pass++ {
			for j := range c {
				S := c[j]
				if pass == 1 {
					S = full &^ c[len(c)-1-j]
				}
				if _, ok := s.memo[S]; !ok && !seen[S] {
					seen[S] = true
					need = append(need, S)
				}
			}
		}
	}
	if len(need) > 0 {
		dst := make([][]float64, s.games)
		for g := range dst {
			dst[g] = make([]float64, len(need))
		}
		if err := s.value(need, dst); err != nil {
			return err
		}
		for j, S := range need {
			v := make([]float64, s.games)
			for g := range v {
				v[g] = dst[g][j]
			}
			s.memo[S] = v
		}
	}
	y := make([]float64, s.k)
	for _, p := range perms {
		c := chain(p)
		s.pairs++
		for g := 0; g < s.games; g++ {
			for j, i := range p {
				// Forward order: i joins c[j]. Reverse order: i joins the
				// players after it in π, N∖c[j+1].
				fwd := s.memo[c[j+1]][g] - s.memo[c[j]][g]
				rev := s.memo[full&^c[j]][g] - s.memo[full&^c[j+1]][g]
				y[i] = (fwd + rev) / 2
			}
			for i, x := range y {
				d := x - s.mean[g][i]
				s.mean[g][i] += d / float64(s.pairs)
				s.m2[g][i] += d * (x - s.mean[g][i])
			}
		}
	}
	return nil
}

func (s *shapleySampler) stderrs() [][]float64 {
	se := make([][]float64, s.games)
	for g := range se {
		se[g] = make([]float64, s.k)
		if s.pairs < 2 {
			for i := range se[g] {
				se[g][i] = math.Inf(1)
			}
			continue
		}
		for i, m2 := range s.m2[g] {
			se[g][i] = math.Sqrt(m2 / float64(s.pairs-1) / float64(s.pairs))
		}
	}
	return se
}

func (s *shapleySampler) maxStderr() float64 {
	var m float64
	for _, row := range s.stderrs() {
		for _, x := range row {
			m = math.Max(m, x)
		}
	}
	return m
}
