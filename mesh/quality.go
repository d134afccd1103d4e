package mesh

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
)

// Quality holds shape measures of a mesh. Side lengths and corner angles
// are taken from the straight chords between corner nodes, also for Quad8.
type Quality struct {
	Elements             int
	MinJacobianRatio     float64 // min over elements of min detJ / max |detJ| at the sample points; ≤ 0 means inverted
	MaxAspectRatio       float64 // max over elements of longest / shortest side
	MinAngle, MaxAngle   float64 // extreme corner angles, degrees; above 180 means a re-entrant corner
	WorstJacobianElement int     // element of MinJacobianRatio, -1 if none
	WorstAspectElement   int     // element of MaxAspectRatio, -1 if none
}

// sampleDetJ returns the smallest and the largest absolute Jacobian
// determinant of an element over the 3×3 Gauss points and its nodes.
func sampleDetJ(x []Point) (lo, hiAbs float64) {
	lo = math.Inf(1)
	add := func(d float64) {
		lo = min(lo, d)
		hiAbs = max(hiAbs, math.Abs(d))
	}
	for _, g := range gauss3x3 {
		add(detJ(x, g.xi, g.eta))
	}
	for i := range x {
		add(detJ(x, nodeXi[i], nodeEta[i]))
	}
	return lo, hiAbs
}

// jacobianRatio is min detJ / max |detJ| over the sample points of an
// element, or −Inf for an element that maps to a single point.
func jacobianRatio(x []Point) float64 {
	lo, hi := sampleDetJ(x)
	if hi == 0 {
		return math.Inf(-1)
	}
	return lo / hi
}

// cornerShape returns the longest/shortest side ratio and the smallest and
// largest interior corner angle (degrees) of the corner polygon.
func cornerShape(x []Point) (aspect, minA, maxA float64) {
	lmin, lmax := math.Inf(1), 0.0
	minA, maxA = math.Inf(1), math.Inf(-1)
	for k := range 4 {
		cur, next, prev := x[k], x[(k+1)%4], x[(k+3)%4]
		l := dist(cur, next)
		lmin, lmax = min(lmin, l), max(lmax, l)
		ax, az := next.X-cur.X, next.Z-cur.Z
		bx, bz := prev.X-cur.X, prev.Z-cur.Z
		// Measured counter-clockwise from the outgoing to the incoming side,
		// so a re-entrant corner shows as more than 180°.
		a := math.Atan2(ax*bz-az*bx, ax*bx+az*bz)
		if a < 0 {
			a += 2 * math.Pi
		}
		a *= 180 / math.Pi
		minA, maxA = min(minA, a), max(maxA, a)
	}
	return lmax / lmin, minA, maxA
}

// Quality returns shape measures of the mesh. Elements that Check rejects
// as malformed (wrong node count, missing nodes) are skipped.
func (m *Mesh) Quality() Quality {
	q := Quality{
		MinJacobianRatio:     math.Inf(1),
		MinAngle:             math.Inf(1),
		MaxAngle:             math.Inf(-1),
		WorstJacobianElement: -1,
		WorstAspectElement:   -1,
	}
	for e := range m.Elements {
		x, ok := m.elementCoords(e)
		if !ok {
			continue
		}
		q.Elements++
		if r := jacobianRatio(x); r < q.MinJacobianRatio || q.WorstJacobianElement < 0 {
			q.MinJacobianRatio, q.WorstJacobianElement = r, e
		}
		a, lo, hi := cornerShape(x)
		if a > q.MaxAspectRatio || q.WorstAspectElement < 0 {
			q.MaxAspectRatio, q.WorstAspectElement = a, e
		}
		q.MinAngle, q.MaxAngle = min(q.MinAngle, lo), max(q.MaxAngle, hi)
	}
	if q.Elements == 0 {
		q.MinJacobianRatio, q.MinAngle, q.MaxAngle = 0, 0, 0
	}
	return q
}

