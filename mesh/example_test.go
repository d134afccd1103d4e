package mesh_test

import (
	"fmt"
	"math"

	"flangeseg/mesh"
)

// A quarter of a thick ring, 50 mm ≤ r ≤ 100 mm, with curved inner and
// outer sides and elements growing towards the outside.
func ExampleBuild() {
	o := mesh.Point{}
	v := []mesh.Point{{X: 50}, {X: 100}, {Z: 100}, {Z: 50}}
	plan := mesh.Plan{
		Vertices: v,
		Curves: []mesh.Curve{
			{From: 1, To: 2, At: mesh.Arc(o, v[1], v[2])},
			{From: 3, To: 0, At: mesh.Arc(o, v[3], v[0])},
		},
		Blocks: []mesh.Block{{
			Corners:   [4]int{0, 1, 2, 3},
			Divisions: [2]int{4, 8},
			Grading:   [2]float64{2, 1},
			Region:    "ring",
			Sides:     [4]string{"x_axis", "outer", "z_axis", "inner"},
		}},
		Regions: []mesh.Region{{Name: "ring", Thickness: 1, Material: "steel"}},
	}
	m, err := mesh.Build(plan, mesh.Quad8)
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := m.Check(); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(len(m.Nodes), "nodes,", len(m.Elements), "elements")
	fmt.Println("edge sets:", m.EdgeSetNames())
	fmt.Printf("area %.4f of %.4f mm²\n", m.Area(), math.Pi*(100*100-50*50)/4)
	// Output:
	// 121 nodes, 32 elements
	// edge sets: [inner outer x_axis z_axis]
	// area 5890.4680 of 5890.4862 mm²
}

func ExampleRect() {
	m, err := mesh.Rect(0, 0, 20, 10, 4, 2, mesh.Region{Name: "plate", Thickness: 5}, mesh.Quad4)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(len(m.Nodes), "nodes; left edge nodes", m.NodeSets["left"])
	// Output:
	// 15 nodes; left edge nodes [0 5 10]
}

// The shape measures of one trapezoidal element, 20 mm wide at the base and
// 10 mm at the top.
func ExampleMesh_Quality() {
	m, err := mesh.Build(mesh.Plan{
		Vertices: []mesh.Point{{X: 0, Z: 0}, {X: 20, Z: 0}, {X: 15, Z: 10}, {X: 5, Z: 10}},
		Blocks:   []mesh.Block{{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{1, 1}, Region: "plate"}},
		Regions:  []mesh.Region{{Name: "plate", Thickness: 5}},
	}, mesh.Quad4)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(m.Quality())
	// Output:
	// elements:       1
	// Jacobian ratio: min 0.500 (element 0)
	// aspect ratio:   max 2 (element 0)
	// corner angles:  63.4° to 116.6°
}
