package attribution

import (
	"reflect"
	"testing"

	"github.com/gapwise/gapwise/attribution/classify"
)

// TestRefitLearner: bootstrap replicates grow the rounded mean of the
// rounds early stopping kept on the folds that were fitted, without a
// validation split, from the Start learner when most of those folds kept
// it; other learners, and boosted learners whose settings need the split,
// are refitted as they are.
func TestRefitLearner(t *testing.T) {
	b := classify.NewBoosted()
	fixed := b
	fixed.Rounds = 55 // (102+43+48+25)/4 = 54.5, rounded half away from zero
	fixed.ValidationFraction = 0
	calibrated := b
	calibrated.Calibrate = true
	noSplit := b
	noSplit.ValidationFraction = 0
	unstarted := fixed
	unstarted.Start = nil
	startOnly := b
	startOnly.Rounds = 1 // folds 0 and 2 kept the start and no tree: mean 0, at least 1
	startOnly.ValidationFraction = 0
	all := []bool{true, true, true, true, true}
	none := make([]bool, 5)
	for _, c := range []struct {
		name    string
		in      classify.Learner
		rounds  []int
		started []bool
		want    classify.Learner
	}{
		{"boosted", b, []int{102, 43, 0, 48, 25}, []bool{true, true, false, true, true}, fixed},
		{"most folds without start", b, []int{102, 43, 0, 48, 25}, []bool{true, false, false, false, true}, unstarted},
		{"half the folds without start", b, []int{102, 43, 0, 48, 25}, []bool{true, false, false, true, false}, unstarted},
		{"start only", b, []int{0, 0, 0, 0, 0}, []bool{true, false, true, false, false}, startOnly},
		{"not fitted", b, []int{0, 0, 0, 0, 0}, none, b},
		{"calibrated", calibrated, []int{10, 20, 30, 40, 50}, all, calibrated},
		{"no split", noSplit, []int{200, 200, 200, 200, 200}, all, noSplit},
		{"linear", classify.NewLinear(), []int{0, 0, 0, 0, 0}, none, classify.NewLinear()},
	} {
		if got := refitLearner(c.in, c.rounds, c.started); !reflect.DeepEqual(got, c.want) {
			t.Errorf("%s: refitLearner = %+v, want %+v", c.name, got, c.want)
		}
	}
}
