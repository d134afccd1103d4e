package sparse

import (
	"errors"
	"fmt"
	"slices"
)

// A factorization whose last pivots are given equations (AnalyzeLast)
// carries, in its trailing block, the Cholesky factor of the Schur
// complement on them: with P A Pᵀ = [A_II A_IC; A_CI A_CC] and L split
// alike, L_CC L_CCᵀ = A_CC − A_CI A_II⁻¹ A_IC (Golub & Van Loan, Matrix
// Computations, 4th ed., §4.2 and §3.2.10 on block elimination). A matrix
// that differs from A only in the C×C block, A + Pᵀ[0 0; 0 Δ]P, is then
// solved with the one factor and a system of the size of C, whatever Δ is:
// the forward solve reduces the right-hand side onto C, the caller solves
// (L_CC L_CCᵀ + Δ)·x_C = L_CC·y_C there, and the backward solve from
// y_C = L_CCᵀ·x_C recovers the rest (SolveVecSplitTo).

var errTrailing = errors.New("sparse: no trailing equations were analysed (use AnalyzeLast)")

// AnalyzeLast is Analyze with the equations in last pivoted after all
// others, in the order given; the others are ordered by ord among
// themselves. The pattern must couple the equations of last with each
// other (one dense group in NewPattern): their block of the factor is
// dense anyway once the rest is eliminated, and so the elimination tree
// keeps them in one chain at its root, in their order.
func AnalyzeLast(m *Matrix, ord Ordering, last []int) (*Symbolic, error) {
	if m == nil {
		return nil, errors.New("sparse: AnalyzeLast: nil matrix")
	}
	n, nc := m.n, len(last)
	isLast := make([]bool, n)
	for _, i := range last {
		if i < 0 || i >= n || isLast[i] {
			return nil, fmt.Errorf("sparse: AnalyzeLast: equation %d out of range or repeated: %w", i, errIndex)
		}
		isLast[i] = true
	}
	if ord == OrderBest {
		ord = OrderAMD
	}
	// Order the graph of the other equations alone.
	xadj, adj := symmetricAdjacency(m)
	local := make([]int, n) // equation → index among the others, −1 for last
	var global []int
	for i := range n {
		local[i] = -1
		if !isLast[i] {
			local[i] = len(global)
			global = append(global, i)
		}
	}
	ni := len(global)
	sx := make([]int, ni+1)
	var sa []int32
	for k, i := range global {
		for _, j := range adj[xadj[i]:xadj[i+1]] {
			if l := local[j]; l >= 0 {
				sa = append(sa, int32(l))
			}
		}
		sx[k+1] = len(sa)
	}
	var sub []int
	switch ord {
	case OrderAMD:
		sub = amdOrder(ni, sx, sa, nil)
	case OrderNestedDissection:
		var err error
		if sub, err = ndOrder(ni, sx, sa); err != nil {
			return nil, err
		}
	case OrderNatural:
		sub = make([]int, ni)
		for i := range sub {
			sub[i] = i
		}
	default:
		return nil, fmt.Errorf("sparse: AnalyzeLast: %v: %w", ord, errOrdering)
	}
	perm := make([]int, 0, n)
	for _, k := range sub {
		perm = append(perm, global[k])
	}
	perm = append(perm, last...)
	s, err := analyzePerm(m, ord, perm)
	if err != nil {
		return nil, err
	}
	if !slices.Equal(s.perm[n-nc:], last) {
		return nil, errors.New("sparse: AnalyzeLast: the postorder moved the trailing equations; their group must be dense in the pattern")
	}
	s.trailing = nc
	return s, nil
}

// Trailing returns the number of equations that AnalyzeLast pivoted last
// (0 after Analyze).
func (s *Symbolic) Trailing() int { return s.trailing }

// TrailingFactor writes the trailing block L_CC of the factor (see
// AnalyzeLast) into dst, m×m row-major, lower triangle, in the order of
// the trailing equations; the strict upper triangle is set to zero.
func (c *Cholesky) TrailingFactor(dst []float64) error {
	if !c.valid {
		return fmt.Errorf("sparse: TrailingFactor: %w", errNoFactor)
	}
	s := c.sym
	nc := s.trailing
	if nc == 0 {
		return fmt.Errorf("sparse: TrailingFactor: %w", errTrailing)
	}
	if len(dst) != nc*nc {
		return fmt.Errorf("sparse: TrailingFactor: len(dst) = %d, want %d: %w", len(dst), nc*nc, errLength)
	}
	clear(dst)
	first := s.n - nc
	for t := s.nsuper - 1; t >= 0 && s.super[t+1] > first; t-- {
		f, l := s.super[t], s.super[t+1]
		k := l - f
		rows := s.rows[s.rowPtr[t]:s.rowPtr[t+1]]
		block := c.lx[s.lPtr[t]:s.lPtr[t+1]]
		for j := max(f, first); j < l; j++ {
			for q, i := range rows {
				if int(i) >= j {
					dst[(int(i)-first)*nc+j-first] = block[q*k+j-f]
				}
			}
		}
	}
	return nil
}

// SolveVecSplitTo solves with the factor as SolveVecTo does, but hands the
// forward solve's trailing part y_C = L_CC⁻¹·(…) to inner, which may
// rewrite it in place before the backward solve (see AnalyzeLast): inner
// doing nothing gives SolveVecTo's result. An error from inner stops the
// solve and is returned.
func (c *Cholesky) SolveVecSplitTo(dst, b []float64, inner func(yc []float64) error) error {
	return pooledSolve("SolveVecSplitTo", c.valid, factorView[float64]{c.sym, c.lx}, c.solvePool, c.numWorkers(), dst, b, false, inner)
}

// SolveTrailingTo is the backward half of SolveVecSplitTo for a
// right-hand side that is zero outside the trailing equations (see
// AnalyzeLast), whose forward solve changes nothing outside them: inner
// receives y_C = 0 and sets it, and dst = Pᵀ·L⁻ᵀ·y.
func (c *Cholesky) SolveTrailingTo(dst []float64, inner func(yc []float64) error) error {
	return pooledSolve("SolveTrailingTo", c.valid, factorView[float64]{c.sym, c.lx}, c.solvePool, c.numWorkers(), dst, nil, true, inner)
}
