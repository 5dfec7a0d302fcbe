package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"html"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// fuzzResult is hostileResult(s) with Details whose column names and
// categorical levels carry s (the first level of each with a display
// name that does too), and the warnings fairness.Warnings derives
// from it (which quote node and column names) before the hostile one.
func fuzzResult(s string) *fairness.Result {
	r := hostileResult(s)
	r.Details = handDetails()
	r.Names.Levels = map[string]map[string]string{}
	for i := range r.Details.Columns {
		c := &r.Details.Columns[i]
		c.Name += s
		for j := range c.Levels {
			c.Levels[j] = "level" + c.Levels[j] + s
		}
		if len(c.Levels) > 0 { // the first level gets a display name
			r.Names.Levels[c.Name] = map[string]string{c.Levels[0]: "LN" + s}
		}
	}
	r.Warnings = append(fairness.Warnings(r), r.Warnings...)
	return r
}

// fuzzSeeds adds the hostile texts and a few more that aim at the
// checks' edges: escapes next to pipes and backticks, references that a
// decoder might take, comments and end tags, ECharts template fields and
// the separators that JSON or whitespace collapsing treat specially.
func fuzzSeeds(f *testing.F) {
	for _, h := range hostileTexts {
		f.Add(h)
	}
	for _, h := range []string{
		"", "a\\|b `x\\` ``", "&#60;b&#x3e; &lt &copy; &",
		"<!-- </code> <![CDATA[ ]]> <?x?> </dd> </title>",
		"{b} {c|x} {@v} <br> \"quoted\" 'single' &quot;",
		"\u2028\u2029 \u00a0nbsp \ufeffbom",
	} {
		f.Add(h)
	}
}

// FuzzHTML renders as HTML a result holding the arbitrary text s in
// every place that takes user text (fuzzResult) and checks that none of
// it becomes markup (htmlProblems, against the page of the plain text
// "plain").
func FuzzHTML(f *testing.F) {
	fuzzSeeds(f)
	var clean strings.Builder
	if err := WriteHTML(&clean, fuzzResult("plain")); err != nil {
		f.Fatal(err)
	}
	cleanTags, problems := htmlSkeleton(clean.String(), rawTextElements(clean.String()))
	if len(problems) > 0 {
		f.Fatal(problems)
	}
	f.Fuzz(func(t *testing.T, s string) {
		var page strings.Builder
		if err := WriteHTML(&page, fuzzResult(s)); err != nil {
			t.Fatal(err)
		}
		for _, p := range htmlProblems(s, page.String(), cleanTags) {
			t.Errorf("HTML for %q: %s", s, p)
		}
	})
}

// FuzzMarkdown renders as Markdown and as text a result holding the
// arbitrary text s in every place that takes user text (fuzzResult) and
// checks that none of it becomes Markdown markup (markdownProblems,
// against the Markdown of the plain text "plain") and that neither output
// holds a character a terminal would act on or an extra line.
func FuzzMarkdown(f *testing.F) {
	fuzzSeeds(f)
	cleanMD, cleanText, err := renderMarkdownText(fuzzResult("plain"))
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, s string) {
		md, text, err := renderMarkdownText(fuzzResult(s))
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range markdownProblems(s, md, cleanMD) {
			t.Errorf("Markdown for %q: %s", s, p)
		}
		if r, bad := terminalUnsafe(md); bad {
			t.Errorf("Markdown for %q holds %U raw", s, r)
		}
		if r, bad := terminalUnsafe(text); bad {
			t.Errorf("text report for %q holds %U raw", s, r)
		}
		if got, want := strings.Count(text, "\n"), strings.Count(cleanText, "\n"); got != want {
			t.Errorf("text report for %q has %d lines, the clean one %d", s, got, want)
		}
	})
}

// renderMarkdownText renders r as Markdown and as text.
func renderMarkdownText(r *fairness.Result) (md, text string, err error) {
	var m, x bytes.Buffer
	if err := WriteMarkdown(&m, r); err != nil {
		return "", "", err
	}
	err = WriteText(&x, r)
	return m.String(), x.String(), err
}

var (
	// htmlCharRefRE is a character reference (WHATWG HTML, "Character
	// references"): named, decimal or hexadecimal, with its semicolon.
	htmlCharRefRE = regexp.MustCompile(`^&(?:[a-zA-Z][a-zA-Z0-9]*|#[0-9]+|#[xX][0-9a-fA-F]+);`)
	tagNameRE     = regexp.MustCompile(`^<(/?)([a-zA-Z][a-zA-Z0-9-]*)`)
	tagEndRE      = regexp.MustCompile(`^\s*/?>`)
	auditTitleRE  = regexp.MustCompile(`<dd id="audit-title">([^<]*)</dd>`)
	titleRE       = regexp.MustCompile(`<title>([^<]*)</title>`)
)

