package report

import (
	"encoding/json"
	"fmt"
	"reflect"

	"github.com/gapwise/gapwise/fairness"
)

// visibleCopy returns a deep copy of res in which every string has gone
// through Printable, for the HTML page. html/template escapes what markup
// could do with user text, but not what the text itself can do to its
// display: a right-to-left override (U+202E) in a group value would still
// reverse the words after it, and a control character would be invisible.
// In the page they read as Go escapes (\u202e), as in the text report. The
// copy is made by a JSON round trip (the Result is its JSON contract; Go
// encodes floats so that they decode to the same bits), then every string
// reachable from it is rewritten.
func visibleCopy(res *fairness.Result) (*fairness.Result, error) {
	raw, err := json.Marshal(res)
	if err != nil {
		return nil, fmt.Errorf("report: copying the result: %w", err)
	}
	var c fairness.Result
	if err := json.Unmarshal(raw, &c); err != nil {
		return nil, fmt.Errorf("report: copying the result: %w", err)
	}
	printableStrings(reflect.ValueOf(&c).Elem())
	return &c, nil
}

// printableStrings applies Printable to every settable string under v.
func printableStrings(v reflect.Value) {
	switch v.Kind() {
	case reflect.String:
		if v.CanSet() {
			v.SetString(Printable(v.String()))
		}
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			printableStrings(v.Elem())
		}
	case reflect.Struct:
		for i := range v.NumField() {
			printableStrings(v.Field(i))
		}
	case reflect.Slice, reflect.Array:
		for i := range v.Len() {
			printableStrings(v.Index(i))
		}
	}
}
