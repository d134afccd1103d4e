package contact

import (
	"math"
	"testing"
)

// TestResultantLinearPressure: a slave face tilted onto a rigid flat
// master carries p(x) = ε_N·(δ0 + α·x) on x ∈ [0, L]. Exact construction:
// the integrals F = ε_N·(δ0·L + α·L²/2)·w and x̄ = ∫x·p/∫p, which the Gauss
// rules integrate exactly.
func TestResultantLinearPressure(t *testing.T) {
	const (
		penalty = 1000.0
		d0      = 0.01  // penetration at x = 0, mm
		alpha   = 0.002 // its slope
		length  = 10.0
		w       = 2.5
	)
	integral := func(x0, x1 float64) (force, moment float64) {
		force = penalty * w * (d0*(x1-x0) + alpha*(x1*x1-x0*x0)/2)
		moment = penalty * w * (d0*(x1*x1-x0*x0)/2 + alpha*(x1*x1*x1-x0*x0*x0)/3)
		return force, moment
	}
	for _, c := range []struct{ mseg, morder, sseg, sorder int }{{3, 2, 5, 2}, {2, 3, 5, 3}, {7, 2, 10, 2}} {
		m := flat(c.mseg, c.morder, c.sseg, c.sorder)
		p := mustPair(t, m, Settings{Penalty: penalty}, nil, func(x, z float64) float64 { return w })
		cur := m.moved(func(n int, q Point) (float64, float64) { return 0, -(d0 + alpha*q.X) })
		force, x := p.Resultant(cur)
		wantF, wantM := integral(0, length)
		if !near(force, wantF, 1e-12) || !near(x, wantM/wantF, 1e-12) {
			t.Errorf("%+v: resultant %g at x = %g, want %g at %g", c, force, x, wantF, wantM/wantF)
		}
		// Zones on segment boundaries (every 2 mm for 5 segments, 1 mm for 10).
		total := 0.0
		for _, z := range [][2]float64{{-1, 4}, {4, 6}, {6, 20}} {
			got := p.ForceBetween(cur, z[0], z[1])
			want, _ := integral(math.Max(z[0], 0), math.Min(z[1], length))
			if !near(got, want, 1e-12) {
				t.Errorf("%+v: force in [%g, %g) %g, want %g", c, z[0], z[1], got, want)
			}
			total += got
		}
		if !near(total, force, 1e-12) {
			t.Errorf("%+v: zones sum to %g, resultant %g", c, total, force)
		}
		// Interior nodes recover the linear pressure exactly (symmetric hats).
		for _, r := range p.NodeResults(cur) {
			if r.X == 0 || r.X == length {
				continue
			}
			if want := penalty * (d0 + alpha*r.X); !near(r.Pressure, want, 1e-12) {
				t.Errorf("%+v: pressure at x = %g: %g, want %g", c, r.X, r.Pressure, want)
			}
		}
		// The deepest Gauss point is the one nearest x = L.
		last := 0.0
		for _, gp := range p.points {
			last = math.Max(last, gp.ref.X)
		}
		if pen, want := p.MaxPenetration(cur), d0+alpha*last; !near(pen, want, 1e-12) {
			t.Errorf("%+v: max penetration %g, want %g", c, pen, want)
		}
	}
}

// TestNodeOrder: NodeResults follow the surface whatever order its
// segments are listed in.
func TestNodeOrder(t *testing.T) {
	m := flat(2, 2, 4, 3)
	segs := m.slave.Segments
	m.slave.Segments = [][]int{segs[2], segs[0], segs[3], segs[1]}
	p := mustPair(t, m, Settings{Penalty: 1}, nil, nil)
	res := p.NodeResults(m.ref)
	if len(res) != 9 {
		t.Fatalf("%d node results, want 9", len(res))
	}
	for i := 1; i < len(res); i++ {
		if !(res[i].X > res[i-1].X) {
			t.Errorf("node results not along the surface: x = %g after %g", res[i].X, res[i-1].X)
		}
	}
}
