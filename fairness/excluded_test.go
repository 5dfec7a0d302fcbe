package fairness

import (
	"errors"
	"fmt"
	"reflect"
	"strings"
	"testing"
)

// TestReadDataExcludedValues: rows of other groups are counted per value,
// most rows first, and values that differ from a chosen one only in case,
// inner spacing or an invisible character are marked as resembling it.
// (Cells are trimmed, so surrounding spaces select the group itself.)
func TestReadDataExcludedValues(t *testing.T) {
	csv := "clinic,sex,dx,hb,mcv,score\n" +
		"north,F,1,11.5,80,0.7\nnorth,M,0,14,90,0.2\nsouth,F,1,11.5,80,0.7\n south ,M,0,14,90,0.2\n" +
		"North,F,1,1,1,0.5\nNORTH,F,1,1,1,0.5\nNorth,F,1,1,1,0.5\n" +
		"sou th,F,1,1,1,0.5\nsouth\u200b,F,1,1,1,0.5\n" +
		"east,x,y,z,w,v\neast,x,y,z,w,v\nwest,,,,,\n" +
		",F,1,1,1,0.5\nNA,F,1,1,1,0.5\n"
	d, err := ReadData(strings.NewReader(csv), "cohort.csv", dataSpec(t, "missing: drop\n"))
	if err != nil {
		t.Fatal(err)
	}
	want := []ExcludedValue{
		{Value: "North", Rows: 2, Resembles: "north"},
		{Value: "east", Rows: 2},
		{Value: "NORTH", Rows: 1, Resembles: "north"},
		{Value: "sou th", Rows: 1, Resembles: "south"},
		{Value: "south\u200b", Rows: 1, Resembles: "south"},
		{Value: "west", Rows: 1},
	}
	if !reflect.DeepEqual(d.Excluded, want) {
		t.Errorf("excluded %+v\nwant     %+v", d.Excluded, want)
	}
	if d.ExcludedRows != 8 || d.MissingGroupRows != 2 {
		t.Errorf("excluded rows %d, missing group rows %d; want 8, 2", d.ExcludedRows, d.MissingGroupRows)
	}
	if r, c := d.Counts(); r != 2 || c != 2 {
		t.Errorf("kept %d/%d rows, want 2/2", r, c)
	}
	ws := excludedWarnings(groupInfo(dataSpec(t, ""), d), plainCount)
	if len(ws) != 4 {
		t.Fatalf("%d warnings, want one per near-miss value (4): %v", len(ws), ws)
	}
	for _, w := range ws {
		if w.Kind != KindGroupValueNearMiss || w.Severity != SeverityCaution || !strings.Contains(w.Message, "excluded") {
			t.Errorf("warning %+v", w)
		}
	}
	if !strings.Contains(ws[0].Message, `2 rows with group value "North", which differs from the chosen value "north"`) {
		t.Errorf("first warning %q", ws[0].Message)
	}
}

// TestExcludedCounterBounds: memory stays bounded whatever the group
// column holds: at most maxExcludedValues values, each cut to
// maxExcludedValueBytes at a character boundary, and every row counted.
func TestExcludedCounterBounds(t *testing.T) {
	var c excludedCounter
	for i := range maxExcludedValues + 50 {
		c.add(fmt.Sprintf("id-%05d", i))
	}
	c.add("id-00000")
	long := strings.Repeat("é", maxExcludedValueBytes) // 2 bytes each
	c.add(long)
	c.add(long + "x")
	got := c.list("a", "b")
	if len(got) != maxExcludedValues || c.total() != maxExcludedValues+53 {
		t.Fatalf("%d values listed, %d rows; want %d, %d", len(got), c.total(), maxExcludedValues, maxExcludedValues+53)
	}
	if got[0].Value != "id-00000" || got[0].Rows != 2 {
		t.Errorf("first %+v", got[0])
	}
	var d excludedCounter
	d.add(long)
	d.add(long + "x")
	l := d.list("a", "b")
	if len(l) != 1 || l[0].Rows != 2 || len(l[0].Value) > maxExcludedValueBytes+len("…") || !strings.HasSuffix(l[0].Value, "é…") {
		t.Errorf("long values: %d listed, %+v", len(l), l)
	}
}

// TestAbsentGroupListsValues: a group value that never occurs is refused
// with the values the column holds, a near-miss marked.
func TestAbsentGroupListsValues(t *testing.T) {
	csv := "clinic,sex,dx,hb,mcv,score\nnorth,F,1,11,80,0.7\nnorth,M,0,14,90,0.2\nSouth,F,1,11,80,0.7\nSouth,M,0,14,90,0.2\neast,M,0,14,90,0.2\n"
	_, err := ReadData(strings.NewReader(csv), "cohort.csv", dataSpec(t, ""))
	want := `group value "south" does not appear in the column; it holds "north" (2 rows), "South" (2 rows, differs only in case or spacing), "east" (1 row)`
	if !errors.Is(err, ErrGroupAbsent) || !strings.Contains(err.Error(), want) {
		t.Errorf("error %v\nwant %s", err, want)
	}
}
