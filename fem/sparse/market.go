package sparse

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// The Matrix Market exchange format is the plain-text format of the NIST
// Matrix Market collection (Boisvert, Pozo & Remington, "The Matrix Market
// Exchange Formats: Initial Design", NISTIR 5935, 1996). Values are written
// with the shortest representation that parses back to the same float64, so
// a write–read round trip is exact and output is deterministic.

var errFormat = errors.New("sparse: Matrix Market format")

// WriteMatrixMarket writes m as a "coordinate real symmetric" Matrix Market
// file: 1-based indices, lower triangle, column by column.
func WriteMatrixMarket(w io.Writer, m *Matrix) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "%%%%MatrixMarket matrix coordinate real symmetric\n%d %d %d\n", m.n, m.n, m.NNZ())
	buf := make([]byte, 0, 64)
	for j := 0; j < m.n; j++ {
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			buf = strconv.AppendInt(buf[:0], int64(m.rowIdx[p])+1, 10)
			buf = append(buf, ' ')
			buf = strconv.AppendInt(buf, int64(j)+1, 10)
			buf = append(buf, ' ')
			buf = strconv.AppendFloat(buf, m.val[p], 'g', -1, 64)
			buf = append(buf, '\n')
			bw.Write(buf)
		}
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("sparse: WriteMatrixMarket: %w", err)
	}
	return nil
}

// WriteVectorMarket writes v as an "array real general" Matrix Market file
// with one column.
func WriteVectorMarket(w io.Writer, v []float64) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "%%%%MatrixMarket matrix array real general\n%d 1\n", len(v))
	buf := make([]byte, 0, 32)
	for _, x := range v {
		buf = strconv.AppendFloat(buf[:0], x, 'g', -1, 64)
		buf = append(buf, '\n')
		bw.Write(buf)
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("sparse: WriteVectorMarket: %w", err)
	}
	return nil
}

// ReadMatrixMarket reads a "coordinate real symmetric" (or "integer
// symmetric") Matrix Market file. Entries may be given in either triangle;
// duplicates are summed.
func ReadMatrixMarket(r io.Reader) (*Matrix, error) {
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 1<<16), 1<<20)
	line := 0
	fail := func(format string, args ...any) error {
		return fmt.Errorf("sparse: ReadMatrixMarket: line %d: %s: %w", line, fmt.Sprintf(format, args...), errFormat)
	}
	if !sc.Scan() {
		if err := sc.Err(); err != nil {
			return nil, fmt.Errorf("sparse: ReadMatrixMarket: %w", err)
		}
		return nil, fail("empty input")
	}
	line++
	head := strings.Fields(strings.ToLower(sc.Text()))
	if len(head) != 5 || head[0] != "%%matrixmarket" || head[1] != "matrix" || head[2] != "coordinate" ||
		(head[3] != "real" && head[3] != "integer") || head[4] != "symmetric" {
		return nil, fail("header %q: want coordinate real symmetric", sc.Text())
	}
	var t *Triplets
	var n, nnz, got int
	for sc.Scan() {
		line++
		f := strings.Fields(sc.Text())
		if len(f) == 0 || strings.HasPrefix(f[0], "%") {
			continue
		}
		if t == nil {
			if len(f) != 3 {
				return nil, fail("size line %q", sc.Text())
			}
			var err error
			var cols int
			n, err = strconv.Atoi(f[0])
			if err == nil {
				cols, err = strconv.Atoi(f[1])
			}
			if err == nil {
				nnz, err = strconv.Atoi(f[2])
			}
			if err != nil || n < 0 || n != cols || nnz < 0 || n > maxDim {
				return nil, fail("size line %q: want n n nnz", sc.Text())
			}
			t = NewTriplets(n, min(nnz, 1<<24))
			continue
		}
		if len(f) != 3 {
			return nil, fail("entry %q: want i j value", sc.Text())
		}
		i, err1 := strconv.Atoi(f[0])
		j, err2 := strconv.Atoi(f[1])
		v, err3 := strconv.ParseFloat(f[2], 64)
		if err1 != nil || err2 != nil || err3 != nil {
			return nil, fail("entry %q", sc.Text())
		}
		if i < 1 || i > n || j < 1 || j > n {
			return nil, fail("entry (%d, %d) outside 1…%d", i, j, n)
		}
		if got == nnz {
			return nil, fail("more than %d entries", nnz)
		}
		t.Add(i-1, j-1, v)
		got++
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("sparse: ReadMatrixMarket: %w", err)
	}
	if t == nil {
		return nil, fail("missing size line")
	}
	if got != nnz {
		return nil, fail("%d entries, header says %d", got, nnz)
	}
	return t.Matrix(), nil
}
