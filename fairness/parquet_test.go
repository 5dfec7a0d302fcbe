package fairness

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness/synth"
)

// sameDataset compares two datasets of the same records read from CSV
// and from Parquet: equal in everything but the file (path, digest) and
// the row positions (CSV lines count the header, Parquet rows do not).
func sameDataset(t *testing.T, csvD, pqD *Dataset) {
	t.Helper()
	c, p := *csvD, *pqD
	if len(c.Lines) != len(p.Lines) {
		t.Fatalf("%d rows from CSV, %d from Parquet", len(c.Lines), len(p.Lines))
	}
	for i := range c.Lines {
		if c.Lines[i] != p.Lines[i]+1 {
			t.Fatalf("row %d: CSV line %d, Parquet row %d", i, c.Lines[i], p.Lines[i])
		}
	}
	c.Path, c.SHA256, c.Lines = "", "", nil
	p.Path, p.SHA256, p.Lines = "", "", nil
	if !reflect.DeepEqual(c, p) {
		t.Errorf("datasets differ:\nCSV     %+v\nParquet %+v", c, p)
	}
}

// TestParquetSameResult: the synthetic demo cohort written as CSV and as
// Parquet (several row groups; the sex as text, the age as INT64, the
// label as BOOLEAN, the haemoglobin and the score as DOUBLE, MCV as FLOAT,
// RDW as DECIMAL(18, 1)) gives the same Dataset and byte-identical JSON
// results, but for the data file's name and digest.
func TestParquetSameResult(t *testing.T) {
	dir := t.TempDir()
	tab := synth.AnaemiaTable(synth.DefaultScenario().Generate(2000, 3))
	var buf bytes.Buffer
	if err := tab.WriteCSV(&buf); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "cohort.csv"), buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	writeParquet(t, filepath.Join(dir, "cohort.parquet"), tab.Header, tab.Rows,
		map[string]string{"sex": "string", "age": "int64", "anaemia": "bool", "mcv": "float", "rdw": "decimal1"}, 700)
	results := map[string][]byte{}
	datasets := map[string]*Dataset{}
	for _, file := range []string{"cohort.csv", "cohort.parquet"} {
		path := filepath.Join(dir, "spec-"+file+".yaml")
		if err := os.WriteFile(path, synth.AnaemiaSpec(file), 0o644); err != nil {
			t.Fatal(err)
		}
		spec, err := LoadSpec(path)
		if err != nil {
			t.Fatal(err)
		}
		spec.FoldSplits = 1
		if datasets[file], err = LoadData(spec); err != nil {
			t.Fatal(err)
		}
		r, err := Run(spec, RunOptions{Workers: 2, Intervals: &Intervals{Replicates: 5, Level: 0.9, KeepRatios: true}})
		if err != nil {
			t.Fatal(err)
		}
		if r.Inputs.DataFile != spec.DataPath {
			t.Errorf("data file %q", r.Inputs.DataFile)
		}
		r.Inputs = InputInfo{} // the spec file, its digest, the data file and its digest differ
		results[file], err = json.MarshalIndent(r, "", "  ")
		if err != nil {
			t.Fatal(err)
		}
	}
	sameDataset(t, datasets["cohort.csv"], datasets["cohort.parquet"])
	if !bytes.Equal(results["cohort.csv"], results["cohort.parquet"]) {
		t.Errorf("the results differ (%d and %d bytes of JSON)", len(results["cohort.csv"]), len(results["cohort.parquet"]))
	}
}

// TestParquetMissing: nulls and NaN in a Parquet file are missing values
// as empty cells and NaN are in CSV: with missing: drop both give the
// same dataset, and with missing: error the same refusal, naming the row
// and its row group.
func TestParquetMissing(t *testing.T) {
	data := "site,x,dx,z,score\na,0.5,1,0.2,0.9\nb,,0,0.1,0.2\na,0.3,0,NaN,0.4\nb,0.7,1,0.5,0.8\na,0.1,,0.3,0.3\nb,0.2,0,0.6,0.1\na,0.4,1,0.1,0.7\nb,0.9,1,0.2,0.6\n"
	for _, missing := range []string{"drop", "indicator"} {
		spec := writeAudit(t, smallSpec+"missing: "+missing+"\n", data)
		csvD, err := LoadData(spec)
		if err != nil {
			t.Fatal(err)
		}
		header, rows := csvTable(data)
		spec.DataPath = filepath.Join(t.TempDir(), "cohort.parquet")
		writeParquet(t, spec.DataPath, header, rows, map[string]string{"site": "string", "dx": "int32"}, 3)
		pqD, err := LoadData(spec)
		if err != nil {
			t.Fatal(err)
		}
		sameDataset(t, csvD, pqD)
	}
}

