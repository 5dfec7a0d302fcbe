package attribution

import (
	"math"
	"math/bits"
	"math/rand/v2"
	"testing"
)

// gameFrom tabulates a characteristic function over all 2^k coalitions.
func gameFrom(k int, f func(S uint64) float64) []float64 {
	v := make([]float64, 1<<k)
	for S := range v {
		v[S] = f(uint64(S))
	}
	return v
}

// weightedVoting is the simple game [q; w_1..w_k]: v(S) = 1 if Σ_{i∈S} w_i ≥ q.
func weightedVoting(q float64, w []float64) []float64 {
	return gameFrom(len(w), func(S uint64) float64 {
		var sum float64
		for i, x := range w {
			if S&(1<<i) != 0 {
				sum += x
			}
		}
		if sum >= q {
			return 1
		}
		return 0
	})
}

// permutationShapley is the definition by orderings (Shapley 1953): the
// average over all k! orders of a player's marginal contribution when it
// joins the players before it. Feasible for k ≤ 8.
func permutationShapley(v []float64, k int) []float64 {
	phi := make([]float64, k)
	perm := make([]int, k)
	for i := range perm {
		perm[i] = i
	}
	count := 0
	var rec func(d int)
	rec = func(d int) {
		if d == k {
			var S uint64
			for _, p := range perm {
				phi[p] += v[S|1<<p] - v[S]
				S |= 1 << p
			}
			count++
			return
		}
		for j := d; j < k; j++ {
			perm[d], perm[j] = perm[j], perm[d]
			rec(d + 1)
			perm[d], perm[j] = perm[j], perm[d]
		}
	}
	rec(0)
	for i := range phi {
		phi[i] /= float64(count)
	}
	return phi
}

func TestExactShapleyPublishedGames(t *testing.T) {
	// Airport game (Littlechild & Owen 1973, "A simple expression for the
	// Shapley value in a special case", from memory): players need runways
	// of cost c_1 ≤ … ≤ c_k, v(S) = max_{i∈S} c_i, and the Shapley value
	// shares each cost increment equally among the players that need it:
	// φ_i = Σ_{j≤i} (c_j − c_{j−1})/(k − j + 1).
	costs := []float64{1, 1.5, 4, 4, 7.25, 9, 12, 20}
	airport := gameFrom(len(costs), func(S uint64) float64 {
		if S == 0 {
			return 0
		}
		return costs[63-bits.LeadingZeros64(S)]
	})
	wantAirport := make([]float64, len(costs))
	for i := range costs {
		prev := 0.0
		for j := 0; j <= i; j++ {
			wantAirport[i] += (costs[j] - prev) / float64(len(costs)-j)
			prev = costs[j]
		}
	}
	// UN Security Council (15 members, 5 permanent with veto, 9 votes to
	// pass) as the weighted voting game [39; 7,7,7,7,7,1,…,1]. Analytic: a
	// non-permanent member is pivotal exactly when the 5 permanent members
	// and 3 of the other 9 have voted yes: C(9,3)·8!·6!/15! = 4/2145; the
	// permanent members share the rest, (1 − 10·4/2145)/5 = 421/2145
	// (≈ 0.1963 and 0.00186, the figures quoted in game-theory texts, from
	// memory).
	unsc := []float64{7, 7, 7, 7, 7, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1}
	wantUNSC := make([]float64, 15)
	for i := range wantUNSC {
		wantUNSC[i] = 4.0 / 2145
		if i < 5 {
			wantUNSC[i] = 421.0 / 2145
		}
	}
	tests := []struct {
		name string
		v    []float64
		k    int
		want []float64
	}{
		// [51; 50, 49, 1]: the large party is pivotal in 4 of 6 orders
		// (common textbook example, from memory; checked by hand).
		{"voting 51;50,49,1", weightedVoting(51, []float64{50, 49, 1}), 3, []float64{2.0 / 3, 1.0 / 6, 1.0 / 6}},
		// Glove game: player 0 holds a left glove, players 1 and 2 right
		// gloves; a pair is worth 1 (from memory; same orders as above).
		{"gloves", gameFrom(3, func(S uint64) float64 {
			if S&1 != 0 && S&6 != 0 {
				return 1
			}
			return 0
		}), 3, []float64{2.0 / 3, 1.0 / 6, 1.0 / 6}},
		{"airport", airport, len(costs), wantAirport},
		{"UN Security Council", weightedVoting(39, unsc), 15, wantUNSC},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := ExactShapley(tc.v, tc.k)
			for i := range tc.want {
				if !relClose(got[i], tc.want[i], 1e-12) {
					t.Errorf("φ_%d = %.15g, want %.15g", i, got[i], tc.want[i])
				}
			}
		})
	}
}

