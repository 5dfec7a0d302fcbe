package classify

import (
	"math"
	"slices"

	"github.com/gapwise/gapwise/internal/rank"

	"gonum.org/v1/gonum/mat"
)

// boostStart is the fitted start of a Boosted model: the Start learner's
// model, whose log-odds the trees add to, and the bounds [lo, hi] its
// log-odds are clamped to, in fitting and prediction alike.
type boostStart struct {
	model  Model
	lo, hi float64
}

// logOdds writes the start's clamped log-odds for the rows of x into dst.
func (s *boostStart) logOdds(x *mat.Dense, dst []float64) {
	s.model.LogOdds(x, dst)
	clampInPlace(dst, s.lo, s.hi)
}

// fitStart fits b.Start on the training rows (targets y, weights wn) and
// returns it with its log-odds on the training and validation rows. The
// bounds are order statistics of the training log-odds: lo is the
// (k+1)-th smallest and hi the (k+1)-th largest, k = MinLeafRows, so that,
// as no tree leaf gives fewer than MinLeafRows rows a value of their own,
// no fewer than that share the start's most extreme values; a single
// extreme input, where a logistic fit on squares and products
// extrapolates, thus cannot carry an odds of its own. It returns a nil
// start (the trees then start from the log prior odds base) when b.Start
// is nil, its fit fails, or its validation log loss is above that of the
// constant base.
func (b Boosted) fitStart(x *mat.Dense, y, wn []float64, train, valid []int32, base float64, seed uint64, threads int) (start *boostStart, zt, zv []float64) {
	if b.Start == nil {
		return nil, nil, nil
	}
	learner := b.Start
	if t, ok := learner.(Threaded); ok {
		learner = t.WithThreads(threads)
	}
	xt := boostRows(x, train)
	m, err := learner.Fit(xt, boostGather(y, train), boostGather(wn, train), seed)
	if err != nil {
		return nil, nil, nil
	}
	zt = make([]float64, len(train))
	m.LogOdds(xt, zt)
	start = &boostStart{model: m, lo: math.Inf(-1), hi: math.Inf(1)}
	if k := b.MinLeafRows; len(zt) > 2*k {
		v := slices.Clone(zt)
		if finite(v) {
			// Two selections instead of a sort (rank.SelectKth): the second
			// works on the values at or above the first.
			start.lo = rank.SelectKth(v, k)
			start.hi = rank.SelectKth(v[k:], len(v)-1-2*k)
		} else {
			slices.Sort(v)
			start.lo, start.hi = v[k], v[len(v)-1-k]
		}
	}
	clampInPlace(zt, start.lo, start.hi)
	if len(valid) == 0 {
		return start, zt, nil
	}
	zv = make([]float64, len(valid))
	start.logOdds(boostRows(x, valid), zv)
	yv, wv := boostGather(y, valid), boostGather(wn, valid)
	constant := make([]float64, len(valid))
	for i := range constant {
		constant[i] = base
	}
	if boostLogLoss(zv, yv, wv) > boostLogLoss(constant, yv, wv) {
		return nil, nil, nil
	}
	return start, zt, zv
}

// boostRows copies the given rows of x.
func boostRows(x *mat.Dense, rows []int32) *mat.Dense {
	_, p := x.Dims()
	if len(rows) == 0 {
		return &mat.Dense{}
	}
	out := mat.NewDense(len(rows), p, nil)
	for i, r := range rows {
		copy(out.RawRowView(i), x.RawRowView(int(r)))
	}
	return out
}
