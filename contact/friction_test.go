package contact

import (
	"math"
	"testing"
)

// frictionFixture is a flat slave face (x from 0 to 10, weight 2) pressed
// 0.01 mm into a rigid flat master: p_N = 10 MPa; with μ = 0.3 the
// Coulomb limit is 3 MPa; ε_T = 100 MPa/mm.
type frictionFixture struct {
	m *model
	p *Pair
}

func newFrictionFixture(t *testing.T) frictionFixture {
	m := flat(3, 3, 4, 3)
	p := mustPair(t, m, Settings{Penalty: 1000, Friction: 0.3, StickPenalty: 100}, nil,
		func(x, z float64) float64 { return 2 })
	return frictionFixture{m: m, p: p}
}

// at moves the slave by ux along x, pressed 0.01 mm.
func (f frictionFixture) at(ux float64) []Point {
	return f.m.moved(func(int, Point) (float64, float64) { return ux, -0.01 })
}

// shear returns the slave's total x force and the nodal shear tractions.
// The master walks towards −x, so a slave dragged towards +x pulls the
// master against its walking direction: negative shear.
func (f frictionFixture) shear(t *testing.T, ux float64) (fx float64, tractions []float64) {
	cur := f.at(ux)
	a := assemble(t, f.p, cur, false)
	for _, n := range f.m.slaveNodes() {
		fx += a.f[2*n]
	}
	for _, r := range f.p.NodeResults(cur) {
		tractions = append(tractions, r.Shear)
	}
	return fx, tractions
}

func (f frictionFixture) check(t *testing.T, what string, ux, wantT float64) {
	t.Helper()
	const area = 10 * 2.0
	fx, tr := f.shear(t, ux)
	if math.Abs(fx+wantT*area) > 1e-10*area {
		t.Errorf("%s: slave force %g N, want %g", what, fx, -wantT*area)
	}
	for i, v := range tr {
		if math.Abs(v-wantT) > 1e-10 {
			t.Errorf("%s: node %d shear %g MPa, want %g", what, i, v, wantT)
		}
	}
}

func TestFrictionStickSlip(t *testing.T) {
	const (
		epsT  = 100.0
		limit = 0.3 * 10 // μ·p_N, MPa
	)
	f := newFrictionFixture(t)
	// Sticking: t_T = ε_T·s, the internal force resists the motion.
	for _, ux := range []float64{0.001, 0.01, -0.02} {
		f.check(t, "stick", ux, -epsT*ux)
		if got := statuses(f.p, f.at(ux))[sticking]; got != len(f.p.points) {
			t.Errorf("stick at %g: %d of %d points sticking", ux, got, len(f.p.points))
		}
	}
	// Beyond μ·p_N it slides on the limit.
	for _, ux := range []float64{0.05, 0.5, -0.1} {
		f.check(t, "slide", ux, -math.Copysign(limit, ux))
		if got := statuses(f.p, f.at(ux))[sliding]; got != len(f.p.points) {
			t.Errorf("slide at %g: %d of %d points sliding", ux, got, len(f.p.points))
		}
	}
}

func TestFrictionCommitRevert(t *testing.T) {
	const epsT, limit = 100.0, 3.0
	f := newFrictionFixture(t)
	// Slide to 0.05 mm without committing, then Revert: the anchors stay
	// at the start, so 0.04 mm still slides.
	assemble(t, f.p, f.at(0.05), false)
	f.p.Revert()
	f.check(t, "reverted", 0.04, -limit)
	// Commit at 0.05: the slip is 0.05 − limit/ε_T = 0.02 mm, the elastic
	// part 0.03 mm stays. Back to 0.04 mm unloads elastically.
	assemble(t, f.p, f.at(0.05), false)
	f.p.Commit()
	f.check(t, "committed, same place", 0.05, -limit)
	f.check(t, "committed, unloading", 0.04, -(limit - epsT*0.01))
	f.check(t, "committed, back to the start", 0.0, epsT*0.02)
	f.check(t, "committed, reversed", -0.02, limit)
	// A later trial that is reverted leaves the committed history alone.
	assemble(t, f.p, f.at(-0.5), false)
	f.p.Revert()
	f.check(t, "after revert", 0.04, -(limit - epsT*0.01))
	// Lifting off clears the tangential history: after a commit while
	// open, the next contact starts from zero shear where it lands.
	lift := f.m.moved(func(int, Point) (float64, float64) { return 0.3, 0.01 })
	assemble(t, f.p, lift, false)
	f.p.Commit()
	f.check(t, "new contact", 0.3, 0)
	f.check(t, "new contact, moved", 0.31, -epsT*0.01)
}

// TestFrictionAugment: updates of the tangential multiplier pull a
// sticking point back to its anchor under a fixed tangential load, and
// keep a sliding point on the Coulomb limit.
func TestFrictionAugment(t *testing.T) {
	const epsT = 100.0
	f := newFrictionFixture(t)
	cur := f.at(0.01)
	if _, again := f.p.Augment(cur); !again {
		t.Fatal("no update")
	}
	// λ_T = −1 MPa now carries the traction: back at the anchor (ux = 0)
	// the traction stays −1 MPa, and ux = 0.01 gives −2 MPa.
	f.check(t, "stick, back at the anchor", 0, -epsT*0.01)
	f.check(t, "stick, same shift", 0.01, -2*epsT*0.01)
	f.p.Revert()
	slide := f.at(0.2)
	f.p.Augment(slide)
	// λ_T on the limit and the anchor at the current point: unloading by
	// 0.001 mm drops the traction by ε_T·0.001. The normal update doubled
	// the pressure (limit 6 MPa), so the point now sticks at the traction
	// it slid with, until it slides on.
	f.check(t, "slide, unloading", 0.199, -(3 - epsT*0.001))
	f.check(t, "slide, same place", 0.2, -3)
	f.check(t, "slide, on", 0.3, -6)
}

// A sliding point whose slip turns round from one evaluation to the next
// is linearised as sticking for that evaluation (tangential stiffness
// ε_T over its area), while its force stays the law's, μ·p_N in the new
// direction; evaluated again in the same direction it has the sliding
// tangent, with no tangential stiffness. Regularised Coulomb friction
// (Wriggers, Computational Contact Mechanics, 2006): the traction of a
// sliding point does not depend on its slip.
func TestFrictionTurnedSlipStiffens(t *testing.T) {
	const epsT, limit, area = 100.0, 3.0, 10 * 2.0
	f := newFrictionFixture(t)
	slaveX := func(k []float64) float64 {
		n := 2 * len(f.at(0))
		sum := 0.0
		for _, a := range f.m.slaveNodes() {
			for _, b := range f.m.slaveNodes() {
				sum += k[2*a*n+2*b]
			}
		}
		return sum
	}
	steps := []struct {
		what      string
		ux, stiff float64
	}{
		{"sliding towards +x", 0.5, 0},
		{"slip turned round", -0.5, epsT * area},
		{"sliding on towards −x", -0.6, 0},
	}
	for _, s := range steps {
		a := assemble(t, f.p, f.at(s.ux), true)
		if got := slaveX(a.k); math.Abs(got-s.stiff) > 1e-9*epsT*area {
			t.Errorf("%s: tangential stiffness of the slave %g N/mm, want %g", s.what, got, s.stiff)
		}
		f.check(t, s.what, s.ux, -math.Copysign(limit, s.ux))
	}
}
