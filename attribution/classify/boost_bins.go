package classify

import (
	"math/rand/v2"
	"slices"

	"github.com/gapwise/gapwise/internal/workers"
	"gonum.org/v1/gonum/mat"
)

// boostBinSample is the most training rows whose values are sorted to place
// the bin edges of one feature. Quantiles of a 50 000-row random subsample
// are within about ±0.5/√50000 ≈ 0.2 percentage points of the full-data
// quantiles (binomial standard error), far finer than a 1/255 bin.
const boostBinSample = 50_000

// boostBinning maps every feature to at most 255 ordered bins.
//
// Bin b of feature f holds the values v with edges[f][b−1] < v ≤ edges[f][b]
// (edges[f][−1] = −∞, edges[f][len] = +∞), so a feature with E edges has
// E+1 bins and "bin ≤ b" is the same test as "v ≤ edges[f][b]". That
// equivalence lets trees be grown on bins and applied to raw values.
type boostBinning struct {
	edges   [][]float64 // strictly increasing per feature
	offsets []int       // offsets[f] is feature f's first histogram slot; offsets[p] is the total
}

// newBoostBinning places the bin edges of every column of x from the given
// rows (all of them, or a seeded subsample of boostBinSample rows), sorting
// the columns on up to threads goroutines.
func newBoostBinning(x *mat.Dense, rows []int32, maxBins int, seed uint64, threads int) *boostBinning {
	_, p := x.Dims()
	sample := rows
	if len(rows) > boostBinSample {
		// Partial Fisher–Yates shuffle of a copy; the first boostBinSample
		// entries are a uniform sample without replacement.
		sample = slices.Clone(rows)
		rng := rand.New(rand.NewPCG(seed, 0x62696e73))
		for i := range boostBinSample {
			j := i + rng.IntN(len(sample)-i)
			sample[i], sample[j] = sample[j], sample[i]
		}
		sample = sample[:boostBinSample]
	}
	b := &boostBinning{edges: make([][]float64, p), offsets: make([]int, p+1)}
	raw := x.RawMatrix()
	workers.For(threads, p, func(_, f int) {
		vals := make([]float64, len(sample))
		for i, r := range sample {
			vals[i] = raw.Data[int(r)*raw.Stride+f]
		}
		slices.Sort(vals)
		b.edges[f] = boostEdges(vals, maxBins)
	})
	for f := range p {
		b.offsets[f+1] = b.offsets[f] + len(b.edges[f]) + 1
	}
	return b
}

// boostEdges returns the strictly increasing bin edges for sorted values,
// giving at most maxBins bins. When there are at most maxBins distinct values
// each gets its own bin, with edges at the midpoints between neighbours
// (so a 0/1 column gets the single edge 0.5). Otherwise edge k
// (k = 1 … maxBins−1) is the midpoint of the two order statistics around the
// k/maxBins quantile, and repeated edges (ties spanning several quantiles)
// are merged.
func boostEdges(sorted []float64, maxBins int) []float64 {
	if len(sorted) == 0 {
		return nil
	}
	distinct := 1
	for i := 1; i < len(sorted) && distinct <= maxBins; i++ {
		if sorted[i] != sorted[i-1] {
			distinct++
		}
	}
	var edges []float64
	if distinct <= maxBins {
		edges = make([]float64, 0, distinct-1)
		for i := 1; i < len(sorted); i++ {
			if sorted[i] != sorted[i-1] {
				edges = append(edges, sorted[i-1]+(sorted[i]-sorted[i-1])/2)
			}
		}
		return edges
	}
	m := len(sorted)
	edges = make([]float64, 0, maxBins-1)
	for k := 1; k < maxBins; k++ {
		j := max(1, min(m-1, (k*m+maxBins/2)/maxBins))
		e := sorted[j-1] + (sorted[j]-sorted[j-1])/2
		if e >= sorted[m-1] {
			break // an edge at the maximum would leave the last bin empty
		}
		if len(edges) == 0 || e > edges[len(edges)-1] {
			edges = append(edges, e)
		}
	}
	return edges
}

// boostWords is the number of uint64 words holding one row's bins, eight
// 8-bit bins per word.
func boostWords(p int) int { return (p + 7) / 8 }

// binRows returns the bins of the given rows of x, packed row-major: row i
// occupies words i·W … i·W+W−1 (W = boostWords(p)), and the bin of feature f
// is byte f mod 8 (little-endian) of word i·W + f/8. Packing lets a row's
// bins move as whole words when rows are partitioned. Blocks of rows are
// binned on up to threads goroutines.
func (b *boostBinning) binRows(x *mat.Dense, rows []int32, threads int) []uint64 {
	p := len(b.edges)
	words := boostWords(p)
	out := make([]uint64, len(rows)*words)
	raw := x.RawMatrix()
	const block = 8192
	workers.For(threads, (len(rows)+block-1)/block, func(_, k int) {
		lo, hi := k*block, min(len(rows), (k+1)*block)
		for i := lo; i < hi; i++ {
			src := raw.Data[int(rows[i])*raw.Stride:]
			dst := out[i*words : i*words+words]
			for f, e := range b.edges {
				dst[f>>3] |= uint64(boostBinOf(e, src[f])) << (8 * (f & 7))
			}
		}
	})
	return out
}

// boostBinAt returns the bin of feature f from a packed row.
func boostBinAt(row []uint64, f int) uint8 { return uint8(row[f>>3] >> (8 * (f & 7))) }

// boostBinOf returns the bin of v: the number of edges strictly below v.
// The search is branch-free (a fixed number of halving steps), which is
// several times faster than sort.SearchFloat64s on unpredictable values.
func boostBinOf(edges []float64, v float64) uint8 {
	lo, n := 0, len(edges)
	for n > 0 {
		half := n >> 1
		step := 0
		if edges[lo+half] < v {
			step = n - half
		}
		lo += step
		n = half
	}
	return uint8(lo)
}
