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
// output escapes the sentence for its format. Counts that res withholds
// (fairness.Suppression) read "<10" or "withheld".
func excludedSentence(res *fairness.Result) string {
	g := res.Groups
	_, exclHidden := withheldText(res, fairness.PathExcludedRows)
	_, missHidden := withheldText(res, fairness.PathMissingGroupRows)
	if (g.ExcludedRows == 0 && !exclHidden) && (g.MissingGroupRows == 0 && !missHidden) {
		return ""
	}
	var parts []string
	if g.ExcludedRows > 0 || exclHidden {
		parts = append(parts, fmt.Sprintf("%s whose %s value is neither %s nor %s: %s",
			rowsAt(res, fairness.PathExcludedRows, g.ExcludedRows), strconv.Quote(g.Column), strconv.Quote(g.Reference), strconv.Quote(g.Comparison), excludedValues(res)))
	}
	if g.MissingGroupRows > 0 || missHidden {
		parts = append(parts, rowsAt(res, fairness.PathMissingGroupRows, g.MissingGroupRows)+" without a group value")
	}
	return "Not audited: " + strings.Join(parts, "; ") + "."
}

// rowsAt reads "1 row", "n rows" or, for a count res withholds, "<10
// rows" or "withheld rows".
func rowsAt(res *fairness.Result, path string, n int) string {
	if t, ok := withheldText(res, path); ok {
		return t + " rows"
	}
	return rowCount(n)
}

// excludedValues lists the first excludedShown values with their rows and
// sums up the rest, as res's suppression allows: a rest that would be a
// total less withheld counts is withheld too, a small rest is "<T".
func excludedValues(res *fairness.Result) string {
	g := res.Groups
	var items []string
	listed, hidden := 0, false
	for i, e := range g.Excluded {
		if i == excludedShown {
			break
		}
		path := fairness.ExcludedPath(i)
		_, h := withheldText(res, path)
		hidden = hidden || h
		s := fmt.Sprintf("%s %s", strconv.Quote(e.Value), countAt(res, path, e.Rows, strconv.Itoa))
		if e.Resembles != "" {
			s += fmt.Sprintf(" (like %s)", strconv.Quote(e.Resembles))
		}
		items = append(items, s)
		listed += e.Rows
	}
	_, totalHidden := withheldText(res, fairness.PathExcludedRows)
	switch rest := g.ExcludedRows - listed; {
	case (hidden || totalHidden) && len(g.Excluded) > excludedShown:
		// the rest is the total less withheld counts: withheld with them
		items = append(items, "other values "+withheldWord)
	case !hidden && !totalHidden && rest > 0:
		if small(res, rest) {
			items = append(items, fmt.Sprintf("other values <%d rows", res.Suppression.Below))
		} else {
			items = append(items, fmt.Sprintf("other values %s", rowCount(rest)))
		}
	}
	return strings.Join(items, ", ")
}

// small reports whether res suppresses small cells and n is one.
func small(res *fairness.Result, n int) bool {
	return res.Suppression != nil && n >= 1 && n < res.Suppression.Below
}

// rowCount reads "1 row" or "n rows".
func rowCount(n int) string {
	if n == 1 {
		return "1 row"
	}
	return strconv.Itoa(n) + " rows"
}
