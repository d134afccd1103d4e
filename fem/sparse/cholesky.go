package sparse

// This file is longer than most: the supernodal factorization and its
// triangular solves work on one storage layout and are kept beside it.

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
)

// PivotTolerance is the smallest accepted pivot relative to the original
// diagonal entry of its row. The pivot d_j of column j is what is left of
// a_jj once the earlier columns are eliminated; d_j/a_jj near zero means
// column j is nearly a combination of earlier ones: a stiffness with a
// rigid-body mode left free, or a node that no element reaches. Such a pivot
// is made of rounding errors, about ε = 2.2e-16 times the growth of the
// elimination; a floating block of Q8 elements gives d_j/a_jj between 4e-13
// and 1.5e-12 (the tests' case, depending on the ordering). A supported
// structure keeps far larger ratios even when slender: a Q8 cantilever one
// element thick and 400 long keeps d_j/a_jj ≥ 3e-9. 1e-11 lies between with
// an order of magnitude to spare on the singular side and more on the other;
// a pivot below it would leave the solution with fewer than five
// significant digits anyway.
const PivotTolerance = 1e-11

// NotPositiveDefiniteError reports a pivot that is not positive in the
// sense of PivotTolerance, or not finite.
type NotPositiveDefiniteError struct {
	Index int     // original row/column of the failing pivot
	Pivot float64 // its value
}

func (e *NotPositiveDefiniteError) Error() string {
	return fmt.Sprintf("sparse: matrix not positive definite: pivot %g at row/column %d", e.Pivot, e.Index)
}

var (
	errNoFactor    = errors.New("sparse: no valid factorization")
	errNotAnalysed = errors.New("sparse: matrix pattern differs from the analysed one")
)

// Cholesky holds a numeric factorization P A Pᵀ = L Lᵀ. The zero value is
// ready to use; Factorize reuses its memory across calls on the same
// Symbolic. A Cholesky must not be factorized while it is used to solve;
// solves may run concurrently with each other.
type Cholesky struct {
	sym     *Symbolic
	workers int
	lx      []float64
	valid   bool
	plan    *plan
	ws      []*workspace
	upd     [][]float64 // update matrices that outlive a worker's stack

	solvePool *sync.Pool // of *solveSpace
}

// plan assigns independent subtrees of the supernodal tree to workers; the
// supernodes above them (the top) are done afterwards with all workers
// sharing each dense update.
type plan struct {
	workers  int
	subtrees [][]int // subtree roots of each worker, ascending
	top      []int   // ascending
	first    []int   // first (lowest) supernode of each subtree
	persist  []bool  // update matrix kept in Cholesky.upd
	stack    []int   // stack size each worker needs
}

type workspace struct {
	rel   []int32 // position of a global row in the current front
	idx   []int32 // positions of a child's rows in the current front
	tol   []float64
	stack []float64
	kids  [][]float64
	fail  failure
}

type failure struct {
	col   int // permuted column, -1 if none
	pivot float64
}

// SetWorkers sets how many goroutines Factorize and the solves may use;
// n ≤ 0 means runtime.GOMAXPROCS(0). The factor and the solutions do not
// depend on it, bit for bit.
func (c *Cholesky) SetWorkers(n int) {
	c.workers = max(0, n)
}

func (c *Cholesky) numWorkers() int {
	if c.workers > 0 {
		return c.workers
	}
	return max(1, runtime.GOMAXPROCS(0))
}

