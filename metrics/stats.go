package metrics

import (
	"fmt"
	"math"
)

// Stats holds weighted sufficient statistics from which every metric except
// AUC is an exact function. Records fall into cells indexed by
// (score bin b, label y, decision d): cell = (b*2+y)*2+d, where
// b = min(⌊score·Bins⌋, Bins−1) (equal-width bins on [0, 1], used by ECE),
// y ∈ {0, 1} and d = 1 when score ≥ threshold. Per cell it keeps
//
//	W   = Σ w          WS  = Σ w·s
//	WS2 = Σ w·s²       WL  = Σ w·ℓ(y, s)
//
// where ℓ is the log-loss term of LogLossTerm. Because each of these is a
// linear function of the weights, the statistics of a reweighted sample are
// matrix products, which is what the attribution engine exploits.
type Stats struct {
	Bins int
	W    []float64
	WS   []float64
	WS2  []float64
	WL   []float64
}

// NewStats returns zeroed statistics with the given number of score bins
// (use 1 when ECE is not needed). It panics if bins < 1.
func NewStats(bins int) *Stats {
	if bins < 1 {
		panic("metrics: NewStats needs bins >= 1")
	}
	n := CellCount(bins)
	return &Stats{Bins: bins, W: make([]float64, n), WS: make([]float64, n), WS2: make([]float64, n), WL: make([]float64, n)}
}

// CellCount is the number of cells for the given number of bins.
func CellCount(bins int) int { return bins * 4 }

// Cell returns the cell index of a record; label must be 0 or 1.
func Cell(label, score, threshold float64, bins int) int {
	b := int(score * float64(bins))
	if b >= bins {
		b = bins - 1
	}
	if b < 0 {
		b = 0
	}
	y := 0
	if label == 1 {
		y = 1
	}
	d := 0
	if score >= threshold {
		d = 1
	}
	return (b*2+y)*2 + d
}

// LogLossEps bounds scores away from 0 and 1 in the log loss. It is the
// default clip of scikit-learn's log_loss before version 1.2, which changed
// the default to the machine epsilon of the score type (per the log_loss
// docstring of the installed scikit-learn 1.2.1); the fixture script passes
// eps=1e-15 explicitly.
const LogLossEps = 1e-15

// LogLossTerm is −[y·log s + (1−y)·log(1−s)] with s clipped to
// [LogLossEps, 1−LogLossEps].
func LogLossTerm(label, score float64) float64 {
	s := math.Min(math.Max(score, LogLossEps), 1-LogLossEps)
	if label == 1 {
		return -math.Log(s)
	}
	return -math.Log1p(-s)
}

// Add accumulates one record with weight w.
func (st *Stats) Add(label, score, threshold, w float64) {
	c := Cell(label, score, threshold, st.Bins)
	st.W[c] += w
	st.WS[c] += w * score
	st.WS2[c] += w * score * score
	st.WL[c] += w * LogLossTerm(label, score)
}

// Confusion returns the weighted confusion counts (TP, FP, TN, FN).
func (st *Stats) Confusion() (tp, fp, tn, fn float64) {
	for b := 0; b < st.Bins; b++ {
		base := b * 4
		tn += st.W[base+0] // y=0, d=0
		fp += st.W[base+1] // y=0, d=1
		fn += st.W[base+2] // y=1, d=0
		tp += st.W[base+3] // y=1, d=1
	}
	return
}

func ratio(name string, num, den float64, what string) (float64, error) {
	if !(den > 0) {
		return math.NaN(), fmt.Errorf("%w: %s needs %s (weighted count is 0)", ErrUndefined, name, what)
	}
	return num / den, nil
}

// Value returns the named metric computed from the statistics: a threshold
// metric from the confusion counts (Confusion.Rate), the others from the
// per-cell sums. ECE uses st.Bins bins. AUC cannot be computed from Stats
// and returns an error, as does an unknown name; a metric with a zero
// denominator returns an error wrapping ErrUndefined.
func (st *Stats) Value(name string) (float64, error) {
	tp, fp, tn, fn := st.Confusion()
	total := tp + fp + tn + fn
	switch name {
	case NameBrier:
		// (s−y)² = s² − 2ys + y
		var sum float64
		for c := range st.W {
			y := float64((c >> 1) & 1)
			sum += st.WS2[c] - 2*y*st.WS[c] + y*st.W[c]
		}
		return ratio(name, sum, total, "records")
	case NameLogLoss:
		var sum float64
		for _, v := range st.WL {
			sum += v
		}
		return ratio(name, sum, total, "records")
	case NameCalibrationInTheLarge:
		var sum float64
		for c := range st.W {
			y := float64((c >> 1) & 1)
			sum += st.WS[c] - y*st.W[c]
		}
		return ratio(name, sum, total, "records")
	case NameECE:
		var sum float64
		for b := 0; b < st.Bins; b++ {
			var d float64
			for j := 0; j < 4; j++ {
				c := b*4 + j
				y := float64((c >> 1) & 1)
				d += st.WS[c] - y*st.W[c]
			}
			sum += math.Abs(d)
		}
		return ratio(name, sum, total, "records")
	case NameAUC:
		return math.NaN(), fmt.Errorf("metrics: auc cannot be computed from Stats; use AUC on the records")
	}
	if IsThreshold(name) {
		return Confusion{TP: tp, FP: fp, TN: tn, FN: fn}.Rate(name)
	}
	return math.NaN(), fmt.Errorf("metrics: unknown metric %q", name)
}
