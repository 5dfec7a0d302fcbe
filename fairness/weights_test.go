package fairness

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
)

// wlsFit is a weighted least-squares fit of y on the design rows x
// (intercept included by the caller): coefficients with sandwich standard
// errors, the weighted residual variance s² = Σw e²/Σw and its
// linearised standard error.
type wlsFit struct {
	beta, se []float64
	s2, s2se float64
}

// wls fits y on x with weights w. The coefficient standard errors are the
// heteroskedasticity-robust sandwich (X'WX)⁻¹ (Σ w² e² x x') (X'WX)⁻¹
// (White 1980, Econometrica 48(4)), which for weights carries their
// variance (Kish's design effect) into the error; the variance's is
// √(Σ w² (e² − s²)²) / Σw, the delta method for a ratio of weighted sums
// (common practice).
func wls(y []float64, x [][]float64, w []float64) wlsFit {
	p := len(x[0])
	a := mat.NewDense(p, p, nil)
	b := mat.NewVecDense(p, nil)
	for i := range y {
		for j := 0; j < p; j++ {
			b.SetVec(j, b.AtVec(j)+w[i]*x[i][j]*y[i])
			for k := 0; k < p; k++ {
				a.Set(j, k, a.At(j, k)+w[i]*x[i][j]*x[i][k])
			}
		}
	}
	var inv mat.Dense
	if err := inv.Inverse(a); err != nil {
		panic(err)
	}
	var beta mat.VecDense
	beta.MulVec(&inv, b)
	e := make([]float64, len(y))
	meat := mat.NewDense(p, p, nil)
	sw, swe := 0.0, 0.0
	for i := range y {
		e[i] = y[i]
		for j := 0; j < p; j++ {
			e[i] -= beta.AtVec(j) * x[i][j]
		}
		sw += w[i]
		swe += w[i] * e[i] * e[i]
		for j := 0; j < p; j++ {
			for k := 0; k < p; k++ {
				meat.Set(j, k, meat.At(j, k)+w[i]*w[i]*e[i]*e[i]*x[i][j]*x[i][k])
			}
		}
	}
	var cov mat.Dense
	cov.Mul(&inv, meat)
	cov.Mul(&cov, &inv)
	f := wlsFit{s2: swe / sw}
	for j := 0; j < p; j++ {
		f.beta = append(f.beta, beta.AtVec(j))
		f.se = append(f.se, math.Sqrt(cov.At(j, j)))
	}
	v := 0.0
	for i := range y {
		d := e[i]*e[i] - f.s2
		v += w[i] * w[i] * d * d
	}
	f.s2se = math.Sqrt(v) / sw
	return f
}

