package fairness

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"

	"github.com/parquet-go/parquet-go"
)

// ErrParquet is wrapped by the *DataError of a Parquet file that cannot be
// read: not a Parquet file, a damaged footer or page, a column whose
// values do not match its row group.
var ErrParquet = errors.New("unreadable Parquet file")

// MaxParquetCells caps rows × columns read from a Parquet file, the
// counterpart of MaxDataBytes for a compressed format (a 2 GiB CSV file
// of 8-byte cells holds about this many).
const MaxParquetCells = 1 << 28

// IsParquet reports whether a data path names a Parquet file: its
// extension is .parquet (any case). Every other file is read as CSV.
func IsParquet(path string) bool { return strings.EqualFold(filepath.Ext(path), ".parquet") }

// loadParquet reads the Parquet file named by spec.DataPath (ReadParquet).
func loadParquet(spec *Spec) (*Dataset, error) {
	f, err := os.Open(spec.DataPath)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, &DataError{File: spec.DataPath, Err: wrapf(ErrFileNotFound, "data file not found (key data on line %d of %s)", spec.KeyLine("data"), spec.File)}
		}
		return nil, &DataError{File: spec.DataPath, Err: wrapf(ErrReadFailed, "cannot open data file: %v", err)}
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return nil, &DataError{File: spec.DataPath, Err: wrapf(ErrReadFailed, "cannot read data file: %v", err)}
	}
	return ReadParquet(f, st.Size(), spec.DataPath, spec)
}

// ReadParquet reads a Parquet file of size bytes from r; name identifies it
// in errors. It reads only the columns the spec uses (the group, the
// label, the score, the graph's columns and the declared model inputs),
// row group by row group, and passes every row through the same checks
// as ReadData, so the same data give the same Dataset (and the same
// result) from either format. Each value becomes the cell a CSV file
// would hold (readerOf): a null is a missing value, as are NaN and the
// text "NA"; booleans read as true/false, integers and decimals exactly,
// FLOAT and DOUBLE as the shortest decimal that reads back as the same
// number; text must be UTF-8. Columns must be flat (not nested, not
// repeated) and of those types; dates, times, timestamps and other types
// are refused naming the column. Errors are *DataErrors naming the
// column and the row (RowGroup, Row: 1-based, Row counted over the whole
// file; Dataset.Lines holds these rows); a file that cannot be read wraps
// ErrParquet. A file above MaxDataBytes, or with more than MaxParquetCells
// cells to read, is refused (ErrTooLarge).
func ReadParquet(r io.ReaderAt, size int64, name string, spec *Spec) (*Dataset, error) {
	l := &csvLoader{name: name, spec: spec, parquet: true}
	sum, err := l.readParquet(r, size)
	if err != nil {
		return nil, err
	}
	return l.dataset(sum)
}

