package report

import (
	"crypto/sha256"
	"encoding/base64"
	"html/template"
	"strings"
	"unicode/utf8"
)

// cspHash returns the hash source that lets a Content-Security-Policy
// accept an inline script or style element whose text is exactly text:
// 'sha256-' followed by the base64 encoding of the SHA-256 digest of the
// text's UTF-8 bytes (W3C Content Security Policy Level 3, "hash-source"
// and "Does element match source list"). The browser hashes the element's
// text after parsing, so text must be what the parser hands back: valid
// UTF-8 without carriage returns or NUL (which the parser would rewrite)
// and without "</" followed by the element's name; inlineText checks this.
func cspHash(text string) string {
	sum := sha256.Sum256([]byte(text))
	return "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
}

// pagePolicy is the report's Content-Security-Policy: the page loads
// nothing (default-src 'none'), runs only the scripts whose text hashes to
// one of scripts, applies only the style elements whose text hashes to one
// of styles (style attributes, which ECharts' tooltips write, still apply:
// style-src-attr), and shows images only from data: URLs. Without
// 'unsafe-inline', 'unsafe-eval' or 'unsafe-hashes', markup that an
// escaping bug let into the page could not run: inline event handlers,
// javascript: URLs, injected script elements and eval are all refused.
func pagePolicy(scripts, styles []string) string {
	hashes := func(texts []string) string {
		out := make([]string, len(texts))
		for i, t := range texts {
			out[i] = cspHash(t)
		}
		return strings.Join(out, " ")
	}
	return strings.Join([]string{
		"default-src 'none'",
		"script-src " + hashes(scripts),
		"style-src " + hashes(styles),
		"style-src-attr 'unsafe-inline'",
		"img-src data:",
		"base-uri 'none'",
		"form-action 'none'",
	}, "; ")
}

// inline sets the page's script elements, its style element and the
// policy that admits exactly them. It panics if a text could not be
// inlined as it is (inlineText): the texts are the embedded assets and
// JSON from encodeOptions, so that is a programmer error.
func (p *page) inline(scripts []string, css string) {
	p.Scripts = make([]template.JS, len(scripts))
	for i, s := range scripts {
		inlineText(s, "script")
		p.Scripts[i] = template.JS(s)
	}
	inlineText(css, "style")
	p.CSS = template.CSS(css)
	p.Policy = template.HTMLAttr(`content="` + pagePolicy(scripts, []string{css}) + `"`)
}

// inlineText panics unless text reads back unchanged from a raw text
// element named tag: valid UTF-8 with no carriage return or NUL (the HTML
// parser rewrites them, and the hash would no longer match) and no "</"
// followed by the element's name or "<!--" (which would end the element
// early or change how it is parsed; WHATWG HTML, "script data state").
func inlineText(text, tag string) {
	low := strings.ToLower(text)
	switch {
	case !utf8.ValidString(text), strings.ContainsAny(text, "\r\x00"):
		panic("report: an inline " + tag + " is not clean UTF-8 text and cannot be hashed")
	case strings.Contains(low, "</"+tag), strings.Contains(low, "<!--"):
		panic("report: an inline " + tag + " contains </" + tag + " or <!-- and cannot be inlined")
	}
}
