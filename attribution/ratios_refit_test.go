package attribution

import (
	"reflect"
	"testing"

	"github.com/gapwise/gapwise/attribution/classify"
)

// TestRefitLearner: bootstrap replicates grow the rounded mean of the
// rounds early stopping kept on the folds that were fitted, without a
// validation split; other learners, and boosted learners whose settings
// need the split, are refitted as they are.
func TestRefitLearner(t *testing.T) {
	b := classify.NewBoosted()
	fixed := b
	fixed.Rounds = 55 // (102+43+48+25)/4 = 54.5, rounded half away from zero
	fixed.ValidationFraction = 0
	calibrated := b
	calibrated.Calibrate = true
	noSplit := b
	noSplit.ValidationFraction = 0
	for _, c := range []struct {
		name   string
		in     classify.Learner
		rounds []int
		want   classify.Learner
	}{
		{"boosted", b, []int{102, 43, 0, 48, 25}, fixed},
		{"not fitted", b, []int{0, 0, 0, 0, 0}, b},
		{"calibrated", calibrated, []int{10, 20, 30, 40, 50}, calibrated},
		{"no split", noSplit, []int{200, 200, 200, 200, 200}, noSplit},
		{"linear", classify.NewLinear(), []int{0, 0, 0, 0, 0}, classify.NewLinear()},
	} {
		if got := refitLearner(c.in, c.rounds); !reflect.DeepEqual(got, c.want) {
			t.Errorf("%s: refitLearner = %+v, want %+v", c.name, got, c.want)
		}
	}
}
