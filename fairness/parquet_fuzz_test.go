package fairness

import (
	"bytes"
	"math"
	"os"
	"testing"
)

// FuzzLoadParquet: any bytes read as a Parquet file give an input error
// or a consistent dataset (every column as long as the labels, labels 0/1,
// scores in [0, 1], finite values, rows increasing); the reader's panics
// on damaged files become input errors (ReadParquet). Seeds: the committed
// fixture, damaged copies of it, and the malformed fixtures.
func FuzzLoadParquet(f *testing.F) {
	good, err := os.ReadFile("testdata/parquet/small.parquet")
	if err != nil {
		f.Fatal(err)
	}
	f.Add(good)
	for _, off := range []int{4, 100, len(good) / 2, len(good) - 200, len(good) - 12} {
		bad := append([]byte(nil), good...)
		for i := off; i < off+8 && i < len(bad); i++ {
			bad[i] ^= 0xA5
		}
		f.Add(bad)
	}
	f.Add(good[:len(good)-40])
	f.Add([]byte("PAR1PAR1"))
	f.Add([]byte{})
	spec, err := ParseSpec("s.yaml", []byte(smallSpec))
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		d, err := ReadParquet(bytes.NewReader(data), int64(len(data)), "d.parquet", spec)
		if err != nil {
			if !IsInputError(err) {
				t.Fatalf("not an input error: %v", err)
			}
			return
		}
		n := len(d.Labels)
		if len(d.Scores) != n || len(d.Comparison) != n || len(d.Lines) != n {
			t.Fatalf("inconsistent lengths: %d labels, %d scores, %d groups, %d rows", n, len(d.Scores), len(d.Comparison), len(d.Lines))
		}
		for i := range n {
			if (d.Labels[i] != 0 && d.Labels[i] != 1) || !(d.Scores[i] >= 0 && d.Scores[i] <= 1) || (i > 0 && d.Lines[i] <= d.Lines[i-1]) {
				t.Fatalf("row %d: label %v, score %v, rows %v", i, d.Labels[i], d.Scores[i], d.Lines)
			}
		}
		for _, c := range d.Columns {
			if len(c.Values) != n {
				t.Fatalf("column %s has %d values for %d rows", c.Name, len(c.Values), n)
			}
			for _, v := range c.Values {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("column %s: value %v", c.Name, v)
				}
			}
		}
	})
}
