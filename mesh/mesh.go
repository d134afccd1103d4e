package mesh

import (
	"math"
	"slices"
	"strconv"
)

// Point is a location in the x–z section plane (x radial, z axial), mm.
type Point struct{ X, Z float64 }

// Kind is the element type of a mesh; its value is the number of nodes per element.
type Kind int

const (
	Quad4 Kind = 4 // 4-node bilinear quadrilateral
	Quad8 Kind = 8 // 8-node serendipity quadrilateral
)

// String returns "Quad4" or "Quad8".
func (k Kind) String() string {
	switch k {
	case Quad4:
		return "Quad4"
	case Quad8:
		return "Quad8"
	}
	return "Kind(" + strconv.Itoa(int(k)) + ")"
}

func (k Kind) valid() bool { return k == Quad4 || k == Quad8 }

// Element is one quadrilateral. Nodes holds the corners counter-clockwise
// n0 n1 n2 n3, then for Quad8 the midside nodes of sides 0-1, 1-2, 2-3 and
// 3-0 (also the node order of VTK's quadratic quad).
//
// Body numbers the separately meshed part the element belongs to (the
// Block.Body it came from). Elements of different bodies share no nodes, so
// their nodes may coincide where the bodies touch.
type Element struct {
	Nodes  []int
	Region int // index into Mesh.Regions
	Body   int
}

// Region is a named part of the section with its own thickness and material.
type Region struct {
	Name      string
	Thickness float64 // out-of-plane thickness (plane stress), mm; must be positive
	Material  string
}

// Edge is one element side on a named boundary. Side s runs from corner s to
// corner s+1 (mod 4), so the body lies to its left. Nodes are the side's
// nodes in that order: [corner s, corner s+1] for Quad4, [corner s,
// corner s+1, midside] for Quad8.
type Edge struct {
	Element, Side int
	Nodes         []int
}

// Mesh is a quadrilateral mesh of the section.
type Mesh struct {
	Kind     Kind
	Nodes    []Point
	Elements []Element
	Regions  []Region
	NodeSets map[string][]int  // sorted, unique node numbers
	EdgeSets map[string][]Edge // in the order they lie along the boundary
}

// NodeSetNames returns the names of the node sets, sorted.
func (m *Mesh) NodeSetNames() []string { return sortedKeys(m.NodeSets) }

// EdgeSetNames returns the names of the edge sets, sorted.
func (m *Mesh) EdgeSetNames() []string { return sortedKeys(m.EdgeSets) }

func sortedKeys[V any](s map[string]V) []string {
	keys := make([]string, 0, len(s))
	for k := range s {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	return keys
}

// NearestNode returns the node closest to p, the lowest number on a tie,
// or -1 if the mesh has no nodes.
func (m *Mesh) NearestNode(p Point) int {
	best, bestD := -1, math.Inf(1)
	for i, q := range m.Nodes {
		dx, dz := q.X-p.X, q.Z-p.Z
		if d := dx*dx + dz*dz; d < bestD {
			best, bestD = i, d
		}
	}
	return best
}

// RegionIndex returns the index of the region called name.
func (m *Mesh) RegionIndex(name string) (int, bool) {
	for i, r := range m.Regions {
		if r.Name == name {
			return i, true
		}
	}
	return -1, false
}

// Area returns the total area of the elements in the x–z plane, mm², by the
// 3×3 Gauss rule (exact for the element maps used here). Malformed elements
// are skipped.
func (m *Mesh) Area() float64 {
	var a float64
	for e := range m.Elements {
		x, ok := m.elementCoords(e)
		if !ok {
			continue
		}
		for _, g := range gauss3x3 {
			a += g.w * detJ(x, g.xi, g.eta)
		}
	}
	return a
}

// elementCoords returns the node coordinates of element e, or false if the
// element does not fit the mesh kind or names a node that does not exist.
func (m *Mesh) elementCoords(e int) ([]Point, bool) {
	nodes := m.Elements[e].Nodes
	if !m.Kind.valid() || len(nodes) != int(m.Kind) {
		return nil, false
	}
	x := make([]Point, len(nodes))
	for i, n := range nodes {
		if n < 0 || n >= len(m.Nodes) {
			return nil, false
		}
		x[i] = m.Nodes[n]
	}
	return x, true
}
