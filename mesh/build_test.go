package mesh

import (
	"math"
	"reflect"
	"strings"
	"testing"
)

var steel = Region{Name: "steel", Thickness: 10, Material: "S355"}

// lPlan is an L-shaped section, (0,0)–(2,0)–(2,1)–(1,1)–(1,2)–(0,2), cut
// into two blocks along the diagonal from (0,0) to the re-entrant corner
// (1,1). Block 0 runs the cut as its side 3, block 1 as its side 0, so n
// divides the cut in both.
func lPlan(n0, n, n1 int) Plan {
	return Plan{
		Vertices: []Point{{0, 0}, {2, 0}, {2, 1}, {1, 1}, {1, 2}, {0, 2}},
		Blocks: []Block{
			{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{n0, n}, Region: "steel",
				Sides: [4]string{"outer", "outer", "outer", "cut"}},
			{Corners: [4]int{0, 3, 4, 5}, Divisions: [2]int{n, n1}, Region: "steel",
				Sides: [4]string{"", "outer", "outer", "outer"}},
		},
		Regions: []Region{steel},
		Sets:    []VertexSet{{"corner", 3}, {"origin", 0}},
	}
}

// gridCount is the number of nodes of an n0 × n1 block meshed alone.
func gridCount(n0, n1 int, kind Kind) int {
	if kind == Quad4 {
		return (n0 + 1) * (n1 + 1)
	}
	return (2*n0+1)*(2*n1+1) - n0*n1
}

func TestBuildLShapeConforming(t *testing.T) {
	const n0, n, n1 = 3, 4, 5
	for _, kind := range []Kind{Quad4, Quad8} {
		t.Run(kind.String(), func(t *testing.T) {
			m, err := Build(lPlan(n0, n, n1), kind)
			if err != nil {
				t.Fatal(err)
			}
			if err := m.Check(); err != nil {
				t.Fatal(err)
			}
			sideNodes := n + 1
			if kind == Quad8 {
				sideNodes = 2*n + 1
			}
			want := gridCount(n0, n, kind) + gridCount(n, n1, kind) - sideNodes
			if len(m.Nodes) != want {
				t.Errorf("nodes = %d, want %d", len(m.Nodes), want)
			}
			if got := len(m.Elements); got != n0*n+n*n1 {
				t.Errorf("elements = %d, want %d", got, n0*n+n*n1)
			}
			// Every node on the cut belongs to elements of both blocks.
			inBlock := [2]map[int]bool{{}, {}}
			for e, el := range m.Elements {
				b := 0
				if e >= n0*n {
					b = 1
				}
				for _, v := range el.Nodes {
					inBlock[b][v] = true
				}
			}
			cut := m.NodeSets["cut"]
			if len(cut) != sideNodes {
				t.Fatalf("cut holds %d nodes, want %d", len(cut), sideNodes)
			}
			for _, v := range cut {
				if !inBlock[0][v] || !inBlock[1][v] {
					t.Errorf("cut node %d is not shared by both blocks", v)
				}
				if p := m.Nodes[v]; math.Abs(p.X-p.Z) > 1e-14 {
					t.Errorf("cut node %d at %v is off the diagonal", v, p)
				}
			}
			if got := m.Area(); math.Abs(got-3) > 1e-13 {
				t.Errorf("area = %.15g, want 3", got)
			}
			if c := m.NodeSets["corner"]; len(c) != 1 || m.Nodes[c[0]] != (Point{1, 1}) {
				t.Errorf("vertex set corner = %v", c)
			}
		})
	}
}

func TestBuildDeterministic(t *testing.T) {
	for _, kind := range []Kind{Quad4, Quad8} {
		a, err := Build(annulusPlan(1, 2, 3, 5), kind)
		if err != nil {
			t.Fatal(err)
		}
		b, err := Build(annulusPlan(1, 2, 3, 5), kind)
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(a, b) {
			t.Errorf("%v: two builds of one plan differ", kind)
		}
	}
}

