package fairness

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// dataSpec has a categorical root, a vector node and the label.
func dataSpec(t testing.TB, extra string) *Spec {
	t.Helper()
	s, err := ParseSpec(filepath.Join("dir", "spec.yaml"), []byte(`data: cohort.csv
label: dx
score: score
threshold: 0.5
groups: {column: clinic, reference: north, comparison: south}
metrics: [fpr]
graph:
  - node: sex
  - node: dx
    parents: [sex]
  - node: labs
    columns: [hb, mcv]
    parents: [dx]
categorical: [sex]
folds: 2
`+extra))
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestReadDataValid(t *testing.T) {
	csv := "\ufeffclinic, sex ,dx,hb,mcv,score,extra\r\n" +
		"north,F,1,11.5,80,0.7,x\r\n" +
		"east,M,2,oops,,,\r\n" + // other groups' rows are not checked
		"south,\"M, adult\",TRUE,13.9,90,1,\r\n" +
		"north, M ,false,14.1,  88 ,0,\r\n" +
		"south,F,0.0,12,85,0.25,\r\n" +
		"south,F,1,1e1,-3,0.5,\r\n"
	d, err := ReadData(strings.NewReader(csv), "cohort.csv", dataSpec(t, ""))
	if err != nil {
		t.Fatal(err)
	}
	sum := sha256.Sum256([]byte(csv)) // the standard library as reference
	want := &Dataset{
		Path:   "cohort.csv",
		SHA256: hex.EncodeToString(sum[:]),
		Columns: []Column{
			// levels sorted: "F" < "M" < "M, adult"
			{Name: "sex", Categorical: true, Values: []float64{0, 2, 1, 0, 0}, Levels: []string{"F", "M", "M, adult"}},
			{Name: "dx", Values: []float64{1, 1, 0, 0, 1}},
			{Name: "hb", Values: []float64{11.5, 13.9, 14.1, 12, 10}},
			{Name: "mcv", Values: []float64{80, 90, 88, 85, -3}},
		},
		Labels:     []float64{1, 1, 0, 0, 1},
		Scores:     []float64{0.7, 1, 0, 0.25, 0.5},
		Comparison: []bool{false, true, false, true, true},
		Lines:      []int{2, 4, 5, 6, 7},
		Excluded:   []ExcludedValue{{Value: "east", Rows: 1}},
		Outside:    []Column{},

		ExcludedRows: 1,
	}
	if !reflect.DeepEqual(d, want) {
		t.Errorf("got  %+v\nwant %+v", d, want)
	}
	if r, c := d.Counts(); r != 2 || c != 3 {
		t.Errorf("Counts() = %d, %d", r, c)
	}
}

func TestReadDataDrop(t *testing.T) {
	csv := "clinic,sex,dx,hb,mcv,score\n" +
		"north,F,1,11.5,80,0.7\n" +
		"north,F,NA,11.5,80,0.7\n" +
		"north,F,1,11.5,80,0.7\n" +
		"south,,1,11.5,80,0.7\n" +
		"south,M,1,nan,80,0.7\n" +
		"south,M,0,11.5,80,\n" +
		",M,0,11.5,80,0.3\n" + // no group: belongs to neither
		"south,M,0,11.5,80,0.3\n" +
		"south,F,1,12.5,80,0.4\n"
	d, err := ReadData(strings.NewReader(csv), "cohort.csv", dataSpec(t, "missing: drop\n"))
	if err != nil {
		t.Fatal(err)
	}
	if d.DroppedReference != 1 || d.DroppedComparison != 3 || !reflect.DeepEqual(d.Lines, []int{2, 4, 9, 10}) {
		t.Errorf("dropped %d/%d, lines %v", d.DroppedReference, d.DroppedComparison, d.Lines)
	}
	// Levels come from kept rows only.
	if !reflect.DeepEqual(d.Columns[0].Levels, []string{"F", "M"}) {
		t.Errorf("levels %v", d.Columns[0].Levels)
	}
}

// TestReadDataErrors checks every data problem: sentinel, line and column.
func TestReadDataErrors(t *testing.T) {
	const head = "clinic,sex,dx,hb,mcv,score\n"
	const ok = "north,F,1,11.5,80,0.7\nnorth,M,0,14,90,0.2\nsouth,F,1,11.5,80,0.7\nsouth,M,0,14,90,0.2\n"
	tests := []struct {
		name, csv string
		sentinel  error
		line      int
		column    string
		msg       string
	}{
		{"empty", "", ErrEmptyFile, 0, "", "empty"},
		{"header only", head, ErrNoRecords, 0, "", "no records"},
		{"duplicate header", "clinic,sex,dx,hb,hb,score\n" + ok, ErrDuplicateHeader, 1, "hb", "twice"},
		{"missing column", "clinic,sex,dx,hb,score\n", ErrMissingColumn, 1, "mcv", "not found"},
		{"missing group column", "sex,dx,hb,mcv,score\n", ErrMissingColumn, 1, "clinic", "not found"},
		{"ragged short", head + ok + "north,F,1\n", ErrRaggedRow, 6, "", "3 fields but the header has 6"},
		{"ragged long", head + "north,F,1,11.5,80,0.7,9\n", ErrRaggedRow, 2, "", "7 fields"},
		{"csv quote", head + "north,\"F,1,11.5,80,0.7\nsouth\"x,1\n", ErrCSVSyntax, 3, "", "malformed CSV"},
		{"not numeric", head + ok + "north,F,1,\"12,4\",80,0.7\n", ErrNotNumeric, 6, "hb", `"12,4" is not a number`},
		{"infinite", head + ok + "north,F,1,12,Inf,0.7\n", ErrNotNumeric, 6, "mcv", `"Inf" is not a number`},
		{"overflow", head + ok + "north,F,1,12,1e400,0.7\n", ErrNotNumeric, 6, "mcv", "not a finite number"},
		{"label 2", head + "north,F,2,11.5,80,0.7\n", ErrNotBinary, 2, "dx", `label "2"`},
		{"label yes", head + "north,F,yes,11.5,80,0.7\n", ErrNotBinary, 2, "dx", `label "yes"`},
		{"score above", head + "north,F,1,11.5,80,1.01\n", ErrScoreRange, 2, "score", `score "1.01" is outside [0, 1]`},
		{"score negative", head + "north,F,1,11.5,80,-0.1\n", ErrScoreRange, 2, "score", "outside"},
		{"score inf", head + "north,F,1,11.5,80,+Inf\n", ErrNotNumeric, 2, "score", `score "+Inf" is not a number`},
		{"score text", head + "north,F,1,11.5,80,high\n", ErrNotNumeric, 2, "score", `score "high"`},
		{"score nan", head + "north,F,1,11.5,80,NaN\n", ErrMissingValue, 2, "score", `missing value "NaN"`},
		{"missing value", head + "north,F,1,NA,80,0.3\n", ErrMissingValue, 2, "hb", "missing: drop"},
		{"missing group", head + ok + ",F,1,11,80,0.3\n", ErrMissingValue, 6, "clinic", "missing group value"},
		{"comparison absent", head + "north,F,1,11.5,80,0.7\nnorth,M,0,14,90,0.2\n", ErrGroupAbsent, 0, "clinic", `group value "south" does not appear`},
		{"reference absent", head + "south,F,1,11.5,80,0.7\n", ErrGroupAbsent, 0, "clinic", `"north"`},
		{"too few", head + "north,F,1,11.5,80,0.7\nnorth,M,0,14,90,0.2\nsouth,F,1,11.5,80,0.7\n", ErrTooFewRecords, 0, "clinic", `group "south" keeps 1 of its 1 rows`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ReadData(strings.NewReader(tc.csv), "cohort.csv", dataSpec(t, ""))
			if !errors.Is(err, tc.sentinel) {
				t.Fatalf("error %v does not wrap %v", err, tc.sentinel)
			}
			var de *DataError
			if !errors.As(err, &de) {
				t.Fatalf("error %T is not a *DataError", err)
			}
			if de.Line != tc.line || de.Column != tc.column || de.File != "cohort.csv" {
				t.Errorf("file %q line %d column %q, want line %d column %q (%v)", de.File, de.Line, de.Column, tc.line, tc.column, err)
			}
			prefix := "cohort.csv"
			if tc.line > 0 {
				prefix = fmt.Sprintf("cohort.csv:%d", tc.line)
			}
			if !strings.HasPrefix(err.Error(), prefix) || !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("message %q lacks %q or %q", err, prefix, tc.msg)
			}
			if !IsInputError(err) {
				t.Error("IsInputError = false")
			}
		})
	}
}

