package report

import (
	"bytes"
	"strings"
	"testing"
)

func TestWriteMarkdown(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteMarkdown(&buf, handResult()); err != nil {
		t.Fatal(err)
	}
	got := buf.String()
	// Rows are the fixture's numbers rounded by hand; the pipe inside a
	// mechanism label must be escaped or the table breaks.
	for _, want := range []string{
		"> **Synthetic data.**",
		"| false-negative rate | 12.0% [10.1%, 13.9%] | 21.0% | +9.0 pts [+6.1, +11.8] pts |",
		"| Brier score | 0.081 | 0.074 | −0.007 |",
		"| `hb \\| anaemia` | +6.1 pts | [+4.8, +7.3] pts | +5.8 pts | +2.0 pts |",
		"| `ferritin \\| anaemia, hb` (unreliable) | 0.0 pts | – | 0.0 pts | +7.9 pts |",
		"| Residual (not assigned) | +1.1 pts | | | |",
		"| Observed gap | +9.0 pts | [+6.1, +11.8] pts | | |",
		"2. **caution**: mechanism ferritin: largest weight carries 11% of the total",
		"| false-negative rate | 12.0% | 21.0% | +9.0 pts [+6.1, +11.8] pts | how `hb` presents given `anaemia`: +6.1 pts (95% interval [+4.8, +7.3] pts); 68% of the gap | **Reliable**, no warning concerns it |",
	} {
		if !strings.Contains(got, want) {
			t.Errorf("markdown lacks %q", want)
		}
	}
	// Every table row has the same number of unescaped pipes as its header.
	for _, line := range strings.Split(got, "\n") {
		if strings.HasPrefix(line, "| Mechanism") || strings.HasPrefix(line, "| `") {
			if n := strings.Count(strings.ReplaceAll(line, `\|`, ""), "|"); n != 6 {
				t.Errorf("row has %d cell separators, want 6: %s", n, line)
			}
		}
	}
}

type failWriter struct{}

func (failWriter) Write([]byte) (int, error) { return 0, errWrite }

var errWrite = bytes.ErrTooLarge

func TestWriteMarkdownError(t *testing.T) {
	if err := WriteMarkdown(failWriter{}, handResult()); err != errWrite {
		t.Fatalf("err = %v, want the writer's error", err)
	}
}
