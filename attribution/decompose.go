package attribution

import (
	"errors"
	"fmt"
	"math"

	"github.com/gapwise/gapwise/metrics"
)

// Decompose estimates, for each requested metric, the gap
// M(P_cmp) − M(P_ref) and its Shapley split over the mechanisms.
//
// It estimates every mechanism's density ratio with EstimateRatios, then
// evaluates the metric of every hybrid distribution P_S by reweighting the
// reference records with w_S = Π_{i∈S} r_i (EvaluateCoalitions), forms the
// game v(S) = M(P_S) − M(P_∅), and returns φ = ExactShapley(v). Because the
// reweighted grand coalition only estimates the comparison group's metric,
// Residual = Gap − Σφ is reported rather than absorbed.
func Decompose(s *Sample, mechs []Mechanism, metricNames []string, opt Options) (*Decomposition, error) {
	d, _, err := decompose(s, mechs, metricNames, opt, nil)
	return d, err
}

// groupSplit holds one group's labels and scores and its record indices in
// the Sample.
type groupSplit struct {
	refIdx, cmpIdx []int
	refY, refS     []float64
	cmpY, cmpS     []float64
}

func splitGroups(s *Sample) groupSplit {
	var g groupSplit
	for i, c := range s.Comparison {
		if c {
			g.cmpIdx = append(g.cmpIdx, i)
		} else {
			g.refIdx = append(g.refIdx, i)
		}
	}
	g.refY, g.refS = pick(s.Labels, g.refIdx), pick(s.Scores, g.refIdx)
	g.cmpY, g.cmpS = pick(s.Labels, g.cmpIdx), pick(s.Scores, g.cmpIdx)
	return g
}

func decompose(s *Sample, mechs []Mechanism, metricNames []string, opt Options, chosen map[string]string) (*Decomposition, []MechanismRatio, error) {
	n := len(s.Comparison)
	if len(s.Labels) != n || len(s.Scores) != n {
		panic("attribution: Sample slices differ in length")
	}
	opt = withDefaults(opt)
	g := splitGroups(s)
	// Observed metrics first: an undefined metric is the user's problem and
	// is reported before any fitting.
	out := &Decomposition{}
	var err error
	if out.Metrics, err = observe(metricNames, g, opt); err != nil {
		return nil, nil, err
	}
	ratios, err := estimateRatios(s, mechs, RatioOptions{Folds: opt.Folds, Seed: opt.Seed, Learners: opt.Learners, Workers: opt.Workers}, chosen)
	if err != nil {
		return nil, nil, err
	}
	logr := make([][]float64, len(mechs))
	member := s.comparisonLabels()
	for i, mr := range ratios {
		logr[i] = pick(mr.LogRatio, g.refIdx)
		ws := SummariseLogWeights(logr[i])
		// Out-of-fold AUC of the (node, parents) classifier; both groups
		// are present, so it is defined.
		auc, err := metrics.AUC(member, mr.JointLogOdds, nil)
		if err != nil {
			auc = math.NaN()
		}
		out.Mechanisms = append(out.Mechanisms, MechanismReport{
			Mechanism:     mr.Mechanism,
			Learner:       mr.Learner,
			ParentLearner: mr.ParentLearner,
			Losses:        mr.Losses,
			AUC:           auc,
			ESS:           ws.ESS,
			MaxShare:      ws.MaxShare,
			MeanRatio:     ws.MeanRatio,
		})
	}
	if err := splitGaps(out.Metrics, g.refY, g.refS, logr, opt); err != nil {
		return nil, nil, err
	}
	return out, ratios, nil
}

func withDefaults(opt Options) Options {
	if opt.ECEBins == 0 {
		opt.ECEBins = metrics.DefaultECEBins
	}
	if opt.Folds == 0 {
		opt.Folds = 5
	}
	return opt
}

// observe computes each metric on the two groups' records, unweighted.
func observe(metricNames []string, g groupSplit, opt Options) ([]MetricDecomposition, error) {
	var out []MetricDecomposition
	for _, name := range metricNames {
		ref, err := metrics.Compute(name, g.refY, g.refS, opt.Threshold, opt.ECEBins, nil)
		if err != nil {
			return nil, metricErr(name, GroupReference, err)
		}
		cmp, err := metrics.Compute(name, g.cmpY, g.cmpS, opt.Threshold, opt.ECEBins, nil)
		if err != nil {
			return nil, metricErr(name, GroupComparison, err)
		}
		out = append(out, MetricDecomposition{Metric: name, Reference: ref, Comparison: cmp, Gap: cmp - ref})
	}
	return out, nil
}

// splitGaps evaluates the game of every metric over all coalitions from the
// reference records and their log-ratios, and fills the Shapley values.
func splitGaps(mds []MetricDecomposition, refY, refS []float64, logr [][]float64, opt Options) error {
	names := make([]string, len(mds))
	for m := range mds {
		names[m] = mds[m].Metric
	}
	k := len(logr)
	games, err := EvaluateCoalitions(refY, refS, opt.Threshold, logr, names, EngineOptions{Workers: opt.Workers, ECEBins: opt.ECEBins})
	if err != nil {
		return fmt.Errorf("attribution: evaluating coalitions: %w", err)
	}
	full := uint64(1)<<k - 1
	for m := range mds {
		md := &mds[m]
		vals := games.Values[m]
		v := make([]float64, len(vals))
		for S := range vals {
			v[S] = vals[S] - vals[0]
		}
		md.Contributions = ExactShapley(v, k)
		md.Estimated = v[full]
		md.Residual = md.Gap - md.Estimated
		md.Alone = make([]float64, k)
		md.IfEqualised = make([]float64, k)
		for i := 0; i < k; i++ {
			md.Alone[i] = v[uint64(1)<<i]
			md.IfEqualised[i] = v[full&^(uint64(1)<<i)]
		}
	}
	return nil
}

func metricErr(name, group string, err error) error {
	if errors.Is(err, metrics.ErrUndefined) {
		return &MetricError{Metric: name, Group: group, Err: err}
	}
	return fmt.Errorf("attribution: metric %s in the %s group: %w", name, group, err)
}

func pick(x []float64, idx []int) []float64 {
	out := make([]float64, len(idx))
	for a, i := range idx {
		out[a] = x[i]
	}
	return out
}

// comparisonLabels returns 1 for comparison records and 0 otherwise.
func (s *Sample) comparisonLabels() []float64 {
	y := make([]float64, len(s.Comparison))
	for i, c := range s.Comparison {
		if c {
			y[i] = 1
		}
	}
	return y
}