func TestLoadDataRelativePath(t *testing.T) {
	spec := writeAudit(t, smallSpec, smallData(20))
	d, err := LoadData(spec)
	if err != nil {
		t.Fatal(err)
	}
	if d.Path != filepath.Join(filepath.Dir(spec.File), "cohort.csv") || len(d.Labels) != 20 {
		t.Errorf("path %s, %d rows", d.Path, len(d.Labels))
	}
}

func ExampleReadData() {
	spec, _ := ParseSpec("spec.yaml", []byte(`data: cohort.csv
label: dx
score: score
threshold: 0.5
groups: {column: clinic, reference: north, comparison: south}
metrics: [fnr]
graph: [{node: hb}, {node: dx, parents: [hb]}]
folds: 2
`))
	_, err := ReadData(strings.NewReader("clinic,hb,dx,score\nnorth,13.1,0,0.2\nsouth,\"12,4\",1,0.8\n"), "cohort.csv", spec)
	fmt.Println(err)
	// Output:
	// cohort.csv:3: column "hb": "12,4" is not a number (numbers are decimal with an optional exponent, e.g. 12.4 or 1.5e-3; list the column under categorical: if it holds categories)
}

func BenchmarkReadData(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("clinic,sex,dx,hb,mcv,score\n")
	for i := range 10000 {
		g, s := "north", "F"
		if i%2 == 1 {
			g = "south"
		}
		if i%3 == 0 {
			s = "M"
		}
		fmt.Fprintf(&sb, "%s,%s,%d,%.2f,%.1f,%.3f\n", g, s, i%2, 10+float64(i%50)/10, 80+float64(i%17), float64(i%1000)/1000)
	}
	data := sb.String()
	spec := dataSpec(b, "")
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := ReadData(strings.NewReader(data), "cohort.csv", spec); err != nil {
			b.Fatal(err)
		}
	}
}
