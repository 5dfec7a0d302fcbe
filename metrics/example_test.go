package metrics_test

import (
	"errors"
	"fmt"

	"github.com/gapwise/gapwise/metrics"
)

// Six scored records; the weights could be importance weights of a
// reweighted sample. At threshold 0.5: TP = 2+1, FN = 1, FP = 1+2, TN = 5.
var (
	labels  = []float64{1, 1, 0, 0, 1, 0}
	scores  = []float64{0.9, 0.4, 0.7, 0.2, 0.5, 0.5}
	weights = []float64{2, 1, 1, 5, 1, 2}
)

func ExampleConfusionAt() {
	c := metrics.ConfusionAt(labels, scores, 0.5, weights)
	fmt.Printf("TP=%g FP=%g TN=%g FN=%g\n", c.TP, c.FP, c.TN, c.FN)
	// Output: TP=3 FP=3 TN=5 FN=1
}

func ExampleFalseNegativeRate() {
	fnr, err := metrics.FalseNegativeRate(labels, scores, 0.5, weights)
	fmt.Println(fnr, err) // FN/(TP+FN) = 1/4

	// Without events the rate has no value.
	_, err = metrics.FalseNegativeRate([]float64{0, 0}, []float64{0.3, 0.8}, 0.5, nil)
	fmt.Println(errors.Is(err, metrics.ErrUndefined))
	// Output:
	// 0.25 <nil>
	// true
}

func ExampleExpectedCalibrationError() {
	// Per-bin Σw(s−y) over 4 bins: 1.0, −0.6, 1.2, −0.2; ECE = 3.0/12.
	ece, _ := metrics.ExpectedCalibrationError(labels, scores, 4, weights)
	fmt.Printf("%.4f\n", ece)
	// Output: 0.2500
}

func ExampleReliabilityCurve() {
	for _, b := range metrics.ReliabilityCurve(labels, scores, 4, weights) {
		fmt.Printf("[%.2f,%.2f) n=%d w=%g score=%.2f events=%.2f\n", b.Lower, b.Upper, b.Count, b.Weight, b.MeanScore, b.EventRate)
	}
	// Output:
	// [0.00,0.25) n=1 w=5 score=0.20 events=0.00
	// [0.25,0.50) n=1 w=1 score=0.40 events=1.00
	// [0.50,0.75) n=3 w=4 score=0.55 events=0.25
	// [0.75,1.00) n=1 w=2 score=0.90 events=1.00
}

func ExampleAUC() {
	// 27 of the 32 weighted (event, non-event) pairs are ordered correctly,
	// counting the tie at 0.5 as one half.
	auc, _ := metrics.AUC(labels, scores, weights)
	fmt.Println(auc)
	// Output: 0.84375
}

func ExampleAUCSorter() {
	// Sort once, then evaluate AUC under many weight vectors in O(n) each.
	s := metrics.NewAUCSorter(labels, scores)
	for _, w := range [][]float64{nil, weights} {
		auc, _ := s.Value(w)
		fmt.Printf("%.4f\n", auc)
	}
	// Output:
	// 0.6111
	// 0.8438
}

func ExampleCompute() {
	for _, name := range []string{metrics.NameFPR, metrics.NameBrier, metrics.NameCalibrationInTheLarge} {
		v, _ := metrics.Compute(name, labels, scores, 0.5, metrics.DefaultECEBins, weights)
		fmt.Printf("%s %.4f\n", name, v)
	}
	// Output:
	// fpr 0.3750
	// brier 0.1517
	// calibration_in_the_large 0.1167
}

func ExampleCheckLabels() {
	err := metrics.CheckLabels([]float64{0, 1, 2})
	fmt.Println(err)
	fmt.Println(errors.Is(err, metrics.ErrNotBinary))
	// Output:
	// metrics: label 2 is 2: label is not 0 or 1
	// true
}
