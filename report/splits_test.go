package report

import (
	"bytes"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// withSplits gives handResult's FNR contributions a spread over 10 fold
// splits (invented numbers; the expected strings are their rounding by
// hand), leaving brier without one.
func withSplits(r *fairness.Result) {
	r.Settings.FoldSplits = 10
	for j := range r.Metrics[0].Contributions {
		r.Metrics[0].Contributions[j].SplitSD = ptr(0.0031 * float64(j+1))
	}
}

// TestSplitSDText: the text report adds a split SD column to the metrics
// whose contributions average several fold splits, and names the splits
// in the settings.
func TestSplitSDText(t *testing.T) {
	res := handResult()
	withSplits(res)
	var b bytes.Buffer
	_ = WriteText(&b, res)
	out := b.String()
	for _, want := range []string{"split SD", "+0.0610  +0.0580           +0.0200    0.0093", "fold splits     10 (contributions are their mean; split SD is the spread between them)"} {
		if !strings.Contains(out, want) {
			t.Errorf("missing %q in\n%s", want, out)
		}
	}
	if strings.Count(out, "split SD  ") != 1 {
		t.Errorf("split SD column shown for a metric without splits:\n%s", out)
	}
}

// TestSplitSDMarkdown: the Markdown decomposition table gains a Split SD
// column (in points for a rate) and keeps one cell per column in every row.
func TestSplitSDMarkdown(t *testing.T) {
	res := handResult()
	withSplits(res)
	var b bytes.Buffer
	if err := WriteMarkdown(&b, res); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{
		"| Mechanism | Contribution | 95% interval | Alone | Gap if equalised | Split SD |",
		"| `hb \\| anaemia` | +6.1 pts | [+4.8, +7.3] pts | +5.8 pts | +2.0 pts | 0.9 pts |",
		"| Residual (not assigned) | +1.1 pts | | | | |",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("markdown lacks %q:\n%s", want, out)
		}
	}
	inFNR := false
	for _, line := range strings.Split(out, "\n") {
		switch {
		case strings.HasPrefix(line, "### Decomposition"):
			inFNR = strings.Contains(line, "false-negative")
		case inFNR && strings.HasPrefix(line, "|"):
			if n := strings.Count(strings.ReplaceAll(line, `\|`, ""), "|"); n != 7 {
				t.Errorf("row has %d cell separators, want 7: %s", n, line)
			}
		}
	}
}

// TestSplitSDHTML: the HTML decomposition table gains a Split SD column
// with an explanation, only where there were several splits.
func TestSplitSDHTML(t *testing.T) {
	page := renderHTML(t, false, withSplits)
	rows := tableRows(t, page, "decomp-fnr")
	if got := strings.Join(rows[2], " ‖ "); got != "hb | anaemia ‖ +6.1 pts ‖ 0.9 pts ‖ [+4.8, +7.3] pts ‖ +5.8 pts ‖ +2.0 pts" {
		t.Errorf("hb row: %s", got)
	}
	if !strings.Contains(page, "mean over several independent cross-fitting fold splits") {
		t.Error("no explanation of the split SD")
	}
	if plain := renderHTML(t, false, nil); strings.Contains(plain, "Split SD") {
		t.Error("split SD column without fold splits")
	}
}
