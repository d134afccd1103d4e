package sparse

import (
	"fmt"
	"math"
	"slices"
	"sync"
	"sync/atomic"
)

// The triangular solves, L y = P b and Lᵀ Pᵀ x = y, read every entry of the
// factor once per pass and do two flops with it: they are bound by memory
// traffic and by the latency of running sums, not by arithmetic. Two things
// make them cheaper:
//
//   - The supernodal tree is split into parts of independent subtrees and
//     the top above them (solvePlan). The parts are solved on separate
//     goroutines; what a part adds to a top row goes to a buffer of the part,
//     and the buffers are added in part order. The split depends on the
//     Symbolic alone, so each solve does the same arithmetic in the same
//     order for any number of workers: the result is the same bit for bit.
//   - Cholesky32 keeps a copy of the factor rounded to float32 for use as a
//     preconditioner: half the bytes to read. Sums are kept in float64.

// solveParts is the number of parts the solves split the tree into. It is
// fixed, not the number of workers, so that the arithmetic does not depend
// on the workers; two suit the two-core machines the tool is made for, and
// more parts would put more of the factor into the top, which is serial.
const solveParts = 2

// minParallelSolve is the least number of factor entries for which the
// solves start goroutines.
const minParallelSolve = 1 << 16

// solvePlan is the split of the supernodal tree for the solves.
type solvePlan struct {
	parts   [][]int // subtree roots of each part, ascending
	top     []int   // supernodes above the parts, ascending
	first   []int   // first (lowest) supernode of the subtree of each root
	topCols []int   // columns of the top supernodes, ascending
	// For a supernode t in a part, its rows below its own columns are
	// rows[rowPtr[t]+k : rowPtr[t]+k+split[t]] inside the part and, past
	// them, rows of the top, whose positions in topCols are in topRow
	// (aligned with Symbolic.rows). For a top supernode split[t] is the
	// number of its rows below its columns.
	split   []int
	topRow  []int32
	entries int // stored entries of L
}

// newSolvePlan splits the tree into parts of nearly equal work (stored
// entries of L) below a top. Starting from the roots, the heaviest subtree
// is moved to the top as long as that can shorten the estimated time of a
// solve on parts workers, the top's work plus that of the largest part; the
// best split seen is kept. The parts are packed by the largest-first rule.
func (s *Symbolic) newSolvePlan(parts int) *solvePlan {
	ns := s.nsuper
	cost := make([]float64, ns)
	sub := make([]float64, ns)
	sp := &solvePlan{parts: make([][]int, parts), first: make([]int, ns), split: make([]int, ns), entries: s.lPtr[ns]}
	for t := 0; t < ns; t++ {
		cost[t] = float64(s.lPtr[t+1] - s.lPtr[t])
		sub[t] += cost[t]
		sp.first[t] = t
		for _, ch := range s.child[s.childPtr[t]:s.childPtr[t+1]] {
			sp.first[t] = min(sp.first[t], sp.first[ch])
			sub[t] += sub[ch]
		}
	}
	var cands, top []int
	for t := 0; t < ns; t++ {
		if s.parent[t] < 0 {
			cands = append(cands, t)
		}
	}
	owner := make([]int, ns)
	bins := make([]float64, parts)
	best := math.Inf(1)
	var bestCands, bestTop []int
	topCost := 0.0
	for len(cands) > 0 && topCost < best {
		if t := topCost + packLargestFirst(cands, sub, bins, owner); t < best {
			best = t
			bestCands, bestTop = slices.Clone(cands), slices.Clone(top)
		}
		h := cands[0] // the heaviest, after packing
		if s.childPtr[h] == s.childPtr[h+1] {
			break
		}
		cands = append(cands[1:], s.child[s.childPtr[h]:s.childPtr[h+1]]...)
		top = append(top, h)
		topCost += cost[h]
	}
	packLargestFirst(bestCands, sub, bins, owner)
	for _, t := range bestCands {
		sp.parts[owner[t]] = append(sp.parts[owner[t]], t)
	}
	for _, roots := range sp.parts {
		slices.Sort(roots)
	}
	sp.top = bestTop
	slices.Sort(sp.top)
	topIdx := make([]int32, s.n)
	for i := range topIdx {
		topIdx[i] = -1
	}
	for _, t := range sp.top {
		for j := s.super[t]; j < s.super[t+1]; j++ {
			topIdx[j] = int32(len(sp.topCols))
			sp.topCols = append(sp.topCols, j)
		}
	}
	sp.topRow = make([]int32, len(s.rows))
	for t := 0; t < ns; t++ {
		k := s.super[t+1] - s.super[t]
		for q := s.rowPtr[t] + k; q < s.rowPtr[t+1]; q++ {
			if topIdx[s.rows[q]] < 0 {
				sp.split[t]++
			}
			sp.topRow[q] = topIdx[s.rows[q]]
		}
	}
	return sp
}

