package contact

import (
	"cmp"
	"math"
	"slices"
)

// slavePoint returns the current position of Gauss point i and the slave
// tangent there.
func (p *Pair) slavePoint(i int, cur []Point) (x, t vec) {
	gp := &p.points[i]
	seg := p.slave[gp.seg]
	_, dn, _ := shape(len(seg), gp.r)
	for a, nd := range seg {
		q := nodeVec(cur, nd)
		x = x.add(q.scale(gp.n[a]))
		t = t.add(q.scale(dn[a]))
	}
	return x, t
}

// project finds the master point closest to x. The local search tries
// the hint segment (the last accepted one), then its neighbours; when both
// fail, the global search takes the nearest valid projection over all
// master segments.
func (p *Pair) project(x vec, cur []Point, hint int) (curvePoint, int, bool) {
	if hint >= 0 {
		if c, ok := projectSegment(p.master[hint], cur, x); ok {
			return c, hint, true
		}
		if c, s, ok := p.nearest(x, cur, p.neighbours[hint], math.Inf(1)); ok {
			return c, s, true
		}
	}
	return p.globalSearch(x, cur)
}

// facing returns the master point that slave point i at x is measured
// against: its closest-point projection, or with SmallSliding the master
// point it faced in the reference configuration.
func (p *Pair) facing(i int, x vec, cur []Point, hint int) (curvePoint, int, bool) {
	if p.set.SmallSliding {
		return p.homePoint(p.points[i].home, cur)
	}
	return p.project(x, cur, hint)
}

// homePoint is the master point at a fixed location for SmallSliding: at
// its current position, with the reference configuration's tangent,
// normal and length element.
func (p *Pair) homePoint(at location, cur []Point) (curvePoint, int, bool) {
	if at.seg < 0 {
		return curvePoint{}, -1, false
	}
	return p.masterAt(at, cur), at.seg, true
}

// masterAt evaluates the master surface at a location: in the current
// configuration, or with SmallSliding at the current position along the
// reference geometry.
func (p *Pair) masterAt(at location, cur []Point) curvePoint {
	nodes := p.master[at.seg]
	if !p.set.SmallSliding {
		return evalCurve(nodes, cur, at.r)
	}
	c := evalCurve(nodes, p.ref, at.r)
	n, _, _ := shape(len(nodes), at.r)
	c.x = vec{}
	for a, nd := range nodes {
		c.x = c.x.add(nodeVec(cur, nd).scale(n[a]))
	}
	return c
}

// nearest projects x onto each of the segments and keeps the nearest valid
// projection closer than limit (the first one on a tie).
func (p *Pair) nearest(x vec, cur []Point, segs []int, limit float64) (curvePoint, int, bool) {
	best, bestSeg := curvePoint{}, -1
	for _, s := range segs {
		c, ok := projectSegment(p.master[s], cur, x)
		if !ok {
			continue
		}
		if d := x.sub(c.x).norm(); d < limit {
			best, bestSeg, limit = c, s, d
		}
	}
	return best, bestSeg, bestSeg >= 0
}

// globalSearch visits the master segments in the order of the distance
// from x to their bounding boxes and stops at the first box farther than
// the best projection found.
func (p *Pair) globalSearch(x vec, cur []Point) (curvePoint, int, bool) {
	type candidate struct {
		dist float64
		seg  int
	}
	order := make([]candidate, len(p.master))
	for s, seg := range p.master {
		order[s] = candidate{boxDistance(seg, cur, x), s}
	}
	slices.SortFunc(order, func(a, b candidate) int {
		return cmp.Or(cmp.Compare(a.dist, b.dist), cmp.Compare(a.seg, b.seg))
	})
	best, bestSeg, limit := curvePoint{}, -1, math.Inf(1)
	for _, o := range order {
		if o.dist > limit {
			break
		}
		c, ok := projectSegment(p.master[o.seg], cur, x)
		if !ok {
			continue
		}
		if d := x.sub(c.x).norm(); d < limit {
			best, bestSeg, limit = c, o.seg, d
		}
	}
	return best, bestSeg, bestSeg >= 0
}

// boxDistance is the distance from x to a box that holds the segment: the
// box of its end nodes and, for a 3-node segment, of the Bézier control
// point 2·x_mid − (x_1 + x_2)/2, since a quadratic lies in the hull of its
// Bézier points.
func boxDistance(seg []int, cur []Point, x vec) float64 {
	pts := []vec{nodeVec(cur, seg[0]), nodeVec(cur, seg[1])}
	if len(seg) == 3 {
		pts = append(pts, nodeVec(cur, seg[2]).scale(2).sub(pts[0].add(pts[1]).scale(0.5)))
	}
	lo, hi := pts[0], pts[0]
	for _, q := range pts[1:] {
		lo = vec{min(lo.x, q.x), min(lo.z, q.z)}
		hi = vec{max(hi.x, q.x), max(hi.z, q.z)}
	}
	dx := max(lo.x-x.x, 0, x.x-hi.x)
	dz := max(lo.z-x.z, 0, x.z-hi.z)
	return math.Hypot(dx, dz)
}

