package contact

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// springModel is a tiny 1D problem of our own: a flat slave face pressed
// onto a rigid flat master by a force F on a load point, joined to each
// slave node by a stiff vertical spring. Unknowns: the z of the slave
// nodes and of the load point; the slave's x stays fixed.
type springModel struct {
	m       *model
	springs []float64 // stiffness per slave node, N/mm
	force   float64   // on the load point, downwards, N
	z       []float64 // slave node z, then the load point's
}

func (s *springModel) current() []Point {
	cur := append([]Point(nil), s.m.ref...)
	for i, n := range s.m.slaveNodes() {
		cur[n].Z += s.z[i]
	}
	return cur
}

// solve runs Newton's method to equilibrium: f_ext − f_spring − f_contact = 0.
func (s *springModel) solve(t *testing.T, p *Pair) {
	t.Helper()
	nodes := s.m.slaveNodes()
	nu := len(nodes) + 1
	load := nu - 1
	for it := 0; it < 30; it++ {
		cur := s.current()
		a := assemble(t, p, cur, true)
		r := make([]float64, nu)
		k := mat.NewDense(nu, nu, nil)
		r[load] = -s.force
		for i, n := range nodes {
			stretch := s.z[i] - s.z[load]
			r[i] -= s.springs[i]*stretch + a.f[2*n+1]
			r[load] += s.springs[i] * stretch
			k.Set(i, i, k.At(i, i)+s.springs[i])
			k.Set(load, load, k.At(load, load)+s.springs[i])
			k.Set(i, load, -s.springs[i])
			k.Set(load, i, -s.springs[i])
			for j, m := range nodes {
				k.Set(i, j, k.At(i, j)+a.k[(2*n+1)*2*len(cur)+2*m+1])
			}
		}
		if mat.Norm(mat.NewVecDense(nu, r), math.Inf(1)) <= 1e-10*s.force {
			return
		}
		var du mat.VecDense
		if err := du.SolveVec(k, mat.NewVecDense(nu, r)); err != nil {
			t.Fatalf("solve: %v", err)
		}
		for i := range s.z {
			s.z[i] += du.AtVec(i)
		}
	}
	t.Fatal("Newton's method did not converge")
}

// TestAugmentFixedForce: under a fixed force, the augmented-Lagrangian
// updates drive the penetration below the tolerance while the force
// transmitted stays the applied one.
func TestAugmentFixedForce(t *testing.T) {
	m := flat(3, 2, 2, 3)
	// Uzawa's iteration contracts by about k/(k + ε_N·A) per update for a
	// spring k behind a contact area A: a penalty well above the structure's
	// stiffness converges in a few updates.
	p := mustPair(t, m, Settings{Penalty: 1e4, Tolerance: 1e-4}, nil, nil)
	s := &springModel{m: m, springs: []float64{1e3, 2e3, 3e3, 4e3, 5e3}, force: 2000}
	s.z = make([]float64, len(m.slaveNodes())+1)
	for i := range s.z {
		s.z[i] = -0.01 // start pressed, so the first tangent is regular
	}
	var history []float64
	for update := 0; ; update++ {
		if update > 20 {
			t.Fatalf("penetration %v: not within tolerance after 20 updates", history)
		}
		s.solve(t, p)
		pen, again := p.Augment(s.current())
		history = append(history, pen)
		if update > 0 && pen >= history[update-1] {
			t.Errorf("penetration did not fall: %v", history)
		}
		if !again {
			break
		}
	}
	t.Logf("largest penetration after each solve: %.3g", history)
	if history[0] < 0.01 {
		t.Errorf("pure penalty penetration %g, expected about F/(ε·L) = 0.02 mm", history[0])
	}
	final := history[len(history)-1]
	if final > p.Settings().Tolerance || p.MaxPenetration(s.current()) != final {
		t.Errorf("final penetration %g (MaxPenetration %g), tolerance %g", final, p.MaxPenetration(s.current()), p.Settings().Tolerance)
	}
	if f, _ := p.Resultant(s.current()); !near(f, s.force, 1e-9) {
		t.Errorf("transmitted force %g, want %g", f, s.force)
	}
}

// TestAugmentRevertCommit: multipliers from Augment are dropped by Revert
// and kept by Commit.
func TestAugmentRevertCommit(t *testing.T) {
	m := flat(2, 2, 2, 2)
	p := mustPair(t, m, Settings{Penalty: 1000}, nil, nil)
	cur := m.moved(func(int, Point) (float64, float64) { return 0, -0.01 })
	before, _ := p.Resultant(cur)
	if pen, again := p.Augment(cur); !again || !near(pen, 0.01, 1e-12) {
		t.Fatalf("Augment: penetration %g again %v", pen, again)
	}
	after, _ := p.Resultant(cur)
	if !near(after, 2*before, 1e-12) {
		t.Errorf("after one update at the same position force %g, want %g (λ = ε·δ added)", after, 2*before)
	}
	p.Revert()
	if f, _ := p.Resultant(cur); !near(f, before, 1e-12) {
		t.Errorf("after Revert force %g, want %g", f, before)
	}
	p.Augment(cur)
	p.Commit()
	p.Revert()
	if f, _ := p.Resultant(cur); !near(f, after, 1e-12) {
		t.Errorf("after Commit and Revert force %g, want %g", f, after)
	}
	// Within tolerance nothing changes.
	touch := m.moved(func(int, Point) (float64, float64) { return 0, -1e-4 })
	f0, _ := p.Resultant(touch)
	if _, again := p.Augment(touch); again {
		t.Error("Augment asks for more within tolerance")
	}
	if f1, _ := p.Resultant(touch); f1 != f0 {
		t.Errorf("Augment within tolerance changed the force from %g to %g", f0, f1)
	}
}
