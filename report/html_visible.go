package report

import (
	"reflect"

	"github.com/gapwise/gapwise/fairness"
)

// visibleCopy returns a deep copy of res in which every string has gone
// through Printable, for the HTML page. html/template escapes what markup
// could do with user text, but not what the text itself can do to its
// display: a right-to-left override (U+202E) in a group value would still
// reverse the words after it, and a control character would be invisible.
// In the page they read as Go escapes (\u202e, \xff for a byte that is not
// UTF-8), as in the text report. The caller's Result is not touched.
func visibleCopy(res *fairness.Result) (*fairness.Result, error) {
	c := printableClone(reflect.ValueOf(res)).Interface().(*fairness.Result)
	return c, nil
}

// printableClone returns a deep copy of v with Printable applied to every
// string, map keys included (the display names are keyed by identifiers,
// which go through Printable wherever else they appear): pointers, maps,
// slices, arrays and structs are copied, other values (numbers, booleans)
// taken as they are. A Result holds no interfaces, channels or functions.
func printableClone(v reflect.Value) reflect.Value {
	switch v.Kind() {
	case reflect.String:
		out := reflect.New(v.Type()).Elem()
		out.SetString(Printable(v.String()))
		return out
	case reflect.Pointer:
		if v.IsNil() {
			return reflect.Zero(v.Type())
		}
		out := reflect.New(v.Type().Elem())
		out.Elem().Set(printableClone(v.Elem()))
		return out
	case reflect.Slice:
		if v.IsNil() {
			return reflect.Zero(v.Type())
		}
		out := reflect.MakeSlice(v.Type(), v.Len(), v.Len())
		for i := range v.Len() {
			out.Index(i).Set(printableClone(v.Index(i)))
		}
		return out
	case reflect.Array:
		out := reflect.New(v.Type()).Elem()
		for i := range v.Len() {
			out.Index(i).Set(printableClone(v.Index(i)))
		}
		return out
	case reflect.Struct:
		out := reflect.New(v.Type()).Elem()
		for i := range v.NumField() {
			if out.Field(i).CanSet() {
				out.Field(i).Set(printableClone(v.Field(i)))
			}
		}
		return out
	case reflect.Map:
		if v.IsNil() {
			return reflect.Zero(v.Type())
		}
		out := reflect.MakeMapWithSize(v.Type(), v.Len())
		iter := v.MapRange()
		for iter.Next() {
			out.SetMapIndex(printableClone(iter.Key()), printableClone(iter.Value()))
		}
		return out
	case reflect.Interface, reflect.Chan, reflect.Func:
		panic("report: printableClone: unexpected " + v.Kind().String() + " in a Result")
	}
	return v
}
