package mesh_test

import (
	"errors"
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

// One bolt segment of an invented tower joint: a 28 mm shell on 90 mm
// flanges with a 20 mm neck fillet and an M48 bolt.
func ExampleBuildFlangeSegment() {
	g := mesh.FlangeSegment{
		ShellThickness: 28, ShellLength: 400, FlangeThickness: 90, A: 75, B: 85,
		SegmentWidth: 130, NeckRadius: 20,
		BoltDiameter: 48, HoleDiameter: 52, WasherOuter: 92, WasherThickness: 8,
		HeadHeight: 30, NutHeight: 38, StressArea: 1473, ThreadInClamp: 60,
		FaceLines:   []float64{-50, 60}, // edges of the contact zones
		ElementSize: 8, Refine: 0.3, Kind: mesh.Quad8,
	}
	m, err := mesh.BuildFlangeSegment(g, mesh.FlangeMaterials{Shell: "S355", Flange: "S355", Bolt: "10.9"})
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := m.Check(); err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range m.Regions {
		fmt.Printf("%-17s %6.2f mm  %s\n", r.Name, r.Thickness, r.Material)
	}
	fmt.Println(m.EdgeSetNames())
	// Output:
	// upper_shell       130.00 mm  S355
	// upper_flange      130.00 mm  S355
	// upper_flange_hole  78.00 mm  S355
	// lower_shell       130.00 mm  S355
	// lower_flange      130.00 mm  S355
	// lower_flange_hole  78.00 mm  S355
	// bolt_head         113.10 mm  10.9
	// head_washer       113.10 mm  10.9
	// bolt_shank         43.53 mm  10.9
	// bolt_thread        35.43 mm  10.9
	// bolt_preload       43.53 mm  10.9
	// nut               113.10 mm  10.9
	// nut_washer        113.10 mm  10.9
	// [bolt_interface bolt_under_head head_bearing lower_bottom lower_end lower_face lower_shell_inner lower_shell_outer nut_bearing upper_end upper_face upper_shell_inner upper_shell_outer upper_top]
}

// Validate reports every broken rule; FieldError.Field names the field for
// a program that maps it onto its own input keys.
func ExampleFlangeSegment_Validate() {
	g := mesh.FlangeSegment{
		ShellThickness: 28, ShellLength: 400, FlangeThickness: 90, A: 75, B: 85,
		SegmentWidth: 130, BoltDiameter: 36, HoleDiameter: 36, WasherOuter: 66,
		WasherThickness: 6, HeadHeight: 22.5, NutHeight: 31, StressArea: 817,
		FullThread: true, ElementSize: 8, Refine: 1.5, Kind: mesh.Quad8,
	}
	err := g.Validate()
	fmt.Println(err)
	var fe mesh.FieldErrors
	if errors.As(err, &fe) {
		for _, e := range fe {
			fmt.Println(e.Field, e.Value)
		}
	}
	// Output:
	// bolt hole diameter 36 mm: must exceed the bolt diameter 36 mm
	// refinement factor 1.5: must be greater than 0 and at most 1
	// HoleDiameter 36
	// Refine 1.5
}
