package compare

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"

	"github.com/gapwise/gapwise/fairness"
)

// Load reads a result file, the JSON that `gapwise decompose --format
// json` prints and --out writes as result.json (fairness.Result), and
// checks what comparing it relies on (validate). A problem is an *Error
// naming the file and, for syntax and type errors, the line and column,
// for other problems the JSON path of the value.
func Load(path string) (*fairness.Result, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, &Error{File: path, Err: ErrNotFound}
		}
		return nil, &Error{File: path, Err: wrapf(ErrRead, fmt.Sprintf("%s: %v", ErrRead, unwrapPath(err)))}
	}
	return Parse(path, b)
}

// Parse decodes the result file named name from its bytes b; see Load.
func Parse(name string, b []byte) (*fairness.Result, error) {
	if len(bytes.TrimSpace(b)) == 0 {
		return nil, &Error{File: name, Err: wrapf(ErrNotResult, "the file is empty; want the JSON of a gapwise result (decompose --format json or result.json)")}
	}
	var raw any
	if err := json.Unmarshal(b, &raw); err != nil {
		var se *json.SyntaxError
		if errors.As(err, &se) {
			line, col := position(b, se.Offset)
			return nil, &Error{File: name, Line: line, Column: col, Err: wrapf(ErrSyntax, "invalid JSON: "+se.Error())}
		}
		return nil, &Error{File: name, Err: wrapf(ErrSyntax, "invalid JSON: "+err.Error())}
	}
	if _, ok := raw.(map[string]any); !ok {
		return nil, &Error{File: name, Err: wrapf(ErrNotResult, "the file holds "+jsonKind(raw)+", not the JSON object of a gapwise result")}
	}
	var res fairness.Result
	if err := json.Unmarshal(b, &res); err != nil {
		var te *json.UnmarshalTypeError
		if errors.As(err, &te) {
			line, col := position(b, te.Offset)
			return nil, &Error{File: name, Line: line, Column: col, Path: te.Field,
				Err: wrapf(ErrType, fmt.Sprintf("want %s, got %s", goKind(te.Type.Kind().String()), "a JSON "+te.Value))}
		}
		return nil, &Error{File: name, Err: wrapf(ErrType, err.Error())}
	}
	if err := validate(&res); err != nil {
		err.File = name
		return nil, err
	}
	return &res, nil
}

// position turns a byte offset into a 1-based line and column (in bytes).
// The offset of a json error is just past the offending byte or value.
func position(b []byte, off int64) (line, col int) {
	if off > int64(len(b)) {
		off = int64(len(b))
	}
	if off < 1 {
		off = 1
	}
	before := b[:off-1]
	line = 1 + bytes.Count(before, []byte("\n"))
	col = len(before) - bytes.LastIndexByte(before, '\n')
	return line, col
}

func jsonKind(v any) string {
	switch v.(type) {
	case []any:
		return "an array"
	case string:
		return "a string"
	case float64:
		return "a number"
	case bool:
		return "a boolean"
	case nil:
		return "null"
	}
	return "a value"
}

func goKind(k string) string {
	switch k {
	case "float64", "float32", "int", "int64", "uint64", "uint":
		return "a number"
	case "string":
		return "a string"
	case "bool":
		return "a boolean"
	case "slice":
		return "an array"
	case "struct", "map", "ptr":
		return "an object"
	}
	return "a " + k
}

// unwrapPath drops the *fs.PathError's own copy of the file name, which
// the Error already shows.
func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
