package metrics

// handLabels, handScores and handWeights form the small worked example used
// by the hand-checked tests of every metric (arithmetic in each test).
//
//	record  y  s    w   decision at t=0.5
//	1       1  0.9  2   positive  → TP 2
//	2       1  0.4  1   negative  → FN 1
//	3       0  0.7  1   positive  → FP 1
//	4       0  0.2  5   negative  → TN 5
//	5       1  0.5  1   positive  → TP 1   (s ≥ t counts as positive)
//	6       0  0.5  2   positive  → FP 2
//
// TP = 3, FN = 1, FP = 3, TN = 5, total = 12.
var (
	handLabels    = []float64{1, 1, 0, 0, 1, 0}
	handScores    = []float64{0.9, 0.4, 0.7, 0.2, 0.5, 0.5}
	handWeights   = []float64{2, 1, 1, 5, 1, 2}
	handThreshold = 0.5
)
