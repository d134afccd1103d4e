package contact

import (
	"fmt"
	"math"
	"slices"
)

// vec is a vector of the x–z plane.
type vec struct{ x, z float64 }

func (a vec) add(b vec) vec          { return vec{a.x + b.x, a.z + b.z} }
func (a vec) sub(b vec) vec          { return vec{a.x - b.x, a.z - b.z} }
func (a vec) scale(s float64) vec    { return vec{s * a.x, s * a.z} }
func (a vec) dot(b vec) float64      { return a.x*b.x + a.z*b.z }
func (a vec) norm() float64          { return math.Sqrt(a.x*a.x + a.z*a.z) }
func (a vec) right() vec             { return vec{a.z, -a.x} }
func toVec(p Point) vec              { return vec{p.X, p.Z} }
func finitePoint(p Point) bool       { return isFinite(p.X) && isFinite(p.Z) }
func isFinite(v float64) bool        { return !math.IsNaN(v) && !math.IsInf(v, 0) }
func nodeVec(cur []Point, n int) vec { return toVec(cur[n]) }

// shape evaluates the shape functions of a 2-node (linear) or 3-node
// (quadratic: ends, then midside) segment at the parameter r ∈ [−1, 1]:
// values, first and second derivatives with respect to r.
func shape(nodes int, r float64) (n, dn, ddn [3]float64) {
	if nodes == 2 {
		n = [3]float64{(1 - r) / 2, (1 + r) / 2}
		dn = [3]float64{-0.5, 0.5}
		return n, dn, ddn
	}
	n = [3]float64{r * (r - 1) / 2, r * (r + 1) / 2, 1 - r*r}
	dn = [3]float64{r - 0.5, r + 0.5, -2 * r}
	ddn = [3]float64{1, 1, -2}
	return n, dn, ddn
}

// curvePoint is a segment evaluated at one parameter: position x, tangent
// a = dx/dr and b = d²x/dr², with the unit tangent t = a/|a| and the outward
// unit normal n = (t_z, −t_x), to the right of the walking direction.
type curvePoint struct {
	r       float64
	x, a, b vec
	length  float64 // |a|
	t, n    vec
}

// evalCurve evaluates the segment with the given nodes at r in the
// coordinates cur.
func evalCurve(nodes []int, cur []Point, r float64) curvePoint {
	c := curvePoint{r: r}
	c.x, c.a, c.b = curveAt(nodes, cur, r)
	c.length = c.a.norm()
	if c.length > 0 {
		c.t = c.a.scale(1 / c.length)
	}
	c.n = c.t.right()
	return c
}

// curveAt is the position and the first and second derivatives of the
// segment at r.
func curveAt(nodes []int, cur []Point, r float64) (x, a, b vec) {
	n, dn, ddn := shape(len(nodes), r)
	for i, nd := range nodes {
		p := nodeVec(cur, nd)
		x = x.add(p.scale(n[i]))
		a = a.add(p.scale(dn[i]))
		b = b.add(p.scale(ddn[i]))
	}
	return x, a, b
}

// Projection limits: the parameter may overshoot the segment ends by
// paramSlack so that a point exactly above a shared node finds one of the
// two segments despite rounding.
const (
	paramSlack   = 1e-9
	projectIters = 30
)

// projectSegment finds the closest point of the segment to x by Newton's
// method on (x − x_m(r))·a(r) = 0 and reports whether it lies on the
// segment with a positive second derivative of the distance (a proper,
// differentiable minimum).
func projectSegment(nodes []int, cur []Point, x vec) (curvePoint, bool) {
	ends := [2]vec{nodeVec(cur, nodes[0]), nodeVec(cur, nodes[1])}
	chord := ends[1].sub(ends[0])
	cc := chord.dot(chord)
	if cc == 0 {
		return curvePoint{}, false
	}
	// The chord projection is exact for a straight segment and a good start
	// for a curved one.
	r := 2*x.sub(ends[0]).dot(chord)/cc - 1
	c := evalCurve(nodes, cur, r)
	if len(nodes) == 3 {
		var ok bool
		if r, ok = newtonProject(nodes, cur, x, r); !ok {
			return curvePoint{}, false
		}
		c = evalCurve(nodes, cur, r)
	}
	if math.IsNaN(r) || math.Abs(r) > 1+paramSlack {
		return curvePoint{}, false
	}
	gap := x.sub(c.x).dot(c.n)
	if c.a.dot(c.a)-gap*c.n.dot(c.b) <= 0 {
		return curvePoint{}, false
	}
	return c, true
}

