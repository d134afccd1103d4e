package fem

// The Newton equations of a model that is linear apart from contact.
//
// Where every element is linear (elastic law, small strain), the tangent
// changes from one iteration to the next only in the rows and columns of
// the equations that contact couples, C. The factorization is then made
// with C pivoted last (sparse.AnalyzeLast): its trailing block L_CC is the
// Cholesky factor of the Schur complement S₀ of the factorized tangent on
// C (Golub & Van Loan, Matrix Computations, 4th ed., §3.2.10). A later
// tangent K = K₀ + Eᵀ·Δ·E, Δ the change of the contact stiffness plus the
// sliding-friction couplings, is solved exactly with the old factor: the
// forward solve reduces the right-hand side onto C, GMRES solves
// (S₀ + Δ)·x_C = L_CC·y_C there, preconditioned by S₀⁻¹ (two dense
// triangular solves), and the backward solve recovers the rest. A step of
// that GMRES costs some hundred thousand multiply-adds instead of a sparse
// triangular solve pair and a product with the whole tangent, so an old
// factor serves through many contact changes, and a solve costs one pair
// of sparse triangular solves. When the changes pile up, the block on C is
// refactorized alone: the elements' part of S₀ is kept, and S₀ of the
// current tangent is that plus the current contact stiffness, a dense
// Cholesky factorization of C's size. Plasticity or large deformation
// change the whole tangent; their models keep the whole-tangent path
// (plainDirection).

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"time"

	"flangeseg/fem/sparse"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// maxContactEquations bounds the contact equations of the contact-space
// solve: its dense blocks take 5·n² values (90 MB at the bound).
const maxContactEquations = 1500

// GMRES steps on the contact equations allowed with an old factor before a
// new one is made, and the count above which the next solve refactorizes.
// A step costs about a hundredth of a factorization of the demo joint.
const (
	contactSteps      = 60
	contactStepsFresh = 20
)

// contactTolerance is the relative residual the contact equations are
// solved to, whatever the Newton forcing term would allow: a step costs
// little here, and an exact direction does not depend on how old the
// factor is, so the Newton path does not depend on when it was made.
// (Solved only to the forcing term, as the whole tangent is, the coarse
// tapered joint of TestPreloadUnchanged needed 38 preload solves instead
// of 16.)
const contactTolerance = 1e-10

// contactSpace holds the contact equations and the dense blocks over them.
type contactSpace struct {
	eqs []int // contact equations, ascending: the factor's trailing pivots
	at  []int // equation → place in eqs, −1 for the others
	// lsp: L_CC of the sparse factorization, which its solves reduce
	// with; l: the factor of the current Schur complement S₀ (lsp until
	// refactor replaces it); base: the elements' part of S₀, S₀ − kc0
	// (lower triangle); kc: the contact stiffness over C×C of the last
	// tangent assembly, kc0 that of l (n×n row-major, full).
	lsp, l, base, kc, kc0 []float64
	// dense: l is a refactorization, not lsp; refresh: the last solve took
	// many steps, so the next one refactorizes first.
	dense, refresh bool
	// change: kc − kc0 by rows (compressed), and the sliding couplings
	// mapped to places in eqs, for the products of one solve.
	dPtr      []int
	dCol      []int32
	dVal      []float64
	couplings []coupling
	krylov    krylovSpace
	rhs, x, t []float64
	// lastIn, lastOut: the last vector preconditioned and its result.
	lastIn, lastOut []float64
	// outside: a contact stiffness reached beyond the contact equations
	// (none should), so the solves take the whole tangent.
	outside bool
}

var errContactSpaceStale = errors.New("fem: the old factor no longer serves the contact equations")

func newContactSpace(nEq int, eqs []int) *contactSpace {
	n := len(eqs)
	cs := &contactSpace{eqs: eqs, at: make([]int, nEq),
		lsp: make([]float64, n*n), l: make([]float64, n*n), base: make([]float64, n*n),
		kc: make([]float64, n*n), kc0: make([]float64, n*n),
		rhs: make([]float64, n), x: make([]float64, n), t: make([]float64, n)}
	for i := range cs.at {
		cs.at[i] = -1
	}
	for i, q := range eqs {
		cs.at[q] = i
	}
	return cs
}

