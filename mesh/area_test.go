package mesh

import (
	"math"
	"testing"
)

// annulusPlan is the quarter annulus a ≤ r ≤ b, x, z ≥ 0, with nr elements
// across and nt around. The inner arc is given from vertex 0 to 3 and run by
// the block the other way.
func annulusPlan(a, b float64, nr, nt int) Plan {
	o := Point{}
	v := []Point{{a, 0}, {b, 0}, {0, b}, {0, a}}
	return Plan{
		Vertices: v,
		Curves: []Curve{
			{From: 1, To: 2, At: Arc(o, v[1], v[2])},
			{From: 0, To: 3, At: Arc(o, v[0], v[3])},
		},
		Blocks: []Block{{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{nr, nt}, Region: "steel",
			Sides: [4]string{"x_axis", "outer", "z_axis", "inner"}}},
		Regions: []Region{steel},
	}
}

// TestAnnulusArea: the mesh area converges to π(b² − a²)/4, as h⁴ for Quad8
// (quadratic arcs) and h² for Quad4 (chords). Exact construction: the area
// of the region itself.
func TestAnnulusArea(t *testing.T) {
	const a, b = 1.0, 2.0
	exact := math.Pi * (b*b - a*a) / 4
	for _, c := range []struct {
		kind     Kind
		minRatio float64 // error(n) / error(2n)
		finest   float64 // relative error at the finest mesh
	}{
		{Quad4, 3.8, 2e-3},
		{Quad8, 15, 5e-7},
	} {
		prev := 0.0
		for _, nt := range []int{2, 4, 8, 16} {
			m, err := Build(annulusPlan(a, b, 2, nt), c.kind)
			if err != nil {
				t.Fatal(err)
			}
			if err := m.Check(); err != nil {
				t.Fatal(err)
			}
			e := math.Abs(m.Area()-exact) / exact
			if prev > 0 && prev/e < c.minRatio {
				t.Errorf("%v nt=%d: error %.3g after %.3g, ratio %.2f < %g", c.kind, nt, e, prev, prev/e, c.minRatio)
			}
			prev = e
		}
		if prev > c.finest {
			t.Errorf("%v: finest error %.3g > %g", c.kind, prev, c.finest)
		}
	}
}

// TestNodesOnArcs: every node of a curved side, midside nodes included,
// lies on the circle.
func TestNodesOnArcs(t *testing.T) {
	const a, b = 1.0, 2.0
	m, err := Build(annulusPlan(a, b, 3, 7), Quad8)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		set string
		r   float64
	}{{"inner", a}, {"outer", b}} {
		checkEdgeSet(t, m, c.set, false)
		if got, want := len(m.NodeSets[c.set]), 2*7+1; got != want {
			t.Errorf("%s: %d nodes, want %d", c.set, got, want)
		}
		for _, n := range m.NodeSets[c.set] {
			p := m.Nodes[n]
			if r := math.Hypot(p.X, p.Z); math.Abs(r-c.r) > 1e-14 {
				t.Errorf("%s node %d at radius %.16g, want %g", c.set, n, r, c.r)
			}
		}
	}
	// Midside nodes sit at the parameter midpoint: here the angular one.
	for _, e := range m.EdgeSets["outer"] {
		p0, p1, pm := m.Nodes[e.Nodes[0]], m.Nodes[e.Nodes[1]], m.Nodes[e.Nodes[2]]
		t0, t1, tm := math.Atan2(p0.Z, p0.X), math.Atan2(p1.Z, p1.X), math.Atan2(pm.Z, pm.X)
		if math.Abs(tm-(t0+t1)/2) > 1e-14 {
			t.Errorf("midside node at %.16g rad, want %.16g", tm, (t0+t1)/2)
		}
	}
}

func TestArcAndEllipseArc(t *testing.T) {
	c := Point{1, 2}
	near := func(p, q Point) bool { return dist(p, q) < 1e-14 }
	for _, tc := range []struct {
		name     string
		f        func(float64) Point
		at0, at1 Point
		mid      Point
	}{
		{"ccw quarter", Arc(c, Point{3, 2}, Point{1, 4}), Point{3, 2}, Point{1, 4}, Point{1 + math.Sqrt2, 2 + math.Sqrt2}},
		{"cw quarter", Arc(c, Point{1, 4}, Point{3, 2}), Point{1, 4}, Point{3, 2}, Point{1 + math.Sqrt2, 2 + math.Sqrt2}},
		{"shorter way across −x", Arc(c, Point{1 - math.Sqrt2, 2 + math.Sqrt2}, Point{1 - math.Sqrt2, 2 - math.Sqrt2}),
			Point{1 - math.Sqrt2, 2 + math.Sqrt2}, Point{1 - math.Sqrt2, 2 - math.Sqrt2}, Point{-1, 2}},
		{"half circle ccw", Arc(c, Point{3, 2}, Point{-1, 2}), Point{3, 2}, Point{-1, 2}, Point{1, 4}},
		{"ellipse quarter", EllipseArc(c, 3, 2, 0, math.Pi/2), Point{4, 2}, Point{1, 4}, Point{1 + 3/math.Sqrt2, 2 + math.Sqrt2}},
	} {
		if !near(tc.f(0), tc.at0) || !near(tc.f(1), tc.at1) || !near(tc.f(0.5), tc.mid) {
			t.Errorf("%s: ends %v %v, middle %v; want %v %v %v", tc.name, tc.f(0), tc.f(1), tc.f(0.5), tc.at0, tc.at1, tc.mid)
		}
	}
}
