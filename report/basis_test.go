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

// TestNotEstimableInEveryOutput: a contribution the data cannot estimate
// shows no number in any output, stays out of the summary's headline and
// of the demo's largest contribution, and the summary says so.
func TestNotEstimableInEveryOutput(t *testing.T) {
	res := handResult()
	res.Metrics[0].Contributions[2].NotEstimable = true // hb, the largest: +6.1 pts [4.8, 7.3]
	var text, md, page bytes.Buffer
	if err := WriteText(&text, res); err != nil {
		t.Fatal(err)
	}
	if err := WriteMarkdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if err := WriteHTML(&page, res); err != nil {
		t.Fatal(err)
	}
	for name, out := range map[string]string{"text": text.String(), "markdown": md.String(), "html": page.String()} {
		if !strings.Contains(out, "not estimable") || !strings.Contains(strings.ToLower(out), "sum of contributions (including those not estimable)") {
			t.Errorf("%s does not mark the contribution", name)
		}
	}
	for name, bad := range map[string]bool{
		"text value": strings.Contains(text.String(), "hb | anaemia                +0.0610"), "text interval": strings.Contains(text.String(), "+0.0480"),
		"markdown value": strings.Contains(md.String(), "| +6.1 pts"), "markdown interval": strings.Contains(md.String(), "4.8, 7.3"),
	} {
		if bad {
			t.Errorf("%s of a not-estimable contribution is printed", name)
		}
	}
	s := Summary(res, res.Metrics[0])
	if strings.Contains(s, "6.1 points") || !strings.Contains(s, "The data cannot estimate the contribution of") {
		t.Errorf("summary: %s", s)
	}
	if c, ok := Largest(res.Metrics[0].Contributions); !ok || c.Node == "hb" {
		t.Errorf("largest %+v", c)
	}
}
