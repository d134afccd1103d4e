package sparse

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// trailingCase is a Q8 block whose equations in last (every 7th and the
// highest ones, as a contact face's would be scattered through the
// numbering) are coupled densely in the pattern, as AnalyzeLast needs.
func trailingCase(t *testing.T) (*Matrix, []int) {
	t.Helper()
	_, n := q8Mesh(10, 6)
	var last []int
	for i := n - 1; i >= 0; i-- {
		if i%7 == 0 || i >= n-12 {
			last = append(last, i)
		}
	}
	return q8Matrix(t, 10, 6, last), last
}

// TestTrailingFactorIsSchurComplement checks the block-elimination identity
// of AnalyzeLast (Golub & Van Loan, Matrix Computations, §3.2.10):
// L_CC·L_CCᵀ = A_CC − A_CI·A_II⁻¹·A_IC, against a dense computation.
func TestTrailingFactorIsSchurComplement(t *testing.T) {
	m, last := trailingCase(t)
	for _, ord := range []Ordering{OrderAMD, OrderNestedDissection} {
		s, err := AnalyzeLast(m, ord, last)
		if err != nil {
			t.Fatal(err)
		}
		if got := s.Perm()[m.n-len(last):]; !slices.Equal(got, last) {
			t.Fatalf("%v: trailing pivots %v, want %v", ord, got, last)
		}
		var c Cholesky
		if err := c.Factorize(s, m); err != nil {
			t.Fatal(err)
		}
		nc := len(last)
		l := make([]float64, nc*nc)
		if err := c.TrailingFactor(l); err != nil {
			t.Fatal(err)
		}
		var got mat.Dense
		lm := mat.NewDense(nc, nc, l)
		got.Mul(lm, lm.T())

		want := schur(dense(m), last)
		if d := relDiff(&got, want); d > 1e-10 {
			t.Errorf("%v: ‖L_CC·L_CCᵀ − S‖/‖S‖ = %.3g", ord, d)
		}
	}
}

