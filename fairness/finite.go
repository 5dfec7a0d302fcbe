package fairness

import (
	"fmt"
	"math"
	"reflect"
	"strings"
)

// NonFiniteError reports a number of a Result that is not finite (NaN or
// ±Inf): an estimate that could not be computed. It is a failure of the
// tool, not bad input, and keeps non-finite numbers out of every output.
type NonFiniteError struct {
	Field string  // JSON path of the number, e.g. "mechanisms[2].mean_ratio"
	About string  // the mechanism, metric or column it belongs to, if any
	Value float64 // the offending value
}

func (e *NonFiniteError) Error() string {
	about := ""
	if e.About != "" {
		about = " (" + e.About + ")"
	}
	return fmt.Sprintf("the estimate %s%s came out as %v and cannot be reported; the data or the chosen classifier may be degenerate for it", e.Field, about, e.Value)
}

// checkFinite returns a *NonFiniteError for the first number of r, in
// field order, that is not finite, or nil.
func checkFinite(r *Result) error {
	return finiteValue(reflect.ValueOf(r).Elem(), "", "")
}

// finiteValue walks v (a value at JSON path path, belonging to about).
func finiteValue(v reflect.Value, path, about string) error {
	switch v.Kind() {
	case reflect.Float64, reflect.Float32:
		if x := v.Float(); math.IsNaN(x) || math.IsInf(x, 0) {
			return &NonFiniteError{Field: path, About: about, Value: x}
		}
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			return finiteValue(v.Elem(), path, about)
		}
	case reflect.Slice, reflect.Array:
		for i := range v.Len() {
			if err := finiteValue(v.Index(i), fmt.Sprintf("%s[%d]", path, i), about); err != nil {
				return err
			}
		}
	case reflect.Struct:
		if name := subject(v); name != "" && about != "" {
			about += ", " + name
		} else if name != "" {
			about = name
		}
		t := v.Type()
		for i := range t.NumField() {
			f := t.Field(i)
			if !f.IsExported() {
				continue
			}
			if err := finiteValue(v.Field(i), joinPath(path, jsonName(f)), about); err != nil {
				return err
			}
		}
	}
	return nil
}

// subject names what a result struct describes, for the error message.
func subject(v reflect.Value) string {
	switch x := v.Interface().(type) {
	case MechanismResult:
		return "mechanism " + x.Mechanism
	case MetricResult:
		return "metric " + x.Metric
	case Contribution:
		return "contribution of " + x.Mechanism
	case ColumnDetails:
		return "column " + x.Name
	}
	return ""
}

// jsonName is the JSON key of a struct field.
func jsonName(f reflect.StructField) string {
	name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
	if name == "" || name == "-" {
		return f.Name
	}
	return name
}

func joinPath(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}
