package post

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// csvDigits is the number of significant digits of every number in a CSV
// file: enough for any engineering result, few enough that the last digit
// does not flicker between platforms that round differently.
const csvDigits = 10

// Table is a table of numbers for CSV output. Each column name carries its
// unit after an underscore, e.g. "Z_kN" or "u_mm"; every row has one value
// per column. NaN marks a value that does not exist (it is written as an
// empty field).
type Table struct {
	Columns []string
	Rows    [][]float64
}

// Append adds a copy of row to t. It fails if the row does not have one
// value per column.
func (t *Table) Append(row ...float64) error {
	if len(row) != len(t.Columns) {
		return fmt.Errorf("post: row of %d values does not fit a table of %d columns", len(row), len(t.Columns))
	}
	t.Rows = append(t.Rows, append([]float64(nil), row...))
	return nil
}

// WriteCSV writes t to path as CSV: a header line with the column names,
// then one line per row. Numbers are written with strconv's 'g' format at
// 10 significant digits, so the output is deterministic; NaN is written as
// an empty field, ±Inf as +Inf and −Inf, −0 as 0. The file is replaced
// atomically.
func WriteCSV(path string, t Table) error {
	if err := t.validate(); err != nil {
		return fmt.Errorf("post: write %s: %w", path, err)
	}
	return WriteFileAtomic(path, func(w io.Writer) error { return encodeCSV(w, t) })
}

// EncodeCSV writes what WriteCSV puts in a file to w.
func EncodeCSV(w io.Writer, t Table) error {
	if err := t.validate(); err != nil {
		return fmt.Errorf("post: %w", err)
	}
	return encodeCSV(w, t)
}

// validate checks that the header can be written without quoting, so the
// file reads the same in a spreadsheet, a script or a plain text split on
// commas, and that every row fits the header.
func (t Table) validate() error {
	if len(t.Columns) == 0 {
		return errors.New("table has no columns")
	}
	seen := make(map[string]int, len(t.Columns))
	for j, c := range t.Columns {
		switch {
		case c == "":
			return fmt.Errorf("column %d has no name", j)
		case strings.ContainsAny(c, ",\"\r\n"):
			return fmt.Errorf("column %d %q: a name must not contain a comma, quote or line break", j, c)
		case strings.TrimSpace(c) != c:
			return fmt.Errorf("column %d %q: a name must not start or end with a space", j, c)
		}
		if k, dup := seen[c]; dup {
			return fmt.Errorf("columns %d and %d are both named %q", k, j, c)
		}
		seen[c] = j
	}
	for i, r := range t.Rows {
		if len(r) != len(t.Columns) {
			return fmt.Errorf("row %d has %d values, the table has %d columns", i, len(r), len(t.Columns))
		}
	}
	return nil
}

func encodeCSV(w io.Writer, t Table) error {
	buf := make([]byte, 0, 1<<12)
	buf = append(buf, strings.Join(t.Columns, ",")...)
	buf = append(buf, '\n')
	for _, r := range t.Rows {
		buf = appendRow(buf, r)
		if len(buf) >= 1<<15 {
			if _, err := w.Write(buf); err != nil {
				return err
			}
			buf = buf[:0]
		}
	}
	_, err := w.Write(buf)
	return err
}

func appendRow(buf []byte, r []float64) []byte {
	if len(r) == 1 && math.IsNaN(r[0]) {
		// A blank line would be skipped by CSV readers and the row lost;
		// a quoted empty field keeps it.
		return append(buf, "\"\"\n"...)
	}
	for j, v := range r {
		if j > 0 {
			buf = append(buf, ',')
		}
		buf = appendCell(buf, v)
	}
	return append(buf, '\n')
}

func appendCell(buf []byte, v float64) []byte {
	switch {
	case math.IsNaN(v):
		return buf
	case v == 0:
		return append(buf, '0') // also −0, which reads as noise in a table
	}
	return strconv.AppendFloat(buf, v, 'g', csvDigits, 64)
}
