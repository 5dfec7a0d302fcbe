package attribution_test

import (
	"math"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
)

// A metric-level mix combines two games with one weight λ, so by the
// linearity of the Shapley value (Shapley 1953, "A value for n-person
// games") every contribution must be λ·φ_ref + (1−λ)·φ_cmp of the
// one-sided decompositions (same seed, hence the same fitted ratios), and
// the agreement's differences must be φ_ref − φ_cmp. MixMechanism mixes
// per contribution, each between the two one-sided values; MixGuarded is
// either per coalition (no weight) or metric-level.
func TestMixesAreConsistentGames(t *testing.T) {
	s, mechs := twoNodeSample(3000, 0.6, 5)
	names := []string{"fnr", "brier"}
	// One fold split: the identities hold for one set of fitted ratios (the
	// mean over several splits mixes games with different λ).
	opt := attribution.Options{Threshold: 0.5, Seed: 2, Learners: []classify.Learner{classify.NewLinear()}, FoldSplits: 1}
	one := func(side attribution.Side, mix attribution.Mix) *attribution.Decomposition {
		o := opt
		o.Side, o.Mix = side, mix
		d, err := attribution.Decompose(s, mechs, names, o)
		if err != nil {
			t.Fatal(err)
		}
		return d
	}
	ref, cmp := one(attribution.SideReference, 0), one(attribution.SideComparison, 0)
	for _, mix := range attribution.Mixes() {
		d := one(attribution.SideBoth, mix)
		for m, md := range d.Metrics {
			for i, phi := range md.Contributions {
				pr, pc := ref.Metrics[m].Contributions[i], cmp.Metrics[m].Contributions[i]
				if diff := md.Agreement.Contributions[i].Value; math.Abs(diff-(pr-pc)) > 1e-12 {
					t.Errorf("%s %s φ_%d: agreement difference %v, want %v", mix, md.Metric, i, diff, pr-pc)
				}
				switch {
				case mix == attribution.MixGuarded && md.ReferenceWeight == nil:
					// the sides agree: combined per coalition.
				case mix == attribution.MixCoalition:
					if md.ReferenceWeight != nil {
						t.Errorf("%s: reference weight %v, want none", mix, *md.ReferenceWeight)
					}
				case mix == attribution.MixMechanism:
					if lo, hi := math.Min(pr, pc), math.Max(pr, pc); phi < lo-1e-12 || phi > hi+1e-12 {
						t.Errorf("%s %s φ_%d = %v outside the one-sided values [%v, %v]", mix, md.Metric, i, phi, lo, hi)
					}
				default:
					l := *md.ReferenceWeight
					if want := l*pr + (1-l)*pc; l < 0 || l > 1 || math.Abs(phi-want) > 1e-12 {
						t.Errorf("%s %s φ_%d = %v, want λ·φ_ref + (1−λ)·φ_cmp = %v (λ %v)", mix, md.Metric, i, phi, want, l)
					}
				}
			}
		}
	}
}
