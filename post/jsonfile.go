package post

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
)

// WriteJSON writes v to path as a JSON document indented by two spaces,
// with a trailing newline; the file is replaced atomically. v is encoded
// with encoding/json, so map keys come out sorted and struct fields in
// declaration order. Characters such as < and & are written as they are,
// not escaped for HTML.
//
// encoding/json writes each float64 in its shortest exact form, which
// shows every bit of a result. Callers that want a document that stays
// byte-identical across platforms round their floats with Round10 first.
// NaN and ±Inf have no JSON form and make WriteJSON fail.
func WriteJSON(path string, v any) error {
	// Encode before touching the disk, so an unsupported value leaves no trace.
	var buf bytes.Buffer
	if err := encodeJSON(&buf, v); err != nil {
		return fmt.Errorf("post: write %s: %w", path, err)
	}
	return WriteFileAtomic(path, func(w io.Writer) error {
		_, err := w.Write(buf.Bytes())
		return err
	})
}

// EncodeJSON writes what WriteJSON puts in a file to w. Nothing is written
// if v cannot be encoded.
func EncodeJSON(w io.Writer, v any) error {
	if err := encodeJSON(w, v); err != nil {
		return fmt.Errorf("post: %w", err)
	}
	return nil
}

func encodeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return fmt.Errorf("encode JSON: %w", err)
	}
	return nil
}

// Round10 returns x rounded to 10 significant decimal digits, the
// precision of the CSV files. The last bits of a computed value can differ
// between platforms (fused multiply–add, other summation orders); rounding
// hides that in the written files. NaN, ±Inf and zero are returned as they
// are, and so is a value that would round past the largest float64.
func Round10(x float64) float64 {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	r, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', csvDigits, 64), 64)
	if err != nil {
		return x
	}
	return r
}
