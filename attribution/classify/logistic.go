package classify

import (
	"errors"
	"fmt"
	"math"

	"github.com/gapwise/gapwise/internal/workers"
	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// Errors returned by the logistic learners; test with errors.Is.
var (
	// ErrSingleClass: the rows with positive weight all have the same target.
	ErrSingleClass = errors.New("all rows with positive weight have the same target")
	// ErrBadInput: a target, weight or feature value is out of its domain.
	ErrBadInput = errors.New("invalid input value")
)

// DefaultLambda is the default L2 penalty of the logistic learners, the same
// as scikit-learn's default C = 1 (λ = 1/C).
const DefaultLambda = 1.0

// DefaultMaxInteract is the default size of the interaction set of Expanded.
const DefaultMaxInteract = 8

// Linear is L2-penalised logistic regression on standardised features.
//
// Each raw column c is standardised on the training rows with weighted mean
// and population standard deviation, z_c = (x_c − m_c)/s_c; a column that is
// constant over the rows with positive weight is dropped. The fit minimises
//
//	L(β₀, β) = Σ_i w_i ℓ(y_i, β₀ + z_iᵀβ) + (λ/2) ‖β‖²,
//	ℓ(y, η) = log(1 + e^η) − y η,
//
// with the intercept β₀ unpenalised. This has the same minimiser as
// scikit-learn's LogisticRegression(penalty="l2", C=1/λ) fitted with
// sample_weight=w on the standardised columns, whose objective is
// C Σ_i w_i ℓ_i + ½‖β‖². Because the loss is a sum, not a mean, the penalty
// weighs less as the (weighted) row count grows; scaling all weights by a
// factor a is the same as dividing λ by a.
//
// The minimiser is found with Newton's method (analytic gradient and
// Hessian, a line search on the directional derivative only, so that no
// logarithm is taken; see newtonMinimise) from β₀ = logit(ȳ_w), β = 0, and
// stops when ‖∇L‖_∞ < 1e-9·Σ_i w_i. On large or wide inputs a subsample
// warm start and a reused or subsampled Hessian save work; the gradient
// and the stopping test are always exact. Work is split over goroutines in
// fixed row blocks reduced in a fixed order, so the result does not depend
// on GOMAXPROCS. Under perfect separation λ > 0 keeps
// the minimiser finite. With λ = 0 separable data have no minimiser: the
// gradient decays as the coefficients grow, and the iteration stops at
// arbitrarily large ones (hundreds, on standardised columns); use λ > 0.
type Linear struct {
	// Lambda is the L2 penalty λ ≥ 0 on the coefficients of the
	// standardised columns (scikit-learn's C = 1/λ).
	Lambda float64
	// Threads bounds the goroutines of Fit and of the fitted model's
	// LogOdds; 0 means GOMAXPROCS. Results do not depend on it.
	Threads int
	// Warm, if non-nil, is a model whose coefficients Newton starts from
	// when its terms are those of the new design (see WithWarmStart).
	Warm *LogisticModel
}

// NewLinear returns a Linear learner with λ = DefaultLambda.
func NewLinear() Linear { return Linear{Lambda: DefaultLambda} }

// Name returns "linear".
func (Linear) Name() string { return NameLinear }

// WithThreads returns a copy of l with Threads = n (see Threaded).
func (l Linear) WithThreads(n int) Learner {
	l.Threads = n
	return l
}

// Fit trains on the rows of x with 0/1 targets y and optional non-negative
// weights w (nil means all 1). The seed is unused: the fit is deterministic.
// It panics if len(y) or a non-nil len(w) differs from x.Rows(), and returns
// an error wrapping ErrBadInput (naming the row and column) for a non-finite
// feature, a target other than 0 or 1 or a negative or non-finite weight,
// and ErrSingleClass when both classes do not occur with positive weight.
func (l Linear) Fit(x *mat.Dense, y, w []float64, seed uint64) (Model, error) {
	sw, err := checkLogisticInput("linear", l.Lambda, x, y, w)
	if err != nil {
		return nil, err
	}
	threads := workers.Count(l.Threads)
	z, raw, active := rawDesign(x, w, sw, threads)
	terms := make([]Term, len(active))
	for a, c := range active {
		terms[a] = Term{c, -1}
	}
	b := &basis{p: x.RawMatrix().Cols, raw: raw, terms: terms}
	return fitLogistic("linear", b, z, y, w, sw, l.Lambda, l.Threads, l.Warm)
}

// Expanded is L2-penalised logistic regression on an expanded basis of the
// standardised features: the originals z_c, the squares z_c² and the
// pairwise products z_c·z_e, every expanded column standardised again on
// the training rows before fitting. Objective, penalty and solver are those
// of Linear (the penalty applies to all expanded coefficients alike).
//
// A log density ratio that is quadratic in the features (a shift of the mean
// within a subgroup, a change of spread, a change of correlation) is linear
// in this basis, so the classifier can represent it exactly.
//
// Terms are dropped when they carry nothing new:
//   - columns constant over the rows with positive weight (and so all their
//     squares and products);
//   - squares of binary columns (at most two distinct values, e.g. one-hot
//     codes): z² is then an affine function of z;
//   - products of two binary columns that do not take all four value
//     combinations over the rows with positive weight, e.g. two one-hot codes
//     of one variable: the product is then an affine function of the two;
//   - expanded columns constant over the rows with positive weight.
//
// To bound the cost (the design has 1 + p + q + q(q−1)/2 columns for p
// active columns and an interaction set of q), squares and products are
// formed only within the interaction set: all active columns when p ≤
// MaxInteract, otherwise the MaxInteract columns with the largest weighted
// |Σ_i w_i z_ic y_i|, i.e. the largest marginal correlation with the target,
// ties to the lower column index. With the default MaxInteract = 8 the
// design has at most p + 36 columns besides the intercept.
type Expanded struct {
	// Lambda is the L2 penalty λ ≥ 0 (scikit-learn's C = 1/λ).
	Lambda float64
	// MaxInteract ≥ 1 bounds the interaction set (see the type comment).
	MaxInteract int
	// Threads bounds the goroutines of Fit and of the fitted model's
	// LogOdds; 0 means GOMAXPROCS. Results do not depend on it.
	Threads int
	// Warm, if non-nil, is a model whose coefficients Newton starts from
	// when its terms are those of the new design (see WithWarmStart).
	Warm *LogisticModel
}

// NewExpanded returns an Expanded learner with λ = DefaultLambda and
// MaxInteract = DefaultMaxInteract.
func NewExpanded() Expanded {
	return Expanded{Lambda: DefaultLambda, MaxInteract: DefaultMaxInteract}
}

// Name returns "expanded".
func (Expanded) Name() string { return NameExpanded }

// WithThreads returns a copy of e with Threads = n (see Threaded).
func (e Expanded) WithThreads(n int) Learner {
	e.Threads = n
	return e
}

// Fit trains as Linear.Fit does, on the expanded basis. It also returns an
// error wrapping ErrBadInput when MaxInteract < 1.
func (e Expanded) Fit(x *mat.Dense, y, w []float64, seed uint64) (Model, error) {
	sw, err := checkLogisticInput("expanded", e.Lambda, x, y, w)
	if err != nil {
		return nil, err
	}
	if e.MaxInteract < 1 {
		return nil, fmt.Errorf("classify: expanded: MaxInteract must be ≥ 1, got %d: %w", e.MaxInteract, ErrBadInput)
	}
	threads := workers.Count(e.Threads)
	lin, raw, active := rawDesign(x, w, sw, threads)
	inter := interactionSet(lin, active, y, w, e.MaxInteract)
	z, terms, scales := expandDesign(lin, raw, active, expandTerms(raw, active, inter), w, sw, threads)
	b := &basis{p: x.RawMatrix().Cols, raw: raw, terms: terms, termScale: scales}
	return fitLogistic("expanded", b, z, y, w, sw, e.Lambda, e.Threads, e.Warm)
}

// checkLogisticInput validates the training data and returns Σ w_i.
func checkLogisticInput(name string, lambda float64, x *mat.Dense, y, w []float64) (float64, error) {
	n, p := x.Dims()
	if len(y) != n {
		panic(fmt.Sprintf("classify: %s: len(y) = %d, want %d", name, len(y), n))
	}
	if w != nil && len(w) != n {
		panic(fmt.Sprintf("classify: %s: len(w) = %d, want %d", name, len(w), n))
	}
	if !(lambda >= 0) || math.IsInf(lambda, 1) {
		return 0, fmt.Errorf("classify: %s: Lambda must be finite and ≥ 0, got %v: %w", name, lambda, ErrBadInput)
	}
	if n == 0 {
		return 0, fmt.Errorf("classify: %s: no rows: %w", name, ErrSingleClass)
	}
	raw := x.RawMatrix()
	var sw float64
	var has [2]bool
	for i := 0; i < n; i++ {
		wi := 1.0
		if w != nil {
			wi = w[i]
			if !(wi >= 0) || math.IsInf(wi, 1) {
				return 0, fmt.Errorf("classify: %s: row %d: weight %v is not a finite non-negative number: %w", name, i, wi, ErrBadInput)
			}
		}
		if y[i] != 0 && y[i] != 1 {
			return 0, fmt.Errorf("classify: %s: row %d: target %v is not 0 or 1: %w", name, i, y[i], ErrBadInput)
		}
		// v·0 is 0 for finite v and NaN for ±Inf and NaN: one multiply-add
		// per value; the offending value is located only on failure.
		var nonFinite float64
		for _, v := range raw.Data[i*raw.Stride : i*raw.Stride+p] {
			nonFinite += v * 0
		}
		if nonFinite != 0 {
			for c, v := range raw.Data[i*raw.Stride : i*raw.Stride+p] {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					return 0, fmt.Errorf("classify: %s: row %d, column %d: feature %v is not finite: %w", name, i, c, v, ErrBadInput)
				}
			}
		}
		sw += wi
		if wi > 0 {
			has[int(y[i])] = true
		}
	}
	if !has[0] || !has[1] {
		return 0, fmt.Errorf("classify: %s: %d rows: %w", name, n, ErrSingleClass)
	}
	return sw, nil
}

