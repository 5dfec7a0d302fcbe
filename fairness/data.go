package fairness

import (
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"io"
	"io/fs"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"
)

// Column is one graph column of a Dataset.
type Column struct {
	Name        string
	Categorical bool
	Values      []float64 // per kept row: the number, or for a categorical column the level's index in Levels
	Levels      []string  // categorical only: the levels seen in kept rows, sorted
}

// Dataset holds the records of the two audited groups.
type Dataset struct {
	Path    string
	SHA256  string   // hex SHA-256 of the file's bytes
	Columns []Column // every graph column, in order of first appearance in the graph

	Labels     []float64 // 0/1 per kept row
	Scores     []float64 // in [0, 1] per kept row
	Comparison []bool    // false: reference group, true: comparison group
	Lines      []int     // 1-based CSV line of each kept row

	DroppedReference, DroppedComparison int // rows dropped for missing values (missing: drop)
}

// Counts returns the number of kept reference and comparison rows.
func (d *Dataset) Counts() (nRef, nCmp int) {
	for _, c := range d.Comparison {
		if c {
			nCmp++
		} else {
			nRef++
		}
	}
	return
}

// LoadData reads the CSV file named by spec.DataPath. See ReadData.
func LoadData(spec *Spec) (*Dataset, error) {
	f, err := os.Open(spec.DataPath)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, &DataError{File: spec.DataPath, Err: wrapf(ErrFileNotFound, "data file not found (key data on line %d of %s)", spec.KeyLine("data"), spec.File)}
		}
		return nil, &DataError{File: spec.DataPath, Err: wrapf(ErrReadFailed, "cannot open data file: %v", err)}
	}
	defer f.Close()
	return ReadData(&boundedReader{r: f, total: MaxDataBytes, line: MaxLineBytes}, spec.DataPath, spec)
}

