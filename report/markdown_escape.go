package report

import "strings"

// User text (titles, group values, node, column and metric names, the
// warnings that quote them) enters the Markdown report only through the
// functions of this file. References are to the CommonMark spec 0.31.2
// (https://spec.commonmark.org/0.31.2/) and the GitHub Flavored Markdown
// spec 0.29-gfm (https://github.github.com/gfm/), section numbers in
// brackets.

// mdEntities are the HTML-significant characters, written as character
// references [2.5] so that no raw HTML tag, autolink [6.5, 6.6] or block
// quote [5.1] can start, and so that a renderer that passes HTML through
// gets the same text.
var mdEntities = map[rune]string{'&': "&amp;", '<': "&lt;", '>': "&gt;", '"': "&quot;", '\'': "&#39;"}

// mdPunct are the characters that take a backslash wherever they stand:
// "any ASCII punctuation character may be backslash-escaped" [2.4]. These
// start or end code spans (`) [6.1], emphasis (* _) [6.2], strikethrough
// (~, GFM 6.5), links and images ([ ] ( ) !) [6.3, 6.4], ATX headings
// (#) [4.2], table cells (|, GFM 4.10), backslash escapes (\) and, in
// renderers that have them, math ($) and attribute lists ({ }).
const mdPunct = "\\`*_[]()#!|~$\x7b\x7d"

// mdText escapes user text for Markdown running text, headings and GFM
// table cells, where it renders as exactly that text: whitespace (line
// breaks included) is collapsed to single spaces, so that it can start no
// block [4, 5]; control characters are written as Go escapes (Printable,
// which also keeps them off the terminal when the Markdown is printed);
// the HTML-significant characters become character references
// (mdEntities); mdPunct characters are backslash-escaped; and so is what
// would start a list item [5.2], a thematic break [4.1] or a setext
// underline [4.3] if the text began a line: a leading - or +, and the . or
// ) after leading digits. (- and + mean nothing elsewhere on a line, and
// user text, being one line, can begin a line only at its start.)
func mdText(s string) string { return mdEscape(oneLine(s)) }

// oneLine collapses every run of whitespace in s to one space and trims
// both ends.
func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

// mdEscape is mdText without collapsing whitespace.
func mdEscape(s string) string {
	s = Printable(s)
	var b strings.Builder
	digits := 0 // leading digits so far, -1 once past them
	for i, r := range s {
		switch {
		case mdEntities[r] != "":
			b.WriteString(mdEntities[r])
		case strings.ContainsRune(mdPunct, r),
			i == 0 && (r == '-' || r == '+'),
			digits > 0 && (r == '.' || r == ')'):
			b.WriteByte('\\')
			b.WriteRune(r)
		default:
			b.WriteRune(r)
		}
		if r >= '0' && r <= '9' && digits >= 0 {
			digits++
		} else {
			digits = -1
		}
	}
	return b.String()
}

// mdCode writes user text as a code span [6.1], which renders it
// literally: inside a code span neither backslash escapes nor character
// references are decoded, and no HTML is recognised, so the text is not
// escaped but fenced. The fence is one backtick longer than the longest
// run of backticks in the text, so no run inside can close it; a space
// pads each side when the text begins or ends with a backtick, or begins
// and ends with a space (the one space each side that a code span strips).
// Whitespace is collapsed as in mdText (a line break inside a code span
// would still end the paragraph when the next line starts a block) and
// control characters are written as Go escapes. Empty text gives "".
func mdCode(s string) string {
	s = Printable(oneLine(s))
	if s == "" {
		return ""
	}
	fence := strings.Repeat("`", longestRun(s, '`')+1)
	if strings.HasPrefix(s, "`") || strings.HasSuffix(s, "`") || (strings.HasPrefix(s, " ") && strings.HasSuffix(s, " ")) {
		s = " " + s + " "
	}
	return fence + s + fence
}

// mdCodeCell is mdCode for a GFM table cell: the table is split into
// cells before code spans are parsed, so a pipe inside one is written \|,
// which GFM turns back into | (GFM 4.10, example 200).
func mdCodeCell(s string) string {
	return strings.ReplaceAll(mdCode(s), "|", `\|`)
}

// mdSentence renders one of the report's sentences, whose code is marked
// with backticks (Summary, fairness.Warning.Message): the parts between a
// pair of backticks become code spans (mdCode), the rest running text
// (mdText), and an unpaired backtick stays a literal one. A backtick inside
// a quoted name shifts which parts read as code, but every part is escaped
// for where it lands, so nothing in the names can become markup.
func mdSentence(s string) string {
	parts := strings.Split(oneLine(s), "`")
	var b strings.Builder
	for i, part := range parts {
		switch {
		case i%2 == 1 && i < len(parts)-1:
			b.WriteString(mdCode(part))
		case i%2 == 1:
			b.WriteString(mdEscape("`" + part))
		default:
			b.WriteString(mdEscape(part))
		}
	}
	return b.String()
}

// longestRun returns the length of the longest run of c in s.
func longestRun(s string, c rune) int {
	best, run := 0, 0
	for _, r := range s {
		if r == c {
			run++
			best = max(best, run)
		} else {
			run = 0
		}
	}
	return best
}