// TestWeightsReproduceTargetMechanism checks the main job of Weights on the
// Screening model (internal/scm), whose mechanisms are known: after
// weighting, the source group's node given its parents must have the
// target group's conditional mean and variance. Within each disease
// stratum, the node is regressed on its other parent (age) where it has
// one; each coefficient and the residual variance of the weighted source
// records must match the target group's unweighted fit within 4 combined
// standard errors (sandwich errors for the weighted fit, so that the
// weights' variance is counted). The same quantities before weighting
// must differ by more than 4 standard errors somewhere, so the check can
// fail: the shifts are a mean shift of marker_a among the diseased
// (DiseasedMarker 1) and a standard deviation 0.7 instead of 1 of
// marker_b (Spread), with an age shift that moves the parents too.
func TestWeightsReproduceTargetMechanism(t *testing.T) {
	const n = 4000
	m := scm.Screening("weights", scm.Shift{Age: 0.5, DiseasedMarker: 1, Spread: 0.7})
	s, mechs, err := scm.Pooled(m, n, n, 21)
	if err != nil {
		t.Fatal(err)
	}
	cols, _ := m.Columns()
	col := func(node, r int) float64 { return s.X.At(r, cols[node][0]) }
	tests := []struct {
		name             string
		node             int
		covariate        int // a parent beside disease to regress on, or −1
		towardComparison bool
	}{
		{"marker_a toward comparison", scm.NodeMarkerA, scm.NodeAge, true},
		{"marker_a toward reference", scm.NodeMarkerA, scm.NodeAge, false},
		{"marker_b toward comparison", scm.NodeMarkerB, -1, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			ropt := attribution.RatioOptions{Seed: 5, Learners: []classify.Learner{classify.NewExpanded()}}
			sw, err := MechanismWeights(s, mechs[tc.node], tc.towardComparison, 0, ropt)
			if err != nil {
				t.Fatal(err)
			}
			if len(sw.Records) != n {
				t.Fatalf("%d weighted records, want the %d of the source group", len(sw.Records), n)
			}
			if mean := sum(sw.Weights) / float64(n); math.Abs(mean-1) > 1e-9 {
				t.Errorf("mean weight %v, want 1", mean)
			}
			if !(sw.ESS > 0 && sw.ESS <= float64(n)) {
				t.Errorf("ESS %v outside (0, %d]", sw.ESS, n)
			}
			t.Logf("ESS %.0f of %d", sw.ESS, n)
			weightOf := map[int]float64{}
			for a, r := range sw.Records {
				weightOf[r] = sw.Weights[a]
			}
			shiftedBefore := false
			for d := 0.0; d <= 1; d++ {
				var src, tgt struct {
					y []float64
					x [][]float64
					w []float64
				}
				for r, c := range s.Comparison {
					if col(scm.NodeDisease, r) != d {
						continue
					}
					row := []float64{1}
					if tc.covariate >= 0 {
						row = append(row, col(tc.covariate, r))
					}
					if c != tc.towardComparison {
						src.y, src.x, src.w = append(src.y, col(tc.node, r)), append(src.x, row), append(src.w, weightOf[r])
					} else {
						tgt.y, tgt.x = append(tgt.y, col(tc.node, r)), append(tgt.x, row)
						tgt.w = append(tgt.w, 1)
					}
				}
				ones := make([]float64, len(src.w))
				for i := range ones {
					ones[i] = 1
				}
				fw, f0, ft := wls(src.y, src.x, src.w), wls(src.y, src.x, ones), wls(tgt.y, tgt.x, tgt.w)
				check := func(what string, w, w0, tv, sew, se0, set float64) {
					z := math.Abs(w-tv) / math.Hypot(sew, set)
					if z > 4 {
						t.Errorf("disease=%v %s: weighted %.4f (SE %.4f), target %.4f (SE %.4f): z %.1f > 4", d, what, w, sew, tv, set, z)
					}
					if math.Abs(w0-tv)/math.Hypot(se0, set) > 4 {
						shiftedBefore = true
					}
					t.Logf("disease=%v %s: unweighted %.3f, weighted %.3f, target %.3f (z %.1f)", d, what, w0, w, tv, z)
				}
				for j := range fw.beta {
					check(fmt.Sprintf("coefficient %d", j), fw.beta[j], f0.beta[j], ft.beta[j], fw.se[j], f0.se[j], ft.se[j])
				}
				check("residual variance", fw.s2, f0.s2, ft.s2, fw.s2se, f0.s2se, ft.s2se)
			}
			if !shiftedBefore {
				t.Error("the unweighted source records already match the target: the test could not fail")
			}
		})
	}
}

func sum(x []float64) float64 {
	t := 0.0
	for _, v := range x {
		t += v
	}
	return t
}

// TestMechanismWeightsClipping checks the clipping count and flags: with
// clip 0.9 about a tenth of the source records (both tails of the
// log-ratios, by ClipAtQuantiles' definition) are clipped, the flags
// agree with the count, and clipping can only raise the ESS of these
// weights since it pulls extreme log-ratios in (common practice).
func TestMechanismWeightsClipping(t *testing.T) {
	const n = 600
	m := scm.Screening("weights-clip", scm.Shift{DiseasedMarker: 1})
	s, mechs, err := scm.Pooled(m, n, n, 4)
	if err != nil {
		t.Fatal(err)
	}
	ropt := attribution.RatioOptions{Seed: 2, Learners: []classify.Learner{classify.NewLinear()}}
	raw, err := MechanismWeights(s, mechs[scm.NodeMarkerA], true, 0, ropt)
	if err != nil {
		t.Fatal(err)
	}
	clipped, err := MechanismWeights(s, mechs[scm.NodeMarkerA], true, 0.9, ropt)
	if err != nil {
		t.Fatal(err)
	}
	if raw.NClipped != 0 {
		t.Errorf("%d clipped without clipping", raw.NClipped)
	}
	flags := 0
	for _, c := range clipped.Clipped {
		if c {
			flags++
		}
	}
	if flags != clipped.NClipped || clipped.NClipped < n/20 || clipped.NClipped > n/5 {
		t.Errorf("clipped %d (flags %d) of %d at 0.9, want about %d", clipped.NClipped, flags, n, n/10)
	}
	if clipped.ESS < raw.ESS {
		t.Errorf("ESS %v after clipping below %v before", clipped.ESS, raw.ESS)
	}
}
