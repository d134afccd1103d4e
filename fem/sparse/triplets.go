package sparse

import (
	"fmt"
	"slices"
)

// Triplets collects entries (i, j, v) of a symmetric n×n matrix. Add accepts
// either triangle and stores (max(i,j), min(i,j)); duplicates are summed by
// Matrix. The zero value is an empty 0×0 collection; use NewTriplets.
type Triplets struct {
	n    int
	row  []int32
	col  []int32
	val  []float64
	err  error
	errs int
}

// NewTriplets returns an empty collection for an n×n matrix with room for
// capacity entries. A negative n or capacity counts as zero.
func NewTriplets(n, capacity int) *Triplets {
	n = max(0, min(n, maxDim))
	capacity = max(0, capacity)
	return &Triplets{
		n:   n,
		row: make([]int32, 0, capacity),
		col: make([]int32, 0, capacity),
		val: make([]float64, 0, capacity),
	}
}

// Add records entry (i, j) with value v; (j, i) is meant as well. As with
// AddDense, an entry with a negative index is skipped (a removed equation).
// An entry with an index ≥ n is dropped and remembered by Err.
func (t *Triplets) Add(i, j int, v float64) {
	if i < j {
		i, j = j, i
	}
	if j < 0 {
		return
	}
	if i >= t.n {
		if t.err == nil {
			t.err = fmt.Errorf("sparse: Triplets.Add(%d, %d): n = %d: %w", i, j, t.n, errIndex)
		}
		t.errs++
		return
	}
	t.row = append(t.row, int32(i))
	t.col = append(t.col, int32(j))
	t.val = append(t.val, v)
}

// Len returns the number of entries recorded, duplicates counted.
func (t *Triplets) Len() int { return len(t.val) }

// Err returns an error describing the first entry that Add dropped for an
// index out of range, or nil.
func (t *Triplets) Err() error {
	if t.err == nil {
		return nil
	}
	return fmt.Errorf("%w (%d entries dropped)", t.err, t.errs)
}

// Matrix compresses the entries into a new Matrix: duplicates summed, rows
// sorted within columns, every diagonal entry present. The collection is not
// modified and may grow further.
func (t *Triplets) Matrix() *Matrix {
	n := t.n
	// Bucket by column, the diagonal first in each bucket, then sort and merge.
	start := make([]int, n+1)
	for j := 0; j < n; j++ {
		start[j+1] = 1
	}
	for _, c := range t.col {
		start[c+1]++
	}
	for j := 0; j < n; j++ {
		start[j+1] += start[j]
	}
	rows := make([]int32, start[n])
	vals := make([]float64, start[n])
	pos := make([]int, n)
	for j := 0; j < n; j++ {
		rows[start[j]] = int32(j) // the diagonal, value 0
		pos[j] = start[j] + 1
	}
	for e, c := range t.col {
		p := pos[c]
		rows[p] = t.row[e]
		vals[p] = t.val[e]
		pos[c]++
	}
	// Compacting in place is safe: column j is copied to buf before it is
	// written, and writes never pass the start of the next column.
	m := &Matrix{n: n, colPtr: make([]int, n+1)}
	m.rowIdx = rows[:0]
	m.val = vals[:0]
	type entry struct {
		r int32
		v float64
	}
	var buf []entry
	for j := 0; j < n; j++ {
		buf = buf[:0]
		for p := start[j]; p < start[j+1]; p++ {
			buf = append(buf, entry{rows[p], vals[p]})
		}
		// A stable sort keeps the summation order of duplicates fixed.
		slices.SortStableFunc(buf, func(a, b entry) int { return int(a.r) - int(b.r) })
		for q, e := range buf {
			if q > 0 && e.r == buf[q-1].r {
				m.val[len(m.val)-1] += e.v
				continue
			}
			m.rowIdx = append(m.rowIdx, e.r)
			m.val = append(m.val, e.v)
		}
		m.colPtr[j+1] = len(m.rowIdx)
	}
	m.rowIdx = slices.Clip(m.rowIdx)
	m.val = slices.Clip(m.val)
	return m
}
