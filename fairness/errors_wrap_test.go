package fairness

import (
	"encoding/csv"
	"errors"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

// TestCSVParseErrorReachable: a CSV syntax error keeps the standard
// library's *csv.ParseError (with its line and column) reachable through
// errors.As, beside the sentinel ErrCSVSyntax, while the message is ours.
func TestCSVParseErrorReachable(t *testing.T) {
	spec := writeAudit(t, smallSpec, "site,x,dx,z,score\na,1,0,\"2,0.5\nb,1,0,2,0.5\n")
	_, err := LoadData(spec)
	var pe *csv.ParseError
	if !errors.As(err, &pe) || !errors.Is(err, ErrCSVSyntax) {
		t.Fatalf("got %v, want a *csv.ParseError and ErrCSVSyntax", err)
	}
	if pe.StartLine != 2 || !strings.Contains(err.Error(), "malformed CSV") {
		t.Errorf("parse error %+v, message %q", pe, err)
	}
}

// TestOneErrNotBinary: the data loader's and the metrics package's label
// errors match the same sentinel.
func TestOneErrNotBinary(t *testing.T) {
	if !errors.Is(metrics.CheckLabels([]float64{0, 2}), ErrNotBinary) {
		t.Error("metrics' label error does not match fairness.ErrNotBinary")
	}
	spec := writeAudit(t, smallSpec, strings.Replace(smallData(20), "a,", "a,", 1)+"a,0.1,maybe,0.2,0.5\n")
	if _, err := LoadData(spec); !errors.Is(err, metrics.ErrNotBinary) {
		t.Errorf("loader error %v does not match metrics.ErrNotBinary", err)
	}
}
