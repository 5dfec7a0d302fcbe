package scm

import (
	"fmt"

	"github.com/gapwise/gapwise/internal/workers"
	"github.com/gapwise/gapwise/metrics"
)

// maxChunks is the number of contiguous record ranges a hybrid simulation is
// split into. Chunks are the unit of parallel work and the batches of the
// batch-means Monte Carlo error in GroundTruth; their bounds depend only on
// n, never on the number of goroutines.
const maxChunks = 32

// HybridStats simulates n records of every hybrid distribution P_S at once,
// with common random numbers: record j has the same noise in every
// coalition. It returns the metric statistics (metrics.Stats with the given
// score bins, decisions at score ≥ threshold) of each coalition, indexed by
// the Coalition bit set, so element 0 is the reference distribution and
// element All(k) the comparison distribution. The records of coalition s
// are exactly those of Simulate(m, s, n, seed). Deterministic for a given
// seed whatever GOMAXPROCS.
func HybridStats(m *Model, n int, seed uint64, threshold float64, bins int) ([]*metrics.Stats, error) {
	chunks, err := hybridChunks(m, n, seed, threshold, bins, true)
	if err != nil {
		return nil, err
	}
	return sumChunks(chunks, bins), nil
}

// Hybrid returns the metric statistics of n records of the single hybrid
// distribution P_s, drawn from the same random stream as HybridStats.
func Hybrid(m *Model, s Coalition, n int, seed uint64, threshold float64, bins int) (*metrics.Stats, error) {
	rec, err := Simulate(m, s, n, seed)
	if err != nil {
		return nil, err
	}
	if bins < 1 {
		return nil, fmt.Errorf("scm: need at least 1 score bin, got %d", bins)
	}
	st := metrics.NewStats(bins)
	for j := range rec.Labels {
		st.Add(rec.Labels[j], rec.Scores[j], threshold, 1)
	}
	return st, nil
}

// hybridChunks returns per chunk, per coalition statistics. Without logLoss
// the log-loss sums (Stats.WL) stay 0.
func hybridChunks(m *Model, n int, seed uint64, threshold float64, bins int, logLoss bool) ([][]*metrics.Stats, error) {
	if err := m.Validate(); err != nil {
		return nil, err
	}
	if n < 1 {
		return nil, fmt.Errorf("scm: hybrid simulation needs at least 1 record, got %d", n)
	}
	if bins < 1 {
		return nil, fmt.Errorf("scm: need at least 1 score bin, got %d", bins)
	}
	k := len(m.Nodes)
	blocks := (n + BlockSize - 1) / BlockSize
	nChunks := min(maxChunks, blocks)
	out := make([][]*metrics.Stats, nChunks)
	workers.For(0, nChunks, func(_, c int) {
		// Coalitions differing only in unshifted nodes share statistics.
		shifted := m.ShiftedSet()
		stats := make([]*metrics.Stats, 1<<uint(k))
		for s := range stats {
			if r := Coalition(s) & shifted; r != Coalition(s) {
				stats[s] = stats[r]
			} else {
				stats[s] = metrics.NewStats(bins)
			}
		}
		e := newEvaluator(m)
		leaf := newLeafScorer(m, threshold, logLoss)
		visit := func(s Coalition, v []float64) { leaf.add(stats[s], v) }
		for b := c * blocks / nChunks; b < (c+1)*blocks/nChunks; b++ {
			r := blockRand(seed, streamHybrid, b)
			for j := b * BlockSize; j < min(n, (b+1)*BlockSize); j++ {
				drawNoise(r, e.u, e.z)
				e.everyCoalition(visit)
			}
		}
		out[c] = stats
	})
	return out, nil
}

// sumChunks adds the chunks' statistics in chunk order.
func sumChunks(chunks [][]*metrics.Stats, bins int) []*metrics.Stats {
	total := make([]*metrics.Stats, len(chunks[0]))
	for s := range total {
		total[s] = metrics.NewStats(bins)
		for _, c := range chunks {
			addStats(total[s], c[s])
		}
	}
	return total
}

// addStats adds src's cells to dst's.
func addStats(dst, src *metrics.Stats) {
	for c := range dst.W {
		dst.W[c] += src.W[c]
		dst.WS[c] += src.WS[c]
		dst.WS2[c] += src.WS2[c]
		dst.WL[c] += src.WL[c]
	}
}
