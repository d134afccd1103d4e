package mesh

import (
	"cmp"
	"errors"
	"math"
	"reflect"
	"slices"
	"strings"
	"testing"
)

// demoSegment is an invented but plausible tower joint, our own numbers and
// no published case: a 28 mm shell on 90 mm flanges, M48 bolts in 52 mm
// holes, 130 mm bolt spacing and contact-zone edges at x = −50 and 60 mm.
// The stress area is that of the ISO 898-1 formula for the coarse pitch
// P = 5 mm; here it is only an input.
func demoSegment(r float64, kind Kind) FlangeSegment {
	return FlangeSegment{
		ShellThickness: 28, ShellLength: 400, FlangeThickness: 90, A: 75, B: 85,
		SegmentWidth: 130, NeckRadius: r,
		BoltDiameter: 48, HoleDiameter: 52, WasherOuter: 92, WasherThickness: 8,
		HeadHeight: 30, NutHeight: 38, StressArea: 1473, ThreadInClamp: 60,
		FaceLines:   []float64{-50, 60},
		ElementSize: 8, Refine: 0.3, Kind: kind,
	}
}

var demoMaterials = FlangeMaterials{Shell: "S355 shell", Flange: "S355 flange", Bolt: "10.9"}

func buildDemo(t testing.TB, g FlangeSegment) *Mesh {
	t.Helper()
	m, err := BuildFlangeSegment(g, demoMaterials)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// demoCases are the four meshes most tests look at.
var demoCases = []struct {
	name string
	r    float64
	kind Kind
}{
	{"sharp Q4", 0, Quad4},
	{"sharp Q8", 0, Quad8},
	{"fillet Q4", 20, Quad4},
	{"fillet Q8", 20, Quad8},
}

// regionArea is the x–z area of the elements of one region.
func regionArea(m *Mesh, name string) float64 {
	ri, ok := m.RegionIndex(name)
	if !ok {
		return 0
	}
	var a float64
	for e, el := range m.Elements {
		if el.Region != ri {
			continue
		}
		x, _ := m.elementCoords(e)
		for _, g := range gauss3x3 {
			a += g.w * detJ(x, g.xi, g.eta)
		}
	}
	return a
}

// filletDeviation is the area by which the mesh's boundary misses the
// fillet arc: the circular segment of each chord (for Quad4 the side is the
// chord), less for Quad8 the parabolic segment through the midside node,
// 4/3 of the triangle of the side's nodes (Archimedes' quadrature of the
// parabola, exact for a quadratic side whose middle node sits at the mid
// parameter).
func filletDeviation(m *Mesh, g FlangeSegment) float64 {
	c := Point{g.B - g.ShellThickness/2 - g.NeckRadius, g.FlangeThickness + g.NeckRadius}
	r := g.NeckRadius
	onArc := func(n int) bool { return math.Abs(dist(m.Nodes[n], c)-r) < 1e-9*r }
	var dev float64
	for _, e := range m.EdgeSets["upper_top"] {
		if !onArc(e.Nodes[0]) || !onArc(e.Nodes[1]) {
			continue
		}
		p0, p1 := m.Nodes[e.Nodes[0]], m.Nodes[e.Nodes[1]]
		th := 2 * math.Asin(dist(p0, p1)/(2*r))
		dev += r * r * (th - math.Sin(th)) / 2
		if m.Kind == Quad8 {
			q := m.Nodes[e.Nodes[2]]
			tri := math.Abs((p1.X-p0.X)*(q.Z-p0.Z)-(q.X-p0.X)*(p1.Z-p0.Z)) / 2
			dev -= 4 * tri / 3
		}
	}
	return dev
}

// TestFlangeSegmentVolumes checks area × thickness of every region against
// the geometry: exact for straight-sided regions, and with the neck fillet
// up to the arc's exactly computed chord or parabola deviation. The
// fillet's area is (1 − π/4)r², and the neck up to z = t_f + r (r·t) joins
// the flange region.
func TestFlangeSegmentVolumes(t *testing.T) {
	for _, tc := range demoCases {
		t.Run(tc.name, func(t *testing.T) {
			g := demoSegment(tc.r, tc.kind)
			m := buildDemo(t, g)
			a, x3, tf, c := g.A, g.B+g.ShellThickness/2, g.FlangeThickness, g.SegmentWidth
			d, dh, dw := g.BoltDiameter, g.HoleDiameter, g.WasherOuter
			r, tt := g.NeckRadius, g.ShellThickness
			zu := tf + g.WasherThickness
			tb := math.Pi * (dw*dw - dh*dh) / (4 * (dw - dh))
			shankA := math.Pi * d * d / 4
			h := math.Sqrt(3) / 2 * d
			flange := (a+x3-dh)*tf + (1-math.Pi/4)*r*r + r*tt
			dev := 0.0
			if r > 0 {
				dev = filletDeviation(m, g)
			}
			lt := g.ThreadInClamp
			for _, w := range []struct {
				region          string
				area, thickness float64
			}{
				{region: "upper_flange", area: flange + dev, thickness: c},
				{region: "lower_flange", area: flange + dev, thickness: c},
				{region: "upper_flange_hole", area: dh * tf, thickness: c - dh},
				{region: "lower_flange_hole", area: dh * tf, thickness: c - dh},
				{region: "upper_shell", area: tt * (g.ShellLength - r), thickness: c},
				{region: "lower_shell", area: tt * (g.ShellLength - r), thickness: c},
				{region: "bolt_head", area: dw * g.HeadHeight, thickness: tb},
				{region: "nut", area: dw * g.NutHeight, thickness: tb},
				// Washer bearing lines: area × t_b is the annulus π/4 (d_w² − d_h²) times t_w.
				{region: "head_washer", area: (dw - dh) * g.WasherThickness, thickness: tb},
				{region: "nut_washer", area: (dw - dh) * g.WasherThickness, thickness: tb},
				// Thread from the nut to z = −zu + l_t; the preload slice, 0.25·d long, lies
				// in the unthreaded shank above it.
				{region: "bolt_thread", area: h * lt, thickness: g.StressArea / h},
				{region: "bolt_shank", area: h * (2*zu - lt - d/4), thickness: shankA / h},
				{region: "bolt_preload", area: h * d / 4, thickness: shankA / h},
			} {
				got := regionArea(m, w.region)
				tol := 1e-9 * w.area
				if math.Abs(got-w.area) > tol {
					t.Errorf("%s: area %.12g, want %.12g (difference %.3g)", w.region, got, w.area, got-w.area)
				}
				ri, ok := m.RegionIndex(w.region)
				if !ok {
					continue
				}
				if th := m.Regions[ri].Thickness; math.Abs(th-w.thickness) > 1e-12*w.thickness {
					t.Errorf("%s: thickness %.12g, want %.12g", w.region, th, w.thickness)
				}
			}
			// Per unit length the strip carries A in the shank and A_s in the thread.
			for _, w := range []struct {
				region string
				length float64
				want   float64
			}{
				{"bolt_shank", 2*zu - lt - d/4, shankA},
				{"bolt_thread", lt, g.StressArea},
			} {
				ri, _ := m.RegionIndex(w.region)
				if got := regionArea(m, w.region) * m.Regions[ri].Thickness / w.length; math.Abs(got-w.want) > 1e-9*w.want {
					t.Errorf("%s: area × thickness per length %.12g, want %.12g", w.region, got, w.want)
				}
			}
		})
	}
}

// TestFlangeSegmentStripMatchesRoundBar checks the choice h = (√3/2)·d: the
// strip of width h and thickness A/h has the round bar's area πd²/4 and
// second moment of area πd⁴/64 (exact construction).
func TestFlangeSegmentStripMatchesRoundBar(t *testing.T) {
	g := demoSegment(0, Quad8)
	m := buildDemo(t, g)
	ri, _ := m.RegionIndex("bolt_shank")
	th := m.Regions[ri].Thickness
	var lo, hi float64
	for _, el := range m.Elements {
		if el.Region != ri {
			continue
		}
		for _, n := range el.Nodes {
			lo, hi = min(lo, m.Nodes[n].X), max(hi, m.Nodes[n].X)
		}
	}
	h, d := hi-lo, g.BoltDiameter
	if got, want := th*h, math.Pi*d*d/4; math.Abs(got-want) > 1e-12*want {
		t.Errorf("strip area %.12g, want %.12g", got, want)
	}
	if got, want := th*h*h*h/12, math.Pi*math.Pow(d, 4)/64; math.Abs(got-want) > 1e-12*want {
		t.Errorf("strip second moment %.12g, want %.12g", got, want)
	}
}

func TestFlangeSegmentFullThread(t *testing.T) {
	g := demoSegment(20, Quad8)
	g.FullThread = true
	m := buildDemo(t, g)
	if _, ok := m.RegionIndex("bolt_shank"); ok {
		t.Error("a fully threaded bolt has a bolt_shank region")
	}
	h, zu := math.Sqrt(3)/2*g.BoltDiameter, g.FlangeThickness+g.WasherThickness
	ri, _ := m.RegionIndex("bolt_preload")
	if th := m.Regions[ri].Thickness; math.Abs(th-g.StressArea/h) > 1e-12*th {
		t.Errorf("preload slice thickness %g, want the thread's %g", th, g.StressArea/h)
	}
	if got, want := regionArea(m, "bolt_thread")+regionArea(m, "bolt_preload"), h*2*zu; math.Abs(got-want) > 1e-9*want {
		t.Errorf("threaded strip area %.12g, want %.12g", got, want)
	}
	// The slice lies in the clamp, clear of the nut (z = −zu) and of z = 0.
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, el := range m.Elements {
		if el.Region == ri {
			for _, n := range el.Nodes {
				lo, hi = min(lo, m.Nodes[n].Z), max(hi, m.Nodes[n].Z)
			}
		}
	}
	if math.Abs(hi-lo-g.BoltDiameter/4) > 1e-9 || lo <= -zu || hi >= 0 {
		t.Errorf("preload slice from z = %g to %g", lo, hi)
	}
}

// edgeSetNames are the edge sets BuildFlangeSegment promises, with the
// number of separate pieces each consists of.
var edgeSetNames = map[string]int{
	"upper_face": 1, "lower_face": 1, "upper_top": 1, "lower_bottom": 1,
	"head_bearing": 2, "nut_bearing": 2, "upper_end": 1, "lower_end": 1,
	"upper_shell_inner": 1, "upper_shell_outer": 1, "lower_shell_inner": 1, "lower_shell_outer": 1,
	"bolt_interface": 1, "bolt_under_head": 1,
}

func TestFlangeSegmentEdgeSets(t *testing.T) {
	for _, tc := range demoCases {
		t.Run(tc.name, func(t *testing.T) {
			m := buildDemo(t, demoSegment(tc.r, tc.kind))
			if got, want := m.EdgeSetNames(), sortedKeys(edgeSetNames); !slices.Equal(got, want) {
				t.Errorf("edge sets %v, want %v", got, want)
			}
			for name, pieces := range edgeSetNames {
				checkPieces(t, m, name, pieces)
				if len(m.NodeSets[name]) == 0 {
					t.Errorf("node set %s is empty", name)
				}
			}
		})
	}
}

// checkPieces checks that the set is non-empty, runs in the given number
// of connected pieces and keeps the body on its left.
func checkPieces(t *testing.T, m *Mesh, name string, pieces int) {
	t.Helper()
	es := m.EdgeSets[name]
	if len(es) == 0 {
		t.Errorf("%s: empty", name)
		return
	}
	breaks := 1
	for i := 1; i < len(es); i++ {
		if es[i].Nodes[0] != es[i-1].Nodes[1] {
			breaks++
		}
	}
	if breaks != pieces {
		t.Errorf("%s: %d pieces, want %d", name, breaks, pieces)
	}
	for i, e := range es {
		el := m.Elements[e.Element].Nodes
		var c Point
		for _, n := range el[:4] {
			c.X += m.Nodes[n].X / 4
			c.Z += m.Nodes[n].Z / 4
		}
		p0, p1 := m.Nodes[e.Nodes[0]], m.Nodes[e.Nodes[1]]
		if cross := (p1.X-p0.X)*(c.Z-p0.Z) - (p1.Z-p0.Z)*(c.X-p0.X); !(cross > 0) {
			t.Errorf("%s, edge %d: element %d lies to the right", name, i, e.Element)
			return
		}
	}
}

// TestFlangeSegmentSetGeometry checks where the sets lie and which body
// they belong to.
func TestFlangeSegmentSetGeometry(t *testing.T) {
	for _, tc := range demoCases {
		t.Run(tc.name, func(t *testing.T) {
			g := demoSegment(tc.r, tc.kind)
			m := buildDemo(t, g)
			tf, zu, top := g.FlangeThickness, g.FlangeThickness+g.WasherThickness, g.FlangeThickness+g.ShellLength
			x2, x3 := g.B-g.ShellThickness/2, g.B+g.ShellThickness/2
			h := math.Sqrt(3) / 2 * g.BoltDiameter
			for _, w := range []struct {
				set  string
				body int
				ok   func(Point) bool
			}{
				{"upper_face", UpperBody, func(p Point) bool { return p.Z == 0 && p.X >= -g.A && p.X <= x3 }},
				{"lower_face", LowerBody, func(p Point) bool { return p.Z == 0 && p.X >= -g.A && p.X <= x3 }},
				{"upper_top", UpperBody, func(p Point) bool { return p.Z >= tf && p.X <= x2 }},
				{"lower_bottom", LowerBody, func(p Point) bool { return p.Z <= -tf && p.X <= x2 }},
				{"upper_end", UpperBody, func(p Point) bool { return p.Z == top }},
				{"lower_end", LowerBody, func(p Point) bool { return p.Z == -top }},
				{"upper_shell_inner", UpperBody, func(p Point) bool { return p.X == x2 && p.Z >= tf+g.NeckRadius }},
				{"upper_shell_outer", UpperBody, func(p Point) bool { return p.X == x3 && p.Z >= tf }},
				{"lower_shell_inner", LowerBody, func(p Point) bool { return p.X == x2 && p.Z <= -tf-g.NeckRadius }},
				{"lower_shell_outer", LowerBody, func(p Point) bool { return p.X == x3 && p.Z <= -tf }},
				{"head_bearing", BoltBody, func(p Point) bool {
					return p.Z == tf && math.Abs(p.X) >= g.HoleDiameter/2 && math.Abs(p.X) <= g.WasherOuter/2
				}},
				{"nut_bearing", BoltBody, func(p Point) bool {
					return p.Z == -tf && math.Abs(p.X) >= g.HoleDiameter/2 && math.Abs(p.X) <= g.WasherOuter/2
				}},
				{"bolt_interface", BoltBody, func(p Point) bool { return p.Z == 0 && math.Abs(p.X) <= h/2 }},
				{"bolt_under_head", BoltBody, func(p Point) bool { return p.Z == zu && math.Abs(p.X) <= h/2 }},
			} {
				for _, n := range m.NodeSets[w.set] {
					if p := m.Nodes[n]; !w.ok(p) {
						t.Errorf("%s: node %d at %v is out of place", w.set, n, p)
						break
					}
				}
				for _, e := range m.EdgeSets[w.set] {
					if b := m.Elements[e.Element].Body; b != w.body {
						t.Errorf("%s: element %d of body %d, want %d", w.set, e.Element, b, w.body)
						break
					}
				}
			}
			// The face spans the flange and the two faces are different nodes.
			face := m.NodeSets["upper_face"]
			xs := faceXs(m, "upper_face")
			if xs[0] != -g.A || xs[len(xs)-1] != x3 {
				t.Errorf("upper_face runs from x = %g to %g, want %g to %g", xs[0], xs[len(xs)-1], -g.A, x3)
			}
			for _, n := range m.NodeSets["lower_face"] {
				if _, found := slices.BinarySearch(face, n); found {
					t.Errorf("node %d is on both faces", n)
				}
			}
		})
	}
}

// faceXs returns the sorted x positions of the nodes of a set.
func faceXs(m *Mesh, set string) []float64 {
	var xs []float64
	for _, n := range m.NodeSets[set] {
		xs = append(xs, m.Nodes[n].X)
	}
	slices.Sort(xs)
	return xs
}

// hasX reports whether a node of the set lies at x.
func hasX(m *Mesh, set string, x float64) bool {
	for _, n := range m.NodeSets[set] {
		if math.Abs(m.Nodes[n].X-x) <= 1e-12*(1+math.Abs(x)) {
			return true
		}
	}
	return false
}

func TestFlangeSegmentNodeLines(t *testing.T) {
	for _, tc := range demoCases {
		t.Run(tc.name, func(t *testing.T) {
			g := demoSegment(tc.r, tc.kind)
			m := buildDemo(t, g)
			xs := append([]float64{-g.HoleDiameter / 2, g.HoleDiameter / 2, -g.WasherOuter / 2, g.WasherOuter / 2}, g.FaceLines...)
			flatTop := g.B - g.ShellThickness/2 - g.NeckRadius
			for _, set := range []string{"upper_face", "lower_face", "upper_top", "lower_bottom"} {
				for _, x := range xs {
					onTop := set == "upper_top" || set == "lower_bottom"
					if (!onTop || x <= flatTop) && !hasX(m, set, x) {
						t.Errorf("%s has no node at x = %g", set, x)
					}
				}
			}
			// Across the bolt at each line along it, at both sides of the strip.
			tf, zu := g.FlangeThickness, g.FlangeThickness+g.WasherThickness
			te := -zu + g.ThreadInClamp
			mid := (te + zu) / 2
			h := math.Sqrt(3) / 2 * g.BoltDiameter
			for _, z := range []float64{0, tf, -tf, zu, -zu, te, mid - g.BoltDiameter/8, mid + g.BoltDiameter/8} {
				for _, x := range []float64{-h / 2, h / 2, 0} {
					n := m.NearestNode(Point{x, z})
					if p := m.Nodes[n]; dist(p, Point{x, z}) > 1e-9 {
						t.Errorf("no bolt node at (%g, %g); nearest %v", x, z, p)
					}
				}
			}
		})
	}
}

// TestFlangeSegmentMirror checks that the lower flange and shell mirror the
// upper ones node for node, to rounding.
func TestFlangeSegmentMirror(t *testing.T) {
	for _, tc := range demoCases {
		t.Run(tc.name, func(t *testing.T) {
			m := buildDemo(t, demoSegment(tc.r, tc.kind))
			var upper, lower []Point
			for _, el := range m.Elements {
				for _, n := range el.Nodes {
					switch el.Body {
					case UpperBody:
						upper = append(upper, m.Nodes[n])
					case LowerBody:
						lower = append(lower, Point{m.Nodes[n].X, -m.Nodes[n].Z})
					}
				}
			}
			upper, lower = distinct(upper), distinct(lower)
			if len(upper) != len(lower) {
				t.Fatalf("%d upper and %d lower node positions", len(upper), len(lower))
			}
			for _, p := range upper {
				// lower is sorted by x: look through the nodes within 1e-9 of p.X.
				i, _ := slices.BinarySearchFunc(lower, p.X-1e-9, func(q Point, x float64) int { return cmp.Compare(q.X, x) })
				found := false
				for ; i < len(lower) && lower[i].X <= p.X+1e-9 && !found; i++ {
					found = dist(lower[i], p) <= 1e-9
				}
				if !found {
					t.Fatalf("upper node at %v has no mirror image", p)
				}
			}
		})
	}
}

// distinct sorts points by x, then z, and drops repeats.
func distinct(ps []Point) []Point {
	slices.SortFunc(ps, func(a, b Point) int {
		if a.X != b.X {
			return cmp.Compare(a.X, b.X)
		}
		return cmp.Compare(a.Z, b.Z)
	})
	return slices.Compact(ps)
}

// TestFlangeSegmentQuality requires Check to pass and bounds the shape
// measures of the demo meshes.
func TestFlangeSegmentQuality(t *testing.T) {
	for _, tc := range demoCases {
		t.Run(tc.name, func(t *testing.T) {
			m := buildDemo(t, demoSegment(tc.r, tc.kind))
			if err := m.Check(); err != nil {
				t.Fatal(err)
			}
			q := m.Quality()
			t.Logf("%d nodes, %d elements, MinJacobianRatio %.3f, MaxAspectRatio %.2f, angles %.1f°–%.1f°",
				len(m.Nodes), q.Elements, q.MinJacobianRatio, q.MaxAspectRatio, q.MinAngle, q.MaxAngle)
			if q.MaxAspectRatio >= 10 || q.MinJacobianRatio <= 0.2 {
				t.Errorf("aspect ratio %.3g (want < 10), Jacobian ratio %.3g (want > 0.2)", q.MaxAspectRatio, q.MinJacobianRatio)
			}
		})
	}
}

// TestFlangeSegmentGrading checks element lengths along the boundaries:
// neighbours within the ratio 1.5, about ElementSize·Refine next to the
// node lines of the face, at most ElementSize in the flange and twice that
// at the shell's end.
func TestFlangeSegmentGrading(t *testing.T) {
	for _, tc := range demoCases {
		t.Run(tc.name, func(t *testing.T) {
			g := demoSegment(tc.r, tc.kind)
			m := buildDemo(t, g)
			hf := g.ElementSize * g.Refine
			for name := range edgeSetNames {
				ls := edgeLengths(m, name)
				for i := 1; i < len(ls); i++ {
					if r := max(ls[i]/ls[i-1], ls[i-1]/ls[i]); r > 1.5 && !pieceBreak(m, name, i) {
						t.Errorf("%s: edges %d and %d are %.3g and %.3g long", name, i-1, i, ls[i-1], ls[i])
					}
				}
			}
			face := m.EdgeSets["upper_face"]
			ls := edgeLengths(m, "upper_face")
			for i, e := range face {
				p0, p1 := m.Nodes[e.Nodes[0]], m.Nodes[e.Nodes[1]]
				if ls[i] > g.ElementSize*(1+1e-9) {
					t.Errorf("face edge at x = %g is %.3g long", p0.X, ls[i])
				}
				for _, x := range g.FaceLines {
					if (p0.X == x || p1.X == x) && (ls[i] < 0.75*hf || ls[i] > 1.25*hf) {
						t.Errorf("face edge next to the line x = %g is %.3g long, want about %.3g", x, ls[i], hf)
					}
				}
			}
			shell := edgeLengths(m, "upper_shell_outer")
			if first, last := shell[0], shell[len(shell)-1]; first > 1.25*hf || last < 4*first || last > 2*g.ElementSize*(1+1e-9) {
				t.Errorf("shell edges grow from %.3g to %.3g", first, last)
			}
		})
	}
}

// pieceBreak reports whether edge i of the set starts a new piece.
func pieceBreak(m *Mesh, set string, i int) bool {
	es := m.EdgeSets[set]
	return es[i].Nodes[0] != es[i-1].Nodes[1]
}

func TestFlangeSegmentRegionsAndBodies(t *testing.T) {
	m := buildDemo(t, demoSegment(20, Quad4))
	want := []string{
		"upper_shell", "upper_flange", "upper_flange_hole", "lower_shell", "lower_flange", "lower_flange_hole",
		"bolt_head", "head_washer", "bolt_shank", "bolt_thread", "bolt_preload", "nut", "nut_washer",
	}
	var got []string
	for _, r := range m.Regions {
		got = append(got, r.Name)
	}
	if !slices.Equal(got, want) {
		t.Errorf("regions %v, want %v", got, want)
	}
	for e, el := range m.Elements {
		name := m.Regions[el.Region].Name
		body, mat := BoltBody, demoMaterials.Bolt
		switch {
		case strings.HasPrefix(name, "upper_"):
			body = UpperBody
		case strings.HasPrefix(name, "lower_"):
			body = LowerBody
		}
		switch {
		case strings.HasSuffix(name, "_shell"):
			mat = demoMaterials.Shell
		case strings.Contains(name, "_flange"):
			mat = demoMaterials.Flange
		}
		if el.Body != body || m.Regions[el.Region].Material != mat {
			t.Fatalf("element %d of %s: body %d, material %q; want %d, %q", e, name, el.Body, m.Regions[el.Region].Material, body, mat)
		}
	}
}

func TestFlangeSegmentDeterministic(t *testing.T) {
	for _, tc := range demoCases {
		a := buildDemo(t, demoSegment(tc.r, tc.kind))
		b := buildDemo(t, demoSegment(tc.r, tc.kind))
		if !reflect.DeepEqual(a, b) {
			t.Errorf("%s: two builds differ", tc.name)
		}
	}
}

// TestFlangeSegmentElementCount checks that the element count follows
// 1/ElementSize² without refinement. With refinement the graded layers at
// the node lines keep their number of elements (their growth ratio is
// fixed), so the count grows more slowly until the uniform parts dominate.
func TestFlangeSegmentElementCount(t *testing.T) {
	for _, refine := range []float64{1, 0.3} {
		var prev int
		for _, h := range []float64{16, 8, 4, 2} {
			g := demoSegment(20, Quad4)
			g.ElementSize, g.Refine = h, refine
			n := len(buildDemo(t, g).Elements)
			t.Logf("Refine %g, ElementSize %g: %d elements", refine, h, n)
			if prev > 0 {
				ratio := float64(n) / float64(prev)
				lo, hi := 3.2, 4.4
				if refine < 1 {
					lo = 2
				}
				if ratio < lo || ratio > hi {
					t.Errorf("Refine %g: halving the element size to %g multiplies the count by %.2f", refine, h, ratio)
				}
			}
			prev = n
		}
	}
}

// TestFlangeSegmentVariants builds geometries off the demo's path and
// requires Check to pass.
func TestFlangeSegmentVariants(t *testing.T) {
	for _, v := range []struct {
		name string
		edit func(*FlangeSegment)
	}{
		{"small fillet", func(g *FlangeSegment) { g.NeckRadius = 2.4 }},
		{"fillet at the washer", func(g *FlangeSegment) { g.NeckRadius = 25 }},
		{"thick shell", func(g *FlangeSegment) { g.ShellThickness, g.B = 60, 110 }},
		{"thin flange", func(g *FlangeSegment) { g.FlangeThickness, g.ThreadInClamp = 30, 20 }},
		{"many face lines", func(g *FlangeSegment) { g.FaceLines = []float64{-70, -46, 0, 0, 55, 70, 98} }},
		{"no refinement", func(g *FlangeSegment) { g.Refine = 1 }},
		{"coarse", func(g *FlangeSegment) { g.ElementSize = 50 }},
		{"thread fills the clamp", func(g *FlangeSegment) { g.ThreadInClamp = 196 }},
		{"short shank", func(g *FlangeSegment) { g.ThreadInClamp = 180 }},
		{"short stub", func(g *FlangeSegment) { g.ShellLength = 25 }},
	} {
		for _, r := range []float64{0, 20} {
			g := demoSegment(r, Quad8)
			v.edit(&g)
			if r == 0 {
				g.NeckRadius = 0
			}
			m, err := BuildFlangeSegment(g, demoMaterials)
			if err != nil {
				t.Errorf("%s, r = %g: %v", v.name, g.NeckRadius, err)
				continue
			}
			if err := m.Check(); err != nil {
				t.Errorf("%s, r = %g: %v", v.name, g.NeckRadius, err)
			}
			q := m.Quality()
			t.Logf("%s, r = %g: %d elements, Jacobian ratio %.3f, aspect %.2f", v.name, g.NeckRadius, q.Elements, q.MinJacobianRatio, q.MaxAspectRatio)
		}
	}
}

func TestFlangeSegmentValidate(t *testing.T) {
	if err := demoSegment(20, Quad8).Validate(); err != nil {
		t.Fatalf("demo geometry: %v", err)
	}
	for _, c := range []struct {
		name   string
		edit   func(*FlangeSegment)
		fields []string
	}{
		{"no shell", func(g *FlangeSegment) { g.ShellThickness = 0 }, []string{"ShellThickness"}},
		{"NaN shell length", func(g *FlangeSegment) { g.ShellLength = math.NaN() }, []string{"ShellLength"}},
		{"negative flange", func(g *FlangeSegment) { g.FlangeThickness = -1 }, []string{"FlangeThickness"}},
		{"washer past the edge", func(g *FlangeSegment) { g.A = 46 }, []string{"A"}},
		{"washer past the shell", func(g *FlangeSegment) { g.B = 60 }, []string{"B"}},
		{"fillet over the washer", func(g *FlangeSegment) { g.NeckRadius = 26 }, []string{"NeckRadius"}},
		{"negative fillet", func(g *FlangeSegment) { g.NeckRadius = -1 }, []string{"NeckRadius"}},
		{"fillet below the element size", func(g *FlangeSegment) { g.NeckRadius = 1 }, []string{"NeckRadius"}},
		{"stub shorter than the fillet", func(g *FlangeSegment) { g.ShellLength = 15 }, []string{"ShellLength"}},
		{"segment narrower than the hole", func(g *FlangeSegment) { g.SegmentWidth = 52 }, []string{"SegmentWidth"}},
		{"segment narrower than the washer", func(g *FlangeSegment) { g.SegmentWidth = 90 }, []string{"SegmentWidth"}},
		{"infinite bolt", func(g *FlangeSegment) { g.BoltDiameter = math.Inf(1) }, []string{"BoltDiameter"}},
		{"hole as wide as the bolt", func(g *FlangeSegment) { g.HoleDiameter = 48 }, []string{"HoleDiameter"}},
		{"washer inside the hole", func(g *FlangeSegment) { g.WasherOuter = 52 }, []string{"WasherOuter"}},
		{"no washer", func(g *FlangeSegment) { g.WasherThickness = 0 }, []string{"WasherThickness"}},
		{"no head", func(g *FlangeSegment) { g.HeadHeight = 0 }, []string{"HeadHeight"}},
		{"no nut", func(g *FlangeSegment) { g.NutHeight = -5 }, []string{"NutHeight"}},
		{"stress area too big", func(g *FlangeSegment) { g.StressArea = 1810 }, []string{"StressArea"}},
		{"no thread", func(g *FlangeSegment) { g.ThreadInClamp = 0 }, []string{"ThreadInClamp"}},
		{"thread longer than the clamp", func(g *FlangeSegment) { g.ThreadInClamp = 197 }, []string{"ThreadInClamp"}},
		{"face line at the edge", func(g *FlangeSegment) { g.FaceLines = []float64{-75} }, []string{"FaceLines"}},
		{"face line past the shell", func(g *FlangeSegment) { g.FaceLines = []float64{0, 99.5} }, []string{"FaceLines"}},
		{"NaN face line", func(g *FlangeSegment) { g.FaceLines = []float64{math.NaN()} }, []string{"FaceLines"}},
		{"no element size", func(g *FlangeSegment) { g.ElementSize = 0 }, []string{"ElementSize"}},
		{"too many elements", func(g *FlangeSegment) { g.ElementSize, g.NeckRadius = 0.05, 0 }, []string{"ElementSize"}},
		{"no refinement factor", func(g *FlangeSegment) { g.Refine = 0 }, []string{"Refine"}},
		{"refinement factor above 1", func(g *FlangeSegment) { g.Refine = 1.5 }, []string{"Refine"}},
		{"unknown kind", func(g *FlangeSegment) { g.Kind = 3 }, []string{"Kind"}},
		{"several", func(g *FlangeSegment) { g.ShellThickness, g.HeadHeight, g.Kind = 0, 0, 0 },
			[]string{"ShellThickness", "HeadHeight", "Kind"}},
	} {
		g := demoSegment(20, Quad8)
		c.edit(&g)
		err := g.Validate()
		var fe FieldErrors
		if !errors.As(err, &fe) {
			t.Errorf("%s: error %v is no FieldErrors", c.name, err)
			continue
		}
		var got []string
		for _, e := range fe {
			got = append(got, e.Field)
			if !strings.Contains(e.Error(), ": ") || e.Rule == "" {
				t.Errorf("%s: message %q", c.name, e.Error())
			}
		}
		if !slices.Equal(got, c.fields) {
			t.Errorf("%s: fields %v, want %v (%v)", c.name, got, c.fields, err)
		}
		if _, berr := BuildFlangeSegment(g, demoMaterials); !errors.As(berr, &fe) {
			t.Errorf("%s: BuildFlangeSegment returned %v", c.name, berr)
		}
	}
}

func TestFieldErrorText(t *testing.T) {
	g := demoSegment(0, Quad4)
	g.BoltDiameter, g.HoleDiameter, g.StressArea = 36, 36, 817
	err := g.Validate()
	if want := "bolt hole diameter 36 mm: must exceed the bolt diameter 36 mm"; err == nil || err.Error() != want {
		t.Errorf("error %q, want %q", err, want)
	}
	two := FieldErrors{{Field: "Refine", Rule: "r1", Value: 2}, {Field: "FaceLines", Rule: "r2", Value: -80}}
	if got, want := two.Error(), "refinement factor 2: r1\nface line -80 mm: r2"; got != want {
		t.Errorf("FieldErrors text %q, want %q", got, want)
	}
}
