package fairness

import (
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"slices"
	"sort"
	"strings"
)

// Column is one graph column of a Dataset.
type Column struct {
	Name        string
	Categorical bool
	Values      []float64 // per kept row: the number, or for a categorical column the level's index in Levels
	Levels      []string  // categorical only: the levels seen in kept rows, sorted
	// Missing marks, with missing: indicator, the kept rows whose value of
	// this numeric column was missing and filled (fillMissing); nil when
	// none was. A categorical column has the level MissingLevel instead.
	Missing []bool
}

// Dataset holds the records of the two audited groups.
type Dataset struct {
	Path    string
	SHA256  string   // hex SHA-256 of the file's bytes
	Columns []Column // every graph column, in order of first appearance in the graph
	// Outside holds the declared model inputs in no graph node
	// (Spec.OutsideInputs), for description only: a missing value is NaN
	// there and drops no row.
	Outside []Column

	Labels     []float64 // 0/1 per kept row
	Scores     []float64 // in [0, 1] per kept row
	Comparison []bool    // false: reference group, true: comparison group
	Lines      []int     // 1-based CSV line of each kept row; for a Parquet file its 1-based row

	DroppedReference, DroppedComparison int // rows dropped for missing values (missing: drop)

	// Excluded counts the rows of other groups per group value (see
	// ExcludedValue), most rows first; ExcludedRows is their total,
	// including values beyond the ones listed. MissingGroupRows counts rows
	// skipped because their group value is missing (missing: drop).
	Excluded         []ExcludedValue
	ExcludedRows     int
	MissingGroupRows int

	// Complete holds the label and score of every audited row that has
	// both, dropped or not, when rows were dropped for missing values; nil
	// otherwise.
	Complete *Outcomes

	// LabelValues is how label words were read (spec key positive); nil
	// when the labels are 0/1 or true/false.
	LabelValues *LabelValues

	// levelNames holds the display names of the columns' levels (spec key
	// names; levelNames), set by prepare.
	levelNames map[string]map[string]string
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

// LoadData reads the data file named by spec.DataPath: a Parquet file when
// its extension is .parquet (IsParquet, ReadParquet), CSV otherwise
// (ReadData).
func LoadData(spec *Spec) (*Dataset, error) {
	if IsParquet(spec.DataPath) {
		return loadParquet(spec)
	}
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
// or comparison value; rows of other groups are not audited but counted
// per group value (Dataset.Excluded).
//
// The file is CSV (RFC 4180, with either line ending) in UTF-8; a UTF-8
// byte-order mark before the header is skipped, and text that is not
// valid UTF-8 (or a UTF-16 file) is refused, naming its line and column.
// Header fields left unnamed (as spreadsheet exports write for empty
// trailing columns) are ignored when every cell under them is blank, and a
// row may then omit them; a value under an unnamed field is refused.
//
// Cells are trimmed of surrounding blanks. A cell that is empty, "NA" or
// "NaN" (any case) is missing: with spec.Missing = "error" it is an error,
// with "drop" the row is dropped and counted per group (a row whose group
// value is missing belongs to neither group and is counted as such). The
// label accepts 0, 1, true and false (any case), or with spec.Positive
// the two values of a label column of words (labelCoder); the score must
// be a number in [0, 1]; other graph columns must be finite numbers unless listed as
// categorical, in which case their levels are sorted and coded 0, 1, ...
// in that order. Numbers are decimal with an optional exponent
// (parseDecimal). Every problem is a *DataError carrying the line and
// column involved. Each group must keep at least spec.Folds rows.
func ReadData(r io.Reader, name string, spec *Spec) (*Dataset, error) {
	h := sha256.New()
	text, err := skipBOM(io.TeeReader(r, h))
	if err != nil {
		return nil, (&csvLoader{name: name}).textErr(err)
	}
	cr := csv.NewReader(text)
	cr.FieldsPerRecord = -1
	cr.ReuseRecord = true
	l := &csvLoader{cr: cr, name: name, spec: spec}
	if err := l.readHeader(cr); err != nil {
		return nil, err
	}
	if err := l.readRows(); err != nil {
		return nil, err
	}
	return l.dataset(hex.EncodeToString(h.Sum(nil)))
}

// dataset finishes the loader's dataset once every row is read: the label
// words, the groups' sizes, the categorical levels, the filled missing
// values (missing: indicator), the excluded rows and the file's digest
// sum.
func (l *csvLoader) dataset(sum string) (*Dataset, error) {
	spec := l.spec
	if err := l.labels.check(); err != nil {
		return nil, l.derr(0, spec.Label, err)
	}
	if err := l.checkGroups(); err != nil {
		return nil, err
	}
	d := l.d
	for j := range d.Columns {
		if d.Columns[j].Categorical {
			d.Columns[j].Levels, d.Columns[j].Values = codeLevels(l.raw[j])
		}
	}
	d.Columns, d.Outside = d.Columns[:l.nGraph], d.Columns[l.nGraph:]
	if spec.IndicateMissing() {
		if err := fillMissing(d); err != nil {
			return nil, l.derr(0, err.column, err.err)
		}
	}
	if d.DroppedReference+d.DroppedComparison > 0 {
		d.Complete = &l.complete
	}
	d.LabelValues = l.labels.values()
	d.Excluded = l.excluded.list(spec.Groups.Reference, spec.Groups.Comparison)
	d.ExcludedRows, d.MissingGroupRows = l.excluded.total(), l.excluded.missingRows
	d.SHA256 = sum
	return d, nil
}

// records is the row source of a loader: encoding/csv's Reader, or the
// rows of a Parquet file's used columns as text cells (parquetRecords),
// whose "line" is the row of the file.
type records interface {
	Read() ([]string, error)
	FieldPos(field int) (line, column int)
}

// csvLoader holds the state of ReadData (and ReadParquet) between its
// phases: the header's column positions, the dataset being filled and the
// per-group counts.
type csvLoader struct {
	cr   records
	name string
	spec *Spec
	// parquet marks a Parquet file: lines are the file's rows, located in
	// their row groups by rowStarts (the rows before each group).
	parquet   bool
	rowStarts []int

	width              int      // fields of the header
	named              int      // fields up to the last named one
	header             []string // trimmed names; "" for unnamed fields
	labelIdx, scoreIdx int      // their fields
	groupIdx           []int    // fields of the group columns (GroupSpec.DataColumns)
	groupBands         []*GroupBands
	groupParts         []string // buffer of groupOf
	names              []string // graph columns (Spec.Columns), then Spec.OutsideInputs
	nGraph             int      // how many of names are graph columns
	colIdx             []int    // field of each graph column
	categorical        map[string]bool
	probability        map[string]bool // declared under probabilities

	d                      *Dataset
	raw                    [][]string // categorical cells of kept rows
	rows, seenRef, seenCmp int        // all records, and those of each group
	rowVals                []float64
	rowRaw                 []string
	excluded               excludedCounter  // rows of other groups
	scan                   *excludedCounter // non-nil: count every group value and keep no row (scanGroupValues)
	labels                 labelCoder       // reads the label cells (spec key positive)
	complete               Outcomes         // label and score of every audited row that has both
}

// derr builds the *DataError of a problem at line (0: none) and column;
// in a Parquet file the line is the file's row, reported with its row
// group.
func (l *csvLoader) derr(line int, col string, err error) error {
	if l.parquet {
		e := &DataError{File: l.name, Row: line, Column: col, Err: err}
		if line > 0 {
			e.RowGroup = rowGroupOf(l.rowStarts, line)
		}
		return e
	}
	return &DataError{File: l.name, Line: line, Column: col, Err: err}
}

// missingText describes a missing cell in a message: quoted, or for a
// Parquet file's empty cell "(null or empty text)".
func (l *csvLoader) missingText(cell string) string {
	if l.parquet && cell == "" {
		return "(null or empty text)"
	}
	return fmt.Sprintf("%q", cell)
}

// textErr maps an error of the text layer (skipBOM): an encoding error
// passes as is, anything else is a read failure.
func (l *csvLoader) textErr(err error) error {
	if errors.Is(err, ErrEncoding) {
		return l.derr(0, "", err)
	}
	return l.csvErr(err)
}

// csvErr maps a csv.Reader error, keeping it reachable (errors.As); a
// *DataError (from the Parquet rows) passes as is.
func (l *csvLoader) csvErr(err error) error {
	var de *DataError
	if errors.As(err, &de) {
		return err
	}
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return l.derr(pe.Line, "", wrapCause(ErrCSVSyntax, pe, "malformed CSV at column %d: %v", pe.Column, pe.Err))
	}
	return l.derr(0, "", wrapCause(ErrReadFailed, err, "cannot read data file: %v", err))
}

// readHeader reads the header row, refuses invalid UTF-8 and duplicate
// names, notes the unnamed fields and finds every column the spec needs
// (locateColumns).
func (l *csvLoader) readHeader(cr *csv.Reader) error {
	header, err := cr.Read()
	if err == io.EOF {
		return l.derr(0, "", wrapf(ErrEmptyFile, "the file is empty; it needs a header row and records"))
	}
	if err != nil {
		return l.csvErr(err)
	}
	l.header = make([]string, len(header))
	pos := map[string]int{}
	for i, hname := range header {
		if err := checkUTF8(hname); err != nil {
			line, col := cr.FieldPos(i)
			return l.derr(line, "", fmt.Errorf("header field %d (starting at byte %d of the line): %w", i+1, col, err))
		}
		hname = strings.TrimSpace(hname)
		l.header[i] = hname
		if hname == "" {
			continue
		}
		if _, dup := pos[hname]; dup {
			return l.derr(1, hname, wrapf(ErrDuplicateHeader, "appears twice in the header (fields %d and %d)", pos[hname]+1, i+1))
		}
		pos[hname] = i
		l.named = i + 1
	}
	l.width = len(header)
	if err := l.locateColumns(pos); err != nil {
		return err
	}
	l.newDataset()
	return nil
}

// locateColumns finds the group, label, score and graph columns among the
// header positions pos, in that order, refusing the first one absent.
func (l *csvLoader) locateColumns(pos map[string]int) error {
	spec := l.spec
	l.names = spec.Columns()
	l.nGraph = len(l.names)
	l.names = append(l.names, spec.OutsideInputs()...)
	gcols := spec.Groups.DataColumns()
	wanted := append(append(slices.Clip(gcols), spec.Label, spec.Score), l.names...)
	idx := make([]int, len(wanted))
	for k, col := range wanted {
		i, ok := pos[col]
		if !ok {
			return l.derr(1, col, wrapf(ErrMissingColumn, "not found in the header (needed by the spec%s)%s", l.groupKeyHint(k), separatorHint(l.header)))
		}
		idx[k] = i
	}
	ng := len(gcols)
	l.groupIdx, l.labelIdx, l.scoreIdx, l.colIdx = idx[:ng], idx[ng], idx[ng+1], idx[ng+2:]
	l.groupBands, l.groupParts = make([]*GroupBands, ng), make([]string, ng)
	for j, c := range gcols {
		l.groupBands[j] = spec.Groups.bandsOf(c)
	}
	l.categorical = map[string]bool{}
	for _, c := range spec.Categorical {
		l.categorical[c] = true
	}
	l.probability = map[string]bool{}
	for _, c := range spec.Probabilities {
		l.probability[c] = true
	}
	return nil
}

// newDataset starts the dataset with one empty Column per graph column and
// sizes the per-row buffers.
func (l *csvLoader) newDataset() {
	l.d = &Dataset{Path: l.name, Columns: make([]Column, len(l.names))}
	l.labels = labelCoder{positive: l.spec.Positive}
	if l.parquet {
		l.labels.place = "row"
	}
	l.raw = make([][]string, len(l.names))
	for j, c := range l.names {
		l.d.Columns[j] = Column{Name: c, Categorical: l.categorical[c]}
	}
	l.rowVals = make([]float64, len(l.names))
	l.rowRaw = make([]string, len(l.names))
}

// readRows reads every record after the header (readRow).
func (l *csvLoader) readRows() error {
	for {
		rec, err := l.cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return l.csvErr(err)
		}
		if err := l.readRow(rec); err != nil {
			return err
		}
	}
	if l.rows == 0 {
		return l.derr(0, "", wrapf(ErrNoRecords, "the file has a header but no records"))
	}
	return nil
}