// fitLogistic minimises the penalised objective of Linear on the design z
// (column 0 the intercept) and wraps the result with its basis.
//
// On large inputs (n ≥ 4·logisticWarmRows) Newton first runs on the
// every-s-th-row subsample (s = ⌊n/logisticWarmRows⌋, penalty λ/s so the
// objective keeps its scale) to a loose tolerance, and the full-data Newton
// iteration starts from there: this saves about half of the full-data
// iterations. For wide designs (≥ lagHessianMinCols columns) the full-data
// iteration also takes its Hessian from that subsample, scaled by s
// (subsampled Newton; Byrd, Chin, Neveitt & Nocedal 2011, "On the use of
// stochastic Hessian information in optimization methods for machine
// learning", cited from memory), as d(d+1)/2 products per row then cost
// more than the extra iterations. Gradients are always
// exact, so the returned minimiser and the stopping test are those of the
// full objective. Row blocks are processed on up to threads goroutines
// (0 means GOMAXPROCS); the fitted model's LogOdds uses as many.
func fitLogistic(name string, b *basis, z *design, y, w []float64, sw, lambda float64, threads int, warm *LogisticModel) (*LogisticModel, error) {
	theta := make([]float64, z.d)
	theta[0] = math.Log(weightedSum(y, w) / (sw - weightedSum(y, w)))
	iters := 0
	var hsub *logisticObjective
	warmed := warm.startFor(b, theta)
	if s := z.n / logisticWarmRows; s >= 4 && !warmed {
		sz, sy, sws := subsampleRows(z, y, w, s)
		ssw := weightedSum(nil, sws)
		if sy1 := weightedSum(sy, sws); sy1 > 0 && sy1 < ssw {
			sub := newLogisticObjective(sz, sy, sws, lambda/float64(s), threads)
			th, it, err := newtonMinimise(sub, theta, logisticWarmTol*ssw)
			iters += it
			if err == nil {
				theta = th
				if z.d >= lagHessianMinCols {
					hsub = sub
					hsub.hscale = float64(s)
				}
			}
		}
	}
	full := newLogisticObjective(z, y, w, lambda, threads)
	full.hsub = hsub
	if hsub != nil {
		full.hscale = hsub.hscale
	}
	theta, it, err := newtonMinimise(full, theta, logisticGradTol*sw)
	iters += it
	if err != nil {
		return nil, fmt.Errorf("classify: %s: %w", name, err)
	}
	return &LogisticModel{
		b:         b,
		intercept: theta[0],
		coef:      append([]float64(nil), theta[1:]...),
		iters:     iters,
		threads:   threads,
	}, nil
}

