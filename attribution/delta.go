package attribution

import (
	"math"
	"math/bits"

	"github.com/gapwise/gapwise/internal/workers"
	"github.com/gapwise/gapwise/metrics"
)

// deltaParts is the fixed number of record ranges the delta-method sums
// are split into; partial sums are added in range order, so the variances
// do not depend on the number of goroutines.
const deltaParts = 16

// phiVarianceBudget bounds n·2^k, the per-record coalition work of the
// delta-method variances of the Shapley values on one side; above it only
// the variances of the two ends are computed.
const phiVarianceBudget = 1 << 23

// deltaInput is one side's records and the weight coalitions whose
// metrics the delta method linearises.
type deltaInput struct {
	y, s      []float64
	logr      [][]float64 // weight log-ratios per mechanism (clipped here to ±ClipLogRatio)
	wc        []uint64    // weight coalitions, one per evaluated hybrid
	names     []string    // metrics; AUC gets NaN variances
	threshold float64
	bins      int
}

// functional maps u[m][j], the influence of one record on metric m at
// coalition wc[j], to dst[m][f], its influence on linear functional f of
// the coalition values (a Shapley value, an end, the estimated gap).
type functional func(u, dst [][]float64)

// deltaVariances returns var[m][f], the delta-method (linearisation)
// variance of functional f of the estimated coalition values of metric m,
// conditional on the log-ratios (the uncertainty of the fitted
// classifiers is not included).
//
// Every metric but AUC is a function M = g(T) of weighted cell sums
// T_{c,h} = Σ_r w_r·[cell(r) = c]·h(r), h ∈ {1, s, s², ℓ} (metrics.Stats),
// and g is homogeneous of degree 0 in w, so M̂ is a self-normalised
// importance-sampling estimate. Linearising around the sample sums, a
// record r moves M̂(S) by
//
//	IF_S(r) = w_S(r) · Σ_h ∂g/∂T_{cell(r),h} · h(r),
//
// with Σ_r IF_S(r) = 0 (Euler's theorem for degree-0 homogeneous g), and
// for records drawn independently Var(M̂(S)) ≈ Σ_r IF_S(r)² (the delta
// method for ratio estimators, e.g. Owen 2013, "Monte Carlo theory,
// methods and examples", ch. 9, the self-normalised importance sampling
// variance Σ w_r²(f_r − μ̂)²/(Σw)² for a mean). A linear functional
// L = Σ_S a_S M̂(S) has influence Σ_S a_S IF_S(r) and variance the sum of
// its squares. The gradients are central differences of
// metrics.Stats.Value with step 10⁻⁶·Σw; weights are scaled by their
// largest value per coalition, which changes neither M̂ nor IF. A metric
// undefined under some coalition, and AUC, get NaN.
func deltaVariances(in deltaInput, nf int, fn functional) [][]float64 {
	n, nc := len(in.y), len(in.wc)
	logc := in.logScales()
	grads := in.gradients(logc)
	parts := min(deltaParts, max(1, n))
	partial := make([][][]float64, parts)
	workers.For(0, parts, func(_, p int) {
		lo, hi := splitRange(n, parts, p)
		partial[p] = in.squares(lo, hi, logc, grads, nf, fn)
	})
	out := zeros(len(in.names), nf)
	for _, part := range partial {
		for m := range out {
			for f := range out[m] {
				out[m][f] += part[m][f]
			}
		}
	}
	for m, name := range in.names {
		for j := 0; j < nc; j++ {
			if name == metrics.NameAUC || grads[j][m] == nil {
				for f := range out[m] {
					out[m][f] = math.NaN()
				}
				break
			}
		}
	}
	return out
}

// logWeight returns log w_S(r) for weight coalition wc: the sum of the
// clipped log-ratios of its mechanisms.
func (in *deltaInput) logWeight(wc uint64, r int) float64 {
	var x float64
	for b := wc; b != 0; b &= b - 1 {
		x += math.Max(-ClipLogRatio, math.Min(ClipLogRatio, in.logr[bits.TrailingZeros64(b)][r]))
	}
	return x
}

// logScales returns max_r log w_S(r) per coalition (0 without records).
func (in *deltaInput) logScales() []float64 {
	out := make([]float64, len(in.wc))
	for j, wc := range in.wc {
		c := math.Inf(-1)
		for r := range in.y {
			c = math.Max(c, in.logWeight(wc, r))
		}
		if math.IsInf(c, -1) {
			c = 0
		}
		out[j] = c
	}
	return out
}

// gradients returns grads[j][m][4·cell + h], ∂g_m/∂T_{cell,h} at the
// scaled sums of coalition j, for h = 1, s, s², ℓ in that order; nil
// where metric m is AUC or undefined under coalition j.
func (in *deltaInput) gradients(logc []float64) [][][]float64 {
	grads := make([][][]float64, len(in.wc))
	workers.For(0, len(in.wc), func(_, j int) {
		st := metrics.NewStats(in.bins)
		for r := range in.y {
			st.Add(in.y[r], in.s[r], in.threshold, math.Exp(in.logWeight(in.wc[j], r)-logc[j]))
		}
		grads[j] = make([][]float64, len(in.names))
		for m, name := range in.names {
			if name != metrics.NameAUC {
				grads[j][m] = statGradient(st, name)
			}
		}
	})
	return grads
}

