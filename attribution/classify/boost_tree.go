package classify

import (
	"math"

	"github.com/gapwise/gapwise/internal/workers"
)

// The boosting rounds use the gradient and hessian of the weighted
// logistic loss ℓ = w·[log(1+e^z) − y·z] at the current log-odds z:
// g = ∂ℓ/∂z = w·(σ(z) − y), h = ∂²ℓ/∂z² = w·σ(z)·(1 − σ(z)). They are
// stored in single precision (relative rounding 6e-8, far below the
// sampling noise of any split) to shrink the bytes moved per row; all sums
// are accumulated in double precision.

// boostBin accumulates the gradient, hessian and row count of the rows of a
// tree node that fall into one bin of one feature.
type boostBin struct {
	g, h float64
	n    int
}

// boostTreeConfig holds the growth limits of one tree.
type boostTreeConfig struct {
	maxLeaves, maxDepth int
	minRows             int     // rows on each side of a split
	minHessian          float64 // hessian sum on each side of a split
	l2                  float64 // λ in the leaf value −G/(H+λ)
	rate                float64 // shrinkage applied to every leaf value
	threads             int     // goroutines for gradients and histograms
}

// boostNode is a node of a fitted tree. Rows with x[feat] ≤ thr (bins:
// bin ≤ bin) go to child left, the others to left+1. A leaf points to itself
// with thr = +Inf and bin = 255, so walking a fixed number of steps past a
// leaf stays on it; this makes prediction branch-free.
type boostNode struct {
	thr   float64
	feat  int32
	left  int32
	bin   uint8
	value float64 // leaf value, 0 for inner nodes
}

// boostTree is one fitted regression tree; nodes[0] is the root and depth is
// the longest root-to-leaf path.
type boostTree struct {
	nodes []boostNode
	depth int
}

// boostSplit is the best split found for a node: rows with bin ≤ bin of
// feature feat go left, with gradient, hessian and row sums gl, hl, nl.
type boostSplit struct {
	gain   float64
	feat   int
	bin    int
	gl, hl float64
	nl     int
}

// boostLeaf is a node of the tree being grown: it owns the training rows at
// positions start … end−1 of the grower's position-ordered arrays.
type boostLeaf struct {
	node       int32
	start, end int
	g, h       float64
	depth      int
	hist       []boostBin // nil once released
	split      boostSplit // valid when split.gain > 0
	applied    bool       // leaf value already added to z (rows not partitioned)
}

// boostGrower grows regression trees on binned training rows by best-first
// (leaf-wise) splitting: at every step the leaf whose best split lowers the
// second-order loss the most is split, until maxLeaves leaves exist or no
// split is allowed. The gain of splitting a node with sums (G, H) into
// (G_L, H_L) and (G_R, H_R) is
//
//	gain = G_L²/(H_L+λ) + G_R²/(H_R+λ) − G²/(H+λ),
//
// the decrease in the Newton approximation of the loss (Friedman 2001,
// "Greedy function approximation: a gradient boosting machine"; Chen &
// Guestrin 2016, "XGBoost: a scalable tree boosting system", eq. 7), and a
// leaf's value is −rate·G/(H+λ). The histogram of the larger child is the
// parent's minus the smaller child's (Ke et al. 2017, "LightGBM").
//
// The training rows' bins are stored in position order: splitting a node
// partitions its rows' 16-byte records (bins and row number) physically
// (stably), so each node's rows are contiguous and histogram building
// streams through memory. Gradients, hessians, odds and weights stay in
// row order and are looked up by row number; they fit in cache at the
// sizes where partitioning dominates, and keeping them out of the records
// halves the bytes each partition moves.
type boostGrower struct {
	p, words int
	binning  *boostBinning
	recs     []boostRec
	gh       []boostGH // per training row
	odds     []float64 // per training row: e^z at the running log-odds z, see boostClampOdds
	sw       []float64 // per training row: signed weight, +w for y = 1, −w for y = 0
	hi       []uint64  // bins of features 8, 9, …: words−1 words per position
	cfg      boostTreeConfig
	free     [][]boostBin // released histograms for reuse

	tmp   []boostRec
	tmpHi []uint64
}

