package attribution

import (
	"math"
	"math/bits"

	"github.com/gapwise/gapwise/internal/workers"
	"github.com/gapwise/gapwise/metrics"
)

// aucSegment is the number of coalitions walked in Gray-code order from one
// freshly computed starting point. Segments are fixed by the coalition
// index, not by the number of workers, so results are reproducible.
const aucSegment = 64

// evaluateAUCAll writes the weighted AUC of every coalition into dst.
// AUC is not linear in the weights, so each coalition costs O(n) on records
// sorted once (metrics.AUCSorter). Within a segment of aucSegment coalitions
// s0 | gray(t), gray(t) = t XOR t>>1, consecutive coalitions differ by one
// mechanism, so the per-record log-weight L(S) = Σ_{i∈S} log r_i changes by
// one addition or subtraction; the weights exp(L − max L) are scaled so the
// largest is 1 (AUC is invariant to a common factor).
func evaluateAUCAll(in *engineInput, dst []float64) error {
	k := len(in.logr)
	n := len(in.labels)
	sorter := metrics.NewAUCSorter(in.labels, in.scores)
	total := 1 << k
	seg := min(aucSegment, total)
	segBits := bits.TrailingZeros(uint(seg))
	type scratch struct{ l, w []float64 }
	sc := make([]scratch, in.workers)
	for i := range sc {
		sc[i] = scratch{make([]float64, n), make([]float64, n)}
	}
	errs := make([]error, total/seg)
	workers.For(in.workers, total/seg, func(worker, g int) {
		l, w := sc[worker].l, sc[worker].w
		s0 := uint64(g) << segBits
		clear(l)
		for i := 0; i < k; i++ {
			if s0&(1<<i) != 0 {
				for r, x := range in.logr[i] {
					l[r] += x
				}
			}
		}
		prev := uint64(0)
		for t := 0; t < seg; t++ {
			gray := uint64(t ^ t>>1)
			if t > 0 {
				i := bits.TrailingZeros64(gray ^ prev)
				sign := 1.0
				if gray&(1<<i) == 0 {
					sign = -1
				}
				for r, x := range in.logr[i] {
					l[r] += sign * x
				}
			}
			prev = gray
			S := s0 | gray
			top := math.Inf(-1)
			for _, x := range l {
				top = math.Max(top, x)
			}
			for r, x := range l {
				w[r] = math.Exp(x - top)
			}
			v, err := sorter.Value(w)
			if err != nil {
				errs[g] = &CoalitionError{Metric: metrics.NameAUC, Coalition: S, Err: err}
				return
			}
			dst[S] = v
		}
	})
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}
