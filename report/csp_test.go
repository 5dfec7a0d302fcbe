package report

import (
	"fmt"
	"html"
	"regexp"
	"strings"
	"testing"
)

// TestCSPHash: the hash source of the script doSomething(); is the one
// content-security-policy.com/hash gives, also computed with
// `printf 'doSomething();' | openssl sha256 -binary | base64`.
func TestCSPHash(t *testing.T) {
	if got, want := cspHash("doSomething();"), "'sha256-RFWPLDbv2BY+rCkDzsE+0fr8ylGr2R2faWMhq4lfEQc='"; got != want {
		t.Errorf("cspHash = %s, want %s", got, want)
	}
}

var (
	cspMetaRE = regexp.MustCompile(`<meta http-equiv="Content-Security-Policy" content="([^"]*)">`)
	cspHashRE = regexp.MustCompile(`^'sha256-[A-Za-z0-9+/]{43}='$`)
	tagOpenRE = regexp.MustCompile(`<[a-zA-Z][^\s/>]*`)
	tagAttrRE = regexp.MustCompile("^\\s+([^\\s\"'>/=]+)(?:\\s*=\\s*(\"[^\"]*\"|'[^']*'|[^\\s\"'=<>`]+))?")
)

// policyProblems checks a rendered page against its own
// Content-Security-Policy (W3C CSP Level 3): one policy, before any script
// or style; scripts and style elements admitted by SHA-256 hash only
// (no 'unsafe-inline', 'unsafe-eval', 'unsafe-hashes', nonce, host or
// scheme); every script and style element's text hashed in the policy
// and no hash for anything else; no event-handler or style attribute and
// no javascript: URL in the page's markup; nothing loaded (default-src
// 'none'). Style attributes may apply (style-src-attr 'unsafe-inline'),
// because ECharts writes them in its tooltips, but the page itself has
// none.
func policyProblems(page string) []string {
	var out []string
	bad := func(format string, args ...any) { out = append(out, fmt.Sprintf(format, args...)) }
	metas := cspMetaRE.FindAllStringSubmatchIndex(page, -1)
	if len(metas) != 1 {
		return []string{fmt.Sprintf("%d Content-Security-Policy meta elements, want 1", len(metas))}
	}
	dirs := map[string][]string{}
	for _, d := range strings.Split(page[metas[0][2]:metas[0][3]], ";") {
		if f := strings.Fields(d); len(f) > 0 {
			dirs[f[0]] = f[1:]
		}
	}
	if strings.Join(dirs["default-src"], " ") != "'none'" {
		bad("default-src is %q, want 'none'", dirs["default-src"])
	}
	for _, d := range []string{"script-src-elem", "script-src-attr", "style-src-elem"} {
		if _, ok := dirs[d]; ok {
			bad("%s would override the hashed source lists", d)
		}
	}
	if got := strings.Join(dirs["style-src-attr"], " "); got != "'unsafe-inline'" {
		bad("style-src-attr is %q", got)
	}
	allowed := map[string]map[string]bool{"script": {}, "style": {}}
	for kind := range allowed {
		for _, src := range dirs[kind+"-src"] {
			if !cspHashRE.MatchString(src) {
				bad("%s-src admits %s, not a SHA-256 hash", kind, src)
			}
			allowed[kind][src] = true
		}
	}
	used := map[string]bool{}
	var markup strings.Builder
	last := 0
	for _, m := range rawTextElements(page) {
		kind, attrs, text := m.kind, m.attrs, m.text
		if m.start < metas[0][0] {
			bad("a %s element comes before the policy", kind)
		}
		if strings.TrimSpace(attrs) != "" {
			bad("a %s element has attributes %q", kind, attrs)
		}
		if h := cspHash(text); !allowed[kind][h] {
			bad("the policy lacks the hash %s of a %s element", h, kind)
		} else {
			used[h] = true
		}
		markup.WriteString(page[last:m.start])
		last = m.end
	}
	markup.WriteString(page[last:])
	for kind, hashes := range allowed {
		for h := range hashes {
			if !used[h] {
				bad("the policy admits %s, which no %s element of the page has", h, kind)
			}
		}
	}
	for _, a := range inlineAttributes(markup.String()) {
		bad("inline handler, style attribute or javascript: URL in the markup: %s", a)
	}
	return out
}

// rawTextElement is a script or style element of a page: its tag name,
// the attributes of its start tag, its text and its byte span.
type rawTextElement struct {
	kind, attrs, text string
	start, end        int
}