// TestSolveVecSplitTo solves a matrix changed in its trailing block only,
// A + Eᵀ·Δ·E with Δ unsymmetric (as sliding friction makes it), through
// the factor of A and a dense solve of the size of the trailing block.
func TestSolveVecSplitTo(t *testing.T) {
	m, last := trailingCase(t)
	s, err := AnalyzeLast(m, OrderAMD, last)
	if err != nil {
		t.Fatal(err)
	}
	var c Cholesky
	if err := c.Factorize(s, m); err != nil {
		t.Fatal(err)
	}
	nc, n := len(last), m.n
	l := make([]float64, nc*nc)
	if err := c.TrailingFactor(l); err != nil {
		t.Fatal(err)
	}
	lm := mat.NewDense(nc, nc, l)
	rnd := rand.New(rand.NewPCG(3, 5))
	delta := mat.NewDense(nc, nc, nil)
	for i := range nc {
		for j := range nc {
			if rnd.IntN(4) == 0 {
				delta.Set(i, j, 2e4*(rnd.Float64()-0.3))
			}
		}
	}
	var reduced mat.Dense // L_CC·L_CCᵀ + Δ
	reduced.Mul(lm, lm.T())
	reduced.Add(&reduced, delta)
	var lu mat.LU
	lu.Factorize(&reduced)

	b := randVec(n, rnd)
	x := make([]float64, n)
	err = c.SolveVecSplitTo(x, b, func(yc []float64) error {
		rhs := mat.NewVecDense(nc, nil)
		rhs.MulVec(lm, mat.NewVecDense(nc, slices.Clone(yc)))
		var xc mat.VecDense
		if err := lu.SolveVecTo(&xc, false, rhs); err != nil {
			return err
		}
		var back mat.VecDense
		back.MulVec(lm.T(), &xc)
		copy(yc, back.RawVector().Data)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}

	full := mat.NewDense(n, n, nil)
	full.Copy(dense(m))
	for i, gi := range last {
		for j, gj := range last {
			full.Set(gi, gj, full.At(gi, gj)+delta.At(i, j))
		}
	}
	var want mat.VecDense
	if err := want.SolveVec(full, mat.NewVecDense(n, b)); err != nil {
		t.Fatal(err)
	}
	var diff mat.VecDense
	diff.SubVec(mat.NewVecDense(n, x), &want)
	if d := mat.Norm(&diff, 2) / mat.Norm(&want, 2); d > 1e-9 {
		t.Errorf("split solve differs from the dense solve by %.3g (relative)", d)
	}

	// A right-hand side that is zero outside the trailing equations needs
	// no forward solve: its reduction onto them is its trailing part.
	bc := make([]float64, n)
	for _, i := range last {
		bc[i] = b[i]
	}
	viaTrailing, plainC := make([]float64, n), make([]float64, n)
	if err := c.SolveVecTo(plainC, bc); err != nil {
		t.Fatal(err)
	}
	err = c.SolveTrailingTo(viaTrailing, func(yc []float64) error {
		rhs := mat.NewVecDense(nc, nil)
		for k, i := range last {
			rhs.SetVec(k, bc[i])
		}
		var sol mat.VecDense
		if err := sol.SolveVec(&reducedPlain{lm}, rhs); err != nil {
			return err
		}
		var back mat.VecDense
		back.MulVec(lm.T(), &sol)
		copy(yc, back.RawVector().Data)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if d := relDiffVec(viaTrailing, plainC); d > 1e-10 {
		t.Errorf("SolveTrailingTo differs from SolveVecTo by %.3g (relative)", d)
	}

	// With an inner step that changes nothing it is the plain solve.
	plain, split := make([]float64, n), make([]float64, n)
	if err := c.SolveVecTo(plain, b); err != nil {
		t.Fatal(err)
	}
	if err := c.SolveVecSplitTo(split, b, func([]float64) error { return nil }); err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(plain, split) {
		t.Error("an idle inner step changed the solution")
	}
}

func TestAnalyzeLastNeedsDenseGroup(t *testing.T) {
	// Equations 0 and 2 are coupled, 1 is not: the tree holds 0 below 2
	// and 1 apart, and its postorder puts 1 first.
	m, err := NewPattern(5, [][]int{{0, 2}, {3, 4}})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := AnalyzeLast(m, OrderAMD, []int{0, 1, 2}); err == nil {
		t.Error("AnalyzeLast accepted trailing equations that the pattern does not couple")
	}
	if _, err := AnalyzeLast(m, OrderAMD, []int{3, 3}); err == nil {
		t.Error("AnalyzeLast accepted a repeated equation")
	}
}

// schur returns A_CC − A_CI·A_II⁻¹·A_IC over the equations in last.
func schur(a *mat.SymDense, last []int) *mat.Dense {
	n, nc := a.SymmetricDim(), len(last)
	isLast := map[int]bool{}
	for _, i := range last {
		isLast[i] = true
	}
	var inner []int
	for i := range n {
		if !isLast[i] {
			inner = append(inner, i)
		}
	}
	ni := len(inner)
	aii := mat.NewDense(ni, ni, nil)
	aic := mat.NewDense(ni, nc, nil)
	s := mat.NewDense(nc, nc, nil)
	for p, i := range inner {
		for q, j := range inner {
			aii.Set(p, q, a.At(i, j))
		}
		for q, j := range last {
			aic.Set(p, q, a.At(i, j))
		}
	}
	for p, i := range last {
		for q, j := range last {
			s.Set(p, q, a.At(i, j))
		}
	}
	var x mat.Dense
	if err := x.Solve(aii, aic); err != nil {
		panic(err)
	}
	var prod mat.Dense
	prod.Mul(aic.T(), &x)
	s.Sub(s, &prod)
	return s
}

func relDiff(a, b mat.Matrix) float64 {
	var d mat.Dense
	d.Sub(a, b)
	return mat.Norm(&d, 2) / math.Max(mat.Norm(b, 2), math.SmallestNonzeroFloat64)
}

// reducedPlain is L_CC·L_CCᵀ as a matrix.
type reducedPlain struct{ l *mat.Dense }

func (r *reducedPlain) Dims() (int, int) { return r.l.Dims() }
func (r *reducedPlain) At(i, j int) float64 {
	n, _ := r.l.Dims()
	s := 0.0
	for k := range n {
		s += r.l.At(i, k) * r.l.At(j, k)
	}
	return s
}
func (r *reducedPlain) T() mat.Matrix { return r }

func relDiffVec(a, b []float64) float64 {
	num, den := 0.0, 0.0
	for i := range a {
		num += (a[i] - b[i]) * (a[i] - b[i])
		den += b[i] * b[i]
	}
	return math.Sqrt(num / math.Max(den, math.SmallestNonzeroFloat64))
}
