package fairness

import "fmt"

// groupOf returns the group of row r: the group column's cell, or for
// combined groups (GroupSpec.Combined) the combination of its group
// cells, a banded column's number replaced by its band's label
// (GroupSpec.combination). When a group cell is missing, miss is the
// index of the first such column among GroupSpec.DataColumns and g its
// cell; otherwise miss is −1. A banded cell that is not a decimal number
// is a *DataError naming the line, the column and the groups.bands key.
func (l *csvLoader) groupOf(r *csvRow) (g string, miss int, err error) {
	gs := &l.spec.Groups
	if !gs.Combined() {
		g = r.cell(l.groupIdx[0])
		if isMissing(g) {
			return g, 0, nil
		}
		return g, -1, nil
	}
	parts := l.groupParts
	for j, i := range l.groupIdx {
		c := r.cell(i)
		if isMissing(c) {
			return c, j, nil
		}
		b := l.groupBands[j]
		if b == nil {
			parts[j] = c
			continue
		}
		x, ok := parseDecimal(c)
		if !ok {
			return "", -1, l.derr(r.at(i), b.Column, wrapf(ErrNotNumeric, "%q is not a number; groups.bands.%s (line %d of %s) cuts this column into bands", c, b.Column, gs.bandsLine, l.spec.File))
		}
		parts[j] = b.Label(b.Band(x))
	}
	return gs.combination(parts), -1, nil
}

// groupKeyHint names, for the k-th column the loader looks for, the spec
// key that asks for it when it is a group column: " (groups.columns)".
func (l *csvLoader) groupKeyHint(k int) string {
	g := l.spec.Groups
	switch {
	case k >= len(g.DataColumns()):
		return ""
	case g.Columns == nil:
		return fmt.Sprintf(": groups.column on line %d of %s", l.spec.KeyLine("groups"), l.spec.File)
	}
	return fmt.Sprintf(": groups.columns on line %d of %s", l.spec.KeyLine("groups"), l.spec.File)
}
