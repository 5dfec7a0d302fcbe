package report

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/gapwise/gapwise/fairness"
)

// hostileTexts are user texts (titles, group values, names) that try to
// break out of where a report prints them: into HTML (script and image
// tags, javascript: links), into Markdown (links, images, emphasis, code,
// headings, lists, block quotes, table cells, line breaks, backticks,
// escapes and entities that should stay text) and into the terminal (ANSI
// colour, an OSC window title ended by BEL, CR overwriting, C1 CSI, DEL,
// NUL, bidi overrides and isolates, invalid UTF-8). The classes are
// common practice in injection testing; the terminal ones are ECMA-48
// sequences and the bidi ones the Unicode Bidi_Control characters.
var hostileTexts = []string{
	`<script>alert(1)</script>`,
	`<img src=x onerror=alert(1)>`,
	`<a href="javascript:alert(1)">x</a>`,
	`[click](javascript:alert(1))`,
	`![x](javascript:alert(1))`,
	`<javascript:alert(1)>`,
	`*em* _em_ **strong** ~~gone~~ $x$`,
	"line\n# heading\n- item\n1. first\n> quote\n---\n<div onclick=alert(1)>",
	"`code` ``two`` ```three",
	"`",
	"x | y | z",
	`\*not* \\ \`,
	`&lt;script&gt; &amp; &#60;b&#62;`,
	`{: onclick="alert(1)"} 'quoted'`,
	"- leading dash",
	"+ plus",
	"12. twelve",
	"3) three",
	"# hash",
	"\x1b[31mred\x1b[0m",
	"\x1b]0;title\x07",
	"over\rwrite",
	"\u202eevil\u202c and \u2066isolate\u2069",
	"c1 \u009b31m del \x7f nul \x00 bell \a",
	"bad \xff\xfe utf8",
}

// hostileResult is handResult with s in every place that holds user text:
// the title, the group column and values (an excluded one too), label and score, node,
// mechanism (the headline's lead too), column and metric names, learners, the warnings (quoting s
// in backticks as fairness does), the assumptions, the input paths, and the display names of
// groups, nodes and columns, the model and the audit date.
// Each place gets s with a different prefix, so that the places stay
// distinct.
func hostileResult(s string) *fairness.Result {
	r := handResult()
	r.Title = "T" + s
	r.Groups.Column, r.Groups.Reference, r.Groups.Comparison = "G"+s, "R"+s, "C"+s
	r.Groups.Excluded = []fairness.ExcludedValue{{Value: "E" + s, Rows: 2, Resembles: "R" + s}}
	r.Groups.ExcludedRows = 2
	r.Label, r.Score = "L"+s, "S"+s
	r.Tool.Version = "V" + s
	r.Settings.Learners = []string{"learner" + s}
	r.Inputs.SpecFile, r.Inputs.DataFile = "spec"+s+".yaml", "data"+s+".csv"
	r.Assumptions = append(r.Assumptions, "A"+s)
	for i := range r.Metrics {
		m := &r.Metrics[i]
		if i == 1 {
			m.Metric = "M" + s // a metric without a title of its own
		}
		for j := range m.Contributions {
			c := &m.Contributions[j]
			c.Mechanism = c.Node + s + " | " + s
			c.Node += s
		}
		if m.Headline.Lead != "" {
			m.Headline.Lead += s
		}
	}
	for i := range r.Mechanisms {
		mr := &r.Mechanisms[i]
		mr.Mechanism = mr.Node + s + " | " + s
		mr.Node += s
		for j := range mr.Parents {
			mr.Parents[j] += s
		}
		mr.Columns = []string{"col" + s}
	}
	r.Warnings = append(r.Warnings, fairness.Warning{Kind: fairness.KindPoorOverlap, Severity: fairness.SeverityCaution,
		Message: "the groups are nearly separable on `W" + s + "`; W" + s})
	// Display names for the groups, half the nodes and the columns, and
	// the model and date, each carrying s (the other nodes, and the score,
	// keep their identifiers, so that both forms are rendered).
	r.Names = &fairness.Names{Groups: &fairness.GroupNames{Reference: "NR" + s, Comparison: "NC" + s},
		Nodes: map[string]fairness.DisplayName{}, Columns: map[string]fairness.DisplayName{}}
	for i, m := range r.Mechanisms {
		if i%2 == 0 {
			r.Names.Nodes[m.Node] = fairness.DisplayName{Name: "N" + fmt.Sprint(i) + s, Unit: "U" + s}
		}
		for _, c := range m.Columns {
			r.Names.Columns[c] = fairness.DisplayName{Name: "K" + fmt.Sprint(i) + s, Unit: "U" + s}
		}
	}
	r.Model = &fairness.ModelInfo{Name: "Mo" + s, Version: "Ve" + s}
	r.AuditDate = "D" + s
	return r
}

// terminalUnsafe returns the first character of out that a terminal would
// act on: a control character other than newline, a bidi control, or a
// byte that is not UTF-8; ok is false when there is none.
func terminalUnsafe(out string) (r rune, ok bool) {
	for i, c := range out {
		switch {
		case c == utf8.RuneError && !strings.HasPrefix(out[i:], "\uFFFD"):
			return c, true
		case c != '\n' && (unicode.Is(unicode.Cc, c) || unicode.Is(unicode.Bidi_Control, c)):
			return c, true
		}
	}
	return 0, false
}
