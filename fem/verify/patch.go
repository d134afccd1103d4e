package verify

import (
	"fmt"
	"math"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// patchPlan is a square patch of four distorted blocks around an interior
// vertex, with the boundary vertices moved along the boundary: every
// element is a general straight-sided quadrilateral. x0 shifts the patch
// off the axis for the axisymmetric case.
func patchPlan(x0 float64) mesh.Plan {
	p := func(x, z float64) mesh.Point { return mesh.Point{X: x0 + x, Z: z} }
	v := []mesh.Point{
		p(0, 0), p(3, 0), p(10, 0),
		p(0, 4), p(5.7, 4.3), p(10, 6.5),
		p(0, 10), p(6.5, 10), p(10, 10),
	}
	blk := func(a, b, c, d int) mesh.Block {
		return mesh.Block{Corners: [4]int{a, b, c, d}, Divisions: [2]int{2, 2}, Grading: [2]float64{1.7, 0.6}, Region: "patch"}
	}
	return mesh.Plan{
		Vertices: v,
		Blocks:   []mesh.Block{blk(0, 1, 4, 3), blk(1, 2, 5, 4), blk(3, 4, 7, 6), blk(4, 5, 8, 7)},
		Regions:  []mesh.Region{{Name: "patch", Thickness: 2.5, Material: "steel"}},
	}
}

// linearField is an imposed displacement with constant strain. In the
// axisymmetric case u_x must be proportional to x for the hoop strain u_x/x
// to be constant, and the shear must vanish: a constant τ_xz is not in
// equilibrium there (∂τ/∂x + ∂σ_zz/∂z + τ/x = 0).
type linearField struct{ ax, axx, axz, az, azx, azz float64 }

func (f linearField) at(p mesh.Point) (float64, float64) {
	return f.ax + f.axx*p.X + f.axz*p.Z, f.az + f.azx*p.X + f.azz*p.Z
}

func (f linearField) strain(c material.Condition) material.Vec4 {
	e := material.Vec4{f.axx, f.azz, 0, f.axz + f.azx}
	if c == material.Axisymmetric {
		e[2] = f.axx
	}
	return e
}

func runPatch(o Options) (*Outcome, error) {
	out := &Outcome{}
	steel := material.Elastic{E: 210000, Nu: 0.3}
	general := linearField{ax: 0.01, axx: 1e-3, axz: 2e-4, az: -0.02, azx: -5e-4, azz: 3e-4}
	axi := linearField{axx: 1e-3, az: 0.01, azz: -4e-4}
	cases := []struct {
		name string
		cond material.Condition
		kind mesh.Kind
		form fem.Formulation
		f    linearField
		x0   float64
	}{
		{"Q8 plane stress", material.PlaneStress, mesh.Quad8, fem.Standard, general, 0},
		{"Q8 plane strain", material.PlaneStrain, mesh.Quad8, fem.Standard, general, 0},
		{"Q8 axisymmetric", material.Axisymmetric, mesh.Quad8, fem.Standard, axi, 5},
		{"Q4 plane stress", material.PlaneStress, mesh.Quad4, fem.Standard, general, 0},
		{"Q4 incompatible, plane stress", material.PlaneStress, mesh.Quad4, fem.IncompatibleModes, general, 0},
		{"Q4 incompatible, plane strain", material.PlaneStrain, mesh.Quad4, fem.IncompatibleModes, general, 0},
		{"Q4 incompatible, axisymmetric", material.Axisymmetric, mesh.Quad4, fem.IncompatibleModes, axi, 5},
	}
	for _, tc := range cases {
		msh, err := buildMesh(patchPlan(tc.x0), tc.kind)
		if err != nil {
			return nil, fmt.Errorf("patch %s: %w", tc.name, err)
		}
		m, err := fem.NewModel(msh, map[string]material.Law{"steel": steel}, fem.Options{Condition: tc.cond, Formulation: tc.form})
		if err != nil {
			return nil, fmt.Errorf("patch %s: %w", tc.name, err)
		}
		boundary := patchBoundary(msh, tc.x0)
		for _, n := range boundary {
			ux, uz := tc.f.at(msh.Nodes[n])
			if err := m.Fix(m.NodeDof(n, fem.X), ux); err != nil {
				return nil, err
			}
			if err := m.Fix(m.NodeDof(n, fem.Z), uz); err != nil {
				return nil, err
			}
		}
		sol, err := solve(o, out, "patch", "patch "+tc.name, m)
		if err != nil {
			return nil, err
		}
		var want material.Vec4
		var tangent material.Mat4
		if err := steel.Respond(tc.cond, tc.f.strain(tc.cond), nil, nil, &want, &tangent); err != nil {
			return nil, err
		}
		scale := math.Max(math.Abs(want[0]), math.Max(math.Abs(want[1]), math.Abs(want[3])))
		worst, worstVal, worstRef := 0.0, 0.0, 0.0
		for _, pts := range sol.Points {
			for _, p := range pts {
				for c := 0; c < 4; c++ {
					if e := math.Abs(p.Stress[c]-want[c]) / scale; e > worst || (worst == 0 && c == 0) {
						worst, worstVal, worstRef = e, p.Stress[c], want[c]
					}
				}
			}
		}
		out.Rows = append(out.Rows, Row{
			Case: "patch", Quantity: tc.name + ": stress at the worst point, max error / max |σ|", Unit: "MPa",
			Computed: worstVal, Reference: worstRef, Error: worst, Tolerance: 1e-8,
			Source: "Irons' patch test",
		})
		dispErr := 0.0
		for n, p := range msh.Nodes {
			ux, uz := sol.Displacement(n)
			ex, ez := tc.f.at(p)
			dispErr = math.Max(dispErr, math.Hypot(ux-ex, uz-ez)/0.01)
		}
		out.Rows = append(out.Rows, Row{
			Case: "patch", Quantity: tc.name + ": interior displacement, max error / 0.01 mm", Unit: "-",
			Computed: dispErr, Error: dispErr, Tolerance: 1e-8, Source: "Irons' patch test",
		})
	}
	return out, nil
}

// patchBoundary lists the nodes on the outer square.
func patchBoundary(m *mesh.Mesh, x0 float64) []int {
	var b []int
	for n, p := range m.Nodes {
		x := p.X - x0
		if x < 1e-9 || x > 10-1e-9 || p.Z < 1e-9 || p.Z > 10-1e-9 {
			b = append(b, n)
		}
	}
	return b
}
