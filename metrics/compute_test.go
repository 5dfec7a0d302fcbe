package metrics

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestComputeDispatch(t *testing.T) {
	// Each name reaches the function documented for it; the expected values
	// are the hand-worked ones of rates_test.go, scoring_test.go,
	// calibration_test.go and auc_test.go (4 ECE bins).
	want := map[string]float64{
		NameFPR: 3.0 / 8, NameTPR: 3.0 / 4, NameFNR: 1.0 / 4, NamePPV: 3.0 / 6,
		NameNPV: 5.0 / 6, NameSelectionRate: 6.0 / 12, NameAccuracy: 8.0 / 12,
		NameBrier: 1.82 / 12, NameLogLoss: 5.5261438 / 12,
		NameCalibrationInTheLarge: 1.4 / 12, NameECE: 3.0 / 12, NameAUC: 27.0 / 32,
	}
	for _, name := range Names() {
		got, err := Compute(name, handLabels, handScores, handThreshold, 4, handWeights)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if math.Abs(got-want[name]) > 1e-8 {
			t.Errorf("Compute(%s) = %v, want %v", name, got, want[name])
		}
	}
	if len(want) != len(Names()) {
		t.Errorf("test covers %d metrics, Names has %d", len(want), len(Names()))
	}
}

func TestComputeUnknown(t *testing.T) {
	_, err := Compute("f1", handLabels, handScores, 0.5, 10, nil)
	if err == nil || errors.Is(err, ErrUndefined) || !strings.Contains(err.Error(), `"f1"`) {
		t.Errorf("err = %v, want an unknown-metric error naming f1", err)
	}
}
