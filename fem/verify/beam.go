package verify

import (
	"fmt"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// runCantilever: a plane-stress cantilever, L/h = 10, clamped at x = 0 and
// loaded by a uniform shear traction on its free end, two elements through
// the depth: Q8, and the Q4 with incompatible modes. Reference: Timoshenko beam theory (Timoshenko & Gere,
// Mechanics of Materials), δ = PL³/(3EI) + PL/(κGA) with κ = 5/6.
func runCantilever(o Options) (*Outcome, error) {
	const (
		length = 1000.0 // L, mm
		depth  = 100.0  // h, mm
		width  = 10.0   // out-of-plane thickness, mm
		force  = 1000.0 // P, N
	)
	steel := material.Elastic{E: 210000, Nu: 0.3}
	area := depth * width
	inertia := width * depth * depth * depth / 12
	want := force*length*length*length/(3*steel.E*inertia) + force*length/(5.0/6*steel.ShearModulus()*area)
	out := &Outcome{}
	elements := []struct {
		name string
		kind mesh.Kind
		form fem.Formulation
	}{
		{"Q8", mesh.Quad8, fem.Standard},
		{"Q4 incompatible", mesh.Quad4, fem.IncompatibleModes},
	}
	for _, el := range elements {
		msh, err := mesh.Rect(0, -depth/2, length, depth/2, 20, 2,
			mesh.Region{Name: "beam", Thickness: width, Material: "steel"}, el.kind)
		if err != nil {
			return nil, fmt.Errorf("cantilever: %w", err)
		}
		m, err := fem.NewModel(msh, map[string]material.Law{"steel": steel},
			fem.Options{Condition: material.PlaneStress, Formulation: el.form})
		if err != nil {
			return nil, err
		}
		for _, d := range []fem.Direction{fem.X, fem.Z} { // fully clamped root
			if err := m.FixSet("left", d, 0); err != nil {
				return nil, err
			}
		}
		if err := m.AddTraction("right", 0, -force/(depth*width)); err != nil {
			return nil, err
		}
		sol, err := solve(o, out, "cantilever", "cantilever "+el.name+" 20×2", m)
		if err != nil {
			return nil, err
		}
		_, uz := sol.Displacement(msh.NearestNode(mesh.Point{X: length, Z: 0}))
		out.Rows = append(out.Rows, Row{
			Case: "cantilever", Quantity: el.name + " 20×2: tip deflection at the neutral axis", Unit: "mm",
			Computed: -uz, Reference: want, Error: relErr(-uz, want), Tolerance: 0.01,
			Source: "Timoshenko & Gere, Timoshenko beam, κ = 5/6",
		})
	}
	return out, nil
}