// pointEval is the state of one Gauss point at a configuration.
type pointEval struct {
	status status
	seg    int        // master segment of the projection
	m      curvePoint // master at the projection
	xs     vec        // slave point
	gGeo   float64    // geometric gap (x_s − x_m)·n, mm
	g      float64    // gap including gap0, mm
	pN     float64    // pressure, MPa

	// Friction, used when friction is on and the point is active.
	anchor location   // anchor in use
	a      curvePoint // master at the anchor
	s      float64    // elastic tangential displacement t_A·(x_s − x_A), mm
	tT     float64    // tangential traction, MPa
	sign   float64    // slip direction when sliding
	keep   location   // anchor to keep when accepted
	// turned: sliding, against the direction of the point's last
	// evaluation; its tangent is then the sticking one (see Evaluate).
	turned bool
}

// frictional reports whether the tangential terms apply to the point.
func (e *pointEval) frictional() bool {
	return e.status == sticking || e.status == sliding
}

// evalPoint applies the contact law at Gauss point i in configuration cur
// from the history st.
//
// Normal: p_N = max(0, λ_N − ε_N·g). The active set is the sign of
// λ_N − ε_N·g at the configuration itself, and the tangent is the exact
// derivative of the branch in force there. A point exactly at
// λ_N − ε_N·g = 0 — faces that touch without pressure, as flange faces do
// in the reference configuration — counts as pressed: it contributes the
// penalty stiffness at zero force, so the first iteration sees the contact
// instead of letting the bodies pass through each other by a whole
// increment.
//
// Tangential: the slave point sticks elastically to its anchor, a material
// point of the master; s = t_A·(x_s − x_A) with t_A the master's unit
// tangent at the anchor. Trial traction λ_T + ε_T·s; if it exceeds μ·p_N
// the point slides, the traction is returned to μ·p_N in the trial
// direction and the anchor follows the slave point so that
// λ_T + ε_T·s = t_T (the return mapping of Wriggers 2006 and Laursen 2002).
func (p *Pair) evalPoint(i int, cur []Point, st *pointState) pointEval {
	e := pointEval{status: unpaired, seg: -1, keep: nowhere}
	e.xs, _ = p.slavePoint(i, cur)
	c, seg, ok := p.facing(i, e.xs, cur, st.hint)
	if !ok {
		return e
	}
	e.seg, e.m = seg, c
	e.gGeo = e.xs.sub(c.x).dot(c.n)
	e.g = e.gGeo + p.points[i].gap0
	e.keep = p.slidAnchor(&e, cur, 0)
	e.status = open
	held := p.heldStatus(i)
	if held == unpaired && p.glued != unpaired {
		held = p.glued
	}
	trial := st.lambdaN - p.set.Penalty*e.g
	if held == open || (held == unpaired && trial < 0) {
		return e
	}
	// A point held pressed keeps the pressed branch even where the trial
	// pressure has turned tensile (see Freeze).
	e.pN = trial
	e.status = pressed
	if p.set.Friction == 0 || st.anchor.seg < 0 {
		// Without an anchor (the point had no projection when the last
		// increment was accepted) there is nothing to stick to yet.
		return e
	}
	p.returnMap(&e, cur, st, held, p.heldSign(i))
	return e
}

// returnMap computes the tangential traction of a pressed point. A point
// held sticking or sliding (held ≠ unpaired) keeps that branch, sliding
// in direction sign.
func (p *Pair) returnMap(e *pointEval, cur []Point, st *pointState, held status, sign float64) {
	e.anchor = st.anchor
	e.a = p.masterAt(st.anchor, cur)
	e.s = e.a.t.dot(e.xs.sub(e.a.x))
	tr := st.lambdaT + p.set.StickPenalty*e.s
	limit := p.set.Friction * e.pN
	if held == sticking || (held != sliding && math.Abs(tr) <= limit) {
		e.status, e.tT, e.keep = sticking, tr, st.anchor
		return
	}
	e.status, e.sign = sliding, math.Copysign(1, tr)
	if held == sliding {
		e.sign = sign
	}
	e.tT = e.sign * limit
	e.keep = p.slidAnchor(e, cur, (e.tT-st.lambdaT)/p.set.StickPenalty)
}

// slidAnchor places the anchor on the projection's segment at the
// parameter where t(r)·(x_s − x_m(r)) = s, by Newton's method from the
// projection (exact in one step on a straight segment). Beyond the segment
// ends the anchor stays a point of the same segment's extension.
func (p *Pair) slidAnchor(e *pointEval, cur []Point, s float64) location {
	nodes := p.master[e.seg]
	// e.m is the closest point (t·(x_s − x_m) = 0) or, with SmallSliding,
	// the fixed home point, which the slave point may have slid past.
	r := e.m.r + (e.m.t.dot(e.xs.sub(e.m.x))-s)/e.m.length
	if len(nodes) == 2 || p.set.SmallSliding {
		return location{seg: e.seg, r: r}
	}
	for it := 0; it < projectIters; it++ {
		c := evalCurve(nodes, cur, r)
		d := e.xs.sub(c.x)
		dh := c.n.dot(c.b)*c.n.dot(d)/c.length - c.length
		if !(dh < 0) {
			break
		}
		step := -(c.t.dot(d) - s) / dh
		r += step
		if math.Abs(step) <= 1e-12 {
			break
		}
	}
	return location{seg: e.seg, r: r}
}
