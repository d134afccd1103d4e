package fem

// Forces and results read off the current state.

import (
	"errors"
	"fmt"
	"slices"
)

// Reaction is the generalised force the constraints exert at dof d in the
// current state (after Equilibrium; a model change since then, such as a new
// eigenstrain, needs an Equilibrium first): a rigid edge's master collects
// its nodes' forces.
func (s *Solver) Reaction(d Dof) (float64, error) {
	if err := s.forces(); err != nil {
		return 0, err
	}
	fext, err := s.m.externalForces()
	if err != nil {
		return 0, err
	}
	r := make([]float64, s.m.nDof)
	for i := range r {
		r[i] = s.fint[i] - fext[i]
	}
	s.m.reduce(r)
	return r[d], nil
}

// NodeSetReaction sums the constraint forces (x, z) over a node set.
func (s *Solver) NodeSetReaction(set string) (rx, rz float64, err error) {
	nodes, ok := s.m.mesh.NodeSets[set]
	if !ok {
		return 0, 0, fmt.Errorf("fem: node set %q does not exist", set)
	}
	if err := s.forces(); err != nil {
		return 0, 0, err
	}
	fext, err := s.m.externalForces()
	if err != nil {
		return 0, 0, err
	}
	for _, n := range nodes {
		rx += s.fint[2*n] - fext[2*n]
		rz += s.fint[2*n+1] - fext[2*n+1]
	}
	return rx, rz, nil
}

// SectionForce cuts a body along the node line nodes and returns the
// resultant that the elements elems (one side of the cut) carry there:
// the normal force in z (tension positive when elems lie above the cut),
// the shear in x, and the moment about x = x0 (positive when the side
// x > x0 carries more tension). The nodal internal forces of the elements
// are the consistent integral of their section stresses.
func (s *Solver) SectionForce(elems []int, nodes []int, x0 float64) (normal, shear, moment float64, err error) {
	on := map[int]bool{}
	for _, n := range nodes {
		on[n] = true
	}
	sc := newScratch()
	for _, e := range elems {
		el := s.m.mesh.Elements[e]
		nd := 2 * len(el.Nodes)
		ue, fe := sc.ue[:nd], sc.fe[:nd]
		for a, n := range el.Nodes {
			ue[2*a], ue[2*a+1] = s.u[2*n], s.u[2*n+1]
		}
		if err := s.m.elementResponse(e, ue, fe, nil, nil, sc); err != nil {
			return 0, 0, 0, err
		}
		for a, n := range el.Nodes {
			if !on[n] {
				continue
			}
			normal -= fe[2*a+1]
			shear -= fe[2*a]
			moment -= fe[2*a+1] * (s.m.mesh.Nodes[n].X - x0)
		}
	}
	return normal, shear, moment, nil
}

// Points returns the integration point results in the current state.
func (s *Solver) Points() ([][]PointResult, error) {
	pts := s.m.newPointResults()
	s.forcesValid = false // fint is used for element forces alone here
	if err := s.a.assemble(s.u, s.fint, nil, pts); err != nil {
		return nil, err
	}
	return pts, nil
}

// Displacements returns the current state as a Solution without point
// results; EvaluatePoints adds them later, for a model whose points keep
// no history.
func (s *Solver) Displacements() *Solution {
	return &Solution{model: s.m, U: slices.Clone(s.u), Equations: s.m.nEq, FactorNonzeros: s.factorNonzeros()}
}

// EvaluatePoints computes the integration point results of a Solution
// made by Displacements, from its displacements. The points of a model
// with path-dependent laws depend on more than the displacements: there
// it is an error (take a Snapshot when the state is reached).
func (sol *Solution) EvaluatePoints() error {
	m := sol.model
	if m.HasHistory() {
		return errors.New("fem: point results of a path-dependent model need a snapshot of the state")
	}
	pts := m.newPointResults()
	fint := make([]float64, m.nDof)
	if err := newAssembler(m).assemble(sol.U, fint, nil, pts); err != nil {
		return err
	}
	sol.Points = pts
	return nil
}

// Snapshot returns the current state as a Solution (for stresses and
// field output).
func (s *Solver) Snapshot() (*Solution, error) {
	pts, err := s.Points()
	if err != nil {
		return nil, err
	}
	return &Solution{model: s.m, U: slices.Clone(s.u), Points: pts, Equations: s.m.nEq, FactorNonzeros: s.factorNonzeros()}, nil
}

// factorNonzeros is the factor's size, 0 before the first solve.
func (s *Solver) factorNonzeros() int {
	if s.sym == nil {
		return 0
	}
	return s.sym.FactorNNZ()
}
