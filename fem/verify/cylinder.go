package verify

import (
	"fmt"
	"math"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// Lamé's thick-walled cylinder under internal pressure (Timoshenko &
// Goodier, Theory of Elasticity): σ_r = A − B/r², σ_θ = A + B/r² with
// A = p a²/(b² − a²), B = p a² b²/(b² − a²), in plane strain (ε_z = 0).
const (
	lameInner    = 100.0 // a, mm
	lameOuter    = 200.0 // b, mm
	lamePressure = 100.0 // p, MPa
)

func lame(r float64) (sr, st float64) {
	a2, b2 := lameInner*lameInner, lameOuter*lameOuter
	A := lamePressure * a2 / (b2 - a2)
	B := lamePressure * a2 * b2 / (b2 - a2)
	return A - B/(r*r), A + B/(r*r)
}

func runLame(o Options) (*Outcome, error) {
	out := &Outcome{}
	steel := material.Elastic{E: 210000, Nu: 0.3}
	laws := map[string]material.Law{"steel": steel}

	// Axisymmetric: an r–z rectangle held in z top and bottom (ε_z = 0).
	axi, err := mesh.Rect(lameInner, 0, lameOuter, 20, 20, 2,
		mesh.Region{Name: "wall", Thickness: 1, Material: "steel"}, mesh.Quad8)
	if err != nil {
		return nil, fmt.Errorf("Lamé: %w", err)
	}
	m, err := fem.NewModel(axi, laws, fem.Options{Condition: material.Axisymmetric})
	if err != nil {
		return nil, err
	}
	for _, set := range []string{"bottom", "top"} {
		if err := m.FixSet(set, fem.Z, 0); err != nil {
			return nil, err
		}
	}
	if err := m.AddPressure("left", lamePressure); err != nil {
		return nil, err
	}
	sol, err := solve(o, out, "lame", "Lamé axisymmetric Q8 20×2", m)
	if err != nil {
		return nil, err
	}
	out.Rows = append(out.Rows, lameRows("axisymmetric", sol, func(p fem.PointResult) (float64, float64, float64) {
		return p.X, p.Stress[0], p.Stress[2]
	})...)

	// Plane strain: a quarter annulus with symmetry on both cuts.
	ring := mesh.Plan{
		Vertices: []mesh.Point{{X: lameInner}, {X: lameOuter}, {Z: lameOuter}, {Z: lameInner}},
		Curves: []mesh.Curve{
			{From: 1, To: 2, At: mesh.Arc(mesh.Point{}, mesh.Point{X: lameOuter}, mesh.Point{Z: lameOuter})},
			{From: 0, To: 3, At: mesh.Arc(mesh.Point{}, mesh.Point{X: lameInner}, mesh.Point{Z: lameInner})},
		},
		Blocks: []mesh.Block{{
			Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{16, 16}, Grading: [2]float64{3, 1}, Region: "wall",
			Sides: [4]string{"symmetry_z", "outer", "symmetry_x", "inner"},
		}},
		Regions: []mesh.Region{{Name: "wall", Thickness: 1, Material: "steel"}},
	}
	msh, err := buildMesh(ring, mesh.Quad8)
	if err != nil {
		return nil, fmt.Errorf("Lamé: %w", err)
	}
	m, err = fem.NewModel(msh, laws, fem.Options{Condition: material.PlaneStrain})
	if err != nil {
		return nil, err
	}
	if err := fixSymmetry(m); err != nil {
		return nil, err
	}
	if err := m.AddPressure("inner", lamePressure); err != nil {
		return nil, err
	}
	sol, err = solve(o, out, "lame", "Lamé plane strain Q8 16×16, graded", m)
	if err != nil {
		return nil, err
	}
	out.Rows = append(out.Rows, lameRows("plane strain", sol, func(p fem.PointResult) (float64, float64, float64) {
		r := math.Hypot(p.X, p.Z)
		c, s := p.X/r, p.Z/r
		sr := c*c*p.Stress[0] + s*s*p.Stress[1] + 2*c*s*p.Stress[3]
		st := s*s*p.Stress[0] + c*c*p.Stress[1] - 2*c*s*p.Stress[3]
		return r, sr, st
	})...)
	return out, nil
}

// lameRows compares σ_r and σ_θ at every integration point with Lamé; the
// error is the largest deviation over the wall relative to the largest
// stress of that component (σ_r: p, σ_θ: its value at the bore).
func lameRows(label string, sol *fem.Solution, polar func(fem.PointResult) (r, sr, st float64)) []Row {
	_, stMax := lame(lameInner)
	var worstR, worstT, atR, atT, refR, refT float64
	for _, pts := range sol.Points {
		for _, p := range pts {
			r, sr, st := polar(p)
			wr, wt := lame(r)
			if e := math.Abs(sr-wr) / lamePressure; e >= worstR {
				worstR, atR, refR = e, sr, wr
			}
			if e := math.Abs(st-wt) / stMax; e >= worstT {
				worstT, atT, refT = e, st, wt
			}
		}
	}
	src := "Lamé (Timoshenko & Goodier)"
	return []Row{
		{Case: "lame", Quantity: label + ": σ_r at the worst point, max error / p", Unit: "MPa",
			Computed: atR, Reference: refR, Error: worstR, Tolerance: 0.005, Source: src},
		{Case: "lame", Quantity: label + ": σ_θ at the worst point, max error / σ_θ(a)", Unit: "MPa",
			Computed: atT, Reference: refT, Error: worstT, Tolerance: 0.005, Source: src},
	}
}
