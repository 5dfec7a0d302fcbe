package fairness

// The cells of a Parquet file as the loader reads them: every supported
// column type written as the text a CSV file would hold for the same
// value, so that one grammar and one set of checks (data.go) serve both.

import (
	"fmt"
	"math"
	"math/big"
	"strconv"
	"strings"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/format"
)

// cellKind is how the values of one Parquet column become cells.
type cellKind int

const (
	cellText     cellKind = iota // BYTE_ARRAY: UTF-8 text (STRING, ENUM, JSON or no logical type)
	cellBool                     // BOOLEAN: true / false
	cellSigned                   // INT32, INT64: decimal integers
	cellUnsigned                 // INT32, INT64 with an unsigned INT logical type
	cellFloat                    // FLOAT: the shortest decimal that reads back as the float32
	cellDouble                   // DOUBLE: the shortest decimal that reads back as the float64
	cellDecimal                  // DECIMAL on INT32, INT64, BYTE_ARRAY or FIXED_LEN_BYTE_ARRAY: exact decimal text
)

// columnReader converts the values of one column.
type columnReader struct {
	kind  cellKind
	scale int // DECIMAL's scale
}

// readerOf returns the converter for a column of type t, or a sentence
// naming the type when gapwise does not read it (dates, times,
// timestamps, UUIDs, half floats, INT96, fixed-length bytes that are not a
// decimal, nested types).
func readerOf(t parquet.Type) (columnReader, string) {
	var lt format.LogicalTypeValue
	if l := t.LogicalType(); l != nil {
		lt = l.Value
	}
	switch v := lt.(type) {
	case *format.DecimalType:
		return columnReader{kind: cellDecimal, scale: int(v.Scale)}, ""
	case *format.IntType:
		if !v.IsSigned {
			return columnReader{kind: cellUnsigned}, ""
		}
		return columnReader{kind: cellSigned}, ""
	case nil, *format.StringType, *format.EnumType, *format.JsonType:
	default:
		return columnReader{}, fmt.Sprintf("its Parquet logical type is %s", strings.ToUpper(lt.String()))
	}
	switch t.Kind() {
	case parquet.Boolean:
		return columnReader{kind: cellBool}, ""
	case parquet.Int32, parquet.Int64:
		return columnReader{kind: cellSigned}, ""
	case parquet.Float:
		return columnReader{kind: cellFloat}, ""
	case parquet.Double:
		return columnReader{kind: cellDouble}, ""
	case parquet.ByteArray:
		return columnReader{kind: cellText}, ""
	}
	return columnReader{}, fmt.Sprintf("its Parquet type is %s", t.Kind())
}

// cell returns the text of value v: "" for a null (missing), "NaN" for a
// NaN (missing, as in a CSV file); an infinity is an error, and so is text
// that is not UTF-8.
func (c columnReader) cell(v parquet.Value) (string, error) {
	if v.IsNull() {
		return "", nil
	}
	switch c.kind {
	case cellBool:
		return strconv.FormatBool(v.Boolean()), nil
	case cellSigned:
		if v.Kind() == parquet.Int32 {
			return strconv.FormatInt(int64(v.Int32()), 10), nil
		}
		return strconv.FormatInt(v.Int64(), 10), nil
	case cellUnsigned:
		if v.Kind() == parquet.Int32 {
			return strconv.FormatUint(uint64(v.Uint32()), 10), nil
		}
		return strconv.FormatUint(v.Uint64(), 10), nil
	case cellFloat:
		return floatCell(float64(v.Float()), 32)
	case cellDouble:
		return floatCell(v.Double(), 64)
	case cellDecimal:
		return decimalCell(v, c.scale), nil
	}
	b := v.ByteArray()
	if err := checkUTF8(string(b)); err != nil {
		return "", err
	}
	return string(b), nil
}

// floatCell writes x in the shortest decimal that reads back as the same
// float of the given bit size: a FLOAT 12.4 is "12.4", as a CSV export
// would write it, not the float64 12.399999618530273.
func floatCell(x float64, bits int) (string, error) {
	switch {
	case math.IsNaN(x):
		return "NaN", nil
	case math.IsInf(x, 0):
		return "", wrapf(ErrNotNumeric, "%v is not a finite number", x)
	}
	return strconv.FormatFloat(x, 'g', -1, bits), nil
}

// decimalCell writes a DECIMAL value exactly: its unscaled integer (the
// INT32 or INT64 value, or the big-endian two's-complement bytes) with the
// decimal point scale digits from the right.
func decimalCell(v parquet.Value, scale int) string {
	var u big.Int
	switch v.Kind() {
	case parquet.Int32:
		u.SetInt64(int64(v.Int32()))
	case parquet.Int64:
		u.SetInt64(v.Int64())
	default:
		b := v.ByteArray()
		u.SetBytes(b)
		if len(b) > 0 && b[0]&0x80 != 0 { // negative: subtract 2^(8·len)
			u.Sub(&u, new(big.Int).Lsh(big.NewInt(1), uint(8*len(b))))
		}
	}
	digits := u.String()
	neg := strings.HasPrefix(digits, "-")
	digits = strings.TrimPrefix(digits, "-")
	if scale > 0 {
		if len(digits) <= scale {
			digits = strings.Repeat("0", scale-len(digits)+1) + digits
		}
		digits = digits[:len(digits)-scale] + "." + digits[len(digits)-scale:]
	} else if scale < 0 {
		digits += strings.Repeat("0", -scale)
	}
	if neg {
		digits = "-" + digits
	}
	return digits
}