// TestExactShapleyMatchesOrderings compares with the ordering definition
// (Shapley 1953) on random games.
func TestExactShapleyMatchesOrderings(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 5))
	for k := 1; k <= 7; k++ {
		v := gameFrom(k, func(uint64) float64 { return rng.NormFloat64() })
		got, want := ExactShapley(v, k), permutationShapley(v, k)
		for i := range want {
			if !relClose(got[i], want[i], 1e-12) {
				t.Errorf("k=%d φ_%d = %v, orderings give %v", k, i, got[i], want[i])
			}
		}
	}
}

// TestExactShapleyAxioms checks Shapley's (1953) axioms on random games.
func TestExactShapleyAxioms(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 1))
	for trial := 0; trial < 20; trial++ {
		k := 2 + rng.IntN(9)
		N := uint64(1)<<k - 1
		v := gameFrom(k, func(uint64) float64 { return rng.NormFloat64() })
		u := gameFrom(k, func(uint64) float64 { return rng.NormFloat64() })
		phi, psi := ExactShapley(v, k), ExactShapley(u, k)

		// Efficiency: Σφ = v(N) − v(∅).
		var sum float64
		for _, x := range phi {
			sum += x
		}
		if !relClose(sum, v[N]-v[0], 1e-12) {
			t.Errorf("k=%d: Σφ = %v, v(N)−v(∅) = %v", k, sum, v[N]-v[0])
		}

		// Linearity: φ(a·v + b·u) = a·φ(v) + b·φ(u).
		a, b := rng.NormFloat64(), rng.NormFloat64()
		lin := ExactShapley(gameFrom(k, func(S uint64) float64 { return a*v[S] + b*u[S] }), k)
		for i := range lin {
			if !relClose(lin[i], a*phi[i]+b*psi[i], 1e-12) {
				t.Errorf("k=%d linearity φ_%d: %v vs %v", k, i, lin[i], a*phi[i]+b*psi[i])
			}
		}

		// Sign flip: swapping the groups, v'(S) = v(N∖S) − v(N), gives −φ.
		flip := ExactShapley(gameFrom(k, func(S uint64) float64 { return v[N&^S] - v[N] }), k)
		for i := range flip {
			if !relClose(flip[i], -phi[i], 1e-12) {
				t.Errorf("k=%d sign flip φ_%d: %v vs %v", k, i, flip[i], -phi[i])
			}
		}

		// Null player: make player p null by v(S∪{p}) = v(S).
		p := rng.IntN(k)
		pb := uint64(1) << p
		null := gameFrom(k, func(S uint64) float64 { return v[S&^pb] })
		phiNull := ExactShapley(null, k)
		if phiNull[p] != 0 {
			t.Errorf("k=%d null player %d gets %v", k, p, phiNull[p])
		}

		// Symmetry: make players p and q interchangeable by symmetrising
		// v over swapping their bits; they must get equal values.
		q := (p + 1 + rng.IntN(k-1)) % k
		qb := uint64(1) << q
		swap := func(S uint64) uint64 {
			hasP, hasQ := S&pb != 0, S&qb != 0
			S &^= pb | qb
			if hasP {
				S |= qb
			}
			if hasQ {
				S |= pb
			}
			return S
		}
		sym := ExactShapley(gameFrom(k, func(S uint64) float64 { return v[S] + v[swap(S)] }), k)
		if !relClose(sym[p], sym[q], 1e-12) {
			t.Errorf("k=%d symmetric players %d, %d: %v vs %v", k, p, q, sym[p], sym[q])
		}
	}
}

func TestExactShapleyEdges(t *testing.T) {
	if got := ExactShapley([]float64{3}, 0); len(got) != 0 {
		t.Errorf("k=0: got %v", got)
	}
	if got := ExactShapley([]float64{1, 4}, 1); got[0] != 3 {
		t.Errorf("k=1: got %v, want [3]", got)
	}
	for _, tc := range []struct {
		v []float64
		k int
	}{{make([]float64, 3), 2}, {make([]float64, 1), -1}} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("no panic for len %d, k %d", len(tc.v), tc.k)
				}
			}()
			ExactShapley(tc.v, tc.k)
		}()
	}
}

// TestExactShapleyPrecisionLargeK: at k = 20 the additive game
// v(S) = Σ_{i∈S} a_i has φ_i = a_i exactly (analytic).
func TestExactShapleyPrecisionLargeK(t *testing.T) {
	if testing.Short() {
		t.Skip("k = 20 takes a second")
	}
	k := 20
	a := make([]float64, k)
	for i := range a {
		a[i] = math.Sin(float64(i + 1))
	}
	v := gameFrom(k, func(S uint64) float64 {
		var s float64
		for i := range a {
			if S&(1<<i) != 0 {
				s += a[i]
			}
		}
		return s
	})
	phi := ExactShapley(v, k)
	for i := range a {
		if !relClose(phi[i], a[i], 1e-12) {
			t.Errorf("φ_%d = %.17g, want %.17g", i, phi[i], a[i])
		}
	}
}