// statGradient returns the central-difference gradient of st.Value(name)
// with respect to every cell sum (4·cell + h, h = W, WS, WS2, WL), or nil
// when the metric is undefined on st.
func statGradient(st *metrics.Stats, name string) []float64 {
	if _, err := st.Value(name); err != nil {
		return nil
	}
	var total float64
	for _, w := range st.W {
		total += w
	}
	h := 1e-6 * total
	arrays := [4][]float64{st.W, st.WS, st.WS2, st.WL}
	g := make([]float64, 4*len(st.W))
	for c := range st.W {
		if st.W[c] == 0 {
			continue // no record in the cell: its gradient is never read
		}
		for a, arr := range arrays {
			x := arr[c]
			arr[c] = x + h
			up, err1 := st.Value(name)
			arr[c] = x - h
			down, err2 := st.Value(name)
			arr[c] = x
			if err1 != nil || err2 != nil {
				return nil
			}
			g[4*c+a] = (up - down) / (2 * h)
		}
	}
	return g
}

// squares sums, over records lo…hi−1, the squared influence of every
// functional.
func (in *deltaInput) squares(lo, hi int, logc []float64, grads [][][]float64, nf int, fn functional) [][]float64 {
	u := zeros(len(in.names), len(in.wc))
	dst := zeros(len(in.names), nf)
	acc := zeros(len(in.names), nf)
	for r := lo; r < hi; r++ {
		c := metrics.Cell(in.y[r], in.s[r], in.threshold, in.bins)
		s := in.s[r]
		h := [4]float64{1, s, s * s, metrics.LogLossTerm(in.y[r], s)}
		for j, wc := range in.wc {
			w := math.Exp(in.logWeight(wc, r) - logc[j])
			for m := range in.names {
				g := grads[j][m]
				if g == nil {
					u[m][j] = 0
					continue
				}
				u[m][j] = w * (g[4*c]*h[0] + g[4*c+1]*h[1] + g[4*c+2]*h[2] + g[4*c+3]*h[3])
			}
		}
		fn(u, dst)
		for m := range acc {
			for f, x := range dst[m] {
				acc[m][f] += x * x
			}
		}
	}
	return acc
}

func zeros(rows, cols int) [][]float64 {
	out := make([][]float64, rows)
	for i := range out {
		out[i] = make([]float64, cols)
	}
	return out
}

// endsFunctional works on the coalitions {∅, N} (in that order) and gives
// the functionals M̂(∅), M̂(N), M̂(N) − M̂(∅) and (M̂(N) + M̂(∅))/2.
func endsFunctional(u, dst [][]float64) {
	for m := range u {
		setEnds(dst[m][0:4], u[m][0], u[m][1])
	}
}

// setEnds writes the influences on the four end functionals of
// endsFunctional from those on M̂(∅) and M̂(N).
func setEnds(dst []float64, empty, full float64) {
	dst[0], dst[1], dst[2], dst[3] = empty, full, full-empty, (full+empty)/2
}

// shapleyFunctional works on all 2^k hybrid coalitions in index order and
// gives φ_0 … φ_{k−1} of the game S ↦ M̂(S) (ExactShapley's weights), then
// the four end functionals of endsFunctional.
func shapleyFunctional(k int) functional {
	w := shapleyWeights(k)
	full := 1<<k - 1
	return func(u, dst [][]float64) {
		for m := range u {
			d := dst[m]
			for i := range d {
				d[i] = 0
			}
			for S := 0; S <= full; S++ {
				size := bits.OnesCount(uint(S))
				for i := 0; i < k; i++ {
					if S&(1<<i) == 0 {
						d[i] += w[size] * (u[m][S|1<<i] - u[m][S])
					}
				}
			}
			setEnds(d[k:k+4], u[m][0], u[m][full])
		}
	}
}

// sideVariances are the delta-method variances of one side's estimates of
// one metric (see deltaVariances); NaN when unknown.
type sideVariances struct {
	empty, full, gap float64   // of M̂(∅), M̂(N) and M̂(N) − M̂(∅)
	mid              float64   // of (M̂(N) + M̂(∅))/2
	phi              []float64 // of φ̂_i; nil when not computed
}

// variances returns the delta-method variances of this side's estimates
// of every metric: of the ends and the gap always, of the Shapley values
// when withPhi and n·2^k ≤ phiVarianceBudget.
func (e *sideEstimate) variances(names []string, threshold float64, bins int, withPhi bool) []sideVariances {
	k := len(e.logr)
	full := uint64(1)<<k - 1
	in := deltaInput{y: e.y, s: e.s, logr: e.logr, names: names, threshold: threshold, bins: bins}
	out := make([]sideVariances, len(names))
	if withPhi && k <= 30 && float64(len(e.y))*math.Exp2(float64(k)) <= phiVarianceBudget {
		in.wc = make([]uint64, 1<<k)
		for S := range in.wc {
			in.wc[S] = e.weightCoalition(uint64(S), full)
		}
		v := deltaVariances(in, k+4, shapleyFunctional(k))
		for m := range out {
			out[m] = sideVariances{phi: v[m][:k], empty: v[m][k], full: v[m][k+1], gap: v[m][k+2], mid: v[m][k+3]}
		}
		return out
	}
	in.wc = []uint64{e.weightCoalition(0, full), e.weightCoalition(full, full)}
	v := deltaVariances(in, 4, endsFunctional)
	for m := range out {
		out[m] = sideVariances{empty: v[m][0], full: v[m][1], gap: v[m][2], mid: v[m][3]}
	}
	return out
}
