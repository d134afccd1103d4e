package fem

import (
	"errors"
	"fmt"
	"math"

	"flangeseg/fem/sparse"
	"flangeseg/material"
)

// LinearOptions tune SolveLinear.
type LinearOptions struct {
	// Inspect, if set, sees the assembled matrix and right-hand side (in
	// equation space) before factorization, e.g. to write them in Matrix
	// Market form. An error from it stops the solve.
	Inspect func(k *sparse.Matrix, rhs []float64) error
	// Ordering of the sparse factorization (default approximate minimum degree).
	Ordering sparse.Ordering
}

// Solution is the state of a model after a solve.
type Solution struct {
	model *Model
	// U holds every dof's value: node dofs (2·node + direction), then the
	// rigid-edge masters.
	U []float64
	// Out is the out-of-balance force fint − fext per dof at node level:
	// zero at free dofs (to the solver's accuracy); at fixed and tied dofs
	// it is the force the support or constraint exerts on the body.
	Out []float64
	// Points holds the integration point results per element.
	Points [][]PointResult
	// RelativeResidual is ‖Ku − f‖/‖f‖ over the free equations.
	RelativeResidual float64
	Equations        int
	FactorNonzeros   int
}

// UnsupportedError reports a stiffness that is not positive definite: the
// model can move without resistance at the named dof.
type UnsupportedError struct {
	Dof         Dof
	Description string
	Err         error
}

func (e *UnsupportedError) Error() string {
	return fmt.Sprintf("fem: stiffness not positive definite at %s: a support is missing there (free rigid-body motion) or that part is not connected", e.Description)
}

func (e *UnsupportedError) Unwrap() error { return e.Err }

// Iterative refinement stops below refineBelow or after maxRefinements.
const (
	refineBelow    = 1e-13
	maxRefinements = 2
)

// SolveLinear solves the model for its loads and prescribed values in one
// Newton step from zero, which is exact for a linear model, and checks the
// residual afterwards.
func (m *Model) SolveLinear(opt LinearOptions) (*Solution, error) {
	m.Number()
	a := newAssembler(m)
	k, err := a.pattern()
	if err != nil {
		return nil, fmt.Errorf("fem: sparsity pattern: %w", err)
	}
	u := make([]float64, m.nDof)
	for d := range u {
		if m.fixed[d] {
			u[d] = m.value[d]
		}
	}
	m.expand(u)
	fext, err := m.externalForces()
	if err != nil {
		return nil, err
	}
	fint := make([]float64, m.nDof)
	if err := a.assemble(u, fint, k, nil); err != nil {
		return nil, err
	}
	rhs := m.freeResidual(fext, fint)
	if opt.Inspect != nil {
		if err := opt.Inspect(k, rhs); err != nil {
			return nil, err
		}
	}
	sym, err := sparse.Analyze(k, opt.Ordering)
	if err != nil {
		return nil, fmt.Errorf("fem: ordering: %w", err)
	}
	var chol sparse.Cholesky
	if err := chol.Factorize(sym, k); err != nil {
		return nil, m.factorError(err)
	}
	du := make([]float64, m.nEq)
	if err := chol.SolveVecTo(du, rhs); err != nil {
		return nil, err
	}
	m.update(u, du)
	sol := &Solution{model: m, U: u, Equations: m.nEq, FactorNonzeros: sym.FactorNNZ()}
	sol.Points = m.newPointResults()
	// Iterative refinement: a step or two with the same factor removes the
	// rounding a stiff, badly scaled system leaves behind.
	for step := 0; ; step++ {
		if err := a.assemble(u, fint, nil, sol.Points); err != nil {
			return nil, err
		}
		after := m.freeResidual(fext, fint)
		sol.RelativeResidual = norm(after) / math.Max(norm(rhs), math.SmallestNonzeroFloat64)
		if sol.RelativeResidual < refineBelow || step == maxRefinements {
			break
		}
		if err := chol.SolveVecTo(du, after); err != nil {
			return nil, err
		}
		m.update(u, du)
	}
	sol.Out = make([]float64, m.nDof)
	for d := range sol.Out {
		sol.Out[d] = fint[d] - fext[d]
	}
	return sol, nil
}

// externalForces returns the nodal and edge loads per dof at node level.
func (m *Model) externalForces() ([]float64, error) {
	f := make([]float64, m.nDof)
	copy(f, m.force)
	if err := m.addEdgeLoads(f); err != nil {
		return nil, err
	}
	return f, nil
}

// freeResidual is fext − fint reduced to the free equations.
func (m *Model) freeResidual(fext, fint []float64) []float64 {
	r := make([]float64, m.nDof)
	for d := range r {
		r[d] = fext[d] - fint[d]
	}
	m.reduce(r)
	out := make([]float64, m.nEq)
	for d, q := range m.eq {
		if q >= 0 {
			out[q] = r[d]
		}
	}
	return out
}

// update adds an equation-space correction to u and re-expands tied dofs.
func (m *Model) update(u, du []float64) {
	for d, q := range m.eq {
		if q >= 0 {
			u[d] += du[q]
		}
	}
	m.expand(u)
}

func (m *Model) factorError(err error) error {
	var np *sparse.NotPositiveDefiniteError
	if !errors.As(err, &np) {
		return fmt.Errorf("fem: factorization: %w", err)
	}
	for d, q := range m.eq {
		if q == np.Index {
			return &UnsupportedError{Dof: Dof(d), Description: m.DescribeDof(Dof(d)), Err: err}
		}
	}
	return fmt.Errorf("fem: factorization: %w", err)
}

func (m *Model) newPointResults() [][]PointResult {
	np := len(m.rule)
	all := make([]PointResult, np*len(m.mesh.Elements))
	out := make([][]PointResult, len(m.mesh.Elements))
	for e := range out {
		out[e] = all[e*np : (e+1)*np : (e+1)*np]
	}
	return out
}

func norm(v []float64) float64 {
	s := 0.0
	for _, x := range v {
		s += x * x
	}
	return math.Sqrt(s)
}

// Displacement of a node (ux, uz), mm.
func (s *Solution) Displacement(node int) (ux, uz float64) {
	return s.U[2*node], s.U[2*node+1]
}

// Reaction sums over a node set the forces that supports and constraints
// exert on the body there.
func (s *Solution) Reaction(set string) (rx, rz float64, err error) {
	nodes, ok := s.model.mesh.NodeSets[set]
	if !ok {
		return 0, 0, fmt.Errorf("fem: node set %q does not exist", set)
	}
	for _, n := range nodes {
		rx += s.Out[2*n]
		rz += s.Out[2*n+1]
	}
	return rx, rz, nil
}

// DofReaction is the generalised force the constraint exerts at a dof; a
// master dof collects the forces of its tied nodes (the force that drives
// a rigid edge, or the moment about its reference point).
func (s *Solution) DofReaction(d Dof) float64 {
	r := append([]float64(nil), s.Out...)
	s.model.reduce(r)
	return r[d]
}

// VonMises is the equivalent stress of the point.
func (p PointResult) VonMises() float64 { return material.VonMises(p.Stress) }

// Model returns the model the solution belongs to.
func (s *Solution) Model() *Model { return s.model }
