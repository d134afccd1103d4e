package sparse

import (
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// Solutions are checked against gonum's dense Cholesky factorization of the
// same matrix, and by the relative residual.
func TestSolveAgainstDense(t *testing.T) {
	rnd := rand.New(rand.NewPCG(11, 12))
	tests := []struct {
		name string
		m    *Matrix
	}{
		{"1×1", randomSPD(1, 0, rnd)},
		{"2×2", randomSPD(2, 1, rnd)},
		{"random 50", randomSPD(50, 2, rnd)},
		{"random 400", randomSPD(400, 4, rnd)},
		{"random 800 dense-ish", randomSPD(800, 40, rnd)},
		{"grid Laplacian 20×17", laplace2D(20, 17)},
		{"Q8 block 5×4", q8Matrix(t, 5, 4)},
		{"Q8 block 12×9", q8Matrix(t, 12, 9)},
	}
	for _, tt := range tests {
		n := tt.m.N()
		b := randVec(n, rnd)
		var chol mat.Cholesky
		if !chol.Factorize(dense(tt.m)) {
			t.Fatalf("%s: dense Cholesky failed", tt.name)
		}
		want := mat.NewVecDense(n, nil)
		if err := chol.SolveVecTo(want, mat.NewVecDense(n, b)); err != nil {
			t.Fatal(err)
		}
		cond := chol.Cond()
		for _, ord := range []Ordering{OrderAMD, OrderNestedDissection, OrderNatural} {
			x := factorSolve(t, tt.m, ord, 0, b)
			var diff, norm float64
			for i := range x {
				diff = max(diff, math.Abs(x[i]-want.AtVec(i)))
				norm = max(norm, math.Abs(want.AtVec(i)))
			}
			if diff > 1e-14*cond*norm {
				t.Errorf("%s, %v: max difference from dense %g (‖x‖∞ %g, cond %g)", tt.name, ord, diff, norm, cond)
			}
			if res := relResidual(tt.m, x, b); res > 1e-10 {
				t.Errorf("%s, %v: relative residual %g", tt.name, ord, res)
			}
		}
		// In place, and the log-determinant, with the default ordering.
		s, _ := Analyze(tt.m, OrderAMD)
		var c Cholesky
		if err := c.Factorize(s, tt.m); err != nil {
			t.Fatal(err)
		}
		x := slices.Clone(b)
		if err := c.SolveVecTo(x, x); err != nil {
			t.Fatal(err)
		}
		if res := relResidual(tt.m, x, b); res > 1e-10 {
			t.Errorf("%s: in-place solve: relative residual %g", tt.name, res)
		}
		if got, want := c.LogDet(), chol.LogDet(); math.Abs(got-want) > 1e-10*math.Max(1, math.Abs(want)) {
			t.Errorf("%s: LogDet = %g, dense %g", tt.name, got, want)
		}
	}
}

// One Symbolic serves matrices with the same pattern and other values; a
// Cholesky is refactorized in place.
func TestSymbolicReuse(t *testing.T) {
	rnd := rand.New(rand.NewPCG(13, 14))
	m1 := q8Matrix(t, 9, 7)
	m2 := m1.Copy()
	for p := range m2.val { // another SPD matrix: scaled plus a diagonal shift
		m2.val[p] *= 0.5
	}
	for j := 0; j < m2.n; j++ {
		m2.val[m2.colPtr[j]] += 1000
	}
	s, err := Analyze(m1, OrderAMD)
	if err != nil {
		t.Fatal(err)
	}
	var c Cholesky
	for round := 0; round < 2; round++ {
		for i, m := range []*Matrix{m1, m2} {
			if err := c.Factorize(s, m); err != nil {
				t.Fatal(err)
			}
			b := randVec(m.N(), rnd)
			x := make([]float64, m.N())
			if err := c.SolveVecTo(x, b); err != nil {
				t.Fatal(err)
			}
			if res := relResidual(m, x, b); res > 1e-10 {
				t.Errorf("round %d, matrix %d: residual %g", round, i+1, res)
			}
		}
	}
	other := laplace2D(3, 3)
	if err := c.Factorize(s, other); !errors.Is(err, errNotAnalysed) {
		t.Errorf("other pattern: err = %v", err)
	}
	if err := c.SolveVecTo(make([]float64, 9), make([]float64, 9)); !errors.Is(err, errNoFactor) {
		t.Errorf("solve after failed factorization: err = %v", err)
	}
}

// Failing pivots are reported with the original index; no NaN reaches a
// "successful" factor.
func TestNotPositiveDefinite(t *testing.T) {
	// zeroRows clears the rows and columns of the given dofs, as if no
	// element reached them any more.
	zeroRows := func(nx int, dofs ...int) *Matrix {
		m := q8Matrix(t, nx, 4)
		for j := 0; j < m.n; j++ {
			for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
				if slices.Contains(dofs, int(m.rowIdx[p])) || slices.Contains(dofs, j) {
					m.val[p] = 0
				}
			}
		}
		return m
	}
	zeroRow := func() (*Matrix, int) { return zeroRows(6, 37), 37 }
	// Two far apart: the lower in elimination order is reported, whatever
	// the number of workers.
	twoZeroRows := func() (*Matrix, int) { return zeroRows(40, 3, 600), -1 }
	unsupported := func() (*Matrix, int) {
		// Without its fixed bottom edge the block floats: three rigid-body
		// modes, so pivots near the end of the elimination vanish.
		const nx, nz = 5, 4
		var groups [][]int
		maxDof := 0
		for e := 0; e < nx*nz; e++ {
			nodes := q8Nodes(nx, e)
			g := make([]int, 16)
			for i, nd := range nodes {
				g[2*i], g[2*i+1] = 2*nd, 2*nd+1
				maxDof = max(maxDof, 2*nd+2)
			}
			groups = append(groups, g)
		}
		m, err := NewPattern(maxDof, groups)
		if err != nil {
			t.Fatal(err)
		}
		ke := q8Stiffness(210000, 0.3)
		for _, g := range groups {
			if err := m.AddDense(g, ke); err != nil {
				t.Fatal(err)
			}
		}
		return m, -1 // which pivot vanishes depends on the ordering
	}
	indefinite := func() (*Matrix, int) {
		m := laplace2D(8, 8)
		m.val[m.colPtr[20]] = -4
		return m, 20
	}
	notFinite := func() (*Matrix, int) {
		m := laplace2D(8, 8)
		m.val[m.colPtr[9]] = math.Inf(1)
		return m, 9
	}
	nan := func() (*Matrix, int) {
		m := laplace2D(8, 8)
		m.val[m.colPtr[30]+1] = math.NaN()
		return m, -1
	}
	tests := []struct {
		name string
		make func() (*Matrix, int)
	}{
		{"zero row", zeroRow}, {"two zero rows", twoZeroRows}, {"missing support", unsupported}, {"indefinite", indefinite},
		{"infinite diagonal", notFinite}, {"NaN entry", nan},
	}
	for _, tt := range tests {
		m, want := tt.make()
		for _, ord := range []Ordering{OrderAMD, OrderNestedDissection, OrderNatural} {
			first := -1
			for _, w := range []int{1, 2, 4} {
				s, err := Analyze(m, ord)
				if err != nil {
					t.Fatal(err)
				}
				var c Cholesky
				c.SetWorkers(w)
				err = c.Factorize(s, m)
				var npd *NotPositiveDefiniteError
				if !errors.As(err, &npd) {
					t.Errorf("%s, %v, %d workers: err = %v, want NotPositiveDefiniteError", tt.name, ord, w, err)
					continue
				}
				if want >= 0 && npd.Index != want || npd.Index < 0 || npd.Index >= m.n {
					t.Errorf("%s, %v: index %d, want %d", tt.name, ord, npd.Index, want)
				}
				if w == 1 {
					first = npd.Index
				} else if npd.Index != first {
					t.Errorf("%s, %v: %d workers report index %d, 1 worker %d", tt.name, ord, w, npd.Index, first)
				}
				if err := c.SolveVecTo(make([]float64, m.n), make([]float64, m.n)); err == nil {
					t.Errorf("%s: solve with a failed factor succeeded", tt.name)
				}
			}
		}
	}
}

