package attribution

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

// For FNR the delta-method variance of the weighted estimate is the
// self-normalised importance-sampling variance of a mean over the positives
// (Owen 2013, "Monte Carlo theory, methods and examples", §9.2):
//
//	Var = Σ_{y=1} w²·([d=0] − FNR)² / (Σ_{y=1} w)².
//
// The numeric-gradient implementation must match it.
func TestDeltaVarianceMatchesRatioFormula(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	const n = 400
	y, s, l := make([]float64, n), make([]float64, n), make([]float64, n)
	for r := range y {
		y[r] = float64(rng.IntN(2))
		s[r] = rng.Float64()
		l[r] = rng.NormFloat64()
	}
	in := deltaInput{y: y, s: s, logr: [][]float64{l}, wc: []uint64{0, 1}, names: []string{metrics.NameFNR}, threshold: 0.5, bins: 1}
	got := deltaVariances(in, 4, endsFunctional)[0]
	for j, wc := range []uint64{0, 1} {
		var wpos, fn float64
		for r := range y {
			w := math.Exp(float64(wc) * l[r])
			if y[r] == 1 {
				wpos += w
				if s[r] < 0.5 {
					fn += w
				}
			}
		}
		fnr := fn / wpos
		var v float64
		for r := range y {
			w := math.Exp(float64(wc) * l[r])
			if y[r] == 1 {
				d := pick01(s[r] < 0.5) - fnr
				v += w * w * d * d
			}
		}
		v /= wpos * wpos
		if math.Abs(got[j]-v) > 1e-6*v {
			t.Errorf("coalition %d: delta variance %.10g, formula %.10g", wc, got[j], v)
		}
	}
}

// randomLabelSide is gaussianSides' reference side (two normal root
// mechanisms, exact log-ratios towards spreads cmpSD) with labels drawn
// independently per record, y ~ Bernoulli(σ(x1 + x2 − 0.5)), so that
// records are independent and identically distributed as the delta method
// assumes.
func randomLabelSide(seed uint64, n int, cmpSD [2]float64) *sideEstimate {
	rng := rand.New(rand.NewPCG(seed, 5))
	y, s := make([]float64, n), make([]float64, n)
	logr := [][]float64{make([]float64, n), make([]float64, n)}
	for r := 0; r < n; r++ {
		var sum float64
		for i, c := range cmpSD {
			x := rng.NormFloat64()
			sum += x
			logr[i][r] = -math.Log(c) - x*x/(2*c*c) + x*x/2
		}
		s[r] = 1 / (1 + math.Exp(-sum))
		y[r] = pick01(rng.Float64() < 1/(1+math.Exp(0.5-sum)))
	}
	return newSideEstimate(SideReference, y, s, logr)
}

// Over independent draws with exact density ratios (randomLabelSide with
// spreads 0.8 and 1.2, whose weights have finite variance), the delta-method standard errors must match the
// spread of the estimates they describe (Monte Carlo, 300 draws: the
// sample SD is within about ±4% of the true SD, so a ratio outside
// [0.85, 1.15] means a wrong variance), for the far end M̂(N), the gap and
// a Shapley value, and for a rate, a scoring rule and a calibration metric.
func TestDeltaVarianceMatchesMonteCarlo(t *testing.T) {
	if testing.Short() {
		t.Skip("300 draws")
	}
	const draws, n = 300, 1500
	threshold := 1 / (1 + math.Exp(-1))
	names := []string{metrics.NameFNR, metrics.NameBrier, metrics.NameCalibrationInTheLarge, metrics.NameECE}
	// est[m][q][d], q: M̂(N), gap, φ_0; and the squared SEs.
	est := make([][][]float64, len(names))
	v2 := zeros(len(names), 3)
	for m := range est {
		est[m] = make([][]float64, 3)
	}
	for d := 0; d < draws; d++ {
		ref := randomLabelSide(uint64(100+d), n, [2]float64{0.8, 1.2})
		vals, err := ref.all(names, threshold, EngineOptions{Workers: 1})
		if err != nil {
			t.Fatal(err)
		}
		vars := ref.variances(names, threshold, metrics.DefaultECEBins, true)
		for m := range names {
			phi := ExactShapley(shifted(vals[m]), 2)
			for q, x := range []float64{vals[m][3], vals[m][3] - vals[m][0], phi[0]} {
				est[m][q] = append(est[m][q], x)
			}
			for q, x := range []float64{vars[m].full, vars[m].gap, vars[m].phi[0]} {
				v2[m][q] += x / draws
			}
		}
	}
	for m, name := range names {
		for q, what := range []string{"M(N)", "gap", "phi_0"} {
			_, _, sd := moments(est[m][q])
			r := math.Sqrt(v2[m][q]) / sd
			t.Logf("%s %s: RMS SE / SD %.3f", name, what, r)
			if r < 0.85 || r > 1.15 {
				t.Errorf("%s %s: RMS delta SE / Monte Carlo SD = %.3f (SD %.5f)", name, what, r, sd)
			}
		}
	}
}

