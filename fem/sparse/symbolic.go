package sparse

// This file is longer than most: the symbolic analysis (elimination tree,
// postorder, column counts, supernodes and their row structure) is one
// pipeline whose steps share their arrays; split, it would read worse.

import (
	"errors"
	"fmt"
	"slices"
)

// Ordering selects the fill-reducing permutation computed by Analyze.
type Ordering int

const (
	// OrderAMD is the approximate minimum degree ordering (Amestoy, Davis &
	// Duff 1996). It is the default.
	OrderAMD Ordering = iota
	// OrderNestedDissection is a nested dissection ordering (George 1973;
	// George & Liu 1981) by recursive multilevel vertex separators of the
	// matrix graph. On large 2D meshes it needs fewer operations than AMD;
	// its analysis takes longer.
	OrderNestedDissection
	// OrderNatural keeps the given order.
	OrderNatural
	// OrderBest runs AMD and nested dissection and keeps the ordering whose
	// factor has fewer nonzeros.
	OrderBest
)

func (o Ordering) String() string {
	switch o {
	case OrderAMD:
		return "AMD"
	case OrderNestedDissection:
		return "nested dissection"
	case OrderNatural:
		return "natural"
	case OrderBest:
		return "best of AMD and nested dissection"
	}
	return fmt.Sprintf("Ordering(%d)", int(o))
}

var errOrdering = errors.New("sparse: unknown ordering")

// Symbolic is the analysis of a pattern: fill-reducing permutation,
// elimination tree, column counts, supernode partition and factor pattern.
// It is reused by every numeric factorization of matrices with the same
// pattern and is not modified by them, so one Symbolic may serve several
// Cholesky values at once.
type Symbolic struct {
	n       int
	ord     Ordering
	perm    []int // new index → old index
	pattern *Matrix

	// The permuted lower triangle C = P A Pᵀ: for column j of C, entries
	// cPtr[j]:cPtr[j+1] with rows cRow and positions cSrc in A's storage.
	cPtr []int
	cRow []int32
	cSrc []int32

	lnz   int     // nonzeros of L, relaxed zeros not counted
	flops float64 // operations of one factorization of the exact pattern

	// Supernodes, in postorder: columns super[s]:super[s+1], row structure
	// rows[rowPtr[s]:rowPtr[s+1]] (the supernode's own columns first), dense
	// block of L at lx[lPtr[s]:lPtr[s+1]], row-major rows × columns.
	nsuper   int
	super    []int
	parent   []int
	rowPtr   []int
	rows     []int32
	lPtr     []int
	childPtr []int
	child    []int
	work     []float64 // estimated cost of each supernode's front

	solve *solvePlan // split of the tree for the triangular solves

	trailing int // equations pivoted last by AnalyzeLast, 0 after Analyze
}

// Analyze computes the symbolic factorization of m's pattern with the given
// fill-reducing ordering. The values of m are not used. Nested dissection
// orders the halves of large parts on two goroutines when GOMAXPROCS > 1;
// the result does not depend on it.
func Analyze(m *Matrix, ord Ordering) (*Symbolic, error) {
	if m == nil {
		return nil, errors.New("sparse: Analyze: nil matrix")
	}
	if ord == OrderBest {
		a, errA := Analyze(m, OrderAMD)
		d, errD := Analyze(m, OrderNestedDissection)
		switch {
		case errA != nil:
			return nil, errA
		case errD != nil || a.lnz <= d.lnz:
			a.ord = OrderBest
			return a, nil
		default:
			d.ord = OrderBest
			return d, nil
		}
	}
	perm, err := ordering(m, ord)
	if err != nil {
		return nil, err
	}
	return analyzePerm(m, ord, perm)
}

// analyzePerm is Analyze for a given fill-reducing permutation.
func analyzePerm(m *Matrix, ord Ordering, perm []int) (*Symbolic, error) {
	if !validPerm(perm, m.n) {
		return nil, fmt.Errorf("sparse: Analyze: %v ordering is not a permutation (internal error)", ord)
	}
	s := &Symbolic{n: m.n, ord: ord, pattern: &Matrix{
		n:      m.n,
		colPtr: slices.Clone(m.colPtr),
		rowIdx: slices.Clone(m.rowIdx),
	}}
	// A first pass finds the elimination tree for the ordering; its postorder
	// makes supernodes contiguous and is composed into the final permutation.
	rowPtr, rowCol := s.permute(m, perm)
	parent := etree(s.n, rowPtr, rowCol)
	post := postorder(parent)
	final := make([]int, s.n)
	for k, j := range post {
		final[k] = perm[j]
	}
	s.perm = final
	rowPtr, rowCol = s.permute(m, final)
	parent = etree(s.n, rowPtr, rowCol)
	cc := colCounts(parent, rowPtr, rowCol)
	for _, c := range cc {
		s.lnz += c
		s.flops += float64(c) * float64(c)
	}
	s.supernodes(parent, cc)
	s.solve = s.newSolvePlan(solveParts)
	return s, nil
}

