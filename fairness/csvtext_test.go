package fairness

import (
	"errors"
	"fmt"
	"math"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// TestParseDecimal checks the one number grammar of the data file. The
// values of accepted forms are compared with Go's strconv.ParseFloat (the
// standard library as reference); the refused forms are those strconv
// accepts as Go syntax (hexadecimal floats, digit separators, Inf) or that
// other locales write (decimal comma), which a data file must not mean as
// numbers (common practice for CSV: decimal point, optional exponent).
func TestParseDecimal(t *testing.T) {
	accepted := []string{"0", "-0", "+1", "1.", ".5", "-.5e-3", "1E10", "007", "12.25", "6.02214076e23", "1e-400"}
	for _, s := range accepted {
		got, ok := parseDecimal(s)
		want, err := strconv.ParseFloat(s, 64)
		if !ok || (err != nil && !errors.Is(err, strconv.ErrRange)) || got != want {
			t.Errorf("parseDecimal(%q) = %v, %v; want %v", s, got, ok, want)
		}
	}
	if v, ok := parseDecimal("1e400"); !ok || !math.IsInf(v, 1) {
		t.Errorf("parseDecimal(1e400) = %v, %v; want +Inf, true (refused later as not finite)", v, ok)
	}
	refused := []string{"", "+", "-", ".", "e5", "1e", "1e+", "--1", "1.2.3", " 1", "1 ", "1,5",
		"0x1p-2", "0X1.8P1", "0x10", "1_000", "1_0.5", "0b101", "0o17",
		"Inf", "+Inf", "-infinity", "NaN", "١٢", "１２"}
	for _, s := range refused {
		if v, ok := parseDecimal(s); ok {
			t.Errorf("parseDecimal(%q) = %v, true; want refused", s, v)
		}
	}
}

// spreadsheetCSV is what a spreadsheet's "CSV UTF-8" export of a sheet with
// two empty formatted columns after the data writes: a UTF-8 byte-order
// mark (The Unicode Standard, section 23.8), every header name quoted and
// CRLF line ends (RFC 4180, section 2), empty names and cells for the
// trailing columns; one row omits them (common practice of exporters that
// trim trailing empty cells).
const spreadsheetCSV = "\ufeff\"clinic\",\"sex\",\"dx\",\"hb\",\"mcv\",\"score\",,\r\n" +
	"\"north\",\"F\",1,11.5,80,0.7,,\r\n" +
	"south,M,0,13.9,90,0.2,,\r\n" +
	"north,M,0,14.1,88,0.1\r\n" +
	"south,F,1,12,85,0.9,\"\", \r\n"

// TestReadDataSpreadsheetExport: the export loads, with the same records as
// the plain file.
func TestReadDataSpreadsheetExport(t *testing.T) {
	plain := "clinic,sex,dx,hb,mcv,score\nnorth,F,1,11.5,80,0.7\nsouth,M,0,13.9,90,0.2\nnorth,M,0,14.1,88,0.1\nsouth,F,1,12,85,0.9\n"
	want, err := ReadData(strings.NewReader(plain), "cohort.csv", dataSpec(t, ""))
	if err != nil {
		t.Fatal(err)
	}
	got, err := ReadData(strings.NewReader(spreadsheetCSV), "cohort.csv", dataSpec(t, ""))
	if err != nil {
		t.Fatal(err)
	}
	got.SHA256, want.SHA256 = "", ""
	if !reflect.DeepEqual(got, want) {
		t.Errorf("spreadsheet export read as\n%+v\nwant\n%+v", got, want)
	}
}

// TestReadDataTextErrors: encodings other than UTF-8, values under unnamed
// header fields and numbers outside the grammar are refused, naming the
// line, the column and the position in the line.
func TestReadDataTextErrors(t *testing.T) {
	const head = "clinic,sex,dx,hb,mcv,score\n"
	const ok = "north,F,1,11.5,80,0.7\nsouth,M,0,14,90,0.2\n"
	latin1 := "north,F\xe9,1,11.5,80,0.7\n" // "Fé" in Latin-1: 0xE9 alone is not UTF-8
	tests := []struct {
		name, csv string
		sentinel  error
		line      int
		column    string
		msg       string
	}{
		{"utf-16 le", "\xff\xfec\x00l\x00", ErrEncoding, 0, "", "UTF-16"},
		{"utf-16 be", "\xfe\xff\x00c\x00l", ErrEncoding, 0, "", "UTF-16"},
		{"latin-1 cell", head + ok + latin1, ErrEncoding, 4, "sex", "byte 0xE9 (byte 2 of the field) is not valid UTF-8"},
		{"latin-1 position", head + ok + latin1, ErrEncoding, 4, "sex", "field 2 (starting at byte 7 of the line)"},
		{"latin-1 header", "clinic,s\xe9x,dx,hb,mcv,score\n" + ok, ErrEncoding, 1, "", "header field 2"},
		{"latin-1 other group", head + ok + "east,\xe9,1,1,1,0.5\n", ErrEncoding, 4, "sex", "not valid UTF-8"},
		{"value under unnamed", "clinic,sex,dx,hb,mcv,score,\n" + ok + "north,F,1,11.5,80,0.7,note\n", ErrUnnamedColumn, 4, "", `field 7 (starting at byte 23 of the line) holds "note"`},
		{"unnamed inside", "clinic,,sex,dx,hb,mcv,score\nnorth,x,F,1,11.5,80,0.7\n", ErrUnnamedColumn, 2, "", "field 2"},
		{"extra value", head + ok + "north,F,1,11.5,80,0.7,,9\n", ErrRaggedRow, 4, "", "field 8"},
		{"hex float", head + ok + "north,F,1,0x1.8p3,80,0.7\n", ErrNotNumeric, 4, "hb", `"0x1.8p3" is not a number`},
		{"digit separator", head + ok + "north,F,1,11.5,1_000,0.7\n", ErrNotNumeric, 4, "mcv", `"1_000" is not a number`},
		{"score hex", head + ok + "north,F,1,11.5,80,0x1p-1\n", ErrNotNumeric, 4, "score", `score "0x1p-1"`},
		{"label hex", head + ok + "north,F,0x1,11.5,80,0.5\n", ErrNotBinary, 4, "dx", `label "0x1"`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ReadData(strings.NewReader(tc.csv), "cohort.csv", dataSpec(t, ""))
			if !errors.Is(err, tc.sentinel) {
				t.Fatalf("error %v does not wrap %v", err, tc.sentinel)
			}
			var de *DataError
			if !errors.As(err, &de) || de.Line != tc.line || de.Column != tc.column {
				t.Fatalf("error %v: want line %d column %q", err, tc.line, tc.column)
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

// TestReadDataSeparators: a file with bare CR line ends, or separated by
// semicolons or tabs, is refused with a message saying so rather than a
// confusing missing-column error (hand-made cases; RFC 4180 for the
// comma and CRLF).
func TestReadDataSeparators(t *testing.T) {
	const plain = "clinic,sex,dx,hb,mcv,score\nnorth,F,1,11.5,80,0.7\nsouth,M,0,14,90,0.2\n"
	for _, tc := range []struct {
		name, csv string
		sentinel  error
		msg       string
	}{
		{"cr", strings.ReplaceAll(plain, "\n", "\r"), ErrCSVSyntax, "bare carriage return"},
		{"semicolon", strings.ReplaceAll(plain, ",", ";"), ErrMissingColumn, `the file seems separated by semicolons`},
		{"tab", strings.ReplaceAll(plain, ",", "\t"), ErrMissingColumn, `separated by tabs`},
	} {
		_, err := ReadData(strings.NewReader(tc.csv), "cohort.csv", dataSpec(t, ""))
		if !errors.Is(err, tc.sentinel) || !strings.Contains(err.Error(), tc.msg) || !IsInputError(err) {
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.msg)
		}
	}
	// CRLF is fine, and so is a lone CR inside a quoted field of an LF file.
	for _, ok := range []string{strings.ReplaceAll(plain, "\n", "\r\n"), strings.Replace(plain, "north,F", "north,\"F\r\"", 1)} {
		if _, err := ReadData(strings.NewReader(ok), "cohort.csv", dataSpec(t, "")); err != nil && errors.Is(err, ErrCSVSyntax) {
			t.Errorf("%q refused: %v", ok, err)
		}
	}
}