// ReadData reads CSV records with a header row from r; name identifies the
// file in errors. It keeps the rows whose group column holds the reference
// or comparison value and ignores rows of other groups.
//
// Cells are trimmed of surrounding blanks. A cell that is empty, "NA" or
// "NaN" (any case) is missing: with spec.Missing = "error" it is an error,
// with "drop" the row is dropped and counted per group (a row whose group
// value is missing belongs to neither group and is skipped uncounted). The
// label accepts
// 0, 1, true and false (any case); the score must be a number in [0, 1];
// other graph columns must be finite numbers unless listed as categorical,
// in which case their levels are sorted and coded 0, 1, ... in that order.
// Every problem is a *DataError carrying the line and column involved.
// Each group must keep at least spec.Folds rows.
func ReadData(r io.Reader, name string, spec *Spec) (*Dataset, error) {
	h := sha256.New()
	cr := csv.NewReader(io.TeeReader(r, h))
	cr.FieldsPerRecord = -1
	cr.ReuseRecord = true
	derr := func(line int, col string, err error) error {
		return &DataError{File: name, Line: line, Column: col, Err: err}
	}
	csvErr := func(err error) error {
		var pe *csv.ParseError
		if errors.As(err, &pe) {
			return derr(pe.Line, "", wrapCause(ErrCSVSyntax, pe, "malformed CSV at column %d: %v", pe.Column, pe.Err))
		}
		return derr(0, "", wrapCause(ErrReadFailed, err, "cannot read data file: %v", err))
	}

	header, err := cr.Read()
	if err == io.EOF {
		return nil, derr(0, "", wrapf(ErrEmptyFile, "the file is empty; it needs a header row and records"))
	}
	if err != nil {
		return nil, csvErr(err)
	}
	pos := map[string]int{}
	for i, hname := range header {
		hname = strings.TrimSpace(hname)
		if i == 0 {
			hname = strings.TrimPrefix(hname, "\ufeff")
		}
		if _, dup := pos[hname]; dup {
			return nil, derr(1, hname, wrapf(ErrDuplicateHeader, "appears twice in the header (fields %d and %d)", pos[hname]+1, i+1))
		}
		pos[hname] = i
	}
	width := len(header)
	need := func(col string) (int, error) {
		i, ok := pos[col]
		if !ok {
			return 0, derr(1, col, wrapf(ErrMissingColumn, "not found in the header (needed by the spec)"))
		}
		return i, nil
	}
	groupIdx, err := need(spec.Groups.Column)
	if err != nil {
		return nil, err
	}
	labelIdx, err := need(spec.Label)
	if err != nil {
		return nil, err
	}
	scoreIdx, err := need(spec.Score)
	if err != nil {
		return nil, err
	}
	names := spec.Columns()
	colIdx := make([]int, len(names))
	categorical := map[string]bool{}
	for _, c := range spec.Categorical {
		categorical[c] = true
	}
	for j, c := range names {
		if colIdx[j], err = need(c); err != nil {
			return nil, err
		}
	}

	d := &Dataset{Path: name, Columns: make([]Column, len(names))}
	raw := make([][]string, len(names)) // categorical cells of kept rows
	for j, c := range names {
		d.Columns[j] = Column{Name: c, Categorical: categorical[c]}
	}
	var rows, seenRef, seenCmp int // all records, and those of each group
	rowVals := make([]float64, len(names))
	rowRaw := make([]string, len(names))
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvErr(err)
		}
		rows++
		line, _ := cr.FieldPos(0)
		if len(rec) != width {
			return nil, derr(line, "", wrapf(ErrRaggedRow, "the row has %d fields but the header has %d", len(rec), width))
		}
		cell := func(i int) string { return strings.TrimSpace(rec[i]) }
		at := func(i int) int { l, _ := cr.FieldPos(i); return l }

		g := cell(groupIdx)
		isCmp := g == spec.Groups.Comparison
		if isMissing(g) && !spec.DropMissing() {
			return nil, derr(at(groupIdx), spec.Groups.Column, wrapf(ErrMissingValue, "missing group value %q (set missing: drop to skip such rows)", g))
		}
		if !isCmp && g != spec.Groups.Reference {
			continue
		}
		if isCmp {
			seenCmp++
		} else {
			seenRef++
		}

		dropped := false
		missing := func(i int, col string) (bool, error) {
			if !isMissing(cell(i)) {
				return false, nil
			}
			if spec.DropMissing() {
				dropped = true
				return true, nil
			}
			return true, derr(at(i), col, wrapf(ErrMissingValue, "missing value %q (set missing: drop to drop such rows)", cell(i)))
		}
		var label, score float64
		if m, err := missing(labelIdx, spec.Label); err != nil {
			return nil, err
		} else if !m {
			if label, err = parseLabel(cell(labelIdx)); err != nil {
				return nil, derr(at(labelIdx), spec.Label, err)
			}
		}
		if m, err := missing(scoreIdx, spec.Score); err != nil {
			return nil, err
		} else if !m {
			if score, err = parseScore(cell(scoreIdx)); err != nil {
				return nil, derr(at(scoreIdx), spec.Score, err)
			}
		}
		for j, c := range names {
			i := colIdx[j]
			if i == labelIdx || i == scoreIdx {
				rowVals[j] = label
				if i == scoreIdx {
					rowVals[j] = score
				}
				continue
			}
			m, err := missing(i, c)
			if err != nil {
				return nil, err
			}
			switch {
			case m:
			case categorical[c]:
				rowRaw[j] = cell(i)
			default:
				if rowVals[j], err = parseNumber(cell(i)); err != nil {
					return nil, derr(at(i), c, err)
				}
			}
		}
		if dropped {
			if isCmp {
				d.DroppedComparison++
			} else {
				d.DroppedReference++
			}
			continue
		}
		d.Labels = append(d.Labels, label)
		d.Scores = append(d.Scores, score)
		d.Comparison = append(d.Comparison, isCmp)
		d.Lines = append(d.Lines, line)
		for j := range names {
			d.Columns[j].Values = append(d.Columns[j].Values, rowVals[j])
			if categorical[names[j]] {
				raw[j] = append(raw[j], rowRaw[j])
			}
		}
	}
	if rows == 0 {
		return nil, derr(0, "", wrapf(ErrNoRecords, "the file has a header but no records"))
	}
	for _, gc := range []struct {
		value string
		seen  int
	}{{spec.Groups.Reference, seenRef}, {spec.Groups.Comparison, seenCmp}} {
		if gc.seen == 0 {
			return nil, derr(0, spec.Groups.Column, wrapf(ErrGroupAbsent, "group value %q does not appear in the column", gc.value))
		}
	}
	nRef, nCmp := d.Counts()
	for _, gc := range []struct {
		value      string
		kept, seen int
	}{{spec.Groups.Reference, nRef, seenRef}, {spec.Groups.Comparison, nCmp, seenCmp}} {
		if gc.kept < spec.Folds {
			return nil, derr(0, spec.Groups.Column, wrapf(ErrTooFewRecords, "group %q keeps %d of its %d rows; cross-fitting with %d folds needs at least %d", gc.value, gc.kept, gc.seen, spec.Folds, spec.Folds))
		}
	}
	for j := range d.Columns {
		if d.Columns[j].Categorical {
			d.Columns[j].Levels, d.Columns[j].Values = codeLevels(raw[j])
		}
	}
	d.SHA256 = hex.EncodeToString(h.Sum(nil))
	return d, nil
}