func ordering(m *Matrix, ord Ordering) ([]int, error) {
	n := m.n
	switch ord {
	case OrderAMD:
		xadj, adj := symmetricAdjacency(m)
		return amdOrder(n, xadj, adj, nil), nil
	case OrderNestedDissection:
		xadj, adj := symmetricAdjacency(m)
		return ndOrder(n, xadj, adj)
	case OrderNatural:
		p := make([]int, n)
		for i := range p {
			p[i] = i
		}
		return p, nil
	}
	return nil, fmt.Errorf("sparse: Analyze: %v: %w", ord, errOrdering)
}

// permute builds C = P A Pᵀ (lower triangle, rows ascending) with the source
// positions of its entries, and returns C's rows in CSR form (the columns of
// each row, which lie left of the diagonal) for the tree algorithms.
func (s *Symbolic) permute(m *Matrix, perm []int) ([]int, []int32) {
	n := s.n
	pinv := make([]int, n)
	for k, i := range perm {
		pinv[i] = k
	}
	nnz := m.NNZ()
	// Bucket by row of C, then by column: the second pass yields sorted rows.
	rowPtr := make([]int, n+1)
	for j := 0; j < n; j++ {
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			rowPtr[max(pinv[m.rowIdx[p]], pinv[j])+1]++
		}
	}
	for i := 0; i < n; i++ {
		rowPtr[i+1] += rowPtr[i]
	}
	rowCol := make([]int32, nnz)
	rowSrc := make([]int32, nnz)
	next := slices.Clone(rowPtr[:n])
	colCnt := make([]int, n+1)
	for j := 0; j < n; j++ {
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			a, b := pinv[m.rowIdx[p]], pinv[j]
			if a < b {
				a, b = b, a
			}
			rowCol[next[a]] = int32(b)
			rowSrc[next[a]] = int32(p)
			next[a]++
			colCnt[b+1]++
		}
	}
	for j := 0; j < n; j++ {
		colCnt[j+1] += colCnt[j]
	}
	s.cPtr = colCnt
	s.cRow = make([]int32, nnz)
	s.cSrc = make([]int32, nnz)
	next = slices.Clone(colCnt[:n])
	for i := 0; i < n; i++ {
		for q := rowPtr[i]; q < rowPtr[i+1]; q++ {
			j := rowCol[q]
			s.cRow[next[j]] = int32(i)
			s.cSrc[next[j]] = rowSrc[q]
			next[j]++
		}
	}
	return rowPtr, rowCol
}

// etree returns the elimination tree of the matrix whose lower triangle is
// given by rows (Liu's algorithm with path compression; Liu, "The role of
// elimination trees in sparse factorization", SIAM J. Matrix Anal. Appl.
// 11(1), 1990).
func etree(n int, rowPtr []int, rowCol []int32) []int {
	parent := make([]int, n)
	anc := make([]int, n)
	for k := 0; k < n; k++ {
		parent[k] = -1
		anc[k] = -1
		for _, jj := range rowCol[rowPtr[k]:rowPtr[k+1]] {
			for r := int(jj); r != -1 && r < k; {
				next := anc[r]
				anc[r] = k
				if next == -1 {
					parent[r] = k
				}
				r = next
			}
		}
	}
	return parent
}

// postorder returns a postorder of the forest given by parent, children
// visited in ascending order.
func postorder(parent []int) []int {
	n := len(parent)
	head := make([]int, n)
	next := make([]int, n)
	for i := range head {
		head[i] = -1
	}
	for j := n - 1; j >= 0; j-- {
		if p := parent[j]; p >= 0 {
			next[j] = head[p]
			head[p] = j
		}
	}
	post := make([]int, 0, n)
	stack := make([]int, 0, 64)
	for r := 0; r < n; r++ {
		if parent[r] >= 0 {
			continue
		}
		stack = append(stack, r)
		for len(stack) > 0 {
			top := stack[len(stack)-1]
			if c := head[top]; c >= 0 {
				head[top] = next[c]
				stack = append(stack, c)
				continue
			}
			stack = stack[:len(stack)-1]
			post = append(post, top)
		}
	}
	return post
}

