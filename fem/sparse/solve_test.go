package sparse

import (
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// The solve plan covers every supernode once: each part's subtrees and the
// top partition the tree, and the top holds every ancestor of a part's root.
func TestSolvePlanPartitionsTree(t *testing.T) {
	for _, tt := range []struct {
		name string
		m    *Matrix
	}{
		{"Q8 block 30×30", q8Matrix(t, 30, 30)},
		{"Q8 column 1×40", q8Matrix(t, 1, 40)},
		{"random 300", randomSPD(300, 3, rand.New(rand.NewPCG(1, 2)))},
		{"1×1", randomSPD(1, 0, rand.New(rand.NewPCG(1, 2)))},
	} {
		for _, ord := range []Ordering{OrderAMD, OrderNestedDissection} {
			s, err := Analyze(tt.m, ord)
			if err != nil {
				t.Fatal(err)
			}
			sp := s.solve
			seen := make([]int, s.nsuper)
			for _, roots := range sp.parts {
				for _, r := range roots {
					for u := sp.first[r]; u <= r; u++ {
						seen[u]++
					}
					for a := s.parent[r]; a >= 0; a = s.parent[a] {
						if !slices.Contains(sp.top, a) {
							t.Errorf("%s, %v: ancestor %d of part root %d not in the top", tt.name, ord, a, r)
						}
					}
				}
			}
			for _, u := range sp.top {
				seen[u]++
			}
			for u, k := range seen {
				if k != 1 {
					t.Errorf("%s, %v: supernode %d covered %d times", tt.name, ord, u, k)
				}
			}
		}
	}
}

// The solves give the same bits for any number of workers, with the parts
// run on goroutines (the factor is large enough for that), and through
// SolveTo and in place.
func TestSolveWorkersBitwise(t *testing.T) {
	m := q8Matrix(t, 36, 30)
	n := m.N()
	b := randVec(n, rand.New(rand.NewPCG(31, 32)))
	for _, ord := range []Ordering{OrderAMD, OrderNestedDissection} {
		s, err := Analyze(m, ord)
		if err != nil {
			t.Fatal(err)
		}
		if s.solve.entries < minParallelSolve || len(s.solve.parts[1]) == 0 {
			t.Fatalf("%v: %d entries, parts %v: the test would not run the parts in parallel", ord, s.solve.entries, s.solve.parts)
		}
		var c Cholesky
		c.SetWorkers(1)
		if err := c.Factorize(s, m); err != nil {
			t.Fatal(err)
		}
		var ref, ref32 []float64
		for _, w := range []int{1, 2, 3, 0} {
			c.SetWorkers(w)
			x := make([]float64, n)
			if err := c.SolveVecTo(x, b); err != nil {
				t.Fatal(err)
			}
			var f Cholesky32
			f.SetWorkers(w)
			if err := f.Round(&c); err != nil {
				t.Fatal(err)
			}
			x32 := slices.Clone(b)
			if err := f.SolveVecTo(x32, x32); err != nil {
				t.Fatal(err)
			}
			if ref == nil {
				ref, ref32 = x, x32
				if res := relResidual(m, x, b); res > 1e-10 {
					t.Errorf("%v: relative residual %g", ord, res)
				}
				continue
			}
			if !slices.Equal(x, ref) {
				t.Errorf("%v: %d workers: solution differs from 1 worker's", ord, w)
			}
			if !slices.Equal(x32, ref32) {
				t.Errorf("%v: %d workers: float32 solution differs from 1 worker's", ord, w)
			}
			both := append(slices.Clone(b), b...)
			if err := c.SolveTo(both, both, 2); err != nil {
				t.Fatal(err)
			}
			if !slices.Equal(both[:n], ref) || !slices.Equal(both[n:], ref) {
				t.Errorf("%v: %d workers: in-place SolveTo differs from SolveVecTo", ord, w)
			}
		}
	}
}

// The float32 copy of the factor is an inverse of A to about κ·u₃₂: one
// application leaves a backward error near float32's roundoff, and as the
// preconditioner of a stationary iteration x ← x + M⁻¹(b − A x) (iterative
// refinement, Higham, Accuracy and Stability of Numerical Algorithms, 2nd
// ed., 2002, ch. 12) it reaches float64 accuracy in a few steps, each
// gaining about log10(1/(κ·u₃₂)) digits.
func TestCholesky32Preconditions(t *testing.T) {
	for _, tt := range []struct {
		name string
		m    *Matrix
	}{
		{"Q8 block 30×20", q8Matrix(t, 30, 20)},
		{"Q8 column 1×100", q8Matrix(t, 1, 100)},
		{"random 500", randomSPD(500, 4, rand.New(rand.NewPCG(5, 6)))},
	} {
		m := tt.m
		n := m.N()
		b := randVec(n, rand.New(rand.NewPCG(41, 42)))
		s, err := Analyze(m, OrderAMD)
		if err != nil {
			t.Fatal(err)
		}
		var c Cholesky
		if err := c.Factorize(s, m); err != nil {
			t.Fatal(err)
		}
		var f Cholesky32
		if err := f.Round(&c); err != nil {
			t.Fatal(err)
		}
		x := make([]float64, n)
		if err := f.SolveVecTo(x, b); err != nil {
			t.Fatal(err)
		}
		if be := backwardError(m, x, b); be > 1e-6 || be < 1e-12 {
			// Below 1e-12 the rounding to float32 would not have happened.
			t.Errorf("%s: backward error of one float32 solve %g, want float32's roundoff", tt.name, be)
		}
		r, dx := make([]float64, n), make([]float64, n)
		steps := 0
		for ; steps < 6 && backwardError(m, x, b) > 1e-15; steps++ {
			m.MulVecTo(r, x)
			for i := range r {
				r[i] = b[i] - r[i]
			}
			if err := f.SolveVecTo(dx, r); err != nil {
				t.Fatal(err)
			}
			for i := range x {
				x[i] += dx[i]
			}
		}
		if be := backwardError(m, x, b); be > 1e-15 {
			t.Errorf("%s: refinement with the float32 factor: backward error %g after %d steps", tt.name, be, steps)
		}
		t.Logf("%s: float64 accuracy after %d refinement steps", tt.name, steps)
	}
	var f Cholesky32
	if err := f.Round(&Cholesky{}); !errors.Is(err, errNoFactor) {
		t.Errorf("Round of an empty Cholesky: err = %v", err)
	}
	if err := f.SolveVecTo(nil, nil); !errors.Is(err, errNoFactor) {
		t.Errorf("SolveVecTo before Round: err = %v", err)
	}
}

// backwardError returns the normwise backward error ‖Ax − b‖∞ / (‖A‖∞‖x‖∞ +
// ‖b‖∞).
func backwardError(m *Matrix, x, b []float64) float64 {
	r := make([]float64, m.N())
	m.MulVecTo(r, x)
	rowSum := make([]float64, m.N())
	for j := 0; j < m.n; j++ {
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			i := int(m.rowIdx[p])
			rowSum[i] += math.Abs(m.val[p])
			if i != j {
				rowSum[j] += math.Abs(m.val[p])
			}
		}
	}
	var res, normA, normX, normB float64
	for i := range r {
		res = max(res, math.Abs(r[i]-b[i]))
		normA, normX, normB = max(normA, rowSum[i]), max(normX, math.Abs(x[i])), max(normB, math.Abs(b[i]))
	}
	return res / (normA*normX + normB)
}

// Solves reuse their scratch memory.
func TestSolveDoesNotAllocate(t *testing.T) {
	m := q8Matrix(t, 36, 30)
	s, _ := Analyze(m, OrderNestedDissection)
	var c Cholesky
	if err := c.Factorize(s, m); err != nil {
		t.Fatal(err)
	}
	var f Cholesky32
	if err := f.Round(&c); err != nil {
		t.Fatal(err)
	}
	b := randVec(m.N(), rand.New(rand.NewPCG(7, 8)))
	x := make([]float64, m.N())
	for _, w := range []int{1, 2} {
		c.SetWorkers(w)
		f.SetWorkers(w)
		for name, solve := range map[string]func([]float64, []float64) error{"float64": c.SolveVecTo, "float32": f.SolveVecTo} {
			solve(x, b)
			// One worker allocates nothing; two, a few small objects per
			// parallel phase (closures, the goroutine, its counter).
			if a := testing.AllocsPerRun(5, func() { solve(x, b) }); a > float64(12*(w-1)) {
				t.Errorf("%s, %d workers: %v allocations per solve", name, w, a)
			}
		}
	}
}