// packLargestFirst sorts cands by decreasing subtree work (ties by index),
// assigns each to the least loaded of len(bins) bins in that order (Graham's
// largest-processing-time rule), records the bin in owner and returns the
// largest bin's work.
func packLargestFirst(cands []int, sub, bins []float64, owner []int) float64 {
	slices.SortFunc(cands, func(a, b int) int {
		if sub[a] != sub[b] {
			if sub[a] > sub[b] {
				return -1
			}
			return 1
		}
		return a - b
	})
	clear(bins)
	for _, t := range cands {
		b := 0
		for i := range bins {
			if bins[i] < bins[b] {
				b = i
			}
		}
		bins[b] += sub[t]
		owner[t] = b
	}
	return slices.Max(bins)
}

// solveSpace is the scratch memory of one solve.
type solveSpace struct {
	y   []float64 // the permuted solution
	buf []float64 // each part's sums for the top rows
}

func newSolvePool(s *Symbolic) *sync.Pool {
	n, nt := s.n, len(s.solve.topCols)
	return &sync.Pool{New: func() any {
		return &solveSpace{y: make([]float64, n), buf: make([]float64, solveParts*nt)}
	}}
}

// factorView is a factor's values (float64 or float32) with its analysis.
type factorView[F float32 | float64] struct {
	s  *Symbolic
	lx []F
}

// solve computes dst = A⁻¹ b through y = L⁻¹ P b and x = Pᵀ L⁻ᵀ y, with the
// parts of the solve plan on up to workers goroutines. dst may alias b.
func (v factorView[F]) solve(dst, b []float64, ws *solveSpace, workers int) {
	_ = v.solveSplit(dst, b, ws, workers, nil) // no inner step, no error
}

// solveSplit is solve with inner, if not nil, applied to the trailing
// equations' part of the forward solution before the backward solve; b
// nil stands for a right-hand side that is zero but for the trailing
// equations, which inner sets.
func (v factorView[F]) solveSplit(dst, b []float64, ws *solveSpace, workers int, inner func([]float64) error) error {
	s, sp := v.s, v.s.solve
	if sp.entries < minParallelSolve {
		workers = 1
	}
	y := ws.y
	if b == nil {
		clear(y)
	} else {
		if workers > 1 {
			runParts(workers, len(sp.parts), func(p int) { v.forwardPart(p, b, ws) })
		} else {
			for p := range sp.parts { // no closure: a serial solve allocates nothing
				v.forwardPart(p, b, ws)
			}
		}
		nt := len(sp.topCols)
		for _, i := range sp.topCols {
			y[i] = b[s.perm[i]]
		}
		for p := range sp.parts { // the buffers hold −Σ L_ij y_j
			for q, i := range sp.topCols {
				y[i] += ws.buf[p*nt+q]
			}
		}
		for _, t := range sp.top {
			x, B, below := v.forwardSupernode(t, y)
			subtractRows(y, below, B, x)
		}
	}
	if inner != nil {
		if err := inner(y[s.n-s.trailing : s.n]); err != nil {
			return err
		}
	}
	for _, t := range slices.Backward(sp.top) {
		v.backwardSupernode(t, y)
	}
	if workers > 1 {
		runParts(workers, len(sp.parts), func(p int) { v.backwardPart(p, dst, y) })
	} else {
		for p := range sp.parts {
			v.backwardPart(p, dst, y)
		}
	}
	for _, i := range sp.topCols {
		dst[s.perm[i]] = y[i]
	}
	return nil
}