// weightedSum returns Σ_i w_i v_i; nil v means all 1, nil w means all 1.
func weightedSum(v, w []float64) float64 {
	switch {
	case v == nil && w == nil:
		return 0
	case v == nil:
		return floats.Sum(w)
	case w == nil:
		return floats.Sum(v)
	}
	return floats.Dot(v, w)
}

// subsampleRows returns rows 0, s, 2s, … of the design, targets and weights.
func subsampleRows(z *design, y, w []float64, s int) (*design, []float64, []float64) {
	m := (z.n + s - 1) / s
	sub := &design{n: m, d: z.d, cols: make([]float64, m*z.d)}
	for k := 0; k < z.d; k++ {
		src, dst := z.col(k), sub.col(k)
		for i := range dst {
			dst[i] = src[i*s]
		}
	}
	sy := make([]float64, m)
	sw := make([]float64, m)
	for i := range sy {
		sy[i] = y[i*s]
		sw[i] = 1
		if w != nil {
			sw[i] = w[i*s]
		}
	}
	return sub, sy, sw
}

// Convergence thresholds, relative to Σ w_i: the Newton iteration stops at
// ‖∇L‖_∞ < logisticGradTol·Σw; a result is accepted if ‖∇L‖_∞ <
// logisticGradFloor·Σw (the loss is then within rounding noise of its
// minimum). The warm start on a subsample stops at logisticWarmTol. These
// values are common practice for double-precision Newton solvers.
const (
	logisticGradTol   = 1e-9
	logisticGradFloor = 1e-6
	logisticWarmTol   = 1e-4
	logisticWarmRows  = 16384
	logisticMaxIter   = 100
	logisticMaxEvals  = 300
)

