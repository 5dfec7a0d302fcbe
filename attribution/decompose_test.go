package attribution_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"gonum.org/v1/gonum/mat"
)

// twoNodeSample draws x ~ N(μ_g, 1), y | x ~ Bernoulli(σ(x − 0.5)) in both
// groups, score = σ(x). Only the root mechanism of x differs between the
// groups (μ_ref = 0, μ_cmp = shift), so by the Shapley null-player axiom
// (Shapley 1953) the mechanism of y | x must get zero and x the whole gap.
func twoNodeSample(n int, shift float64, seed uint64) (*attribution.Sample, []attribution.Mechanism) {
	rng := rand.New(rand.NewPCG(seed, 7))
	x := mat.NewDense(2*n, 2, nil)
	s := &attribution.Sample{X: x, Comparison: make([]bool, 2*n), Labels: make([]float64, 2*n), Scores: make([]float64, 2*n)}
	for r := 0; r < 2*n; r++ {
		mu := 0.0
		if r >= n {
			mu = shift
			s.Comparison[r] = true
		}
		xv := mu + rng.NormFloat64()
		yv := 0.0
		if rng.Float64() < 1/(1+math.Exp(-(xv-0.5))) {
			yv = 1
		}
		x.Set(r, 0, xv)
		x.Set(r, 1, yv)
		s.Labels[r] = yv
		s.Scores[r] = 1 / (1 + math.Exp(-xv))
	}
	mechs := []attribution.Mechanism{
		{Node: "x", NodeCols: []int{0}},
		{Node: "y", Parents: []string{"x"}, NodeCols: []int{1}, ParentCols: []int{0}},
	}
	return s, mechs
}

func TestDecomposeNullMechanism(t *testing.T) {
	s, mechs := twoNodeSample(8000, 0.6, 1)
	d, err := attribution.Decompose(s, mechs, []string{"fnr", "brier"}, attribution.Options{
		Threshold: 0.5, Seed: 1, Learners: []classify.Learner{classify.NewLinear(), classify.NewExpanded()},
	})
	if err != nil {
		t.Fatal(err)
	}
	for _, md := range d.Metrics {
		sum := md.Residual
		for _, c := range md.Contributions {
			sum += c
		}
		if math.Abs(sum-md.Gap) > 1e-12 {
			t.Errorf("%s: Σφ + residual = %v, gap %v", md.Metric, sum, md.Gap)
		}
		t.Logf("%s: gap %.4f est %.4f φ=%v", md.Metric, md.Gap, md.Estimated, md.Contributions)
		// The y | x mechanism is identical in both groups: its share must be
		// small relative to the gap (sampling noise only).
		if math.Abs(md.Contributions[1]) > 0.15*math.Abs(md.Gap)+0.005 {
			t.Errorf("%s: null mechanism got %v of gap %v", md.Metric, md.Contributions[1], md.Gap)
		}
	}
	for _, m := range d.Mechanisms {
		t.Logf("%s: learner %s/%s auc %.3f ess %.0f mean ratio %.3f", m.Mechanism.Label(), m.Learner, m.ParentLearner, m.AUC, m.ESS, m.MeanRatio)
		if math.Abs(m.MeanRatio-1) > 0.05 {
			t.Errorf("%s: mean ratio %v, want ≈ 1", m.Mechanism.Label(), m.MeanRatio)
		}
	}
}

// With two players, one antithetic pair of orders visits both orders, so the
// sampled Shapley values equal the exact ones (Castro, Gómez & Tejada 2009:
// the estimator averages marginal contributions over the sampled orders).
func TestDecomposeSampledMatchesExactForTwoMechanisms(t *testing.T) {
	s, mechs := twoNodeSample(3000, 0.5, 2)
	opt := attribution.Options{Threshold: 0.5, Seed: 3, Learners: []classify.Learner{classify.NewLinear()}}
	exact, err := attribution.Decompose(s, mechs, []string{"fpr", "ece"}, opt)
	if err != nil {
		t.Fatal(err)
	}
	opt.ExactLimit = 1
	sampled, err := attribution.Decompose(s, mechs, []string{"fpr", "ece"}, opt)
	if err != nil {
		t.Fatal(err)
	}
	for m := range exact.Metrics {
		e, g := exact.Metrics[m], sampled.Metrics[m]
		if g.StdErrors == nil || e.StdErrors != nil {
			t.Fatalf("%s: std errors exact=%v sampled=%v", e.Metric, e.StdErrors, g.StdErrors)
		}
		for i := range e.Contributions {
			if math.Abs(e.Contributions[i]-g.Contributions[i]) > 1e-12 {
				t.Errorf("%s φ_%d: exact %v sampled %v", e.Metric, i, e.Contributions[i], g.Contributions[i])
			}
			if e.Alone[i] != g.Alone[i] && math.Abs(e.Alone[i]-g.Alone[i]) > 1e-12 {
				t.Errorf("%s alone_%d: exact %v sampled %v", e.Metric, i, e.Alone[i], g.Alone[i])
			}
		}
		if math.Abs(e.Residual-g.Residual) > 1e-12 {
			t.Errorf("%s residual: exact %v sampled %v", e.Metric, e.Residual, g.Residual)
		}
	}
}

// The sampling progress callback reports the pairs spent against the
// budget, in order, ending at the budget when no tolerance stops early.
func TestDecomposeSamplingProgress(t *testing.T) {
	s, mechs := twoNodeSample(1000, 0.5, 5)
	var calls [][2]int
	opt := attribution.Options{Threshold: 0.5, Seed: 3, Learners: []classify.Learner{classify.NewLinear()}, ExactLimit: 1,
		Sampling: attribution.SamplingOptions{MaxPairs: 24, Batch: 8, Progress: func(p, b int) { calls = append(calls, [2]int{p, b}) }}}
	if _, err := attribution.Decompose(s, mechs, []string{"fnr"}, opt); err != nil {
		t.Fatal(err)
	}
	want := [][2]int{{8, 24}, {16, 24}, {24, 24}}
	if len(calls) != len(want) {
		t.Fatalf("progress calls %v, want %v", calls, want)
	}
	for i := range want {
		if calls[i] != want[i] {
			t.Errorf("progress calls %v, want %v", calls, want)
		}
	}
}
