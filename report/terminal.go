package report

import (
	"fmt"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Printable returns s with every character that a terminal would act on
// instead of showing written as a Go escape sequence, so that text from a
// spec, a data file or a file name can be printed without moving the
// cursor, recolouring, retitling the window or reordering what follows:
//
//   - the C0 controls U+0000–U+001F (ESC as \x1b, CR as \r, BEL as \a,
//     newline as \n, tab as \t, ...), DEL U+007F as \x7f and the C1
//     controls U+0080–U+009F (CSI U+009B as \u009b): Unicode category Cc;
//   - the bidirectional controls (Unicode property Bidi_Control: U+061C,
//     U+200E, U+200F, the embeddings and overrides U+202A–U+202E, the
//     isolates U+2066–U+2069), as \u202e and so on;
//   - bytes that are not valid UTF-8, as \xff and so on.
//
// The escapes are those of strconv.QuoteRune (a byte as \xNN). Every other
// character, backslashes included, is kept as it is, so clean text is
// returned unchanged. Text reports, the plan, the demo summary and the
// command line's error messages all print user text through it.
func Printable(s string) string {
	if !needsEscape(s) {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && n == 1:
			fmt.Fprintf(&b, `\x%02x`, s[i])
		case isTerminalControl(r):
			q := strconv.QuoteRuneToASCII(r)
			b.WriteString(q[1 : len(q)-1])
		default:
			b.WriteString(s[i : i+n])
		}
		i += n
	}
	return b.String()
}

// isTerminalControl reports whether Printable escapes r.
func isTerminalControl(r rune) bool {
	return unicode.Is(unicode.Cc, r) || unicode.Is(unicode.Bidi_Control, r)
}

// needsEscape reports whether Printable would change s.
func needsEscape(s string) bool {
	if !utf8.ValidString(s) {
		return true
	}
	return strings.ContainsFunc(s, isTerminalControl)
}