// String returns a few lines summarising the measures.
func (q Quality) String() string {
	var s strings.Builder
	fmt.Fprintf(&s, "elements:       %d\n", q.Elements)
	fmt.Fprintf(&s, "Jacobian ratio: min %.3f (element %d)\n", q.MinJacobianRatio, q.WorstJacobianElement)
	fmt.Fprintf(&s, "aspect ratio:   max %.3g (element %d)\n", q.MaxAspectRatio, q.WorstAspectElement)
	fmt.Fprintf(&s, "corner angles:  %.1f° to %.1f°\n", q.MinAngle, q.MaxAngle)
	return s.String()
}

// maxReported bounds the number of faults Check lists one by one.
const maxReported = 20

// Check returns an error listing the faults of the mesh: an unknown kind,
// elements with the wrong number of nodes or with missing nodes or regions,
// node and edge sets that point nowhere, a node used by elements of two
// bodies, nodes of one body that coincide within 1e-9 of the mesh's extent,
// and elements whose Jacobian determinant is not positive (below 1e-12 of
// its largest value) at a 3×3 Gauss point or a node. Coincident nodes of
// different bodies are legitimate (parts in contact); a node that no
// element uses counts as belonging to every body.
func (m *Mesh) Check() error {
	if !m.Kind.valid() {
		return fmt.Errorf("mesh: element kind %d is neither Quad4 nor Quad8", int(m.Kind))
	}
	var f faults
	m.checkElements(&f)
	m.checkSets(&f)
	m.checkDuplicates(&f, m.nodeBodies(&f))
	return f.err()
}

// noBody marks a node that no element uses.
const noBody = math.MinInt

// nodeBodies returns the body of each node, noBody for unused nodes, and
// reports nodes that elements of two bodies share.
func (m *Mesh) nodeBodies(f *faults) []int {
	body := make([]int, len(m.Nodes))
	for i := range body {
		body[i] = noBody
	}
	reported := make(map[int]bool)
	for e, el := range m.Elements {
		for _, n := range el.Nodes {
			if n < 0 || n >= len(body) {
				continue // reported with the element
			}
			switch {
			case body[n] == noBody:
				body[n] = el.Body
			case body[n] != el.Body && !reported[n]:
				reported[n] = true
				f.addf("node %d joins bodies %d and %d (%s); bodies share no nodes", n, body[n], el.Body, m.elementName(e))
			}
		}
	}
	return body
}

// faults collects the first maxReported messages and counts the rest.
type faults struct {
	list []error
	more int
}

func (f *faults) addf(format string, args ...any) {
	if len(f.list) == maxReported {
		f.more++
		return
	}
	f.list = append(f.list, fmt.Errorf(format, args...))
}

func (f *faults) err() error {
	if len(f.list) == 0 {
		return nil
	}
	if f.more > 0 {
		f.list = append(f.list, fmt.Errorf("and %d more faults", f.more))
	}
	return fmt.Errorf("mesh: %w", errors.Join(f.list...))
}

func (m *Mesh) elementName(e int) string {
	if r := m.Elements[e].Region; r >= 0 && r < len(m.Regions) {
		return fmt.Sprintf("element %d (region %q)", e, m.Regions[r].Name)
	}
	return fmt.Sprintf("element %d", e)
}

func (m *Mesh) checkElements(f *faults) {
	for e, el := range m.Elements {
		name := m.elementName(e)
		if el.Region < 0 || el.Region >= len(m.Regions) {
			f.addf("%s: region %d does not exist (%d regions)", name, el.Region, len(m.Regions))
		}
		x, ok := m.elementCoords(e)
		if !ok {
			f.addf("%s: nodes %v do not fit a %v element in a mesh of %d nodes", name, el.Nodes, m.Kind, len(m.Nodes))
			continue
		}
		lo, hi := sampleDetJ(x)
		if !(lo > 1e-12*hi) {
			f.addf("%s is inverted or degenerate: Jacobian determinant %.3g (largest %.3g)", name, lo, hi)
		}
	}
}