// contactEquations returns the equations that the contact groups couple,
// ascending.
func (s *Solver) contactEquations() []int {
	var eqs []int
	for _, g := range s.groups[len(s.a.eqIdx):] {
		for _, q := range g {
			if q >= 0 {
				eqs = append(eqs, q)
			}
		}
	}
	slices.Sort(eqs)
	return slices.Compact(eqs)
}

// covers reports whether every equation of g is a contact equation.
func (cs *contactSpace) covers(g []int) bool {
	for _, q := range g {
		if q >= 0 && cs.at[q] < 0 {
			return false
		}
	}
	return true
}

// interiorNorm is the norm of r over the equations other than contact.
func (cs *contactSpace) interiorNorm(r []float64) float64 {
	sum := 0.0
	for q, v := range r {
		if cs.at[q] < 0 {
			sum += v * v
		}
	}
	return math.Sqrt(sum)
}

// add adds a contact stiffness block over equations (−1: none) to kc.
func (cs *contactSpace) add(idx []int, k []float64) {
	n, nb := len(cs.eqs), len(idx)
	for i, qi := range idx {
		if qi < 0 {
			continue
		}
		if cs.at[qi] < 0 {
			cs.outside = true
			continue
		}
		row := cs.at[qi] * n
		for j, qj := range idx {
			if qj < 0 {
				continue
			}
			if cs.at[qj] < 0 {
				cs.outside = true
				continue
			}
			cs.kc[row+cs.at[qj]] += k[i*nb+j]
		}
	}
}

// prepare collects the change of the contact stiffness since l was
// factorized, and the couplings if any, and reports whether there is any
// change and whether the stiffness changed; ok is false if a coupling
// reaches beyond the contact equations.
func (cs *contactSpace) prepare(couplings []coupling) (changed, stiffness, ok bool) {
	n := len(cs.eqs)
	cs.dPtr, cs.dCol, cs.dVal = append(cs.dPtr[:0], 0), cs.dCol[:0], cs.dVal[:0]
	for i := range n {
		row, row0 := cs.kc[i*n:(i+1)*n], cs.kc0[i*n:(i+1)*n]
		for j, v := range row {
			if d := v - row0[j]; d != 0 {
				cs.dCol = append(cs.dCol, int32(j))
				cs.dVal = append(cs.dVal, d)
			}
		}
		cs.dPtr = append(cs.dPtr, len(cs.dCol))
	}
	cs.couplings = cs.couplings[:0]
	for _, c := range couplings {
		places := make([]int, len(c.eqs))
		for i, q := range c.eqs {
			places[i] = -1
			if q >= 0 {
				if places[i] = cs.at[q]; places[i] < 0 {
					return false, false, false
				}
			}
		}
		cs.couplings = append(cs.couplings, coupling{eqs: places, k: c.k})
	}
	return len(cs.dVal) > 0 || len(cs.couplings) > 0, len(cs.dVal) > 0, true
}

// mul is dst = (S₀ + Δ)·v with S₀ = L_CC·L_CCᵀ. Where v is the last
// preconditioned vector, v = S₀⁻¹·w, S₀·v is w itself: GMRES multiplies
// each preconditioned vector right after making it, so a step costs one
// pair of dense triangular solves, not two pairs.
func (cs *contactSpace) mul(dst, v []float64) error {
	n := len(cs.eqs)
	if len(v) > 0 && len(cs.lastOut) > 0 && &v[0] == &cs.lastOut[0] {
		copy(dst, cs.lastIn)
	} else {
		lowerTransMulVec(cs.t, cs.l, n, v)
		lowerMulVec(dst, cs.l, n, cs.t)
	}
	for i := range n {
		s := 0.0
		for p := cs.dPtr[i]; p < cs.dPtr[i+1]; p++ {
			s += cs.dVal[p] * v[cs.dCol[p]]
		}
		dst[i] += s
	}
	for _, c := range cs.couplings {
		c.addProduct(dst, v)
	}
	return nil
}

// precond is dst = S₀⁻¹·v; it keeps v (see mul).
func (cs *contactSpace) precond(dst, v []float64) error {
	n := len(cs.eqs)
	cs.lastIn = append(cs.lastIn[:0], v...)
	cs.lastOut = dst
	copy(dst, v)
	lowerSolve(cs.l, n, dst)
	lowerTransSolve(cs.l, n, dst)
	return nil
}

