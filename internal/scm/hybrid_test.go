package scm

import (
	"math"
	"runtime"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

func caseNamed(t testing.TB, name string) Case {
	for _, c := range Cases() {
		if c.Name == name {
			return c
		}
	}
	t.Fatalf("no case %q", name)
	return Case{}
}

// TestHybridMatchesIntegration checks the simulated FNR and FPR of every
// hybrid distribution of the combined case (all shift kinds at once)
// against numerical integration of the same model (screeningRates, gonum
// quadrature): analytic ground truth. Tolerance: 4.5 binomial standard
// errors √(p(1−p)/n_class) of a rate over the simulated class count
// (common practice); 2·32·2 checks at 4.5 SE fail by chance with
// probability < 0.1 %.
func TestHybridMatchesIntegration(t *testing.T) {
	c := caseNamed(t, "combined")
	n := 1 << 18
	if testing.Short() {
		n = 1 << 16
	}
	stats, err := HybridStats(c.Model, n, 7, ScreeningThreshold, 1)
	if err != nil {
		t.Fatal(err)
	}
	shifted := c.Model.ShiftedSet()
	for s := range stats {
		if Coalition(s)&^shifted != 0 {
			continue
		}
		wantFNR, wantFPR := screeningRates(c.Shift, Coalition(s))
		tp, fp, tn, fn := stats[s].Confusion()
		for _, chk := range []struct {
			name      string
			got, want float64
			count     float64
		}{
			{metrics.NameFNR, fn / (tp + fn), wantFNR, tp + fn},
			{metrics.NameFPR, fp / (fp + tn), wantFPR, fp + tn},
		} {
			se := math.Sqrt(chk.want * (1 - chk.want) / chk.count)
			if d := math.Abs(chk.got - chk.want); d > 4.5*se {
				t.Errorf("coalition %06b %s: simulated %.5f, integrated %.5f (|diff| %.5f > 4.5·SE %.5f)", s, chk.name, chk.got, chk.want, d, 4.5*se)
			}
		}
	}
}

// TestNullMechanismsExactlyZero: with common random numbers a mechanism that
// does not differ, or whose output nothing reads, changes no record, so its
// Shapley value is exactly 0 (Shapley 1953, dummy-player property).
func TestNullMechanismsExactlyZero(t *testing.T) {
	names := []string{metrics.NameFNR, metrics.NameFPR, metrics.NameCalibrationInTheLarge, metrics.NameBrier, metrics.NameECE}
	for _, c := range Cases() {
		t.Run(c.Name, func(t *testing.T) {
			truth, err := GroundTruth(c.Model, names, 1<<14, 3, ScreeningThreshold, metrics.DefaultECEBins)
			if err != nil {
				t.Fatal(err)
			}
			for _, tr := range truth {
				for _, i := range c.Null {
					if tr.Shapley[i] != 0 {
						t.Errorf("%s: null node %s has φ = %g, want exactly 0", tr.Metric, c.Model.Nodes[i].Name, tr.Shapley[i])
					}
				}
				var sum float64
				for _, p := range tr.Shapley {
					sum += p
				}
				// Efficiency (Shapley 1953): Σφ = v(N) = gap.
				if math.Abs(sum-tr.Gap) > 1e-12 {
					t.Errorf("%s: Σφ = %g, gap %g", tr.Metric, sum, tr.Gap)
				}
			}
		})
	}
}

// TestHybridStatsDeterministic: the same seed gives bit-identical statistics
// whatever GOMAXPROCS.
func TestHybridStatsDeterministic(t *testing.T) {
	m := caseNamed(t, "combined").Model
	run := func(procs int) []*metrics.Stats {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		st, err := HybridStats(m, 3*BlockSize+17, 11, ScreeningThreshold, 4)
		if err != nil {
			t.Fatal(err)
		}
		return st
	}
	a, b := run(1), run(4)
	for s := range a {
		for c := range a[s].W {
			if a[s].W[c] != b[s].W[c] || a[s].WS[c] != b[s].WS[c] || a[s].WS2[c] != b[s].WS2[c] || a[s].WL[c] != b[s].WL[c] {
				t.Fatalf("coalition %b cell %d differs between GOMAXPROCS 1 and 4", s, c)
			}
		}
	}
}

// TestHybridUsesCommonRandomNumbers: Hybrid for one coalition reproduces the
// records behind HybridStats (up to summation order).
func TestHybridUsesCommonRandomNumbers(t *testing.T) {
	m := caseNamed(t, "combined").Model
	n := 2*BlockSize + 5
	all, err := HybridStats(m, n, 5, ScreeningThreshold, 2)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range []Coalition{0, 1 << NodeDisease, 1<<NodeMarkerA | 1<<NodeAge, All(len(m.Nodes))} {
		one, err := Hybrid(m, s, n, 5, ScreeningThreshold, 2)
		if err != nil {
			t.Fatal(err)
		}
		for c := range one.W {
			if one.W[c] != all[s].W[c] || math.Abs(one.WS[c]-all[s].WS[c]) > 1e-9*math.Max(1, one.WS[c]) {
				t.Errorf("coalition %b cell %d: Hybrid W=%v WS=%v, HybridStats W=%v WS=%v", s, c, one.W[c], one.WS[c], all[s].W[c], all[s].WS[c])
			}
		}
	}
}

// TestSampleMatchesIntegration: the reference and comparison samples have
// the integrated FNR of their groups (4.5 binomial SE, common practice).
func TestSampleMatchesIntegration(t *testing.T) {
	c := caseNamed(t, "combined")
	for _, g := range []Group{Reference, Comparison} {
		rec, err := Sample(c.Model, g, 1<<16, 9)
		if err != nil {
			t.Fatal(err)
		}
		s := Coalition(0)
		if g == Comparison {
			s = All(len(c.Model.Nodes))
		}
		want, _ := screeningRates(c.Shift, s)
		got, err := metrics.FalseNegativeRate(rec.Labels, rec.Scores, ScreeningThreshold, nil)
		if err != nil {
			t.Fatal(err)
		}
		var pos float64
		for _, y := range rec.Labels {
			pos += y
		}
		if se := math.Sqrt(want * (1 - want) / pos); math.Abs(got-want) > 4.5*se {
			t.Errorf("%v FNR %.4f, integrated %.4f (4.5·SE %.4f)", g, got, want, 4.5*se)
		}
	}
}

func TestValidate(t *testing.T) {
	id := func(_ []float64, _, z float64) float64 { return z }
	coin := func(_ []float64, u, _ float64) float64 {
		if u < 0.5 {
			return 1
		}
		return 0
	}
	score := func(v []float64) float64 { return 0.5 }
	tests := []struct {
		name string
		m    Model
		ok   bool
	}{
		{"ok", Model{Nodes: []Node{{Name: "y", Kind: Binary, Reference: coin}}, Score: score}, true},
		{"no nodes", Model{Score: score}, false},
		{"no score", Model{Nodes: []Node{{Name: "y", Kind: Binary, Reference: coin}}}, false},
		{"label not binary", Model{Nodes: []Node{{Name: "y", Reference: id}}, Score: score}, false},
		{"repeated name", Model{Nodes: []Node{{Name: "y", Kind: Binary, Reference: coin}, {Name: "y", Reference: id}}, Score: score}, false},
		{"later parent", Model{Nodes: []Node{{Name: "y", Kind: Binary, Parents: []int{1}, Reference: coin}, {Name: "x", Reference: id}}, Score: score}, false},
		{"one level", Model{Nodes: []Node{{Name: "y", Kind: Binary, Reference: coin}, {Name: "c", Kind: Categorical, Levels: 1, Reference: id}}, Score: score}, false},
		{"no reference", Model{Nodes: []Node{{Name: "y", Kind: Binary, Comparison: coin}}, Score: score}, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			err := tt.m.Validate()
			if (err == nil) != tt.ok {
				t.Errorf("Validate() = %v, want ok=%v", err, tt.ok)
			}
		})
	}
}

func BenchmarkHybridStats(b *testing.B) {
	m := caseNamed(b, "combined").Model
	for i := 0; i < b.N; i++ {
		if _, err := HybridStats(m, 1<<16, 1, ScreeningThreshold, 1); err != nil {
			b.Fatal(err)
		}
	}
}