// Factorize computes the numeric factorization of m, whose pattern must be
// the one analysed by s. A pivot d with d ≤ PivotTolerance·|a_jj|, or not
// finite, stops it with a *NotPositiveDefiniteError naming the original
// index; the factor is then invalid and solves return an error.
func (c *Cholesky) Factorize(s *Symbolic, m *Matrix) error {
	c.valid = false
	if s == nil || m == nil {
		return errors.New("sparse: Factorize: nil argument")
	}
	if !m.samePattern(s.pattern) {
		return fmt.Errorf("sparse: Factorize: %w", errNotAnalysed)
	}
	c.prepare(s)
	p := c.plan
	var wg sync.WaitGroup
	for w := range p.workers {
		c.ws[w].fail = failure{col: -1}
		if len(p.subtrees[w]) == 0 {
			continue
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			c.runSubtrees(c.ws[w], m, p.subtrees[w])
		}()
	}
	wg.Wait()
	// Report what a sequential elimination in column order would: the
	// lowest failing column. Subtrees are independent, so that is the lowest
	// over the workers, unless a top supernode left of it fails first (its
	// descendants lie further left, so they all succeeded).
	fail := failure{col: -1}
	for _, ws := range c.ws {
		if ws.fail.col >= 0 && (fail.col < 0 || ws.fail.col < fail.col) {
			fail = ws.fail
		}
	}
	ws := c.ws[0]
	for _, t := range p.top {
		if fail.col >= 0 && s.super[t] > fail.col {
			break
		}
		kids := ws.kids[:0]
		for _, ch := range s.child[s.childPtr[t]:s.childPtr[t+1]] {
			kids = append(kids, c.upd[ch])
		}
		ws.kids = kids
		if col, d := c.front(ws, m, t, c.upd[t], kids, p.workers); col >= 0 {
			fail = failure{col, d}
			break
		}
	}
	if fail.col >= 0 {
		return &NotPositiveDefiniteError{Index: s.perm[fail.col], Pivot: fail.pivot}
	}
	c.valid = true
	return nil
}

// runSubtrees factors the given subtrees, children's update matrices kept
// on the worker's stack. It stops at the first failing pivot.
func (c *Cholesky) runSubtrees(ws *workspace, m *Matrix, roots []int) {
	s, p := c.sym, c.plan
	for _, root := range roots {
		top := 0
		for t := p.first[root]; t <= root; t++ {
			base := top
			kids := ws.kids[:0]
			for _, ch := range s.child[s.childPtr[t]:s.childPtr[t+1]] {
				base -= s.updateSize(ch)
			}
			off := base
			for _, ch := range s.child[s.childPtr[t]:s.childPtr[t+1]] {
				sz := s.updateSize(ch)
				kids = append(kids, ws.stack[off:off+sz])
				off += sz
			}
			ws.kids = kids
			sz := s.updateSize(t)
			var ud []float64
			if t == root {
				ud = c.upd[t]
			} else {
				ud = ws.stack[top : top+sz]
			}
			if col, d := c.front(ws, m, t, ud, kids, 1); col >= 0 {
				ws.fail = failure{col, d}
				return
			}
			if t == root {
				top = base
				continue
			}
			copy(ws.stack[base:], ud)
			top = base + sz
		}
	}
}

// updateSize returns the length of supernode t's update matrix.
func (s *Symbolic) updateSize(t int) int {
	nu := s.rowPtr[t+1] - s.rowPtr[t] - (s.super[t+1] - s.super[t])
	return nu * nu
}

// prepare sets up the plan and memory for s and the current worker count.
func (c *Cholesky) prepare(s *Symbolic) {
	w := c.numWorkers()
	if c.sym == s && c.plan != nil && c.plan.workers == w {
		return
	}
	if c.sym != s || len(c.lx) != s.lPtr[s.nsuper] {
		c.lx = make([]float64, s.lPtr[s.nsuper])
	}
	if c.sym != s {
		c.solvePool = newSolvePool(s)
	}
	c.sym = s
	c.plan = s.newPlan(w)
	maxRows := 0
	for t := 0; t < s.nsuper; t++ {
		maxRows = max(maxRows, s.rowPtr[t+1]-s.rowPtr[t])
	}
	c.ws = make([]*workspace, w)
	for i := range c.ws {
		c.ws[i] = &workspace{
			rel:   make([]int32, s.n),
			idx:   make([]int32, maxRows),
			tol:   make([]float64, maxRows),
			stack: make([]float64, c.plan.stack[i]),
		}
	}
	c.upd = make([][]float64, s.nsuper)
	for t, keep := range c.plan.persist {
		if keep {
			c.upd[t] = make([]float64, s.updateSize(t))
		}
	}
}

