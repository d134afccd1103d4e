package contact

import (
	"errors"
	"fmt"
	"math"
	"slices"
)

// Point is a node position in the x–z section, mm.
type Point struct{ X, Z float64 }

// Surface is a chain of element sides. Each segment lists 2 nodes (linear)
// or 3 nodes (ends, then midside: quadratic) ordered so that the body lies
// to the left when walking from the first to the second node; the outward
// normal therefore points to the right of the walking direction:
// n = (t_z, −t_x)/|t| for the tangent t.
type Surface struct{ Segments [][]int }

// Settings tune the enforcement of a pair. Zero values select the defaults
// given with each field.
type Settings struct {
	Penalty      float64 // normal penalty ε_N, MPa/mm (pressure per mm of penetration); must be > 0
	Friction     float64 // Coulomb coefficient μ (0 = frictionless)
	StickPenalty float64 // tangential regularisation ε_T, MPa/mm (0 → 0.1·Penalty)
	Tolerance    float64 // target: largest penetration after augmentation, mm (0 → 1e-3)
	Points       int     // Gauss points per slave segment (0 → 4 for 3-node, 3 for 2-node segments)

	// SymmetricTangent hands out the symmetric part (k+kᵀ)/2 of each
	// contact tangent, for a symmetric solver. Only sliding friction makes
	// the tangent non-symmetric, so without friction, or while every point
	// sticks, nothing changes; while points slide Newton's method converges
	// linearly instead of quadratically. The forces are untouched, so the
	// equilibrium reached is the same.
	SymmetricTangent bool

	// NoSlidingStiffness leaves the friction coupling −μ·σ·ε_N·∂s⊗∂g of
	// sliding points out of the tangent. Its symmetric part is indefinite,
	// so with it a symmetric tangent can stop a Cholesky factorization;
	// without it, and with FrozenGeometry or SmallSliding, the tangent
	// stays positive semi-definite. The forces are untouched: the
	// equilibrium is the same. The coupling left out is handed separately
	// by SlidingCouplings; a solver that ignores it converges linearly
	// while points slide.
	NoSlidingStiffness bool

	// FrozenGeometry leaves the geometric terms out of the tangent: those
	// from the change of the normal, of the tangent and of the projection
	// point, which scale with the pressure (−p_N·∂²g) and the shear
	// (t_T·∂²s). What remains is the tangent of frozen geometry,
	// ε_N·∂g⊗∂g plus the frictional penalty terms: for the normal part the
	// Gauss–Newton approximation of the penalty energy, positive
	// semi-definite. The full tangent is indefinite when the pressure is
	// high against the stiffness of the bodies — typically the first
	// iteration after contact closes with a very stiff penalty, when the
	// trial penetration is a whole increment — which a Cholesky
	// factorization rejects. Forces are untouched; Newton's method then
	// converges linearly, at a rate of about p_N·area/length over the
	// stiffness of the bodies, which for flange faces under service
	// pressures is small.
	FrozenGeometry bool

	// SmallSliding measures gap and slip along the normal and tangent of
	// the reference configuration, against the master point that each
	// slave point faces there: the contact of small-deformation analysis
	// (Wriggers 2006, the small-sliding case). Both are then linear in the
	// displacements and the tangent is exact, geometric terms being nil
	// by construction, so Newton's method converges in one iteration once
	// the contact status settles. Slip and rotation must stay small: a
	// slave point keeps its master segment, extended past its ends if it
	// slides beyond them. Without it, contact is searched and measured in
	// the current configuration (finite sliding), which large-deformation
	// analysis needs.
	SmallSliding bool
}

// maxPoints bounds the Gauss rule per slave segment.
const maxPoints = 16

