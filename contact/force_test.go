package contact

import (
	"math"
	"testing"
)

// TestUniformPenetration presses a flat slave face uniformly into a rigid
// flat master: the force must be ε_N·δ·length·weight exactly, whatever the
// segment orders, the segment counts on either side and the Gauss rule
// (the integral runs over the slave). Exact construction: the gap is the
// same constant at every slave point.
func TestUniformPenetration(t *testing.T) {
	const (
		penalty = 1000.0
		delta   = 0.02 // penetration, mm
		length  = 10.0 // slave face, mm
		weight  = 3.0  // strip thickness, mm
	)
	cases := []struct {
		mseg, morder, sseg, sorder, points int
	}{
		{1, 2, 1, 2, 0},
		{4, 2, 4, 2, 0},
		{3, 3, 5, 2, 0},
		{5, 2, 3, 3, 0},
		{7, 3, 5, 3, 0},
		{2, 3, 3, 3, 1},
		{6, 2, 7, 2, 2},
		{3, 3, 4, 3, 5},
	}
	for _, c := range cases {
		for _, g0 := range []float64{0, 0.005, 0.03} {
			m := flat(c.mseg, c.morder, c.sseg, c.sorder)
			p := mustPair(t, m, Settings{Penalty: penalty, Points: c.points},
				func(x, z float64) float64 { return g0 }, func(x, z float64) float64 { return weight })
			cur := m.moved(func(int, Point) (float64, float64) { return 0, -delta })
			want := penalty * math.Max(0, delta-g0) * length * weight
			a := assemble(t, p, cur, true)
			var slaveZ, masterZ []int
			for _, n := range m.slaveNodes() {
				slaveZ = append(slaveZ, 2*n+1)
			}
			for n := range m.ref {
				if !contains(m.slaveNodes(), n) {
					masterZ = append(masterZ, 2*n+1)
				}
			}
			force, x := p.Resultant(cur)
			for _, got := range []float64{force, -sum(a.f, slaveZ), sum(a.f, masterZ)} {
				if !near(got, want, 1e-12) && math.Abs(got-want) > 1e-12 {
					t.Errorf("%+v, gap0 %g: force %.15g, want %.15g", c, g0, got, want)
				}
			}
			if want > 0 && !near(x, length/2, 1e-12) {
				t.Errorf("%+v: line of action at x = %g, want %g", c, x, length/2)
			}
			if want == 0 && len(a.groups) != 0 {
				t.Errorf("%+v, gap0 %g: %d groups emitted for an open face", c, g0, len(a.groups))
			}
			for _, r := range p.NodeResults(cur) {
				wantP := penalty * math.Max(0, delta-g0)
				if math.Abs(r.Pressure-wantP) > 1e-12*penalty || math.Abs(r.Gap-(g0-delta)) > 1e-15 || !r.Paired {
					t.Errorf("%+v, gap0 %g: node %d: pressure %g gap %g paired %v, want %g, %g", c, g0, r.Node, r.Pressure, r.Gap, r.Paired, wantP, g0-delta)
				}
			}
		}
	}
}

func contains(s []int, v int) bool {
	for _, x := range s {
		if x == v {
			return true
		}
	}
	return false
}

// TestFarFromOrigin: fine quadratic segments far from the origin (the
// bolt circle radius in an axisymmetric model) still project exactly.
func TestFarFromOrigin(t *testing.T) {
	m := flat(45, 3, 60, 3)
	for i := range m.ref {
		m.ref[i].X = 3000 + m.ref[i].X/5
	}
	p := mustPair(t, m, Settings{Penalty: 1000}, nil, nil)
	cur := wobble(m.moved(func(int, Point) (float64, float64) { return 0.005, -0.01 }), 1e-4)
	if got := statuses(p, cur); got[pressed] != len(p.points) {
		t.Fatalf("statuses %v, want all %d pressed", got, len(p.points))
	}
	flatCur := m.moved(func(int, Point) (float64, float64) { return 0.005, -0.01 })
	if force, want := mustResultant(p, flatCur), 1000*0.01*2.0; !near(force, want, 1e-9) {
		t.Errorf("force %.12g, want %.12g", force, want)
	}
}

func mustResultant(p *Pair, cur []Point) float64 {
	f, _ := p.Resultant(cur)
	return f
}

// TestUnpairedPoints: slave points beyond the master's end have no
// projection and stay inactive.
func TestUnpairedPoints(t *testing.T) {
	// Master from x = 2 to 8 under a slave from 0 to 10, one segment each
	// 2 mm wide on the slave.
	m := flatSpan(3, 2, 2, 8, 5, 2)
	p := mustPair(t, m, Settings{Penalty: 1000}, nil, nil)
	cur := m.moved(func(int, Point) (float64, float64) { return 0, -0.01 })
	force, _ := p.Resultant(cur)
	if want := 1000 * 0.01 * 6.0; !near(force, want, 1e-12) {
		t.Errorf("force %g, want %g (only the 6 mm over the master)", force, want)
	}
	for _, r := range p.NodeResults(cur) {
		inside := r.X >= 2 && r.X <= 8
		if r.Paired != inside || (!inside && !math.IsInf(r.Gap, 1)) {
			t.Errorf("node at x = %g: paired %v gap %g", r.X, r.Paired, r.Gap)
		}
	}
	if got := statuses(p, cur)[unpaired]; got != 6 {
		t.Errorf("%d unpaired points, want 6 (two slave segments)", got)
	}
}
