package attribution

import (
	"math"

	"gonum.org/v1/gonum/blas/blas64"
)

// Every regression of the robust estimator is least squares, so a fitted
// prediction is linear in its response: at step r, μ̂_r(i) = x_r(i)·β for
// the design row x_r(i) of the step's basis (regBasis), and the response,
// the next step's fit x_{r+1}(i)·β', is linear in β'. A fit, its
// held-out error and every correction of the estimator are then sums over
// records of products of design rows, which the moments below hold per
// step, fold and group; no fit touches the records again. Step R, the top,
// has the terms themselves as its design, x_R(i) = (f_1(i), …, f_T(i)),
// and term t's "coefficients" there are the unit vector e_t.

// stepMoments holds, for one step r of a family, per fold j and group g
// over the records of fold j in group g:
//
//	H = Σ x_r x_rᵀ       (d_r × d_r)
//	K = Σ x_r x_{r+1}ᵀ   (d_r × d_{r+1})
//	S = Σ x_r            (d_r)
//
// The training sums of fold j are those over the other folds.
//
// With pooling (Options.RobustPool) it also holds HR and KR, the same
// sums weighted by ρ(i) = P_c(x_k | pa_k)/P_g(x_k | pa_k), the ratio of
// the step's own mechanism k that carries a record of group g to the other
// group c's mechanism (r_k for reference records, 1/r_k for comparison
// ones).
type stepMoments struct {
	d, dNext int
	H, K, S  [][2][]float64
	HR, KR   [][2][]float64
}

// stepDesign evaluates the design rows of step r of a family (1 ≤ r ≤ R; r =
// R gives the terms).
type stepDesign struct {
	fam  *robustFamily
	raw  blas64.General
	r    int
	zbuf []float64
}

func (fam *robustFamily) design(in *robustInput, r int) *stepDesign {
	ds := &stepDesign{fam: fam, raw: in.x.RawMatrix(), r: r}
	if r < len(fam.chain.steps) {
		ds.zbuf = make([]float64, len(fam.bases[r].active))
	}
	return ds
}

// width is d_r.
func (ds *stepDesign) width() int {
	if ds.r == len(ds.fam.chain.steps) {
		return len(ds.fam.terms)
	}
	return ds.fam.bases[ds.r].d
}

// row writes x_r(i) into dst.
func (ds *stepDesign) row(i int, dst []float64) {
	if ds.r == len(ds.fam.chain.steps) {
		for t := range ds.fam.terms {
			dst[t] = ds.fam.f[t][i]
		}
		return
	}
	if ds.fam.oracle != nil {
		for c, col := range ds.fam.oracle[ds.r] {
			dst[c] = col[i]
		}
		return
	}
	ds.fam.bases[ds.r].row(ds.raw, i, ds.zbuf, dst)
}

// momentsOf computes the moments of step r (1 ≤ r < R) over every record,
// in record order within each (fold, group).
func (fam *robustFamily) momentsOf(in *robustInput, r int) *stepMoments {
	cur, next := fam.design(in, r), fam.design(in, r+1)
	m := &stepMoments{d: cur.width(), dNext: next.width()}
	m.H = make([][2][]float64, in.k)
	m.K = make([][2][]float64, in.k)
	m.S = make([][2][]float64, in.k)
	for j := 0; j < in.k; j++ {
		for g := 0; g < 2; g++ {
			m.H[j][g] = make([]float64, m.d*m.d)
			m.K[j][g] = make([]float64, m.d*m.dNext)
			m.S[j][g] = make([]float64, m.d)
		}
	}
	if in.pool {
		m.HR = make([][2][]float64, in.k)
		m.KR = make([][2][]float64, in.k)
		for j := 0; j < in.k; j++ {
			for g := 0; g < 2; g++ {
				m.HR[j][g] = make([]float64, m.d*m.d)
				m.KR[j][g] = make([]float64, m.d*m.dNext)
			}
		}
	}
	mech := fam.chain.steps[r].mech
	x, xn := make([]float64, m.d), make([]float64, m.dNext)
	for i := range in.y {
		g := 0
		if in.cmp[i] {
			g = 1
		}
		j := in.folds[i]
		cur.row(i, x)
		next.row(i, xn)
		for p, xp := range x {
			m.S[j][g][p] += xp
		}
		addOuter(m.H[j][g], m.K[j][g], x, xn, 1)
		if in.pool {
			addOuter(m.HR[j][g], m.KR[j][g], x, xn, in.carry(mech, g, i))
		}
	}
	for j := range m.H {
		for g := range m.H[j] {
			symmetrise(m.H[j][g], m.d)
			if in.pool {
				symmetrise(m.HR[j][g], m.d)
			}
		}
	}
	return m
}