// newtonProject solves (x − x_m(r))·a(r) = 0 on a curved segment from r.
// Rounding bounds the attainable step at about ε·|x|/|a|, so the iteration
// stops one step after the step has fallen below convergedStep: with
// quadratic convergence that last step leaves only rounding.
func newtonProject(nodes []int, cur []Point, x vec, r float64) (float64, bool) {
	const convergedStep = 1e-8
	last := false
	for it := 0; it < projectIters; it++ {
		xm, a, b := curveAt(nodes, cur, r)
		d := x.sub(xm)
		df := d.dot(b) - a.dot(a)
		if !(df < 0) {
			return r, false
		}
		step := -d.dot(a) / df
		r += step
		if last {
			return r, true
		}
		last = math.Abs(step) <= convergedStep
	}
	return r, false
}

// gaussLegendre returns the points and weights of the n-point
// Gauss–Legendre rule on [−1, 1]: the roots of the Legendre polynomial P_n
// by Newton's method from the usual cosine estimates, and the weights
// 2/((1 − x²)·P_n′(x)²).
func gaussLegendre(n int) (pts, wts []float64, err error) {
	if n < 1 || n > maxPoints {
		return nil, nil, fmt.Errorf("contact: %d Gauss points: want 1 to %d", n, maxPoints)
	}
	pts, wts = make([]float64, n), make([]float64, n)
	for i := 0; i < (n+1)/2; i++ {
		x := math.Cos(math.Pi * (float64(i) + 0.75) / (float64(n) + 0.5))
		for it := 0; it < 50; it++ {
			p, dp := legendre(n, x)
			step := p / dp
			x -= step
			if math.Abs(step) < 1e-15 {
				break
			}
		}
		_, dp := legendre(n, x)
		w := 2 / ((1 - x*x) * dp * dp)
		pts[i], pts[n-1-i] = -x, x
		wts[i], wts[n-1-i] = w, w
	}
	if n%2 == 1 {
		pts[n/2] = 0
	}
	return pts, wts, nil
}

// legendre evaluates P_n(x) and P_n′(x) for |x| < 1 by the three-term
// recurrence k·P_k = (2k − 1)·x·P_{k−1} − (k − 1)·P_{k−2}.
func legendre(n int, x float64) (p, dp float64) {
	prev, p := 1.0, x
	for k := 2; k <= n; k++ {
		prev, p = p, ((2*float64(k)-1)*x*p-(float64(k)-1)*prev)/float64(k)
	}
	return p, float64(n) * (x*p - prev) / (x*x - 1)
}

// chainOrder lists the segments so that they follow each other along the
// surface where they connect end to end: each chain starts at a segment
// whose first node ends no other segment. Segments that do not chain keep
// their given order.
func chainOrder(segs [][]int) []int {
	next := map[int]int{} // first node → segment
	ends := map[int]bool{}
	for s, seg := range segs {
		if _, dup := next[seg[0]]; !dup {
			next[seg[0]] = s
		}
		ends[seg[1]] = true
	}
	done := make([]bool, len(segs))
	order := make([]int, 0, len(segs))
	follow := func(s int) {
		for !done[s] {
			done[s] = true
			order = append(order, s)
			n, ok := next[segs[s][1]]
			if !ok {
				return
			}
			s = n
		}
	}
	for s, seg := range segs {
		if !done[s] && !ends[seg[0]] {
			follow(s)
		}
	}
	for s := range segs {
		if !done[s] {
			follow(s)
		}
	}
	return order
}

// neighbours lists, per segment, the other segments that share an end
// node with it, in ascending order.
func neighbours(segs [][]int) [][]int {
	byNode := map[int][]int{}
	for s, seg := range segs {
		for _, n := range seg[:2] {
			byNode[n] = append(byNode[n], s)
		}
	}
	out := make([][]int, len(segs))
	for s, seg := range segs {
		for _, n := range seg[:2] {
			for _, o := range byNode[n] {
				if o != s && !slices.Contains(out[s], o) {
					out[s] = append(out[s], o)
				}
			}
		}
		slices.Sort(out[s])
	}
	return out
}