// csvRow is one record being read: its fields, its line, and whether a
// missing value drops it.
type csvRow struct {
	l              *csvLoader
	rec            []string
	dropped        bool
	outcomeMissing bool // the label or the score is missing
}

func (r *csvRow) cell(i int) string {
	if i >= len(r.rec) {
		return "" // an omitted trailing unnamed field
	}
	return strings.TrimSpace(r.rec[i])
}
func (r *csvRow) at(i int) int { line, _ := r.l.cr.FieldPos(i); return line }

// missing reports whether field i (column col; outcome: the label or the
// score) is missing. With missing: drop it marks the row dropped; with
// missing: indicator only a missing outcome does (a graph column's value
// is then filled and indicated); with missing: error it is an error.
func (r *csvRow) missing(i int, col string, outcome bool) (bool, error) {
	if !isMissing(r.cell(i)) {
		return false, nil
	}
	r.outcomeMissing = r.outcomeMissing || outcome
	spec := r.l.spec
	if spec.DropMissing() || (spec.IndicateMissing() && outcome) {
		r.dropped = true
		return true, nil
	}
	if spec.IndicateMissing() {
		return true, nil
	}
	return true, r.l.derr(r.at(i), col, wrapf(ErrMissingValue, "missing value %s (set missing: drop to drop such rows, or missing: indicator to keep them)", r.l.missingText(r.cell(i))))
}

