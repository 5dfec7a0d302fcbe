package classify

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// LogLossFromLogOdds returns the weighted mean log loss of log-odds z for
// 0/1 targets y:
//
//	Σ_i w_i ℓ(y_i, z_i) / Σ_i w_i,   ℓ(y, z) = log(1 + e^z) − y z,
//
// i.e. −y log p − (1−y) log(1−p) with p = 1/(1+e^{−z}), evaluated as
// max(z, 0) + log1p(e^{−|z|}) − y z so that it stays finite and accurate
// for any finite z. If w is nil, all weights are 1. It returns NaN when
// there are no rows or the weights sum to zero. It panics if the lengths of
// y, logOdds and a non-nil w differ.
func LogLossFromLogOdds(y, logOdds, w []float64) float64 {
	if len(logOdds) != len(y) {
		panic(fmt.Sprintf("classify: LogLossFromLogOdds: len(logOdds) = %d, want %d", len(logOdds), len(y)))
	}
	if w != nil && len(w) != len(y) {
		panic(fmt.Sprintf("classify: LogLossFromLogOdds: len(w) = %d, want %d", len(w), len(y)))
	}
	var s, sw float64
	for i, z := range logOdds {
		wi := 1.0
		if w != nil {
			wi = w[i]
		}
		if wi == 0 {
			continue
		}
		s += wi * (softplus(z) - y[i]*z)
		sw += wi
	}
	if sw == 0 {
		return math.NaN()
	}
	return s / sw
}

// softplus returns log(1 + e^z) without overflow.
func softplus(z float64) float64 {
	return math.Max(z, 0) + math.Log1p(math.Exp(-math.Abs(z)))
}

// logisticObjective is the penalised objective of Linear on a design z
// whose column 0 is the intercept:
//
//	L(θ) = Σ_i w_i ℓ(y_i, η_i) + (λ/2) Σ_{k≥1} θ_k²,   η = Zθ,
//	∇L   = Zᵀr + λ θ̃,        r_i = w_i (p_i − y_i),
//	∇²L  = Zᵀ diag(h) Z + λ Ĩ, h_i = w_i p_i (1 − p_i),
//
// where θ̃ and Ĩ zero the intercept entry. p_i(1−p_i) is computed as
// e^{−|η|}/(1+e^{−|η|})², accurate in both tails. Work is split in fixed row
// blocks (logisticBlocks) and reduced in block order, so results do not
// depend on GOMAXPROCS. The per-row quantities of the last θ are cached,
// because newtonMinimise asks for the gradient and the Hessian at the same
// point in turn. L itself is never evaluated (see newtonMinimise).
//
// Hess recomputes Zᵀdiag(h)Z only while Newton is far from the optimum:
// once a step has cut ‖∇L‖_∞ at least tenfold, the previous data Hessian is
// reused (a Newton iteration with a lagged Hessian; Shamanskii 1967, "A
// modification of Newton's method", cited from memory). Near the optimum
// the Hessian changes by O(‖Δθ‖), so each reused step still contracts the
// gradient by about that factor, while costing only a gradient
// evaluation. The gradient is always exact, so the minimiser and
// the stopping test are unchanged; if a step contracts less than tenfold
// the Hessian is recomputed at the next point. This pays only when the
// d(d+1)/2 products per row of the Hessian outweigh the exp and the d
// products per row of a gradient evaluation, so below lagHessianMinCols design columns
// the Hessian is always recomputed (plain Newton).
type logisticObjective struct {
	z      *design
	y, w   []float64
	lambda float64
	nb     int
	at     []float64 // θ of the cached per-row values
	valid  bool
	eta    []float64
	// etaOld holds η at the previous point evaluated, and moved is
	// max_i |η_i − η_old,i| between the last two points (+Inf at the
	// first); movePart holds its per-block parts.
	etaOld   []float64
	moved    float64
	movePart []float64
	r, h     []float64
	partial  []float64 // per-block Hessian parts, reused
	gpart    []float64 // per-block gradient parts at at
	gnorm    float64   // ‖∇L‖_∞ at at, valid if gvalid
	gvalid   bool
	// lastHess is the data Hessian in use; prevGnorm is ‖∇L‖_∞ at the
	// previous point where the Hessian was requested.
	lastHess  []float64
	prevGnorm float64
	// hsub, if set, supplies the data Hessian from a row subsample,
	// scaled by hscale (see fitLogistic). It is computed once and kept
	// while each step at least halves ‖∇L‖_∞; otherwise Hess falls back
	// to the full data for good.
	hsub    *logisticObjective
	hscale  float64
	threads int // goroutines over row blocks; 0 means GOMAXPROCS
}

func newLogisticObjective(z *design, y, w []float64, lambda float64, threads int) *logisticObjective {
	nb := (z.n + logisticBlockRows - 1) / logisticBlockRows
	d := z.d
	return &logisticObjective{
		z: z, y: y, w: w, lambda: lambda, nb: nb, threads: threads,
		at:       make([]float64, d),
		eta:      make([]float64, z.n),
		etaOld:   make([]float64, z.n),
		moved:    math.Inf(1),
		movePart: make([]float64, nb),
		r:        make([]float64, z.n),
		h:        make([]float64, z.n),
		partial:  make([]float64, nb*d*(d+1)/2),
		gpart:    make([]float64, nb*d),
	}
}