// htmlProblems checks a page rendered from fuzzResult(s) against the tags
// of the page of fuzzResult("plain") (htmlSkeleton):
//
//   - it passes its own Content-Security-Policy (policyProblems);
//   - outside script and style elements, read as the HTML syntax writes
//     it (WHATWG HTML, "Syntax": tags with names and attributes, text with
//     character references), the markup holds only whole tags, no < or >
//     in text, attribute values quoted and every & a character reference,
//     and the same sequence of tags and attribute names as the plain page
//     (but for <code>, which backticks in s may pair differently);
//   - the title element and the audit title show "T"+s itself once
//     character references are decoded, with control characters and bytes
//     that are not UTF-8 as Go escapes (visibleCopy, Printable);
//   - the chart data is JSON with <, > and & escaped (so no string in it
//     can end the script element); no label or tooltip formatter holds a
//     {…} template field, and no tooltip formatter, which ECharts shows as
//     HTML, holds markup but its <br> line breaks (formatterProblems).
func htmlProblems(s, page string, want []string) []string {
	out := policyProblems(page)
	raw := rawTextElements(page)
	skel, problems := htmlSkeleton(page, raw)
	out = append(out, problems...)
	if strings.Contains(s, "`") {
		skel, want = withoutCodeTags(skel), withoutCodeTags(want)
	}
	if !slices.Equal(skel, want) {
		out = append(out, fmt.Sprintf("tags differ from the plain page's:\n%s\nwant\n%s", strings.Join(skel, " "), strings.Join(want, " ")))
	}
	shown := Printable("T" + s) // visibleCopy
	for _, re := range []*regexp.Regexp{titleRE, auditTitleRE} {
		if m := re.FindStringSubmatch(page); m == nil || html.UnescapeString(m[1]) != shown {
			out = append(out, fmt.Sprintf("%s shows %q, want %q", re, m, shown))
		}
	}
	return append(out, chartDataProblems(raw)...)
}

// htmlSkeleton reads the markup of page outside its script and style
// elements (raw, from rawTextElements) and returns its tags as "name attr attr …" (end tags as
// "/name"), with the problems found: text holding < or >, an & that does
// not start a character reference, an unquoted attribute value, or a tag
// that does not end as tags do.
func htmlSkeleton(page string, raw []rawTextElement) (tags, problems []string) {
	var markup strings.Builder
	last := 0
	for _, e := range raw {
		markup.WriteString(page[last:e.start] + "<" + e.kind + ">")
		last = e.end
	}
	m := strings.TrimPrefix(markup.String()+page[last:], "<!DOCTYPE html>")
	bad := func(format string, args ...any) { problems = append(problems, fmt.Sprintf(format, args...)) }
	for i := 0; i < len(m); {
		switch m[i] {
		case '<':
			loc := tagNameRE.FindStringSubmatchIndex(m[i:])
			if loc == nil {
				bad("a < that starts no tag at %q", clip(m[i:]))
				i++
				continue
			}
			tag := m[i+loc[2]:i+loc[3]] + strings.ToLower(m[i+loc[4]:i+loc[5]])
			i += loc[1]
			for {
				a := tagAttrRE.FindStringSubmatch(m[i:])
				if a == nil {
					break
				}
				if a[2] != "" && a[2][0] != '"' {
					bad("attribute %s of <%s> has an unquoted value", a[1], tag)
				}
				problems = append(problems, ampProblems(a[2])...)
				tag += " " + strings.ToLower(a[1])
				i += len(a[0])
			}
			end := tagEndRE.FindString(m[i:])
			if end == "" {
				bad("tag <%s> does not end as a tag: %q", tag, clip(m[i:]))
			}
			i += len(end)
			tags = append(tags, tag)
		case '>':
			bad("a > in text at %q", clip(m[i:]))
			i++
		case '&':
			if !htmlCharRefRE.MatchString(m[i:]) {
				bad("an & that is no character reference at %q", clip(m[i:]))
			}
			i++
		default:
			i++
		}
	}
	return tags, problems
}

