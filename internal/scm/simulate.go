package scm

import (
	"fmt"

	"github.com/gapwise/gapwise/internal/workers"
)

// Group selects one of the two groups' distributions.
type Group int

// The two groups.
const (
	Reference Group = iota
	Comparison
)

// String returns "reference" or "comparison".
func (g Group) String() string {
	if g == Comparison {
		return "comparison"
	}
	return "reference"
}

// Records are n simulated records: Values[j][i] is node i of record j
// (categorical nodes as level indices), with the label and the fixed model's
// score of each record.
type Records struct {
	Values [][]float64
	Labels []float64
	Scores []float64
}

// Sample draws n records from group g's distribution (every node follows g's
// equation). The same (model, g, n, seed) always gives the same records,
// whatever GOMAXPROCS.
func Sample(m *Model, g Group, n int, seed uint64) (*Records, error) {
	s, stream := Coalition(0), streamReference
	if g == Comparison {
		s, stream = All(len(m.Nodes)), streamComparison
	}
	return simulate(m, s, n, seed, stream)
}

// Simulate draws n records from the hybrid distribution P_S: node i follows
// the comparison group's equation when i ∈ s and the reference group's
// otherwise. It uses the hybrid stream of seed, which HybridStats also uses,
// so Simulate(m, s, n, seed) are exactly the records behind
// HybridStats(...)[s] with the same n and seed.
func Simulate(m *Model, s Coalition, n int, seed uint64) (*Records, error) {
	return simulate(m, s, n, seed, streamHybrid)
}

func simulate(m *Model, s Coalition, n int, seed uint64, stream int) (*Records, error) {
	if err := m.Validate(); err != nil {
		return nil, err
	}
	if n < 0 {
		return nil, fmt.Errorf("scm: negative record count %d", n)
	}
	k := len(m.Nodes)
	rec := &Records{Values: make([][]float64, n), Labels: make([]float64, n), Scores: make([]float64, n)}
	flat := make([]float64, n*k)
	blocks := (n + BlockSize - 1) / BlockSize
	workers.For(0, blocks, func(_, b int) {
		e := newEvaluator(m)
		r := blockRand(seed, stream, b)
		for j := b * BlockSize; j < min(n, (b+1)*BlockSize); j++ {
			drawNoise(r, e.u, e.z)
			e.record(s)
			row := flat[j*k : (j+1)*k : (j+1)*k]
			copy(row, e.v)
			rec.Values[j] = row
			rec.Labels[j] = e.v[m.Label]
			rec.Scores[j] = m.Score(e.v)
		}
	})
	return rec, nil
}