// newPlan splits the supernodal tree among w workers: starting from the
// roots, the heaviest subtree is moved to the top while the subtrees cannot
// be packed into w bins of nearly equal work (Geist & Ng, "Task scheduling
// for parallel sparse Cholesky factorization", Int. J. Parallel Prog. 18(4),
// 1989).
func (s *Symbolic) newPlan(w int) *plan {
	ns := s.nsuper
	p := &plan{workers: w, subtrees: make([][]int, w), first: make([]int, ns), persist: make([]bool, ns), stack: make([]int, w)}
	sub := make([]float64, ns)
	for t := 0; t < ns; t++ {
		p.first[t] = t
		sub[t] += s.work[t]
		for _, ch := range s.child[s.childPtr[t]:s.childPtr[t+1]] {
			p.first[t] = min(p.first[t], p.first[ch])
			sub[t] += sub[ch]
		}
	}
	var cands []int
	for t := 0; t < ns; t++ {
		if s.parent[t] < 0 {
			cands = append(cands, t)
		}
	}
	bins := make([]float64, w)
	owner := make([]int, ns)
	assign := func() float64 {
		var total float64
		for _, t := range cands {
			total += sub[t]
		}
		return packLargestFirst(cands, sub, bins, owner) / (total / float64(w))
	}
	for len(cands) > 0 && w > 1 {
		if assign() < 1.05 {
			break
		}
		h := cands[0]
		if s.childPtr[h] == s.childPtr[h+1] || len(p.top) > 4*ns/5 {
			break
		}
		cands = append(cands[1:], s.child[s.childPtr[h]:s.childPtr[h+1]]...)
		p.top = append(p.top, h)
	}
	assign()
	for _, t := range cands {
		p.subtrees[owner[t]] = append(p.subtrees[owner[t]], t)
	}
	slices.Sort(p.top)
	for _, t := range p.top {
		p.persist[t] = true
	}
	for b, roots := range p.subtrees {
		slices.Sort(roots)
		size := 0
		for _, root := range roots {
			p.persist[root] = true
			size = max(size, s.stackNeed(p.first[root], root))
		}
		p.stack[b] = size
	}
	for t := range p.persist {
		p.persist[t] = p.persist[t] && s.updateSize(t) > 0
	}
	return p
}

// stackNeed returns the stack length that runSubtrees uses for the subtree
// of supernodes first…root.
func (s *Symbolic) stackNeed(first, root int) int {
	top, peak := 0, 0
	for t := first; t < root; t++ {
		sz := s.updateSize(t)
		peak = max(peak, top+sz) // written above the children, then moved down
		for _, ch := range s.child[s.childPtr[t]:s.childPtr[t+1]] {
			top -= s.updateSize(ch)
		}
		top += sz
	}
	return peak
}

// Panel width of the blocked factorization of a front's pivot columns.
const panelWidth = 32

// front assembles and partially factors supernode t: its pivot block goes
// to L, its Schur complement to ud (lower triangle, row-major nu×nu). It
// returns the permuted column and value of a failing pivot, or -1.
func (c *Cholesky) front(ws *workspace, m *Matrix, t int, ud []float64, kids [][]float64, par int) (int, float64) {
	s := c.sym
	f, l := s.super[t], s.super[t+1]
	k := l - f
	rows := s.rows[s.rowPtr[t]:s.rowPtr[t+1]]
	r := len(rows)
	nu := r - k
	L := c.lx[s.lPtr[t]:s.lPtr[t+1]]
	clear(L)
	for a := 0; a < nu; a++ {
		clear(ud[a*nu : a*nu+a+1])
	}
	rel := ws.rel
	for a, i := range rows {
		rel[i] = int32(a)
	}
	for j := f; j < l; j++ {
		col := j - f
		for p := s.cPtr[j]; p < s.cPtr[j+1]; p++ {
			L[int(rel[s.cRow[p]])*k+col] += m.val[s.cSrc[p]]
		}
		ws.tol[col] = PivotTolerance * math.Abs(m.val[s.cSrc[s.cPtr[j]]])
	}
	for ci, cu := range kids {
		ch := s.child[s.childPtr[t]+ci]
		c.extendAdd(ws, t, ch, cu, L, ud)
	}
	for j0 := 0; j0 < k; j0 += panelWidth {
		j1 := min(j0+panelWidth, k)
		w := j1 - j0
		if j0 > 0 {
			if par > 1 {
				parallelRange(par, j0, r, float64(w*j0), func(i0, i1 int) {
					gemmNT(i1-i0, w, j0, L[i0*k:], k, L[j0*k:], k, L[i0*k+j0:], k)
				})
			} else {
				gemmNT(r-j0, w, j0, L[j0*k:], k, L[j0*k:], k, L[j0*k+j0:], k)
			}
		}
		if bad, d := cholDiag(w, L[j0*k+j0:], k, ws.tol[j0:j1]); bad >= 0 {
			return f + j0 + bad, d
		}
		if par > 1 {
			parallelRange(par, j1, r, float64(w*w), func(i0, i1 int) {
				trsmRows(i0, i1, w, L[j0*k+j0:], k, L[j0:], k)
			})
		} else {
			trsmRows(j1, r, w, L[j0*k+j0:], k, L[j0:], k)
		}
	}
	for i := 0; i < k; i++ {
		clear(L[i*k+i+1 : (i+1)*k])
	}
	switch {
	case nu == 0:
	case par > 1:
		parallelTriangle(par, nu, float64(k), func(i0, i1 int) {
			syrkLowerRows(i0, i1, k, L[k*k:], k, ud, nu)
		})
	default:
		syrkLowerRows(0, nu, k, L[k*k:], k, ud, nu)
	}
	return -1, 0
}