// colCounts returns the number of nonzeros in each column of L (diagonal
// included) by walking each row's subtree of the elimination tree. The cost
// is proportional to the nonzeros of L.
func colCounts(parent []int, rowPtr []int, rowCol []int32) []int {
	n := len(parent)
	cc := make([]int, n)
	mark := make([]int, n)
	for k := 0; k < n; k++ {
		cc[k]++
		mark[k] = k
		for _, jj := range rowCol[rowPtr[k]:rowPtr[k+1]] {
			for j := int(jj); mark[j] != k; j = parent[j] {
				mark[j] = k
				cc[j]++
			}
		}
	}
	return cc
}

// relaxedMerge reports whether a child supernode may be merged into its
// parent (relaxed amalgamation, Ashcraft & Grimes, "The influence of
// relaxed supernode partitions on the multifrontal method", ACM TOMS 15(4),
// 1989): when the merged block of cols columns stays small, or the explicit
// zeros it would store stay a small share of its entries. Larger dense
// blocks run the kernels faster; the thresholds were tuned on 2D
// quadrilateral stiffness matrices.
func relaxedMerge(cols int, zeros float64) bool {
	switch {
	case cols <= 4:
		return true
	case cols <= 16:
		return zeros < 0.5
	case cols <= 48:
		return zeros < 0.1
	}
	return zeros < 0.04
}

// supernodes finds the fundamental supernodes, amalgamates them and builds
// their row structures and the layout of L.
func (s *Symbolic) supernodes(parent []int, cc []int) {
	n := s.n
	nchild := make([]int, n)
	for _, p := range parent {
		if p >= 0 {
			nchild[p]++
		}
	}
	// Fundamental supernodes: j joins j-1 if it is j-1's parent, has no other
	// child and its column is j-1's shortened by one.
	var start []int
	for j := 0; j < n; j++ {
		if j == 0 || parent[j-1] != j || nchild[j] != 1 || cc[j-1] != cc[j]+1 {
			start = append(start, j)
		}
	}
	start = append(start, n)
	ns := len(start) - 1
	colSup := make([]int, n)
	for t := 0; t < ns; t++ {
		for j := start[t]; j < start[t+1]; j++ {
			colSup[j] = t
		}
	}
	type node struct {
		first, cols, rows int
		nz                float64 // true nonzeros in the block
		parent            int
		into              int // supernode this one was merged into, or -1
	}
	nodes := make([]node, ns)
	for t := 0; t < ns; t++ {
		f, l := start[t], start[t+1]
		nd := node{first: f, cols: l - f, rows: cc[f], parent: -1, into: -1}
		for j := f; j < l; j++ {
			nd.nz += float64(cc[j])
		}
		if p := parent[l-1]; p >= 0 {
			nd.parent = colSup[p]
		}
		nodes[t] = nd
	}
	find := func(t int) int {
		for nodes[t].into >= 0 {
			t = nodes[t].into
		}
		return t
	}
	for t := 0; t < ns; t++ {
		c := &nodes[t]
		if c.parent < 0 {
			continue
		}
		pt := find(c.parent)
		p := &nodes[pt]
		if c.first+c.cols != p.first {
			continue
		}
		k := c.cols + p.cols
		r := c.cols + p.rows
		stored := float64(k)*float64(r) - float64(k)*float64(k-1)/2
		z := 1 - (c.nz+p.nz)/stored
		if !relaxedMerge(k, z) {
			continue
		}
		p.first, p.cols, p.rows, p.nz = c.first, k, r, c.nz+p.nz
		c.into = pt
	}
	// Renumber the surviving supernodes in column order.
	id := make([]int, ns)
	s.super = s.super[:0]
	for t := 0; t < ns; t++ {
		if nodes[t].into < 0 {
			id[t] = len(s.super)
			s.super = append(s.super, nodes[t].first)
		}
	}
	s.nsuper = len(s.super)
	s.super = append(s.super, n)
	s.parent = make([]int, s.nsuper)
	for t := 0; t < ns; t++ {
		if nodes[t].into < 0 {
			p := -1
			if nodes[t].parent >= 0 {
				p = id[find(nodes[t].parent)]
			}
			s.parent[id[t]] = p
		}
	}
	s.children()
	s.structure()
}