// TestBuildNumbering pins the documented order: block by block, grid row by
// row from corner 0, elements likewise.
func TestBuildNumbering(t *testing.T) {
	m, err := Rect(0, 0, 2, 1, 2, 1, steel, Quad4)
	if err != nil {
		t.Fatal(err)
	}
	wantNodes := []Point{{0, 0}, {1, 0}, {2, 0}, {0, 1}, {1, 1}, {2, 1}}
	if !reflect.DeepEqual(m.Nodes, wantNodes) {
		t.Errorf("nodes = %v, want %v", m.Nodes, wantNodes)
	}
	wantEls := []Element{{Nodes: []int{0, 1, 4, 3}}, {Nodes: []int{1, 2, 5, 4}}}
	if !reflect.DeepEqual(m.Elements, wantEls) {
		t.Errorf("elements = %v, want %v", m.Elements, wantEls)
	}
	q8, err := Rect(0, 0, 2, 2, 1, 1, steel, Quad8)
	if err != nil {
		t.Fatal(err)
	}
	// Grid rows: (0,0) (1,0) (2,0) | (0,1) (2,1) | (0,2) (1,2) (2,2).
	if got, want := q8.Elements[0].Nodes, []int{0, 2, 7, 5, 1, 4, 6, 3}; !reflect.DeepEqual(got, want) {
		t.Errorf("Quad8 nodes = %v, want %v", got, want)
	}
}

func TestGradingRealised(t *testing.T) {
	const n = 5
	for _, kind := range []Kind{Quad4, Quad8} {
		for _, r := range []float64{4, 0.25, 1, 0} {
			p := Plan{
				Vertices: []Point{{0, 0}, {10, 0}, {10, 3}, {0, 3}},
				Blocks: []Block{{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{n, n}, Grading: [2]float64{r, 1 / r},
					Region: "steel", Sides: [4]string{"bottom", "right", "top", "left"}}},
				Regions: []Region{steel},
			}
			if r == 0 {
				p.Blocks[0].Grading[1] = 0
			}
			m, err := Build(p, kind)
			if err != nil {
				t.Fatal(err)
			}
			want := r
			if r == 0 {
				want = 1
			}
			// Bottom runs with direction 0; top against it; right with direction 1.
			check := func(set string, ratio float64) {
				l := edgeLengths(m, set)
				if got := l[n-1] / l[0]; math.Abs(got-ratio) > 1e-12*ratio {
					t.Errorf("%v r=%g %s: last/first = %.15g, want %g", kind, r, set, got, ratio)
				}
				for k := 1; k < n; k++ {
					step := math.Pow(ratio, 1/float64(n-1))
					if got := l[k] / l[k-1]; math.Abs(got-step) > 1e-12 {
						t.Errorf("%v r=%g %s: step %d ratio %.15g, want %.15g", kind, r, set, k, got, step)
					}
				}
			}
			check("bottom", want)
			check("top", 1/want)
			check("right", 1/want)
			if kind == Quad8 { // midside nodes at the parameter midpoint
				for _, e := range m.EdgeSets["bottom"] {
					a, b, c := m.Nodes[e.Nodes[0]], m.Nodes[e.Nodes[1]], m.Nodes[e.Nodes[2]]
					if math.Abs(c.X-(a.X+b.X)/2) > 1e-14 {
						t.Errorf("midside node at x = %g, want %g", c.X, (a.X+b.X)/2)
					}
				}
			}
		}
	}
}

func edgeLengths(m *Mesh, set string) []float64 {
	var l []float64
	for _, e := range m.EdgeSets[set] {
		l = append(l, dist(m.Nodes[e.Nodes[0]], m.Nodes[e.Nodes[1]]))
	}
	return l
}

// checkEdgeSet verifies that each edge matches its element side, keeps the
// element on its left and starts where the previous edge ended.
func checkEdgeSet(t *testing.T, m *Mesh, name string, closed bool) {
	t.Helper()
	es := m.EdgeSets[name]
	if len(es) == 0 {
		t.Fatalf("edge set %q is empty", name)
	}
	for i, e := range es {
		el := m.Elements[e.Element].Nodes
		if !reflect.DeepEqual(e.Nodes, sideNodes(el, e.Side)) {
			t.Errorf("%s[%d]: nodes %v are not side %d of element %v", name, i, e.Nodes, e.Side, el)
		}
		a, b := m.Nodes[e.Nodes[0]], m.Nodes[e.Nodes[1]]
		var c Point
		for _, v := range el[:4] {
			c.X += m.Nodes[v].X / 4
			c.Z += m.Nodes[v].Z / 4
		}
		if cross := (b.X-a.X)*(c.Z-a.Z) - (b.Z-a.Z)*(c.X-a.X); cross <= 0 {
			t.Errorf("%s[%d]: element %d lies to the right of the edge", name, i, e.Element)
		}
		if i > 0 && es[i-1].Nodes[1] != e.Nodes[0] {
			t.Errorf("%s[%d] starts at node %d, previous edge ends at %d", name, i, e.Nodes[0], es[i-1].Nodes[1])
		}
	}
	if closed != (es[len(es)-1].Nodes[1] == es[0].Nodes[0]) {
		t.Errorf("%s: closed = %v, want %v", name, !closed, closed)
	}
}