// forwardPart gathers b into the columns of part p and eliminates them; the
// part's updates of top rows are summed in its buffer.
func (v factorView[F]) forwardPart(p int, b []float64, ws *solveSpace) {
	s, sp := v.s, v.s.solve
	y := ws.y
	nt := len(sp.topCols)
	buf := ws.buf[p*nt : (p+1)*nt]
	clear(buf)
	for _, root := range sp.parts[p] {
		lo, hi := s.super[sp.first[root]], s.super[root+1]
		for i := lo; i < hi; i++ {
			y[i] = b[s.perm[i]]
		}
		for t := sp.first[root]; t <= root; t++ {
			x, B, below := v.forwardSupernode(t, y)
			m, k := sp.split[t], len(x)
			subtractRows(y, below[:m], B[:m*k], x)
			q := s.rowPtr[t] + k + m
			subtractRows(buf, sp.topRow[q:s.rowPtr[t+1]], B[m*k:], x)
		}
	}
}

// backwardPart solves the columns of part p, whose top rows are final, and
// scatters them into dst.
func (v factorView[F]) backwardPart(p int, dst, y []float64) {
	s, sp := v.s, v.s.solve
	for _, root := range slices.Backward(sp.parts[p]) {
		for t := root; t >= sp.first[root]; t-- {
			v.backwardSupernode(t, y)
		}
		for i := s.super[sp.first[root]]; i < s.super[root+1]; i++ {
			dst[s.perm[i]] = y[i]
		}
	}
}

// forwardSupernode solves the diagonal block of supernode t in place in y
// and returns its solved values, its block below the diagonal and the rows
// of that block.
func (v factorView[F]) forwardSupernode(t int, y []float64) ([]float64, []F, []int32) {
	s := v.s
	f, l := s.super[t], s.super[t+1]
	k := l - f
	L := v.lx[s.lPtr[t]:s.lPtr[t+1]]
	x := y[f:l]
	for j := range x {
		rj := L[j*k : j*k+j+1]
		x[j] = (x[j] - dotRow(rj[:j], x[:j])) / float64(rj[j])
	}
	return x, L[k*k:], s.rows[s.rowPtr[t]+k : s.rowPtr[t+1]]
}

// backwardSupernode does x_t = L_ttᵀ⁻¹ (y_t − L_btᵀ y_b) in place in y.
func (v factorView[F]) backwardSupernode(t int, y []float64) {
	s := v.s
	f, l := s.super[t], s.super[t+1]
	k := l - f
	L := v.lx[s.lPtr[t]:s.lPtr[t+1]]
	x := y[f:l]
	subtractColumns(x, L[k*k:], s.rows[s.rowPtr[t]+k:s.rowPtr[t+1]], y)
	for j := k - 1; j >= 0; j-- {
		rj := L[j*k : j*k+j+1]
		x[j] /= float64(rj[j])
		xj := x[j]
		for p, lv := range rj[:j] {
			x[p] -= float64(lv) * xj
		}
	}
}

// runParts calls fn for the parts 0…n-1 on up to workers goroutines (the
// calling one included). Parts share no memory they write, so which
// goroutine runs a part does not matter.
func runParts(workers, n int, fn func(p int)) {
	if workers <= 1 || n <= 1 {
		for p := range n {
			fn(p)
		}
		return
	}
	var next atomic.Int64
	loop := func() {
		for p := int(next.Add(1) - 1); p < n; p = int(next.Add(1) - 1) {
			fn(p)
		}
	}
	var wg sync.WaitGroup
	for range min(workers, n) - 1 {
		wg.Go(loop)
	}
	loop()
	wg.Wait()
}

