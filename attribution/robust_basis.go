package attribution

import (
	"math"

	"github.com/gapwise/gapwise/attribution/classify"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
)

// regMaxInteract bounds the raw columns of a regression basis whose
// pairwise products enter it; above, the expanded basis has the squares
// only (as classify.Expanded limits its interaction set, by size here
// since the basis is shared by many responses).
const regMaxInteract = 8

// regBasis maps a record's raw columns to the design row of one
// regression step of the robust estimator. Raw column c is clamped to its
// typical range (classify.TypicalRange over all records) and standardised
// over all records, z_c = (clamp(x_c) − m_c)/s_c; columns constant over
// all records are dropped. The linear basis is (1, z_c …); the expanded
// basis adds z_c² for every non-binary column and z_c·z_e for every pair
// (when at most regMaxInteract columns are active), each standardised
// again over all records and dropped when constant (e.g. the product of
// two one-hot codes of one node). The linear terms come first, so the
// linear design is a leading block of the expanded one and the two
// learners share one Gram matrix. The scaling uses the features only,
// never a response, so sharing it between folds leaks nothing.
type regBasis struct {
	cols       []int // raw columns of the learner features
	lo, hi     []float64
	mean, sd   []float64 // per active raw column
	active     []int     // indices into cols
	terms      [][2]int  // expanded terms as indices into active: (a, a) a square, (a, e) a product
	tmean, tsd []float64
	nLin, d    int // columns of the linear and the expanded design, intercept included
}

// newRegBasis builds the basis of the raw columns cols of x.
func newRegBasis(x *mat.Dense, cols []int) *regBasis {
	n, _ := x.Dims()
	b := &regBasis{cols: cols}
	raw := x.RawMatrix()
	colv := make([]float64, n)
	z := make([][]float64, 0, len(cols))
	var binary []bool
	for a, c := range cols {
		for i := 0; i < n; i++ {
			colv[i] = raw.Data[i*raw.Stride+c]
		}
		lo, hi := classify.TypicalRange(colv, nil)
		b.lo, b.hi = append(b.lo, lo), append(b.hi, hi)
		for i := range colv {
			colv[i] = min(max(colv[i], lo), hi)
		}
		m, s, two := meanSD(colv)
		if s == 0 {
			continue
		}
		b.active = append(b.active, a)
		b.mean, b.sd = append(b.mean, m), append(b.sd, s)
		zc := make([]float64, n)
		for i, v := range colv {
			zc[i] = (v - m) / s
		}
		z = append(z, zc)
		binary = append(binary, two)
	}
	b.nLin = 1 + len(b.active)
	var cand [][2]int
	for a := range b.active {
		if !binary[a] {
			cand = append(cand, [2]int{a, a})
		}
	}
	if len(b.active) <= regMaxInteract {
		for a := range b.active {
			for e := a + 1; e < len(b.active); e++ {
				cand = append(cand, [2]int{a, e})
			}
		}
	}
	for _, t := range cand {
		for i := range colv {
			colv[i] = z[t[0]][i] * z[t[1]][i]
		}
		m, s, _ := meanSD(colv)
		if s < 1e-9 {
			continue
		}
		b.terms = append(b.terms, t)
		b.tmean, b.tsd = append(b.tmean, m), append(b.tsd, s)
	}
	b.d = b.nLin + len(b.terms)
	return b
}

// row writes the expanded design row of record i of x into dst (length
// b.d) and uses zbuf (length len(b.active)) as scratch.
func (b *regBasis) row(raw blas64.General, i int, zbuf, dst []float64) {
	dst[0] = 1
	base := raw.Data[i*raw.Stride:]
	for a, ai := range b.active {
		v := min(max(base[b.cols[ai]], b.lo[ai]), b.hi[ai])
		zbuf[a] = (v - b.mean[a]) / b.sd[a]
		dst[1+a] = zbuf[a]
	}
	for k, t := range b.terms {
		dst[b.nLin+k] = (zbuf[t[0]]*zbuf[t[1]] - b.tmean[k]) / b.tsd[k]
	}
}

// meanSD returns the mean and population standard deviation of v and
// whether it takes at most two distinct values.
func meanSD(v []float64) (mean, sd float64, two bool) {
	if len(v) == 0 {
		return 0, 0, true
	}
	for _, x := range v {
		mean += x
	}
	mean /= float64(len(v))
	var ss float64
	a, bb, k := 0.0, 0.0, 0
	for _, x := range v {
		ss += (x - mean) * (x - mean)
		switch {
		case k > 0 && x == a, k > 1 && x == bb:
		case k == 0:
			a, k = x, 1
		case k == 1:
			bb, k = x, 2
		default:
			k = 3
		}
	}
	return mean, math.Sqrt(ss / float64(len(v))), k <= 2
}