// solveInner replaces the forward solution's contact part y_C by
// L_CCᵀ·x_C, x_C solving (S₀ + Δ)·x_C = L_CC·y_C to the relative
// tolerance tol in at most maxSteps GMRES steps; it returns the steps
// and errContactSpaceStale if they did not reach tol.
func (cs *contactSpace) solveInner(yc []float64, tol float64, maxSteps int, accept bool) (int, error) {
	lowerMulVec(cs.rhs, cs.lsp, len(cs.eqs), yc)
	return cs.solveReduced(yc, tol, maxSteps, accept)
}

// solveReduced is solveInner for the reduced right-hand side in cs.rhs.
func (cs *contactSpace) solveReduced(yc []float64, tol float64, maxSteps int, accept bool) (int, error) {
	cs.lastOut = nil
	steps, rel, err := cs.krylov.gmres(cs.mul, cs.precond, cs.rhs, cs.x, tol, maxSteps, maxSteps)
	if err != nil {
		return steps, err
	}
	if rel > tol && !accept {
		return steps, errContactSpaceStale
	}
	lowerTransMulVec(yc, cs.lsp, len(cs.eqs), cs.x)
	return steps, nil
}

// contactDirection is direction for a solver with a contact space.
// An interior residual (outside the contact equations) of norm at most
// interiorBelow is left out: the forward solve is skipped.
func (s *Solver) contactDirection(du, r []float64, tol, interiorBelow float64) error {
	cs := s.cs
	var couplings []coupling
	if s.coupled {
		couplings = s.couplings
	}
	if !s.factorOK {
		if err := s.factorize(); err != nil {
			return err
		}
	} else if cs.refresh {
		if err := s.refactorContact(); err != nil {
			return err
		}
	}
	balanced := cs.interiorNorm(r) <= interiorBelow
	for {
		changed, stiffness, ok := cs.prepare(couplings)
		if !ok || cs.outside {
			s.factorStale = true // the sparse factor's block may be older than l
			return s.plainDirection(du, r, tol)
		}
		if !changed && !cs.dense && !balanced {
			return s.chol.SolveVecTo(du, r)
		}
		var steps int
		var err error
		if balanced {
			// The interior equations are in balance (they are linear and
			// the last step solved them): the forward solve would leave
			// the contact equations' part as it is.
			err = s.chol.SolveTrailingTo(du, func(yc []float64) error {
				for i, q := range cs.eqs {
					cs.rhs[i] = r[q]
				}
				var err error
				steps, err = cs.solveReduced(yc, contactTolerance, contactSteps, !stiffness)
				return err
			})
		} else {
			err = s.chol.SolveVecSplitTo(du, r, func(yc []float64) error {
				var err error
				steps, err = cs.solveInner(yc, contactTolerance, contactSteps, !stiffness)
				return err
			})
		}
		s.Timing.KrylovSteps += steps
		if errors.Is(err, errContactSpaceStale) {
			if err := s.refactorContact(); err != nil {
				return err
			}
			continue
		}
		cs.refresh = err == nil && steps > contactStepsFresh
		return err
	}
}

// refactorContact refactorizes the contact equations' block alone: the
// elements' part of the tangent does not change, so the Schur complement
// on the contact equations is the elements' (base) plus the current
// contact stiffness, a dense Cholesky factorization of their size. Where
// it meets a pivot that is not clearly positive the whole tangent is
// factorized, which names the dof.
func (s *Solver) refactorContact() error {
	start := time.Now()
	ok := s.cs.refactor()
	s.Timing.Factorization += time.Since(start)
	s.Timing.Solve -= time.Since(start)
	s.Timing.ContactFactorizations++
	if !ok {
		return s.factorize()
	}
	return nil
}

// factorize factorizes the current tangent (and, with a contact space,
// keeps its trailing block and contact stiffness).
func (s *Solver) factorize() error {
	if err := s.wholeTangent(); err != nil {
		return err
	}
	start := time.Now()
	err := s.chol.Factorize(s.sym, s.k)
	s.preOK = false
	if err == nil && s.cs != nil {
		err = s.cs.keepFactor(&s.chol)
	}
	s.Timing.Factorization += time.Since(start)
	s.Timing.Solve -= time.Since(start)
	if err != nil {
		s.factorOK = false
		return s.unstable(s.m.factorError(err))
	}
	s.Timing.Factorizations++
	s.factorOK, s.factorStale = true, false
	return nil
}

