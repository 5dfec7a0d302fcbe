package attribution_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/metrics"
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

// observeSample builds a Sample of the given groups (X unused by Observe).
func observeSample(cmp []bool, labels, scores []float64) *attribution.Sample {
	return &attribution.Sample{X: mat.NewDense(len(cmp), 1, nil), Comparison: cmp, Labels: labels, Scores: scores}
}

func TestObserve(t *testing.T) {
	// Reference: y = 0, 0, 1 with s = 0.2, 0.7, 0.9; comparison: y = 1, 0
	// with s = 0.8, 0.3; threshold 0.5. By hand: FPR 1/2 and 0/1, TPR 1/1
	// and 1/1, Brier (0.04+0.49+0.01)/3 = 0.18 and (0.04+0.09)/2 = 0.065.
	s := observeSample([]bool{false, true, false, true, false}, []float64{0, 1, 0, 0, 1}, []float64{0.2, 0.8, 0.7, 0.3, 0.9})
	got, err := attribution.Observe(s, []string{metrics.NameFPR, metrics.NameTPR, metrics.NameBrier}, 0.5, 0)
	if err != nil {
		t.Fatal(err)
	}
	want := [][2]float64{{0.5, 0}, {1, 1}, {0.18, 0.065}}
	if len(got) != len(want) {
		t.Fatalf("%d metrics, want %d", len(got), len(want))
	}
	for m, md := range got {
		if math.Abs(md.Reference-want[m][0]) > 1e-12 || math.Abs(md.Comparison-want[m][1]) > 1e-12 || md.Gap != md.Comparison-md.Reference {
			t.Errorf("%s: %+v, want %v", md.Metric, md, want[m])
		}
	}
}

// TestObserveUndefinedOrder: FPR has no negatives in the comparison group
// and TPR no positives in the reference group. The reference group is
// checked first, so the error names TPR there: the order in which
// `gapwise check` and `decompose` have always reported it (the fairness
// check before Observe existed looped over the groups, then the metrics).
func TestObserveUndefinedOrder(t *testing.T) {
	s := observeSample([]bool{false, false, true, true}, []float64{0, 0, 1, 1}, []float64{0.2, 0.7, 0.8, 0.3})
	_, err := attribution.Observe(s, []string{metrics.NameFPR, metrics.NameTPR}, 0.5, 0)
	var me *attribution.MetricError
	if !errors.As(err, &me) || me.Metric != metrics.NameTPR || me.Group != attribution.GroupReference || !errors.Is(err, metrics.ErrUndefined) {
		t.Errorf("err = %v, want a MetricError for tpr in the reference group", err)
	}
	// A failure that is not a missing value is no MetricError.
	if _, err = attribution.Observe(s, []string{"f1"}, 0.5, 0); err == nil || errors.As(err, &me) {
		t.Errorf("f1: err = %v, want a plain error", err)
	}
}