// Pair presses a slave surface against a master surface, integrated over
// the slave (surface-to-surface: pressure × weight × length element at slave
// Gauss points, each point projected onto the master), so the pressure is
// right on non-matching meshes.
//
// A Pair holds three levels of state per Gauss point: committed (the last
// accepted increment), working (committed plus the multiplier updates of
// Augment within the increment) and trial (what the last Evaluate or
// Augment found, kept for Commit). It is not safe for concurrent use.
type Pair struct {
	name    string
	set     Settings // defaults filled in
	slave   [][]int
	master  [][]int
	points  []gaussPoint
	nodes   []slaveNode // slave nodes ordered along the surface
	used    []int       // every node of the pair, ascending
	maxNode int
	// neighbours lists, per master segment, the segments that share an end
	// node with it: the second try of the local search.
	neighbours [][]int
	// ref holds the reference coordinates of all nodes (SmallSliding
	// measures along the reference normals).
	ref []Point

	committed, working []pointState
	trial              []trialState
	hasTrial           bool
	couplings          []Block // SlidingCouplings of the last tangent evaluation
	// before holds each point's status at the Evaluate before the last,
	// changed whether the last one changed it, lastPressure its pressure
	// there (for Changes).
	before       []status
	changed      []bool
	lastPressure []float64
	hasEvaluated bool
	// flips counts each point's status changes in the current solve;
	// held, when not nil, the status each point is frozen at (unpaired:
	// free), lastSign the slip direction of its last evaluation.
	flips    []uint8
	held     []status
	lastSign []float64
	// returns counts each point's changes in the current solve back to
	// the status (and slip direction) it had before its previous change:
	// a point going round a cycle, not one carried along by a moving
	// contact edge; prior and priorSign are that earlier status.
	returns   []uint8
	prior     []status
	priorSign []float64
	// glued: the status Glue holds every point at (unpaired: none).
	glued status
}

// gaussPoint is an integration point of the slave surface.
type gaussPoint struct {
	seg  int        // slave segment
	r    float64    // parameter on the segment
	n    [3]float64 // slave shape function values
	area float64    // weight × reference length element × Gauss weight, mm²
	ref  Point      // reference position
	gap0 float64    // initial gap, mm
	home location   // master point faced in the reference configuration
}

// slaveNode carries a slave node's share of the Gauss points for the
// recovery of pressure and shear.
type slaveNode struct {
	node   int
	ref    Point     // reference position
	gap0   float64   // initial gap at the node, mm
	home   location  // master point faced in the reference configuration
	points []int     // Gauss points that touch the node
	share  []float64 // their non-negative recovery weights × area
}

// location is a material point of the master surface: a segment and a
// parameter on it. seg < 0 means none.
type location struct {
	seg int
	r   float64
}

var nowhere = location{seg: -1}

// pointState is the history of one Gauss point.
type pointState struct {
	lambdaN float64  // normal multiplier, MPa
	lambdaT float64  // tangential multiplier, MPa
	anchor  location // master point the slave point sticks to
	hint    int      // master segment of the last accepted projection, start of the search
}

// status classifies a Gauss point.
type status int

const (
	unpaired status = iota // no projection onto the master
	open                   // projected, no pressure
	pressed                // pressure, no tangential traction (frictionless)
	sticking               // pressure, elastic stick
	sliding                // pressure, traction on the Coulomb limit
)

// trialState is what the last evaluation found for a Gauss point.
type trialState struct {
	status status
	proj   location // current projection
	anchor location // anchor to keep when the increment is accepted
}

// NewPair checks and builds a pair. ref are the reference coordinates of
// ALL nodes (indexed by node number). gap0(x, z) is an initial gap (mm,
// positive open) added at a slave point of reference position (x, z): the
// machined recess/taper/parallel-gap profile (nil = 0). weight(x, z) is the
// out-of-plane thickness at a slave point (strip thickness, or 2πx in
// axisymmetry); nil = 1.
//
// The master point that each slave point faces in the reference
// configuration becomes its first stick anchor.
func NewPair(name string, slave, master Surface, ref []Point, s Settings,
	gap0, weight func(x, z float64) float64) (*Pair, error) {
	set, err := resolve(s)
	if err != nil {
		return nil, fmt.Errorf("contact: pair %q: %w", name, err)
	}
	p := &Pair{name: name, set: set, maxNode: -1, ref: slices.Clone(ref)}
	if p.slave, err = p.checkSurface(slave, ref); err != nil {
		return nil, fmt.Errorf("contact: pair %q: slave surface: %w", name, err)
	}
	if p.master, err = p.checkSurface(master, ref); err != nil {
		return nil, fmt.Errorf("contact: pair %q: master surface: %w", name, err)
	}
	if gap0 == nil {
		gap0 = func(x, z float64) float64 { return 0 }
	}
	if weight == nil {
		weight = func(x, z float64) float64 { return 1 }
	}
	if err := p.buildPoints(ref, gap0, weight); err != nil {
		return nil, fmt.Errorf("contact: pair %q: %w", name, err)
	}
	if err := p.buildNodes(ref, gap0); err != nil {
		return nil, fmt.Errorf("contact: pair %q: %w", name, err)
	}
	p.collectNodes()
	p.neighbours = neighbours(p.master)
	if err := p.initialState(ref); err != nil {
		return nil, fmt.Errorf("contact: pair %q: %w", name, err)
	}
	return p, nil
}