// readRow checks one record's width and group, parses its label, score
// and graph columns, and keeps it unless a missing value drops it (counted
// per group). Rows of other groups are skipped.
func (l *csvLoader) readRow(rec []string) error {
	l.rows++
	if err := l.checkFields(rec); err != nil {
		return err
	}
	line, _ := l.cr.FieldPos(0)
	r := &csvRow{l: l, rec: rec}
	spec := l.spec
	g, miss, err := l.groupOf(r)
	if err != nil {
		return err
	}
	isCmp := g == spec.Groups.Comparison
	if miss >= 0 {
		if !spec.ToleratesMissing() {
			return l.derr(r.at(l.groupIdx[miss]), spec.Groups.DataColumns()[miss], wrapf(ErrMissingValue, "missing group value %s (set missing: drop to skip such rows)", l.missingText(g)))
		}
		l.excluded.missingRows++
		return nil
	}
	if l.scan != nil {
		l.scan.add(g) // scanGroupValues: every value counted, nothing kept
		return nil
	}
	if !isCmp && g != spec.Groups.Reference {
		l.excluded.add(g)
		return nil
	}
	if isCmp {
		l.seenCmp++
	} else {
		l.seenRef++
	}
	label, score, err := l.parseOutcome(r)
	if err != nil {
		return err
	}
	if err := l.parseColumns(r, label, score); err != nil {
		return err
	}
	if spec.DropMissing() && !r.outcomeMissing {
		l.complete.add(label, score, isCmp)
	}
	if r.dropped {
		if isCmp {
			l.d.DroppedComparison++
		} else {
			l.d.DroppedReference++
		}
		return nil
	}
	l.keep(line, label, score, isCmp)
	return nil
}