// ampProblems reports the first & of text that does not start a
// character reference.
func ampProblems(text string) []string {
	for i := 0; i < len(text); i++ {
		if text[i] == '&' && !htmlCharRefRE.MatchString(text[i:]) {
			return []string{fmt.Sprintf("an & that is no character reference at %q", clip(text[i:]))}
		}
	}
	return nil
}

func withoutCodeTags(tags []string) []string {
	return slices.DeleteFunc(slices.Clone(tags), func(t string) bool { return t == "code" || t == "/code" })
}

// clip shortens a piece of page for a message.
func clip(s string) string {
	if len(s) > 40 {
		return s[:40]
	}
	return s
}

// chartDataProblems checks the chart data script among the page's
// script and style elements.
func chartDataProblems(raw []rawTextElement) []string {
	const prefix = "window.gapwiseData = "
	for _, e := range raw {
		if !strings.HasPrefix(e.text, prefix) {
			continue
		}
		js := strings.TrimSuffix(strings.TrimPrefix(e.text, prefix), ";")
		if strings.ContainsAny(js, "<>&\u2028\u2029") {
			return []string{"the chart data holds <, >, &, U+2028 or U+2029 unescaped"}
		}
		var v any
		if err := json.Unmarshal([]byte(js), &v); err != nil {
			return []string{"the chart data is not JSON: " + err.Error()}
		}
		return formatterProblems(v, "", nil)
	}
	return []string{"no chart data script"}
}

// formatterProblems walks decoded chart data (under the key key) and
// reports each ECharts formatter string that holds a {…} template field
// (ECharts' formatTpl replaces {a}…{e} and {@dim} in labels and
// tooltips alike; only the axis formatters "{value}" and "{value}%" are
// meant as templates) and each tooltip formatter, which ECharts shows as
// HTML, that holds markup other than <br> or an & that is no character
// reference.
func formatterProblems(v any, key string, out []string) []string {
	switch x := v.(type) {
	case []any:
		for _, e := range x {
			out = formatterProblems(e, key, out)
		}
	case map[string]any:
		if f, ok := x["formatter"].(string); ok {
			if f != "{value}" && f != "{value}%" && strings.ContainsAny(f, "{}") {
				out = append(out, fmt.Sprintf("%s formatter %q holds a template field", key, f))
			}
			rest := strings.ReplaceAll(f, "<br>", "")
			if key == "tooltip" && (strings.ContainsAny(rest, "<>") || len(ampProblems(rest)) > 0) {
				out = append(out, fmt.Sprintf("tooltip formatter %q holds markup", f))
			}
		}
		for k, e := range x {
			out = formatterProblems(e, k, out)
		}
	}
	return out
}

// mdActive are the characters that can be Markdown or HTML markup in
// running text (CommonMark 0.31.2 §2.4 ASCII punctuation that starts or
// ends inline markup, as in mdPunct, and the HTML characters of §6.6).
const mdActive = mdPunct + `<>&`

var (
	mdEntityRE  = regexp.MustCompile(`^&(?:amp|lt|gt|quot|#39);`)
	mdHeadingRE = regexp.MustCompile(`(?m)^## (.*)$`)
)

// markdownProblems checks Markdown rendered from fuzzResult(s) against
// that of fuzzResult("plain"):
//
//   - the same number of lines;
//   - every line has the same characters that can be markup (mdMarks) as
//     the plain Markdown's line; when s has a backtick, which may pair the
//     code spans of a warning differently (mdSentence), code spans are
//     left out and the line's marks may only lack some of the plain
//     line's (template text that landed in a code span);
//   - every table row has as many cell separators as the plain one: a |
//     not right after a backslash (GFM 0.29 §4.10, which splits cells
//     before it finds code spans);
//   - the heading shows "T"+s and the score's code span "S"+s, once
//     escapes and references are decoded, with whitespace collapsed and
//     control characters as Go escapes (mdText, mdCode).
func markdownProblems(s, md, clean string) []string {
	var out []string
	lines, want := strings.Split(md, "\n"), strings.Split(clean, "\n")
	if len(lines) != len(want) {
		return []string{fmt.Sprintf("%d lines, the plain Markdown has %d:\n%s", len(lines), len(want), md)}
	}
	backtick := strings.Contains(s, "`")
	for i, line := range lines {
		if got, w := mdMarks(line, backtick), mdMarks(want[i], backtick); got != w && !(backtick && subsequence(got, w)) {
			out = append(out, fmt.Sprintf("line %d has markup %q, the plain line %q:\n%s", i+1, got, w, line))
		}
		if strings.HasPrefix(line, "|") {
			if got, w := cellSeparators(line), cellSeparators(want[i]); got != w {
				out = append(out, fmt.Sprintf("line %d has %d cell separators, the plain line %d:\n%s", i+1, got, w, line))
			}
		}
	}
	shown := func(prefix string) string { return Printable(oneLine(prefix + s)) }
	if m := mdHeadingRE.FindStringSubmatch(md); m == nil || mdDecode(m[1]) != shown("T") {
		out = append(out, fmt.Sprintf("heading %q, want %q", m, shown("T")))
	}
	if code, ok := scoreSpan(md); !ok || codeContent(code) != shown("S") {
		out = append(out, fmt.Sprintf("score code span %q, want %q", code, shown("S")))
	}
	return out
}

