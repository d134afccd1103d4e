package contact

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// Evaluate computes the contact contribution at current node coordinates
// cur (= ref + u, indexed by node number). For every run of active slave
// Gauss points of one slave segment that share their nodes it calls
// add(dofs, f, k): dofs are node dofs 2·node + d (d = 0 for x, 1 for z) of
// the slave segment, the master segment the points project onto and, with
// friction, the master segment of their stick anchor if that is another
// one; f is the contribution to the INTERNAL force vector (so residual =
// f_ext − f_int − f_contact) and k = ∂f/∂u (row-major, len(dofs)², nil
// when tangent is false). The slices are fresh on every call.
//
// The contact search (closest-point projection of each slave point onto
// the master surface, starting from the segment of the last accepted
// increment and its neighbours, with a global search over master segments
// when those fail)
// happens here. Points without a master projection are inactive. Evaluate
// does not change committed state; it keeps the trial frictional state for
// Commit.
func (p *Pair) Evaluate(cur []Point, tangent bool, add func(dofs []int, f, k []float64) error) error {
	if err := p.checkCurrent(cur); err != nil {
		return err
	}
	var acc accumulator
	acc.tangent = tangent
	if tangent {
		p.couplings = p.couplings[:0]
	}
	flush := func() error {
		if len(acc.nodes) == 0 {
			return nil
		}
		if acc.coupling != nil {
			p.couplings = append(p.couplings, Block{Dofs: nodeDofs(acc.nodes), K: acc.coupling})
		}
		dofs, f, k := acc.hand(p.set.SymmetricTangent)
		if err := add(dofs, f, k); err != nil {
			return fmt.Errorf("contact: pair %q: %w", p.name, err)
		}
		return nil
	}
	lastSeg := -1
	for i := range p.points {
		if s := p.points[i].seg; s != lastSeg {
			if err := flush(); err != nil {
				return err
			}
			lastSeg = s
		}
		st := &p.working[i]
		e := p.evalPoint(i, cur, st)
		p.before[i] = p.trial[i].status
		// A sliding point whose slip turns round changes branch too.
		e.turned = e.status == sliding && p.trial[i].status == sliding && e.sign != p.lastSign[i]
		p.changed[i] = p.hasEvaluated && (e.status != p.trial[i].status || e.turned)
		if p.changed[i] {
			p.noteChange(i, e.status, e.sign)
		}
		p.lastPressure[i] = e.pN
		p.lastSign[i] = e.sign
		p.trial[i] = trialState{status: e.status, proj: location{seg: e.seg, r: e.m.r}, anchor: e.keep}
		if e.status == unpaired || e.status == open {
			continue
		}
		nodes := p.groupNodes(i, e.seg, st)
		if !slices.Equal(nodes, acc.nodes) {
			if err := flush(); err != nil {
				return err
			}
			acc.start(nodes)
		}
		p.accumulate(&acc, i, &e)
	}
	p.hasTrial, p.hasEvaluated = true, true
	return flush()
}

// Couplings lists the dof groups Evaluate may produce at cur: the group of
// every slave Gauss point that projects onto the master, pressed or not,
// each distinct group once, in the order of the slave points. A group that
// Evaluate emits at cur is always among them.
func (p *Pair) Couplings(cur []Point) [][]int {
	if p.checkCurrent(cur) != nil {
		return nil
	}
	var groups [][]int
	seen := map[string]bool{}
	for i := range p.points {
		st := &p.working[i]
		xs, _ := p.slavePoint(i, cur)
		_, seg, ok := p.facing(i, xs, cur, st.hint)
		if !ok {
			continue
		}
		nodes := p.groupNodes(i, seg, st)
		key := nodeKey(nodes)
		if seen[key] {
			continue
		}
		seen[key] = true
		groups = append(groups, nodeDofs(nodes))
	}
	return groups
}

// checkCurrent rejects a configuration that misses nodes of the pair or
// places one at a non-finite position.
func (p *Pair) checkCurrent(cur []Point) error {
	if len(cur) <= p.maxNode {
		return fmt.Errorf("contact: pair %q: %d current positions, node %d needs at least %d", p.name, len(cur), p.maxNode, p.maxNode+1)
	}
	for _, n := range p.used {
		if !finitePoint(cur[n]) {
			return fmt.Errorf("contact: pair %q: node %d at a non-finite position (%g, %g)", p.name, n, cur[n].X, cur[n].Z)
		}
	}
	return nil
}

// groupNodes lists the nodes a Gauss point couples: its slave segment, the
// master segment it projects onto and, with friction, its anchor's master
// segment.
func (p *Pair) groupNodes(i, seg int, st *pointState) []int {
	nodes := slices.Clone(p.slave[p.points[i].seg])
	more := [][]int{p.master[seg]}
	if p.set.Friction > 0 && st.anchor.seg >= 0 && st.anchor.seg != seg {
		more = append(more, p.master[st.anchor.seg])
	}
	for _, m := range more {
		for _, n := range m {
			if !slices.Contains(nodes, n) {
				nodes = append(nodes, n)
			}
		}
	}
	return nodes
}

