package scm

import (
	"fmt"
	"math"

	"github.com/gapwise/gapwise/metrics"
)

// Truth is the ground-truth decomposition of one metric's gap in a Model.
type Truth struct {
	Metric string
	// Values[S] = M(P_S), the metric of hybrid distribution S.
	Values []float64
	// Gap = M(P_all) − M(P_∅), the comparison minus the reference value.
	Gap float64
	// Shapley[i] is node i's Shapley value of v(S) = M(P_S) − M(P_∅).
	Shapley []float64
	// SE[i] is the Monte Carlo standard error of Shapley[i] and GapSE that
	// of Gap, by batch means over the simulation's chunks:
	// SE = sd(φ_c) / √C over the C chunks' own estimates φ_c.
	SE    []float64
	GapSE float64
}

// GroundTruth simulates n records of every hybrid distribution with common
// random numbers (HybridStats) and returns, for each named metric, the exact
// Shapley decomposition of the simulated game with its Monte Carlo error.
// Metrics are those of metrics.Stats.Value (every metric except AUC).
func GroundTruth(m *Model, metricNames []string, n int, seed uint64, threshold float64, bins int) ([]Truth, error) {
	logLoss := false
	for _, name := range metricNames {
		logLoss = logLoss || name == metrics.NameLogLoss
	}
	chunks, err := hybridChunks(m, n, seed, threshold, bins, logLoss)
	if err != nil {
		return nil, err
	}
	total := sumChunks(chunks, bins)
	out := make([]Truth, len(metricNames))
	for mi, name := range metricNames {
		t, err := decompose(name, total)
		if err != nil {
			return nil, fmt.Errorf("scm: model %q: %w", m.Name, err)
		}
		t.SE = make([]float64, len(t.Shapley))
		if c := len(chunks); c > 1 {
			var gaps []float64
			phis := make([][]float64, len(t.Shapley))
			for _, chunk := range chunks {
				tc, err := decompose(name, chunk)
				if err != nil {
					return nil, fmt.Errorf("scm: model %q: %w", m.Name, err)
				}
				gaps = append(gaps, tc.Gap)
				for i, p := range tc.Shapley {
					phis[i] = append(phis[i], p)
				}
			}
			t.GapSE = batchSE(gaps)
			for i := range phis {
				t.SE[i] = batchSE(phis[i])
			}
		} else {
			t.GapSE = math.NaN()
			for i := range t.SE {
				t.SE[i] = math.NaN()
			}
		}
		out[mi] = t
	}
	return out, nil
}

func decompose(name string, stats []*metrics.Stats) (Truth, error) {
	t := Truth{Metric: name, Values: make([]float64, len(stats))}
	for s, st := range stats {
		x, err := st.Value(name)
		if err != nil {
			return Truth{}, fmt.Errorf("hybrid coalition %b: %w", s, err)
		}
		t.Values[s] = x
	}
	v := make([]float64, len(stats))
	for s := range v {
		v[s] = t.Values[s] - t.Values[0]
	}
	t.Gap = v[len(v)-1]
	t.Shapley = Shapley(v)
	return t, nil
}

// batchSE is the standard error of the mean of batch estimates x:
// sd(x)/√len(x), with the n−1 sample standard deviation.
func batchSE(x []float64) float64 {
	var mean float64
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	var ss float64
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	return math.Sqrt(ss/float64(len(x)-1)) / math.Sqrt(float64(len(x)))
}
