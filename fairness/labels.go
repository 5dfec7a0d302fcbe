package fairness

import (
	"fmt"
	"strings"
)

// LabelValues records how label words were read (spec key positive): the
// value counted as the outcome and the one other value, counted as 0 ("" if
// the audited rows hold only the positive one).
type LabelValues struct {
	Positive string `json:"positive"`
	Negative string `json:"negative"`
}

// labelCoder reads label cells. Without a positive value it accepts 0, 1,
// true and false (parseLabel). With one, the cell equal to it is 1 and
// the audited rows may hold exactly one other value, which is 0: a third
// value is refused rather than silently counted as a negative, and so is
// a value that differs from the positive one only in case or spacing.
type labelCoder struct {
	positive     string
	negative     string
	negativeLine int    // line where negative was first seen
	place        string // what negativeLine counts: "line" (CSV, the default) or "row" (Parquet)
	seenPositive bool
}

// code returns the 0/1 label of cell, read on line.
func (c *labelCoder) code(cell string, line int) (float64, error) {
	if c.positive == "" {
		return parseLabel(cell)
	}
	switch {
	case cell == c.positive:
		c.seenPositive = true
		return 1, nil
	case resembles(cell, c.positive, c.positive) != "":
		return 0, wrapf(ErrNotBinary, "label %q differs from the positive value %q (key positive) only in letter case or spacing; correct the data or the spec", cell, c.positive)
	case c.negative == "":
		c.negative, c.negativeLine = cell, line
		return 0, nil
	case cell == c.negative:
		return 0, nil
	}
	place := c.place
	if place == "" {
		place = "line"
	}
	return 0, wrapf(ErrNotBinary, "label %q is a third value: with positive: %q the label column holds %q (from %s %d) as its one other value",
		cell, c.positive, c.negative, place, c.negativeLine)
}

// check refuses a positive value that no audited row holds.
func (c *labelCoder) check() error {
	if c.positive == "" || c.seenPositive {
		return nil
	}
	other := "no other value"
	if c.negative != "" {
		other = fmt.Sprintf("only %q", c.negative)
	}
	return wrapf(ErrNotBinary, "the positive value %q (key positive) appears in no audited row; the label column holds %s", c.positive, other)
}

// values returns the LabelValues, or nil without a positive value.
func (c *labelCoder) values() *LabelValues {
	if c.positive == "" {
		return nil
	}
	return &LabelValues{Positive: c.positive, Negative: strings.TrimSpace(c.negative)}
}