// update computes η, r, h and the per-block gradient parts at θ unless
// they are cached. It does not form the loss: newtonMinimise needs only
// derivatives, so each row costs one exp and no logarithm.
func (o *logisticObjective) update(theta []float64) {
	if o.valid && floats.Equal(o.at, theta) {
		return
	}
	copy(o.at, theta)
	hadPrev := o.valid
	o.valid = true
	o.gvalid = false
	o.eta, o.etaOld = o.etaOld, o.eta
	d := o.z.d
	logisticBlocks(o.threads, o.z.n, func(b, lo, hi int) {
		gp := o.gpart[b*d : (b+1)*d]
		for k := range gp {
			gp[k] = 0
		}
		var moved float64
		// Sub-blocks keep η, r and the d column slices in cache between
		// the pass that forms η and the one that forms the gradient.
		for s := lo; s < hi; s += hessianSubRows {
			e := min(hi, s+hessianSubRows)
			eta := o.eta[s:e]
			for i := range eta {
				eta[i] = theta[0]
			}
			for k := 1; k < d; k++ {
				if theta[k] != 0 {
					floats.AddScaled(eta, theta[k], o.z.col(k)[s:e])
				}
			}
			for i, et := range eta {
				g := s + i
				if dm := et - o.etaOld[g]; dm > moved {
					moved = dm
				} else if -dm > moved {
					moved = -dm
				}
				wi := 1.0
				if o.w != nil {
					wi = o.w[g]
				}
				a := math.Exp(-math.Abs(et))
				p := 1 / (1 + a)
				if et < 0 {
					p = a / (1 + a)
				}
				o.r[g] = wi * (p - o.y[g])
				o.h[g] = wi * a / ((1 + a) * (1 + a))
			}
			r := o.r[s:e]
			for k := 0; k < d; k++ {
				gp[k] += floats.Dot(r, o.z.col(k)[s:e])
			}
		}
		o.movePart[b] = moved
	})
	o.moved = math.Inf(1)
	if hadPrev {
		o.moved = 0
		for _, m := range o.movePart {
			o.moved = max(o.moved, m)
		}
	}
}

// Grad writes ∇L(θ) into grad (its per-block parts are formed by update).
func (o *logisticObjective) Grad(grad, theta []float64) {
	o.update(theta)
	d := o.z.d
	for k := range grad {
		grad[k] = 0
	}
	for b := 0; b < o.nb; b++ {
		floats.Add(grad, o.gpart[b*d:(b+1)*d])
	}
	for k := 1; k < d; k++ {
		grad[k] += o.lambda * theta[k]
	}
	o.gnorm = floats.Norm(grad, math.Inf(1))
	o.gvalid = true
}

// Hess writes ∇²L(θ) into hess; the gradient at θ must have been formed
// (Grad) first, as the lagged-Hessian rule reads its norm.
func (o *logisticObjective) Hess(hess *mat.SymDense, theta []float64) {
	o.update(theta)
	d := o.z.d
	// Reuse the last data Hessian while the previous step still cut the
	// gradient at least tenfold (see the type comment).
	switch {
	case o.lastHess == nil && o.hsub != nil:
		o.hsub.update(theta)
		o.lastHess = o.hsub.dataHessian()
		floats.Scale(o.hscale, o.lastHess)
	case o.hsub != nil && o.gnorm < 0.5*o.prevGnorm:
		// Keep the subsample Hessian: its error is sampling noise, which
		// recomputing on the same rows would not reduce.
	case o.lastHess == nil || d < lagHessianMinCols || !(o.gnorm < 0.1*o.prevGnorm):
		o.hsub = nil
		o.lastHess = o.dataHessian()
	}
	o.prevGnorm = o.gnorm
	tri := o.lastHess
	idx := 0
	for j := 0; j < d; j++ {
		for k := j; k < d; k++ {
			v := tri[idx]
			if j == k && j > 0 {
				v += o.lambda
			}
			hess.SetSym(j, k, v)
			idx++
		}
	}
}

// lagHessianMinCols is the design width from which Hess reuses a lagged
// Hessian (measured with instruction counts on 160k rows: at 7 columns
// recomputing is cheaper, at 28 reusing saves about a fifth of the fit).
const lagHessianMinCols = 12

// hessianSubRows is the row count of the cache-sized sub-blocks of
// dataHessian (d columns × 2048 rows × 8 bytes ≤ 512 KiB for d ≤ 32).
const hessianSubRows = 2048

// dataHessian returns the upper triangle, row by row, of Zᵀdiag(h)Z at the
// cached θ.
func (o *logisticObjective) dataHessian() []float64 {
	d := o.z.d
	tri := d * (d + 1) / 2
	logisticBlocks(o.threads, o.z.n, func(b, lo, hi int) {
		hz := make([]float64, hessianSubRows)
		out := o.partial[b*tri : (b+1)*tri]
		for i := range out {
			out[i] = 0
		}
		// Sub-blocks keep the d columns of a slice of rows in cache while
		// all d(d+1)/2 dot products are formed.
		for s := lo; s < hi; s += hessianSubRows {
			e := min(hi, s+hessianSubRows)
			h, hz := o.h[s:e], hz[:e-s]
			idx := 0
			for j := 0; j < d; j++ {
				floats.MulTo(hz, h, o.z.col(j)[s:e])
				for k := j; k < d; k++ {
					out[idx] += floats.Dot(hz, o.z.col(k)[s:e])
					idx++
				}
			}
		}
	})
	sum := make([]float64, tri)
	for b := 0; b < o.nb; b++ {
		floats.Add(sum, o.partial[b*tri:(b+1)*tri])
	}
	return sum
}
