package mesh

// This file is longer than most: the block mesher (vertices, curved
// sides, divisions with grading, node merging along shared sides, sets)
// is one algorithm whose steps share the block tables.

import (
	"errors"
	"fmt"
	"math"
	"slices"
)

// Build meshes the plan conformingly with elements of the given kind. Blocks
// that share a side (the same two vertices) share its nodes exactly; their
// division counts and gradings along it must agree when read in the same
// direction, and they must run it in opposite directions (as two
// counter-clockwise neighbours do). Nodes are numbered block by block, each
// block's grid row by row from corner 0; elements follow the same order.
//
// Blocks of different Body share no vertex: each body gets its own nodes,
// and the elements carry the block's Body.
//
// Build reports every fault of the plan it finds: a region name not in
// Regions, a clockwise or degenerate block, divisions below 1, a side shared
// by more than two blocks or shared inconsistently, a vertex shared by two
// bodies, a curve that is no block side. It does not look for inverted
// elements; call Check for that.
func Build(p Plan, kind Kind) (*Mesh, error) {
	if !kind.valid() {
		return nil, fmt.Errorf("mesh: element kind %d is neither Quad4 nor Quad8", int(kind))
	}
	b := &builder{plan: p, kind: kind}
	if err := b.prepare(); err != nil {
		return nil, fmt.Errorf("mesh: invalid plan: %w", err)
	}
	b.generate()
	return b.mesh, nil
}

// sideKey names a block side by its two vertices, lower index first.
type sideKey struct{ lo, hi int }

func keyOf(a, c int) sideKey { return sideKey{min(a, c), max(a, c)} }

// sideUse is side s of block b.
type sideUse struct{ block, side int }

type builder struct {
	plan      Plan
	kind      Kind
	regionIdx map[string]int
	curves    map[sideKey]int // index into plan.Curves
	uses      map[sideKey][]sideUse
	sideFns   [][4]func(float64) Point // per block, side s from corner s to s+1
	tol       float64                  // length below which two points coincide

	mesh       *Mesh
	vertexNode []int
	sideNodes  map[sideKey][]int // node numbers along the side from lo to hi
}

func (b *builder) prepare() error {
	errs := b.checkRegions()
	errs = append(errs, b.checkVertices()...)
	errs = append(errs, b.checkBlocks()...)
	errs = append(errs, b.checkCurves()...)
	if len(errs) > 0 {
		return errors.Join(errs...)
	}
	errs = b.checkSides()
	errs = append(errs, b.checkBodies()...)
	b.makeSideFns()
	errs = append(errs, b.checkOrientation()...)
	errs = append(errs, b.checkSets()...)
	return errors.Join(errs...)
}

func (b *builder) checkRegions() []error {
	var errs []error
	b.regionIdx = make(map[string]int, len(b.plan.Regions))
	for i, r := range b.plan.Regions {
		if r.Name == "" {
			errs = append(errs, fmt.Errorf("region %d has no name", i))
			continue
		}
		if _, dup := b.regionIdx[r.Name]; dup {
			errs = append(errs, fmt.Errorf("region %q is defined twice", r.Name))
			continue
		}
		b.regionIdx[r.Name] = i
		if !(r.Thickness > 0) || math.IsInf(r.Thickness, 1) {
			errs = append(errs, fmt.Errorf("region %q: thickness %g is not a positive finite length", r.Name, r.Thickness))
		}
	}
	return errs
}

