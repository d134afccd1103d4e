package mesh

import (
	"math"
	"strings"
	"testing"
)

func quad(corners ...Point) Plan {
	return Plan{
		Vertices: corners,
		Blocks:   []Block{{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{1, 1}, Region: "steel"}},
		Regions:  []Region{steel},
	}
}

// TestQualityKnownShapes checks the measures against shapes whose values
// follow by hand: a 2 × 1 rectangle, a parallelogram with 63.43° corners
// (affine, so constant detJ) and a trapezoid with sides 2 and 1 whose
// detJ = (3 − η)/8 halves from bottom to top.
func TestQualityKnownShapes(t *testing.T) {
	slant := math.Atan2(1, 0.5) * 180 / math.Pi
	for _, c := range []struct {
		name           string
		corners        []Point
		jac, asp       float64
		minAng, maxAng float64
	}{
		{"rectangle 2 × 1", []Point{{0, 0}, {2, 0}, {2, 1}, {0, 1}}, 1, 2, 90, 90},
		{"parallelogram", []Point{{0, 0}, {1, 0}, {1.5, 1}, {0.5, 1}}, 1, math.Sqrt(1.25), slant, 180 - slant},
		{"trapezoid", []Point{{0, 0}, {2, 0}, {1.5, 1}, {0.5, 1}}, 0.5, 2, slant, 180 - slant},
	} {
		for _, kind := range []Kind{Quad4, Quad8} {
			m, err := Build(quad(c.corners...), kind)
			if err != nil {
				t.Fatal(err)
			}
			q := m.Quality()
			for _, v := range []struct {
				what      string
				got, want float64
			}{
				{"Jacobian ratio", q.MinJacobianRatio, c.jac},
				{"aspect ratio", q.MaxAspectRatio, c.asp},
				{"min angle", q.MinAngle, c.minAng},
				{"max angle", q.MaxAngle, c.maxAng},
			} {
				if math.Abs(v.got-v.want) > 1e-12*math.Max(1, v.want) {
					t.Errorf("%s %v: %s = %.15g, want %.15g", c.name, kind, v.what, v.got, v.want)
				}
			}
			if q.Elements != 1 || q.WorstJacobianElement != 0 || q.WorstAspectElement != 0 {
				t.Errorf("%s %v: %+v", c.name, kind, q)
			}
		}
	}
}

func TestQualityRectMesh(t *testing.T) {
	m, err := Rect(0, 0, 8, 2, 4, 4, steel, Quad8) // 2 × 0.5 elements
	if err != nil {
		t.Fatal(err)
	}
	q := m.Quality()
	if q.Elements != 16 || math.Abs(q.MaxAspectRatio-4) > 1e-12 || math.Abs(q.MinJacobianRatio-1) > 1e-12 {
		t.Errorf("quality = %+v", q)
	}
	s := q.String()
	for _, w := range []string{"elements:       16", "aspect ratio:   max 4", "90.0° to 90.0°"} {
		if !strings.Contains(s, w) {
			t.Errorf("String() = %q lacks %q", s, w)
		}
	}
}

// distortedPlan is a 2 × 2 patch of blocks whose middle vertex is moved to
// mid; its four outer sides form the edge set "boundary".
func distortedPlan(mid Point) Plan {
	v := []Point{{0, 0}, {1, 0}, {2, 0}, {0, 1}, mid, {2, 1}, {0, 2}, {1, 2}, {2, 2}}
	blk := func(c0 int, sides [4]string) Block {
		return Block{Corners: [4]int{c0, c0 + 1, c0 + 4, c0 + 3}, Divisions: [2]int{2, 3}, Region: "steel", Sides: sides}
	}
	return Plan{
		Vertices: v,
		Blocks: []Block{
			blk(0, [4]string{"boundary", "", "", "boundary"}),
			blk(1, [4]string{"boundary", "boundary", "", ""}),
			blk(3, [4]string{"", "", "boundary", "boundary"}),
			blk(4, [4]string{"", "boundary", "boundary", ""}),
		},
		Regions: []Region{steel},
	}
}

func TestDistortedPatch(t *testing.T) {
	// Divisions must agree on shared sides: 2 along x and 3 along z throughout.
	for _, kind := range []Kind{Quad4, Quad8} {
		m, err := Build(distortedPlan(Point{1.3, 0.7}), kind)
		if err != nil {
			t.Fatal(err)
		}
		if err := m.Check(); err != nil {
			t.Fatalf("%v: %v", kind, err)
		}
		if q := m.Quality(); !(q.MinJacobianRatio > 0.3 && q.MinJacobianRatio < 0.99) {
			t.Errorf("%v: Jacobian ratio %g", kind, q.MinJacobianRatio)
		}
		if a := m.Area(); math.Abs(a-4) > 1e-13 {
			t.Errorf("%v: area %.15g, want 4", kind, a)
		}
		checkEdgeSet(t, m, "boundary", true)
		// Moving the middle vertex past a corner of the patch folds it.
		m, err = Build(distortedPlan(Point{2.5, 2.5}), kind)
		if err == nil {
			err = m.Check()
		}
		if err == nil {
			t.Errorf("%v: a folded patch passes", kind)
		}
	}
}

