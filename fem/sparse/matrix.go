package sparse

import (
	"errors"
	"fmt"
	"slices"
	"sync"
)

// Matrix is a symmetric n×n matrix stored by its lower triangle (diagonal
// included) in compressed sparse column form, row indices ascending in each
// column. Every diagonal entry is structurally present (an explicit zero if
// need be), so the diagonal is the first entry of its column.
type Matrix struct {
	n      int
	colPtr []int     // column j holds entries colPtr[j] : colPtr[j+1]
	rowIdx []int32   // row of each entry, ascending within a column
	val    []float64 // value of each entry
	// tails holds the buffers (*[]float64) of the split products
	// (MulVecTo), so that GMRES's steps do not each allocate one.
	tails sync.Pool
}

// maxDim bounds n so that row indices fit the int32 used for storage.
const maxDim = 1<<31 - 1

// errNotSquare and friends are wrapped with context by the callers.
var (
	errDim     = errors.New("sparse: dimension out of range")
	errIndex   = errors.New("sparse: index out of range")
	errPattern = errors.New("sparse: entry outside the pattern")
	errLength  = errors.New("sparse: length mismatch")
)

// NewPattern returns a zero-valued matrix whose pattern holds every pair (i,j)
// of indices that appear together in one group (think: the equation numbers of
// one element) plus the whole diagonal. Negative indices are skipped; an index
// ≥ n is an error. It is built without dense intermediates: memory is
// proportional to the size of the groups and of the pattern.
func NewPattern(n int, groups [][]int) (*Matrix, error) {
	if n < 0 || n > maxDim {
		return nil, fmt.Errorf("sparse: NewPattern: n = %d: %w", n, errDim)
	}
	// Incidence index → groups, in CSR form, so that each column can collect
	// its rows from the groups that contain it.
	cnt := make([]int, n+1)
	for g, grp := range groups {
		for _, i := range grp {
			if i >= n {
				return nil, fmt.Errorf("sparse: NewPattern: group %d: index %d ≥ n = %d: %w", g, i, n, errIndex)
			}
			if i >= 0 {
				cnt[i+1]++
			}
		}
	}
	for i := 0; i < n; i++ {
		cnt[i+1] += cnt[i]
	}
	inc := make([]int32, cnt[n])
	next := slices.Clone(cnt[:n])
	for g, grp := range groups {
		for _, i := range grp {
			if i >= 0 {
				inc[next[i]] = int32(g)
				next[i]++
			}
		}
	}
	mark := make([]int, n)
	for i := range mark {
		mark[i] = -1
	}
	m := &Matrix{n: n, colPtr: make([]int, n+1)}
	rows := make([]int32, 0, 64)
	for j := 0; j < n; j++ {
		rows = append(rows[:0], int32(j))
		mark[j] = j
		for _, g := range inc[cnt[j]:cnt[j+1]] {
			for _, i := range groups[g] {
				if i > j && mark[i] != j {
					mark[i] = j
					rows = append(rows, int32(i))
				}
			}
		}
		slices.Sort(rows[1:])
		m.rowIdx = append(m.rowIdx, rows...)
		m.colPtr[j+1] = len(m.rowIdx)
	}
	m.rowIdx = slices.Clip(m.rowIdx)
	m.val = make([]float64, len(m.rowIdx))
	return m, nil
}

// N returns the dimension of m.
func (m *Matrix) N() int { return m.n }

// NNZ returns the number of stored entries: those of the lower triangle,
// diagonal included.
func (m *Matrix) NNZ() int { return len(m.rowIdx) }

// find returns the position of entry (i, j), i ≥ j, or -1 if it is not in
// the pattern.
func (m *Matrix) find(i, j int) int {
	lo, hi := m.colPtr[j], m.colPtr[j+1]
	r := int32(i)
	for lo < hi {
		mid := int(uint(lo+hi) >> 1)
		switch v := m.rowIdx[mid]; {
		case v < r:
			lo = mid + 1
		case v > r:
			hi = mid
		default:
			return mid
		}
	}
	return -1
}

// At returns entry (i, j) of m, reading either triangle. It returns 0 for an
// entry outside the pattern or for indices out of range.
func (m *Matrix) At(i, j int) float64 {
	if i < j {
		i, j = j, i
	}
	if j < 0 || i >= m.n {
		return 0
	}
	if p := m.find(i, j); p >= 0 {
		return m.val[p]
	}
	return 0
}

// Zero sets every stored value to zero and keeps the pattern.
func (m *Matrix) Zero() { clear(m.val) }