// q8Nodes returns the node numbers of element e of a block nx elements
// wide, numbered as in q8Mesh with the bottom row included.
func q8Nodes(nx, e int) [8]int {
	perRow := 3*nx + 2
	node := func(x2, z2 int) int {
		base := (z2 / 2) * perRow
		if z2%2 == 1 {
			return base + 2*nx + 1 + x2/2
		}
		return base + x2
	}
	x, z := 2*(e%nx), 2*(e/nx)
	return [8]int{
		node(x, z), node(x+2, z), node(x+2, z+2), node(x, z+2),
		node(x+1, z), node(x+2, z+1), node(x+1, z+2), node(x, z+1),
	}
}

func TestMultipleRightHandSides(t *testing.T) {
	rnd := rand.New(rand.NewPCG(15, 16))
	m := q8Matrix(t, 8, 6)
	n := m.N()
	s, _ := Analyze(m, OrderAMD)
	var c Cholesky
	if err := c.Factorize(s, m); err != nil {
		t.Fatal(err)
	}
	const k = 3
	b := randVec(n*k, rnd)
	x := make([]float64, n*k)
	if err := c.SolveTo(x, b, k); err != nil {
		t.Fatal(err)
	}
	for j := 0; j < k; j++ {
		xj := make([]float64, n)
		if err := c.SolveVecTo(xj, b[j*n:(j+1)*n]); err != nil {
			t.Fatal(err)
		}
		if !slices.Equal(xj, x[j*n:(j+1)*n]) {
			t.Errorf("column %d differs from a single solve", j)
		}
	}
	// In place: dst aliases b.
	in := slices.Clone(b)
	if err := c.SolveTo(in, in, k); err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(in, x) {
		t.Error("in-place SolveTo differs")
	}
	if err := c.SolveTo(x, b[:n], k); !errors.Is(err, errLength) {
		t.Errorf("short b: err = %v", err)
	}
}

