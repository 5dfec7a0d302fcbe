package attribution

import (
	"math"
	"math/bits"

	"github.com/gapwise/gapwise/internal/workers"
)

// Influence-function standard errors of coalition values, gaps and
// Shapley values. Each estimator's M̂(S) is asymptotically linear in the
// records, M̂(S) − M(S) ≈ Σ_i u_S(i), with u_S(i) its influence at record i
// (robust: robust_influence.go; weighting: weighting_influence.go). A
// quantity L = Σ_S a_S M̂(S) that is linear in the game — a Shapley value
// (Shapley 1953: a_S the Shapley weights), an end of the gap, v(N), a
// what-if value v({i}) or v(N∖{i}) — then has influence Σ_S a_S u_S(i)
// and variance Σ_i (Σ_S a_S u_S(i))², the records of the two groups being
// independent samples. The difference of the two estimators' values of L
// has influence the difference of theirs, which gives the standard error
// of their disagreement (EstimatorCheck) with their correlation in it.

// InfluenceSE holds the influence-function standard errors of one
// metric's estimates; NaN where unknown (AUC, an undefined metric, or
// Shapley values above influenceBudget).
type InfluenceSE struct {
	// Reference, Comparison and Gap are the observed group metrics and
	// their difference; Estimated is v(N), the estimated gap (for the
	// robust estimator the observed one).
	Reference, Comparison, Gap, Estimated float64
	// Contributions[i] is the standard error of φ̂_i, Alone[i] of v({i})
	// and IfEqualised[i] of v(N∖{i}).
	Contributions, Alone, IfEqualised []float64
}

// influenceBudget bounds n·2^k, the per-record coalition work of the
// standard errors of Shapley values; above it only the ends, the gap and
// the what-if values get one (the influence is then needed at 2k + 2
// coalitions only).
const influenceBudget = 1 << 27

// influenceBlock is the number of records per block of the influence
// pass; blocks are the unit of parallel work and are summed in order, so
// the result does not depend on the number of goroutines.
const influenceBlock = 512

// recordInfluence fills u[m][c], the influence of record lo+a on M̂(cs[c])
// of metric m, for the records of one block, and at c = len(cs) and
// len(cs)+1 on the observed reference and comparison metrics;
// prepare(lo, hi) returns it for block lo … hi−1 (nil: the estimator is
// not computed).
type recordInfluence func(a int, u [][]float64)

// influencePlan lists the coalitions whose influence is needed, in the
// order the functionals read: all 2^k (full) or ∅, N, {i}…, N∖{i}….
type influencePlan struct {
	k    int
	full bool
	cs   []uint64
	// b[S] = w(|S|) and c[S] = w(|S|−1) + w(|S|) with the Shapley weights
	// w (w(−1) = w(k) = 0), for functionals; set when full.
	b, c []float64
}

// newInfluencePlan returns the plan for n records and k mechanisms: all
// coalitions when the Shapley values are exact and n·2^k ≤
// influenceBudget.
func newInfluencePlan(n, k int, exact bool) influencePlan {
	p := influencePlan{k: k, full: exact && float64(n)*math.Exp2(float64(k)) <= influenceBudget}
	all := uint64(1)<<k - 1
	if p.full {
		p.cs = make([]uint64, 1<<k)
		w := shapleyWeights(k)
		at := func(s int) float64 {
			if s < 0 || s >= k {
				return 0
			}
			return w[s]
		}
		p.b, p.c = make([]float64, 1<<k), make([]float64, 1<<k)
		for S := range p.cs {
			p.cs[S] = uint64(S)
			size := popcount(S)
			p.b[S], p.c[S] = at(size), at(size-1)+at(size)
		}
		return p
	}
	p.cs = []uint64{0, all}
	for i := 0; i < k; i++ {
		p.cs = append(p.cs, uint64(1)<<i)
	}
	for i := 0; i < k; i++ {
		p.cs = append(p.cs, all&^(uint64(1)<<i))
	}
	return p
}