func TestEdgeSets(t *testing.T) {
	for _, kind := range []Kind{Quad4, Quad8} {
		m, err := Build(lPlan(2, 3, 4), kind)
		if err != nil {
			t.Fatal(err)
		}
		checkEdgeSet(t, m, "outer", true)
		if got, want := len(m.EdgeSets["outer"]), 2*(2+3+4); got != want {
			t.Errorf("outer has %d edges, want %d", got, want)
		}
		checkEdgeSet(t, m, "cut", false)
		if got, want := m.EdgeSetNames(), []string{"cut", "outer"}; !reflect.DeepEqual(got, want) {
			t.Errorf("EdgeSetNames = %v, want %v", got, want)
		}
		if got, want := m.NodeSetNames(), []string{"corner", "cut", "origin", "outer"}; !reflect.DeepEqual(got, want) {
			t.Errorf("NodeSetNames = %v, want %v", got, want)
		}
	}
}

// TestEdgeSetOrderAcrossBlocks lists the right block first: the bottom edge
// set must still start at the left end.
func TestEdgeSetOrderAcrossBlocks(t *testing.T) {
	p := Plan{
		Vertices: []Point{{0, 0}, {1, 0}, {2, 0}, {2, 1}, {1, 1}, {0, 1}},
		Blocks: []Block{
			{Corners: [4]int{1, 2, 3, 4}, Divisions: [2]int{2, 1}, Region: "steel", Sides: [4]string{"bottom", "", "top", ""}},
			{Corners: [4]int{0, 1, 4, 5}, Divisions: [2]int{3, 1}, Region: "steel", Sides: [4]string{"bottom", "", "top", ""}},
		},
		Regions: []Region{steel},
	}
	m, err := Build(p, Quad8)
	if err != nil {
		t.Fatal(err)
	}
	for _, set := range []string{"bottom", "top"} {
		checkEdgeSet(t, m, set, false)
	}
	if first := m.Nodes[m.EdgeSets["bottom"][0].Nodes[0]]; first != (Point{0, 0}) {
		t.Errorf("bottom starts at %v, want (0, 0)", first)
	}
	if first := m.Nodes[m.EdgeSets["top"][0].Nodes[0]]; first != (Point{2, 1}) {
		t.Errorf("top starts at %v, want (2, 1)", first)
	}
}

// TestSharedSideReversedGrading: two blocks read a graded shared side in
// opposite directions; ratios that agree when read the same way are accepted.
func TestSharedSideGrading(t *testing.T) {
	for _, c := range []struct {
		a, b float64
		ok   bool
	}{
		{3, 3, true},
		{3, 1.0 / 3, false},
		{0, 1, true},
	} {
		p := lPlan(2, 4, 2)
		p.Blocks[0].Grading[1] = c.a // along the cut from vertex 0 to 3
		p.Blocks[1].Grading[0] = c.b // the same direction
		m, err := Build(p, Quad8)
		if (err == nil) != c.ok {
			t.Errorf("gradings %g, %g: err = %v, want ok = %v", c.a, c.b, err, c.ok)
			continue
		}
		if err == nil {
			if err := m.Check(); err != nil {
				t.Error(err)
			}
		} else if !strings.Contains(err.Error(), "block 0") || !strings.Contains(err.Error(), "block 1") {
			t.Errorf("error %q does not name both blocks", err)
		}
	}
}

