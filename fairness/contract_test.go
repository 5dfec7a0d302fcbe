package fairness

import (
	"os"
	"reflect"
	"sort"
	"strings"
	"testing"
)

// TestResultFieldNames pins the JSON contract of Result: the set of field
// paths (e.g. "metrics[].contributions[].ci_low") its encoding can hold.
// The README promises that field names are stable; this test fails on any
// rename, removal or addition. After a deliberate change, update the README's
// contract section and regenerate the list with
//
//	GAPWISE_UPDATE_CONTRACT=1 go test ./fairness -run TestResultFieldNames
func TestResultFieldNames(t *testing.T) {
	var got []string
	jsonPaths(reflect.TypeOf(Result{}), "", &got)
	sort.Strings(got)
	const file = "testdata/result_fields.txt"
	if os.Getenv("GAPWISE_UPDATE_CONTRACT") == "1" {
		if err := os.WriteFile(file, []byte(strings.Join(got, "\n")+"\n"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	raw, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	want := strings.Fields(string(raw))
	gotSet := map[string]bool{}
	for _, p := range got {
		gotSet[p] = true
	}
	wantSet := map[string]bool{}
	for _, p := range want {
		wantSet[p] = true
		if !gotSet[p] {
			t.Errorf("JSON field %s is gone (renamed or removed)", p)
		}
	}
	for _, p := range got {
		if !wantSet[p] {
			t.Errorf("JSON field %s is new: document it in the README's contract section and add it to %s", p, file)
		}
	}
}

// jsonPaths appends the JSON paths of every field reachable from t.
func jsonPaths(t reflect.Type, prefix string, out *[]string) {
	switch t.Kind() {
	case reflect.Pointer:
		jsonPaths(t.Elem(), prefix, out)
	case reflect.Slice, reflect.Array:
		jsonPaths(t.Elem(), prefix+"[]", out)
	case reflect.Map: // keyed by identifiers: "names.nodes.*.name"
		jsonPaths(t.Elem(), prefix+".*", out)
	case reflect.Struct:
		for i := range t.NumField() {
			f := t.Field(i)
			if !f.IsExported() {
				continue
			}
			if f.Anonymous && f.Tag.Get("json") == "" {
				jsonPaths(f.Type, prefix, out) // embedded: fields are promoted
				continue
			}
			name := jsonName(f)
			if name == "-" {
				continue
			}
			path := joinPath(prefix, name)
			*out = append(*out, path)
			jsonPaths(f.Type, path, out)
		}
	}
}
