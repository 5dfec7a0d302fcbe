package synth

import (
	"encoding/csv"
	"fmt"
	"io"
)

// Table is a generated cohort ready to be written as CSV: a header and rows
// of already formatted fields.
type Table struct {
	Header []string
	Rows   [][]string
}

// WriteCSV writes t as RFC 4180 CSV with a header line. It panics if a row
// does not have len(t.Header) fields, which is a bug in a generator.
func (t *Table) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(t.Header); err != nil {
		return err
	}
	for i, r := range t.Rows {
		if len(r) != len(t.Header) {
			panic(fmt.Sprintf("synth: row %d has %d fields, header has %d", i, len(r), len(t.Header)))
		}
		if err := cw.Write(r); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}