// moments returns the mean, root mean square and sample SD of x.
func moments(x []float64) (mean, rms, sd float64) {
	var ms float64
	for _, v := range x {
		mean += v / float64(len(x))
		ms += v * v / float64(len(x))
	}
	sd = math.Sqrt(math.Max(0, ms-mean*mean) * float64(len(x)) / float64(len(x)-1))
	return mean, math.Sqrt(ms), sd
}

// randomLabelSides is randomLabelSide for both groups: reference records
// with x_i ~ N(0, 1), comparison records with x_i ~ N(0, cmpSD_i²), the
// same label model, and exact log-ratios (the comparison side's negated).
func randomLabelSides(seed uint64, n int, cmpSD [2]float64) (ref, cmp *sideEstimate) {
	draw := func(sd [2]float64, side Side, stream uint64) *sideEstimate {
		rng := rand.New(rand.NewPCG(seed, stream))
		y, s := make([]float64, n), make([]float64, n)
		logr := [][]float64{make([]float64, n), make([]float64, n)}
		for r := 0; r < n; r++ {
			var sum float64
			for i, c := range cmpSD {
				x := sd[i] * rng.NormFloat64()
				sum += x
				logr[i][r] = -math.Log(c) - x*x/(2*c*c) + x*x/2
			}
			s[r] = 1 / (1 + math.Exp(-sum))
			y[r] = pick01(rng.Float64() < 1/(1+math.Exp(0.5-sum)))
		}
		return newSideEstimate(side, y, s, logr)
	}
	return draw([2]float64{1, 1}, SideReference, 7), draw(cmpSD, SideComparison, 8)
}

// The residual's delta-method standard error (residualSE) must match the
// spread of the residual over independent draws with exact ratios (Monte
// Carlo, 300 draws; a ratio outside [0.85, 1.15] means a wrong variance),
// for the metric-level and the per-coalition combinations.
func TestResidualSEMatchesMonteCarlo(t *testing.T) {
	if testing.Short() {
		t.Skip("300 draws")
	}
	const draws, n = 300, 1500
	names := []string{metrics.NameFNR, metrics.NameBrier}
	opt := Options{Threshold: 1 / (1 + math.Exp(-1)), ECEBins: metrics.DefaultECEBins}
	for _, mix := range []Mix{MixMetricVariance, MixCoalition} {
		res := make([][]float64, len(names))
		v2 := make([]float64, len(names))
		for d := 0; d < draws; d++ {
			ref, cmp := randomLabelSides(uint64(500+d), n, [2]float64{0.8, 1.2})
			sides := []*sideEstimate{ref, cmp}
			mds := make([]MetricDecomposition, len(names))
			for m, name := range names {
				mds[m].Metric = name
			}
			if err := splitGapsSides(mds, sides, opt, mix, true); err != nil {
				t.Fatal(err)
			}
			for m, md := range mds {
				// The observed gap: the comparison side's M(N) minus the
				// reference side's M(∅), both unweighted.
				gap := observedGap(t, ref, cmp, md.Metric, opt)
				res[m] = append(res[m], gap-md.Estimated)
				v2[m] += *md.ResidualSE * *md.ResidualSE / draws
			}
		}
		for m, name := range names {
			_, _, sd := moments(res[m])
			r := math.Sqrt(v2[m]) / sd
			t.Logf("%s %s: RMS residual SE / SD %.3f", mix, name, r)
			if r < 0.85 || r > 1.15 {
				t.Errorf("%s %s: RMS residual SE / Monte Carlo SD = %.3f", mix, name, r)
			}
		}
	}
}

// observedGap is metric name on cmp's records minus on ref's, unweighted.
func observedGap(t *testing.T, ref, cmp *sideEstimate, name string, opt Options) float64 {
	t.Helper()
	a, err := metrics.Compute(name, ref.y, ref.s, opt.Threshold, opt.ECEBins, nil)
	if err != nil {
		t.Fatal(err)
	}
	b, err := metrics.Compute(name, cmp.y, cmp.s, opt.Threshold, opt.ECEBins, nil)
	if err != nil {
		t.Fatal(err)
	}
	return b - a
}