// dotRow returns Σ a[p]·x[p] with four running sums: the solves are bound by
// the latency of the additions, not by their number.
func dotRow[F float32 | float64](a []F, x []float64) float64 {
	x = x[:len(a)]
	var s0, s1, s2, s3 float64
	p := 0
	for ; p+4 <= len(a); p += 4 {
		s0 += float64(a[p]) * x[p]
		s1 += float64(a[p+1]) * x[p+1]
		s2 += float64(a[p+2]) * x[p+2]
		s3 += float64(a[p+3]) * x[p+3]
	}
	for ; p < len(a); p++ {
		s0 += float64(a[p]) * x[p]
	}
	return (s0 + s1) + (s2 + s3)
}

// subtractRows does y[rows[a]] −= B[a,:]·x for the row-major block B
// (len(rows)×len(x)), four rows at a time: one running sum per row.
func subtractRows[F float32 | float64](y []float64, rows []int32, B []F, x []float64) {
	k := len(x)
	a := 0
	for ; a+4 <= len(rows); a += 4 {
		r0 := B[a*k : a*k+k]
		r1 := B[(a+1)*k:][:k]
		r2 := B[(a+2)*k:][:k]
		r3 := B[(a+3)*k:][:k]
		var s0, s1, s2, s3 float64
		for j, v := range x {
			s0 += float64(r0[j]) * v
			s1 += float64(r1[j]) * v
			s2 += float64(r2[j]) * v
			s3 += float64(r3[j]) * v
		}
		y[rows[a]] -= s0
		y[rows[a+1]] -= s1
		y[rows[a+2]] -= s2
		y[rows[a+3]] -= s3
	}
	for ; a < len(rows); a++ {
		y[rows[a]] -= dotRow(B[a*k:a*k+k], x)
	}
}

// subtractColumns does x −= Bᵀ·y[rows] for the row-major block B
// (len(rows)×len(x)), four rows at a time so that x is read and written
// once per four.
func subtractColumns[F float32 | float64](x []float64, B []F, rows []int32, y []float64) {
	k := len(x)
	a := 0
	for ; a+4 <= len(rows); a += 4 {
		r0 := B[a*k : a*k+k]
		r1 := B[(a+1)*k:][:k]
		r2 := B[(a+2)*k:][:k]
		r3 := B[(a+3)*k:][:k]
		y0, y1, y2, y3 := y[rows[a]], y[rows[a+1]], y[rows[a+2]], y[rows[a+3]]
		for j := range x {
			x[j] -= float64(r0[j])*y0 + float64(r1[j])*y1 + float64(r2[j])*y2 + float64(r3[j])*y3
		}
	}
	for ; a < len(rows); a++ {
		ya := y[rows[a]]
		ra := B[a*k : a*k+k]
		for j := range x {
			x[j] -= float64(ra[j]) * ya
		}
	}
}

// SolveVecTo solves A x = b for x, stored in dst. dst may alias b. It runs
// on up to SetWorkers goroutines; the result is the same bit for bit for
// any number of them.
func (c *Cholesky) SolveVecTo(dst, b []float64) error {
	return pooledSolve("SolveVecTo", c.valid, factorView[float64]{c.sym, c.lx}, c.solvePool, c.numWorkers(), dst, b, false, nil)
}

