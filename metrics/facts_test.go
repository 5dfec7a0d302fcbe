package metrics

import (
	"errors"
	"math"
	"slices"
	"testing"
)

// TestNamesAsDocumented: the facts table holds exactly the twelve metrics
// the README documents for the spec key `metrics`, in that order (Names is
// read off the table, so this is the check from outside it).
func TestNamesAsDocumented(t *testing.T) {
	want := []string{"fpr", "tpr", "fnr", "ppv", "npv", "selection_rate", "accuracy",
		"brier", "log_loss", "calibration_in_the_large", "ece", "auc"}
	if got := Names(); !slices.Equal(got, want) {
		t.Errorf("Names() = %v, want %v", got, want)
	}
}

// TestFactsMatchComputation: the facts table lists exactly the metrics
// Compute supports, each with a title, and its Counts field says exactly
// when Compute finds the metric undefined: on a sample without the
// records it counts the metric is undefined, on a mixed sample it is not.
// Threshold agrees with Confusion.Rate accepting the name.
func TestFactsMatchComputation(t *testing.T) {
	mixedY, mixedS := []float64{0, 1, 0, 1}, []float64{0.2, 0.8, 0.7, 0.3}
	without := map[Records][2][]float64{
		AllRecords:      {{}, {}},
		Negatives:       {{1, 1}, {0.2, 0.8}},
		Positives:       {{0, 0}, {0.2, 0.8}},
		DecidedPositive: {{0, 1}, {0.1, 0.2}},
		DecidedNegative: {{0, 1}, {0.7, 0.9}},
		BothClasses:     {{1, 1}, {0.2, 0.8}},
	}
	var names []string
	for _, f := range Facts() {
		names = append(names, f.Name)
		if f.Title == "" || f.UndefinedReason() == "" {
			t.Errorf("%s: empty title or reason", f.Name)
		}
		if _, err := Compute(f.Name, mixedY, mixedS, 0.5, 2, nil); err != nil {
			t.Errorf("%s on a mixed sample: %v", f.Name, err)
		}
		ys := without[f.Counts]
		if _, err := Compute(f.Name, ys[0], ys[1], 0.5, 2, nil); !errors.Is(err, ErrUndefined) {
			t.Errorf("%s without the records it counts: error %v, want ErrUndefined", f.Name, err)
		}
		_, err := Confusion{TP: 1, FP: 1, TN: 1, FN: 1}.Rate(f.Name)
		if (err == nil) != f.Threshold {
			t.Errorf("%s: Threshold %v but Rate error %v", f.Name, f.Threshold, err)
		}
	}
	if !slices.Equal(names, Names()) {
		t.Errorf("facts %v, names %v", names, Names())
	}
	if _, ok := FactOf("youden"); ok || Known("youden") {
		t.Error("an unknown metric has facts")
	}
}

// TestFactFlagsAgreeWithValues checks the two flags against the values on
// the worked example of hand_test.go: a metric has Threshold exactly when
// its value moves as the threshold goes from 0.5 to 0.8, and Proportion
// exactly when it is a ratio of weighted confusion counts, i.e. a share of
// records (Confusion.Rate accepts it).
func TestFactFlagsAgreeWithValues(t *testing.T) {
	for _, f := range Facts() {
		at5, err5 := Compute(f.Name, handLabels, handScores, 0.5, 4, handWeights)
		at8, err8 := Compute(f.Name, handLabels, handScores, 0.8, 4, handWeights)
		if err5 != nil || err8 != nil {
			t.Fatalf("%s: %v, %v", f.Name, err5, err8)
		}
		if moved := at5 != at8; moved != f.Threshold {
			t.Errorf("%s: value %v at 0.5 and %v at 0.8, but Threshold is %v", f.Name, at5, at8, f.Threshold)
		}
		_, err := (Confusion{TP: 1, FP: 1, TN: 1, FN: 1}).Rate(f.Name)
		if share := err == nil; share != f.Proportion {
			t.Errorf("%s: a share of records is %v but Proportion is %v", f.Name, share, f.Proportion)
		}
		if got, ok := FactOf(f.Name); !ok || got != f || IsThreshold(f.Name) != f.Threshold {
			t.Errorf("%s: FactOf = %+v, %v; IsThreshold %v", f.Name, got, ok, IsThreshold(f.Name))
		}
	}
}

// TestFactBasis: the records a metric rests on, on a hand-counted sample
// of five (labels 0 1 1 1 0, scores .9 .8 .1 .6 .2, threshold 0.5: two
// negatives, three positives, three decided positive), and zero exactly
// on the samples where the metric is undefined (those of
// TestFactsMatchComputation).
func TestFactBasis(t *testing.T) {
	ys, ss := []float64{0, 1, 1, 1, 0}, []float64{0.9, 0.8, 0.1, 0.6, 0.2}
	want := map[string]int{NameFPR: 2, NameTPR: 3, NameFNR: 3, NamePPV: 3, NameNPV: 2, NameSelectionRate: 5,
		NameAccuracy: 5, NameBrier: 5, NameLogLoss: 5, NameCalibrationInTheLarge: 5, NameECE: 5, NameAUC: 2}
	for _, f := range Facts() {
		if got := f.Basis(ys, ss, 0.5); got != want[f.Name] {
			t.Errorf("%s rests on %d records, want %d", f.Name, got, want[f.Name])
		}
		for _, s := range [][2][]float64{{{1, 1}, {0.2, 0.8}}, {{0, 0}, {0.2, 0.8}}, {{0, 1}, {0.1, 0.2}}, {{0, 1}, {0.7, 0.9}}, {{}, {}}} {
			_, err := Compute(f.Name, s[0], s[1], 0.5, 2, nil)
			if undefined := errors.Is(err, ErrUndefined); undefined != (f.Basis(s[0], s[1], 0.5) == 0) {
				t.Errorf("%s on %v: undefined %v but basis %d", f.Name, s, undefined, f.Basis(s[0], s[1], 0.5))
			}
		}
	}
}

// TestFactRanges: every metric stays within [Min, Max] on extreme samples
// (all events missed, all non-events flagged, perfect and reversed
// scores, a mixed one), and a bounded metric reaches both ends on them
// (by hand: e.g. calibration-in-the-large is 0 − 1 = −1 when every
// record has the event and score 0, and 1 − 0 = +1 in the opposite case).
func TestFactRanges(t *testing.T) {
	samples := [][2][]float64{
		{{1, 1}, {0, 0}}, {{0, 0}, {1, 1}}, {{0, 1}, {0, 1}}, {{0, 1}, {1, 0}},
		{{0, 1, 0, 1}, {0.2, 0.8, 0.7, 0.3}},
	}
	for _, f := range Facts() {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, s := range samples {
			v, err := Compute(f.Name, s[0], s[1], 0.5, 2, nil)
			if err != nil {
				continue
			}
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		if lo < f.Min || hi > f.Max {
			t.Errorf("%s: values in [%v, %v], outside its range [%v, %v]", f.Name, lo, hi, f.Min, f.Max)
		}
		if !math.IsInf(f.Max, 1) && (math.Abs(lo-f.Min) > 1e-9 || math.Abs(hi-f.Max) > 1e-9) {
			t.Errorf("%s: values reach [%v, %v], not the ends of its range [%v, %v]", f.Name, lo, hi, f.Min, f.Max)
		}
	}
}
