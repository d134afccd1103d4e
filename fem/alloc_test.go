package fem

import (
	"fmt"
	"testing"

	"flangeseg/material"
	"flangeseg/mesh"
)

// An element evaluation allocates nothing — force and tangent, with and
// without point results — in the elastic, the elastoplastic small-strain
// and the finite-strain paths, yielding or not, in every condition: its
// working memory is the calling worker's scratch.
func TestElementResponseAllocatesNothing(t *testing.T) {
	laws := kernelLaws(t)
	cases := []struct {
		name string
		kin  Kinematics
		law  material.Law
	}{
		{"elastic, small strain", SmallStrain{}, laws[0]},
		{"elastoplastic, small strain", SmallStrain{}, laws[1]},
		{"elastic, finite strain", FiniteStrain{}, laws[0]},
		{"elastoplastic, finite strain", FiniteStrain{}, laws[1]},
	}
	for _, tc := range cases {
		for _, c := range []material.Condition{material.PlaneStress, material.PlaneStrain, material.Axisymmetric} {
			for _, strain := range []float64{1e-4, 0.02} { // below and past yield
				name := fmt.Sprintf("%s, %v, strain %g", tc.name, c, strain)
				m := oneElement(t, mesh.Quad8, c, tc.law)
				m.kin = tc.kin
				if err := m.SetFoundation("block", 30, 0); err != nil {
					t.Fatal(err)
				}
				if err := m.SetEigenstrain("block", material.Vec4{0, -1e-4, 0, 0}); err != nil {
					t.Fatal(err)
				}
				m.cacheGeometry()
				u := elementDisplacements(m, imposed([2][2]float64{{1 + strain, strain / 2}, {0, 1 - strain/2}}, strain/20))
				fe, ke := make([]float64, len(u)), make([]float64, len(u)*len(u))
				pts := make([]PointResult, len(m.rule))
				sc := newScratch()
				var err error
				allocs := testing.AllocsPerRun(20, func() {
					if e := m.elementResponse(0, u, fe, ke, nil, sc); e != nil {
						err = e
					}
					if e := m.elementResponse(0, u, fe, nil, pts, sc); e != nil {
						err = e
					}
				})
				if err != nil {
					t.Fatalf("%s: %v", name, err)
				}
				if allocs != 0 {
					t.Errorf("%s: %g allocations per element evaluation, want 0", name, allocs)
				}
			}
		}
	}
}

// An assembly of tangent and internal force allocates the same small
// number of times for 100 and for 400 yielding finite-strain elements:
// nothing per element in a Newton iteration.
func TestAssemblyAllocationsDoNotGrowWithElements(t *testing.T) {
	law := kernelLaws(t)[1]
	var counts []float64
	for _, n := range []int{10, 20} {
		msh, err := mesh.Rect(0, 0, 10, 10, n, n, mesh.Region{Name: "block", Thickness: 3, Material: "steel"}, mesh.Quad8)
		if err != nil {
			t.Fatal(err)
		}
		m, err := NewModel(msh, map[string]material.Law{"steel": law}, Options{Condition: material.PlaneStress, Kinematics: FiniteStrain{}})
		if err != nil {
			t.Fatal(err)
		}
		if err := m.FixSet("bottom", Z, 0); err != nil {
			t.Fatal(err)
		}
		m.Number()
		a := newAssembler(m)
		k, err := a.pattern()
		if err != nil {
			t.Fatal(err)
		}
		u := make([]float64, m.nDof)
		for i := range m.mesh.Nodes {
			p := m.mesh.Nodes[i]
			u[m.NodeDof(i, X)], u[m.NodeDof(i, Z)] = 0.01*p.X, -0.005*p.Z+0.001*p.X*p.X/10
		}
		fint := make([]float64, m.nDof)
		if err := a.assemble(u, fint, k, nil); err != nil { // first call: buffers
			t.Fatal(err)
		}
		counts = append(counts, testing.AllocsPerRun(5, func() {
			if err := a.assemble(u, fint, k, nil); err != nil {
				t.Fatal(err)
			}
		}))
	}
	t.Logf("allocations per assembly: %v for 100 and 400 elements", counts)
	if counts[1] > counts[0] || counts[0] > 16 {
		t.Errorf("allocations per assembly: %g for 100 elements, %g for 400: want a few, not growing", counts[0], counts[1])
	}
}
