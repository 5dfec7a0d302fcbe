package attribution

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

// randomReference draws n synthetic reference records and k log-ratio
// vectors with standard deviation spread.
func randomReference(seed uint64, n, k int, spread float64) (labels, scores []float64, logr [][]float64) {
	rng := rand.New(rand.NewPCG(seed, 7))
	labels = make([]float64, n)
	scores = make([]float64, n)
	for r := range labels {
		if rng.Float64() < 0.35 {
			labels[r] = 1
		}
		scores[r] = math.Min(1, math.Max(0, 0.3*labels[r]+0.35+0.25*rng.NormFloat64()))
	}
	logr = make([][]float64, k)
	for i := range logr {
		logr[i] = make([]float64, n)
		for r := range logr[i] {
			logr[i][r] = spread*rng.NormFloat64() + 0.2*labels[r]*float64(i%3-1)
		}
	}
	return
}

// bruteForce computes metric name under coalition S directly: weights
// w = exp(Σ_{i∈S} clip(log r_i)) and metrics.Stats built record by record
// (or metrics.AUC for AUC), the definition EvaluateCoalitions must match.
func bruteForce(t *testing.T, labels, scores []float64, threshold float64, logr [][]float64, name string, S uint64, bins int) float64 {
	t.Helper()
	w := make([]float64, len(labels))
	for r := range w {
		var l float64
		for i := range logr {
			if S&(1<<i) != 0 {
				l += math.Max(-ClipLogRatio, math.Min(ClipLogRatio, logr[i][r]))
			}
		}
		w[r] = math.Exp(l)
	}
	if name == metrics.NameAUC {
		v, err := metrics.AUC(labels, scores, w)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	if name != metrics.NameECE {
		bins = 1
	}
	st := metrics.NewStats(bins)
	for r := range w {
		st.Add(labels[r], scores[r], threshold, w[r])
	}
	v, err := st.Value(name)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func relClose(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}

// TestEvaluateCoalitionsBruteForce checks every coalition's value against
// the direct per-coalition computation (reference: metrics.Stats and
// metrics.AUC applied to explicit weights, which the metrics package tests
// against scikit-learn).
func TestEvaluateCoalitionsBruteForce(t *testing.T) {
	all := metrics.Names()
	tests := []struct {
		name      string
		k, n      int
		spread    float64
		threshold float64
		metrics   []string
		bins      int
		passLimit int
	}{
		{"k0 all metrics", 0, 300, 1, 0.5, all, 0, 0},
		{"k1 all metrics", 1, 300, 1, 0.5, all, 0, 0},
		{"k3 fnr", 3, 700, 1, 0.55, []string{metrics.NameFNR}, 0, 0},
		{"k4 all metrics, 7 ece bins", 4, 900, 1, 0.45, all, 7, 0},
		{"k5 rates", 5, 1000, 0.7, 0.5, []string{metrics.NameFPR, metrics.NamePPV, metrics.NameNPV, metrics.NameAccuracy}, 0, 0},
		{"k6 scoring rules", 6, 1200, 0.8, 0.5, []string{metrics.NameBrier, metrics.NameLogLoss, metrics.NameCalibrationInTheLarge, metrics.NameECE}, 0, 0},
		{"k6 clipped extreme ratios", 6, 800, 40, 0.5, []string{metrics.NameFNR, metrics.NameBrier, metrics.NameAUC}, 0, 0},
		{"k6 several passes", 6, 800, 1, 0.5, all, 0, 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if tc.passLimit > 0 {
				old := passByteLimit
				passByteLimit = tc.passLimit
				defer func() { passByteLimit = old }()
			}
			labels, scores, logr := randomReference(uint64(tc.k*1000+tc.n), tc.n, tc.k, tc.spread)
			g, err := EvaluateCoalitions(labels, scores, tc.threshold, logr, tc.metrics, EngineOptions{Workers: 2, ECEBins: tc.bins})
			if err != nil {
				t.Fatal(err)
			}
			if g.K != tc.k || len(g.Values) != len(tc.metrics) {
				t.Fatalf("got K=%d with %d metrics", g.K, len(g.Values))
			}
			bins := tc.bins
			if bins == 0 {
				bins = metrics.DefaultECEBins
			}
			for m, name := range tc.metrics {
				if len(g.Values[m]) != 1<<tc.k {
					t.Fatalf("%s: %d values, want %d", name, len(g.Values[m]), 1<<tc.k)
				}
				for S := range g.Values[m] {
					want := bruteForce(t, labels, scores, tc.threshold, logr, name, uint64(S), bins)
					if got := g.Values[m][S]; !relClose(got, want, 1e-9) {
						t.Errorf("%s under S=%b: got %.15g, brute force %.15g", name, S, got, want)
					}
				}
			}
		})
	}
}

// TestEvaluateCoalitionsHandComputed checks a case small enough to do by
// hand (analytic ground truth). Three events with scores 0.2, 0.7, 0.9 and
// threshold 0.5: the first is a false negative. One mechanism with
// r = (4, 1, 1) on the events: unweighted FNR = 1/3, weighted 4/6 = 2/3.
func TestEvaluateCoalitionsHandComputed(t *testing.T) {
	labels := []float64{1, 1, 1, 0}
	scores := []float64{0.2, 0.7, 0.9, 0.1}
	logr := [][]float64{{math.Log(4), 0, 0, math.Log(5)}}
	g, err := EvaluateCoalitions(labels, scores, 0.5, logr, []string{metrics.NameFNR, metrics.NameSelectionRate}, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	want := [][]float64{
		{1.0 / 3, 2.0 / 3},               // FNR: 1/3, then 4/(4+1+1)
		{2.0 / 4, 2.0 / (4 + 1 + 1 + 5)}, // selection rate: 2 of 4, then (1+1)/11
	}
	for m := range want {
		for S := range want[m] {
			if !relClose(g.Values[m][S], want[m][S], 1e-14) {
				t.Errorf("%s S=%d: got %v, want %v", g.Metrics[m], S, g.Values[m][S], want[m][S])
			}
		}
	}
}

// TestEvaluateCoalitionsDeterministic requires bit-identical values for any
// number of workers.
func TestEvaluateCoalitionsDeterministic(t *testing.T) {
	labels, scores, logr := randomReference(11, 3000, 10, 1)
	names := []string{metrics.NameFNR, metrics.NameBrier, metrics.NameECE, metrics.NameLogLoss, metrics.NameAUC}
	var ref *Games
	for _, w := range []int{1, 2, 3, 5} {
		g, err := EvaluateCoalitions(labels, scores, 0.5, logr, names, EngineOptions{Workers: w})
		if err != nil {
			t.Fatal(err)
		}
		if ref == nil {
			ref = g
			continue
		}
		for m := range names {
			for S := range g.Values[m] {
				if math.Float64bits(g.Values[m][S]) != math.Float64bits(ref.Values[m][S]) {
					t.Fatalf("Workers=%d: %s S=%b: %v differs from Workers=1: %v", w, names[m], S, g.Values[m][S], ref.Values[m][S])
				}
			}
		}
	}
}

func TestEvaluateCoalitionsErrors(t *testing.T) {
	labels, scores, logr := randomReference(3, 50, 2, 1)
	noEvents := make([]float64, len(labels))
	badLabel := append([]float64(nil), labels...)
	badLabel[7] = 2
	nanScore := append([]float64(nil), scores...)
	nanScore[3] = math.NaN()
	nanRatio := [][]float64{logr[0], append([]float64(nil), logr[1]...)}
	nanRatio[1][9] = math.NaN()
	tests := []struct {
		name      string
		labels    []float64
		scores    []float64
		logr      [][]float64
		metrics   []string
		opt       EngineOptions
		undefined bool
		unknown   bool
	}{
		{"no events for fnr", noEvents, scores, logr, []string{metrics.NameFNR}, EngineOptions{}, true, false},
		{"no events for auc", noEvents, scores, logr, []string{metrics.NameAUC}, EngineOptions{}, true, false},
		{"label 2", badLabel, scores, logr, []string{metrics.NameFPR}, EngineOptions{}, false, false},
		{"NaN score", labels, nanScore, logr, []string{metrics.NameFPR}, EngineOptions{}, false, false},
		{"NaN log-ratio", labels, scores, nanRatio, []string{metrics.NameFPR}, EngineOptions{}, false, false},
		{"unknown metric", labels, scores, logr, []string{"f1"}, EngineOptions{}, false, true},
		{"negative workers", labels, scores, logr, []string{metrics.NameFPR}, EngineOptions{Workers: -1}, false, false},
		{"negative bins", labels, scores, logr, []string{metrics.NameECE}, EngineOptions{ECEBins: -2}, false, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := EvaluateCoalitions(tc.labels, tc.scores, 0.5, tc.logr, tc.metrics, tc.opt)
			if err == nil {
				t.Fatal("no error")
			}
			if got := errors.Is(err, metrics.ErrUndefined); got != tc.undefined {
				t.Errorf("errors.Is(ErrUndefined) = %v for %v", got, err)
			}
			var ce *CoalitionError
			if tc.undefined && (!errors.As(err, &ce) || ce.Metric != tc.metrics[0]) {
				t.Errorf("want a CoalitionError naming %s, got %v", tc.metrics[0], err)
			}
			if got := errors.Is(err, ErrUnsupportedMetric); got != tc.unknown {
				t.Errorf("errors.Is(ErrUnsupportedMetric) = %v for %v", got, err)
			}
		})
	}
}

func TestEvaluateCoalitionsPanicsOnLengthMismatch(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("no panic")
		}
	}()
	EvaluateCoalitions([]float64{0, 1}, []float64{0.1, 0.9}, 0.5, [][]float64{{0}}, []string{metrics.NameFPR}, EngineOptions{})
}

// TestEvaluateCoalitionsLargeK checks random coalitions of an 18-mechanism
// game (many tiles, several passes) against the brute-force definition.
func TestEvaluateCoalitionsLargeK(t *testing.T) {
	if testing.Short() {
		t.Skip("2^18 coalitions")
	}
	old := passByteLimit
	passByteLimit = 2 << 20
	defer func() { passByteLimit = old }()
	k := 18
	labels, scores, logr := randomReference(20, 600, k, 0.4)
	names := []string{metrics.NameFNR, metrics.NameBrier, metrics.NameECE}
	g, err := EvaluateCoalitions(labels, scores, 0.5, logr, names, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(1, 20))
	for c := 0; c < 150; c++ {
		S := uint64(rng.IntN(1 << k))
		if c == 0 {
			S = 1<<k - 1
		}
		for m, name := range names {
			want := bruteForce(t, labels, scores, 0.5, logr, name, S, metrics.DefaultECEBins)
			if got := g.Values[m][S]; !relClose(got, want, 1e-9) {
				t.Errorf("%s S=%b: got %.15g, brute force %.15g", name, S, got, want)
			}
		}
	}
}