// ErrNoConvergence: the Newton iteration did not reach the gradient
// threshold within its iteration and evaluation limits.
var ErrNoConvergence = errors.New("logistic fit did not converge")

// LogisticModel is a fitted Linear or Expanded classifier:
//
//	logit P(y=1 | x) = β₀ + Σ_k β_k t_k(x),
//
// where t_k is the k-th standardised term (see Term and Terms).
type LogisticModel struct {
	b         *basis
	intercept float64
	coef      []float64
	iters     int
	threads   int // goroutines of LogOdds; 0 means GOMAXPROCS
}

// Intercept returns β₀.
func (m *LogisticModel) Intercept() float64 { return m.intercept }

// Terms returns the design terms in coefficient order.
func (m *LogisticModel) Terms() []Term { return append([]Term(nil), m.b.terms...) }

// Coef returns β_k for every term, on the standardised scale.
func (m *LogisticModel) Coef() []float64 { return append([]float64(nil), m.coef...) }

// Iterations returns the number of Newton iterations the fit took,
// including those of the subsample warm start on large inputs.
func (m *LogisticModel) Iterations() int { return m.iters }

// LogOdds writes β₀ + Σ_k β_k t_k(x_i) for every row x_i of x into dst.
// Non-finite features give non-finite log-odds. It panics if len(dst) !=
// x.Rows() or x has a different column count from the training data.
func (m *LogisticModel) LogOdds(x *mat.Dense, dst []float64) {
	n, p := x.Dims()
	if len(dst) != n {
		panic(fmt.Sprintf("classify: LogOdds: len(dst) = %d, want %d", len(dst), n))
	}
	if p != m.b.p {
		panic(fmt.Sprintf("classify: LogOdds: x has %d columns, model was fitted on %d", p, m.b.p))
	}
	raw := x.RawMatrix()
	logisticBlocks(m.threads, n, func(_, lo, hi int) {
		zbuf := make([]float64, p)
		tbuf := make([]float64, len(m.coef))
		for i := lo; i < hi; i++ {
			m.b.rowTerms(raw.Data[i*raw.Stride:i*raw.Stride+p], zbuf, tbuf)
			dst[i] = m.intercept + floats.Dot(m.coef, tbuf)
		}
	})
}

// logisticBlockRows is the fixed number of rows per block of parallel work.
// Block boundaries, and so every floating-point sum, do not depend on
// GOMAXPROCS; partial results are reduced in block order.
const logisticBlockRows = 8192

// logisticBlocks calls fn(b, lo, hi) for every block b of rows [lo, hi) of
// [0, n), on up to threads goroutines (0 means GOMAXPROCS), and returns
// when all are done.
func logisticBlocks(threads, n int, fn func(b, lo, hi int)) {
	nb := (n + logisticBlockRows - 1) / logisticBlockRows
	workers.For(threads, nb, func(_, b int) {
		fn(b, b*logisticBlockRows, min(n, (b+1)*logisticBlockRows))
	})
}