// extendAdd adds child ch's update matrix cu into the front of t: rows that
// are pivot columns of t go to L (row-major r×k), the others to ud.
func (c *Cholesky) extendAdd(ws *workspace, t, ch int, cu, L, ud []float64) {
	s := c.sym
	k := s.super[t+1] - s.super[t]
	nu := s.rowPtr[t+1] - s.rowPtr[t] - k
	kc := s.super[ch+1] - s.super[ch]
	crow := s.rows[s.rowPtr[ch]+kc : s.rowPtr[ch+1]]
	nc := len(crow)
	idx := ws.idx[:nc]
	split := nc
	for a, i := range crow {
		idx[a] = ws.rel[i]
		if split == nc && int(idx[a]) >= k {
			split = a
		}
	}
	for a := 0; a < nc; a++ {
		ra := int(idx[a])
		src := cu[a*nc : a*nc+a+1]
		nl := min(split, a+1)
		dl := L[ra*k : ra*k+k]
		for b, v := range src[:nl] {
			dl[idx[b]] += v
		}
		if nl <= a {
			du := ud[(ra-k)*nu : (ra-k)*nu+nu]
			for b := nl; b <= a; b++ {
				du[int(idx[b])-k] += src[b]
			}
		}
	}
}

// minParallel is the least work (in multiply-adds) worth splitting.
const minParallel = 1 << 16

// parallelRange runs fn over [lo, hi) split into par bands of rows, each row
// costing about perRow; small jobs run on the calling goroutine.
func parallelRange(par, lo, hi int, perRow float64, fn func(i0, i1 int)) {
	if hi <= lo {
		return
	}
	if par <= 1 || float64(hi-lo)*perRow < minParallel || hi-lo < 2*par {
		fn(lo, hi)
		return
	}
	var wg sync.WaitGroup
	for b := range par {
		i0 := lo + (hi-lo)*b/par
		i1 := lo + (hi-lo)*(b+1)/par
		wg.Add(1)
		go func() {
			defer wg.Done()
			fn(i0, i1)
		}()
	}
	wg.Wait()
}

// parallelTriangle runs fn over the rows of an n×n lower triangle, split
// into par bands of equal area.
func parallelTriangle(par, n int, depth float64, fn func(i0, i1 int)) {
	if par <= 1 || float64(n)*float64(n)*depth/2 < minParallel || n < 4*par {
		fn(0, n)
		return
	}
	var wg sync.WaitGroup
	prev := 0
	for b := range par {
		next := n
		if b < par-1 {
			next = int(float64(n) * math.Sqrt(float64(b+1)/float64(par)))
		}
		i0, i1 := prev, next
		prev = next
		wg.Add(1)
		go func() {
			defer wg.Done()
			fn(i0, i1)
		}()
	}
	wg.Wait()
}

// LogDet returns the natural logarithm of the determinant of A, or NaN
// without a valid factorization.
func (c *Cholesky) LogDet() float64 {
	if !c.valid {
		return math.NaN()
	}
	s := c.sym
	var d float64
	for t := 0; t < s.nsuper; t++ {
		k := s.super[t+1] - s.super[t]
		L := c.lx[s.lPtr[t]:]
		for j := 0; j < k; j++ {
			d += 2 * math.Log(L[j*k+j])
		}
	}
	return d
}

// bytes returns the memory held by the factorization: the factor, the
// update matrices and the workers' stacks and maps.
func (c *Cholesky) bytes() int {
	t := 8 * len(c.lx)
	for _, u := range c.upd {
		t += 8 * len(u)
	}
	for _, ws := range c.ws {
		t += 8*len(ws.stack) + 4*len(ws.rel) + 4*len(ws.idx) + 8*len(ws.tol)
	}
	return t
}