// sortSmall bounds the blocks that AddDense orders on the stack; larger
// blocks fall back to one binary search per entry.
const sortSmall = 64

// AddDense adds the dense symmetric block k, row-major len(idx)×len(idx), at
// rows and columns idx. Negative entries of idx are skipped. Only entries with
// idx[r] ≥ idx[c] are read, so either a full block or its lower triangle in
// idx order may be passed. If a target entry is not in the pattern it
// returns an error; the entries added before it stay added. It does not
// allocate.
func (m *Matrix) AddDense(idx []int, k []float64) error {
	ne := len(idx)
	if len(k) != ne*ne {
		return fmt.Errorf("sparse: AddDense: len(k) = %d, want %d: %w", len(k), ne*ne, errLength)
	}
	for _, g := range idx {
		if g >= m.n {
			return fmt.Errorf("sparse: AddDense: index %d ≥ n = %d: %w", g, m.n, errIndex)
		}
	}
	if ne > sortSmall {
		return m.addDenseSearch(idx, k)
	}
	// Order the block's positions by global index so each column is walked
	// once, forward, through its sorted rows.
	var ordArr [sortSmall]int
	ord := orderBlock(idx, ordArr[:0])
	start := 0
	for a, c := range ord {
		col := idx[c]
		if idx[ord[start]] != col {
			start = a // repeated indices share one start, so none is missed
		}
		lo, hi := m.colPtr[col], m.colPtr[col+1]
		rows := m.rowIdx[:hi]
		for _, r := range ord[start:] {
			row := int32(idx[r])
			// Gallop forward: the next row is usually close.
			for lo < hi && rows[lo] < row {
				lo++
			}
			if lo == hi || rows[lo] != row {
				return fmt.Errorf("sparse: AddDense: entry (%d, %d): %w", row, col, errPattern)
			}
			m.val[lo] += k[r*ne+c]
		}
	}
	return nil
}

// orderBlock appends to ord the positions of idx's non-negative entries,
// ordered by their index (insertion sort: a block is small).
func orderBlock(idx []int, ord []int) []int {
	for p, g := range idx {
		if g >= 0 {
			ord = append(ord, p)
		}
	}
	for a := 1; a < len(ord); a++ {
		v := ord[a]
		b := a
		for ; b > 0 && idx[ord[b-1]] > idx[v]; b-- {
			ord[b] = ord[b-1]
		}
		ord[b] = v
	}
	return ord
}

// Slots are where AddDense adds a block's entries in one matrix's values,
// found once: an element's block goes to the same places at every
// assembly, and AddSlots adds it there without searching the pattern.
type Slots struct {
	ne   int      // the block's order
	pos  []int32  // positions in the values, in the order AddDense adds
	from []uint16 // the block's entry (r·ne + c) added there
}

// SlotsOf returns the slots of a block at rows and columns idx, in the
// order AddDense adds its entries, so that AddSlots sums exactly as
// AddDense does. An entry outside the pattern is an error.
func (m *Matrix) SlotsOf(idx []int) (Slots, error) {
	ne := len(idx)
	if ne*ne > 1<<16 {
		return Slots{}, fmt.Errorf("sparse: SlotsOf: block of order %d: %w", ne, errLength)
	}
	for _, g := range idx {
		if g >= m.n {
			return Slots{}, fmt.Errorf("sparse: SlotsOf: index %d ≥ n = %d: %w", g, m.n, errIndex)
		}
	}
	sl := Slots{ne: ne}
	add := func(row, col, from int) error {
		p := m.find(row, col)
		if p < 0 {
			return fmt.Errorf("sparse: SlotsOf: entry (%d, %d): %w", row, col, errPattern)
		}
		sl.pos = append(sl.pos, int32(p))
		sl.from = append(sl.from, uint16(from))
		return nil
	}
	if ne > sortSmall {
		for c, col := range idx {
			for r, row := range idx {
				if col >= 0 && row >= col {
					if err := add(row, col, r*ne+c); err != nil {
						return Slots{}, err
					}
				}
			}
		}
		return sl, nil
	}
	ord := orderBlock(idx, make([]int, 0, ne))
	start := 0
	for a, c := range ord {
		if idx[ord[start]] != idx[c] {
			start = a
		}
		for _, r := range ord[start:] {
			if err := add(idx[r], idx[c], r*ne+c); err != nil {
				return Slots{}, err
			}
		}
	}
	return sl, nil
}

