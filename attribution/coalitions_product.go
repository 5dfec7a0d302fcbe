package attribution

import (
	"math"
	"math/bits"

	"github.com/gapwise/gapwise/internal/workers"
	"github.com/gapwise/gapwise/metrics"
)

// Tuning of the product engine: records are processed in chunks of
// chunkRecords; the output is cut into tiles of tileRows × tileCols, each
// updated by one worker panel by panel (a B panel of 8 × chunkRecords
// float64 stays in L1 while the tile's A panels stream past it).
const (
	chunkRecords = 256
	tileRows     = 64
	tileCols     = 192
)

// passByteLimit bounds the accumulator memory of one pass over the records;
// larger games are processed in several passes over row ranges of S_A. It is
// a variable so that tests can exercise the multi-pass path.
var passByteLimit = 256 << 20

// productEngine computes the per-cell sums of every coalition as matrix
// products over split halves of the mechanisms. Mechanisms 0..kB−1 form
// half B (low bits of S) and kB..k−1 half A (high bits), so S = sA·2^kB + sB.
// For a cell c and per-record feature f,
//
//	T_{c,f}[sA, sB] = Σ_{r∈c} f(r)·P_A(sA)[r]·P_B(sB)[r],
//	P_H(s)[r] = exp(Σ_{i∈s} log r_i(r) − c_H(s)),  c_H(s) = max_r Σ_{i∈s} log r_i(r),
//
// is a product of a 2^kA × n_c and an n_c × 2^kB matrix. The scale c_H(s)
// makes the largest entry of every row 1, so nothing overflows; the true
// sums are T·exp(c_A(sA) + c_B(sB)), a factor common to all cells and
// features of one coalition that cancels in every metric (each is a ratio of
// sums homogeneous in w). Tables are built incrementally,
// P_H(s) = P_H(s∖low) · r_low · exp(c_H(s∖low) − c_H(s)), low the lowest
// bit of s: two multiplications per entry.
type productEngine struct {
	in     *engineInput
	k      int
	kA, kB int
	nA, nB int
	groups [][]int32   // groups[slot]: reference records of cell plan.cells[slot], ascending
	fval   [][]float64 // fval[fi][r]: feature plan.feats[fi] of record r
	rt     []float64   // rt[r·k+i] = exp(clip(log r_i(r)))
	gA, gB []float64   // scale steps exp(c(s∖low) − c(s))
}

func newProductEngine(in *engineInput) *productEngine {
	k := len(in.logr)
	n := len(in.labels)
	e := &productEngine{in: in, k: k, kA: k / 2}
	e.kB = k - e.kA
	e.nA, e.nB = 1<<e.kA, 1<<e.kB
	p := &in.plan
	e.groups = make([][]int32, len(p.cells))
	for r := 0; r < n; r++ {
		s := p.slot[metrics.Cell(in.labels[r], in.scores[r], in.threshold, p.bins)]
		if s >= 0 {
			e.groups[s] = append(e.groups[s], int32(r))
		}
	}
	e.fval = make([][]float64, len(p.feats))
	for fi, f := range p.feats {
		if f == featW {
			continue
		}
		v := make([]float64, n)
		for r := range v {
			v[r] = featureValue(f, in.labels[r], in.scores[r])
		}
		e.fval[fi] = v
	}
	e.rt = make([]float64, n*k)
	workers.For(in.workers, in.workers, func(_, part int) {
		lo, hi := splitRange(n, in.workers, part)
		for r := lo; r < hi; r++ {
			for i := 0; i < k; i++ {
				e.rt[r*k+i] = math.Exp(in.logr[i][r])
			}
		}
	})
	e.gA = e.scaleSteps(e.kB, e.kA)
	e.gB = e.scaleSteps(0, e.kB)
	return e
}

// scaleSteps computes c_H(s) = max_r Σ_{i∈s} log r_{off+i}(r) over the
// records the plan uses and returns g[s] = exp(c_H(s∖low) − c_H(s)).
// A maximum does not depend on the order of records, so the per-worker
// partial maxima combine exactly.
func (e *productEngine) scaleSteps(off, h int) []float64 {
	size := 1 << h
	var recs []int32
	for _, g := range e.groups {
		recs = append(recs, g...)
	}
	w := e.in.workers
	partial := make([][]float64, w)
	workers.For(w, w, func(_, part int) {
		c := make([]float64, size)
		for s := range c {
			c[s] = math.Inf(-1)
		}
		sum := make([]float64, size)
		lo, hi := splitRange(len(recs), w, part)
		for _, r := range recs[lo:hi] {
			for s := 1; s < size; s++ {
				sum[s] = sum[s&(s-1)] + e.in.logr[off+bits.TrailingZeros(uint(s))][r]
				c[s] = math.Max(c[s], sum[s])
			}
		}
		partial[part] = c
	})
	c := make([]float64, size)
	for s := 1; s < size; s++ {
		c[s] = math.Inf(-1)
		for _, pc := range partial {
			c[s] = math.Max(c[s], pc[s])
		}
	}
	g := make([]float64, size)
	g[0] = 1
	for s := 1; s < size; s++ {
		if math.IsInf(c[s], -1) { // no records: any finite step will do
			g[s] = 1
			continue
		}
		g[s] = math.Exp(c[s&(s-1)] - c[s])
	}
	return g
}

// fillHalf writes the scaled products P_H(s)[r] for all s of half H (bits
// off..off+len(g)−1) for the record whose ratios are rtRow.
func fillHalf(dst, rtRow, g []float64, off int) {
	dst[0] = 1
	for s := 1; s < len(dst); s++ {
		dst[s] = dst[s&(s-1)] * rtRow[off+bits.TrailingZeros(uint(s))] * g[s]
	}
}

