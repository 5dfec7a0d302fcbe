package attribution_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
	"github.com/gapwise/gapwise/metrics"
	"gonum.org/v1/gonum/mat"
)

func newRand(seed uint64) *rand.Rand { return rand.New(rand.NewPCG(seed, 0xb007)) }

// TestInfluenceOfObservedRates: the standard error of an observed rate
// is the binomial one, √(p(1−p)/m) over the m records the rate counts
// (e.g. the negatives for the FPR; textbook, from memory), for both
// estimators (with estimator both the weighting estimate's, ratios held
// fixed; the weighting estimator alone computes none), and the observed
// gap's is the two groups' combined
// (independent samples). Shapley and what-if standard errors are positive
// and finite on a shifted case, but for a mechanism nothing reads under
// the robust estimator, whose contribution is exactly 0.
func TestInfluenceOfObservedRates(t *testing.T) {
	c := gtCase(t, "prevalence")
	s, mechs := independentPooled(t, c.Model, 1500, 1200, 5)
	for _, est := range []attribution.Estimator{attribution.EstimatorWeighting, attribution.EstimatorRobust, attribution.EstimatorBoth} {
		d, err := attribution.Decompose(s, mechs, []string{metrics.NameFPR, metrics.NameFNR}, attribution.Options{
			Threshold: scm.ScreeningThreshold, Seed: 3, FoldSplits: 1, Learners: []classify.Learner{classify.NewLinear()},
			Estimator: est, Reads: c.Model.Reads()})
		if err != nil {
			t.Fatal(err)
		}
		for _, md := range d.Metrics {
			inf := md.Influence
			if est == attribution.EstimatorWeighting {
				// Its fixed-ratio errors do not cover; none are computed.
				if inf != nil {
					t.Errorf("%s: influence standard errors for the weighting estimator alone", md.Metric)
				}
				continue
			}
			if inf == nil {
				t.Fatalf("%v %s: no influence standard errors", est, md.Metric)
			}
			var count [2]float64
			for i, cmp := range s.Comparison {
				g := 0
				if cmp {
					g = 1
				}
				if (md.Metric == metrics.NameFPR && s.Labels[i] == 0) || (md.Metric == metrics.NameFNR && s.Labels[i] == 1) {
					count[g]++
				}
			}
			want := [2]float64{math.Sqrt(md.Reference * (1 - md.Reference) / count[0]), math.Sqrt(md.Comparison * (1 - md.Comparison) / count[1])}
			got := [2]float64{inf.Reference, inf.Comparison}
			for g := range want {
				if math.Abs(got[g]-want[g]) > 1e-9 {
					t.Errorf("%v %s group %d: SE %.10f, binomial %.10f", est, md.Metric, g, got[g], want[g])
				}
			}
			if gap := math.Hypot(want[0], want[1]); math.Abs(inf.Gap-gap) > 1e-9 {
				t.Errorf("%v %s: gap SE %.10f, want %.10f", est, md.Metric, inf.Gap, gap)
			}
			for i, se := range inf.Contributions {
				if i == scm.NodeUnread && md.Estimator == attribution.EstimatorRobust {
					// Nothing reads it: its robust contribution is exactly 0,
					// and so is its influence (up to rounding).
					if se > 1e-12 || md.Contributions[i] != 0 {
						t.Errorf("%v %s: unread φ %g with SE %g, want 0 and 0", est, md.Metric, md.Contributions[i], se)
					}
					continue
				}
				if !(se > 0) || math.IsInf(se, 0) || !(inf.Alone[i] >= 0) || !(inf.IfEqualised[i] >= 0) {
					t.Errorf("%v %s mechanism %d: SEs %g, %g, %g", est, md.Metric, i, se, inf.Alone[i], inf.IfEqualised[i])
				}
			}
			if est == attribution.EstimatorBoth {
				if md.CrossCheck == nil || math.IsNaN(md.CrossCheck.MaxZ) {
					t.Errorf("%s: no cross-check with standard errors under both", md.Metric)
				}
			}
		}
	}
}

// TestRobustInfluenceCoverage draws the prevalence-shift screening model
// repeatedly (groups drawn independently) and counts how often the 95%
// Wald intervals φ̂ ± 1.96·SE of the robust estimator, SE its
// influence-function standard error, contain the ground truth of the FNR
// gap and of every contribution (direct simulation + Shapley 1953; see
// package scm). The bound is TestBootstrapCoverage's: at least 0.87 of
// 30 draws × 7 quantities (standard error about 0.015 around a correct
// 0.95).
func TestRobustInfluenceCoverage(t *testing.T) {
	if testing.Short() {
		t.Skip("coverage study: skipped in -short")
	}
	const draws, n = 30, 800
	c := gtCase(t, "prevalence")
	truth, err := scm.GroundTruth(c.Model, []string{metrics.NameFNR}, 1_000_000, 77, scm.ScreeningThreshold, 1)
	if err != nil {
		t.Fatal(err)
	}
	tr := truth[0]
	covered, total := 0, 0
	in := func(v, se, want float64) {
		total++
		if math.Abs(v-want) <= 1.96*se {
			covered++
		}
	}
	for d := 0; d < draws; d++ {
		s, mechs := independentPooled(t, c.Model, n, n, uint64(100+d))
		dec, err := attribution.Decompose(s, mechs, []string{metrics.NameFNR}, attribution.Options{
			Threshold: scm.ScreeningThreshold, Seed: uint64(d), FoldSplits: 1, Learners: []classify.Learner{classify.NewLinear()},
			Estimator: attribution.EstimatorRobust, Reads: c.Model.Reads()})
		if err != nil {
			t.Fatal(err)
		}
		md := dec.Metrics[0]
		in(md.Gap, md.Influence.Gap, tr.Gap)
		for i, phi := range md.Contributions {
			in(phi, md.Influence.Contributions[i], tr.Shapley[i])
		}
	}
	cov := float64(covered) / float64(total)
	t.Logf("pooled coverage of 95%% influence-function intervals: %d/%d = %.3f", covered, total, cov)
	if cov < 0.87 || math.IsNaN(cov) {
		t.Errorf("coverage %.3f below 0.87", cov)
	}
}

