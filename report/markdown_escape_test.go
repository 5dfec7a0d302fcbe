package report

import (
	"bytes"
	"html"
	"os"
	"os/exec"
	"regexp"
	"slices"
	"strings"
	"testing"
)

// TestMdText: each expected string applies the CommonMark spec 0.31.2
// by hand: HTML-significant characters as character references (§2.5),
// punctuation that can start inline markup backslash-escaped (§2.4), a
// leading list marker or ordered-list number escaped (§5.2), line breaks
// collapsed so that no block can start (§4, §5).
func TestMdText(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"plain words stay", "plain words stay"},
		{"false-negative rate (mean − rate)", `false-negative rate \(mean − rate\)`},
		{`<script>alert("x")</script>`, `&lt;script&gt;alert\(&quot;x&quot;\)&lt;/script&gt;`},
		{"[a](javascript:x)", `\[a\]\(javascript:x\)`},
		{"![i](x)", `\!\[i\]\(x\)`},
		{"*a* _b_ ~c~ $d$ {e}", `\*a\* \_b\_ \~c\~ \$d\$ \{e\}`},
		{"a | b", `a \| b`},
		{"`code`", "\\`code\\`"},
		{`back\slash`, `back\\slash`},
		{"&amp; it's", "&amp;amp; it&#39;s"},
		{"a\n# b\n\n- c", `a \# b - c`},
		{"- x", `\- x`},
		{"+ x", `\+ x`},
		{"a - b + c", "a - b + c"},
		{"12. x", `12\. x`},
		{"3) x", `3\) x`},
		{"v1.2", "v1.2"},
		{"> q", "&gt; q"},
		{"  spaced   out  ", "spaced out"},
		{"esc \x1b[31m", `esc \\x1b\[31m`},
		{"\u202eabc", `\\u202eabc`},
	} {
		if got := mdText(c.in); got != c.want {
			t.Errorf("mdText(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}

// TestMdCode: a code span's fence is one backtick longer than any run
// inside, and a space pads a text that begins or ends with a backtick
// (CommonMark 0.31.2 §6.1, examples 329–331 from memory); inside, neither
// escapes nor entities are decoded, so the text is not escaped. In a GFM
// table cell a pipe is written \| (GFM spec 0.29, §4.10).
func TestMdCode(t *testing.T) {
	for _, c := range []struct{ in, want, cell string }{
		{"hb", "`hb`", "`hb`"},
		{"<b>&amp;", "`<b>&amp;`", "`<b>&amp;`"},
		{"a`b", "``a`b``", "``a`b``"},
		{"``a", "``` ``a ```", "``` ``a ```"},
		{"a`", "`` a` ``", "`` a` ``"},
		{"hb | anaemia", "`hb | anaemia`", "`hb \\| anaemia`"},
		{"two\nlines", "`two lines`", "`two lines`"},
		{"esc\x1b", "`esc\\x1b`", "`esc\\x1b`"},
		{"", "", ""},
	} {
		if got := mdCode(c.in); got != c.want {
			t.Errorf("mdCode(%q) = %q, want %q", c.in, got, c.want)
		}
		if got := mdCodeCell(c.in); got != c.cell {
			t.Errorf("mdCodeCell(%q) = %q, want %q", c.in, got, c.cell)
		}
	}
}

// TestMdSentence: backtick pairs become code spans, the rest is escaped
// text, and a lone backtick is kept as a literal one.
func TestMdSentence(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"the weights of `hb` and `age`", "the weights of `hb` and `age`"},
		{"on `<b>` (x)", "on `<b>` \\(x\\)"},
		{"odd ` one", "odd \\` one"},
		{"a\n- `b`", "a - `b`"},
	} {
		if got := mdSentence(c.in); got != c.want {
			t.Errorf("mdSentence(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}

// TestWriteMarkdownHostile: with hostile text in every user field, the
// Markdown holds none of it raw where it could be markup or reach the
// terminal: no "<" outside code spans (inside, CommonMark shows it as
// text), no control or bidi character, no extra line, and every table
// row keeps its number of cells.
func TestWriteMarkdownHostile(t *testing.T) {
	clean := markdownOf(t, "plain")
	for _, h := range hostileTexts {
		md := markdownOf(t, h)
		if text := outsideCode(md); strings.Contains(text, "<") {
			t.Errorf("markdown for %q has a raw < outside code:\n%s", h, text)
		}
		if r, bad := terminalUnsafe(md); bad {
			t.Errorf("markdown for %q holds %U raw", h, r)
		}
		if got, want := strings.Count(md, "\n"), strings.Count(clean, "\n"); got != want {
			t.Errorf("markdown for %q has %d lines, the clean one %d:\n%s", h, got, want, md)
		}
		if got, want := rowSeparators(md), rowSeparators(clean); !slices.Equal(got, want) {
			t.Errorf("markdown for %q: table rows have %v cell separators, the clean ones %v:\n%s", h, got, want, md)
		}
	}
}

// rowSeparators counts the cell separators (cellSeparators) of every
// table row of md.
func rowSeparators(md string) []int {
	var out []int
	for _, line := range strings.Split(md, "\n") {
		if strings.HasPrefix(line, "| ") {
			out = append(out, cellSeparators(line))
		}
	}
	return out
}

// outsideCode returns md without its code spans, found as CommonMark
// §6.1 defines them: a run of n backticks not preceded by a backslash,
// up to the next run of exactly n backticks on the same line.
func outsideCode(md string) string {
	var b strings.Builder
	for _, line := range strings.Split(md, "\n") {
		for i := 0; i < len(line); {
			if line[i] != '`' || escaped(line[:i]) {
				b.WriteByte(line[i])
				i++
				continue
			}
			n := len(line[i:]) - len(strings.TrimLeft(line[i:], "`"))
			end := closingRun(line[i+n:], n)
			if end < 0 {
				b.WriteString(line[i : i+n])
				i += n
				continue
			}
			i += n + end + n
		}
		b.WriteByte('\n')
	}
	return b.String()
}

// escaped reports whether the character after prefix is backslash-escaped:
// prefix ends in an odd number of backslashes.
func escaped(prefix string) bool {
	return (len(prefix)-len(strings.TrimRight(prefix, `\`)))%2 == 1
}

// closingRun returns the index in s of the first run of exactly n
// backticks, or -1.
func closingRun(s string, n int) int {
	for i := 0; i < len(s); {
		if s[i] != '`' {
			i++
			continue
		}
		m := len(s[i:]) - len(strings.TrimLeft(s[i:], "`"))
		if m == n {
			return i
		}
		i += m
	}
	return -1
}

func markdownOf(t *testing.T, h string) string {
	t.Helper()
	var b bytes.Buffer
	if err := WriteMarkdown(&b, hostileResult(h)); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// cmarkGFM returns GitHub's reference Markdown renderer (Debian package
// cmark-gfm). The test is skipped when it is missing, unless
// GAPWISE_REQUIRE_CMARK=1 (set by CI), which makes that a failure.
func cmarkGFM(t *testing.T) string {
	t.Helper()
	if p, err := exec.LookPath("cmark-gfm"); err == nil {
		return p
	}
	if os.Getenv("GAPWISE_REQUIRE_CMARK") == "1" {
		t.Fatal("GAPWISE_REQUIRE_CMARK=1 but cmark-gfm is missing (apt-get install -y cmark-gfm)")
	}
	t.Skip("skipping: cmark-gfm is not installed (apt-get install -y cmark-gfm)")
	return ""
}

// renderGFM renders Markdown to HTML with cmark-gfm, raw HTML allowed
// (--unsafe, as a renderer that trusts its input would) and GitHub's
// extensions on.
func renderGFM(t *testing.T, bin, md string) string {
	t.Helper()
	cmd := exec.Command(bin, "--unsafe", "-e", "table", "-e", "strikethrough", "-e", "autolink")
	cmd.Stdin = strings.NewReader(md)
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("cmark-gfm: %v", err)
	}
	return string(out)
}

var (
	gfmTagRE     = regexp.MustCompile(`<(/?[a-zA-Z][a-zA-Z0-9]*)`)
	gfmHeadingRE = regexp.MustCompile(`<h2>(.*)</h2>`)
	gfmCodeRE    = regexp.MustCompile(`<code>(.*?)</code>`)
)

// TestMarkdownRendersAsText renders the Markdown of hostileResult with
// GitHub's reference renderer (cmark-gfm, the outside truth here) and
// checks that user text never becomes markup: the page has exactly the
// elements of the clean report, in the same order, and the heading and
// the score's code span show the user's text itself (control characters
// as Go escapes, whitespace collapsed). Warnings quote names between
// backticks, and a backtick in a name may join two code spans into one,
// so for names with backticks only the elements outside code are
// compared.
func TestMarkdownRendersAsText(t *testing.T) {
	bin := cmarkGFM(t)
	cleanTags := gfmTagRE.FindAllString(renderGFM(t, bin, markdownOf(t, "plain")), -1)
	for _, h := range hostileTexts {
		page := renderGFM(t, bin, markdownOf(t, h))
		tags := gfmTagRE.FindAllString(page, -1)
		want := cleanTags
		if strings.Contains(h, "`") {
			tags, want = withoutCode(tags), withoutCode(cleanTags)
		}
		if strings.Join(tags, " ") != strings.Join(want, " ") {
			t.Errorf("user text %q changed the rendered elements:\n%s", h, page)
			continue
		}
		shown := Printable(oneLine(h))
		if m := gfmHeadingRE.FindStringSubmatch(page); m == nil || html.UnescapeString(m[1]) != "T"+shown {
			t.Errorf("heading for %q renders as %q, want %q", h, m, "T"+shown)
		}
		if m := gfmCodeRE.FindStringSubmatch(page); m == nil || html.UnescapeString(m[1]) != "S"+shown {
			t.Errorf("score for %q renders as %q, want %q", h, m, "S"+shown)
		}
	}
}

func withoutCode(tags []string) []string {
	var out []string
	for _, tag := range tags {
		if tag != "<code" && tag != "</code" {
			out = append(out, tag)
		}
	}
	return out
}
