package attribution_test

import (
	"slices"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
)

// Two graphs over the same columns (x → z, and both roots) share the
// column set {x}: the root x's classifier. With a FitCache naming it, the
// second graph's ratios must be those it estimates alone, bit for bit
// where the learner does not depend on its seed (the linear learner's
// fit is deterministic given its data), and the cache must hold that one
// fit and no other.
func TestFitCacheSharesAColumnSet(t *testing.T) {
	s := gaussianShift(1500, 0.5, 4)
	s.Features = []string{"x", "z"}
	chain := []attribution.Mechanism{
		{Node: "x", NodeCols: []int{0}},
		{Node: "z", Parents: []string{"x"}, NodeCols: []int{1}, ParentCols: []int{0}},
	}
	roots := []attribution.Mechanism{
		{Node: "z", NodeCols: []int{1}},
		{Node: "x", NodeCols: []int{0}},
	}
	sets := attribution.FitColumnSets(s, chain)
	want := [][]string{{"x"}, {"x", "z"}}
	if len(sets) != len(want) || !slices.Equal(sets[0], want[0]) || !slices.Equal(sets[1], want[1]) {
		t.Fatalf("FitColumnSets(chain) = %v, want %v", sets, want)
	}
	opt := attribution.RatioOptions{Folds: 5, Seed: 3, Learners: []classify.Learner{classify.NewLinear()}, Workers: 2}
	alone, err := attribution.EstimateRatios(s, roots, opt)
	if err != nil {
		t.Fatal(err)
	}
	opt.Fits = attribution.NewFitCache([][]string{{"x"}}, false)
	if _, err := attribution.EstimateRatios(s, chain, opt); err != nil {
		t.Fatal(err)
	}
	if n := opt.Fits.Len(); n != 1 {
		t.Fatalf("cache holds %d fits after the chain, want 1 ({x})", n)
	}
	shared, err := attribution.EstimateRatios(s, roots, opt)
	if err != nil {
		t.Fatal(err)
	}
	if h := opt.Fits.Hits(); h != 1 {
		t.Fatalf("the roots took %d fits from the cache, want 1 ({x})", h)
	}
	for i := range roots {
		if !slices.Equal(alone[i].LogRatio, shared[i].LogRatio) {
			t.Errorf("mechanism %s: log-ratios with the shared fit differ from its own fit", roots[i].Node)
		}
	}
	// A cache guards its records: other seeds (fold assignment) must not
	// take the chain's fit.
	opt.Seed = 4
	if _, err := attribution.EstimateRatios(s, roots, opt); err != nil {
		t.Fatal(err)
	}
	if n, h := opt.Fits.Len(), opt.Fits.Hits(); n != 2 || h != 1 {
		t.Errorf("after another seed the cache holds %d fits with %d hits, want 2 and 1", n, h)
	}
}