// resampleGroups draws a bootstrap sample: each group's records with
// replacement, group sizes fixed (Efron & Tibshirani 1993, "An
// Introduction to the Bootstrap").
func resampleGroups(s *attribution.Sample, seed uint64) *attribution.Sample {
	rng := newRand(seed)
	var idx [2][]int
	for i, c := range s.Comparison {
		g := 0
		if c {
			g = 1
		}
		idx[g] = append(idx[g], i)
	}
	n, p := s.X.Dims()
	out := &attribution.Sample{X: mat.NewDense(n, p, nil), ProbabilityCols: s.ProbabilityCols}
	r := 0
	for _, g := range idx {
		for range g {
			i := g[rng.IntN(len(g))]
			out.X.SetRow(r, s.X.RawRowView(i))
			out.Comparison = append(out.Comparison, s.Comparison[i])
			out.Labels = append(out.Labels, s.Labels[i])
			out.Scores = append(out.Scores, s.Scores[i])
			r++
		}
	}
	return out
}

// TestRobustInfluenceMatchesBootstrap compares, on one fixed sample of the
// combined-shift case, the robust estimator's influence-function standard
// errors with the standard deviation of full bootstrap refits (every
// replicate refits the classifiers and regressions; Efron & Tibshirani
// 1993). With B = 60 replicates a bootstrap SD has a relative standard
// error of about 1/√(2·59) ≈ 9%, so each ratio SE/SD must lie in [0.65,
// 1.5] (about 4 of those standard errors) and their geometric mean in
// [0.85, 1.18].
func TestRobustInfluenceMatchesBootstrap(t *testing.T) {
	if testing.Short() {
		t.Skip("bootstrap study: skipped in -short")
	}
	const n, B = 800, 60
	c := gtCase(t, "combined")
	names := []string{metrics.NameFNR, metrics.NameBrier}
	s, mechs := independentPooled(t, c.Model, n, n, 9)
	opt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: 1, FoldSplits: 1,
		Learners: []classify.Learner{classify.NewLinear()}, Estimator: attribution.EstimatorRobust, Reads: c.Model.Reads()}
	d, err := attribution.Decompose(s, mechs, names, opt)
	if err != nil {
		t.Fatal(err)
	}
	k := len(mechs)
	sum := make([][]float64, len(names))
	sum2 := make([][]float64, len(names))
	for m := range sum {
		sum[m], sum2[m] = make([]float64, k+1), make([]float64, k+1)
	}
	for b := 0; b < B; b++ {
		o := opt
		o.Seed = uint64(1000 + b)
		rep, err := attribution.Decompose(resampleGroups(s, uint64(b)), mechs, names, o)
		if err != nil {
			t.Fatal(err)
		}
		for m, md := range rep.Metrics {
			for i, x := range append(append([]float64{}, md.Contributions...), md.Gap) {
				sum[m][i] += x
				sum2[m][i] += x * x
			}
		}
	}
	var logSum float64
	var count int
	for m, md := range d.Metrics {
		se := append(append([]float64{}, md.Influence.Contributions...), md.Influence.Gap)
		for i := range se {
			if i == scm.NodeUnread {
				continue // exactly 0 in every replicate
			}
			mean := sum[m][i] / B
			sd := math.Sqrt((sum2[m][i] - B*mean*mean) / (B - 1))
			ratio := se[i] / sd
			t.Logf("%s %d: influence SE %.4f, bootstrap SD %.4f, ratio %.2f", md.Metric, i, se[i], sd, ratio)
			if !(ratio >= 0.65 && ratio <= 1.5) {
				t.Errorf("%s quantity %d: SE/SD = %.2f outside [0.65, 1.5]", md.Metric, i, ratio)
			}
			logSum += math.Log(ratio)
			count++
		}
	}
	if g := math.Exp(logSum / float64(count)); g < 0.85 || g > 1.18 {
		t.Errorf("geometric mean of SE/SD %.3f outside [0.85, 1.18]", g)
	} else {
		t.Logf("geometric mean of SE/SD %.3f", g)
	}
}
