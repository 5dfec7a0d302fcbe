package attribution

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// chainSample draws records of a small DAG a → b → c, a → c with a binary
// label c and a score of a and b, shifted between the groups, and
// arbitrary log-ratios (the algebra does not need them right).
func chainSample(n int) (*Sample, []Mechanism, [][]float64) {
	rng := rand.New(rand.NewPCG(11, 12))
	x := mat.NewDense(n, 3, nil)
	s := &Sample{X: x, Comparison: make([]bool, n), Labels: make([]float64, n), Scores: make([]float64, n)}
	logr := [][]float64{make([]float64, n), make([]float64, n), make([]float64, n)}
	for i := 0; i < n; i++ {
		cmp := i%2 == 1
		shift := 0.0
		if cmp {
			shift = 0.5
		}
		a := rng.NormFloat64() + shift
		b := 0.7*a + rng.NormFloat64()
		c := 0.0
		if rng.Float64() < 1/(1+math.Exp(-(a-b+shift))) {
			c = 1
		}
		x.Set(i, 0, a)
		x.Set(i, 1, b)
		x.Set(i, 2, c)
		s.Comparison[i], s.Labels[i] = cmp, c
		s.Scores[i] = 1 / (1 + math.Exp(-(0.8*a + 0.6*b - 0.3)))
		for m := range logr {
			logr[m][i] = 0.3 * rng.NormFloat64()
		}
	}
	mechs := []Mechanism{
		{Node: "a", NodeCols: []int{0}},
		{Node: "b", Parents: []string{"a"}, NodeCols: []int{1}, ParentCols: []int{0}},
		{Node: "c", Parents: []string{"a", "b"}, NodeCols: []int{2}, ParentCols: []int{0, 1}},
	}
	return s, mechs, logr
}

// TestRobustMomentsMatchDirectSums: the moment algebra (robust_moments.go)
// against the estimator's formula computed record by record: every
// fitted regression is the least-squares fit of its response at its
// training rows, and every leaf's θ̂ is mean_{c_1} μ̂_2 + Σ_r Σ ω_r·(μ̂_{r+1}
// − μ̂_r)/Σ ω_r from cross-fitted predictions. Source: the definitions in
// robust.go and robust_pool.go (a check of the implementation, not of the
// method).
func TestRobustMomentsMatchDirectSums(t *testing.T) {
	for _, pool := range []bool{false, true} {
		t.Run(map[bool]string{false: "own group", true: "pooled"}[pool], func(t *testing.T) { checkMomentsDirect(t, pool) })
	}
}

// checkMomentsDirect is TestRobustMomentsMatchDirectSums with or without
// pooling: with it, each regression also reads the other group's
// training records weighted by the step's carrying ratio, and each step
// averages both groups' weighted means with shares proportional to their
// effective sample sizes.
func checkMomentsDirect(t *testing.T, pool bool) {
	const n, k = 600, 3
	s, mechs, logr := chainSample(n)
	folds := assignFolds(s.Comparison, k, 5)
	in, err := newRobustInput(s, mechs, logr, folds, k, Options{Threshold: 0.5, ECEBins: 10, Workers: 2, RobustPool: pool})
	if err != nil {
		t.Fatal(err)
	}
	est, err := estimateRobust(in, []string{"fnr", "brier"})
	if err != nil {
		t.Fatal(err)
	}
	for _, fam := range est.families {
		R := len(fam.chain.steps)
		T := len(fam.terms)
		// Cross-fitted and per-fold predictions of node (r, key), by rows.
		predict := func(r, key, tm, j, i int) float64 {
			if r == R {
				return fam.f[tm][i]
			}
			ds := fam.design(in, r)
			x := make([]float64, ds.width())
			ds.row(i, x)
			return dot(x, fam.nodes[r][key].beta[tm][j])
		}
		for r := 1; r < R; r++ {
			for key := range fam.nodes[r] {
				g := key & 1
				for tm := 0; tm < T; tm++ {
					for j := 0; j < k; j++ {
						// Least squares at fold j's training rows of group g,
						// with the ridge of the learner chosen.
						ds := fam.design(in, r)
						d := ds.width()
						l := fam.nodes[r][key].learner[tm]
						size := d
						if l == regLinear {
							size = fam.bases[r].nLin
						}
						A := mat.NewDense(size, size, nil)
						bv := mat.NewVecDense(size, nil)
						x := make([]float64, d)
						for i := range s.Labels {
							h := 0
							if in.cmp[i] {
								h = 1
							}
							if folds[i] == j || (h != g && !pool) {
								continue
							}
							w := 1.0
							if h != g {
								w = in.carry(fam.chain.steps[r].mech, h, i)
							}
							ds.row(i, x)
							z := predict(r+1, key>>1, tm, j, i)
							for p := 0; p < size; p++ {
								bv.SetVec(p, bv.AtVec(p)+w*x[p]*z)
								for q := 0; q < size; q++ {
									A.Set(p, q, A.At(p, q)+w*x[p]*x[q])
								}
							}
						}
						for p := 1; p < size; p++ {
							A.Set(p, p, A.At(p, p)+regRidge)
						}
						var beta mat.VecDense
						if err := beta.SolveVec(A, bv); err != nil {
							t.Fatal(err)
						}
						got := fam.nodes[r][key].beta[tm][j]
						for p := 0; p < size; p++ {
							if math.Abs(got[p]-beta.AtVec(p)) > 1e-8*(1+math.Abs(beta.AtVec(p))) {
								t.Fatalf("step %d key %d term %d fold %d: β[%d] = %g, direct least squares %g", r, key, tm, j, p, got[p], beta.AtVec(p))
							}
						}
					}
				}
			}
		}
		for key := range fam.leaves {
			for tm := 0; tm < T; tm++ {
				var theta float64
				for r := 0; r < R; r++ {
					var means, ess []float64
					for _, c := range fam.leafConfigs(in, key, r) {
						var num, den, den2 float64
						for _, i := range in.group[c.g] {
							w := math.Exp(in.logWeight(c, i))
							d := predict(1, key>>1, tm, folds[i], i)
							if r > 0 {
								d = predict(r+1, key>>(r+1), tm, folds[i], i) - predict(r, key>>r, tm, folds[i], i)
							}
							num += w * d
							den += w
							den2 += w * w
						}
						means, ess = append(means, num/den), append(ess, den*den/den2)
					}
					var e float64
					for _, x := range ess {
						e += x
					}
					for c := range means {
						theta += ess[c] / e * means[c]
					}
				}
				if got := fam.leaves[key].theta[tm]; math.Abs(got-theta) > 1e-10 {
					t.Errorf("leaf %b term %v: θ̂ = %.12f, direct sums %.12f", key, fam.terms[tm].id, got, theta)
				}
			}
		}
		// ψ is centred within each group: Σ_{i∈g} ψ(i) = 0 for every leaf.
		psi := fam.blockInfluence(in, 0, n)
		for key := range psi {
			for tm := 0; tm < T; tm++ {
				var sum [2]float64
				for i := 0; i < n; i++ {
					g := 0
					if in.cmp[i] {
						g = 1
					}
					sum[g] += psi[key][tm][i]
				}
				if math.Abs(sum[0]) > 1e-12 || math.Abs(sum[1]) > 1e-12 {
					t.Errorf("leaf %b term %v: Σψ = %g, %g, want 0", key, fam.terms[tm].id, sum[0], sum[1])
				}
			}
		}
	}
}
