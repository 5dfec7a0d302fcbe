package attribution_test

import (
	"math"
	"reflect"
	"testing"

	"gonum.org/v1/gonum/stat"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
)

func TestDefaultFoldSplits(t *testing.T) {
	// The defaults are ours (measured, see DefaultFoldSplits); the table
	// pins the size boundaries: the smaller group decides.
	for _, tc := range []struct{ nRef, nCmp, want int }{
		{170, 170, attribution.SplitsMany},
		{50_000, 1_999, attribution.SplitsMany},
		{2_000, 2_000, attribution.SplitsSome},
		{9_999, 80_000, attribution.SplitsSome},
		{10_000, 10_000, 1},
		{200_000, 150_000, 1},
	} {
		if got := attribution.DefaultFoldSplits(tc.nRef, tc.nCmp); got != tc.want {
			t.Errorf("DefaultFoldSplits(%d, %d) = %d, want %d", tc.nRef, tc.nCmp, got, tc.want)
		}
	}
}

// Split 0 is the single-split estimate; the others must differ from it and
// from each other, and from the bootstrap replicates' seeds
// Seed ^ (b+1)·0x9e3779b97f4a7c15 (replicateRefit), so that no split
// repeats a replicate's fold assignment (no outside source needed: a
// property of our seeding).
func TestSplitSeedDistinct(t *testing.T) {
	for _, seed := range []uint64{0, 1, 7, 1 << 40} {
		if got := attribution.SplitSeed(seed, 0); got != seed {
			t.Errorf("SplitSeed(%d, 0) = %d, want the seed itself", seed, got)
		}
		seen := map[uint64]int{}
		for b := 0; b < 10_000; b++ {
			seen[seed^uint64(b+1)*0x9e3779b97f4a7c15] = -1
		}
		for r := 1; r <= 100; r++ {
			z := attribution.SplitSeed(seed, r)
			if prev, dup := seen[z]; dup || z == seed {
				t.Fatalf("seed %d: split %d's seed %d repeats %d (-1: a replicate's)", seed, r, z, prev)
			}
			seen[z] = r
		}
	}
}

// Decompose with R fold splits must report the mean of the R single-split
// estimates seeded by SplitSeed, their standard deviation (checked against
// gonum's stat.Mean and stat.StdDev, the n−1 estimator), and keep the
// efficiency identity Σφ + residual = gap (Shapley 1953).
func TestDecomposeFoldSplitsIsMeanOfSplits(t *testing.T) {
	s, mechs := twoNodeSample(300, 0.6, 3)
	learners := []classify.Learner{classify.NewLinear(), classify.NewExpanded()}
	names := []string{"fnr", "brier"}
	const R = 4
	opt := attribution.Options{Threshold: 0.5, Seed: 11, Learners: learners, FoldSplits: R}
	d, err := attribution.Decompose(s, mechs, names, opt)
	if err != nil {
		t.Fatal(err)
	}
	if d.FoldSplits != R {
		t.Fatalf("FoldSplits = %d, want %d", d.FoldSplits, R)
	}
	single := make([]*attribution.Decomposition, R)
	for r := range single {
		o := opt
		o.Seed, o.FoldSplits = attribution.SplitSeed(opt.Seed, r), 1
		if single[r], err = attribution.Decompose(s, mechs, names, o); err != nil {
			t.Fatal(err)
		}
	}
	if !reflect.DeepEqual(d.Mechanisms, single[0].Mechanisms) {
		t.Error("diagnostics are not those of split 0")
	}
	for m, md := range d.Metrics {
		for i, got := range md.Contributions {
			x := make([]float64, R)
			for r := range single {
				x[r] = single[r].Metrics[m].Contributions[i]
			}
			if want := stat.Mean(x, nil); math.Abs(got-want) > 1e-12 {
				t.Errorf("%s φ_%d = %v, mean of the splits %v", md.Metric, i, got, want)
			}
			if want := stat.StdDev(x, nil); math.Abs(md.SplitSD[i]-want) > 1e-12 {
				t.Errorf("%s split SD_%d = %v, gonum %v", md.Metric, i, md.SplitSD[i], want)
			}
		}
		var sum float64
		for _, phi := range md.Contributions {
			sum += phi
		}
		if math.Abs(sum+md.Residual-md.Gap) > 1e-12 {
			t.Errorf("%s: Σφ %v + residual %v ≠ gap %v", md.Metric, sum, md.Residual, md.Gap)
		}
	}
	one := opt
	one.FoldSplits = 1
	d1, err := attribution.Decompose(s, mechs, names, one)
	if err != nil {
		t.Fatal(err)
	}
	if d1.FoldSplits != 1 || d1.Metrics[0].SplitSD != nil || !reflect.DeepEqual(d1.Metrics, single[0].Metrics) {
		t.Error("one fold split is not the single-split estimate at the seed")
	}
}

// Splits run in parallel and write their own slots, so neither the point
// estimate nor the intervals (replicates spread over the splits) may depend
// on the number of workers (determinism is a product requirement).
func TestFoldSplitsDeterministicAcrossWorkers(t *testing.T) {
	s, mechs := twoNodeSample(250, 0.5, 8)
	for _, keep := range []bool{true, false} {
		var got []*attribution.Decomposition
		for _, w := range []int{1, 3} {
			opt := attribution.Options{Threshold: 0.5, Seed: 5, Learners: []classify.Learner{classify.NewLinear(), classify.NewExpanded()}, Workers: w, FoldSplits: 3}
			d, _, err := attribution.DecomposeWithIntervals(s, mechs, []string{"fpr"}, opt, attribution.BootstrapOptions{Intervals: attribution.Intervals{Replicates: 9, KeepRatios: keep}})
			if err != nil {
				t.Fatal(err)
			}
			got = append(got, d)
		}
		if !reflect.DeepEqual(got[0], got[1]) {
			t.Errorf("keep=%v: results differ between 1 and 3 workers", keep)
		}
	}
}

// With sampled Shapley values (above ExactLimit) each split draws its own
// permutations, so the Monte Carlo standard error of the mean of R splits
// is √(Σ_r se_r²)/R, the standard error of a mean of independent
// estimates (common practice).
func TestFoldSplitsPoolSampledStdErrors(t *testing.T) {
	s, mechs, err := scm.Pooled(gtCase(t, "prevalence").Model, 300, 300, 5)
	if err != nil {
		t.Fatal(err)
	}
	const R = 3
	opt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: 2, Learners: []classify.Learner{classify.NewLinear()}, ExactLimit: 2, FoldSplits: R}
	d, err := attribution.Decompose(s, mechs, []string{"fnr"}, opt)
	if err != nil {
		t.Fatal(err)
	}
	want := make([]float64, len(mechs))
	for r := 0; r < R; r++ {
		o := opt
		o.Seed, o.FoldSplits = attribution.SplitSeed(opt.Seed, r), 1
		dr, err := attribution.Decompose(s, mechs, []string{"fnr"}, o)
		if err != nil {
			t.Fatal(err)
		}
		for i, se := range dr.Metrics[0].StdErrors {
			want[i] += se * se
		}
	}
	for i, got := range d.Metrics[0].StdErrors {
		if w := math.Sqrt(want[i]) / R; math.Abs(got-w) > 1e-15 || got == 0 {
			t.Errorf("std error %d = %v, want %v", i, got, w)
		}
	}
}