func TestBuildErrors(t *testing.T) {
	for _, c := range []struct {
		name string
		edit func(p *Plan)
		want []string
	}{
		{"clockwise block", func(p *Plan) { p.Blocks[1].Corners = [4]int{0, 5, 4, 3} }, []string{"block 1", "clockwise"}},
		{"divisions differ on shared side", func(p *Plan) { p.Blocks[1].Divisions[0] = 5 }, []string{"block 0", "block 1", "4 and 5"}},
		{"unknown region", func(p *Plan) { p.Blocks[1].Region = "bolt" }, []string{"block 1", `"bolt"`}},
		{"zero divisions", func(p *Plan) { p.Blocks[0].Divisions[0] = 0 }, []string{"block 0", "divisions[0] = 0"}},
		{"negative grading", func(p *Plan) { p.Blocks[0].Grading[1] = -2 }, []string{"block 0", "grading[1]"}},
		{"corner out of range", func(p *Plan) { p.Blocks[0].Corners[2] = 9 }, []string{"block 0", "vertex 9"}},
		{"repeated corner", func(p *Plan) { p.Blocks[0].Corners[2] = 1 }, []string{"block 0", "degenerate"}},
		{"collinear corners", func(p *Plan) { p.Vertices[2], p.Vertices[3] = Point{1.5, 0}, Point{1, 0} }, []string{"block 0", "degenerate", "no area"}},
		{"side of no length", func(p *Plan) { p.Vertices[2] = Point{2, 0} }, []string{"block 0", "side 1 has no length"}},
		{"overlapping blocks", func(p *Plan) {
			p.Blocks = append(p.Blocks, Block{Corners: [4]int{3, 0, 1, 2}, Divisions: [2]int{4, 2}, Region: "steel"})
		}, []string{"at most two"}},
		{"region without name", func(p *Plan) { p.Regions = append(p.Regions, Region{Thickness: 1}) }, []string{"region 1 has no name"}},
		{"region thickness", func(p *Plan) { p.Regions[0].Thickness = 0 }, []string{`region "steel"`, "thickness"}},
		{"region twice", func(p *Plan) { p.Regions = append(p.Regions, steel) }, []string{`"steel" is defined twice`}},
		{"curve not a side", func(p *Plan) {
			p.Curves = []Curve{{From: 1, To: 4, At: func(t float64) Point { return lerp(p.Vertices[1], p.Vertices[4], t) }}}
		}, []string{"curve 0", "not the ends"}},
		{"curve misses vertex", func(p *Plan) {
			p.Curves = []Curve{{From: 0, To: 1, At: func(t float64) Point { return Point{2 * t, 0.1} }}}
		}, []string{"curve 0", "At(0)", "vertex 0"}},
		{"curve vertex out of range", func(p *Plan) { p.Curves = []Curve{{From: 0, To: 8, At: Arc(Point{}, Point{1, 0}, Point{0, 1})}} }, []string{"curve 0", "0–8"}},
		{"closed curve", func(p *Plan) { p.Curves = []Curve{{From: 2, To: 2, At: Arc(Point{}, Point{1, 0}, Point{0, 1})}} }, []string{"curve 0", "vertex 2"}},
		{"two curves on one side", func(p *Plan) {
			line := func(t float64) Point { return Point{2 * t, 0} }
			p.Curves = []Curve{{From: 0, To: 1, At: line}, {From: 1, To: 0, At: line}}
		}, []string{"curves 0 and 1", "vertices 0 and 1"}},
		{"curve without function", func(p *Plan) { p.Curves = []Curve{{From: 0, To: 1}} }, []string{"curve 0", "no At"}},
		{"vertex set off the mesh", func(p *Plan) {
			p.Vertices = append(p.Vertices, Point{5, 5})
			p.Sets = append(p.Sets, VertexSet{"far", 6})
		}, []string{`"far"`, "no block corner"}},
		{"not finite", func(p *Plan) { p.Vertices[4].X = math.NaN() }, []string{"vertex 4", "not finite"}},
		{"no blocks", func(p *Plan) { p.Blocks, p.Sets = nil, nil }, []string{"no blocks"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := lPlan(2, 4, 2)
			c.edit(&p)
			_, err := Build(p, Quad4)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not mention %q", err, w)
				}
			}
		})
	}
	if _, err := Build(lPlan(1, 1, 1), Kind(6)); err == nil {
		t.Error("Kind(6) accepted")
	}
}

// TestBuildSameWayOverlap: a block folded back onto its neighbour runs the
// shared side the same way.
func TestBuildSameWayOverlap(t *testing.T) {
	p := Plan{
		Vertices: []Point{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {0.5, 0.5}},
		Blocks: []Block{
			{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{1, 1}, Region: "steel"},
			{Corners: [4]int{0, 1, 2, 4}, Divisions: [2]int{1, 1}, Region: "steel"},
		},
		Regions: []Region{steel},
	}
	_, err := Build(p, Quad4)
	if err == nil || !strings.Contains(err.Error(), "same way") {
		t.Errorf("err = %v, want a same-way overlap", err)
	}
}

func TestNearestNodeAndRegionIndex(t *testing.T) {
	m, err := Rect(0, 0, 4, 2, 4, 2, steel, Quad4)
	if err != nil {
		t.Fatal(err)
	}
	if n := m.NearestNode(Point{2.9, 1.2}); m.Nodes[n] != (Point{3, 1}) {
		t.Errorf("NearestNode = %d at %v, want (3, 1)", n, m.Nodes[n])
	}
	if n := (&Mesh{}).NearestNode(Point{}); n != -1 {
		t.Errorf("NearestNode of empty mesh = %d", n)
	}
	if i, ok := m.RegionIndex("steel"); !ok || i != 0 {
		t.Errorf("RegionIndex(steel) = %d, %v", i, ok)
	}
	if _, ok := m.RegionIndex("bolt"); ok {
		t.Error("RegionIndex(bolt) found")
	}
}