// mdMarks returns the characters of a Markdown line that can be markup
// (mdActive), without those backslash-escaped (CommonMark §2.4) or in a
// character reference (§2.5), and with a code span (§6.1: a run of n
// backticks not escaped, to the next run of exactly n) as "C"; with
// backtick true, code spans and lone backticks are left out.
func mdMarks(line string, backtick bool) string {
	var b strings.Builder
	for i := 0; i < len(line); {
		switch c := line[i]; {
		case c == '\\' && i+1 < len(line) && strings.IndexByte(asciiPunct, line[i+1]) >= 0:
			i += 2
		case c == '&' && mdEntityRE.MatchString(line[i:]):
			i += len(mdEntityRE.FindString(line[i:]))
		case c == '`':
			n := len(line[i:]) - len(strings.TrimLeft(line[i:], "`"))
			end := closingRun(line[i+n:], n)
			switch {
			case backtick && end < 0:
				i += n
			case backtick:
				i += n + end + n
			case end < 0:
				b.WriteString(line[i : i+n]) // an unclosed run is literal
				i += n
			default:
				b.WriteByte('C')
				i += n + end + n
			}
		case strings.IndexByte(mdActive, c) >= 0:
			b.WriteByte(c)
			i++
		default:
			i++
		}
	}
	return b.String()
}

// subsequence reports whether a is b with some characters left out.
func subsequence(a, b string) bool {
	for i := 0; i < len(a); i++ {
		j := strings.IndexByte(b, a[i])
		if j < 0 {
			return false
		}
		b = b[j+1:]
	}
	return true
}

// asciiPunct are the characters a backslash escapes (CommonMark §2.4).
const asciiPunct = "!\"#$%&'()*+,-./:;<=>?@[\\]^_`{|}~"

// cellSeparators counts the | of a table row not right after a
// backslash.
func cellSeparators(line string) int {
	n := 0
	for i := 0; i < len(line); i++ {
		if line[i] == '|' && (i == 0 || line[i-1] != '\\') {
			n++
		}
	}
	return n
}

// mdDecode decodes the backslash escapes (CommonMark §2.4) and the
// character references (§2.5) of running text.
func mdDecode(s string) string {
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		switch {
		case s[i] == '\\' && i+1 < len(s) && strings.IndexByte(asciiPunct, s[i+1]) >= 0:
			b.WriteByte(s[i+1])
			i++
		case s[i] == '&' && htmlCharRefRE.MatchString(s[i:]):
			ref := htmlCharRefRE.FindString(s[i:])
			b.WriteString(html.UnescapeString(ref))
			i += len(ref) - 1
		default:
			b.WriteByte(s[i])
		}
	}
	return b.String()
}

// scoreSpan returns the code span of the line "Performance audit of
// `score`: …", or of "Score of the model: `score` …" for a result that
// names its model: the text between the run of backticks there and the
// next run of as many.
func scoreSpan(md string) (string, bool) {
	_, rest, ok := strings.Cut(md, "\nPerformance audit of `")
	if !ok { // a result that names its model names the score in the next line
		_, rest, ok = strings.Cut(md, "\nScore of the model: `")
	}
	if !ok {
		return "", false
	}
	rest = "`" + rest
	n := len(rest) - len(strings.TrimLeft(rest, "`"))
	end := closingRun(rest[n:], n)
	if end < 0 {
		return "", false
	}
	return rest[n : n+end], true
}

// codeContent is the text a code span shows (CommonMark §6.1): one space
// is stripped from each side when both sides have one and the content is
// not all spaces.
func codeContent(s string) string {
	if len(s) >= 2 && s[0] == ' ' && s[len(s)-1] == ' ' && strings.Trim(s, " ") != "" {
		return s[1 : len(s)-1]
	}
	return s
}
