package report

import (
	"bytes"
	"strings"
	"testing"
)

// TestHTMLShowsControlsEscaped: bidi overrides and isolates, control
// characters and bytes that are not UTF-8 in user text reach the HTML page
// only as Go escapes (as in the text report), so no value can reorder or
// hide the text around it; the caller's Result is left as it was.
func TestHTMLShowsControlsEscaped(t *testing.T) {
	var clean bytes.Buffer
	if err := WriteHTML(&clean, handResult()); err != nil {
		t.Fatal(err)
	}
	bad := []string{"\u202e", "\u202c", "\u2066", "\u2069", "\x1b", "\x07", "\x00", "\x7f", "\u009b", "\xff"}
	for _, h := range hostileTexts {
		res := hostileResult(h)
		title := res.Title
		var page bytes.Buffer
		if err := WriteHTML(&page, res); err != nil {
			t.Fatal(err)
		}
		for _, b := range bad {
			if strings.Contains(h, b) && strings.Count(page.String(), b) != strings.Count(clean.String(), b) {
				t.Errorf("%q: the page holds %q from user text", h, b)
			}
		}
		if strings.Contains(h, "\xff") && !strings.Contains(page.String(), `\xff`) {
			t.Errorf("%q: the invalid byte is not shown as \\xff", h)
		}
		if strings.Contains(h, "\u202e") && !strings.Contains(page.String(), `\u202e`) {
			t.Errorf("%q: the override is not shown as \\u202e", h)
		}
		if res.Title != title {
			t.Errorf("WriteHTML changed the caller's result")
		}
	}
}
