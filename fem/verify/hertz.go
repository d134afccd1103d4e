package verify

import (
	"fmt"
	"math"

	"flangeseg/contact"
	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// runHertz: a cylinder pressed onto a flat block, plane strain, a quarter
// of the cylinder and half of the block by symmetry about x = 0. The top
// of the quarter cylinder (its horizontal radius) is moved down as a rigid
// edge; the line load P is the reaction there. Hertz (K. L. Johnson,
// Contact Mechanics, 1985, ch. 4): half-width a = √(4PR/(πE*)), peak
// pressure p0 = 2P/(πa), 1/E* = (1 − ν₁²)/E₁ + (1 − ν₂²)/E₂.
func runHertz(o Options) (*Outcome, error) {
	const (
		radius = 100.0 // R, mm
		block  = 100.0 // half-width and depth of the flat block, mm
		push   = 0.6   // downward motion of the cylinder's centre line, mm
	)
	steel := material.Elastic{E: 210000, Nu: 0.3}
	msh, err := mesh.Build(hertzPlan(radius, block), mesh.Quad8)
	if err != nil {
		return nil, fmt.Errorf("Hertz: %w", err)
	}
	m, edge, err := pushModel(msh, steel, material.PlaneStrain, []string{"cylinder_axis", "block_axis"},
		"block_bottom", "cylinder_top", mesh.Point{X: 0, Z: radius})
	if err != nil {
		return nil, err
	}
	pair, err := fem.NewContactPair("hertz", msh, "cylinder_surface", "block_top",
		contact.Settings{Penalty: 1e3 * steel.E / radius, FrozenGeometry: true}, nil, nil)
	if err != nil {
		return nil, err
	}
	s, err := contactSolve(m, []fem.ContactPair{pair}, edge, -push, 4)
	if err != nil {
		return nil, fmt.Errorf("Hertz: %w", err)
	}
	half, err := s.Reaction(edge.Axial)
	if err != nil {
		return nil, err
	}
	load := -2 * half // line load on the whole cylinder, N/mm
	estar := 1 / (2 * (1 - steel.Nu*steel.Nu) / steel.E)
	a := math.Sqrt(4 * load * radius / (math.Pi * estar))
	p0 := 2 * load / (math.Pi * a)

	res := pair.NodeResults(s.Current())
	peak, width := 0.0, 0.0
	for i, r := range res {
		peak = math.Max(peak, r.Pressure)
		// The edge of the contact: between the last loaded node and the
		// next, where the pressure extrapolates to zero.
		if r.Pressure > 0 && i+1 < len(res) && res[i+1].Pressure <= 0 {
			width = math.Max(width, r.X)
		}
		if r.Pressure > 0 && i > 0 && res[i-1].Pressure <= 0 {
			width = math.Max(width, r.X)
		}
	}
	out := &Outcome{Rows: []Row{
		{Case: "hertz", Quantity: fmt.Sprintf("peak contact pressure p0, P = %.0f N/mm", load), Unit: "MPa",
			Computed: peak, Reference: p0, Error: relErr(peak, p0), Tolerance: 0.05, Source: "Hertz; Johnson, Contact Mechanics (1985), ch. 4"},
		{Case: "hertz", Quantity: "contact half-width a (last node in contact)", Unit: "mm",
			Computed: width, Reference: a, Error: relErr(width, a), Tolerance: 0.05, Source: "Hertz; Johnson, Contact Mechanics (1985), ch. 4"},
	}}
	snap, err := s.Snapshot()
	if err != nil {
		return nil, err
	}
	out.Snapshots = append(out.Snapshots, Snapshot{Name: "hertz cylinder on flat", Solution: snap})
	return out, nil
}

// hertzPlan is a quarter cylinder (centre (0, R), touching z = 0 at the
// origin) as three blocks around an inner square, and a flat block below
// z = 0, both graded towards the contact point.
func hertzPlan(r, w float64) mesh.Plan {
	const n = 24   // divisions along each arc half and radially
	const g = 40.0 // grading: element length ratio across a block
	s := math.Sqrt2 / 2
	q := 0.5 * r // inner square half size
	c := mesh.Point{X: 0, Z: r}
	v := []mesh.Point{
		{X: 0, Z: r - q},       // 0 P1, on the axis
		{X: 0, Z: 0},           // 1 A, contact point
		{X: r * s, Z: r - r*s}, // 2 M, arc at 45°
		{X: q * s, Z: r - q*s}, // 3 P2
		{X: r, Z: r},           // 4 B, equator
		{X: q, Z: r},           // 5 P3
		c,                      // 6 C, centre
		{X: 0, Z: -w},          // 7 block corners
		{X: w, Z: -w},          // 8
		{X: w, Z: 0},           // 9
		{X: 0, Z: 0},           // 10 block top at the axis
	}
	return mesh.Plan{
		Vertices: v,
		Curves: []mesh.Curve{
			{From: 1, To: 2, At: mesh.Arc(c, v[1], v[2])},
			{From: 2, To: 4, At: mesh.Arc(c, v[2], v[4])},
		},
		Blocks: []mesh.Block{
			// Below the inner square: the arc from A to M, graded to A.
			{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{n, n}, Grading: [2]float64{1 / g, g}, Region: "cylinder",
				Sides: [4]string{"cylinder_axis", "cylinder_surface", "", ""}},
			// Beside it: the arc from M to B.
			{Corners: [4]int{3, 2, 4, 5}, Divisions: [2]int{n, n / 2}, Grading: [2]float64{1 / g, 1}, Region: "cylinder",
				Sides: [4]string{"", "cylinder_surface", "cylinder_top", ""}},
			// The inner square.
			{Corners: [4]int{6, 0, 3, 5}, Divisions: [2]int{n / 2, n}, Grading: [2]float64{1, g}, Region: "cylinder",
				Sides: [4]string{"cylinder_axis", "", "", "cylinder_top"}},
			// The flat block, fine at the contact point (0, 0).
			{Corners: [4]int{7, 8, 9, 10}, Divisions: [2]int{n, n}, Grading: [2]float64{g, 1 / g}, Region: "block",
				Sides: [4]string{"block_bottom", "", "block_top", "block_axis"}},
		},
		Regions: []mesh.Region{{Name: "cylinder", Thickness: 1, Material: "steel"}, {Name: "block", Thickness: 1, Material: "steel"}},
	}
}
