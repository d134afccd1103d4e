package verify

import (
	"fmt"
	"math"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// LE1 (The Standard NAFEMS Benchmarks, 1990): a quarter of an elliptic
// membrane between the ellipses (x/2)² + (y/1)² = 1 and (x/3.25)² +
// (y/2.75)² = 1 (m), 0.1 m thick, E = 210 GPa, ν = 0.3, plane stress, a
// uniform outward pressure of 10 MPa on the outer edge. Target: σ_yy at
// D = (2, 0) is 92.7 MPa. Here in mm, with the section's z as the
// benchmark's y.
const le1Target = 92.7

// le1Meshes are the mesh densities (elements along the arcs, across).
var le1Meshes = []struct {
	name    string
	nt, nr  int
	checked bool // compared with the target; the coarser ones show convergence
}{
	{"coarse 3×2", 3, 2, false},
	{"medium 6×4", 6, 4, false},
	{"fine 12×8", 12, 8, true},
	{"finer 24×16", 24, 16, true},
}

func le1Plan(nt, nr int) mesh.Plan {
	o := mesh.Point{}
	return mesh.Plan{
		Vertices: []mesh.Point{{X: 2000, Z: 0}, {X: 3250, Z: 0}, {X: 0, Z: 2750}, {X: 0, Z: 1000}},
		Curves: []mesh.Curve{
			{From: 1, To: 2, At: mesh.EllipseArc(o, 3250, 2750, 0, math.Pi/2)},
			{From: 0, To: 3, At: mesh.EllipseArc(o, 2000, 1000, 0, math.Pi/2)},
		},
		Blocks: []mesh.Block{{
			Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{nr, nt}, Region: "membrane",
			Sides: [4]string{"symmetry_z", "outer", "symmetry_x", "inner"},
		}},
		Regions: []mesh.Region{{Name: "membrane", Thickness: 100, Material: "steel"}},
		Sets:    []mesh.VertexSet{{Name: "D", Vertex: 0}},
	}
}

func runLE1(o Options) (*Outcome, error) {
	out := &Outcome{}
	steel := material.Elastic{E: 210000, Nu: 0.3}
	var values []float64
	for _, mc := range le1Meshes {
		msh, err := buildMesh(le1Plan(mc.nt, mc.nr), mesh.Quad8)
		if err != nil {
			return nil, fmt.Errorf("LE1: %w", err)
		}
		m, err := fem.NewModel(msh, map[string]material.Law{"steel": steel}, fem.Options{Condition: material.PlaneStress})
		if err != nil {
			return nil, err
		}
		if err := fixSymmetry(m); err != nil {
			return nil, err
		}
		if err := m.AddPressure("outer", -10); err != nil { // outward: a negative pressure
			return nil, err
		}
		sol, err := solve(o, out, "LE1", "LE1 Q8 "+mc.name, m)
		if err != nil {
			return nil, err
		}
		stress, err := sol.NodalStress()
		if err != nil {
			return nil, err
		}
		got := stress[msh.NodeSets["D"][0]][1]
		values = append(values, got)
		if mc.checked {
			out.Rows = append(out.Rows, Row{
				Case: "LE1", Quantity: "σ_yy at D, " + mc.name, Unit: "MPa",
				Computed: got, Reference: le1Target, Error: relErr(got, le1Target), Tolerance: 0.02,
				Source: "NAFEMS LE1 (1990), σ_yy at D",
			})
		}
	}
	out.Rows = append(out.Rows, le1Convergence(values))
	return out, nil
}

// le1Convergence checks that the change of σ_yy at D between successive
// meshes shrinks with every refinement; Error is the largest ratio of a
// change to the one before it, which must stay below 1.
func le1Convergence(v []float64) Row {
	worst := 0.0
	for i := 2; i < len(v); i++ {
		worst = math.Max(worst, math.Abs(v[i]-v[i-1])/math.Abs(v[i-1]-v[i-2]))
	}
	q := "σ_yy at D on "
	for i, mc := range le1Meshes {
		if i > 0 {
			q += ", "
		}
		q += fmt.Sprintf("%s %.2f", mc.name, v[i])
	}
	return Row{
		Case: "LE1", Quantity: q + ": largest ratio of successive changes", Unit: "-",
		Computed: worst, Reference: 1, Error: worst, Tolerance: 1,
		Source: "convergence under mesh refinement (NAFEMS LE1 meshes coarse → fine)",
	}
}