// run fills values[m][S] for every Stats metric m of the plan.
func (e *productEngine) run(values [][]float64) error {
	p := &e.in.plan
	nf := len(p.feats)
	perRow := len(p.cells) * nf * e.nBPad() * 8
	rowsPerPass := e.nA
	if perRow*rowsPerPass > passByteLimit {
		rowsPerPass = max(tileRows, passByteLimit/perRow/tileRows*tileRows)
	}
	for a0 := 0; a0 < e.nA; a0 += rowsPerPass {
		a1 := min(e.nA, a0+rowsPerPass)
		acc := e.accumulate(a0, a1)
		if err := e.evaluate(acc, a0, a1, values); err != nil {
			return err
		}
	}
	return nil
}

// accumulate returns acc[slot][fi] = T_{cell, feature}[a0:a1, :], row-major
// with row stride e.nBPad (rows and columns padded to whole kernel panels
// with zero entries). Per chunk of records of one cell, the tables are built
// directly in packed panel layout: A panel q holds rows 4q..4q+3 as
// pa[q·4·mc + p·4 + i], B panel q holds columns 8q..8q+7 as
// pb[q·8·mc + p·8 + j]. Then every output tile is updated by one worker with
// productKernel, adding the chunk's records in ascending order, so each sum
// has a fixed evaluation order whatever the number of workers.
func (e *productEngine) accumulate(a0, a1 int) [][][]float64 {
	p := &e.in.plan
	nf := len(p.feats)
	rows := a1 - a0
	rowsPad := roundUp(rows, kernelRows)
	nBPad := e.nBPad()
	acc := make([][][]float64, len(p.cells))
	for s := range acc {
		acc[s] = make([][]float64, nf)
		for fi := range acc[s] {
			acc[s][fi] = make([]float64, rowsPad*nBPad)
		}
	}
	w := e.in.workers
	pb := make([]float64, chunkRecords*nBPad)
	pa := make([][]float64, nf)
	for fi := range pa {
		pa[fi] = make([]float64, rowsPad*chunkRecords)
	}
	scratchA := make([][]float64, w)
	scratchB := make([][]float64, w)
	for i := range scratchA {
		scratchA[i] = make([]float64, e.nA)
		scratchB[i] = make([]float64, e.nB)
	}
	rowTiles := (rowsPad + tileRows - 1) / tileRows
	colTiles := (nBPad + tileCols - 1) / tileCols
	for slot, recs := range e.groups {
		for c0 := 0; c0 < len(recs); c0 += chunkRecords {
			chunk := recs[c0:min(len(recs), c0+chunkRecords)]
			mc := len(chunk)
			workers.For(w, w, func(worker, part int) {
				lo, hi := splitRange(mc, w, part)
				ta, tb := scratchA[worker], scratchB[worker]
				for j := lo; j < hi; j++ {
					r := int(chunk[j])
					row := e.rt[r*e.k : (r+1)*e.k]
					fillHalf(tb, row, e.gB, 0)
					for s, x := range tb {
						pb[(s/kernelCols)*kernelCols*mc+j*kernelCols+s%kernelCols] = x
					}
					fillHalf(ta, row, e.gA, e.kB)
					for fi := range pa {
						f := 1.0
						if e.fval[fi] != nil {
							f = e.fval[fi][r]
						}
						dst := pa[fi]
						for a := a0; a < a1; a++ {
							ra := a - a0
							dst[(ra/kernelRows)*kernelRows*mc+j*kernelRows+ra%kernelRows] = ta[a] * f
						}
					}
				}
			})
			workers.For(w, rowTiles*colTiles, func(_, t int) {
				r0 := (t / colTiles) * tileRows
				b0 := (t % colTiles) * tileCols
				r1 := min(rowsPad, r0+tileRows)
				b1 := min(nBPad, b0+tileCols)
				for fi := range pa {
					out := acc[slot][fi]
					for b := b0; b < b1; b += kernelCols {
						bp := pb[b*mc : (b+kernelCols)*mc]
						for r := r0; r < r1; r += kernelRows {
							productKernel(mc, pa[fi][r*mc:(r+kernelRows)*mc], bp, out[r*nBPad+b:], nBPad)
						}
					}
				}
			})
		}
	}
	return acc
}

// nBPad is the number of half-B coalitions rounded up to whole panels.
func (e *productEngine) nBPad() int { return roundUp(e.nB, kernelCols) }

func roundUp(x, m int) int { return (x + m - 1) / m * m }

// evaluate turns the sums of rows a0..a1−1 into metric values.
func (e *productEngine) evaluate(acc [][][]float64, a0, a1 int, values [][]float64) error {
	p := &e.in.plan
	w := e.in.workers
	stats := make([]*metrics.Stats, w)
	targets := make([][]*float64, w)
	for i := range stats {
		stats[i] = metrics.NewStats(p.bins)
		targets[i] = p.targets(stats[i])
	}
	var flat [][]float64 // flat[slot·nf + fi], the order of targets
	for _, a := range acc {
		flat = append(flat, a...)
	}
	errs := make([]error, a1-a0)
	nBPad := e.nBPad()
	workers.For(w, a1-a0, func(worker, ra int) {
		st, tg := stats[worker], targets[worker]
		for sb := 0; sb < e.nB; sb++ {
			idx := ra*nBPad + sb
			for t, dst := range tg {
				*dst = flat[t][idx]
			}
			S := (a0+ra)*e.nB + sb
			for _, m := range p.stat {
				v, err := st.Value(p.names[m])
				if err != nil {
					errs[ra] = &CoalitionError{Metric: p.names[m], Coalition: uint64(S), Err: err}
					return
				}
				values[m][S] = v
			}
		}
	})
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}