// boostRec is one training row of the grower, in position order.
type boostRec struct {
	bins uint64 // bins of features 0…7, byte f holding feature f
	row  int32  // training row: index of gh, odds and sw
}

// boostGH is the gradient and hessian of one training row at its running
// log-odds (see gradients).
type boostGH struct{ g, h float32 }

// The grower keeps each row's odds e^z rather than its log-odds z: a tree
// adds the same value v to z at all rows of a leaf, which multiplies their
// odds by e^v, one exponential per leaf instead of one per row per round
// for σ(z). After t rounds the odds carry a relative rounding error of
// about t·1e-16, far below the single precision of the gradients.
// boostOddsMax bounds the odds to [1/boostOddsMax, boostOddsMax] so that
// they never overflow; beyond e^{±200} both σ(z)(1 − σ(z)) and the gradient
// of the far class are below 1e-87, i.e. 0 in single precision, whatever
// the exact z.
const boostOddsMax = 7.225973768125749e86 // e^200

// boostClampOdds bounds odds to [1/boostOddsMax, boostOddsMax].
func boostClampOdds(o float64) float64 {
	if o > boostOddsMax {
		o = boostOddsMax
	}
	if o < 1/boostOddsMax {
		o = 1 / boostOddsMax
	}
	return o
}

// boostHistChunk is the number of rows whose histogram one goroutine builds.
// The chunks depend only on the node's position range, so the fixed-order
// sum of their histograms is the same whatever GOMAXPROCS is.
const boostHistChunk = 16384

// newBoostGrower builds the grower's records from the packed training bins
// (boostBinning.binRows layout), the initial log-odds z and the signed
// weights sw, all indexed by training row.
func newBoostGrower(bins []uint64, binning *boostBinning, z, sw []float64, cfg boostTreeConfig) *boostGrower {
	p := len(binning.edges)
	W := boostWords(p)
	n := len(z)
	gr := &boostGrower{
		p: p, words: W, binning: binning, cfg: cfg,
		recs: make([]boostRec, n),
		gh:   make([]boostGH, n),
		odds: make([]float64, n),
		sw:   append([]float64(nil), sw...),
		tmp:  make([]boostRec, n),
	}
	for i := range gr.recs {
		gr.recs[i] = boostRec{bins: bins[i*W], row: int32(i)}
		gr.odds[i] = boostClampOdds(math.Exp(z[i]))
	}
	if W > 1 {
		gr.hi = make([]uint64, n*(W-1))
		gr.tmpHi = make([]uint64, n*(W-1))
		for i := range n {
			copy(gr.hi[i*(W-1):(i+1)*(W-1)], bins[i*W+1:(i+1)*W])
		}
	}
	return gr
}

// gradients writes g = w·(σ(z) − y) and h = w·σ(z)(1 − σ(z)) for every
// position, in parallel over fixed blocks (each entry depends on its row
// only). From the odds o = e^z: 1 − σ(z) = q = 1/(1+o) and σ(z) = o·q, so
// both tails are formed without cancellation and without an exponential:
// g = −w·q for y = 1, g = w·o·q for y = 0, and h = w·o·q².
func (gr *boostGrower) gradients() {
	const block = 16384
	n := len(gr.gh)
	workers.For(gr.cfg.threads, (n+block-1)/block, func(_, k int) {
		lo, hi := k*block, min(n, (k+1)*block)
		gh, odds, sw := gr.gh[lo:hi], gr.odds[lo:hi], gr.sw[lo:hi]
		for i := range gh {
			o, s := odds[i], sw[i]
			q := 1 / (1 + o)
			w := math.Abs(s)
			wp := w * o * q // w·σ(z)
			// The class is random from row to row: choose with a bit mask
			// rather than a branch.
			g0, g1 := math.Float64bits(wp), math.Float64bits(-w*q)
			y1 := (math.Float64bits(s) >> 63) - 1 // all ones when sw ≥ 0 (y = 1)
			gh[i] = boostGH{g: float32(math.Float64frombits(g0 ^ ((g0 ^ g1) & y1))), h: float32(wp * q)}
		}
	})
}

