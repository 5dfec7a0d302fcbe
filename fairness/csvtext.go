package fairness

// The text layer of the data file below CSV syntax: its encoding (UTF-8,
// with or without a byte-order mark) and the one grammar of numbers.

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Byte-order marks (The Unicode Standard, section 23.8 "Specials": U+FEFF
// serialised in each encoding form). Spreadsheet programs write the UTF-8
// one before the header when they export "CSV UTF-8"; the UTF-16 ones come
// from exports as "Unicode text".
var (
	bomUTF8    = []byte{0xEF, 0xBB, 0xBF}
	bomUTF16LE = []byte{0xFF, 0xFE}
	bomUTF16BE = []byte{0xFE, 0xFF}
)

// skipBOM returns a reader of r without a leading UTF-8 byte-order mark, so
// that a quoted first header name ("\uFEFF\"age\"") parses as CSV. A file
// that starts with a UTF-16 mark is refused: its bytes are not UTF-8 text.
func skipBOM(r io.Reader) (io.Reader, error) {
	br := bufio.NewReader(r)
	head, err := br.Peek(len(bomUTF8))
	if err != nil && err != io.EOF && err != bufio.ErrBufferFull {
		return nil, err
	}
	switch {
	case bytes.HasPrefix(head, bomUTF8):
		_, _ = br.Discard(len(bomUTF8))
	case bytes.HasPrefix(head, bomUTF16LE), bytes.HasPrefix(head, bomUTF16BE):
		return nil, wrapf(ErrEncoding, "the file is UTF-16 text (it starts with a UTF-16 byte-order mark); save it as UTF-8 CSV")
	}
	if crOnly(br) {
		return nil, wrapf(ErrCSVSyntax, "the lines end with a bare carriage return (CR, the old Mac format), which CSV readers do not take as a line end; save the file with LF or CRLF line ends")
	}
	return br, nil
}

// crOnly reports whether the start of the file (up to the reader's
// buffer) holds a carriage return that no line feed follows and no line
// feed at all: lines ended by a bare CR, which RFC 4180 (CRLF) and LF
// readers both see as one long line.
func crOnly(br *bufio.Reader) bool {
	head, _ := br.Peek(br.Size())
	i := bytes.IndexByte(head, '\r')
	return i >= 0 && i+1 < len(head) && bytes.IndexByte(head, '\n') < 0
}

// separatorHint explains a header that is one field holding semicolons or
// tabs: a file separated by another character than the comma (the
// default of spreadsheets in locales whose decimal mark is the comma).
func separatorHint(header []string) string {
	if len(header) != 1 {
		return ""
	}
	for _, sep := range []struct{ char, name string }{{";", "semicolons"}, {"\t", "tabs"}, {"|", "vertical bars"}} {
		if strings.Contains(header[0], sep.char) {
			return fmt.Sprintf("; the header is one field, %q: the file seems separated by %s, but gapwise reads comma-separated values", cutValue(header[0]), sep.name)
		}
	}
	return ""
}

// checkUTF8 returns an ErrEncoding error when field is not valid UTF-8,
// naming the first invalid byte and its 1-based position in the field.
// Nothing is decoded or replaced: a file in another encoding (Latin-1,
// Windows-1252) would otherwise change its text silently.
func checkUTF8(field string) error {
	if utf8.ValidString(field) {
		return nil
	}
	for i := 0; i < len(field); {
		r, size := utf8.DecodeRuneInString(field[i:])
		if r == utf8.RuneError && size <= 1 {
			return wrapf(ErrEncoding, "byte 0x%02X (byte %d of the field) is not valid UTF-8; save the file as UTF-8", field[i], i+1)
		}
		i += size
	}
	return nil // unreachable: ValidString said there is an invalid byte
}

// parseDecimal parses a number written in the one grammar the data file
// accepts,
//
//	number   = [sign] (digits ["." [digits]] | "." digits) [exponent]
//	exponent = ("e" | "E") [sign] digits
//	sign     = "+" | "-"
//	digits   = "0"…"9" {"0"…"9"}
//
// that is, decimal notation with an optional exponent (what spreadsheets
// and statistics packages write). Forms particular to one programming
// language, such as hexadecimal floats ("0x1p-2"), digit separators
// ("1_000"), "Inf" or "Infinity", are not numbers here. A value beyond the
// float64 range parses to ±Inf with ok true; the callers refuse it.
func parseDecimal(s string) (v float64, ok bool) {
	if !isDecimal(s) {
		return 0, false
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil && !errors.Is(err, strconv.ErrRange) {
		return 0, false
	}
	return v, true
}

// isDecimal reports whether s matches the number grammar of parseDecimal.
func isDecimal(s string) bool {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	intDigits := digitRun(s, i)
	i += intDigits
	fracDigits := 0
	if i < len(s) && s[i] == '.' {
		i++
		fracDigits = digitRun(s, i)
		i += fracDigits
	}
	if intDigits == 0 && fracDigits == 0 {
		return false
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			i++
		}
		exp := digitRun(s, i)
		if exp == 0 {
			return false
		}
		i += exp
	}
	return i == len(s)
}

// digitRun returns how many ASCII digits start at s[i:].
func digitRun(s string, i int) int {
	n := 0
	for i+n < len(s) && s[i+n] >= '0' && s[i+n] <= '9' {
		n++
	}
	return n
}

// fieldName names field i of the header for messages: its name, or its
// position when the header leaves it unnamed.
func fieldName(header []string, i int) string {
	if i < len(header) && header[i] != "" {
		return header[i]
	}
	return fmt.Sprintf("field %d", i+1)
}
