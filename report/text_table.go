package report

import (
	"fmt"
	"io"
	"strings"
	"unicode/utf8"
)

// textTable is a block of aligned columns. right[i] right-aligns column i.
type textTable struct {
	header   []string
	right    []bool
	rows     [][]string
	noHeader bool
}

// add appends a row; control characters in the cells are shown escaped
// (Printable) and so count at their printed width.
func (t *textTable) add(cells ...string) {
	row := make([]string, len(cells))
	for i, c := range cells {
		row[i] = Printable(c)
	}
	t.rows = append(t.rows, row)
}

// dropEmpty removes columns that are empty in every row.
func (t *textTable) dropEmpty() {
	for c := len(t.header) - 1; c >= 0; c-- {
		empty := true
		for _, r := range t.rows {
			empty = empty && (c >= len(r) || r[c] == "")
		}
		if !empty {
			continue
		}
		t.header = append(t.header[:c:c], t.header[c+1:]...)
		if c < len(t.right) {
			t.right = append(t.right[:c:c], t.right[c+1:]...)
		}
		for i, r := range t.rows {
			if c < len(r) {
				t.rows[i] = append(r[:c:c], r[c+1:]...)
			}
		}
	}
}

// write prints the table with each line prefixed by indent, columns
// separated by two spaces and trailing blanks trimmed.
func (t *textTable) write(w io.Writer, indent string) {
	all := t.rows
	if !t.noHeader {
		all = append([][]string{t.header}, t.rows...)
	}
	width := make([]int, len(t.header))
	for _, r := range all {
		for i, c := range r {
			if i < len(width) {
				width[i] = max(width[i], utf8.RuneCountInString(c))
			}
		}
	}
	for _, r := range all {
		var b strings.Builder
		b.WriteString(indent)
		for i := range width {
			c := ""
			if i < len(r) {
				c = r[i]
			}
			pad := strings.Repeat(" ", width[i]-utf8.RuneCountInString(c))
			if i > 0 {
				b.WriteString("  ")
			}
			if i < len(t.right) && t.right[i] {
				b.WriteString(pad + c)
			} else {
				b.WriteString(c + pad)
			}
		}
		fmt.Fprintln(w, strings.TrimRight(b.String(), " "))
	}
}