// Name returns the pair's name.
func (p *Pair) Name() string { return p.name }

// Settings returns the pair's settings with the defaults filled in.
func (p *Pair) Settings() Settings { return p.set }

func resolve(s Settings) (Settings, error) {
	switch {
	case !(s.Penalty > 0) || math.IsInf(s.Penalty, 0):
		return s, fmt.Errorf("penalty %g MPa/mm: must be positive and finite", s.Penalty)
	case !(s.Friction >= 0) || math.IsInf(s.Friction, 0):
		return s, fmt.Errorf("friction coefficient %g: must be zero or positive", s.Friction)
	case !(s.StickPenalty >= 0) || math.IsInf(s.StickPenalty, 0):
		return s, fmt.Errorf("stick penalty %g MPa/mm: must be zero (default) or positive", s.StickPenalty)
	case !(s.Tolerance >= 0) || math.IsInf(s.Tolerance, 0):
		return s, fmt.Errorf("penetration tolerance %g mm: must be zero (default) or positive", s.Tolerance)
	case s.Points < 0 || s.Points > maxPoints:
		return s, fmt.Errorf("%d Gauss points per segment: want 0 (default) to %d", s.Points, maxPoints)
	}
	if s.StickPenalty == 0 {
		s.StickPenalty = 0.1 * s.Penalty
	}
	if s.Tolerance == 0 {
		s.Tolerance = 1e-3
	}
	return s, nil
}

// checkSurface validates a surface against the node table and returns a
// copy of its segments.
func (p *Pair) checkSurface(s Surface, ref []Point) ([][]int, error) {
	if len(s.Segments) == 0 {
		return nil, errors.New("no segments")
	}
	segs := make([][]int, len(s.Segments))
	for i, seg := range s.Segments {
		if len(seg) != 2 && len(seg) != 3 {
			return nil, fmt.Errorf("segment %d has %d nodes: want 2 or 3", i, len(seg))
		}
		for j, n := range seg {
			if n < 0 || n >= len(ref) {
				return nil, fmt.Errorf("segment %d: node %d outside the %d reference nodes", i, n, len(ref))
			}
			if !finitePoint(ref[n]) {
				return nil, fmt.Errorf("segment %d: node %d has a non-finite position", i, n)
			}
			for _, m := range seg[:j] {
				if m == n {
					return nil, fmt.Errorf("segment %d repeats node %d", i, n)
				}
			}
			p.maxNode = max(p.maxNode, n)
		}
		if toVec(ref[seg[0]]) == toVec(ref[seg[1]]) {
			return nil, fmt.Errorf("segment %d: end nodes %d and %d coincide", i, seg[0], seg[1])
		}
		segs[i] = append([]int(nil), seg...)
	}
	return segs, nil
}

func (p *Pair) pointsFor(nodes int) int {
	if p.set.Points > 0 {
		return p.set.Points
	}
	if nodes == 3 {
		return 4
	}
	return 3
}

// buildPoints places the Gauss points on the slave surface with their
// reference area and initial gap.
func (p *Pair) buildPoints(ref []Point, gap0, weight func(x, z float64) float64) error {
	for s, seg := range p.slave {
		pts, wts, err := gaussLegendre(p.pointsFor(len(seg)))
		if err != nil {
			return err
		}
		for q, r := range pts {
			c := evalCurve(seg, ref, r)
			n, _, _ := shape(len(seg), r)
			at := Point{c.x.x, c.x.z}
			w, g := weight(at.X, at.Z), gap0(at.X, at.Z)
			if !(w >= 0) || math.IsInf(w, 0) {
				return fmt.Errorf("weight %g at slave point (%g, %g): must be zero or positive and finite", w, at.X, at.Z)
			}
			if !isFinite(g) {
				return fmt.Errorf("initial gap %g at slave point (%g, %g): must be finite", g, at.X, at.Z)
			}
			p.points = append(p.points, gaussPoint{seg: s, r: r, n: n, area: w * c.length * wts[q], ref: at, gap0: g})
		}
	}
	return nil
}

