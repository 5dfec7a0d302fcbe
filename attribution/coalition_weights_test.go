package attribution

import (
	"math"
	"math/bits"
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

// logNormalRatios draws k independent log-ratio vectors log r_i ~
// N(−σ_i²/2, σ_i²), so that E[r_i] = 1.
func logNormalRatios(seed uint64, n int, sigma []float64) [][]float64 {
	rng := rand.New(rand.NewPCG(seed, 11))
	logr := make([][]float64, len(sigma))
	for i, s := range sigma {
		logr[i] = make([]float64, n)
		for r := range logr[i] {
			logr[i][r] = s*rng.NormFloat64() - s*s/2
		}
	}
	return logr
}

// For log-normal weights log w ~ N(μ, σ²), E[w]²/E[w²] =
// exp(2μ+σ²)/exp(2μ+2σ²) = exp(−σ²) (analytic moments of the log-normal
// distribution), so n_eff(S)/n → exp(−Σ_{i∈S} σ_i²) for independent
// mechanisms.
func TestCoalitionWeightsLogNormal(t *testing.T) {
	const n = 200_000
	for _, sigma := range [][]float64{
		{0.1, 0.3, 0.5, 0.2},
		{0.1, 0.2, 0.15, 0.2, 0.1, 0.25, 0.05, 0.1, 0.2, 0.15},
	} {
		t.Run(strconv.Itoa(len(sigma)), func(t *testing.T) {
			logr := logNormalRatios(3, n, sigma)
			ls, lss, err := CoalitionWeights(logr, EngineOptions{})
			if err != nil {
				t.Fatal(err)
			}
			for S := range ls {
				var v float64
				for i := range sigma {
					if S&(1<<i) != 0 {
						v += sigma[i] * sigma[i]
					}
				}
				want := math.Exp(-v) // analytic log-normal moments
				got := ESSFromLogSums(ls[S], lss[S]) / n
				if math.Abs(got-want) > 0.02*want {
					t.Errorf("S=%#b: n_eff/n = %.4f, want %.4f", S, got, want)
				}
				// Σw/n → E[w_S] = 1 (analytic).
				if m := math.Exp(ls[S]) / n; math.Abs(m-1) > 0.01 {
					t.Errorf("S=%#b: mean weight %.4f, want 1", S, m)
				}
			}
		})
	}
}

// Worked by hand: weights (1, 2, 3) give Σw = 6, Σw² = 14, n_eff = 36/14,
// largest share 3/6; the coalition of both mechanisms has weights
// (1·2, 2·0.5, 3·1) = (2, 1, 3) with the same sums.
func TestCoalitionWeightsByHand(t *testing.T) {
	logr := [][]float64{
		{0, math.Log(2), math.Log(3)},
		{math.Log(2), math.Log(0.5), 0},
	}
	ls, lss, err := CoalitionWeights(logr, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		S          uint64
		sum, sumSq float64
	}{
		{0, 3, 3},      // all weights 1
		{1, 6, 14},     // (1, 2, 3)
		{2, 3.5, 5.25}, // (2, 0.5, 1)
		{3, 6, 14},     // (2, 1, 3)
	} {
		if got := math.Exp(ls[tc.S]); math.Abs(got-tc.sum) > 1e-12 {
			t.Errorf("S=%d: Σw = %v, want %v", tc.S, got, tc.sum)
		}
		if got := math.Exp(lss[tc.S]); math.Abs(got-tc.sumSq) > 1e-12 {
			t.Errorf("S=%d: Σw² = %v, want %v", tc.S, got, tc.sumSq)
		}
	}
	cw := SomeCoalitionWeights(logr, []uint64{1, 3})
	for _, c := range cw {
		if math.Abs(c.ESS-36.0/14) > 1e-12 || math.Abs(c.MaxShare-0.5) > 1e-12 {
			t.Errorf("S=%d: %+v, want n_eff 36/14 and share 1/2", c.Coalition, c)
		}
	}
}

// The product path must agree with a record-by-record sum in float64 (the
// definition) up to rounding, including weights near the clip bound, and
// must not depend on the number of workers.
func TestCoalitionWeightsProductMatchesDefinition(t *testing.T) {
	_, _, logr := randomReference(5, 3000, 11, 2.5)
	logr[3][17] = 80 // clipped to ClipLogRatio
	ls, lss, err := CoalitionWeights(logr, EngineOptions{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	ls4, lss4, err := CoalitionWeights(logr, EngineOptions{Workers: 4})
	if err != nil {
		t.Fatal(err)
	}
	for S := range ls {
		if ls[S] != ls4[S] || lss[S] != lss4[S] {
			t.Fatalf("S=%#b: depends on workers", S)
		}
	}
	for _, S := range []uint64{0, 1, 1 << 3, 0x2a5, 1<<11 - 1} {
		var m float64 = math.Inf(-1)
		lw := make([]float64, len(logr[0]))
		for r := range lw {
			for i := range logr {
				if S&(1<<i) != 0 {
					lw[r] += math.Max(-ClipLogRatio, math.Min(ClipLogRatio, logr[i][r]))
				}
			}
			m = math.Max(m, lw[r])
		}
		var s1, s2 float64
		for _, x := range lw {
			s1 += math.Exp(x - m)
			s2 += math.Exp(2 * (x - m))
		}
		if d := math.Abs(ls[S] - (math.Log(s1) + m)); d > 1e-9 {
			t.Errorf("S=%#b (|S|=%d): log Σw off by %g", S, bits.OnesCount64(S), d)
		}
		if d := math.Abs(lss[S] - (math.Log(s2) + 2*m)); d > 1e-9 {
			t.Errorf("S=%#b: log Σw² off by %g", S, d)
		}
	}
}

func TestCoalitionWeightsErrors(t *testing.T) {
	if _, _, err := CoalitionWeights(nil, EngineOptions{}); err == nil {
		t.Error("no mechanisms accepted")
	}
	if _, _, err := CoalitionWeights([][]float64{{0, math.NaN()}}, EngineOptions{}); err == nil {
		t.Error("NaN accepted")
	}
}

func BenchmarkCoalitionWeights(b *testing.B) {
	for _, k := range []int{6, 8, 10, 16} {
		_, _, logr := randomReference(9, 50_000, k, 0.5)
		b.Run(benchName("k", k)+"/n=50k", func(b *testing.B) {
			for b.Loop() {
				if _, _, err := CoalitionWeights(logr, EngineOptions{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func TestExtremeShare(t *testing.T) {
	l20 := math.Log(20)
	// 2 of 8 weights above 20; ln 20 itself is not extreme, and weights
	// near 0 (−4, −ln 20) do not count (by hand).
	x := []float64{0, l20, -l20, l20 + 1e-9, -4, 7, 1, -1}
	if got := ExtremeShare(x); got != 2.0/8 {
		t.Errorf("ExtremeShare = %v, want 2/8", got)
	}
	if math.Abs(ExtremeLogRatio-l20) > 1e-15 {
		t.Errorf("ExtremeLogRatio %v is not ln 20 = %v", ExtremeLogRatio, l20)
	}
}

// Records are sorted by key and cut into 5 strata of 20; ratios average 1
// in four strata and 2 (or 0.4) in the highest-key one (by hand), so that
// stratum's mean is the worst. Without a key all 100 records form one
// stratum, mean (80 + 20·2)/100 = 1.2.
func TestWorstStratumMean(t *testing.T) {
	for _, top := range []float64{2, 0.4} {
		logr := make([]float64, 100)
		key := make([]float64, 100)
		for r := range logr {
			key[r] = float64((r * 37) % 100) // a permutation of 0..99
			if key[r] >= 80 {
				logr[r] = math.Log(top)
			} else if r%2 == 0 {
				logr[r] = math.Log(1.5) // pairs 1.5, 0.5: mean 1
			} else {
				logr[r] = math.Log(0.5)
			}
		}
		if got := WorstStratumMean(logr, key); math.Abs(got-top) > 1e-12 {
			t.Errorf("top %v: worst stratum mean %v", top, got)
		}
		if got, want := WorstStratumMean(logr, nil), (80+20*top)/100; math.Abs(got-want) > 1e-12 {
			t.Errorf("no key: %v, want %v", got, want)
		}
	}
}

// FNR counts the positives only: with unit weights on positives and wildly
// varying weights on negatives, the reference side's far-end n_eff for FNR is
// the number of positives; selection rate counts every record (by hand).
func TestEffectiveRecords(t *testing.T) {
	y := []float64{1, 1, 1, 1, 0, 0}
	s := []float64{0.9, 0.2, 0.7, 0.1, 0.3, 0.8}
	logr := [][]float64{{0, 0, 0, 0, math.Log(3), 0}, {0, 0, 0, 0, 0, math.Log(5)}}
	mds := []MetricDecomposition{{Metric: metrics.NameFNR}, {Metric: metrics.NameSelectionRate}}
	effectiveRecords(mds, []*sideEstimate{newSideEstimate(SideReference, y, s, logr)}, Options{Threshold: 0.5, ECEBins: 10})
	if mds[0].EffectiveRecords != 4 {
		t.Errorf("fnr: %v effective records, want 4", mds[0].EffectiveRecords)
	}
	// weights 1,1,1,1,3,5: (12)²/(4+9+25) = 144/38.
	if got := mds[1].EffectiveRecords; math.Abs(got-144.0/38) > 1e-12 {
		t.Errorf("selection rate: %v effective records, want 144/38", got)
	}
}
