package main

import (
	"bytes"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/synth"
)

// TestDemoParquet: the demo cohort written by demoParquet loads into the
// same Dataset as its CSV file, but for the file's name, digest and row
// positions (fairness.TestParquetSameResult shows that the same data give
// byte-identical results).
func TestDemoParquet(t *testing.T) {
	dir := t.TempDir()
	tab := synth.AnaemiaTable(synth.DefaultScenario().Generate(12000, 5))
	var csv bytes.Buffer
	if err := tab.WriteCSV(&csv); err != nil {
		t.Fatal(err)
	}
	pq, err := demoParquet(tab)
	if err != nil {
		t.Fatal(err)
	}
	sets := map[string]*fairness.Dataset{}
	for file, data := range map[string][]byte{demoData: csv.Bytes(), demoParquetData: pq} {
		if err := os.WriteFile(filepath.Join(dir, file), data, 0o644); err != nil {
			t.Fatal(err)
		}
		spec, err := fairness.ParseSpec(filepath.Join(dir, "spec.yaml"), synth.AnaemiaSpec(file))
		if err != nil {
			t.Fatal(err)
		}
		if sets[file], err = fairness.LoadData(spec); err != nil {
			t.Fatal(err)
		}
	}
	c, p := *sets[demoData], *sets[demoParquetData]
	for i := range c.Lines {
		if c.Lines[i] != p.Lines[i]+1 {
			t.Fatalf("row %d: CSV line %d, Parquet row %d", i, c.Lines[i], p.Lines[i])
		}
	}
	c.Path, c.SHA256, c.Lines = "", "", nil
	p.Path, p.SHA256, p.Lines = "", "", nil
	if !reflect.DeepEqual(c, p) {
		t.Error("the CSV and Parquet demo cohorts load differently")
	}
}
