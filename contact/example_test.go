package contact_test

import (
	"fmt"

	"flangeseg/contact"
)

// A block face (nodes 0–2, body above) pressed 0.01 mm into a flat master
// (nodes 3–5, body below), with a 3 mm strip thickness.
func Example() {
	ref := []contact.Point{
		{X: 0, Z: 0}, {X: 5, Z: 0}, {X: 10, Z: 0}, // slave, walking +x
		{X: 11, Z: 0}, {X: 5, Z: 0}, {X: -1, Z: 0}, // master, walking −x
	}
	slave := contact.Surface{Segments: [][]int{{0, 1}, {1, 2}}}
	master := contact.Surface{Segments: [][]int{{3, 4}, {4, 5}}}
	thickness := func(x, z float64) float64 { return 3 }
	pair, err := contact.NewPair("face", slave, master, ref, contact.Settings{Penalty: 1000}, nil, thickness)
	if err != nil {
		fmt.Println(err)
		return
	}
	cur := append([]contact.Point(nil), ref...)
	for n := 0; n < 3; n++ {
		cur[n].Z -= 0.01
	}
	fz := 0.0
	err = pair.Evaluate(cur, true, func(dofs []int, f, k []float64) error {
		for i, d := range dofs {
			if d%2 == 1 && d/2 < 3 { // z of a slave node
				fz += f[i]
			}
		}
		return nil
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	force, x := pair.Resultant(cur)
	fmt.Printf("internal force on the slave %.1f N; resultant %.1f N at x = %.1f mm\n", fz, force, x)
	for _, r := range pair.NodeResults(cur) {
		fmt.Printf("node %d: pressure %.1f MPa, gap %.3f mm\n", r.Node, r.Pressure, r.Gap)
	}
	// Output:
	// internal force on the slave -300.0 N; resultant 300.0 N at x = 5.0 mm
	// node 0: pressure 10.0 MPa, gap -0.010 mm
	// node 1: pressure 10.0 MPa, gap -0.010 mm
	// node 2: pressure 10.0 MPa, gap -0.010 mm
}
