package main

import (
	"io"
	"path/filepath"
	"testing"
)

// BenchmarkRunDecompose times `gapwise decompose --format json` on the
// demo cohort (12,000 records, 5 mechanisms, 6 metrics), spec to output.
func BenchmarkRunDecompose(b *testing.B) {
	spec := filepath.Join(demoDir(b), demoSpec)
	for b.Loop() {
		if err := runDecompose(decomposeOptions{spec: spec, format: formatJSON}, io.Discard, io.Discard); err != nil {
			b.Fatal(err)
		}
	}
}
