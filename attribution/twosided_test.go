package attribution

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

func TestParseSide(t *testing.T) {
	for _, s := range []Side{SideReference, SideComparison, SideBoth} {
		got, err := ParseSide(s.String())
		if err != nil || got != s {
			t.Errorf("ParseSide(%q) = %v, %v", s.String(), got, err)
		}
	}
	if _, err := ParseSide("left"); err == nil {
		t.Error("unknown side accepted")
	}
	if SideDefault.resolve() != DefaultSide {
		t.Error("SideDefault does not resolve to DefaultSide")
	}
}

// gaussianSides draws two independent root mechanisms x1, x2 with standard
// deviation 1 in the reference group and cmpSD[i] in the comparison group,
// and returns each group's labels, scores σ(x1 + x2) and exact log-ratios
// log r_i(x) = log N(x; 0, cmpSD²) − log N(x; 0, 1).
func gaussianSides(seed uint64, n int, cmpSD [2]float64) (ref, cmp *sideEstimate) {
	rng := rand.New(rand.NewPCG(seed, 3))
	draw := func(sd [2]float64, side Side) *sideEstimate {
		y := make([]float64, n)
		s := make([]float64, n)
		logr := [][]float64{make([]float64, n), make([]float64, n)}
		for r := 0; r < n; r++ {
			var sum float64
			for i := 0; i < 2; i++ {
				x := sd[i] * rng.NormFloat64()
				sum += x
				c := cmpSD[i]
				logr[i][r] = -math.Log(c) - x*x/(2*c*c) + x*x/2
			}
			s[r] = 1 / (1 + math.Exp(-sum))
			y[r] = float64(r % 2)
		}
		return newSideEstimate(side, y, s, logr)
	}
	return draw([2]float64{1, 1}, SideReference), draw(cmpSD, SideComparison)
}

// The selection rate at threshold σ(1) of the hybrid S is
// P(x1 + x2 ≥ 1) = 1 − Φ(1/√(s1² + s2²)) with s_i = cmpSD[i] for i ∈ S and 1
// otherwise (analytic: a sum of independent normals is normal). Each side
// must recover it when its weights have finite variance; the combination
// must recover it in all cases, including a mechanism wider in the
// comparison group (sd 1.6 ≥ √2: reference weights of infinite variance)
// and one narrower (sd 0.65: comparison weights of infinite variance).
func TestSidesAgainstGaussianTruth(t *testing.T) {
	const n = 200_000
	threshold := 1 / (1 + math.Exp(-1))
	names := []string{metrics.NameSelectionRate}
	tests := []struct {
		name  string
		sd    [2]float64
		sides []Side // which estimates must be accurate
	}{
		{"both finite", [2]float64{0.8, 1.2}, []Side{SideReference, SideComparison, SideBoth}},
		{"comparison wider", [2]float64{1.6, 1}, []Side{SideComparison, SideBoth}},
		{"comparison narrower", [2]float64{0.65, 1}, []Side{SideReference, SideBoth}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			ref, cmp := gaussianSides(7, n, tc.sd)
			for _, side := range tc.sides {
				sides := map[Side][]*sideEstimate{SideReference: {ref}, SideComparison: {cmp}, SideBoth: {ref, cmp}}[side]
				vals, err := hybridAll(sides, names, threshold, EngineOptions{})
				if err != nil {
					t.Fatal(err)
				}
				for S := 0; S < 4; S++ {
					v := 0.0
					for i := 0; i < 2; i++ {
						sd := 1.0
						if S&(1<<i) != 0 {
							sd = tc.sd[i]
						}
						v += sd * sd
					}
					want := 0.5 * math.Erfc(1/math.Sqrt(v)/math.Sqrt2) // 1 − Φ(1/√v)
					if got := vals[0][S]; math.Abs(got-want) > 0.01 {
						t.Errorf("%v, S=%b: selection rate %.4f, want %.4f (analytic)", side, S, got, want)
					}
				}
			}
		})
	}
}

// On the comparison side the grand coalition carries unit weights, so
// M̂(P_N) is the observed comparison metric (by definition of the design),
// and the reference side's M̂(P_∅) is the observed reference metric.
func TestSidesObservedEnds(t *testing.T) {
	ref, cmp := gaussianSides(8, 2000, [2]float64{0.8, 1.2})
	names := []string{metrics.NameFPR}
	for _, tc := range []struct {
		e *sideEstimate
		S int
	}{{ref, 0}, {cmp, 3}} {
		vals, err := hybridAll([]*sideEstimate{tc.e}, names, 0.5, EngineOptions{})
		if err != nil {
			t.Fatal(err)
		}
		want, err := metrics.Compute(metrics.NameFPR, tc.e.y, tc.e.s, 0.5, 10, nil)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(vals[0][tc.S]-want) > 1e-12 {
			t.Errorf("%v: M̂ at S=%b is %v, observed %v", tc.e.side, tc.S, vals[0][tc.S], want)
		}
	}
}

func BenchmarkHybridAll(b *testing.B) {
	ref, cmp := gaussianSides(9, 50_000, [2]float64{0.8, 1.2})
	names := []string{metrics.NameFPR, metrics.NameFNR}
	for _, tc := range []struct {
		name  string
		sides []*sideEstimate
	}{{"reference", []*sideEstimate{ref}}, {"comparison", []*sideEstimate{cmp}}, {"both", []*sideEstimate{ref, cmp}}} {
		b.Run(tc.name+"/k=2/n=50k", func(b *testing.B) {
			for b.Loop() {
				for _, e := range tc.sides {
					e.essAt = nil // measure the effective sample sizes too
				}
				if _, err := hybridAll(tc.sides, names, 0.5, EngineOptions{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
