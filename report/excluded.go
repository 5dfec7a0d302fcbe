package report

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// excludedShown is how many excluded group values a report names; the
// JSON lists them all (up to the loader's cap).
const excludedShown = 5

// excludedSentence says which rows the audit left out because of their
// group value, or "" when none: the count per other value (most rows
// first, up to excludedShown), the chosen value each near-miss resembles,
// and the rows without a group value. Values are quoted in Go syntax, so
// that invisible characters show (a zero-width space reads \u200b); each
// output escapes the sentence for its format.
func excludedSentence(g fairness.GroupInfo) string {
	if g.ExcludedRows == 0 && g.MissingGroupRows == 0 {
		return ""
	}
	var parts []string
	if g.ExcludedRows > 0 {
		parts = append(parts, fmt.Sprintf("%s whose %s value is neither %s nor %s: %s",
			rowCount(g.ExcludedRows), strconv.Quote(g.Column), strconv.Quote(g.Reference), strconv.Quote(g.Comparison), excludedValues(g)))
	}
	if g.MissingGroupRows > 0 {
		parts = append(parts, rowCount(g.MissingGroupRows)+" without a group value")
	}
	return "Not audited: " + strings.Join(parts, "; ") + "."
}

// excludedValues lists the first excludedShown values with their rows and
// sums up the rest.
func excludedValues(g fairness.GroupInfo) string {
	var items []string
	listed := 0
	for i, e := range g.Excluded {
		if i == excludedShown {
			break
		}
		s := fmt.Sprintf("%s %d", strconv.Quote(e.Value), e.Rows)
		if e.Resembles != "" {
			s += fmt.Sprintf(" (like %s)", strconv.Quote(e.Resembles))
		}
		items = append(items, s)
		listed += e.Rows
	}
	if rest := g.ExcludedRows - listed; rest > 0 {
		items = append(items, fmt.Sprintf("other values %s", rowCount(rest)))
	}
	return strings.Join(items, ", ")
}

// rowCount reads "1 row" or "n rows".
func rowCount(n int) string {
	if n == 1 {
		return "1 row"
	}
	return strconv.Itoa(n) + " rows"
}
