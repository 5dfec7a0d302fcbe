package fairness

import (
	"os"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"
)

// parquetType is how writeParquet stores a column: its schema node and
// how a CSV cell becomes a value of it.
type parquetType struct {
	node  parquet.Node
	value func(cell string) (parquet.Value, error)
}

// parquetTypes are the column types the tests write. Every column is
// optional: an empty cell is written as a null.
var parquetTypes = map[string]parquetType{
	"string": {parquet.String(), func(c string) (parquet.Value, error) { return parquet.ByteArrayValue([]byte(c)), nil }},
	"bytes":  {parquet.Leaf(parquet.ByteArrayType), func(c string) (parquet.Value, error) { return parquet.ByteArrayValue([]byte(c)), nil }},
	"double": {parquet.Leaf(parquet.DoubleType), func(c string) (parquet.Value, error) {
		v, err := strconv.ParseFloat(c, 64)
		return parquet.DoubleValue(v), err
	}},
	"float": {parquet.Leaf(parquet.FloatType), func(c string) (parquet.Value, error) {
		v, err := strconv.ParseFloat(c, 32)
		return parquet.FloatValue(float32(v)), err
	}},
	"int64": {parquet.Int(64), func(c string) (parquet.Value, error) {
		v, err := strconv.ParseInt(c, 10, 64)
		return parquet.Int64Value(v), err
	}},
	"int32": {parquet.Leaf(parquet.Int32Type), func(c string) (parquet.Value, error) {
		v, err := strconv.ParseInt(c, 10, 32)
		return parquet.Int32Value(int32(v)), err
	}},
	"uint32": {parquet.Uint(32), func(c string) (parquet.Value, error) {
		v, err := strconv.ParseUint(c, 10, 32)
		return parquet.Int32Value(int32(uint32(v))), err
	}},
	"bool": {parquet.Leaf(parquet.BooleanType), func(c string) (parquet.Value, error) {
		v, err := strconv.ParseBool(c)
		return parquet.BooleanValue(v), err
	}},
	// decimal1: DECIMAL(18, 1) on INT64; the cell must have one decimal.
	"decimal1": {parquet.Decimal(1, 18, parquet.Int64Type), func(c string) (parquet.Value, error) {
		v, err := strconv.ParseInt(strings.Replace(c, ".", "", 1), 10, 64)
		return parquet.Int64Value(v), err
	}},
	// date: DATE (days since 1970-01-01), which the loader refuses.
	"date": {parquet.Date(), func(c string) (parquet.Value, error) {
		v, err := strconv.ParseInt(c, 10, 32)
		return parquet.Int32Value(int32(v)), err
	}},
}

// writeParquet writes a table (a header and rows of CSV cells) as a
// Parquet file with parquet-go's writer: column name gets type
// types[name] (default double), every column optional, an empty cell a
// null, at most groupRows rows per row group (0: one group). It is the
// generator of every Parquet file the tests read (see
// testdata/parquet/README.md).
func writeParquet(t testing.TB, path string, header []string, rows [][]string, types map[string]string, groupRows int) {
	t.Helper()
	group := parquet.Group{}
	for _, h := range header {
		typ := types[h]
		if typ == "" {
			typ = "double"
		}
		group[h] = parquet.Optional(parquetTypes[typ].node)
	}
	schema := parquet.NewSchema("cohort", group)
	// A Group orders its fields by name; that is the leaf index of each.
	sorted := append([]string(nil), header...)
	sort.Strings(sorted)
	leaf := map[string]int{}
	for i, h := range sorted {
		leaf[h] = i
	}
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	opts := []parquet.WriterOption{schema}
	if groupRows > 0 {
		opts = append(opts, parquet.MaxRowsPerRowGroup(int64(groupRows)))
	}
	w := parquet.NewWriter(f, opts...)
	for r, rec := range rows {
		row := make(parquet.Row, len(header))
		for j, h := range header {
			typ := types[h]
			if typ == "" {
				typ = "double"
			}
			if rec[j] == "" {
				row[leaf[h]] = parquet.NullValue().Level(0, 0, leaf[h])
				continue
			}
			v, err := parquetTypes[typ].value(rec[j])
			if err != nil {
				t.Fatalf("row %d, column %s: %v", r+1, h, err)
			}
			row[leaf[h]] = v.Level(0, 1, leaf[h])
		}
		if _, err := w.WriteRows([]parquet.Row{row}); err != nil {
			t.Fatal(err)
		}
		if groupRows > 0 && (r+1)%groupRows == 0 {
			if err := w.Flush(); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
}

// csvTable splits CSV text without quotes into a header and rows.
func csvTable(text string) (header []string, rows [][]string) {
	lines := strings.Split(strings.TrimSpace(text), "\n")
	header = strings.Split(lines[0], ",")
	for _, l := range lines[1:] {
		rows = append(rows, strings.Split(l, ","))
	}
	return header, rows
}