// checkFields checks a record's width against the header (a row may omit
// or add trailing fields that are unnamed in the header, or beyond it, as
// long as they are blank), that every field is UTF-8 text, and that no
// unnamed field holds a value.
func (l *csvLoader) checkFields(rec []string) error {
	if len(rec) < l.named {
		line, _ := l.cr.FieldPos(0)
		return l.derr(line, "", wrapf(ErrRaggedRow, "the row has %d fields but the header has %d", len(rec), l.width))
	}
	for i, f := range rec {
		if err := checkUTF8(f); err != nil {
			line, col := l.cr.FieldPos(i)
			return l.derr(line, fieldName(l.header, i), fmt.Errorf("field %d (starting at byte %d of the line): %w", i+1, col, err))
		}
		if (i >= l.width || l.header[i] == "") && strings.TrimSpace(f) != "" {
			line, col := l.cr.FieldPos(i)
			if i >= l.width {
				return l.derr(line, "", wrapf(ErrRaggedRow, "the row has %d fields but the header has %d (field %d, starting at byte %d of the line, holds %q)", len(rec), l.width, i+1, col, f))
			}
			return l.derr(line, "", wrapf(ErrUnnamedColumn, "field %d (starting at byte %d of the line) holds %q but has no name in the header; name the column or delete it", i+1, col, f))
		}
	}
	return nil
}