func nodeKey(nodes []int) string {
	var b strings.Builder
	for _, n := range nodes {
		b.WriteString(strconv.Itoa(n))
		b.WriteByte(',')
	}
	return b.String()
}

func nodeDofs(nodes []int) []int {
	dofs := make([]int, 0, 2*len(nodes))
	for _, n := range nodes {
		dofs = append(dofs, 2*n, 2*n+1)
	}
	return dofs
}

// accumulator sums the contributions of Gauss points with the same nodes.
type accumulator struct {
	tangent bool
	nodes   []int
	f, k    []float64
	// coupling collects the friction coupling of sliding points that
	// NoSlidingStiffness keeps out of k; nil until a point needs it.
	coupling []float64
	// Work vectors over the group's dofs.
	gg, ga, gn, gs, gna, gta, gnd []float64
	// Shape coefficients over the group's nodes.
	cs, cm, cam, ca, caa []float64
}

func (a *accumulator) start(nodes []int) {
	a.nodes = nodes
	nd := 2 * len(nodes)
	a.f = make([]float64, nd)
	a.k, a.coupling = nil, nil
	if a.tangent {
		a.k = make([]float64, nd*nd)
	}
	for _, v := range []*[]float64{&a.gg, &a.ga, &a.gn, &a.gs, &a.gna, &a.gta, &a.gnd} {
		*v = resize(*v, nd)
	}
	for _, v := range []*[]float64{&a.cs, &a.cm, &a.cam, &a.ca, &a.caa} {
		*v = resize(*v, len(nodes))
	}
}

// hand returns the group and clears the accumulator.
func (a *accumulator) hand(symmetric bool) (dofs []int, f, k []float64) {
	dofs, f, k = nodeDofs(a.nodes), a.f, a.k
	if symmetric && k != nil {
		nd := len(dofs)
		for i := 0; i < nd; i++ {
			for j := i + 1; j < nd; j++ {
				m := (k[i*nd+j] + k[j*nd+i]) / 2
				k[i*nd+j], k[j*nd+i] = m, m
			}
		}
	}
	a.nodes, a.f, a.k = nil, nil, nil
	return dofs, f, k
}

// Block is a dense coupling over a group of dofs, row-major
// len(Dofs)×len(Dofs), not symmetric.
type Block struct {
	Dofs []int
	K    []float64
}

// SlidingCouplings returns the friction coupling −μ·σ·ε_N·∂s⊗∂g of the
// points that slid in the last Evaluate with a tangent, which
// NoSlidingStiffness leaves out of the tangent it hands out: a solver may
// add it to its products with the tangent (an iterative solve
// preconditioned by the factorized symmetric tangent) and keep Newton's
// method quadratic while points slide. Nil when no point slid or without
// NoSlidingStiffness. The blocks stay valid until the next Evaluate.
func (p *Pair) SlidingCouplings() []Block { return p.couplings }

func resize(v []float64, n int) []float64 {
	if cap(v) < n {
		return make([]float64, n)
	}
	v = v[:n]
	clear(v)
	return v
}

// coefficients writes the shape function values (or derivatives) of a
// segment's nodes at r into c, over the group's nodes.
func (a *accumulator) coefficients(c []float64, seg []int, r float64, deriv bool) {
	clear(c)
	n, dn, _ := shape(len(seg), r)
	for i, nd := range seg {
		j := slices.Index(a.nodes, nd)
		if deriv {
			c[j] += dn[i]
		} else {
			c[j] += n[i]
		}
	}
}

// contract writes v·(c1 − c2) per dof into out: the variation of v·(x1 − x2)
// for points x1, x2 with node coefficients c1, c2 (c2 may be nil).
func contract(out []float64, v vec, c1, c2 []float64) {
	for i := range c1 {
		c := c1[i]
		if c2 != nil {
			c -= c2[i]
		}
		out[2*i], out[2*i+1] = c*v.x, c*v.z
	}
}

// outer adds s·(u⊗w) to the row-major square matrix k.
func outer(k []float64, s float64, u, w []float64) {
	nd := len(u)
	for i, ui := range u {
		if ui == 0 {
			continue
		}
		row := k[i*nd : (i+1)*nd]
		for j, wj := range w {
			row[j] += s * ui * wj
		}
	}
}

func axpy(y []float64, s float64, x []float64) {
	for i, v := range x {
		y[i] += s * v
	}
}