// carry returns ρ(i), the ratio of mechanism k that carries record i of
// group g to the other group's mechanism: r_k(i) for a reference record,
// 1/r_k(i) for a comparison one.
func (in *robustInput) carry(k, g, i int) float64 {
	if g == 1 {
		return math.Exp(-in.logr[k][i])
	}
	return math.Exp(in.logr[k][i])
}

// addOuter adds w·x xᵀ to the upper triangle of H and w·x xnᵀ to K.
func addOuter(H, K, x, xn []float64, w float64) {
	d, dn := len(x), len(xn)
	for p, xp := range x {
		if xp == 0 {
			continue
		}
		wx := w * xp
		h := H[p*d:]
		for q := p; q < d; q++ {
			h[q] += wx * x[q]
		}
		kr := K[p*dn:]
		for q, v := range xn {
			kr[q] += wx * v
		}
	}
}

// symmetrise copies the upper triangle of the d × d matrix H below.
func symmetrise(H []float64, d int) {
	for p := 0; p < d; p++ {
		for q := 0; q < p; q++ {
			H[p*d+q] = H[q*d+p]
		}
	}
}

// topGram returns, per fold and group, Σ f fᵀ over the terms (T × T):
// the held-out error of a last-step fit needs the squared responses.
func (fam *robustFamily) topGram(in *robustInput) [][2][]float64 {
	T := len(fam.terms)
	out := make([][2][]float64, in.k)
	for j := range out {
		out[j] = [2][]float64{make([]float64, T*T), make([]float64, T*T)}
	}
	for i := range in.y {
		g := 0
		if in.cmp[i] {
			g = 1
		}
		o := out[in.folds[i]][g]
		for p := 0; p < T; p++ {
			fp := fam.f[p][i]
			for q := 0; q < T; q++ {
				o[p*T+q] += fp * fam.f[q][i]
			}
		}
	}
	return out
}

// trainSum returns Σ_{j' ≠ j} a[j'][g].
func trainSum(a [][2][]float64, j, g int) []float64 {
	out := make([]float64, len(a[0][g]))
	for jj := range a {
		if jj == j {
			continue
		}
		for p, v := range a[jj][g] {
			out[p] += v
		}
	}
	return out
}

// quad returns uᵀ M v for a row-major M of len(u) × len(v).
func quad(u []float64, M []float64, v []float64) float64 {
	var s float64
	for p, up := range u {
		if up == 0 {
			continue
		}
		row := M[p*len(v):]
		var r float64
		for q, vq := range v {
			r += row[q] * vq
		}
		s += up * r
	}
	return s
}

// mulVec returns M v for a row-major M of rows × len(v).
func mulVec(M []float64, rows int, v []float64) []float64 {
	out := make([]float64, rows)
	for p := range out {
		row := M[p*len(v):]
		var r float64
		for q, vq := range v {
			r += row[q] * vq
		}
		out[p] = r
	}
	return out
}

func dot(a, b []float64) float64 {
	var s float64
	for i, x := range a {
		s += x * b[i]
	}
	return s
}