// recoveryWeights are non-negative hat functions that split a segment among
// its nodes for the recovery of nodal values: linear over a 2-node segment,
// linear over each half of a 3-node one (end, midside, end). Unlike the
// quadratic shape functions they never turn negative, so a recovered
// pressure is a weighted mean and stays within the Gauss-point values.
func recoveryWeights(nodes int, r float64) [3]float64 {
	if nodes == 2 {
		return [3]float64{(1 - r) / 2, (1 + r) / 2}
	}
	if r < 0 {
		return [3]float64{-r, 0, 1 + r}
	}
	return [3]float64{0, r, 1 - r}
}

// buildNodes orders the slave nodes along the surface and gives each its
// recovery weights.
func (p *Pair) buildNodes(ref []Point, gap0 func(x, z float64) float64) error {
	index := map[int]int{}
	for _, s := range chainOrder(p.slave) {
		seg := p.slave[s]
		order := []int{seg[0]}
		if len(seg) == 3 {
			order = append(order, seg[2])
		}
		order = append(order, seg[1])
		for _, n := range order {
			if _, ok := index[n]; !ok {
				index[n] = len(p.nodes)
				p.nodes = append(p.nodes, slaveNode{node: n})
			}
		}
	}
	for i, gp := range p.points {
		seg := p.slave[gp.seg]
		w := recoveryWeights(len(seg), gp.r)
		for a, n := range seg {
			if w[a] == 0 {
				continue
			}
			sn := &p.nodes[index[n]]
			sn.points = append(sn.points, i)
			sn.share = append(sn.share, w[a]*gp.area)
		}
	}
	p.coverBareNodes(index)
	for i := range p.nodes {
		sn := &p.nodes[i]
		sn.ref = ref[sn.node]
		sn.gap0 = gap0(sn.ref.X, sn.ref.Z)
		if !isFinite(sn.gap0) {
			return fmt.Errorf("initial gap %g at slave node %d: must be finite", sn.gap0, sn.node)
		}
	}
	return nil
}

// coverBareNodes gives a node that no hat function reaches (the ends of a
// 3-node segment under a 1-point rule) the plain mean of its segments'
// points.
func (p *Pair) coverBareNodes(index map[int]int) {
	bare := make([]bool, len(p.nodes))
	for k := range p.nodes {
		bare[k] = len(p.nodes[k].points) == 0
	}
	for i, gp := range p.points {
		for _, n := range p.slave[gp.seg] {
			if k := index[n]; bare[k] {
				p.nodes[k].points = append(p.nodes[k].points, i)
				p.nodes[k].share = append(p.nodes[k].share, gp.area)
			}
		}
	}
}

// collectNodes lists every node of the pair for the input checks.
func (p *Pair) collectNodes() {
	seen := make([]bool, p.maxNode+1)
	for _, surf := range [2][][]int{p.slave, p.master} {
		for _, seg := range surf {
			for _, n := range seg {
				seen[n] = true
			}
		}
	}
	for n, ok := range seen {
		if ok {
			p.used = append(p.used, n)
		}
	}
}

// initialState anchors every slave point at the master point it faces in
// the reference configuration, and rejects surfaces that face the same way
// (a reversed segment order is the usual cause).
func (p *Pair) initialState(ref []Point) error {
	p.committed = make([]pointState, len(p.points))
	p.working = make([]pointState, len(p.points))
	p.trial = make([]trialState, len(p.points))
	p.before = make([]status, len(p.points))
	p.changed = make([]bool, len(p.points))
	p.lastPressure = make([]float64, len(p.points))
	p.flips = make([]uint8, len(p.points))
	p.returns = make([]uint8, len(p.points))
	p.prior = make([]status, len(p.points))
	p.priorSign = make([]float64, len(p.points))
	p.lastSign = make([]float64, len(p.points))
	facing, same := 0, 0
	for i := range p.points {
		st := pointState{anchor: nowhere, hint: -1}
		xs, ts := p.slavePoint(i, ref)
		p.points[i].home = nowhere
		if c, seg, ok := p.project(xs, ref, -1); ok {
			st.anchor = location{seg: seg, r: c.r}
			st.hint = seg
			p.points[i].home = st.anchor
			if ts.right().dot(c.n) < 0 {
				facing++
			} else {
				same++
			}
		}
		p.committed[i] = st
	}
	copy(p.working, p.committed)
	for k := range p.nodes {
		sn := &p.nodes[k]
		sn.home = nowhere
		if c, seg, ok := p.project(toVec(ref[sn.node]), ref, -1); ok {
			sn.home = location{seg: seg, r: c.r}
		}
	}
	if same > 0 && facing == 0 {
		return errors.New("the slave and master surfaces face the same way: the body must lie to the left of each segment's first-to-second node direction")
	}
	return nil
}