// keepFactor takes the trailing block of a new factorization: the block
// the solves reduce with (lsp), the current factor (l) and the elements'
// Schur complement base = L_CC·L_CCᵀ − kc.
func (cs *contactSpace) keepFactor(chol *sparse.Cholesky) error {
	if err := chol.TrailingFactor(cs.lsp); err != nil {
		return err
	}
	n := len(cs.eqs)
	copy(cs.l, cs.lsp)
	copy(cs.kc0, cs.kc)
	lsp := blas64.General{Rows: n, Cols: n, Stride: n, Data: cs.lsp}
	blas64.Syrk(blas.NoTrans, 1, lsp, 0, blas64.Symmetric{Uplo: blas.Lower, N: n, Stride: n, Data: cs.base})
	for i := range n {
		for j := 0; j <= i; j++ {
			cs.base[i*n+j] -= cs.kc[i*n+j]
		}
	}
	cs.dense, cs.refresh = false, false
	return nil
}

// refactor factorizes base + kc into l; false if a pivot is not clearly
// positive (sparse.PivotTolerance relative to its diagonal entry).
func (cs *contactSpace) refactor() bool {
	n := len(cs.eqs)
	for i := range n {
		for j := 0; j <= i; j++ {
			cs.l[i*n+j] = cs.base[i*n+j] + cs.kc[i*n+j]
		}
		cs.t[i] = cs.l[i*n+i]
	}
	_, ok := lapack64.Potrf(blas64.Symmetric{Uplo: blas.Lower, N: n, Stride: n, Data: cs.l})
	for i := range n {
		if d := cs.l[i*n+i]; !ok || !(d*d > sparse.PivotTolerance*math.Abs(cs.t[i])) {
			copy(cs.l, cs.lsp)
			return false
		}
	}
	copy(cs.kc0, cs.kc)
	cs.dense, cs.refresh = true, false
	return true
}

// analyseContactSpace builds the pattern and its analysis with the contact
// equations pivoted last, where the model is linear apart from contact and
// they are not too many; it returns a nil contact space otherwise.
func (s *Solver) analyseContactSpace(ord sparse.Ordering) (*sparse.Matrix, *sparse.Symbolic, *contactSpace, error) {
	eqs := s.contactEquations()
	if len(eqs) == 0 || len(eqs) > maxContactEquations || !s.a.allLinear() {
		return nil, nil, nil, nil
	}
	groups := append(slices.Clip(s.groups), eqs)
	k, err := sparse.NewPattern(s.m.nEq, groups)
	if err != nil {
		return nil, nil, nil, fmt.Errorf("fem: sparsity pattern: %w", err)
	}
	sym, err := sparse.AnalyzeLast(k, ord, eqs)
	if err != nil {
		return nil, nil, nil, fmt.Errorf("fem: ordering: %w", err)
	}
	return k, sym, newContactSpace(s.m.nEq, eqs), nil
}

// Dense kernels on a lower triangle l, n×n row-major. Rows are walked as
// dot products or combined as axpys, the forms gonum's floats package
// runs in assembly.

// lowerMulVec is dst = l·x (dst and x distinct).
func lowerMulVec(dst, l []float64, n int, x []float64) {
	for i := range n {
		dst[i] = floats.Dot(l[i*n:i*n+i+1], x[:i+1])
	}
}

// lowerTransMulVec is dst = lᵀ·x (dst and x distinct).
func lowerTransMulVec(dst, l []float64, n int, x []float64) {
	clear(dst[:n])
	for i := range n {
		floats.AddScaled(dst[:i+1], x[i], l[i*n:i*n+i+1])
	}
}

// lowerSolve overwrites x with l⁻¹·x.
func lowerSolve(l []float64, n int, x []float64) {
	for i := range n {
		x[i] = (x[i] - floats.Dot(l[i*n:i*n+i], x[:i])) / l[i*n+i]
	}
}

// lowerTransSolve overwrites x with l⁻ᵀ·x.
func lowerTransSolve(l []float64, n int, x []float64) {
	for i := n - 1; i >= 0; i-- {
		x[i] /= l[i*n+i]
		floats.AddScaled(x[:i], -x[i], l[i*n:i*n+i])
	}
}
