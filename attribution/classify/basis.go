package classify

import (
	"fmt"
	"math"
	"sort"

	"github.com/gapwise/gapwise/internal/workers"
	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// Term is one column of a logistic design, built from the standardised raw
// columns z_I, z_J of the feature matrix:
//
//	J < 0:   z_I        (the original column)
//	J == I:  z_I²       (its square)
//	J > I:   z_I · z_J  (a pairwise product)
//
// Every term is then standardised again on the training rows (see Expanded).
type Term struct{ I, J int }

// String renders the term with raw column indices, e.g. "x3", "x3^2", "x3*x5".
func (t Term) String() string {
	switch {
	case t.J < 0:
		return fmt.Sprintf("x%d", t.I)
	case t.J == t.I:
		return fmt.Sprintf("x%d^2", t.I)
	default:
		return fmt.Sprintf("x%d*x%d", t.I, t.J)
	}
}

// columnScale is the weighted location and scale of one column (over all
// rows, weights w_i, nil meaning 1):
//
//	mean = Σ w_i x_i / Σ w_i,   sd = sqrt(Σ w_i (x_i − mean)² / Σ w_i)
//
// (population variance, no degrees-of-freedom correction). A column whose
// values are all equal over the rows with w_i > 0 is constant; it carries no
// information and is left out of the design.
type columnScale struct {
	mean, sd float64
	constant bool
	binary   bool // two distinct values over the rows with w_i > 0
	// lo and hi bound the column's typical range (TypicalRange); values
	// outside are moved to the nearer bound before standardising, in
	// fitting and in prediction alike. pre is the exact power-of-two
	// factor applied next (magnitudeFactor; 1 for ordinary columns), so
	// that z = (pre·clamp(x) − mean)/sd.
	lo, hi, pre float64
}

// design is a term-major design matrix: column k occupies
// cols[k*n : (k+1)*n]. Column 0 is the intercept (all ones).
type design struct {
	n, d int
	cols []float64
}

func (z *design) col(k int) []float64 { return z.cols[k*z.n : (k+1)*z.n] }

// basis maps raw feature rows to the standardised design of a fitted model.
//
// Raw column c (for c in raw) becomes
// z_c = (pre·clamp(x_c, lo, hi) − raw[c].mean)/raw[c].sd, with the column's
// typical range [lo, hi] (TypicalRange) and magnitude factor pre.
// Each term t is built from those and, when termScale is non-nil,
// standardised again: (t − termScale[k].mean)/termScale[k].sd.
type basis struct {
	p         int           // raw column count the model expects
	raw       []columnScale // per raw column
	terms     []Term
	termScale []columnScale // nil for the linear basis
}

// rawDesign builds the linear design of x: the intercept column and the
// standardised non-constant raw columns, in column order, each first
// clamped to its typical range (TypicalRange) and, when huge, rescaled by
// an exact power of two (magnitudeFactor). It returns the
// design, the scales of all p raw columns (see columnScale), and the
// indices of the non-constant ("active") columns. Work is spread over up
// to threads goroutines (0 means GOMAXPROCS).
func rawDesign(x *mat.Dense, w []float64, sw float64, threads int) (*design, []columnScale, []int) {
	n, p := x.Dims()
	rm := x.RawMatrix()
	cols := make([]float64, (1+p)*n)
	// Transpose in row blocks (each block writes its own rows of every
	// column), then scale each column on its own.
	logisticBlocks(threads, n, func(_, lo, hi int) {
		for i := lo; i < hi; i++ {
			for c, v := range rm.Data[i*rm.Stride : i*rm.Stride+p] {
				cols[(1+c)*n+i] = v
			}
		}
	})
	scales := make([]columnScale, p)
	workers.For(threads, p, func(_, c int) {
		col := cols[(1+c)*n : (2+c)*n]
		binary := twoValued(col, w)
		lo, hi := TypicalRange(col, w)
		clampInPlace(col, lo, hi)
		pre := magnitudeFactor(col)
		if pre != 1 {
			floats.Scale(pre, col)
		}
		scales[c] = standardiseInPlace(col, w, sw)
		scales[c].binary = binary && !scales[c].constant
		scales[c].lo, scales[c].hi, scales[c].pre = lo, hi, pre
	})
	var active []int
	for c := 0; c < p; c++ {
		if scales[c].constant {
			continue
		}
		if a := 1 + len(active); a != 1+c {
			copy(cols[a*n:(a+1)*n], cols[(1+c)*n:(2+c)*n])
		}
		active = append(active, c)
	}
	z := &design{n: n, d: 1 + len(active), cols: cols[:(1+len(active))*n]}
	ones := z.col(0)
	for i := range ones {
		ones[i] = 1
	}
	return z, scales, active
}

// twoValued reports whether v takes at most two distinct values over the
// rows with positive weight (w nil means all 1).
func twoValued(v, w []float64) bool {
	var a, b float64
	k := 0
	for i, x := range v {
		if w != nil && w[i] == 0 {
			continue
		}
		switch {
		case k > 0 && x == a, k > 1 && x == b:
		case k == 0:
			a, k = x, 1
		case k == 1:
			b, k = x, 2
		default:
			return false
		}
	}
	return true
}

// interactionSet returns the raw columns whose squares and pairwise
// products enter the expanded basis: all active columns when there are at
// most k of them, otherwise the k with the largest |Σ_i w_i z_ic y_i|
// (which, as z_c has weighted mean 0 and sd 1, ranks the weighted
// correlation of z_c with y), ties broken by lower column index, returned
// in ascending column order.
func interactionSet(z *design, active []int, y, w []float64, k int) []int {
	if len(active) <= k {
		return active
	}
	wy := y
	if w != nil {
		wy = make([]float64, len(y))
		floats.MulTo(wy, w, y)
	}
	score := make([]float64, len(active))
	for a := range active {
		score[a] = math.Abs(floats.Dot(z.col(1+a), wy))
	}
	order := make([]int, len(active))
	for a := range order {
		order[a] = a
	}
	sort.SliceStable(order, func(i, j int) bool { return score[order[i]] > score[order[j]] })
	keep := order[:k]
	sort.Ints(keep)
	out := make([]int, k)
	for i, a := range keep {
		out[i] = active[a]
	}
	return out
}

// expandTerms lists the expanded terms in design order: originals of the
// active columns, then squares of the non-binary columns of the interaction
// set, then products z_I·z_J (I < J) within the interaction set in
// lexicographic order.
func expandTerms(raw []columnScale, active, inter []int) []Term {
	terms := make([]Term, 0, len(active)+len(inter)*(len(inter)+1)/2)
	for _, c := range active {
		terms = append(terms, Term{c, -1})
	}
	for _, c := range inter {
		if !raw[c].binary {
			terms = append(terms, Term{c, c})
		}
	}
	for a, c := range inter {
		for _, e := range inter[a+1:] {
			terms = append(terms, Term{c, e})
		}
	}
	return terms
}

// allFourCells reports whether the two-valued columns a and b take all four
// value combinations over the rows with positive weight. If they do not, the
// product a·b coincides on those rows with an affine function of a and b
// (at most three points of a 2×2 grid, which an affine function can
// interpolate), so the product term would only duplicate the originals;
// e.g. two one-hot codes of one variable never both equal 1.
func allFourCells(a, b, w []float64) bool {
	var cells [4][2]float64
	k := 0
	for i := range a {
		if w != nil && w[i] == 0 {
			continue
		}
		seen := false
		for _, c := range cells[:k] {
			if c[0] == a[i] && c[1] == b[i] {
				seen = true
				break
			}
		}
		if !seen {
			cells[k] = [2]float64{a[i], b[i]}
			if k++; k == 4 {
				return true
			}
		}
	}
	return false
}

// expandDesign turns the linear design lin (intercept + active columns, in
// the order of active) into the design of terms, re-standardising each term
// on the training weights. Products of two binary columns that do not take
// all four value combinations, and terms constant on the weighted rows, are
// dropped; the kept terms and their scales are returned with the design.
// Terms are built on up to threads goroutines (0 means GOMAXPROCS).
func expandDesign(lin *design, raw []columnScale, active []int, terms []Term, w []float64, sw float64, threads int) (*design, []Term, []columnScale) {
	n := lin.n
	pos := make(map[int]int, len(active)) // raw column → design column
	for a, c := range active {
		pos[c] = 1 + a
	}
	z := &design{n: n, cols: make([]float64, (1+len(terms))*n)}
	copy(z.col(0), lin.col(0))
	scales := make([]columnScale, len(terms))
	// Terms are independent: build them in parallel, each into its own
	// slot (k+1); no floating-point result depends on the scheduling.
	workers.For(threads, len(terms), func(_, k int) {
		t := terms[k]
		a, buf := lin.col(pos[t.I]), z.col(k+1)
		if t.J > t.I && raw[t.I].binary && raw[t.J].binary && !allFourCells(a, lin.col(pos[t.J]), w) {
			scales[k].constant = true
			return
		}
		if t.J < 0 {
			copy(buf, a)
		} else {
			b := lin.col(pos[t.J])
			for i := range buf {
				buf[i] = a[i] * b[i]
			}
		}
		scales[k] = standardiseInPlace(buf, w, sw)
	})
	// Compact: drop the terms marked constant, keeping the order.
	var kept []Term
	var keptScales []columnScale
	d := 1
	for k, t := range terms {
		if scales[k].constant {
			continue
		}
		if d != k+1 {
			copy(z.col(d), z.col(k+1))
		}
		kept = append(kept, t)
		keptScales = append(keptScales, scales[k])
		d++
	}
	z.d = d
	z.cols = z.cols[:d*n]
	return z, kept, keptScales
}

// standardiseInPlace replaces v by (v − mean)·(1/sd) with the weighted
// mean and population sd of columnScale, and returns them. A column
// constant over the rows with positive weight is left as is and reported
// constant (binary is not set here).
func standardiseInPlace(v, w []float64, sw float64) columnScale {
	var s columnScale
	ref, found, varying := 0.0, false, false
	for i, x := range v {
		if w != nil && w[i] == 0 {
			continue
		}
		if !found {
			ref, found = x, true
		} else if x != ref {
			varying = true
			break
		}
	}
	if !varying {
		return columnScale{mean: ref, sd: 1, constant: true}
	}
	if w == nil {
		s.mean = floats.Sum(v) / sw
	} else {
		s.mean = floats.Dot(v, w) / sw
	}
	floats.AddConst(-s.mean, v)
	var ss float64
	if w == nil {
		ss = floats.Dot(v, v)
	} else {
		for i, x := range v {
			ss += w[i] * x * x
		}
	}
	s.sd = math.Sqrt(ss / sw)
	floats.Scale(1/s.sd, v)
	return s
}

// rowTerms evaluates the design row (without the intercept) for the raw
// row x into dst, using zbuf (length p) as scratch for standardised values.
func (b *basis) rowTerms(x, zbuf, dst []float64) {
	for c, s := range b.raw {
		zbuf[c] = (s.pre*min(max(x[c], s.lo), s.hi) - s.mean) / s.sd
	}
	for k, t := range b.terms {
		v := zbuf[t.I]
		if t.J >= 0 {
			v *= zbuf[t.J]
		}
		if b.termScale != nil {
			v = (v - b.termScale[k].mean) / b.termScale[k].sd
		}
		dst[k] = v
	}
}