// functionals writes, from um[c] (influence on M̂(cs[c]), then on the
// observed metrics), the influence on φ_0 … φ_{k−1} (0 unless full), the
// observed reference and comparison metrics and their gap, v({i}) (k),
// v(N∖{i}) (k) and v(N) into d (length 3k + 4).
func (p influencePlan) functionals(w []float64, um, d []float64) {
	k := p.k
	for i := range d {
		d[i] = 0
	}
	nc := len(p.cs)
	defer func() {
		d[k], d[k+1], d[k+2] = um[nc], um[nc+1], um[nc+1]-um[nc]
	}()
	if p.full {
		// φ_i = Σ_{S∌i} w(|S|)(u(S∪i) − u(S)) = Σ_{S∋i} c_S·u(S) − B with
		// c_S = w(|S|−1) + w(|S|) (w(k) = 0) and B = Σ_S w(|S|)·u(S).
		full := 1<<k - 1
		var B float64
		for S := 0; S < full; S++ {
			B += p.b[S] * um[S]
		}
		for S := 1; S <= full; S++ {
			v := p.c[S] * um[S]
			for b := uint(S); b != 0; b &= b - 1 {
				d[bits.TrailingZeros(b)] += v
			}
		}
		for i := 0; i < k; i++ {
			d[i] -= B
		}
		for i := 0; i < k; i++ {
			d[k+3+i] = um[1<<i] - um[0]
			d[2*k+3+i] = um[full&^(1<<i)] - um[0]
		}
		d[3*k+3] = um[full] - um[0]
		return
	}
	for i := 0; i < k; i++ {
		d[k+3+i] = um[2+i] - um[0]
		d[2*k+3+i] = um[2+k+i] - um[0]
	}
	d[3*k+3] = um[1] - um[0]
}

func popcount(x int) int {
	n := 0
	for ; x != 0; x &= x - 1 {
		n++
	}
	return n
}

// influenceSEs runs the influence pass over n records: per block, the
// robust and the weighting estimator's influences (either prepare may be
// nil), and returns per metric the standard errors of each estimator's
// quantities and of their difference (robust minus weighting; nil unless
// both are given). defined[e][m] says whether estimator e (0 robust, 1
// weighting) has an influence for metric m.
func influenceSEs(n, nm int, p influencePlan, nw int, prepare [2]func(lo, hi int) recordInfluence, defined [2][]bool) (se [2][]*InfluenceSE, diff []*InfluenceSE) {
	k := p.k
	nf := 3*k + 4
	w := shapleyWeights(k)
	blocks := (n + influenceBlock - 1) / influenceBlock
	partial := make([][3][][]float64, blocks)
	workers.For(nw, blocks, func(_, b int) {
		lo, hi := b*influenceBlock, min(n, (b+1)*influenceBlock)
		var rec [2]recordInfluence
		for e := range prepare {
			if prepare[e] != nil {
				rec[e] = prepare[e](lo, hi)
			}
		}
		u := [2][][]float64{zeros(nm, len(p.cs)+2), zeros(nm, len(p.cs)+2)}
		ud := make([]float64, len(p.cs)+2)
		d := make([]float64, nf)
		var acc [3][][]float64
		for e := range acc {
			acc[e] = zeros(nm, nf)
		}
		for a := 0; a < hi-lo; a++ {
			for e := range rec {
				if rec[e] != nil {
					rec[e](a, u[e])
				}
			}
			for m := 0; m < nm; m++ {
				for e := range rec {
					if rec[e] == nil || !defined[e][m] {
						continue
					}
					p.functionals(w, u[e][m], d)
					for f, x := range d {
						acc[e][m][f] += x * x
					}
				}
				if rec[0] != nil && rec[1] != nil && defined[0][m] && defined[1][m] {
					for c := range ud {
						ud[c] = u[0][m][c] - u[1][m][c]
					}
					p.functionals(w, ud, d)
					for f, x := range d {
						acc[2][m][f] += x * x
					}
				}
			}
		}
		partial[b] = acc
	})
	var total [3][][]float64
	for e := range total {
		total[e] = zeros(nm, nf)
		for _, part := range partial {
			for m := range total[e] {
				for f := range total[e][m] {
					total[e][m][f] += part[e][m][f]
				}
			}
		}
	}
	build := func(e, m int) *InfluenceSE {
		s := func(f int) float64 { return math.Sqrt(total[e][m][f]) }
		o := &InfluenceSE{Reference: s(k), Comparison: s(k + 1), Gap: s(k + 2), Estimated: s(3*k + 3),
			Contributions: make([]float64, k), Alone: make([]float64, k), IfEqualised: make([]float64, k)}
		for i := 0; i < k; i++ {
			o.Contributions[i], o.Alone[i], o.IfEqualised[i] = s(i), s(k+3+i), s(2*k+3+i)
			if !p.full {
				o.Contributions[i] = math.NaN()
			}
		}
		return o
	}
	for e := range se {
		if prepare[e] == nil {
			continue
		}
		se[e] = make([]*InfluenceSE, nm)
		for m := range se[e] {
			if defined[e][m] {
				se[e][m] = build(e, m)
			}
		}
	}
	if prepare[0] != nil && prepare[1] != nil {
		diff = make([]*InfluenceSE, nm)
		for m := range diff {
			if defined[0][m] && defined[1][m] {
				diff[m] = build(2, m)
			}
		}
	}
	return se, diff
}

// fullAt is the index of N in cs.
func (p influencePlan) fullAt() int {
	if p.full {
		return len(p.cs) - 1
	}
	return 1
}
