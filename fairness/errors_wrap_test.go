package fairness

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
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

// TestDataErrorKeepsParseError checks that a malformed CSV file's
// *csv.ParseError is reachable through errors.As, with the position the
// standard library reports, and that the message users read is unchanged.
// Reference: encoding/csv reading the same bytes directly.
func TestDataErrorKeepsParseError(t *testing.T) {
	const head = "clinic,sex,dx,hb,mcv,score\n"
	for _, body := range []string{
		"north,\"F,1,11.5,80,0.7\nsouth\"x,1\n",               // bare quote in a quoted field
		"north,F,1,11.5,80,0.7\nnorth,F\"x\",1,11.5,80,0.7\n", // quote in an unquoted field
	} {
		src := head + body
		var want *csv.ParseError
		cr := csv.NewReader(strings.NewReader(src))
		cr.FieldsPerRecord = -1
		for {
			_, err := cr.Read()
			if err == io.EOF {
				t.Fatalf("encoding/csv accepts %q", src)
			}
			if errors.As(err, &want) {
				break
			}
		}
		_, err := ReadData(strings.NewReader(src), "cohort.csv", dataSpec(t, ""))
		var pe *csv.ParseError
		if !errors.As(err, &pe) {
			t.Fatalf("%q: errors.As finds no *csv.ParseError in %v", body, err)
		}
		if pe.StartLine != want.StartLine || pe.Line != want.Line || pe.Column != want.Column || !errors.Is(pe.Err, want.Err) {
			t.Errorf("%q: ParseError %+v, want %+v", body, pe, want)
		}
		if !errors.Is(err, ErrCSVSyntax) || !errors.Is(err, csv.ErrQuote) && !errors.Is(err, csv.ErrBareQuote) {
			t.Errorf("%q: %v does not wrap ErrCSVSyntax and the csv sentinel", body, err)
		}
		// The sentence is the one before the cause became reachable.
		msg := fmt.Sprintf("cohort.csv:%d: malformed CSV at column %d: %v", want.Line, want.Column, want.Err)
		if err.Error() != msg {
			t.Errorf("message %q, want %q", err, msg)
		}
	}
}

// TestDataErrorKeepsReadError checks that a failing reader's error stays
// reachable under ErrReadFailed.
func TestDataErrorKeepsReadError(t *testing.T) {
	cause := errors.New("disk on fire")
	_, err := ReadData(io.MultiReader(strings.NewReader("clinic,sex,dx,hb,mcv,score\nnorth,F,1,11"), errReader{cause}), "cohort.csv", dataSpec(t, ""))
	if !errors.Is(err, ErrReadFailed) || !errors.Is(err, cause) {
		t.Fatalf("%v does not wrap ErrReadFailed and the reader's error", err)
	}
	if want := "cohort.csv: cannot read data file: disk on fire"; err.Error() != want {
		t.Errorf("message %q, want %q", err, want)
	}
}

type errReader struct{ err error }

func (r errReader) Read([]byte) (int, error) { return 0, r.err }