// accumulate adds one pressed Gauss point to the group.
//
// With W the point's area, d = x_s − x_m and m = |a|² − g·(n·b), the
// normal part is f = −W·p_N·∂g and k = W·(ε_N·∂g⊗∂g − p_N·∂²g) with
//
//	∂g   = n·(δx_s − δx_m)
//	∂²g  = −[(n·b)·A⊗A + |a|·(N⊗A + A⊗N) + g·N⊗N]/m,
//	A = t·(δx_s − δx_m),  N = n·δa,
//
// the closest-point projection's own change included, so the tangent is
// consistent for finite sliding on straight and curved master segments
// (Wriggers 2006 gives the straight-segment case).
//
// The tangential part is f = W·t_T·∂s with s = t_A·(x_s − x_A):
//
//	∂s  = (n_A·d_A)/|a_A|·N_A + t_A·(δx_s − δx_A)
//	∂²s = [−(n_A·d_A)·(N_A⊗T_A + T_A⊗N_A) − (t_A·d_A)·N_A⊗N_A]/|a_A|²
//	      + (N_A⊗D + D⊗N_A)/|a_A|,
//	N_A = n_A·δa_A,  T_A = t_A·δa_A,  D = n_A·(δx_s − δx_A),
//
// and k = W·(ε_T·∂s⊗∂s + t_T·∂²s) when sticking, or
// k = W·(−μ·σ·ε_N·∂s⊗∂g + t_T·∂²s) when sliding in direction σ, which is
// not symmetric (NoSlidingStiffness leaves the first term out). FrozenGeometry
// leaves out the terms with ∂²g and ∂²s.
func (p *Pair) accumulate(a *accumulator, i int, e *pointEval) {
	gp := &p.points[i]
	a.coefficients(a.cs, p.slave[gp.seg], gp.r, false)
	p.addNormal(a, gp.area, e)
	if e.frictional() {
		p.addTangential(a, gp.area, e)
	}
}

// addNormal adds the pressure of a point of area w.
func (p *Pair) addNormal(a *accumulator, w float64, e *pointEval) {
	m := &e.m
	seg := p.master[e.seg]
	a.coefficients(a.cm, seg, m.r, false)
	contract(a.gg, m.n, a.cs, a.cm)
	axpy(a.f, -w*e.pN, a.gg)
	if a.k == nil {
		return
	}
	outer(a.k, w*p.set.Penalty, a.gg, a.gg)
	if p.set.FrozenGeometry || p.set.SmallSliding {
		return
	}
	a.coefficients(a.cam, seg, m.r, true)
	contract(a.ga, m.t, a.cs, a.cm)
	contract(a.gn, m.n, a.cam, nil)
	// −p_N·∂²g
	c := w * e.pN / (m.length*m.length - e.gGeo*m.n.dot(m.b))
	outer(a.k, c*m.n.dot(m.b), a.ga, a.ga)
	outer(a.k, c*m.length, a.gn, a.ga)
	outer(a.k, c*m.length, a.ga, a.gn)
	outer(a.k, c*e.gGeo, a.gn, a.gn)
}

// addTangential adds the shear of a sticking or sliding point of area w;
// addNormal has filled ∂g.
func (p *Pair) addTangential(a *accumulator, w float64, e *pointEval) {
	an := &e.a
	seg := p.master[e.anchor.seg]
	a.coefficients(a.ca, seg, an.r, false)
	a.coefficients(a.caa, seg, an.r, true)
	d := e.xs.sub(an.x)
	nd, td := an.n.dot(d), an.t.dot(d)
	contract(a.gna, an.n, a.caa, nil)
	contract(a.gs, an.t, a.cs, a.ca)
	if !p.set.SmallSliding {
		// the anchor's tangent turns with the master
		axpy(a.gs, nd/an.length, a.gna)
	}
	axpy(a.f, w*e.tT, a.gs)
	if a.k == nil {
		return
	}
	// A point whose slip turned round since the last evaluation is
	// linearised as sticking: its traction has crossed the whole range
	// ±μ·p_N between two iterates, so the solution most likely holds it
	// stuck in between, and a sliding tangent (no tangential stiffness)
	// would send the next step as far the other way. Whole faces sliding
	// to and fro from one iteration to the next stalled the preload of
	// finely meshed joints.
	switch {
	case e.status == sticking || e.turned:
		outer(a.k, w*p.set.StickPenalty, a.gs, a.gs)
	case !p.set.NoSlidingStiffness:
		outer(a.k, -w*p.set.Friction*e.sign*p.set.Penalty, a.gs, a.gg)
	default:
		if a.coupling == nil {
			a.coupling = make([]float64, len(a.k))
		}
		outer(a.coupling, -w*p.set.Friction*e.sign*p.set.Penalty, a.gs, a.gg)
	}
	if p.set.FrozenGeometry || p.set.SmallSliding {
		return
	}
	contract(a.gta, an.t, a.caa, nil)
	contract(a.gnd, an.n, a.cs, a.ca)
	// t_T·∂²s
	l2 := an.length * an.length
	c := w * e.tT
	outer(a.k, -c*nd/l2, a.gna, a.gta)
	outer(a.k, -c*nd/l2, a.gta, a.gna)
	outer(a.k, -c*td/l2, a.gna, a.gna)
	outer(a.k, c/an.length, a.gna, a.gnd)
	outer(a.k, c/an.length, a.gnd, a.gna)
}
