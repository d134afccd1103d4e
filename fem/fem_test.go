package fem

import (
	"errors"
	"math"
	"testing"

	"flangeseg/material"
	"flangeseg/mesh"
)

var steel = map[string]material.Law{"steel": material.Elastic{E: 210000, Nu: 0.3}}

func block(t *testing.T, kind mesh.Kind, nx, nz int) *mesh.Mesh {
	t.Helper()
	m, err := mesh.Rect(0, 0, 40, 20, nx, nz, mesh.Region{Name: "block", Thickness: 3, Material: "steel"}, kind)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// Shape functions sum to one and their derivatives to zero at any point
// (partition of unity, a property of every conforming element).
func TestShapePartitionOfUnity(t *testing.T) {
	for _, kind := range []mesh.Kind{mesh.Quad4, mesh.Quad8} {
		n := make([]float64, kind)
		dx := make([]float64, kind)
		de := make([]float64, kind)
		for _, p := range [][2]float64{{0, 0}, {0.3, -0.7}, {-1, 1}, {0.9, 0.2}} {
			shapeFunctions(kind)(p[0], p[1], n, dx, de)
			var s, sx, se float64
			for i := range n {
				s, sx, se = s+n[i], sx+dx[i], se+de[i]
			}
			if math.Abs(s-1) > 1e-14 || math.Abs(sx) > 1e-14 || math.Abs(se) > 1e-14 {
				t.Errorf("%v at %v: ΣN = %g, ΣdN/dξ = %g, ΣdN/dη = %g", kind, p, s, sx, se)
			}
		}
	}
}

// A body held only in z can slide in x: the solve must name a dof instead
// of returning NaNs.
func TestMissingSupportIsNamed(t *testing.T) {
	msh := block(t, mesh.Quad8, 4, 2)
	m, err := NewModel(msh, steel, Options{Condition: material.PlaneStress})
	if err != nil {
		t.Fatal(err)
	}
	if err := m.FixSet("bottom", Z, 0); err != nil {
		t.Fatal(err)
	}
	if err := m.AddTraction("top", 0, 10); err != nil {
		t.Fatal(err)
	}
	_, err = m.SolveLinear(LinearOptions{})
	var ue *UnsupportedError
	if !errors.As(err, &ue) {
		t.Fatalf("got %v, want an UnsupportedError", err)
	}
	t.Logf("message: %v", err)
}

// A block pulled through a rigid top edge: the edge's master reaction
// equals the reaction at the fixed bottom (equilibrium), and every top node
// moves by the prescribed amount.
func TestRigidEdgeEquilibrium(t *testing.T) {
	for _, rot := range []bool{false, true} {
		msh := block(t, mesh.Quad8, 6, 4)
		m, err := NewModel(msh, steel, Options{Condition: material.PlaneStress})
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range []Direction{X, Z} {
			if err := m.FixSet("bottom", d, 0); err != nil {
				t.Fatal(err)
			}
		}
		edge, err := m.AddRigidEdge("top", mesh.Point{X: 40, Z: 20}, RigidEdgeOptions{FixRotation: !rot})
		if err != nil {
			t.Fatal(err)
		}
		if err := m.Fix(edge.Axial, 0.05); err != nil {
			t.Fatal(err)
		}
		sol, err := m.SolveLinear(LinearOptions{})
		if err != nil {
			t.Fatal(err)
		}
		pull := sol.DofReaction(edge.Axial)
		_, rz, _ := sol.Reaction("bottom")
		if math.Abs(pull+rz) > 1e-9*math.Abs(pull) || pull <= 0 {
			t.Errorf("rotation free %v: pull %g N, bottom reaction %g N", rot, pull, rz)
		}
		if r := sol.DofReaction(edge.Rotation); rot && math.Abs(r) > 1e-8*pull*40 {
			t.Errorf("free rotation carries a moment %g N·mm", r)
		}
		theta := sol.U[edge.Rotation]
		for _, n := range msh.NodeSets["top"] {
			_, uz := sol.Displacement(n)
			want := 0.05 + theta*(msh.Nodes[n].X-40)
			if math.Abs(uz-want) > 1e-12 {
				t.Errorf("top node %d: uz = %g, want %g", n, uz, want)
			}
		}
	}
}

// Consistent edge loads carry the exact resultant: p·L·t on a plane edge,
// p·π(b² − a²) on an annular face of an axisymmetric body (statics).
func TestEdgeLoadResultant(t *testing.T) {
	cases := []struct {
		name string
		cond material.Condition
		kind mesh.Kind
		want float64
	}{
		{"plane stress Q8", material.PlaneStress, mesh.Quad8, 5 * 40 * 3},
		{"plane strain Q4", material.PlaneStrain, mesh.Quad4, 5 * 40 * 3},
		{"axisymmetric Q8", material.Axisymmetric, mesh.Quad8, 5 * math.Pi * (50*50 - 10*10)},
	}
	for _, c := range cases {
		x0 := 0.0
		if c.cond == material.Axisymmetric {
			x0 = 10
		}
		msh, err := mesh.Rect(x0, 0, x0+40, 20, 5, 3, mesh.Region{Name: "block", Thickness: 3, Material: "steel"}, c.kind)
		if err != nil {
			t.Fatal(err)
		}
		m, err := NewModel(msh, steel, Options{Condition: c.cond})
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range []Direction{X, Z} {
			if err := m.FixSet("bottom", d, 0); err != nil {
				t.Fatal(err)
			}
		}
		if err := m.AddPressure("top", 5); err != nil {
			t.Fatal(err)
		}
		sol, err := m.SolveLinear(LinearOptions{})
		if err != nil {
			t.Fatal(err)
		}
		rx, rz, _ := sol.Reaction("bottom")
		// The supports push up with the load's resultant. In an axisymmetric
		// body radial nodal forces are no resultant (hoop stress balances
		// them), so rx is checked in plane models only.
		if c.cond == material.Axisymmetric {
			rx = 0
		}
		if math.Abs(rz-c.want) > 1e-9*c.want || math.Abs(rx) > 1e-9*c.want {
			t.Errorf("%s: bottom reaction (%g, %g), want (0, %g)", c.name, rx, rz, c.want)
		}
	}
}