// grow fits one tree to the current gradients and adds its leaf values to
// the rows' log-odds z.
func (gr *boostGrower) grow() boostTree {
	gr.gradients()
	var g, h float64
	for _, r := range gr.recs {
		e := gr.gh[r.row]
		g += float64(e.g)
		h += float64(e.h)
	}
	root := boostLeaf{node: 0, start: 0, end: len(gr.recs), g: g, h: h, hist: gr.newHist()}
	gr.buildHist(root.hist, 0, len(gr.recs))
	tree := boostTree{nodes: []boostNode{{}}}
	root.split = gr.bestSplit(&root)

	leaves := []boostLeaf{root}
	for len(leaves) < gr.cfg.maxLeaves {
		best := -1
		for i := range leaves {
			if leaves[i].split.gain > 0 && (best < 0 || leaves[i].split.gain > leaves[best].split.gain) {
				best = i
			}
		}
		if best < 0 {
			break
		}
		final := len(leaves)+1 == gr.cfg.maxLeaves
		left, right := gr.split(&tree, &leaves[best], final)
		leaves[best] = left
		leaves = append(leaves, right)
	}
	for i := range leaves {
		lf := &leaves[i]
		gr.release(lf)
		v := gr.leafValue(lf.g, lf.h)
		tree.nodes[lf.node] = boostNode{thr: math.Inf(1), left: lf.node, bin: math.MaxUint8, value: v}
		tree.depth = max(tree.depth, lf.depth)
		if lf.applied {
			continue
		}
		ev := math.Exp(v)
		odds := gr.odds
		for _, r := range gr.recs[lf.start:lf.end] {
			odds[r.row] = boostClampOdds(odds[r.row] * ev)
		}
	}
	return tree
}

// leafValue is −rate·G/(H+λ).
func (gr *boostGrower) leafValue(g, h float64) float64 {
	return -gr.cfg.rate * g / (h + gr.cfg.l2)
}

// split applies parent's best split: it partitions the parent's rows,
// builds the smaller child's histogram, derives the larger one's by
// subtraction and finds both children's best splits. A child is terminal
// when it can never be split: the tree is full after this split (final),
// or the child reaches maxDepth or has fewer than 2·minRows rows. When both
// children are terminal, the rows are not moved at all: their leaf values
// are added to z in place.
func (gr *boostGrower) split(tree *boostTree, parent *boostLeaf, final bool) (left, right boostLeaf) {
	s := parent.split
	lid := int32(len(tree.nodes))
	tree.nodes[parent.node] = boostNode{
		thr: gr.binning.edges[s.feat][s.bin], feat: int32(s.feat), left: lid, bin: uint8(s.bin),
	}
	tree.nodes = append(tree.nodes, boostNode{}, boostNode{})

	depth := parent.depth + 1
	nr := parent.end - parent.start - s.nl
	terminal := func(rows int) bool {
		return final || depth >= gr.cfg.maxDepth || rows < 2*gr.cfg.minRows
	}
	gl, hl := s.gl, s.hl
	gR, hR := parent.g-s.gl, parent.h-s.hl
	if terminal(s.nl) && terminal(nr) {
		gr.applySplit(parent.start, parent.end, s.feat, uint8(s.bin), gr.leafValue(gl, hl), gr.leafValue(gR, hR))
		gr.release(parent)
		left = boostLeaf{node: lid, g: gl, h: hl, depth: depth, applied: true}
		right = boostLeaf{node: lid + 1, g: gR, h: hR, depth: depth, applied: true}
		return left, right
	}

	mid := gr.partition(parent.start, parent.end, s.feat, uint8(s.bin))
	left = boostLeaf{node: lid, start: parent.start, end: mid, g: gl, h: hl, depth: depth}
	right = boostLeaf{node: lid + 1, start: mid, end: parent.end, g: gR, h: hR, depth: depth}

	small, large := &left, &right
	if right.end-right.start < left.end-left.start {
		small, large = large, small
	}
	small.hist = gr.newHist()
	gr.buildHist(small.hist, small.start, small.end)
	large.hist = parent.hist
	parent.hist = nil
	for i := range large.hist {
		large.hist[i].g -= small.hist[i].g
		large.hist[i].h -= small.hist[i].h
		large.hist[i].n -= small.hist[i].n
	}
	for _, c := range []*boostLeaf{&left, &right} {
		if !terminal(c.end - c.start) {
			c.split = gr.bestSplit(c)
		}
		if c.split.gain <= 0 {
			gr.release(c)
		}
	}
	return left, right
}