func (b *builder) checkVertices() []error {
	var errs []error
	lo := Point{math.Inf(1), math.Inf(1)}
	hi := Point{math.Inf(-1), math.Inf(-1)}
	for i, v := range b.plan.Vertices {
		if !finite(v.X) || !finite(v.Z) {
			errs = append(errs, fmt.Errorf("vertex %d: coordinates (%g, %g) are not finite", i, v.X, v.Z))
			continue
		}
		lo = Point{min(lo.X, v.X), min(lo.Z, v.Z)}
		hi = Point{max(hi.X, v.X), max(hi.Z, v.Z)}
	}
	if hi.X >= lo.X {
		b.tol = 1e-9 * math.Hypot(hi.X-lo.X, hi.Z-lo.Z)
	}
	return errs
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

func (b *builder) checkBlocks() []error {
	var errs []error
	if len(b.plan.Blocks) == 0 {
		errs = append(errs, errors.New("the plan has no blocks"))
	}
	nv := len(b.plan.Vertices)
	for bi, blk := range b.plan.Blocks {
		name := blockName(bi, blk)
		for _, c := range blk.Corners {
			if c < 0 || c >= nv {
				errs = append(errs, fmt.Errorf("%s: corner vertex %d does not exist (%d vertices)", name, c, nv))
			}
		}
		for i := range 4 {
			for j := i + 1; j < 4; j++ {
				if blk.Corners[i] == blk.Corners[j] {
					errs = append(errs, fmt.Errorf("%s is degenerate: corners %d and %d are both vertex %d", name, i, j, blk.Corners[i]))
				}
			}
		}
		for d, n := range blk.Divisions {
			if n < 1 {
				errs = append(errs, fmt.Errorf("%s: divisions[%d] = %d, need at least 1", name, d, n))
			}
		}
		for d, g := range blk.Grading {
			if !(g >= 0) || math.IsInf(g, 1) {
				errs = append(errs, fmt.Errorf("%s: grading[%d] = %g, need a positive ratio (0 or 1 for uniform)", name, d, g))
			}
		}
		if _, ok := b.regionIdx[blk.Region]; !ok {
			errs = append(errs, fmt.Errorf("%s: region %q is not in Plan.Regions", name, blk.Region))
		}
	}
	return errs
}

// checkBodies rejects a vertex that is a corner of blocks of two bodies,
// since the vertex's node would join the bodies.
func (b *builder) checkBodies() []error {
	var errs []error
	owner := make([]int, len(b.plan.Vertices)) // block index + 1, 0 = unused
	reported := make([]bool, len(b.plan.Vertices))
	for bi, blk := range b.plan.Blocks {
		for _, c := range blk.Corners {
			switch o := owner[c] - 1; {
			case o < 0:
				owner[c] = bi + 1
			case b.plan.Blocks[o].Body != blk.Body && !reported[c]:
				reported[c] = true
				errs = append(errs, fmt.Errorf("vertex %d is a corner of %s (body %d) and %s (body %d); bodies share no vertices",
					c, blockName(o, b.plan.Blocks[o]), b.plan.Blocks[o].Body, blockName(bi, blk), blk.Body))
			}
		}
	}
	return errs
}

func blockName(bi int, blk Block) string {
	return fmt.Sprintf("block %d (region %q)", bi, blk.Region)
}

func (b *builder) checkCurves() []error {
	var errs []error
	nv := len(b.plan.Vertices)
	b.curves = make(map[sideKey]int, len(b.plan.Curves))
	for ci, c := range b.plan.Curves {
		switch {
		case c.From < 0 || c.From >= nv || c.To < 0 || c.To >= nv:
			errs = append(errs, fmt.Errorf("curve %d: vertices %d–%d do not both exist (%d vertices)", ci, c.From, c.To, nv))
			continue
		case c.From == c.To:
			errs = append(errs, fmt.Errorf("curve %d starts and ends at vertex %d", ci, c.From))
			continue
		case c.At == nil:
			errs = append(errs, fmt.Errorf("curve %d (vertices %d–%d) has no At function", ci, c.From, c.To))
			continue
		}
		k := keyOf(c.From, c.To)
		if prev, dup := b.curves[k]; dup {
			errs = append(errs, fmt.Errorf("curves %d and %d both shape the side between vertices %d and %d", prev, ci, k.lo, k.hi))
			continue
		}
		b.curves[k] = ci
		// A loose tolerance: the caller computes vertices and curve ends separately.
		tol := 1e3 * b.tol
		for _, end := range [2]struct {
			t float64
			v int
		}{{0, c.From}, {1, c.To}} {
			if d := dist(c.At(end.t), b.plan.Vertices[end.v]); !(d <= tol) {
				errs = append(errs, fmt.Errorf("curve %d: At(%g) lies %.3g mm from vertex %d", ci, end.t, d, end.v))
			}
		}
	}
	return errs
}

func dist(a, c Point) float64 { return math.Hypot(a.X-c.X, a.Z-c.Z) }

// sideInfo returns the key of side s of block blk, whether the block runs
// it from key.lo to key.hi, its divisions and its grading read from key.lo.
func sideInfo(blk Block, s int) (k sideKey, forward bool, n int, r float64) {
	a, c := blk.Corners[s], blk.Corners[(s+1)%4]
	k = keyOf(a, c)
	forward = a == k.lo
	n = blk.Divisions[s%2]
	r = blk.Grading[s%2]
	if r == 0 {
		r = 1
	}
	// Sides 2 and 3 run against the block's parameter direction.
	if s >= 2 {
		r = 1 / r
	}
	if !forward {
		r = 1 / r
	}
	return k, forward, n, r
}

func (b *builder) checkSides() []error {
	var errs []error
	b.uses = make(map[sideKey][]sideUse)
	var order []sideKey // first use, for deterministic error order
	for bi, blk := range b.plan.Blocks {
		for s := range 4 {
			k, _, _, _ := sideInfo(blk, s)
			if b.uses[k] == nil {
				order = append(order, k)
			}
			b.uses[k] = append(b.uses[k], sideUse{bi, s})
		}
	}
	for _, k := range order {
		errs = append(errs, b.checkShared(k, b.uses[k])...)
	}
	for ci, c := range b.plan.Curves {
		if k := keyOf(c.From, c.To); b.uses[k] == nil {
			errs = append(errs, fmt.Errorf("curve %d: vertices %d and %d are not the ends of a block side", ci, k.lo, k.hi))
		}
	}
	return errs
}

func (b *builder) checkShared(k sideKey, us []sideUse) []error {
	blocks := b.plan.Blocks
	if len(us) > 2 {
		names := make([]int, len(us))
		for i, u := range us {
			names[i] = u.block
		}
		return []error{fmt.Errorf("the side between vertices %d and %d belongs to %d blocks %v; at most two may share a side", k.lo, k.hi, len(us), names)}
	}
	if len(us) < 2 {
		return nil
	}
	u, w := us[0], us[1]
	bu, bw := blocks[u.block], blocks[w.block]
	_, fu, nu, ru := sideInfo(bu, u.side)
	_, fw, nw, rw := sideInfo(bw, w.side)
	pair := fmt.Sprintf("%s and %s share the side between vertices %d and %d", blockName(u.block, bu), blockName(w.block, bw), k.lo, k.hi)
	switch {
	case u.block == w.block:
		return []error{fmt.Errorf("%s is degenerate: sides %d and %d both join vertices %d and %d", blockName(u.block, bu), u.side, w.side, k.lo, k.hi)}
	case fu == fw:
		return []error{fmt.Errorf("%s but run it the same way, so they overlap", pair)}
	case nu != nw:
		return []error{fmt.Errorf("%s but divide it differently: %d and %d elements", pair, nu, nw)}
	case nu > 1 && math.Abs(ru/rw-1) > 1e-9:
		return []error{fmt.Errorf("%s but grade it differently: ratios %g and %g read from vertex %d to %d", pair, ru, rw, k.lo, k.hi)}
	}
	return nil
}

// makeSideFns sets up, for each block side, the map t ↦ point from corner
// s (t = 0) to corner s+1 (t = 1), curved where a Curve says so.
func (b *builder) makeSideFns() {
	v := b.plan.Vertices
	b.sideFns = make([][4]func(float64) Point, len(b.plan.Blocks))
	for bi, blk := range b.plan.Blocks {
		for s := range 4 {
			pa, pc := v[blk.Corners[s]], v[blk.Corners[(s+1)%4]]
			ci, curved := b.curves[keyOf(blk.Corners[s], blk.Corners[(s+1)%4])]
			if !curved {
				b.sideFns[bi][s] = func(t float64) Point { return lerp(pa, pc, t) }
				continue
			}
			c := b.plan.Curves[ci]
			f := snapped(c.At, v[c.From], v[c.To])
			if c.From != blk.Corners[s] {
				b.sideFns[bi][s] = func(t float64) Point { return f(1 - t) }
			} else {
				b.sideFns[bi][s] = f
			}
		}
	}
}

func lerp(a, c Point, t float64) Point {
	return Point{a.X + t*(c.X-a.X), a.Z + t*(c.Z-a.Z)}
}

// snapped adds to at a linear correction that makes its ends land exactly
// on p0 and p1, so side nodes and vertex nodes agree.
func snapped(at func(float64) Point, p0, p1 Point) func(float64) Point {
	a0, a1 := at(0), at(1)
	d0 := Point{p0.X - a0.X, p0.Z - a0.Z}
	d1 := Point{p1.X - a1.X, p1.Z - a1.Z}
	return func(t float64) Point {
		q := at(t)
		return Point{q.X + (1-t)*d0.X + t*d1.X, q.Z + (1-t)*d0.Z + t*d1.Z}
	}
}

// checkOrientation rejects blocks with a side of no length or whose
// outline, sampled along the (possibly curved) sides, does not enclose a
// positive area.
func (b *builder) checkOrientation() []error {
	const samples = 16
	var errs []error
	for bi, blk := range b.plan.Blocks {
		var area, perim float64
		prev := b.plan.Vertices[blk.Corners[0]]
		for s := range 4 {
			for k := 1; k <= samples; k++ {
				q := b.sideFns[bi][s](float64(k) / samples)
				area += 0.5 * (prev.X*q.Z - q.X*prev.Z)
				perim += dist(prev, q)
				prev = q
			}
		}
		short := -1
		for s := range 4 {
			if dist(b.plan.Vertices[blk.Corners[s]], b.plan.Vertices[blk.Corners[(s+1)%4]]) <= b.tol {
				short = s
			}
		}
		switch {
		case short >= 0:
			errs = append(errs, fmt.Errorf("%s is degenerate: side %d has no length", blockName(bi, blk), short))
		case math.Abs(area) <= 1e-9*perim*perim:
			errs = append(errs, fmt.Errorf("%s is degenerate: it encloses no area", blockName(bi, blk)))
		case area < 0:
			errs = append(errs, fmt.Errorf("%s runs clockwise; its corners must run counter-clockwise", blockName(bi, blk)))
		}
	}
	return errs
}

func (b *builder) checkSets() []error {
	var errs []error
	used := make([]bool, len(b.plan.Vertices))
	for _, blk := range b.plan.Blocks {
		for _, c := range blk.Corners {
			used[c] = true
		}
	}
	for i, s := range b.plan.Sets {
		switch {
		case s.Name == "":
			errs = append(errs, fmt.Errorf("vertex set %d has no name", i))
		case s.Vertex < 0 || s.Vertex >= len(used):
			errs = append(errs, fmt.Errorf("vertex set %q: vertex %d does not exist", s.Name, s.Vertex))
		case !used[s.Vertex]:
			errs = append(errs, fmt.Errorf("vertex set %q: vertex %d is no block corner, so it has no node", s.Name, s.Vertex))
		}
	}
	return errs
}

// generate creates nodes, elements and sets, block by block.
func (b *builder) generate() {
	b.mesh = &Mesh{
		Kind:     b.kind,
		Regions:  slices.Clone(b.plan.Regions),
		NodeSets: map[string][]int{},
		EdgeSets: map[string][]Edge{},
	}
	b.vertexNode = make([]int, len(b.plan.Vertices))
	for i := range b.vertexNode {
		b.vertexNode[i] = -1
	}
	b.sideNodes = make(map[sideKey][]int)
	var edgeNames []string
	edges := map[string][]Edge{}
	for bi := range b.plan.Blocks {
		grid, mu := b.blockNodes(bi)
		first := len(b.mesh.Elements)
		b.blockElements(bi, grid, mu)
		for s, name := range b.plan.Blocks[bi].Sides {
			if name == "" {
				continue
			}
			if edges[name] == nil {
				edgeNames = append(edgeNames, name)
			}
			edges[name] = append(edges[name], b.sideEdges(bi, s, first)...)
		}
	}
	for _, name := range edgeNames {
		chain := chainEdges(edges[name])
		b.mesh.EdgeSets[name] = chain
		for _, e := range chain {
			b.mesh.NodeSets[name] = append(b.mesh.NodeSets[name], e.Nodes...)
		}
	}
	for _, s := range b.plan.Sets {
		b.mesh.NodeSets[s.Name] = append(b.mesh.NodeSets[s.Name], b.vertexNode[s.Vertex])
	}
	for name, ns := range b.mesh.NodeSets {
		slices.Sort(ns)
		b.mesh.NodeSets[name] = slices.Compact(ns)
	}
}

// blockNodes returns the node numbers of block bi's parameter grid, row by
// row (−1 at the element centres of Quad8), and the grid's last column index.
func (b *builder) blockNodes(bi int) ([]int, int) {
	blk := b.plan.Blocks[bi]
	u := gridParams(blk.Divisions[0], blk.Grading[0], b.kind)
	v := gridParams(blk.Divisions[1], blk.Grading[1], b.kind)
	mu, mv := len(u)-1, len(v)-1
	grid := make([]int, 0, (mu+1)*(mv+1))
	for j := range mv + 1 {
		for i := range mu + 1 {
			if b.kind == Quad8 && i%2 == 1 && j%2 == 1 {
				grid = append(grid, -1)
				continue
			}
			grid = append(grid, b.gridNode(bi, i, j, mu, mv, u[i], v[j]))
		}
	}
	return grid, mu
}

// gridNode returns the node at grid point (i, j) of block bi, creating it
// unless a vertex or an already meshed shared side holds it.
func (b *builder) gridNode(bi, i, j, mu, mv int, u, v float64) int {
	blk := b.plan.Blocks[bi]
	switch {
	case i == 0 && j == 0:
		return b.vertex(blk.Corners[0])
	case i == mu && j == 0:
		return b.vertex(blk.Corners[1])
	case i == mu && j == mv:
		return b.vertex(blk.Corners[2])
	case i == 0 && j == mv:
		return b.vertex(blk.Corners[3])
	}
	// On a side: which one, the grid index counted from corner s and the
	// side's parameter there.
	s, k, m, t := -1, 0, 0, 0.0
	switch {
	case j == 0:
		s, k, m, t = 0, i, mu, u
	case i == mu:
		s, k, m, t = 1, j, mv, v
	case j == mv:
		s, k, m, t = 2, mu-i, mu, 1-u
	case i == 0:
		s, k, m, t = 3, mv-j, mv, 1-v
	}
	if s < 0 {
		return b.newNode(b.coons(bi, u, v))
	}
	key, forward, _, _ := sideInfo(blk, s)
	along := b.sideNodes[key]
	if along == nil {
		along = make([]int, m+1)
		for c := range along {
			along[c] = -1
		}
		b.sideNodes[key] = along
	}
	if !forward {
		k = m - k
	}
	if along[k] < 0 {
		// The side's own map, which the Coons map matches there only to
		// rounding: a straight side along z = const keeps its z exactly.
		along[k] = b.newNode(b.sideFns[bi][s](t))
	}
	return along[k]
}

func (b *builder) vertex(vi int) int {
	if b.vertexNode[vi] < 0 {
		b.vertexNode[vi] = b.newNode(b.plan.Vertices[vi])
	}
	return b.vertexNode[vi]
}

func (b *builder) newNode(p Point) int {
	b.mesh.Nodes = append(b.mesh.Nodes, p)
	return len(b.mesh.Nodes) - 1
}

// coons evaluates the transfinite map of block bi at (u, v) ∈ [0, 1]²:
// the sum of the two linear blends of opposite sides minus the bilinear
// blend of the corners.
func (b *builder) coons(bi int, u, v float64) Point {
	f := b.sideFns[bi]
	bot, right := f[0](u), f[1](v)
	top, left := f[2](1-u), f[3](1-v)
	c := b.plan.Blocks[bi].Corners
	vs := b.plan.Vertices
	p0, p1, p2, p3 := vs[c[0]], vs[c[1]], vs[c[2]], vs[c[3]]
	w0, w1, w2, w3 := (1-u)*(1-v), u*(1-v), u*v, (1-u)*v
	return Point{
		X: (1-v)*bot.X + v*top.X + (1-u)*left.X + u*right.X -
			(w0*p0.X + w1*p1.X + w2*p2.X + w3*p3.X),
		Z: (1-v)*bot.Z + v*top.Z + (1-u)*left.Z + u*right.Z -
			(w0*p0.Z + w1*p1.Z + w2*p2.Z + w3*p3.Z),
	}
}

// blockElements appends the elements of block bi, row by row.
func (b *builder) blockElements(bi int, grid []int, mu int) {
	blk := b.plan.Blocks[bi]
	region := b.regionIdx[blk.Region]
	step := 1
	if b.kind == Quad8 {
		step = 2
	}
	at := func(i, j int) int { return grid[j*(mu+1)+i] }
	nk := int(b.kind)
	// One backing array for the block; capped slices keep elements apart.
	all := make([]int, 0, blk.Divisions[0]*blk.Divisions[1]*nk)
	for ej := range blk.Divisions[1] {
		for ei := range blk.Divisions[0] {
			i, j := step*ei, step*ej
			start := len(all)
			all = append(all, at(i, j), at(i+step, j), at(i+step, j+step), at(i, j+step))
			if b.kind == Quad8 {
				all = append(all, at(i+1, j), at(i+2, j+1), at(i+1, j+2), at(i, j+1))
			}
			b.mesh.Elements = append(b.mesh.Elements, Element{Nodes: all[start : start+nk : start+nk], Region: region, Body: blk.Body})
		}
	}
}

// sideEdges returns the element sides along side s of block bi, in the
// side's direction; first is the number of the block's first element.
func (b *builder) sideEdges(bi, s, first int) []Edge {
	n0, n1 := b.plan.Blocks[bi].Divisions[0], b.plan.Blocks[bi].Divisions[1]
	n := b.plan.Blocks[bi].Divisions[s%2]
	edges := make([]Edge, n)
	for k := range n {
		var ei, ej int
		switch s {
		case 0:
			ei, ej = k, 0
		case 1:
			ei, ej = n0-1, k
		case 2:
			ei, ej = n0-1-k, n1-1
		case 3:
			ei, ej = 0, n1-1-k
		}
		e := first + ej*n0 + ei
		edges[k] = Edge{Element: e, Side: s, Nodes: sideNodes(b.mesh.Elements[e].Nodes, s)}
	}
	return edges
}

// sideNodes returns the nodes of side s of an element: its two corners in
// order, then the midside node for Quad8.
func sideNodes(nodes []int, s int) []int {
	out := []int{nodes[s], nodes[(s+1)%4]}
	if len(nodes) == 8 {
		out = append(out, nodes[4+s])
	}
	return out
}

// chainEdges orders edges so that each one starts where the previous one
// ends. Open chains start where no edge of the set ends; several pieces
// follow each other in the order of their first edge in the input.
func chainEdges(in []Edge) []Edge {
	ends := make(map[int]int, len(in))
	starts := make(map[int][]int, len(in))
	for i, e := range in {
		ends[e.Nodes[1]]++
		starts[e.Nodes[0]] = append(starts[e.Nodes[0]], i)
	}
	done := make([]bool, len(in))
	out := make([]Edge, 0, len(in))
	next := func(node int) int {
		for _, i := range starts[node] {
			if !done[i] {
				return i
			}
		}
		return -1
	}
	for len(out) < len(in) {
		cur := -1
		for i, e := range in {
			if !done[i] && ends[e.Nodes[0]] == 0 {
				cur = i
				break
			}
		}
		if cur < 0 { // only closed loops are left
			cur = slices.Index(done, false)
		}
		for cur >= 0 {
			done[cur] = true
			out = append(out, in[cur])
			cur = next(in[cur].Nodes[1])
		}
	}
	return out
}
