package report

import "html/template"

// inlineStyle is how a sentence of the report (the summary of a metric)
// writes user text: as running text, and as code (node names).
type inlineStyle struct {
	text, code func(string) string
}

// plainInline leaves text as it is and marks code with backticks: the
// Markdown-style text that Summary returns and the HTML page renders
// with codeSpans.
var plainInline = inlineStyle{
	text: func(s string) string { return s },
	code: func(s string) string { return "`" + s + "`" },
}

// markdownInline escapes text for the Markdown report (mdText) and writes
// code as code spans (mdCode).
var markdownInline = inlineStyle{text: mdText, code: mdCode}

// htmlInline escapes text for HTML and writes code as <code> elements,
// for the HTML page's sentences built from user text.
var htmlInline = inlineStyle{
	text: template.HTMLEscapeString,
	code: func(s string) string { return "<code>" + template.HTMLEscapeString(s) + "</code>" },
}

// plainText is plainInline without the backticks: text for a page title
// or a chart, where nothing is marked.
var plainText = inlineStyle{text: func(s string) string { return s }, code: func(s string) string { return s }}
