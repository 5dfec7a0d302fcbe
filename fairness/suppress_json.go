package fairness

import (
	"bytes"
	"encoding/json"
	"fmt"
	"slices"
	"strings"
)

// MarshalJSON encodes r as its fields' tags say, except that every value
// r.Suppression withholds is null (and a withheld count whose field is
// left out when zero is written as null at the end of its object), so
// that a reader of the JSON can tell a withheld count from a zero. Without
// suppression the bytes are those of the plain encoding.
func (r Result) MarshalJSON() ([]byte, error) {
	type plain Result // the same fields without this method
	b, err := json.Marshal(plain(r))
	if err != nil || r.Suppression == nil || len(r.Suppression.Cells) == 0 {
		return b, err
	}
	paths := make(map[string]bool, len(r.Suppression.Cells))
	for _, c := range r.Suppression.Cells {
		paths[c.Path] = true
	}
	return nullAt(b, paths)
}

// nullAt rewrites the JSON document js with null at each of paths: a
// path is the dotted field names from the root with [i] for array
// elements ("details.columns[2].reference[0]"). Object keys that paths
// name but js lacks are added as null at the end of their object. Keys
// keep their order; strings and numbers keep their bytes.
func nullAt(js []byte, paths map[string]bool) ([]byte, error) {
	dec := json.NewDecoder(bytes.NewReader(js))
	dec.UseNumber()
	var out bytes.Buffer
	w := nullWriter{paths: paths, keys: map[string][]string{}}
	for p := range paths {
		if i := strings.LastIndexByte(p, '.'); i >= 0 && !strings.Contains(p[i+1:], "[") {
			w.keys[p[:i]] = append(w.keys[p[:i]], p[i+1:])
		}
	}
	for _, ks := range w.keys {
		slices.Sort(ks)
	}
	if err := w.copyValue(dec, &out, ""); err != nil {
		return nil, fmt.Errorf("fairness: writing withheld values as null: %w", err)
	}
	return out.Bytes(), nil
}

// nullWriter copies JSON with null at paths; keys maps the path of an
// object to the keys that paths name in it, sorted.
type nullWriter struct {
	paths map[string]bool
	keys  map[string][]string
}

// copyValue copies the next JSON value from dec to out, with null for the
// value at path when w.paths holds it (and for any withheld value inside).
func (w nullWriter) copyValue(dec *json.Decoder, out *bytes.Buffer, path string) error {
	paths := w.paths
	tok, err := dec.Token()
	if err != nil {
		return err
	}
	if paths[path] {
		out.WriteString("null")
		return skipRest(dec, tok)
	}
	switch tok {
	case json.Delim('{'):
		out.WriteByte('{')
		seen := map[string]bool{}
		n := 0
		for dec.More() {
			kt, err := dec.Token()
			if err != nil {
				return err
			}
			key, _ := kt.(string)
			seen[key] = true
			if n > 0 {
				out.WriteByte(',')
			}
			n++
			writeString(out, key)
			out.WriteByte(':')
			if err := w.copyValue(dec, out, jsonFieldPath(path, key)); err != nil {
				return err
			}
		}
		for _, key := range w.keys[path] {
			if seen[key] {
				continue
			}
			if n > 0 {
				out.WriteByte(',')
			}
			n++
			writeString(out, key)
			out.WriteString(":null")
		}
		_, err := dec.Token() // '}'
		out.WriteByte('}')
		return err
	case json.Delim('['):
		out.WriteByte('[')
		for i := 0; dec.More(); i++ {
			if i > 0 {
				out.WriteByte(',')
			}
			if err := w.copyValue(dec, out, fmt.Sprintf("%s[%d]", path, i)); err != nil {
				return err
			}
		}
		_, err := dec.Token() // ']'
		out.WriteByte(']')
		return err
	}
	switch v := tok.(type) {
	case string:
		writeString(out, v)
	case json.Number:
		out.WriteString(v.String())
	case bool:
		fmt.Fprint(out, v)
	case nil:
		out.WriteString("null")
	}
	return nil
}

// skipRest consumes the rest of a value whose first token was tok.
func skipRest(dec *json.Decoder, tok json.Token) error {
	if tok != json.Delim('{') && tok != json.Delim('[') {
		return nil
	}
	for depth := 1; depth > 0; {
		t, err := dec.Token()
		if err != nil {
			return err
		}
		switch t {
		case json.Delim('{'), json.Delim('['):
			depth++
		case json.Delim('}'), json.Delim(']'):
			depth--
		}
	}
	return nil
}

// jsonFieldPath appends an object key to a path.
func jsonFieldPath(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

// writeString writes s as encoding/json writes a string (HTML characters
// escaped), so copied strings keep their bytes.
func writeString(out *bytes.Buffer, s string) {
	b, _ := json.Marshal(s)
	out.Write(b)
}
