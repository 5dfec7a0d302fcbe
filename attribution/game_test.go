package attribution_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
)

// threeNodeSample draws x ~ N(μ_g, 1), z ~ N(ν_g, 1) and y | x, z ~
// Bernoulli(σ(x + 0.5z − 0.5)), score σ(x + 0.5z), with μ_cmp = 0.5 and
// ν_cmp = −0.4 (0 in the reference group): three mechanisms, two of which
// differ, so the game has interactions for the threshold metrics.
func threeNodeSample(n int, seed uint64) (*attribution.Sample, []attribution.Mechanism) {
	rng := rand.New(rand.NewPCG(seed, 11))
	x := mat.NewDense(2*n, 3, nil)
	s := &attribution.Sample{X: x, Comparison: make([]bool, 2*n), Labels: make([]float64, 2*n), Scores: make([]float64, 2*n)}
	for r := 0; r < 2*n; r++ {
		mu, nu := 0.0, 0.0
		if r >= n {
			mu, nu = 0.5, -0.4
			s.Comparison[r] = true
		}
		xv, zv := mu+rng.NormFloat64(), nu+rng.NormFloat64()
		yv := 0.0
		if rng.Float64() < 1/(1+math.Exp(-(xv+0.5*zv-0.5))) {
			yv = 1
		}
		x.Set(r, 0, xv)
		x.Set(r, 1, zv)
		x.Set(r, 2, yv)
		s.Labels[r], s.Scores[r] = yv, 1/(1+math.Exp(-(xv+0.5*zv)))
	}
	return s, []attribution.Mechanism{
		{Node: "x", NodeCols: []int{0}},
		{Node: "z", NodeCols: []int{1}},
		{Node: "y", Parents: []string{"x", "z"}, NodeCols: []int{2}, ParentCols: []int{0, 1}},
	}
}

// The game a decomposition carries must be the one its contributions are
// the Shapley values of: recomputing them with ExactShapley from Game
// gives Contributions (Shapley 1953; the mean over fold splits and the
// metric-level mix of the two sides are linear in the game, so this holds
// for them too), Game(N) is the estimated gap, Game({i}) Alone and
// Game(N∖{i}) IfEqualised. With several splits Game must also be the mean
// of the games of the single-split decompositions at the split seeds.
func TestGameReproducesContributions(t *testing.T) {
	s, mechs := threeNodeSample(300, 4)
	learners := []classify.Learner{classify.NewLinear(), classify.NewExpanded()}
	names := []string{"fnr", "fpr", "brier"}
	for _, tc := range []struct {
		name   string
		side   attribution.Side
		mix    attribution.Mix
		splits int
	}{
		{"reference side, one split", attribution.SideReference, attribution.MixDefault, 1},
		{"reference side, three splits", attribution.SideReference, attribution.MixDefault, 3},
		{"both sides, one split", attribution.SideBoth, attribution.MixDefault, 1},
		{"both sides, three splits", attribution.SideBoth, attribution.MixDefault, 3},
		{"both sides per coalition, three splits", attribution.SideBoth, attribution.MixCoalition, 3},
		{"comparison side, two splits", attribution.SideComparison, attribution.MixDefault, 2},
	} {
		t.Run(tc.name, func(t *testing.T) {
			opt := attribution.Options{Threshold: 0.5, Seed: 3, Learners: learners, Side: tc.side, Mix: tc.mix, FoldSplits: tc.splits}
			d, err := attribution.Decompose(s, mechs, names, opt)
			if err != nil {
				t.Fatal(err)
			}
			k := len(mechs)
			full := uint64(1)<<k - 1
			for m, md := range d.Metrics {
				if len(md.Game) != 1<<k || md.Game[0] != 0 {
					t.Fatalf("%s: game of %d values, v(∅) = %v", md.Metric, len(md.Game), md.Game)
				}
				phi := attribution.ExactShapley(md.Game, k)
				for i := range phi {
					if math.Abs(phi[i]-md.Contributions[i]) > 1e-12 {
						t.Errorf("%s φ_%d of the game %v, reported %v", md.Metric, i, phi[i], md.Contributions[i])
					}
					if md.Game[1<<i] != md.Alone[i] || md.Game[full&^(1<<i)] != md.IfEqualised[i] {
						t.Errorf("%s mechanism %d: game %v / %v, alone %v, if equalised %v", md.Metric, i,
							md.Game[1<<i], md.Game[full&^(1<<i)], md.Alone[i], md.IfEqualised[i])
					}
				}
				if md.Game[full] != md.Estimated {
					t.Errorf("%s: v(N) %v, estimated gap %v", md.Metric, md.Game[full], md.Estimated)
				}
				if tc.splits > 1 {
					checkMeanGame(t, s, mechs, names, opt, m, md.Game)
				}
			}
		})
	}
}

// checkMeanGame compares game with the mean of metric m's games over the
// single-split decompositions seeded by SplitSeed.
func checkMeanGame(t *testing.T, s *attribution.Sample, mechs []attribution.Mechanism, names []string, opt attribution.Options, m int, game []float64) {
	t.Helper()
	mean := make([]float64, len(game))
	for r := 0; r < opt.FoldSplits; r++ {
		o := opt
		o.Seed, o.FoldSplits = attribution.SplitSeed(opt.Seed, r), 1
		d, err := attribution.Decompose(s, mechs, names, o)
		if err != nil {
			t.Fatal(err)
		}
		for S, v := range d.Metrics[m].Game {
			mean[S] += v / float64(opt.FoldSplits)
		}
	}
	for S := range game {
		if math.Abs(game[S]-mean[S]) > 1e-12 {
			t.Errorf("%s: v(%b) = %v, mean of the splits' games %v", names[m], S, game[S], mean[S])
		}
	}
}

// No game is kept where the contributions are not the Shapley values of
// one: sampled Shapley values (above ExactLimit) and MixMechanism's
// per-mechanism combination; nor in bootstrap replicates, whose intervals
// need none (the point estimate keeps its game).
func TestGameAbsentWhereNotExact(t *testing.T) {
	s, mechs := threeNodeSample(200, 5)
	learners := []classify.Learner{classify.NewLinear()}
	for _, tc := range []struct {
		name string
		opt  attribution.Options
	}{
		{"sampled", attribution.Options{ExactLimit: 2, Side: attribution.SideReference}},
		{"per mechanism", attribution.Options{Side: attribution.SideBoth, Mix: attribution.MixMechanism}},
	} {
		opt := tc.opt
		opt.Threshold, opt.Seed, opt.Learners, opt.FoldSplits = 0.5, 1, learners, 1
		d, err := attribution.Decompose(s, mechs, []string{"brier"}, opt)
		if err != nil {
			t.Fatal(err)
		}
		if g := d.Metrics[0].Game; g != nil {
			t.Errorf("%s: a game of %d values", tc.name, len(g))
		}
	}
	opt := attribution.Options{Threshold: 0.5, Seed: 1, Learners: learners, FoldSplits: 1, Side: attribution.SideReference}
	d, _, err := attribution.DecomposeWithIntervals(s, mechs, []string{"brier"}, opt,
		attribution.BootstrapOptions{Intervals: attribution.Intervals{Replicates: 4, KeepRatios: true}})
	if err != nil {
		t.Fatal(err)
	}
	if len(d.Metrics[0].Game) != 1<<len(mechs) {
		t.Errorf("with intervals the point estimate has a game of %d values", len(d.Metrics[0].Game))
	}
}
