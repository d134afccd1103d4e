package mesh

import "math"

// Plan describes a union of quadrilateral blocks that share whole sides.
type Plan struct {
	Vertices []Point
	Curves   []Curve     // optional curved block sides; a side not listed is straight
	Blocks   []Block     // meshed and numbered in this order
	Regions  []Region    // each Block.Region names one of these
	Sets     []VertexSet // optional named node sets holding single vertices
}

// Curve shapes the side between vertices From and To: At(0) is vertex From,
// At(1) vertex To. A block may run the side either way. At must be smooth
// and one-to-one; Build removes a small endpoint mismatch (below 1e-6 of
// the plan's size) so that the side ends exactly on its vertices.
type Curve struct {
	From, To int
	At       func(t float64) Point
}

// Block is a quadrilateral patch mapped from the unit square by transfinite
// (Coons) interpolation of its four sides. Side s runs from corner s to
// corner s+1 (mod 4). Blocks of different Body share no vertex, so they
// are meshed as separate parts whose nodes may coincide (two flanges
// pressed together, a washer on a flange).
type Block struct {
	Corners   [4]int     // vertex indices, counter-clockwise
	Divisions [2]int     // elements along side 0 (c0→c1, also side 2) and side 1 (c1→c2, also side 3)
	Grading   [2]float64 // last/first element length along c0→c1 and c1→c2; 0 or 1 = uniform
	Region    string
	Sides     [4]string // edge-set names for sides 0..3 ("" = none); each also becomes a node set
	Body      int       // part number, copied to the elements
}

// VertexSet names the node at one vertex. Sets of the same name, and an
// edge set of that name, are merged into one node set.
type VertexSet struct {
	Name   string
	Vertex int
}

// Arc returns the circular arc about center that runs the shorter way from
// from to to, with radius |from − center|; a half circle runs
// counter-clockwise. The caller passes points at equal distance from center.
func Arc(center Point, from, to Point) func(t float64) Point {
	r := math.Hypot(from.X-center.X, from.Z-center.Z)
	a0 := math.Atan2(from.Z-center.Z, from.X-center.X)
	d := math.Atan2(to.Z-center.Z, to.X-center.X) - a0
	// Reduce the sweep to (−π, π] so the arc takes the shorter way.
	for d > math.Pi {
		d -= 2 * math.Pi
	}
	for d <= -math.Pi {
		d += 2 * math.Pi
	}
	return func(t float64) Point {
		s, c := math.Sincos(a0 + t*d)
		return Point{center.X + r*c, center.Z + r*s}
	}
}

// EllipseArc returns the arc (cx + ax cos θ, cz + az sin θ) of the ellipse
// with semi-axes ax along x and az along z, θ running from theta0 to theta1
// (radians).
func EllipseArc(center Point, ax, az, theta0, theta1 float64) func(t float64) Point {
	return func(t float64) Point {
		s, c := math.Sincos(theta0 + t*(theta1-theta0))
		return Point{center.X + ax*c, center.Z + az*s}
	}
}

// spacing returns the n+1 parameter values 0 = s_0 < … < s_n = 1 whose
// steps grow geometrically from first to last by the factor r (0 or 1:
// uniform).
func spacing(n int, r float64) []float64 {
	s := make([]float64, n+1)
	q := 1.0
	if r > 0 && r != 1 && n > 1 {
		q = math.Pow(r, 1/float64(n-1))
	}
	h := 1.0
	for k := 1; k <= n; k++ {
		s[k] = s[k-1] + h
		h *= q
	}
	total := s[n]
	for k := range s {
		s[k] /= total
	}
	s[n] = 1
	return s
}

// gridParams returns the parameter values of the node grid along one block
// direction: the element ends, and for Quad8 also the parameter midpoints
// of the elements between them.
func gridParams(n int, r float64, kind Kind) []float64 {
	s := spacing(n, r)
	if kind == Quad4 {
		return s
	}
	g := make([]float64, 2*n+1)
	for k := range n {
		g[2*k] = s[k]
		g[2*k+1] = 0.5 * (s[k] + s[k+1])
	}
	g[2*n] = 1
	return g
}