// parseOutcome parses the row's label and score (zero when missing).
func (l *csvLoader) parseOutcome(r *csvRow) (label, score float64, err error) {
	spec := l.spec
	if m, err := r.missing(l.labelIdx, spec.Label, true); err != nil {
		return 0, 0, err
	} else if !m {
		if label, err = l.labels.code(r.cell(l.labelIdx), r.at(l.labelIdx)); err != nil {
			return 0, 0, l.derr(r.at(l.labelIdx), spec.Label, err)
		}
	}
	if m, err := r.missing(l.scoreIdx, spec.Score, true); err != nil {
		return 0, 0, err
	} else if !m {
		if score, err = parseScore(r.cell(l.scoreIdx)); err != nil {
			return 0, 0, l.derr(r.at(l.scoreIdx), spec.Score, err)
		}
	}
	return label, score, nil
}

// parseColumns parses the row's graph columns into rowVals (numbers) and
// rowRaw (categorical cells); the label and score reuse their values.
func (l *csvLoader) parseColumns(r *csvRow, label, score float64) error {
	for j, c := range l.names {
		i := l.colIdx[j]
		if i == l.labelIdx || i == l.scoreIdx {
			l.rowVals[j] = label
			if i == l.scoreIdx {
				l.rowVals[j] = score
			}
			continue
		}
		if j >= l.nGraph && isMissing(r.cell(i)) { // outside the graph: described, never dropped
			l.rowVals[j], l.rowRaw[j] = math.NaN(), ""
			continue
		}
		m, err := r.missing(i, c, false)
		if err != nil {
			return err
		}
		switch {
		case m && l.categorical[c]:
			l.rowRaw[j] = MissingLevel // missing: indicator; dropped rows are not kept
		case m:
			l.rowVals[j] = math.NaN() // filled by fillMissing
		case l.categorical[c]:
			l.rowRaw[j] = r.cell(i)
		default:
			if l.rowVals[j], err = parseNumber(r.cell(i)); err != nil {
				return l.derr(r.at(i), c, err)
			}
			if v := l.rowVals[j]; l.probability[c] && !(v >= 0 && v <= 1) {
				return l.derr(r.at(i), c, wrapf(ErrProbabilityRange, "%q is outside [0, 1] (the column is listed under probabilities)", r.cell(i)))
			}
		}
	}
	return nil
}

// keep appends the parsed row to the dataset.
func (l *csvLoader) keep(line int, label, score float64, isCmp bool) {
	d := l.d
	d.Labels = append(d.Labels, label)
	d.Scores = append(d.Scores, score)
	d.Comparison = append(d.Comparison, isCmp)
	d.Lines = append(d.Lines, line)
	for j := range l.names {
		d.Columns[j].Values = append(d.Columns[j].Values, l.rowVals[j])
		if l.categorical[l.names[j]] {
			l.raw[j] = append(l.raw[j], l.rowRaw[j])
		}
	}
}

