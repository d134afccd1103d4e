package verify

import (
	"fmt"
	"math"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// runKirsch: a square plate with a central circular hole under uniaxial
// tension σ0 in x, a quarter modelled with symmetry, the outer boundary at
// 20 hole radii. Kirsch's solution (Timoshenko & Goodier) for the infinite
// plate gives σ_xx = 3σ0 at the hole edge on the axis across the load.
func runKirsch(o Options) (*Outcome, error) {
	const (
		radius = 10.0  // hole radius a, mm
		half   = 200.0 // plate half-width, mm (20 a)
		sigma0 = 100.0 // remote tension, MPa
	)
	c := radius / math.Sqrt2
	plan := mesh.Plan{
		Vertices: []mesh.Point{{X: radius}, {X: half}, {X: half, Z: half}, {X: c, Z: c}, {Z: half}, {Z: radius}},
		Curves: []mesh.Curve{
			{From: 3, To: 0, At: mesh.Arc(mesh.Point{}, mesh.Point{X: c, Z: c}, mesh.Point{X: radius})},
			{From: 5, To: 3, At: mesh.Arc(mesh.Point{}, mesh.Point{Z: radius}, mesh.Point{X: c, Z: c})},
		},
		Blocks: []mesh.Block{
			{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{24, 12}, Grading: [2]float64{25, 1}, Region: "plate",
				Sides: [4]string{"symmetry_z", "far_x", "", "hole"}},
			{Corners: [4]int{3, 2, 4, 5}, Divisions: [2]int{24, 12}, Grading: [2]float64{25, 1}, Region: "plate",
				Sides: [4]string{"", "far_z", "symmetry_x", "hole"}},
		},
		Regions: []mesh.Region{{Name: "plate", Thickness: 10, Material: "steel"}},
		Sets:    []mesh.VertexSet{{Name: "peak", Vertex: 5}},
	}
	out := &Outcome{}
	msh, err := buildMesh(plan, mesh.Quad8)
	if err != nil {
		return nil, fmt.Errorf("Kirsch: %w", err)
	}
	m, err := fem.NewModel(msh, map[string]material.Law{"steel": material.Elastic{E: 210000, Nu: 0.3}},
		fem.Options{Condition: material.PlaneStress})
	if err != nil {
		return nil, err
	}
	if err := fixSymmetry(m); err != nil {
		return nil, err
	}
	if err := m.AddTraction("far_x", sigma0, 0); err != nil {
		return nil, err
	}
	sol, err := solve(o, out, "kirsch", "Kirsch plate with hole Q8", m)
	if err != nil {
		return nil, err
	}
	stress, err := sol.NodalStress()
	if err != nil {
		return nil, err
	}
	got := stress[msh.NodeSets["peak"][0]][0] / sigma0
	out.Rows = append(out.Rows, Row{
		Case: "kirsch", Quantity: "K_t = σ_xx / σ0 at the hole edge across the load", Unit: "-",
		Computed: got, Reference: 3, Error: relErr(got, 3), Tolerance: 0.02,
		Source: "Kirsch (Timoshenko & Goodier)",
	})
	return out, nil
}
