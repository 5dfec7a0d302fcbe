package fairness

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"github.com/gapwise/gapwise/fairness/synth"
)

// BenchmarkLoad compares loading the synthetic demo cohort (200,000 rows)
// from CSV and from Parquet (DOUBLE, INT64 and STRING columns, row
// groups of 50,000 rows, uncompressed).
func BenchmarkLoad(b *testing.B) {
	dir := b.TempDir()
	tab := synth.AnaemiaTable(synth.DefaultScenario().Generate(200000, 1))
	var buf bytes.Buffer
	if err := tab.WriteCSV(&buf); err != nil {
		b.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "cohort.csv"), buf.Bytes(), 0o644); err != nil {
		b.Fatal(err)
	}
	writeParquet(b, filepath.Join(dir, "cohort.parquet"), tab.Header, tab.Rows, map[string]string{"sex": "string", "age": "int64", "anaemia": "int64"}, 50000)
	for _, file := range []string{"cohort.csv", "cohort.parquet"} {
		path := filepath.Join(dir, "spec-"+file+".yaml")
		if err := os.WriteFile(path, synth.AnaemiaSpec(file), 0o644); err != nil {
			b.Fatal(err)
		}
		spec, err := LoadSpec(path)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(filepath.Ext(file)[1:], func(b *testing.B) {
			for b.Loop() {
				if _, err := LoadData(spec); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