// applySplit adds vl to z at positions start … end−1 whose bin of feature f
// is ≤ t and vr to the others (multiplies their odds by e^vl or e^vr).
func (gr *boostGrower) applySplit(start, end, f int, t uint8, vl, vr float64) {
	el, er := math.Exp(vl), math.Exp(vr)
	recs, odds := gr.recs[start:end], gr.odds
	for i, r := range recs {
		e := er
		if gr.binOf(start+i, f) <= t {
			e = el
		}
		odds[r.row] = boostClampOdds(odds[r.row] * e)
	}
}

// binOf returns the bin of feature f at position i.
func (gr *boostGrower) binOf(i, f int) uint8 {
	if f < 8 {
		return uint8(gr.recs[i].bins >> (8 * f))
	}
	return uint8(gr.hi[i*(gr.words-1)+f>>3-1] >> (8 * (f & 7)))
}

// partition reorders positions start … end−1 stably so that rows whose bin of
// feature f is ≤ t come first, and returns the first position of the others.
// Left rows are compacted in place (the write position never passes the
// read position) and right rows are staged in the tmp arrays; the loop is
// branch-free.
func (gr *boostGrower) partition(start, end, f int, t uint8) int {
	recs, tmp := gr.recs, gr.tmp
	nl, nr := start, 0
	if gr.words == 1 {
		shift := uint(8 * f)
		for i := start; i < end; i++ {
			r := recs[i]
			recs[nl] = r
			tmp[nr] = r
			c := 0
			if uint8(r.bins>>shift) <= t {
				c = 1
			}
			nl += c
			nr += 1 - c
		}
	} else {
		H := gr.words - 1
		hi, tmpHi := gr.hi, gr.tmpHi
		for i := start; i < end; i++ {
			c := 0
			if gr.binOf(i, f) <= t {
				c = 1
			}
			r := recs[i]
			copy(tmpHi[nr*H:nr*H+H], hi[i*H:i*H+H])
			copy(hi[nl*H:nl*H+H], tmpHi[nr*H:nr*H+H])
			recs[nl] = r
			tmp[nr] = r
			nl += c
			nr += 1 - c
		}
		copy(hi[nl*H:end*H], tmpHi[:nr*H])
	}
	copy(recs[nl:end], tmp[:nr])
	return nl
}

