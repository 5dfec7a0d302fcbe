package attribution

import (
	"errors"
	"fmt"
	"math"

	"github.com/gapwise/gapwise/internal/workers"
	"github.com/gapwise/gapwise/metrics"
)

// ClipLogRatio bounds every log density ratio to [−ClipLogRatio,
// ClipLogRatio] before it enters a weight. A single ratio beyond e^30 ≈ 10^13
// carries no usable information (the effective sample size of such a weight
// vector is about one record), and the bound keeps the engine's scaled
// products finite in float64 (common practice: clip importance weights).
const ClipLogRatio = 30

// MaxExactMechanisms is the largest k EvaluateCoalitions accepts: 2^k
// coalition values per metric must fit in memory.
const MaxExactMechanisms = 26

// EngineOptions controls EvaluateCoalitions and EvaluateSome.
type EngineOptions struct {
	Workers int // goroutines; 0 means GOMAXPROCS
	ECEBins int // score bins for ECE; 0 means metrics.DefaultECEBins
}

// Games holds the metric of every hybrid distribution.
type Games struct {
	K       int
	Metrics []string
	// Values[m][S] is metric Metrics[m] of the hybrid distribution P_S
	// (an absolute value, not a difference), S a coalition bitmask.
	Values [][]float64
}

// CoalitionError reports a metric that is undefined under one coalition,
// e.g. FNR when the reweighted sample has no positive weight on events.
// Err wraps metrics.ErrUndefined.
type CoalitionError struct {
	Metric    string
	Coalition uint64 // bitmask of mechanisms in their comparison form
	Err       error
}

func (e *CoalitionError) Error() string {
	return fmt.Sprintf("attribution: metric %s is undefined under coalition %#b: %v", e.Metric, e.Coalition, e.Err)
}

func (e *CoalitionError) Unwrap() error { return e.Err }

// ErrUnsupportedMetric is wrapped by errors for a metric name the engine
// does not know.
var ErrUnsupportedMetric = errors.New("unsupported metric")

// EvaluateCoalitions computes, for every coalition S ⊆ {0..k−1} with
// k = len(logr), the metrics of the hybrid distribution P_S estimated on the
// reference group's records (labels 0/1, scores) with weights
//
//	w_S(r) = exp(Σ_{i∈S} clip(logr[i][r])),
//
// where logr[i][r] = log r_i at record r and clip bounds it by ClipLogRatio.
// A record decides positive when score ≥ threshold. Every metric but AUC is
// a ratio of per-cell sums that are linear in w (see metrics.Stats); these
// sums are computed for all 2^k coalitions at once as matrix products over
// split halves of the mechanisms (see productEngine). AUC is evaluated per
// coalition with metrics.AUCSorter. Results do not depend on opt.Workers:
// every sum runs in a fixed order.
//
// It returns an error for an unknown metric name, a label that is not 0 or
// 1, a non-finite score, a NaN log-ratio, or — as a *CoalitionError wrapping
// metrics.ErrUndefined — a metric with zero weighted denominator under some
// coalition. It panics if scores or any logr[i] differ in length from
// labels.
func EvaluateCoalitions(labels, scores []float64, threshold float64, logr [][]float64, metricNames []string, opt EngineOptions) (*Games, error) {
	k := len(logr)
	if k > MaxExactMechanisms {
		return nil, fmt.Errorf("attribution: exact enumeration supports at most %d mechanisms, got %d; use SampledShapley", MaxExactMechanisms, k)
	}
	in, err := newEngineInput(labels, scores, threshold, logr, metricNames, opt)
	if err != nil {
		return nil, err
	}
	g := &Games{K: k, Metrics: append([]string(nil), metricNames...), Values: make([][]float64, len(metricNames))}
	for m := range g.Values {
		g.Values[m] = make([]float64, 1<<k)
	}
	if in.plan.statMetrics() > 0 {
		if err := newProductEngine(in).run(g.Values); err != nil {
			return nil, err
		}
	}
	if in.plan.auc >= 0 {
		if err := evaluateAUCAll(in, g.Values[in.plan.auc]); err != nil {
			return nil, err
		}
	}
	return g, nil
}

// engineInput is validated input shared by the engines.
type engineInput struct {
	labels, scores []float64
	threshold      float64
	logr           [][]float64 // clipped copies
	plan           metricPlan
	workers        int
}

func newEngineInput(labels, scores []float64, threshold float64, logr [][]float64, metricNames []string, opt EngineOptions) (*engineInput, error) {
	n := len(labels)
	if len(scores) != n {
		panic("attribution: labels and scores differ in length")
	}
	for i := range logr {
		if len(logr[i]) != n {
			panic("attribution: a log-ratio vector and labels differ in length")
		}
	}
	if opt.Workers < 0 {
		return nil, fmt.Errorf("attribution: EngineOptions.Workers must be >= 0, got %d", opt.Workers)
	}
	if opt.ECEBins < 0 {
		return nil, fmt.Errorf("attribution: EngineOptions.ECEBins must be >= 0, got %d", opt.ECEBins)
	}
	for r := 0; r < n; r++ {
		if labels[r] != 0 && labels[r] != 1 {
			return nil, fmt.Errorf("attribution: reference record %d: label %v is not 0 or 1", r, labels[r])
		}
		if math.IsNaN(scores[r]) || math.IsInf(scores[r], 0) {
			return nil, fmt.Errorf("attribution: reference record %d: score %v is not finite", r, scores[r])
		}
	}
	clipped := make([][]float64, len(logr))
	for i, l := range logr {
		c := make([]float64, n)
		for r, x := range l {
			if math.IsNaN(x) {
				return nil, fmt.Errorf("attribution: mechanism %d, reference record %d: log-ratio is NaN", i, r)
			}
			c[r] = math.Max(-ClipLogRatio, math.Min(ClipLogRatio, x))
		}
		clipped[i] = c
	}
	bins := opt.ECEBins
	if bins == 0 {
		bins = metrics.DefaultECEBins
	}
	plan, err := newMetricPlan(metricNames, bins)
	if err != nil {
		return nil, err
	}
	return &engineInput{labels: labels, scores: scores, threshold: threshold, logr: clipped, plan: plan, workers: workers.Count(opt.Workers)}, nil
}