// AddSlots adds the block k (row-major, of the order the slots were found
// for) at its slots, as AddDense would.
func (m *Matrix) AddSlots(sl Slots, k []float64) error {
	if len(k) != sl.ne*sl.ne {
		return fmt.Errorf("sparse: AddSlots: len(k) = %d, want %d: %w", len(k), sl.ne*sl.ne, errLength)
	}
	val := m.val
	for i, p := range sl.pos {
		val[p] += k[sl.from[i]]
	}
	return nil
}

// addDenseSearch is AddDense for large blocks: one binary search per entry.
func (m *Matrix) addDenseSearch(idx []int, k []float64) error {
	ne := len(idx)
	for c, col := range idx {
		if col < 0 {
			continue
		}
		for r, row := range idx {
			if row < col {
				continue
			}
			p := m.find(row, col)
			if p < 0 {
				return fmt.Errorf("sparse: AddDense: entry (%d, %d): %w", row, col, errPattern)
			}
			m.val[p] += k[r*ne+c]
		}
	}
	return nil
}

// MulVecTo computes dst = M x with the full symmetric matrix. dst and x must
// have length n and must not overlap; MulVecTo does nothing if the lengths
// are wrong (the caller's bug; use N to size them).
func (m *Matrix) MulVecTo(dst, x []float64) {
	if len(dst) != m.n || len(x) != m.n {
		return
	}
	clear(dst)
	nnz := m.colPtr[m.n]
	if nnz < splitProductNNZ {
		m.mulColumns(dst, x, 0, m.n, 0)
		return
	}
	// Two halves of the columns by entries, on two goroutines. The second
	// half's products reach only rows from its first column on; it sums
	// them apart and they are added after. The split and the order of the
	// sums do not depend on the cores, so the product is the same on
	// every machine.
	mid := m.splitColumn(nnz / 2)
	buf, _ := m.tails.Get().(*[]float64)
	if buf == nil || len(*buf) != m.n-mid {
		b := make([]float64, m.n-mid)
		buf = &b
	}
	defer m.tails.Put(buf)
	tail := *buf
	clear(tail)
	done := make(chan struct{})
	go func() {
		m.mulColumns(tail, x, mid, m.n, mid)
		close(done)
	}()
	m.mulColumns(dst, x, 0, mid, 0)
	<-done
	for i, v := range tail {
		dst[mid+i] += v
	}
}

// splitProductNNZ: below this many entries a product runs on one
// goroutine (a goroutine costs about a microsecond, the product of 2¹⁷
// entries some 150 µs).
const splitProductNNZ = 1 << 17

// splitColumn returns the first column at or after which half the entries
// begin.
func (m *Matrix) splitColumn(half int) int {
	lo, hi := 0, m.n
	for lo < hi {
		c := (lo + hi) / 2
		if m.colPtr[c] < half {
			lo = c + 1
		} else {
			hi = c
		}
	}
	return lo
}

// mulColumns adds the products of columns [from, to) of the symmetric
// matrix with x to dst, which holds the rows from base on (every row the
// columns reach is at least base).
func (m *Matrix) mulColumns(dst, x []float64, from, to, base int) {
	for j := from; j < to; j++ {
		xj := x[j]
		var s float64
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			i := int(m.rowIdx[p])
			v := m.val[p]
			if i == j {
				s += v * xj
				continue
			}
			dst[i-base] += v * xj
			s += v * x[i]
		}
		dst[j-base] += s
	}
}

// Copy returns a deep copy of m.
func (m *Matrix) Copy() *Matrix {
	return &Matrix{
		n:      m.n,
		colPtr: slices.Clone(m.colPtr),
		rowIdx: slices.Clone(m.rowIdx),
		val:    slices.Clone(m.val),
	}
}

// CopyValues sets m's values to src's; the two must share one pattern
// (src a Copy of m, or built from the same groups).
func (m *Matrix) CopyValues(src *Matrix) error {
	if !m.samePattern(src) {
		return fmt.Errorf("sparse: CopyValues: %w", errPattern)
	}
	copy(m.val, src.val)
	return nil
}

// Diagonal copies the diagonal of m into dst, which must have length n
// (otherwise nothing is copied).
func (m *Matrix) Diagonal(dst []float64) {
	if len(dst) != m.n {
		return
	}
	for j := range dst {
		dst[j] = m.val[m.colPtr[j]]
	}
}

// samePattern reports whether m and o have identical patterns.
func (m *Matrix) samePattern(o *Matrix) bool {
	return m.n == o.n && slices.Equal(m.colPtr, o.colPtr) && slices.Equal(m.rowIdx, o.rowIdx)
}