// checkGroups refuses a group value that never appears and a group that
// keeps fewer rows than there are folds.
func (l *csvLoader) checkGroups() error {
	spec := l.spec
	for _, gc := range []struct {
		value string
		seen  int
	}{{spec.Groups.Reference, l.seenRef}, {spec.Groups.Comparison, l.seenCmp}} {
		if gc.seen == 0 {
			return l.derr(0, spec.Groups.Column, wrapf(ErrGroupAbsent, "group value %q does not appear in %s%s", gc.value, l.spec.Groups.where("the column"), l.presentValues(gc.value)))
		}
	}
	nRef, nCmp := l.d.Counts()
	for _, gc := range []struct {
		value      string
		kept, seen int
	}{{spec.Groups.Reference, nRef, l.seenRef}, {spec.Groups.Comparison, nCmp, l.seenCmp}} {
		if gc.kept < spec.Folds {
			return l.derr(0, spec.Groups.Column, wrapf(ErrTooFewRecords, "group %q keeps %d of its %d rows; cross-fitting with %d folds needs at least %d", gc.value, gc.kept, gc.seen, spec.Folds, spec.Folds))
		}
	}
	return nil
}

// presentValues lists, for the message on an absent group value, the
// values the group column does hold (the chosen ones and the most frequent
// others, with their rows), marking those that differ from absent only in
// case or spacing; "" when the column holds none.
func (l *csvLoader) presentValues(absent string) string {
	type seen struct {
		value string
		rows  int
	}
	var vals []seen
	for _, c := range []seen{{l.spec.Groups.Reference, l.seenRef}, {l.spec.Groups.Comparison, l.seenCmp}} {
		if c.rows > 0 {
			vals = append(vals, c)
		}
	}
	for _, e := range l.excluded.list(absent, absent) {
		vals = append(vals, seen{e.Value, e.Rows})
	}
	if len(vals) == 0 {
		return ""
	}
	var parts []string
	for i, v := range vals {
		if i == 6 {
			parts = append(parts, "...")
			break
		}
		p := fmt.Sprintf("%q (%s", v.value, rowsText(v.rows))
		if resembles(v.value, absent, absent) != "" {
			p += ", differs only in case or spacing"
		}
		parts = append(parts, p+")")
	}
	return "; it holds " + strings.Join(parts, ", ")
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
	v, ok := parseDecimal(cell)
	if !ok || (v != 0 && v != 1) {
		return 0, wrapf(ErrNotBinary, "label %q is not 0, 1, true or false", cell)
	}
	return v, nil
}

// parseScore accepts a number in [0, 1].
func parseScore(cell string) (float64, error) {
	v, ok := parseDecimal(cell)
	if !ok {
		return 0, wrapf(ErrNotNumeric, "score %q is not a number", cell)
	}
	if !(v >= 0 && v <= 1) {
		return 0, wrapf(ErrScoreRange, "score %q is outside [0, 1]", cell)
	}
	return v, nil
}

// parseNumber accepts a finite number in the grammar of parseDecimal.
func parseNumber(cell string) (float64, error) {
	v, ok := parseDecimal(cell)
	if !ok {
		return 0, wrapf(ErrNotNumeric, "%q is not a number (numbers are decimal with an optional exponent, e.g. 12.4 or 1.5e-3; list the column under categorical: if it holds categories)", cell)
	}
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, wrapf(ErrNotNumeric, "%q is not a finite number", cell)
	}
	return v, nil
}

// codeLevels returns the sorted distinct values of cells and each cell's
// index among them; an empty cell (a missing value of a column outside the
// graph) is no level and gets the code NaN.
func codeLevels(cells []string) (levels []string, codes []float64) {
	index := map[string]int{}
	for _, c := range cells {
		if _, ok := index[c]; !ok && c != "" {
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
		if c == "" {
			codes[i] = math.NaN()
		}
	}
	return levels, codes
}
