package contact

import "math"

// NodeResult is the contact state at a slave node.
type NodeResult struct {
	Node     int
	X, Z     float64 // reference position
	Pressure float64 // MPa, positive in compression
	Gap      float64 // mm, positive open (including gap0); +Inf when not Paired
	Shear    float64 // MPa, tangential traction on the master along its walking direction
	Paired   bool    // whether the node has a projection onto the master
}

// evalAll applies the contact law at every Gauss point from the working
// state, without keeping anything.
func (p *Pair) evalAll(cur []Point) []pointEval {
	evals := make([]pointEval, len(p.points))
	for i := range p.points {
		evals[i] = p.evalPoint(i, cur, &p.working[i])
	}
	return evals
}

// NodeResults returns one result per slave node, ordered along the
// surface. Pressure and shear are recovered from the Gauss points as
// weighted means: each Gauss point counts for a node with its area times a
// non-negative hat function of the node (linear over a 2-node segment and
// over each half of a 3-node one), so a uniform pressure is recovered
// exactly and a recovered value never leaves the range of the Gauss-point
// values. The gap is the node's own distance to the master plus gap0.
// A cur that misses nodes of the pair gives nil.
func (p *Pair) NodeResults(cur []Point) []NodeResult {
	if p.checkCurrent(cur) != nil {
		return nil
	}
	evals := p.evalAll(cur)
	out := make([]NodeResult, len(p.nodes))
	for k, sn := range p.nodes {
		r := NodeResult{Node: sn.node, X: sn.ref.X, Z: sn.ref.Z, Gap: math.Inf(1)}
		var sum, pw, tw float64
		for j, i := range sn.points {
			sum += sn.share[j]
			pw += sn.share[j] * evals[i].pN
			tw += sn.share[j] * evals[i].tT
		}
		if sum > 0 {
			r.Pressure, r.Shear = pw/sum, tw/sum
		}
		hint := -1
		if len(sn.points) > 0 {
			hint = p.working[sn.points[0]].hint
		}
		x := nodeVec(cur, sn.node)
		c, _, ok := p.project(x, cur, hint)
		if p.set.SmallSliding {
			c, _, ok = p.homePoint(sn.home, cur)
		}
		if ok {
			r.Gap, r.Paired = x.sub(c.x).dot(c.n)+sn.gap0, true
		}
		out[k] = r
	}
	return out
}

// Resultant is the total normal force (N, compression positive)
// transmitted, Σ p_N·area over the slave Gauss points, and the x of its
// line of action on the slave surface, in reference coordinates (for the
// prying-force position). x is 0 when no force is transmitted.
func (p *Pair) Resultant(cur []Point) (force, x float64) {
	if p.checkCurrent(cur) != nil {
		return 0, 0
	}
	var moment float64
	for i, e := range p.evalAll(cur) {
		f := e.pN * p.points[i].area
		force += f
		moment += f * p.points[i].ref.X
	}
	if force > 0 {
		x = moment / force
	}
	return force, x
}

// ForceBetween is the normal force (N) transmitted over the slave Gauss
// points whose reference x lies in [x0, x1) (per contact zone). Zones are
// material: a point belongs to the zone it was built in, however the
// surfaces deform.
func (p *Pair) ForceBetween(cur []Point, x0, x1 float64) float64 {
	if p.checkCurrent(cur) != nil {
		return 0
	}
	var force float64
	for i, e := range p.evalAll(cur) {
		if x := p.points[i].ref.X; x >= x0 && x < x1 {
			force += e.pN * p.points[i].area
		}
	}
	return force
}

// MaxPenetration is the largest penetration (mm, ≥ 0) at the slave Gauss
// points, gap0 included.
func (p *Pair) MaxPenetration(cur []Point) float64 {
	if p.checkCurrent(cur) != nil {
		return 0
	}
	pen := 0.0
	for _, e := range p.evalAll(cur) {
		if e.status != unpaired {
			pen = max(pen, -e.g)
		}
	}
	return pen
}
