package main

import (
	"bytes"
	"fmt"
	"sort"
	"strconv"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress/zstd"

	"github.com/gapwise/gapwise/fairness/synth"
)

// demoParquetData is the demo cohort's file with --parquet.
const demoParquetData = "cohort.parquet"

// demoParquet encodes the demo cohort as a Parquet file (Zstandard
// compression) of one row group per 5,000 rows: the sex as text (STRING), the age and the label as
// INT64, the other columns as DOUBLE, every value parsed from the cell
// the CSV file holds, so that the two files hold the same data and give
// the same result.
func demoParquet(t *synth.Table) ([]byte, error) {
	text := map[string]bool{synth.ColSex: true}
	integer := map[string]bool{synth.ColAge: true, synth.ColAnaemia: true}
	group := parquet.Group{}
	for _, h := range t.Header {
		switch {
		case text[h]:
			group[h] = parquet.String()
		case integer[h]:
			group[h] = parquet.Int(64)
		default:
			group[h] = parquet.Leaf(parquet.DoubleType)
		}
	}
	// A Group orders its fields by name: that is each one's column index.
	names := append([]string(nil), t.Header...)
	sort.Strings(names)
	index := map[string]int{}
	for i, n := range names {
		index[n] = i
	}
	var buf bytes.Buffer
	w := parquet.NewWriter(&buf, parquet.NewSchema("cohort", group), parquet.MaxRowsPerRowGroup(5000), parquet.Compression(&zstd.Codec{}))
	for r, rec := range t.Rows {
		row := make(parquet.Row, len(rec))
		for j, cell := range rec {
			h := t.Header[j]
			var v parquet.Value
			switch {
			case text[h]:
				v = parquet.ByteArrayValue([]byte(cell))
			case integer[h]:
				x, err := strconv.ParseInt(cell, 10, 64)
				if err != nil {
					return nil, fmt.Errorf("demo: row %d, column %s: %w", r+1, h, err)
				}
				v = parquet.Int64Value(x)
			default:
				x, err := strconv.ParseFloat(cell, 64)
				if err != nil {
					return nil, fmt.Errorf("demo: row %d, column %s: %w", r+1, h, err)
				}
				v = parquet.DoubleValue(x)
			}
			row[index[h]] = v.Level(0, 0, index[h])
		}
		if _, err := w.WriteRows([]parquet.Row{row}); err != nil {
			return nil, fmt.Errorf("demo: writing Parquet: %w", err)
		}
	}
	if err := w.Close(); err != nil {
		return nil, fmt.Errorf("demo: writing Parquet: %w", err)
	}
	return buf.Bytes(), nil
}
