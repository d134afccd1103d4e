package contact

import (
	"math"
	"testing"
)

// shifted returns the reference positions with the slave nodes moved by
// dz in z.
func shifted(m *model, dz float64) []Point {
	cur := append([]Point(nil), m.ref...)
	for _, n := range m.slaveNodes() {
		cur[n].Z += dz
	}
	return cur
}

// TestChangesCountFlips: a flat slave pressed, then lifted, reports every
// point as having gone from pressed to open.
func TestChangesCountFlips(t *testing.T) {
	m := flat(4, 2, 3, 2)
	p := mustPair(t, m, Settings{Penalty: 1000}, nil, nil)
	assemble(t, p, shifted(m, -1e-3), false)
	if ch := p.Changes(); len(ch) != 0 {
		t.Fatalf("first evaluation: %d changes, want none", len(ch))
	}
	assemble(t, p, shifted(m, 1e-3), false)
	ch := p.Changes()
	if len(ch) != len(p.points) {
		t.Fatalf("%d changes, want all %d points", len(ch), len(p.points))
	}
	for _, c := range ch {
		if c.From != "pressed" || c.To != "open" {
			t.Errorf("point at x = %g: %s → %s, want pressed → open", c.X, c.From, c.To)
		}
	}
}

// TestFreezeHoldsAndCorrects: points frozen pressed keep pulling when the
// slave lifts off; Correct sets them open (their law) and Thaw then finds
// nothing off; within tol, Correct changes nothing.
func TestFreezeHoldsAndCorrects(t *testing.T) {
	m := flat(4, 2, 3, 2)
	p := mustPair(t, m, Settings{Penalty: 1000}, nil, nil)
	p.ResetFlips()
	for _, dz := range []float64{-1e-3, 1e-3, -1e-3} { // two changes each
		assemble(t, p, shifted(m, dz), false)
	}
	if n := p.Flipping(2); n != len(p.points) {
		t.Fatalf("%d points flipping, want %d", n, len(p.points))
	}
	if n := p.Freeze(2); n != len(p.points) {
		t.Fatalf("%d frozen, want %d", n, len(p.points))
	}
	lift := shifted(m, 1e-3)
	f := assemble(t, p, lift, false).f
	// Held pressed at a gap of 1e-3 mm the faces pull: the slave's force
	// (internal) is +z, the penalty times the gap times the length 10.
	want := 1000 * 1e-3 * 10
	if got := sum(f, zDofs(m.slaveNodes())); math.Abs(got-want) > 1e-9*want {
		t.Errorf("frozen pull %g N, want %g", got, want)
	}
	if worst, changed := p.Correct(lift, 2*want); changed != 0 || worst == 0 {
		t.Errorf("within tol: Correct changed %d (worst %g), want none and a nonzero worst", changed, worst)
	}
	if worst, changed := p.Correct(lift, 1e-9); changed != len(p.points) || !(worst > 0) {
		t.Errorf("Correct changed %d (worst %g), want all %d", changed, worst, len(p.points))
	}
	if f := assemble(t, p, lift, false).f; sum(f, zDofs(m.slaveNodes())) != 0 {
		t.Errorf("corrected to open: force %g, want 0", sum(f, zDofs(m.slaveNodes())))
	}
	if v := p.Thaw(lift); v != 0 {
		t.Errorf("Thaw after the correction: %g N off, want 0", v)
	}
}

// TestCyclingCountsReturns: points that go back to an earlier status
// (pressed, open, pressed) are cycling and FreezeCycling holds them;
// points that change once and stay (pressed, open, open wider), or never
// change, are not.
func TestCyclingCountsReturns(t *testing.T) {
	m := flat(4, 2, 3, 2)
	cases := []struct {
		name    string
		dz      []float64
		cycling int
	}{
		{"pressed, open, pressed", []float64{-1e-3, 1e-3, -1e-3}, len(m.slaveNodes())},
		{"pressed, open, open", []float64{-1e-3, 1e-3, 2e-3}, 0},
		{"pressed, pressed harder", []float64{-1e-3, -2e-3}, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p := mustPair(t, m, Settings{Penalty: 1000}, nil, nil)
			p.ResetFlips()
			for _, dz := range c.dz {
				assemble(t, p, shifted(m, dz), false)
			}
			want := 0
			if c.cycling > 0 {
				want = len(p.points)
			}
			if n := p.Cycling(); n != want {
				t.Errorf("%d points cycling, want %d", n, want)
			}
			if n := p.FreezeCycling(); n != want {
				t.Errorf("%d points frozen, want %d", n, want)
			}
			p.ResetFlips()
			if n := p.Cycling(); n != 0 {
				t.Errorf("after ResetFlips %d points cycling, want 0", n)
			}
		})
	}
}

// TestGlueHoldsTheWashers: a glued pair keeps pulling a lifted slave; let
// go, it does not.
func TestGlueHoldsTheWashers(t *testing.T) {
	m := flat(4, 2, 3, 2)
	p := mustPair(t, m, Settings{Penalty: 1000, Friction: 0.2}, nil, nil)
	lift := shifted(m, 1e-3)
	p.Glue(true, true)
	if got := sum(assemble(t, p, lift, false).f, zDofs(m.slaveNodes())); !(got > 0) {
		t.Errorf("glued: force %g on a lifted slave, want a pull (> 0)", got)
	}
	if st := statuses(p, lift); st[sticking] != len(p.points) {
		t.Errorf("glued with stick: statuses %v, want all sticking", st)
	}
	p.Glue(false, false)
	if got := sum(assemble(t, p, lift, false).f, zDofs(m.slaveNodes())); got != 0 {
		t.Errorf("let go: force %g, want 0", got)
	}
}

func zDofs(nodes []int) []int {
	var out []int
	for _, n := range nodes {
		out = append(out, 2*n+1)
	}
	return out
}
