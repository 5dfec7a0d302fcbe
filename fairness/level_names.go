package fairness

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// levelNames checks the levels of the spec's names key against the loaded
// data d and returns, per column, the display name of each level keyed as
// the column's details write the level (ColumnDetails.Levels): a
// categorical column's level as it is, a numeric column's value in
// strconv 'g' form, so that "1" and "1.0" name the same value of a 0/1
// column. For the label, whose words the spec key positive reads, a level
// may also be written as the word. Entries of names.columns win over the
// ones a single-column node shares. A level that does not occur, levels
// on a column that is not described by levels (the score, the group
// column, a numeric column of more than two values) and a level given
// twice are *SpecError, naming the level's key and line.
func levelNames(spec *Spec, d *Dataset) (map[string]map[string]string, error) {
	if spec.Names == nil {
		return nil, nil
	}
	type source struct {
		column, key string
		levels      []LevelName
	}
	var sources []source
	for _, e := range spec.Names.Nodes {
		if e.Levels == nil {
			continue
		}
		for _, n := range spec.Graph {
			if n.Node == e.ID && len(n.Columns) == 1 {
				sources = append(sources, source{n.Columns[0], "names.nodes." + e.ID + ".levels", e.Levels})
			}
		}
	}
	for _, e := range spec.Names.Columns {
		if e.Levels != nil {
			sources = append(sources, source{e.ID, "names.columns." + e.ID + ".levels", e.Levels})
		}
	}
	out := map[string]map[string]string{}
	for _, src := range sources {
		levels, err := columnLevels(spec, d, src.column)
		if err != nil {
			return nil, specErr(spec.File, src.levels[0].Line, src.key, ErrBadValue, "%v", err)
		}
		names := map[string]string{}
		for _, ln := range src.levels {
			key := src.key + "." + ln.Level
			level, ok := levels.find(ln.Level)
			if lv := d.LabelValues; !ok && src.column == spec.Label && lv != nil {
				switch ln.Level {
				case lv.Positive:
					level, ok = "1", true
				case lv.Negative:
					level, ok = "0", lv.Negative != ""
				}
			}
			if !ok {
				msg := "level %q does not occur in column %q (its levels: %s)"
				if s, close := suggest(ln.Level, levels.names); close {
					return nil, specErr(spec.File, ln.Line, key, ErrBadValue, msg+"; did you mean %q?", ln.Level, src.column, strings.Join(levels.names, ", "), s)
				}
				return nil, specErr(spec.File, ln.Line, key, ErrBadValue, msg, ln.Level, src.column, strings.Join(levels.names, ", "))
			}
			if _, dup := names[level]; dup {
				return nil, specErr(spec.File, ln.Line, key, ErrDuplicateKey, "level %q of column %q is named twice", level, src.column)
			}
			names[level] = ln.Name
		}
		out[src.column] = names
	}
	return out, nil
}

// describedLevels are the levels of a column as its details write them;
// numeric says they are values, matched as numbers.
type describedLevels struct {
	names   []string
	numeric bool
}

// find returns the level that s stands for: itself for a categorical
// column, the value it reads as for a numeric one.
func (l describedLevels) find(s string) (string, bool) {
	if l.numeric {
		v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
		if err != nil {
			return "", false
		}
		s = strconv.FormatFloat(v, 'g', -1, 64)
	}
	for _, n := range l.names {
		if n == s {
			return n, true
		}
	}
	return "", false
}

// columnLevels returns the levels the details will describe column c by,
// or an error saying why it has none.
func columnLevels(spec *Spec, d *Dataset, c string) (describedLevels, error) {
	for _, col := range append(append([]Column(nil), d.Columns...), d.Outside...) {
		if col.Name != c {
			continue
		}
		if col.Categorical {
			return describedLevels{names: col.Levels}, nil
		}
		var present []float64
		for i, v := range col.Values {
			if !math.IsNaN(v) && (col.Missing == nil || !col.Missing[i]) {
				present = append(present, v)
			}
		}
		values, ok := twoValues(present, nil)
		if !ok {
			return describedLevels{}, fmt.Errorf("column %q is numeric with more than two values; levels name those of a categorical column or of a column with at most two values", c)
		}
		l := describedLevels{numeric: true}
		for _, v := range values {
			l.names = append(l.names, strconv.FormatFloat(v, 'g', -1, 64))
		}
		return l, nil
	}
	return describedLevels{}, fmt.Errorf("column %q is not described by levels (only graph columns and model inputs are)", c)
}
