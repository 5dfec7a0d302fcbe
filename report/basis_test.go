package report

import (
	"bytes"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestAllRecordsInEveryOutput: with rows dropped, each output shows the gap
// before dropping beside the audited one, and the missing-value setting.
func TestAllRecordsInEveryOutput(t *testing.T) {
	res := handResult()
	res.Settings.Missing = "drop"
	res.Metrics[0].AllRecords = &fairness.AllRecords{Reference: 0.1, Comparison: 0.15, Gap: 0.05, NReference: 1203, NComparison: 1100}
	var text, md, page bytes.Buffer
	for _, w := range []struct {
		f   func(*bytes.Buffer, *fairness.Result) error
		buf *bytes.Buffer
	}{
		{func(b *bytes.Buffer, r *fairness.Result) error { return WriteText(b, r) }, &text},
		{func(b *bytes.Buffer, r *fairness.Result) error { return WriteMarkdown(b, r) }, &md},
		{func(b *bytes.Buffer, r *fairness.Result) error { return WriteHTML(b, r) }, &page},
	} {
		if err := w.f(w.buf, res); err != nil {
			t.Fatal(err)
		}
	}
	for name, want := range map[string][]string{
		"text":     {"gap before dropping rows", "+0.0500", "1,203 / 1,100 records", "missing values  rows dropped"},
		"markdown": {"before dropping rows: +5.0 pts"},
		"html":     {"before dropping rows: &#43;5.0 pts", "rows dropped"},
	} {
		out := map[string]string{"text": text.String(), "markdown": md.String(), "html": page.String()}[name]
		for _, w := range want {
			if !strings.Contains(out, w) {
				t.Errorf("%s output lacks %q", name, w)
			}
		}
	}
}