// bestSplit scans every feature's histogram for the split with the largest
// positive gain that leaves at least minRows rows and minHessian hessian on
// each side. Ties keep the lowest feature, then the lowest bin. A zero gain
// means the node stays a leaf.
func (gr *boostGrower) bestSplit(lf *boostLeaf) boostSplit {
	var best boostSplit
	cfg := gr.cfg
	n := lf.end - lf.start
	if lf.depth >= cfg.maxDepth || n < 2*cfg.minRows {
		return best
	}
	l2 := cfg.l2
	parentScore := lf.g * lf.g / (lf.h + l2)
	offs := gr.binning.offsets
	for f := range gr.p {
		hist := lf.hist[offs[f]:offs[f+1]]
		var gl, hl float64
		nl := 0
		for b := 0; b < len(hist)-1; b++ {
			gl += hist[b].g
			hl += hist[b].h
			nl += hist[b].n
			if nl < cfg.minRows || hl < cfg.minHessian {
				continue
			}
			if n-nl < cfg.minRows {
				break
			}
			gr, hr := lf.g-gl, lf.h-hl
			if hr < cfg.minHessian {
				break
			}
			gain := gl*gl/(hl+l2) + gr*gr/(hr+l2) - parentScore
			if gain > best.gain {
				best = boostSplit{gain: gain, feat: f, bin: b, gl: gl, hl: hl, nl: nl}
			}
		}
	}
	return best
}

// buildHist fills dst with the histogram of positions start … end−1. Large
// ranges are cut into fixed chunks of boostHistChunk rows built in parallel
// and summed in chunk order.
func (gr *boostGrower) buildHist(dst []boostBin, start, end int) {
	chunks := (end - start + boostHistChunk - 1) / boostHistChunk
	if chunks <= 1 {
		clear(dst)
		gr.accumulate(dst, start, end)
		return
	}
	parts := make([][]boostBin, chunks)
	parts[0] = dst
	for k := 1; k < chunks; k++ {
		parts[k] = gr.newHist()
	}
	workers.For(gr.cfg.threads, chunks, func(_, k int) {
		clear(parts[k])
		lo := start + k*boostHistChunk
		gr.accumulate(parts[k], lo, min(end, lo+boostHistChunk))
	})
	for k := 1; k < chunks; k++ {
		for i, b := range parts[k] {
			dst[i].g += b.g
			dst[i].h += b.h
			dst[i].n += b.n
		}
		gr.free = append(gr.free, parts[k])
	}
}

// accumulate adds the gradients, hessians and counts of positions
// start … end−1 to dst.
func (gr *boostGrower) accumulate(dst []boostBin, start, end int) {
	offs := gr.binning.offsets[:gr.p]
	lo := offs[:min(8, len(offs))]
	recs, gh := gr.recs[start:end], gr.gh
	for _, r := range recs {
		word := r.bins
		e := gh[r.row]
		g, h := float64(e.g), float64(e.h)
		for _, o := range lo {
			e := &dst[o+int(word&0xff)]
			e.g += g
			e.h += h
			e.n++
			word >>= 8
		}
	}
	if gr.words == 1 {
		return
	}
	H := gr.words - 1
	hi := gr.hi[start*H : end*H]
	for i, r := range recs {
		g, h := float64(gh[r.row].g), float64(gh[r.row].h)
		row := hi[i*H : i*H+H]
		for f := 8; f < len(offs); f++ {
			e := &dst[offs[f]+int(uint8(row[f>>3-1]>>(8*(f&7))))]
			e.g += g
			e.h += h
			e.n++
		}
	}
}

func (gr *boostGrower) newHist() []boostBin {
	if k := len(gr.free); k > 0 {
		h := gr.free[k-1]
		gr.free = gr.free[:k-1]
		return h
	}
	return make([]boostBin, gr.binning.offsets[gr.p])
}

func (gr *boostGrower) release(lf *boostLeaf) {
	if lf.hist != nil {
		gr.free = append(gr.free, lf.hist)
		lf.hist = nil
	}
}

// addBinned adds the tree's output for packed binned rows to raw.
func (t *boostTree) addBinned(bins []uint64, words int, raw []float64) {
	nodes := t.nodes
	for i := range raw {
		row := bins[i*words : i*words+words]
		k := int32(0)
		for range t.depth {
			nd := &nodes[k]
			k = nd.left
			if boostBinAt(row, int(nd.feat)) > nd.bin {
				k++
			}
		}
		raw[i] += nodes[k].value
	}
}