// children builds the child lists of the supernodal tree, ascending.
func (s *Symbolic) children() {
	s.childPtr = make([]int, s.nsuper+1)
	for _, p := range s.parent {
		if p >= 0 {
			s.childPtr[p+1]++
		}
	}
	for t := 0; t < s.nsuper; t++ {
		s.childPtr[t+1] += s.childPtr[t]
	}
	s.child = make([]int, s.childPtr[s.nsuper])
	next := slices.Clone(s.childPtr[:s.nsuper])
	for t, p := range s.parent {
		if p >= 0 {
			s.child[next[p]] = t
			next[p]++
		}
	}
}

// structure computes each supernode's rows: its columns, then the rows of C
// and of its children's structures below them.
func (s *Symbolic) structure() {
	n := s.n
	mark := make([]int, n)
	for i := range mark {
		mark[i] = -1
	}
	s.rowPtr = make([]int, s.nsuper+1)
	s.lPtr = make([]int, s.nsuper+1)
	s.work = make([]float64, s.nsuper)
	s.rows = s.rows[:0]
	var below []int32
	for t := 0; t < s.nsuper; t++ {
		f, l := s.super[t], s.super[t+1]
		below = below[:0]
		for j := f; j < l; j++ {
			mark[j] = t
		}
		for j := f; j < l; j++ {
			for _, i := range s.cRow[s.cPtr[j]:s.cPtr[j+1]] {
				if mark[i] != t {
					mark[i] = t
					below = append(below, i)
				}
			}
		}
		for _, c := range s.child[s.childPtr[t]:s.childPtr[t+1]] {
			k := s.super[c+1] - s.super[c]
			for _, i := range s.rows[s.rowPtr[c]+k : s.rowPtr[c+1]] {
				if mark[i] != t {
					mark[i] = t
					below = append(below, i)
				}
			}
		}
		slices.Sort(below)
		for j := f; j < l; j++ {
			s.rows = append(s.rows, int32(j))
		}
		s.rows = append(s.rows, below...)
		s.rowPtr[t+1] = len(s.rows)
		k, r := l-f, len(below)+l-f
		s.lPtr[t+1] = s.lPtr[t] + k*r
		fk, fu := float64(k), float64(r-k)
		s.work[t] = fk*fk*fk/3 + fu*fk*fk + fu*fu*fk + 4*float64(r)*float64(r)
	}
	s.rows = slices.Clip(s.rows)
}

// N returns the dimension of the analysed matrix.
func (s *Symbolic) N() int { return s.n }

// FactorNNZ returns the number of nonzeros of L (lower triangle, diagonal
// included) for the exact pattern; explicit zeros added by supernode
// amalgamation are not counted (StoredNNZ counts them).
func (s *Symbolic) FactorNNZ() int { return s.lnz }

// StoredNNZ returns the number of entries that the supernodal factor
// stores, explicit zeros of amalgamated supernodes included.
func (s *Symbolic) StoredNNZ() int {
	var t int
	for k := 0; k < s.nsuper; k++ {
		c := s.super[k+1] - s.super[k]
		t += s.lPtr[k+1] - s.lPtr[k] - c*(c-1)/2
	}
	return t
}

// FactorFlops returns the floating-point operations of one numeric
// factorization of the exact pattern: Σ c_j² over the column counts c_j of
// L (a square root, divisions and the multiply-adds of each column).
func (s *Symbolic) FactorFlops() float64 { return s.flops }

// Supernodes returns the number of supernodes after amalgamation.
func (s *Symbolic) Supernodes() int { return s.nsuper }

// Ordering returns the ordering that Analyze was asked for.
func (s *Symbolic) Ordering() Ordering { return s.ord }

// Perm returns a copy of the permutation: Perm()[k] is the original index of
// the k-th pivot.
func (s *Symbolic) Perm() []int { return slices.Clone(s.perm) }

func validPerm(p []int, n int) bool {
	if len(p) != n {
		return false
	}
	seen := make([]bool, n)
	for _, i := range p {
		if i < 0 || i >= n || seen[i] {
			return false
		}
		seen[i] = true
	}
	return true
}
