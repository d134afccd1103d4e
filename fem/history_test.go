package fem

import (
	"math"
	"testing"

	"flangeseg/material"
)

// recorder is an elastic law that keeps, as its state, the largest axial
// strain ε_zz its point has been committed at: a stand-in for a
// path-dependent law that tells when the solver commits.
type recorder struct{ material.Elastic }

func (recorder) StateSize() int { return 1 }

func (r recorder) Respond(c material.Condition, strain material.Vec4, committed, trial []float64, stress *material.Vec4, tangent *material.Mat4) error {
	trial[0] = math.Max(committed[0], strain[1])
	return r.Elastic.Respond(c, strain, nil, nil, stress, tangent)
}

// The material state follows the solver: trial values at every
// evaluation, committed only with Commit, and kept through a Revert.
func TestHistoryCommit(t *testing.T) {
	msh := stackedBar(t)
	laws := map[string]material.Law{"steel": recorder{material.Elastic{E: 210000, Nu: 0.3}}}
	m, err := NewModel(msh, laws, Options{Condition: material.PlaneStress})
	if err != nil {
		t.Fatal(err)
	}
	if !m.HasHistory() {
		t.Fatal("HasHistory = false for a law with state")
	}
	if err := m.FixSet("bottom", Z, 0); err != nil {
		t.Fatal(err)
	}
	edge, err := m.AddRigidEdge("top", msh.Nodes[0], RigidEdgeOptions{FixRotation: true, LateralFree: true})
	if err != nil {
		t.Fatal(err)
	}
	if err := m.Fix(edge.Axial, 0); err != nil {
		t.Fatal(err)
	}
	if err := m.Fix(m.NodeDof(0, X), 0); err != nil {
		t.Fatal(err)
	}
	s, err := NewSolver(m, nil, NewtonOptions{})
	if err != nil {
		t.Fatal(err)
	}
	largest := func(v []float64) float64 {
		out := 0.0
		for _, x := range v {
			out = math.Max(out, x)
		}
		return out
	}
	const strain = 0.1 / 100 // uniform ε_zz of the bar pulled by 0.1 mm
	solve := func(u float64) {
		t.Helper()
		if err := m.SetValue(edge.Axial, u); err != nil {
			t.Fatal(err)
		}
		if _, err := s.Equilibrium(); err != nil {
			t.Fatal(err)
		}
	}
	solve(0.1)
	if got := largest(m.history.trial); math.Abs(got-strain) > 1e-9 {
		t.Errorf("trial state %g after the solve, want ε_zz = %g", got, strain)
	}
	if got := largest(m.history.committed); got != 0 {
		t.Errorf("committed state %g before Commit, want 0", got)
	}
	s.Commit()
	solve(0.2)
	s.Revert()
	if got := largest(m.history.committed); math.Abs(got-strain) > 1e-9 {
		t.Errorf("committed state %g after Commit and a reverted solve, want %g", got, strain)
	}
}
