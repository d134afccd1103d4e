package verify

import (
	"fmt"
	"math"

	"flangeseg/contact"
	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// pushModel sets up a displacement-driven contact case: the node sets in
// symmetry hold x, bottom holds z, and top becomes a rigid edge about ref
// (no rotation, length free) whose Axial master contactSolve moves.
func pushModel(msh *mesh.Mesh, steel material.Elastic, cond material.Condition, symmetry []string, bottom, top string, ref mesh.Point) (*fem.Model, fem.RigidEdge, error) {
	m, err := fem.NewModel(msh, map[string]material.Law{"steel": steel}, fem.Options{Condition: cond})
	if err != nil {
		return nil, fem.RigidEdge{}, err
	}
	for _, set := range symmetry {
		if err := m.FixSet(set, fem.X, 0); err != nil {
			return nil, fem.RigidEdge{}, err
		}
	}
	if err := m.FixSet(bottom, fem.Z, 0); err != nil {
		return nil, fem.RigidEdge{}, err
	}
	edge, err := m.AddRigidEdge(top, ref, fem.RigidEdgeOptions{FixRotation: true, LateralFree: true})
	return m, edge, err
}

// contactSolve runs a displacement-controlled contact problem: the rigid
// edge's Axial master is moved to w in a few increments.
func contactSolve(m *fem.Model, pairs []fem.ContactPair, edge fem.RigidEdge, w float64, steps int) (*fem.Solver, error) {
	if err := m.Fix(edge.Axial, 0); err != nil {
		return nil, err
	}
	s, err := fem.NewSolver(m, pairs, fem.NewtonOptions{})
	if err != nil {
		return nil, err
	}
	err = s.Ramp(edge.Axial, w, fem.RampOptions{Increments: steps}, func(fem.Increment) (bool, error) { return false, nil })
	return s, err
}

// runContactPatch: two blocks pressed together through non-matching meshes
// (7 elements over 5) by a uniform displacement of the upper block's top.
// The contact pressure must come out uniform (contact patch test, Taylor &
// Papadopoulos 1991) and equal to the applied force over the area.
func runContactPatch(o Options) (*Outcome, error) {
	const width, height, thick = 10.0, 5.0, 1.0
	plan := mesh.Plan{
		Vertices: []mesh.Point{{X: 0, Z: -height}, {X: width, Z: -height}, {X: width, Z: 0}, {X: 0, Z: 0},
			{X: 0, Z: 0}, {X: width, Z: 0}, {X: width, Z: height}, {X: 0, Z: height}},
		Blocks: []mesh.Block{
			{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{5, 3}, Region: "lower", Sides: [4]string{"lower_bottom", "", "lower_top", "lower_left"}},
			{Corners: [4]int{4, 5, 6, 7}, Divisions: [2]int{7, 3}, Region: "upper", Sides: [4]string{"upper_bottom", "", "upper_top", "upper_left"}},
		},
		Regions: []mesh.Region{{Name: "lower", Thickness: thick, Material: "steel"}, {Name: "upper", Thickness: thick, Material: "steel"}},
	}
	// The two bodies touch, so their corner nodes coincide: mesh.Check's
	// duplicate-node test does not apply across bodies, hence Build alone.
	msh, err := mesh.Build(plan, mesh.Quad8)
	if err != nil {
		return nil, fmt.Errorf("contact patch: %w", err)
	}
	steel := material.Elastic{E: 210000, Nu: 0.3}
	m, edge, err := pushModel(msh, steel, material.PlaneStress, []string{"lower_left", "upper_left"},
		"lower_bottom", "upper_top", mesh.Point{X: width / 2, Z: height})
	if err != nil {
		return nil, err
	}
	pair, err := fem.NewContactPair("patch", msh, "upper_bottom", "lower_top",
		contact.Settings{Penalty: 1e3 * steel.E / height}, nil, func(x, z float64) float64 { return thick })
	if err != nil {
		return nil, err
	}
	s, err := contactSolve(m, []fem.ContactPair{pair}, edge, -0.005, 2)
	if err != nil {
		return nil, fmt.Errorf("contact patch: %w", err)
	}
	force, err := s.Reaction(edge.Axial)
	if err != nil {
		return nil, err
	}
	want := -force / (width * thick)
	worst, at := 0.0, 0.0
	for _, r := range pair.NodeResults(s.Current()) {
		if e := math.Abs(r.Pressure-want) / want; e >= worst {
			worst, at = e, r.Pressure
		}
	}
	out := &Outcome{Rows: []Row{{
		Case: "contact-patch", Quantity: "contact pressure at the worst node, non-matching 7/5 elements", Unit: "MPa",
		Computed: at, Reference: want, Error: worst, Tolerance: 0.01,
		Source: "contact patch test (Taylor & Papadopoulos 1991)",
	}}}
	snap, err := s.Snapshot()
	if err != nil {
		return nil, err
	}
	out.Snapshots = append(out.Snapshots, Snapshot{Name: "contact patch", Solution: snap})
	return out, nil
}