func TestCheckFaults(t *testing.T) {
	for _, c := range []struct {
		name string
		kind Kind
		edit func(m *Mesh)
		want []string
	}{
		{"mirrored block", Quad8, func(m *Mesh) {
			for i := range m.Nodes {
				m.Nodes[i].X = -m.Nodes[i].X
			}
		}, []string{"element 0 (region \"steel\")", "inverted"}},
		{"clockwise element", Quad4, func(m *Mesh) {
			n := m.Elements[3].Nodes
			n[1], n[3] = n[3], n[1]
		}, []string{"element 3 (region \"steel\")", "inverted"}},
		{"collapsed element", Quad4, func(m *Mesh) {
			n := m.Elements[2].Nodes
			m.Nodes[n[2]] = m.Nodes[n[1]]
		}, []string{"element 2", "degenerate", "coincide"}},
		{"re-entrant corner", Quad4, func(m *Mesh) {
			n := m.Elements[0].Nodes
			m.Nodes[n[2]] = Point{0.1, 0.1}
		}, []string{"element 0", "inverted"}},
		{"missing node", Quad4, func(m *Mesh) { m.Elements[1].Nodes[2] = 1000 }, []string{"element 1", "[1 2 1000"}},
		{"wrong node count", Quad8, func(m *Mesh) { m.Elements[1].Nodes = m.Elements[1].Nodes[:4] }, []string{"element 1", "Quad8"}},
		{"missing region", Quad4, func(m *Mesh) { m.Elements[0].Region = 3 }, []string{"element 0", "region 3"}},
		{"edge set mismatch", Quad4, func(m *Mesh) { m.EdgeSets["top"][0].Side = 1 }, []string{`edge set "top"`, "side 1"}},
		{"node set out of range", Quad4, func(m *Mesh) { m.NodeSets["left"] = []int{-1} }, []string{`node set "left"`, "node -1"}},
		{"not finite", Quad4, func(m *Mesh) { m.Nodes[4].Z = math.Inf(1) }, []string{"node 4", "not finite"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			m, err := Rect(0, 0, 2, 2, 2, 2, steel, c.kind)
			if err != nil {
				t.Fatal(err)
			}
			if err := m.Check(); err != nil {
				t.Fatalf("before the edit: %v", err)
			}
			c.edit(m)
			err = m.Check()
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not mention %q", err, w)
				}
			}
			m.Quality() // must not panic on a faulty mesh
		})
	}
}

// TestCheckDuplicateNodes: two blocks that touch but name different
// vertices at the same place do not share nodes; Check finds the pairs.
func TestCheckDuplicateNodes(t *testing.T) {
	p := Plan{
		Vertices: []Point{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {1, 0}, {2, 0}, {2, 1}, {1, 1}},
		Blocks: []Block{
			{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{1, 3}, Region: "steel"},
			{Corners: [4]int{4, 5, 6, 7}, Divisions: [2]int{1, 3}, Region: "steel"},
		},
		Regions: []Region{steel},
	}
	m, err := Build(p, Quad4)
	if err != nil {
		t.Fatal(err)
	}
	err = m.Check()
	if err == nil {
		t.Fatal("no error")
	}
	if got := strings.Count(err.Error(), "coincide"); got != 4 {
		t.Errorf("%d coincident pairs reported, want 4:\n%v", got, err)
	}
	// A shift of 1e-6 of the mesh size is a real gap, not a duplicate.
	for i := 4; i < 8; i++ {
		p.Vertices[i].X += 1e-6 * math.Sqrt(5)
	}
	if m, err = Build(p, Quad4); err != nil {
		t.Fatal(err)
	}
	if err := m.Check(); err != nil {
		t.Errorf("separated blocks: %v", err)
	}
}

func TestCheckReportsAtMost(t *testing.T) {
	m, err := Rect(0, 0, 1, 1, 10, 10, steel, Quad4)
	if err != nil {
		t.Fatal(err)
	}
	for i := range m.Nodes {
		m.Nodes[i].X = -m.Nodes[i].X
	}
	err = m.Check()
	if err == nil || !strings.Contains(err.Error(), "and 80 more faults") {
		t.Errorf("err = %v", err)
	}
}

// TestDuplicateSearchMatchesBruteForce scatters pairs at 0.9 and 1.1 times
// the tolerance in all directions around many points, so close pairs
// straddle cell borders, and compares with a comparison of all pairs.
func TestDuplicateSearchMatchesBruteForce(t *testing.T) {
	m := &Mesh{Kind: Quad4, Nodes: []Point{{0, 0}, {1, 1}}}
	tol := 1e-9 * math.Sqrt2
	for k := range 200 {
		base := Point{0.1 + 0.004*float64(k), 0.9 - 0.0037*float64(k)}
		m.Nodes = append(m.Nodes, base)
		a := float64(k) * 0.7
		for _, s := range []float64{0.9, 1.1} {
			m.Nodes = append(m.Nodes, Point{base.X + s*tol*math.Cos(a), base.Z + s*tol*math.Sin(a)})
		}
	}
	want := 0
	for i := range m.Nodes {
		for j := i + 1; j < len(m.Nodes); j++ {
			if dist(m.Nodes[i], m.Nodes[j]) <= tol {
				want++
			}
		}
	}
	var f faults
	m.checkDuplicates(&f, m.nodeBodies(&f))
	if got := len(f.list) + f.more; got != want || want < 200 {
		t.Errorf("found %d close pairs, brute force %d", got, want)
	}
}