// isMissing reports whether a trimmed cell is a missing value: empty, NA or
// NaN in any case.
func isMissing(cell string) bool {
	return cell == "" || strings.EqualFold(cell, "NA") || strings.EqualFold(cell, "NaN")
}

// parseLabel accepts 0, 1, true and false (any case), and numbers equal to
// 0 or 1 such as "1.0".
func parseLabel(cell string) (float64, error) {
	switch {
	case strings.EqualFold(cell, "true"):
		return 1, nil
	case strings.EqualFold(cell, "false"):
		return 0, nil
	}
	v, err := strconv.ParseFloat(cell, 64)
	if err != nil || (v != 0 && v != 1) {
		return 0, wrapf(ErrNotBinary, "label %q is not 0, 1, true or false", cell)
	}
	return v, nil
}

// parseScore accepts a number in [0, 1].
func parseScore(cell string) (float64, error) {
	v, err := strconv.ParseFloat(cell, 64)
	if err != nil && !errors.Is(err, strconv.ErrRange) {
		return 0, wrapf(ErrNotNumeric, "score %q is not a number", cell)
	}
	if !(v >= 0 && v <= 1) {
		return 0, wrapf(ErrScoreRange, "score %q is outside [0, 1]", cell)
	}
	return v, nil
}

// parseNumber accepts a finite number.
func parseNumber(cell string) (float64, error) {
	v, err := strconv.ParseFloat(cell, 64)
	if err != nil && !errors.Is(err, strconv.ErrRange) {
		return 0, wrapf(ErrNotNumeric, "%q is not a number (list the column under categorical: if it holds categories)", cell)
	}
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, wrapf(ErrNotNumeric, "%q is not a finite number", cell)
	}
	return v, nil
}

// codeLevels returns the sorted distinct values of cells and each cell's
// index among them.
func codeLevels(cells []string) (levels []string, codes []float64) {
	index := map[string]int{}
	for _, c := range cells {
		if _, ok := index[c]; !ok {
			index[c] = 0
			levels = append(levels, c)
		}
	}
	sort.Strings(levels)
	for i, l := range levels {
		index[l] = i
	}
	codes = make([]float64, len(cells))
	for i, c := range cells {
		codes[i] = float64(index[c])
	}
	return levels, codes
}
