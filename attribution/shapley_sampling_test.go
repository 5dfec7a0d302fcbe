package attribution

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

// tableValuer serves a tabulated game and counts the coalitions asked for.
func tableValuer(v []float64, calls *int) BatchValuer {
	return func(cs []uint64, dst [][]float64) error {
		for j, S := range cs {
			dst[0][j] = v[S]
			*calls++
		}
		return nil
	}
}

// A smooth non-additive 12-player game: v(S) = sqrt(Σ_{i∈S} a_i) plus
// pairwise interactions, so orders matter.
func nonAdditiveGame(k int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 3))
	a := make([]float64, k)
	for i := range a {
		a[i] = rng.Float64() * 4
	}
	return gameFrom(k, func(S uint64) float64 {
		var s, inter float64
		for i := range a {
			if S&(1<<i) != 0 {
				s += a[i]
				if S&(1<<((i+1)%k)) != 0 {
					inter += 0.3 * float64(i%3-1)
				}
			}
		}
		return math.Sqrt(s) + inter
	})
}

// TestSampledShapleyMatchesExact: the sampled values must lie within a few
// standard errors of ExactShapley (the reference, itself checked against
// published games) on a 12-player game.
func TestSampledShapleyMatchesExact(t *testing.T) {
	k := 12
	v := nonAdditiveGame(k, 1)
	exact := ExactShapley(v, k)
	calls := 0
	phi, se, err := SampledShapley(k, tableValuer(v, &calls), SamplingOptions{Seed: 7, MaxPairs: 400})
	if err != nil {
		t.Fatal(err)
	}
	var sum float64
	for i := range phi {
		sum += phi[i]
		if !(se[i] > 0) || math.Abs(phi[i]-exact[i]) > 4*se[i] {
			t.Errorf("φ_%d = %.5f ± %.5f, exact %.5f", i, phi[i], se[i], exact[i])
		}
	}
	// Antithetic pairs make every sample efficient (Castro et al. 2009).
	if N := uint64(1)<<k - 1; !relClose(sum, v[N]-v[0], 1e-12) {
		t.Errorf("Σφ = %v, want v(N)−v(∅) = %v", sum, v[N]-v[0])
	}
	if calls > 1<<k {
		t.Errorf("memoisation: %d evaluations for %d coalitions", calls, 1<<k)
	}
}

func TestSampledShapleyToleranceAndDeterminism(t *testing.T) {
	k := 10
	v := nonAdditiveGame(k, 2)
	var c1, c2 int
	opt := SamplingOptions{Seed: 3, Tolerance: 0.01, MaxPairs: 5000}
	phi1, se1, err := SampledShapley(k, tableValuer(v, &c1), opt)
	if err != nil {
		t.Fatal(err)
	}
	phi2, _, _ := SampledShapley(k, tableValuer(v, &c2), opt)
	for i := range phi1 {
		if math.Float64bits(phi1[i]) != math.Float64bits(phi2[i]) {
			t.Fatalf("same seed, different φ_%d: %v vs %v", i, phi1[i], phi2[i])
		}
		if se1[i] > opt.Tolerance {
			t.Errorf("stderr %v above tolerance", se1[i])
		}
	}
	// Stopping early must have spent less than the budget's evaluations.
	budget := 0
	if _, _, err := SampledShapley(k, tableValuer(v, &budget), SamplingOptions{Seed: 3, MaxPairs: 5000}); err != nil {
		t.Fatal(err)
	}
	if c1 >= budget {
		t.Errorf("tolerance stop used %d evaluations, full budget %d", c1, budget)
	}
}

func TestSampledShapleyErrors(t *testing.T) {
	boom := errors.New("boom")
	_, _, err := SampledShapley(4, func([]uint64, [][]float64) error { return boom }, SamplingOptions{})
	if !errors.Is(err, boom) {
		t.Errorf("got %v, want the valuer's error", err)
	}
	if _, _, err := SampledShapley(64, nil, SamplingOptions{}); err == nil {
		t.Error("k = 64 accepted")
	}
	if _, _, err := SampledShapley(3, nil, SamplingOptions{MaxPairs: -1}); err == nil {
		t.Error("negative budget accepted")
	}
}

// TestEvaluateSomeMatchesExhaustive compares EvaluateSome on an arbitrary
// list (chains, repeats, unordered) with EvaluateCoalitions, itself checked
// against brute force; and requires identical results for any Workers.
func TestEvaluateSomeMatchesExhaustive(t *testing.T) {
	k := 7
	labels, scores, logr := randomReference(21, 1500, k, 1)
	// Extreme ratios on one mechanism exercise the power-of-two rescaling.
	for r := range logr[3] {
		logr[3][r] *= 25
	}
	names := metrics.Names()
	all, err := EvaluateCoalitions(labels, scores, 0.5, logr, names, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(4, 4))
	var list []uint64
	for c := 0; c < 40; c++ {
		list = append(list, chain(rng.Perm(k))...)
		list = append(list, uint64(rng.IntN(1<<k)))
	}
	var ref [][]float64
	for _, w := range []int{1, 2, 3} {
		got, err := EvaluateSome(labels, scores, 0.5, logr, names, list, EngineOptions{Workers: w})
		if err != nil {
			t.Fatal(err)
		}
		for m := range names {
			for j, S := range list {
				if !relClose(got[m][j], all.Values[m][S], 1e-9) {
					t.Fatalf("%s S=%b: EvaluateSome %v, EvaluateCoalitions %v", names[m], S, got[m][j], all.Values[m][S])
				}
				if ref != nil && math.Float64bits(got[m][j]) != math.Float64bits(ref[m][j]) {
					t.Fatalf("Workers=%d changes %s S=%b", w, names[m], S)
				}
			}
		}
		ref = got
	}
	if _, err := EvaluateSome(labels, scores, 0.5, logr, names, []uint64{1 << k}, EngineOptions{}); err == nil {
		t.Error("coalition beyond k accepted")
	}
}

// TestSampledShapleyOnEngine runs the sampler on the engine's game and
// compares with exact enumeration.
func TestSampledShapleyOnEngine(t *testing.T) {
	k := 8
	labels, scores, logr := randomReference(8, 2000, k, 0.6)
	names := []string{metrics.NameFNR, metrics.NameBrier}
	all, err := EvaluateCoalitions(labels, scores, 0.5, logr, names, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	value := func(cs []uint64, dst [][]float64) error {
		v, err := EvaluateSome(labels, scores, 0.5, logr, names, cs, EngineOptions{})
		if err != nil {
			return err
		}
		copy(dst[0], v[0])
		copy(dst[1], v[1])
		return nil
	}
	phi, se, err := SampledShapleyGames(k, len(names), value, SamplingOptions{Seed: 1, MaxPairs: 200})
	if err != nil {
		t.Fatal(err)
	}
	for m := range names {
		exact := ExactShapley(all.Values[m], k)
		for i := range exact {
			if math.Abs(phi[m][i]-exact[i]) > 4*se[m][i]+1e-12 {
				t.Errorf("%s φ_%d = %v ± %v, exact %v", names[m], i, phi[m][i], se[m][i], exact[i])
			}
		}
	}
}