// readParquet passes every row of the Parquet file through the loader's
// checks (readRows) and returns the file's digest.
func (l *csvLoader) readParquet(r io.ReaderAt, size int64) (sum string, err error) {
	defer func() {
		// The Parquet reader panics on some damaged files (a schema it
		// cannot interpret); that is bad input, not a bug of gapwise.
		if v := recover(); v != nil {
			sum, err = "", l.derr(0, "", wrapf(ErrParquet, "not a readable Parquet file: %v", v))
		}
	}()
	if size > MaxDataBytes {
		return "", l.derr(0, "", fmt.Errorf("the data file is larger than the limit of %d bytes: %w", int64(MaxDataBytes), ErrTooLarge))
	}
	h := sha256.New()
	if _, err := io.Copy(h, io.NewSectionReader(r, 0, size)); err != nil {
		return "", l.derr(0, "", wrapCause(ErrReadFailed, err, "cannot read data file: %v", err))
	}
	pf, err := parquet.OpenFile(r, size, parquet.SkipPageIndex(true), parquet.SkipBloomFilters(true))
	if err != nil {
		return "", l.derr(0, "", wrapCause(ErrParquet, err, "not a readable Parquet file: %v", err))
	}
	src, err := newParquetRecords(pf, l)
	if err != nil {
		return "", err
	}
	l.cr, l.rowStarts = src, src.starts
	l.header, l.width, l.named = src.names, len(src.names), len(src.names)
	pos := map[string]int{}
	for i, n := range src.names {
		pos[n] = i
	}
	if err := l.locateColumns(pos); err != nil {
		return "", err
	}
	l.newDataset()
	if err := l.readRows(); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// parquetRecords yields the rows of a Parquet file's used columns as text
// cells, one row group in memory at a time; it is the loader's records.
type parquetRecords struct {
	l      *csvLoader
	file   *parquet.File
	names  []string       // the used columns, in the loader's field order
	leaves []int          // each one's leaf column index
	conv   []columnReader // each one's cell converter
	starts []int          // rows of the file before each row group

	group int        // the row group held, -1 before the first
	cells [][]string // per field, the row group's cells
	next  int        // the next row of the group to yield
	rec   []string
	row   int // 1-based file row of the record last read
}

// newParquetRecords finds the columns the spec uses among the file's
// top-level columns, refusing one absent, nested, repeated or of a type
// gapwise does not read, and a file with more cells than MaxParquetCells.
func newParquetRecords(pf *parquet.File, l *csvLoader) (*parquetRecords, error) {
	spec := l.spec
	wanted := append(append(slices.Clip(spec.Groups.DataColumns()), spec.Label, spec.Score), spec.Columns()...)
	wanted = append(wanted, spec.OutsideInputs()...)
	p := &parquetRecords{l: l, file: pf, group: -1}
	seen := map[string]bool{}
	for _, name := range wanted {
		if seen[name] {
			continue
		}
		seen[name] = true
		col := pf.Root().Column(name)
		switch {
		case col == nil:
			return nil, l.derr(0, name, wrapf(ErrMissingColumn, "not found among the Parquet file's columns (needed by the spec)%s", parquetColumnList(pf)))
		case !col.Leaf():
			return nil, l.derr(0, name, wrapf(ErrParquet, "is a nested column (a group, list or map) in the Parquet schema; gapwise reads flat columns"))
		case col.Repeated():
			return nil, l.derr(0, name, wrapf(ErrParquet, "is a repeated column in the Parquet schema; gapwise reads one value per row"))
		}
		conv, why := readerOf(col.Type())
		if why != "" {
			return nil, l.derr(0, name, wrapf(ErrParquet, "gapwise cannot read it: %s; store it as numbers, text or booleans", why))
		}
		p.names = append(p.names, name)
		p.leaves = append(p.leaves, col.Index())
		p.conv = append(p.conv, conv)
	}
	if cells := pf.NumRows() * int64(len(p.names)); cells > MaxParquetCells {
		return nil, l.derr(0, "", fmt.Errorf("the file holds %d rows × %d used columns, above the limit of %d cells: %w", pf.NumRows(), len(p.names), MaxParquetCells, ErrTooLarge))
	}
	n := 0
	for _, rg := range pf.RowGroups() {
		p.starts = append(p.starts, n)
		n += int(rg.NumRows())
	}
	p.cells = make([][]string, len(p.names))
	p.rec = make([]string, len(p.names))
	return p, nil
}

// parquetColumnList lists, for the message on an absent column, the
// file's top-level columns (at most 20).
func parquetColumnList(pf *parquet.File) string {
	var names []string
	for _, c := range pf.Root().Columns() {
		names = append(names, fmt.Sprintf("%q", c.Name()))
	}
	if len(names) == 0 {
		return "; the file has no columns"
	}
	more := ""
	if len(names) > 20 {
		names, more = names[:20], ", ..."
	}
	return "; the file has " + strings.Join(names, ", ") + more
}

// Read returns the next row's cells (the slice is reused), io.EOF after
// the last row, or a *DataError.
func (p *parquetRecords) Read() ([]string, error) {
	for p.group < 0 || p.next >= len(p.cells[0]) {
		if p.group+1 >= len(p.file.RowGroups()) {
			return nil, io.EOF
		}
		p.group++
		if err := p.load(); err != nil {
			return nil, err
		}
	}
	for j := range p.cells {
		p.rec[j] = p.cells[j][p.next]
	}
	p.row = p.starts[p.group] + p.next + 1
	p.next++
	return p.rec, nil
}

// FieldPos returns the 1-based file row of the record last read (the
// loader's "line"); the column is 0.
func (p *parquetRecords) FieldPos(int) (line, column int) { return p.row, 0 }

// load reads every used column of row group p.group into p.cells.
func (p *parquetRecords) load() error {
	rg := p.file.RowGroups()[p.group]
	rows := int(rg.NumRows())
	chunks := rg.ColumnChunks()
	p.next = 0
	var buf []parquet.Value
	for j, leaf := range p.leaves {
		cells := p.cells[j][:0]
		pages := chunks[leaf].Pages()
		for {
			page, err := pages.ReadPage()
			if err == io.EOF {
				break
			}
			if err != nil {
				pages.Close()
				return p.groupErr(j, wrapCause(ErrParquet, err, "cannot read the column: %v", err))
			}
			if n := int(page.NumValues()); cap(buf) < n {
				buf = make([]parquet.Value, n)
			}
			vr := page.Values()
			for {
				n, err := vr.ReadValues(buf[:cap(buf)])
				for _, v := range buf[:n] {
					s, cerr := p.conv[j].cell(v)
					if cerr != nil {
						parquet.Release(page)
						pages.Close()
						return p.l.derr(p.starts[p.group]+len(cells)+1, p.names[j], cerr)
					}
					cells = append(cells, s)
				}
				if err == io.EOF {
					break
				}
				if err != nil {
					parquet.Release(page)
					pages.Close()
					return p.groupErr(j, wrapCause(ErrParquet, err, "cannot read the column's values: %v", err))
				}
				if n == 0 {
					break
				}
			}
			parquet.Release(page)
		}
		pages.Close()
		if len(cells) != rows {
			return p.groupErr(j, wrapf(ErrParquet, "the column holds %d values but the row group has %d rows", len(cells), rows))
		}
		p.cells[j] = cells
	}
	if rows == 0 {
		for j := range p.cells {
			p.cells[j] = p.cells[j][:0]
		}
	}
	return nil
}

// groupErr is the *DataError of a problem with field j's column in the row
// group being read.
func (p *parquetRecords) groupErr(j int, err error) error {
	return &DataError{File: p.l.name, Column: p.names[j], RowGroup: p.group + 1, Err: err}
}

// rowGroupOf returns the 1-based row group of a 1-based file row.
func rowGroupOf(starts []int, row int) int {
	return sort.Search(len(starts), func(i int) bool { return starts[i] >= row })
}