// pooledSolve checks the arguments of a solve with the factor v and runs
// it on a workspace from pool. inner, if set, needs trailing equations
// (AnalyzeLast); so does a right-hand side that is zero outside them
// (trailingOnly: b is not read, see SolveTrailingTo).
func pooledSolve[F float32 | float64](op string, valid bool, v factorView[F], pool *sync.Pool, workers int, dst, b []float64, trailingOnly bool, inner func([]float64) error) error {
	if !valid {
		return fmt.Errorf("sparse: %s: %w", op, errNoFactor)
	}
	n := v.s.n
	if len(dst) != n || (!trailingOnly && len(b) != n) {
		return fmt.Errorf("sparse: %s: len(dst) = %d, len(b) = %d, want %d: %w", op, len(dst), len(b), n, errLength)
	}
	if (inner != nil || trailingOnly) && v.s.trailing == 0 {
		return fmt.Errorf("sparse: %s: %w", op, errTrailing)
	}
	if trailingOnly {
		b = nil
	}
	ws := pool.Get().(*solveSpace)
	defer pool.Put(ws)
	return v.solveSplit(dst, b, ws, workers, inner)
}

// SolveTo solves A X = B for k right-hand sides; b and dst are n×k,
// column-major (column j is b[j*n:(j+1)*n]). dst may alias b. Each column
// gives the same bits as SolveVecTo.
func (c *Cholesky) SolveTo(dst, b []float64, k int) error {
	if !c.valid {
		return fmt.Errorf("sparse: SolveTo: %w", errNoFactor)
	}
	n := c.sym.n
	if k < 0 || len(dst) != n*k || len(b) != n*k {
		return fmt.Errorf("sparse: SolveTo: len(dst) = %d, len(b) = %d, want %d·%d: %w", len(dst), len(b), n, k, errLength)
	}
	ws := c.solvePool.Get().(*solveSpace)
	for j := 0; j < k; j++ {
		factorView[float64]{c.sym, c.lx}.solve(dst[j*n:(j+1)*n], b[j*n:(j+1)*n], ws, c.numWorkers())
	}
	c.solvePool.Put(ws)
	return nil
}

// Cholesky32 is a copy of a factorization with its entries rounded to
// float32, to precondition an iterative solver: its solves read half the
// memory that those of the float64 factor read, and the iteration corrects
// what the rounding loses. As an inverse of A it is good to about κ(A)
// times the unit roundoff of float32, 6e-8, so it is no substitute for the
// direct solve where the solution itself is needed. The zero value is ready
// for Round; solves may run concurrently with each other, not with Round.
type Cholesky32 struct {
	sym     *Symbolic
	workers int
	lx      []float32
	valid   bool
	pool    *sync.Pool
}

// Round sets f to c's factor rounded to float32, reusing f's memory. It
// returns an error if c holds no valid factorization.
func (f *Cholesky32) Round(c *Cholesky) error {
	f.valid = false
	if c == nil || !c.valid {
		return fmt.Errorf("sparse: Cholesky32.Round: %w", errNoFactor)
	}
	if f.sym != c.sym {
		f.sym = c.sym
		f.lx = make([]float32, len(c.lx))
		f.pool = newSolvePool(c.sym)
	}
	w := f.numWorkers()
	if len(c.lx) < minParallelSolve {
		w = 1
	}
	runParts(w, w, func(p int) {
		lo, hi := len(c.lx)*p/w, len(c.lx)*(p+1)/w
		for i, v := range c.lx[lo:hi] {
			f.lx[lo+i] = float32(v)
		}
	})
	f.valid = true
	return nil
}

// SetWorkers sets how many goroutines Round and the solves may use; n ≤ 0
// means runtime.GOMAXPROCS(0). The results do not depend on it, bit for bit.
func (f *Cholesky32) SetWorkers(n int) { f.workers = max(0, n) }

func (f *Cholesky32) numWorkers() int {
	return (&Cholesky{workers: f.workers}).numWorkers()
}

// SolveVecTo solves L̃ L̃ᵀ x = b with the rounded factor L̃ (sums in float64)
// and stores x in dst. dst may alias b.
func (f *Cholesky32) SolveVecTo(dst, b []float64) error {
	return pooledSolve("Cholesky32.SolveVecTo", f.valid, factorView[float32]{f.sym, f.lx}, f.pool, f.numWorkers(), dst, b, false, nil)
}
