package report

import (
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// hiddenFactor prints the sensitivity to an unrecorded factor: the plain
// introduction, then per metric a table of each contribution's and the
// estimated gap's range at every factor and the smallest factor that
// could reverse its sign, the verdicts in words, and the lead's sentence.
func (t *textWriter) hiddenFactor(res *fairness.Result) {
	ms := hiddenMetrics(res)
	if ms == nil {
		return
	}
	t.line("Sensitivity to an unrecorded factor")
	t.wrapped("  ", hiddenIntro)
	t.line("")
	for _, m := range ms {
		t.line("  %s (%s)", m.Metric, MetricTitle(m.Metric))
		if m.Skipped != "" {
			t.line("    not bounded: %s", m.Skipped)
			t.line("")
			continue
		}
		head := append([]string{"mechanism", "value"}, factorHeads(res)...)
		head = append(head, "could reverse from")
		right := make([]bool, len(head))
		for i := 1; i < len(right); i++ {
			right[i] = true
		}
		tab := textTable{header: head, right: right}
		for _, r := range m.Rows {
			name := r.Name
			if name == "" {
				name = "estimated gap"
			}
			row := []string{name, signed(r.Value)}
			for _, b := range r.Ranges {
				row = append(row, "["+signed(b[0])+", "+signed(b[1])+"]")
			}
			tab.add(append(row, reversalCell(r.Reversal, res.HiddenFactor.MaxFactor))...)
		}
		tab.write(t.w, "    ")
		for _, r := range m.Rows {
			who := r.Name
			if who == "" {
				who = "estimated gap"
			}
			t.wrapped("    ", who+": "+r.Words+".")
		}
		if m.Lead != "" {
			t.wrapped("    ", m.Lead)
		}
		t.line("")
	}
}

// reversalCell is the smallest reversing factor as a table cell.
func reversalCell(rev *float64, maxF float64) string {
	if rev == nil {
		return "beyond Λ = " + factorWords(maxF)
	}
	return "Λ = " + factorWords(*rev)
}

// wrapped prints s after indent, broken into lines of at most about 78
// characters at spaces.
func (t *textWriter) wrapped(indent, s string) {
	line := indent
	for _, w := range strings.Fields(s) {
		if len(line) > len(indent) && len(line)+1+len(w) > 78 {
			t.line("%s", line)
			line = indent
		}
		if len(line) > len(indent) {
			line += " "
		}
		line += w
	}
	if len(line) > len(indent) {
		t.line("%s", line)
	}
}
