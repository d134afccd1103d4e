package contact

import (
	"math"
	"testing"
)

// model is a small two-surface test problem: node positions and the two
// surfaces built from node rows.
type model struct {
	ref           []Point
	slave, master Surface
}

// addNode appends a node and returns its number.
func (m *model) addNode(x, z float64) int {
	m.ref = append(m.ref, Point{x, z})
	return len(m.ref) - 1
}

// row places a chain of nseg segments of the given order (2 or 3 nodes) on
// the curve at(s), s from s0 to s1, and returns its segments in walking
// order from s0 to s1.
func (m *model) row(nseg, order int, s0, s1 float64, at func(s float64) (x, z float64)) [][]int {
	node := func(s float64) int { return m.addNode(at(s)) }
	first := node(s0)
	var segs [][]int
	for k := 0; k < nseg; k++ {
		sa := s0 + (s1-s0)*float64(k)/float64(nseg)
		sb := s0 + (s1-s0)*float64(k+1)/float64(nseg)
		last := node(sb)
		seg := []int{first, last}
		if order == 3 {
			seg = append(seg, node((sa+sb)/2))
		}
		segs = append(segs, seg)
		first = last
	}
	return segs
}

// flat returns a flat master (body below z = 0, x from −1 to 11) and a flat
// slave (body above, x from 0 to 10), with the given segment counts and
// orders.
func flat(mseg, morder, sseg, sorder int) *model {
	return flatSpan(mseg, morder, -1, 11, sseg, sorder)
}

// flatSpan is flat with the master from x0 to x1.
func flatSpan(mseg, morder int, x0, x1 float64, sseg, sorder int) *model {
	m := &model{}
	line := func(s float64) (float64, float64) { return s, 0 }
	// Master body below: walk towards −x to keep it on the left.
	m.master.Segments = m.row(mseg, morder, x1, x0, line)
	m.slave.Segments = m.row(sseg, sorder, 0, 10, line)
	return m
}

// arc returns a curved quadratic master, the top of a disc of radius 20
// (body below), and a slave on the same arc (body above), x from about
// 0.5 to 9.5 over a master from about −1 to 11.
func arc(mseg, sseg, sorder int) *model {
	m := &model{}
	const radius = 20.0
	on := func(s float64) (float64, float64) {
		// s is the angle from the top, positive towards +x.
		return 5 + radius*math.Sin(s), -radius + radius*math.Cos(s)
	}
	m.master.Segments = m.row(mseg, 3, 0.31, -0.31, on)
	m.slave.Segments = m.row(sseg, sorder, -0.23, 0.23, on)
	return m
}

// slaveNodes lists the nodes of the slave surface once each.
func (m *model) slaveNodes() []int {
	seen := map[int]bool{}
	var out []int
	for _, seg := range m.slave.Segments {
		for _, n := range seg {
			if !seen[n] {
				seen[n] = true
				out = append(out, n)
			}
		}
	}
	return out
}

// moved returns ref with u added to the slave nodes.
func (m *model) moved(u func(n int, p Point) (dx, dz float64)) []Point {
	cur := append([]Point(nil), m.ref...)
	for _, n := range m.slaveNodes() {
		dx, dz := u(n, m.ref[n])
		cur[n].X += dx
		cur[n].Z += dz
	}
	return cur
}

// wobble adds a small deterministic disturbance to every node, so that no
// test configuration is special.
func wobble(cur []Point, amp float64) []Point {
	out := append([]Point(nil), cur...)
	for n := range out {
		out[n].X += amp * math.Sin(1.3*float64(n)+0.7)
		out[n].Z += amp * math.Cos(2.1*float64(n)+0.2)
	}
	return out
}

// rotate turns every point by angle about the origin.
func rotate(pts []Point, angle float64) []Point {
	c, s := math.Cos(angle), math.Sin(angle)
	out := make([]Point, len(pts))
	for i, p := range pts {
		out[i] = Point{c*p.X - s*p.Z, s*p.X + c*p.Z}
	}
	return out
}

// assembled is the contact contribution gathered into dense global arrays.
type assembled struct {
	f      []float64
	k      []float64 // row-major n×n
	groups [][]int
}

func assemble(t *testing.T, p *Pair, cur []Point, tangent bool) assembled {
	t.Helper()
	n := 2 * len(cur)
	a := assembled{f: make([]float64, n)}
	if tangent {
		a.k = make([]float64, n*n)
	}
	err := p.Evaluate(cur, tangent, func(dofs []int, f, k []float64) error {
		a.groups = append(a.groups, append([]int(nil), dofs...))
		if len(f) != len(dofs) {
			t.Fatalf("len(f) = %d for %d dofs", len(f), len(dofs))
		}
		for i, d := range dofs {
			a.f[d] += f[i]
		}
		if !tangent {
			if k != nil {
				t.Fatalf("k handed out without tangent")
			}
			return nil
		}
		if len(k) != len(dofs)*len(dofs) {
			t.Fatalf("len(k) = %d for %d dofs", len(k), len(dofs))
		}
		for i, di := range dofs {
			for j, dj := range dofs {
				a.k[di*n+dj] += k[i*len(dofs)+j]
			}
		}
		return nil
	})
	if err != nil {
		t.Fatalf("Evaluate: %v", err)
	}
	return a
}

// fdError compares the tangent at cur with central differences of the
// force, returning max |k − k_fd| / max |k| over all entries.
func fdError(t *testing.T, p *Pair, cur []Point) float64 {
	t.Helper()
	n := 2 * len(cur)
	k := assemble(t, p, cur, true).k
	scale := 0.0
	for _, v := range cur {
		scale = math.Max(scale, math.Max(math.Abs(v.X), math.Abs(v.Z)))
	}
	h := 1e-6 * scale
	worst, kmax := 0.0, 0.0
	for _, v := range k {
		kmax = math.Max(kmax, math.Abs(v))
	}
	if kmax == 0 {
		t.Fatalf("zero tangent: nothing is checked")
	}
	for j := 0; j < n; j++ {
		plus := append([]Point(nil), cur...)
		minus := append([]Point(nil), cur...)
		if j%2 == 0 {
			plus[j/2].X += h
			minus[j/2].X -= h
		} else {
			plus[j/2].Z += h
			minus[j/2].Z -= h
		}
		fp := assemble(t, p, plus, false).f
		fm := assemble(t, p, minus, false).f
		for i := 0; i < n; i++ {
			fd := (fp[i] - fm[i]) / (2 * h)
			worst = math.Max(worst, math.Abs(k[i*n+j]-fd))
		}
	}
	return worst / kmax
}

// statuses counts the Gauss points of each status at cur.
func statuses(p *Pair, cur []Point) map[status]int {
	out := map[status]int{}
	for _, e := range p.evalAll(cur) {
		out[e.status]++
	}
	return out
}

func mustPair(t *testing.T, m *model, s Settings, gap0, weight func(x, z float64) float64) *Pair {
	t.Helper()
	p, err := NewPair("test", m.slave, m.master, m.ref, s, gap0, weight)
	if err != nil {
		t.Fatalf("NewPair: %v", err)
	}
	return p
}

func sum(v []float64, idx []int) float64 {
	s := 0.0
	for _, i := range idx {
		s += v[i]
	}
	return s
}

func near(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))
}