func (m *Mesh) checkSets(f *faults) {
	for _, name := range m.NodeSetNames() {
		for _, n := range m.NodeSets[name] {
			if n < 0 || n >= len(m.Nodes) {
				f.addf("node set %q: node %d does not exist", name, n)
			}
		}
	}
	for _, name := range m.EdgeSetNames() {
		for i, ed := range m.EdgeSets[name] {
			if ed.Element < 0 || ed.Element >= len(m.Elements) || ed.Side < 0 || ed.Side > 3 {
				f.addf("edge set %q, edge %d: element %d side %d does not exist", name, i, ed.Element, ed.Side)
				continue
			}
			el := m.Elements[ed.Element].Nodes
			if len(el) != int(m.Kind) {
				continue // reported with the element
			}
			if want := sideNodes(el, ed.Side); !equalInts(want, ed.Nodes) {
				f.addf("edge set %q, edge %d: nodes %v, but side %d of element %d has %v", name, i, ed.Nodes, ed.Side, ed.Element, want)
			}
		}
	}
}

func equalInts(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// maxPairs bounds the work on a mesh with masses of coincident nodes.
const maxPairs = 10000

// checkDuplicates finds nodes of one body closer than 1e-9 of the mesh's
// extent. Nodes are sorted by square cells of that size, so a close pair
// lies in the same or in neighbouring cells, and one sweep over the sorted
// cells with a second cursor one row ahead finds every pair once.
func (m *Mesh) checkDuplicates(f *faults, body []int) {
	lo := Point{math.Inf(1), math.Inf(1)}
	hi := Point{math.Inf(-1), math.Inf(-1)}
	live := 0
	for n, p := range m.Nodes {
		if !finite(p.X) || !finite(p.Z) {
			f.addf("node %d: coordinates (%g, %g) are not finite", n, p.X, p.Z)
			continue
		}
		live++
		lo = Point{min(lo.X, p.X), min(lo.Z, p.Z)}
		hi = Point{max(hi.X, p.X), max(hi.Z, p.Z)}
	}
	tol := 1e-9 * math.Hypot(hi.X-lo.X, hi.Z-lo.Z)
	if tol == 0 && live > 1 {
		f.addf("all %d nodes coincide at (%g, %g)", live, lo.X, lo.Z)
	}
	if !(tol > 0) {
		return
	}
	type entry struct {
		i, j int64
		n    int
	}
	cells := make([]entry, 0, live)
	for n, p := range m.Nodes {
		if finite(p.X) && finite(p.Z) {
			cells = append(cells, entry{int64((p.X - lo.X) / tol), int64((p.Z - lo.Z) / tol), n})
		}
	}
	slices.SortFunc(cells, func(a, b entry) int {
		return cmp.Or(cmp.Compare(a.i, b.i), cmp.Compare(a.j, b.j), cmp.Compare(a.n, b.n))
	})
	var pairs [][2]int
	try := func(a, b int) {
		if body[a] != body[b] && body[a] != noBody && body[b] != noBody {
			return
		}
		if len(pairs) < maxPairs && dist(m.Nodes[a], m.Nodes[b]) <= tol {
			pairs = append(pairs, [2]int{min(a, b), max(a, b)})
		}
	}
	ahead := 0
	for a, e := range cells {
		for b := a + 1; b < len(cells) && cells[b].i == e.i && cells[b].j <= e.j+1; b++ {
			try(e.n, cells[b].n)
		}
		for ahead < len(cells) && (cells[ahead].i < e.i+1 || cells[ahead].i == e.i+1 && cells[ahead].j < e.j-1) {
			ahead++
		}
		for b := ahead; b < len(cells) && cells[b].i == e.i+1 && cells[b].j <= e.j+1; b++ {
			try(e.n, cells[b].n)
		}
	}
	slices.SortFunc(pairs, func(a, b [2]int) int { return cmp.Or(cmp.Compare(a[1], b[1]), cmp.Compare(a[0], b[0])) })
	for _, pr := range pairs {
		p := m.Nodes[pr[1]]
		f.addf("nodes %d and %d coincide at (%g, %g)", pr[0], pr[1], p.X, p.Z)
	}
	if len(pairs) == maxPairs {
		f.addf("the search for coincident nodes stopped after %d pairs", maxPairs)
	}
}
