package report

import (
	"fmt"
	"slices"
)

// Outlines returns the outline of each region of a mesh for a
// JointDrawing: the edges that only one cell of the region has, chained
// into closed loops. nodes are (x, z) [mm]; cells list node numbers with
// corners counter-clockwise first, then any midside nodes (mesh.Element
// order), so outer loops come out counter-clockwise and holes clockwise;
// cellRegion gives each cell's index into names. Regions without cells
// are left out. The result is deterministic: loops start at the region's
// first boundary edge in cell order.
func Outlines(nodes [][2]float64, cells [][]int, cellRegion []int, names []string) ([]Region, error) {
	if len(cellRegion) != len(cells) {
		return nil, fmt.Errorf("report: outlines: %d region numbers for %d cells", len(cellRegion), len(cells))
	}
	for i, c := range cells {
		if err := checkCell(c, len(nodes)); err != nil {
			return nil, fmt.Errorf("report: outlines: cell %d: %w", i, err)
		}
		if r := cellRegion[i]; r < 0 || r >= len(names) {
			return nil, fmt.Errorf("report: outlines: cell %d: region %d is outside 0…%d", i, r, len(names)-1)
		}
	}
	var out []Region
	for r, name := range names {
		edges := boundaryEdges(cells, cellRegion, r)
		if len(edges) == 0 {
			continue
		}
		reg := Region{Name: name}
		for _, loop := range chain(edges) {
			pts := make([][2]float64, len(loop))
			for k, n := range loop {
				pts[k] = nodes[n]
			}
			reg.Loops = append(reg.Loops, pts)
		}
		out = append(out, reg)
	}
	return out, nil
}

// edge is a cell side from node a to node b, through midside node m if
// the cell has one (m < 0 otherwise).
type edge struct{ a, m, b int }

// path returns the edge's nodes from a to b.
func (e edge) path() []int {
	if e.m < 0 {
		return []int{e.a, e.b}
	}
	return []int{e.a, e.m, e.b}
}

// boundaryEdges returns, in cell order, the sides that only one of the
// cells of region has (all cells if cellRegion is nil). Coincident nodes
// with different numbers, as where separate bodies touch, make separate
// sides, so such faces are boundaries too.
func boundaryEdges(cells [][]int, cellRegion []int, region int) []edge {
	type key struct{ lo, hi int }
	count := make(map[key]int)
	var all []edge
	for i, c := range cells {
		if cellRegion != nil && cellRegion[i] != region {
			continue
		}
		for _, e := range cellEdges(c) {
			count[key{min(e.a, e.b), max(e.a, e.b)}]++
			all = append(all, e)
		}
	}
	var out []edge
	for _, e := range all { // in cell order, not map order
		if count[key{min(e.a, e.b), max(e.a, e.b)}] == 1 {
			out = append(out, e)
		}
	}
	return out
}

func cellEdges(c []int) []edge {
	corners := len(c)
	mid := corners == 6 || corners == 8
	if mid {
		corners /= 2
	}
	es := make([]edge, corners)
	for i := range corners {
		m := -1
		if mid {
			m = c[corners+i]
		}
		es[i] = edge{c[i], m, c[(i+1)%corners]}
	}
	return es
}

// chain joins directed edges into closed loops of node numbers (the
// first node not repeated at the end). At a node where two loops touch
// the first unused edge leaving it is taken, which may join the two into
// one figure-eight loop; it fills the same area.
func chain(edges []edge) [][]int {
	from := make(map[int][]int) // node → edges leaving it, in order
	for i, e := range edges {
		from[e.a] = append(from[e.a], i)
	}
	used := make([]bool, len(edges))
	next := func(n int) int {
		for _, i := range from[n] {
			if !used[i] {
				return i
			}
		}
		return -1
	}
	var loops [][]int
	for start := range edges {
		if used[start] {
			continue
		}
		var loop []int
		for i := start; i >= 0; i = next(edges[i].b) {
			used[i] = true
			p := edges[i].path()
			loop = append(loop, p[:len(p)-1]...)
		}
		// An open chain (a mesh that is not closed) is kept as it is.
		loops = append(loops, slices.Clip(loop))
	}
	return loops
}