// rawTextElements finds the script and style elements of page. Their
// text runs to the first "</script" or "</style" (WHATWG HTML, raw text
// and script data states; the page's scripts hold no "<!--").
func rawTextElements(page string) []rawTextElement {
	lower := []byte(page) // ASCII case folding keeps byte offsets
	for i, c := range lower {
		if 'A' <= c && c <= 'Z' {
			lower[i] = c + 'a' - 'A'
		}
	}
	low := string(lower)
	var out []rawTextElement
	for i := 0; i < len(low); {
		j := strings.Index(low[i:], "<s")
		if j < 0 {
			break
		}
		i += j
		kind := ""
		for _, k := range []string{"script", "style"} {
			if rest := low[i+1:]; strings.HasPrefix(rest, k) && len(rest) > len(k) && strings.ContainsRune(" \t\n/>", rune(rest[len(k)])) {
				kind = k
			}
		}
		if kind == "" {
			i += 2
			continue
		}
		open := i + 1 + len(kind)
		gt := strings.IndexByte(low[open:], '>')
		closing := strings.Index(low[open:], "</"+kind)
		if gt < 0 || closing < gt {
			break
		}
		endTag := strings.IndexByte(low[open+closing:], '>')
		if endTag < 0 {
			break
		}
		e := rawTextElement{kind: kind, attrs: page[open : open+gt], text: page[open+gt+1 : open+closing], start: i, end: open + closing + endTag + 1}
		out = append(out, e)
		i = e.end
	}
	return out
}

// inlineAttributes returns the attributes of the tags in markup that
// would run script or apply style: event handlers (on…), style, and
// href, src, action or formaction with a javascript: URL. Tags and their
// attributes are read as the HTML syntax writes them (WHATWG HTML,
// "Attributes"): a name, then optionally = and a quoted or unquoted value.
func inlineAttributes(markup string) []string {
	var out []string
	for _, loc := range tagOpenRE.FindAllStringIndex(markup, -1) {
		rest := markup[loc[1]:]
		for {
			m := tagAttrRE.FindStringSubmatch(rest)
			if m == nil {
				break
			}
			rest = rest[len(m[0]):]
			name := strings.ToLower(m[1])
			value := strings.ToLower(strings.Trim(html.UnescapeString(m[2]), `"' `))
			switch {
			case strings.HasPrefix(name, "on"), name == "style":
				out = append(out, m[0])
			case (name == "href" || name == "src" || name == "action" || name == "formaction") && strings.HasPrefix(value, "javascript:"):
				out = append(out, m[0])
			}
		}
	}
	return out
}

// TestPagePolicy: the page passes its own policy, and the check fails for
// a page into which markup was injected.
func TestPagePolicy(t *testing.T) {
	page := renderHTML(t, true, withDiagnostics)
	for _, p := range policyProblems(page) {
		t.Error(p)
	}
	for _, injected := range []string{
		"<script>alert(1)</script>", "<style>body { display: none }</style>", `<img src="data:," onerror="alert(1)">`,
		`<td style="color: red">`, `<a href="javascript:alert(1)">`, `<script src="x.js"></script>`,
	} {
		if len(policyProblems(strings.Replace(page, "</main>", injected+"</main>", 1))) == 0 {
			t.Errorf("the check misses injected %s", injected)
		}
	}
}

// TestWriteHTMLHostile: with hostile text in every user field (and
// Details, so that the column cards and charts carry it too), no markup
// from it reaches the page: the policy check still passes, no hostile
// text with markup in it appears raw, and the page has as many elements
// as the clean one.
func TestWriteHTMLHostile(t *testing.T) {
	tags := regexp.MustCompile(`<[a-zA-Z]`)
	cleanPage := renderHostileHTML(t, "plain")
	for _, h := range hostileTexts {
		page := renderHostileHTML(t, h)
		for _, p := range policyProblems(page) {
			t.Errorf("%q: %s", h, p)
		}
		if strings.ContainsAny(h, "<>") && strings.Contains(page, h) {
			t.Errorf("%q appears raw in the page", h)
		}
		count := func(page string) int {
			if strings.Contains(h, "`") { // names in backticks may pair differently (codeSpans)
				page = strings.ReplaceAll(page, "<code>", "")
			}
			return len(tags.FindAllString(page, -1))
		}
		if got, want := count(page), count(cleanPage); got != want {
			t.Errorf("%q: %d elements, the clean page has %d", h, got, want)
		}
	}
}

func renderHostileHTML(t *testing.T, h string) string {
	t.Helper()
	res := hostileResult(h)
	res.Details = handDetails()
	for i := range res.Details.Columns {
		res.Details.Columns[i].Name += h
	}
	var b strings.Builder
	if err := WriteHTML(&b, res); err != nil {
		t.Fatal(err)
	}
	return b.String()
}