// The factor does not depend on the number of workers, bit for bit.
func TestParallelMatchesSerial(t *testing.T) {
	rnd := rand.New(rand.NewPCG(17, 18))
	m := q8Matrix(t, 30, 30)
	b := randVec(m.N(), rnd)
	for _, ord := range []Ordering{OrderAMD, OrderNestedDissection} {
		s, err := Analyze(m, ord)
		if err != nil {
			t.Fatal(err)
		}
		var ref []float64
		var refX []float64
		for _, w := range []int{1, 2, 3, 8} {
			var c Cholesky
			c.SetWorkers(w)
			if err := c.Factorize(s, m); err != nil {
				t.Fatal(err)
			}
			if w > 1 && len(c.plan.top) == 0 {
				t.Errorf("%v, %d workers: no shared top nodes; the test misses the parallel kernels", ord, w)
			}
			x := make([]float64, m.N())
			c.SolveVecTo(x, b)
			if ref == nil {
				ref, refX = c.lx, x
				continue
			}
			if !slices.Equal(c.lx, ref) || !slices.Equal(x, refX) {
				t.Errorf("%v: %d workers differ from 1", ord, w)
			}
		}
	}
}

func TestTinyAndEmpty(t *testing.T) {
	empty := NewTriplets(0, 0).Matrix()
	s, err := Analyze(empty, OrderAMD)
	if err != nil {
		t.Fatal(err)
	}
	var c Cholesky
	if err := c.Factorize(s, empty); err != nil {
		t.Fatal(err)
	}
	if err := c.SolveVecTo(nil, nil); err != nil {
		t.Error(err)
	}
	one := NewTriplets(1, 1)
	one.Add(0, 0, 4)
	m := one.Matrix()
	x := factorSolve(t, m, OrderBest, 2, []float64{2})
	if x[0] != 0.5 {
		t.Errorf("1×1: x = %v", x)
	}
	if _, err := Analyze(m, Ordering(99)); !errors.Is(err, errOrdering) {
		t.Errorf("unknown ordering: err = %v", err)
	}
	if err := c.Factorize(nil, m); err == nil {
		t.Error("nil Symbolic accepted")
	}
}

func TestOrderBestPicksFewerNonzeros(t *testing.T) {
	m := q8Matrix(t, 20, 20)
	amd, _ := Analyze(m, OrderAMD)
	nd, _ := Analyze(m, OrderNestedDissection)
	best, err := Analyze(m, OrderBest)
	if err != nil {
		t.Fatal(err)
	}
	if want := min(amd.FactorNNZ(), nd.FactorNNZ()); best.FactorNNZ() != want {
		t.Errorf("best: nnz(L) = %d, want min(%d, %d)", best.FactorNNZ(), amd.FactorNNZ(), nd.FactorNNZ())
	}
	if best.Ordering() != OrderBest {
		t.Errorf("Ordering() = %v", best.Ordering())
	}
}

func TestAddDenseDoesNotAllocate(t *testing.T) {
	groups, _ := q8Mesh(6, 6)
	m := q8Matrix(t, 6, 6)
	ke := q8Stiffness(210000, 0.3)
	allocs := testing.AllocsPerRun(10, func() {
		for _, g := range groups {
			m.AddDense(g, ke)
		}
	})
	if allocs != 0 {
		t.Errorf("AddDense: %v allocations per assembly", allocs)
	}
}

func TestRefactorizeDoesNotAllocateMuch(t *testing.T) {
	m := q8Matrix(t, 20, 20)
	s, _ := Analyze(m, OrderAMD)
	var c Cholesky
	c.SetWorkers(1)
	if err := c.Factorize(s, m); err != nil {
		t.Fatal(err)
	}
	allocs := testing.AllocsPerRun(3, func() { c.Factorize(s, m) })
	if allocs > 10 { // goroutine bookkeeping only
		t.Errorf("Factorize: %v allocations per call", allocs)
	}
}

// A slender but supported structure has small pivots that must still pass
// PivotTolerance: a Q8 column one element wide and 400 high, fixed at its
// foot (d_j/a_jj ≥ 3e-9 in every ordering).
func TestSlenderCantileverFactorizes(t *testing.T) {
	m := q8Matrix(t, 1, 400)
	b := randVec(m.N(), rand.New(rand.NewPCG(21, 22)))
	for _, ord := range []Ordering{OrderAMD, OrderNestedDissection, OrderNatural} {
		x := factorSolve(t, m, ord, 0, b)
		// The condition number is large, so check the normwise backward
		// error, which Cholesky keeps near ε.
		if be := backwardError(m, x, b); be > 1e-14 {
			t.Errorf("%v: backward error %g", ord, be)
		}
	}
}