// TestParquetErrors: each problem in a Parquet file is refused with the
// sentinel of the same problem in CSV and a message naming the column and
// the row (counted over the file) with its row group.
func TestParquetErrors(t *testing.T) {
	base := "site,x,dx,z,score\na,0.5,1,0.2,0.9\nb,0.6,0,0.1,0.2\na,0.3,0,0.4,0.4\nb,0.7,1,0.5,0.8\na,0.1,0,0.3,0.3\nb,0.2,0,0.6,0.1\n"
	strTypes := map[string]string{"site": "string", "x": "string"}
	for _, tc := range []struct {
		name     string
		spec     string
		data     string
		types    map[string]string
		sentinel error
		want     string
	}{
		{"not a number", smallSpec, strings.Replace(base, "0.6", "abc", 1), strTypes, ErrNotNumeric, `cohort.parquet: row 2 (row group 1): column "x": "abc" is not a number`},
		{"row group", smallSpec, strings.Replace(base, "0.2,0,0.6", "x1,0,0.6", 1), strTypes, ErrNotNumeric, `cohort.parquet: row 6 (row group 3): column "x": "x1" is not a number`},
		{"null", smallSpec, strings.Replace(base, "0.6,0,0.1", ",0,0.1", 1), nil, ErrMissingValue, `cohort.parquet: row 2 (row group 1): column "x": missing value (null or empty text) (set missing: drop`},
		{"NaN", smallSpec, strings.Replace(base, "0.6,0,0.1", "NaN,0,0.1", 1), nil, ErrMissingValue, `row 2 (row group 1): column "x": missing value "NaN"`},
		{"infinite", smallSpec, strings.Replace(base, "0.6,0,0.1", "+Inf,0,0.1", 1), nil, ErrNotNumeric, `row 2 (row group 1): column "x": +Inf is not a finite number`},
		{"score range", smallSpec, strings.Replace(base, "0.1,0.2", "0.1,1.2", 1), nil, ErrScoreRange, `row 2 (row group 1): column "score": score "1.2" is outside [0, 1]`},
		{"label", smallSpec, strings.Replace(base, "0.6,0,", "0.6,2,", 1), map[string]string{"site": "string", "dx": "int64"}, ErrNotBinary, `row 2 (row group 1): column "dx": label "2" is not 0, 1, true or false`},
		{"third label word", smallSpec + "positive: yes\n", strings.NewReplacer(",1,", ",yes,", "0.6,0,", "0.6,no,", "0.3,0,", "0.3,maybe,").Replace(base), map[string]string{"site": "string", "dx": "string"}, ErrNotBinary, `row 3 (row group 2): column "dx": label "maybe" is a third value: with positive: "yes" the label column holds "no" (from row 2) as its one other value`},
		{"missing column", smallSpec, strings.NewReplacer(",z,", ",w,").Replace(base), nil, ErrMissingColumn, `cohort.parquet: column "z": not found among the Parquet file's columns (needed by the spec); the file has "dx", "score", "site", "w", "x"`},
		{"date column", smallSpec, strings.NewReplacer("0.5,", "5,", "0.6,", "6,", "0.3,", "3,", "0.7,", "7,", "0.1,", "1,", "0.2,", "2,").Replace(base), map[string]string{"site": "string", "x": "date"}, ErrParquet, `cohort.parquet: column "x": gapwise cannot read it: its Parquet logical type is DATE; store it as numbers, text or booleans`},
		{"group absent", strings.Replace(smallSpec, "comparison: b", "comparison: c", 1), base, strTypes, ErrGroupAbsent, `cohort.parquet: column "site": group value "c" does not appear in the column`},
		{"not UTF-8", smallSpec, strings.Replace(base, "b,0.6", "b\xff,0.6", 1), map[string]string{"site": "bytes"}, ErrEncoding, `row 2 (row group 1): column "site": byte 0xFF`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			spec := writeAudit(t, tc.spec, base)
			header, rows := csvTable(tc.data)
			spec.DataPath = filepath.Join(t.TempDir(), "cohort.parquet")
			types := tc.types
			if types == nil {
				types = map[string]string{"site": "string"}
			}
			writeParquet(t, spec.DataPath, header, rows, types, 2)
			_, err := LoadData(spec)
			var de *DataError
			if !errors.As(err, &de) || !errors.Is(err, tc.sentinel) || !IsInputError(err) || !strings.Contains(err.Error(), strings.Replace(tc.want, "cohort.parquet", spec.DataPath, 1)) {
				t.Errorf("error %v\nwant %v containing %q", err, tc.sentinel, tc.want)
			}
		})
	}
}

// TestParquetFixtures: the committed fixtures (testdata/parquet/README.md)
// read as their CSV twin, and the malformed ones are refused as
// unreadable Parquet files with a message saying so.
func TestParquetFixtures(t *testing.T) {
	if os.Getenv("GAPWISE_UPDATE_PARQUET") == "1" {
		header, rows := csvTable(smallData(60))
		writeParquet(t, "testdata/parquet/small.parquet", header, rows, map[string]string{"site": "string", "dx": "int64"}, 25)
		good, err := os.ReadFile("testdata/parquet/small.parquet")
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile("testdata/parquet/truncated.parquet", good[:len(good)-40], 0o644); err != nil {
			t.Fatal(err)
		}
	}
	spec := writeAudit(t, smallSpec, smallData(60))
	csvD, err := LoadData(spec)
	if err != nil {
		t.Fatal(err)
	}
	spec.DataPath = "testdata/parquet/small.parquet"
	pqD, err := LoadData(spec)
	if err != nil {
		t.Fatal(err)
	}
	sameDataset(t, csvD, pqD)
	for _, tc := range []struct{ file, want string }{
		{"truncated.parquet", "testdata/parquet/truncated.parquet: not a readable Parquet file: "},
		{"not-parquet.parquet", `testdata/parquet/not-parquet.parquet: not a readable Parquet file: invalid magic header of parquet file: "site"`},
		{"empty.parquet", "testdata/parquet/empty.parquet: not a readable Parquet file: "},
	} {
		spec.DataPath = filepath.Join("testdata/parquet", tc.file)
		_, err := LoadData(spec)
		if !errors.Is(err, ErrParquet) || !IsInputError(err) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %v, want %q", tc.file, err, tc.want)
		}
	}
}

// TestIsParquet: the extension chooses the format, in any case.
func TestIsParquet(t *testing.T) {
	for path, want := range map[string]bool{"a.parquet": true, "dir/A.PARQUET": true, "a.csv": false, "a.parquet.csv": false, "parquet": false, "a.pq": false} {
		if IsParquet(path) != want {
			t.Errorf("IsParquet(%q) = %v", path, !want)
		}
	}
}
