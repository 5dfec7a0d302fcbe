package report

import (
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestPrintable: the expected escapes are Go's own (strconv.QuoteRune, a
// byte as \xNN); which characters count is ECMA-48's C0 and C1 sets, DEL,
// and the Unicode Bidi_Control property (U+061C, U+200E, U+200F,
// U+202A–U+202E, U+2066–U+2069), all from memory.
func TestPrintable(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"plain text, é and 中文 stay", "plain text, é and 中文 stay"},
		{`C:\data\cohort.csv`, `C:\data\cohort.csv`},
		{"\x1b[31mred\x1b[0m", `\x1b[31mred\x1b[0m`},
		{"\x1b]0;title\x07", `\x1b]0;title\a`},
		{"over\rwrite", `over\rwrite`},
		{"two\nlines\tand tab", `two\nlines\tand tab`},
		{"nul \x00 del \x7f", `nul \x00 del \x7f`},
		{"c1 \u009b31m \u0085", `c1 \u009b31m \u0085`},
		{"\u202eevil\u202c", `\u202eevil\u202c`},
		{"\u2066\u2067\u2068\u2069 \u200e\u200f\u061c \u202a\u202b\u202d", `\u2066\u2067\u2068\u2069 \u200e\u200f\u061c \u202a\u202b\u202d`},
		{"bad \xff\xfe utf8", `bad \xff\xfe utf8`},
		{"zero width \u200b joiner \u200d kept", "zero width \u200b joiner \u200d kept"},
	} {
		if got := Printable(c.in); got != c.want {
			t.Errorf("Printable(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}

// TestTextOutputsPrintable: with every user-text field of the Result, the
// plan and the demo outputs holding a hostile text, the text report, the
// plan and the demo summary print nothing a terminal would act on, and the
// hostile line breaks add no line.
func TestTextOutputsPrintable(t *testing.T) {
	var clean strings.Builder
	_ = WriteText(&clean, hostileResult("plain"))
	for _, h := range hostileTexts {
		var text strings.Builder
		if err := WriteText(&text, hostileResult(h)); err != nil {
			t.Fatal(err)
		}
		outputs := map[string]string{"text": text.String(), "plan": hostilePlan(t, h), "demo": hostileDemo(t, h)}
		for name, out := range outputs {
			if r, bad := terminalUnsafe(out); bad {
				t.Errorf("%s output for %q holds %U raw", name, h, r)
			}
		}
		if got, want := strings.Count(text.String(), "\n"), strings.Count(clean.String(), "\n"); got != want {
			t.Errorf("text report for %q has %d lines, the clean one %d", h, got, want)
		}
	}
}

// hostilePlan renders a plan whose every name is h.
func hostilePlan(t *testing.T, h string) string {
	t.Helper()
	spec := &fairness.Spec{File: "spec" + h, DataPath: "data" + h}
	p := &fairness.PlanInfo{Title: "T" + h, Label: "L" + h, Score: "S" + h, Metrics: []string{"M" + h},
		Groups:     fairness.GroupInfo{Column: "G" + h, Reference: "R" + h, Comparison: "C" + h},
		Classifier: "K" + h, Learners: []string{"l" + h},
		Nodes:    []fairness.PlanNode{{Node: "N" + h, Mechanism: "N" + h + " | P" + h, Columns: []string{"c" + h}}},
		Warnings: []fairness.Warning{{Message: "W" + h}}}
	var b strings.Builder
	if err := Plan(&b, spec, p); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// hostileDemo renders the demo summary of hostileResult(h) written to a
// folder named h.
func hostileDemo(t *testing.T, h string) string {
	t.Helper()
	var b strings.Builder
	err := DemoSummary(&b, hostileResult(h), DemoOutputs{Dir: "out" + h, Data: "d" + h, Spec: "s" + h, Result: "r" + h, Report: "h" + h})
	if err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// TestPlanAlignedAfterEscaping: a mechanism name with an escape sequence
// is padded by its printed width, so the columns stay aligned.
func TestPlanAlignedAfterEscaping(t *testing.T) {
	out := hostilePlan(t, "\x1b[31m")
	var rows []string
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(l, "  mechanism") || strings.HasPrefix(l, "  N") {
			rows = append(rows, l)
		}
	}
	if len(rows) != 2 || strings.Index(rows[0], "columns") != strings.Index(rows[1], "c\\x1b") {
		t.Errorf("columns not aligned:\n%s", strings.Join(rows, "\n"))
	}
}
