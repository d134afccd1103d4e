package post

import (
	"flangeseg/fem"
	"flangeseg/material"
)

// SolutionFields turns a solution into VTK data: point data displacement
// (vector), stress_xx, stress_zz, stress_yy, stress_xz and von_mises
// (stresses recovered to the nodes, MPa), and cell data region (the index
// of the element's region).
func SolutionFields(sol *fem.Solution) (point, cell []Field, err error) {
	m := sol.Model().Mesh()
	nn := len(m.Nodes)
	disp := make([]float64, 3*nn)
	for n := 0; n < nn; n++ {
		disp[3*n], disp[3*n+1] = sol.Displacement(n)
	}
	stress, err := sol.NodalStress()
	if err != nil {
		return nil, nil, err
	}
	names := [4]string{"stress_xx", "stress_zz", "stress_yy", "stress_xz"}
	comps := make([][]float64, 4)
	vm := make([]float64, nn)
	for c := range comps {
		comps[c] = make([]float64, nn)
	}
	for n, s := range stress {
		for c := range comps {
			comps[c][n] = s[c]
		}
		vm[n] = material.VonMises(s)
	}
	point = append(point, Field{Name: "displacement", Components: 3, Values: disp})
	for c, name := range names {
		point = append(point, Field{Name: name, Components: 1, Values: comps[c]})
	}
	point = append(point, Field{Name: "von_mises", Components: 1, Values: vm})
	region := make([]float64, len(m.Elements))
	for e, el := range m.Elements {
		region[e] = float64(el.Region)
	}
	cell = append(cell, Field{Name: "region", Components: 1, Values: region})
	return point, cell, nil
}
