package fatigue

import (
	"math"
	"testing"
)

// Constant-amplitude loading: Palmgren–Miner damage is n/N_R in closed
// form, N_R from the EN 1993-1-9 Figure 7.1 line of the range, with γ_Mf
// multiplying the range.
func TestConstantAmplitudeDamage(t *testing.T) {
	c, err := Bolt(30) // k_s = 1: Δσ_C = 50 MPa
	if err != nil {
		t.Fatal(err)
	}
	dsd := 50 * math.Cbrt(0.4)
	cases := []struct {
		name   string
		gamma  float64
		ds, n  float64
		closed float64 // n/N_R worked from the branch
	}{
		{"m = 3", 1, 80, 1e5, 1e5 / (2e6 * math.Pow(50.0/80, 3))},
		{"m = 3, γ_Mf = 1.15", 1.15, 80, 1e5, 1e5 / (2e6 * math.Pow(50/(1.15*80), 3))},
		{"m = 5", 1, 30, 1e7, 1e7 / (5e6 * math.Pow(dsd/30, 5))},
		{"m = 5 pushed over the knee by γ_Mf = 1.35", 1.35, 30, 1e7, 1e7 / (2e6 * math.Pow(50/(1.35*30), 3))},
		{"below the cut-off", 1, 20, 1e9, 0},
	}
	for _, k := range cases {
		m, err := NewMiner(c, k.gamma)
		if err != nil {
			t.Fatal(err)
		}
		// The same cycles through a streamed rainflow count: 2n reversals
		// of ±ds/2 plus the start are n cycles.
		var d float64
		ctr := NewCounter(func(cy Cycle) error {
			d += m.Damage(cy.Range(), cy.Count)
			return nil
		})
		if k.n <= 1e5 {
			for i := 0; i <= 2*int(k.n); i++ {
				_ = ctr.Add(k.ds / 2 * float64(1-2*(i%2)))
			}
			_ = ctr.Finish()
		} else {
			d = m.Damage(k.ds, k.n)
		}
		// 1e-9: the rounding of 10⁵ additions, nothing more.
		if !(math.Abs(d-k.closed) <= 1e-9*math.Max(k.closed, 1e-300)) {
			t.Errorf("%s: D = %.12g, closed form n/N_R = %.12g", k.name, d, k.closed)
		}
	}
	if _, err := NewMiner(c, 0.9); err == nil {
		t.Error("γ_Mf = 0.9 accepted")
	}
}

// The equivalent range does, N_ref times on a single-slope curve, the
// damage of the spectrum (its definition), and is the range itself for a
// constant amplitude at N_ref cycles.
func TestEquivalentRange(t *testing.T) {
	e, err := NewEquivalent(3, 2e6)
	if err != nil {
		t.Fatal(err)
	}
	e.Add(40, 2e6)
	if got := e.Range(); !near(got, 40, 1e-14) {
		t.Errorf("constant 40 MPa at N_ref: Δσ_eq = %g", got)
	}
	single, _ := NewCurve("m = 3", []Branch{{Slope: 3, Range: 50, Cycles: 2e6}})
	m, _ := NewMiner(single, 1)
	blocks := []struct{ ds, n float64 }{{120, 1e3}, {60, 1e5}, {25, 1e7}, {8, 1e8}}
	e, _ = NewEquivalent(3, 2e6)
	var d float64
	for _, b := range blocks {
		e.Add(b.ds, b.n)
		d += m.Damage(b.ds, b.n)
	}
	want := math.Cbrt((1e3*120*120*120 + 1e5*60*60*60 + 1e7*25*25*25 + 1e8*8*8*8) / 2e6)
	if got := e.Range(); !near(got, want, 1e-14) {
		t.Errorf("Δσ_eq = %g, closed form %g", got, want)
	}
	if got := m.Damage(e.Range(), 2e6); !near(got, d, 1e-12) {
		t.Errorf("damage of Δσ_eq at N_ref = %g, of the spectrum %g", got, d)
	}
}

func TestSpectrumBins(t *testing.T) {
	s, _ := NewSpectrum(0.5)
	for _, a := range []struct{ ds, n, d float64 }{{0.2, 10, 0}, {1.0, 2, 0.1}, {1.49, 3, 0.2}, {7.9, 1, 0.4}} {
		if err := s.Add(a.ds, a.n, a.d); err != nil {
			t.Fatal(err)
		}
	}
	bins := s.Bins(4, 10) // 2 MPa wide, listed up to 10 MPa
	if len(bins) != 5 {
		t.Fatalf("%d bins, want 5", len(bins))
	}
	want := []Bin{{0, 2, 15, 0.3}, {2, 4, 0, 0}, {4, 6, 0, 0}, {6, 8, 1, 0.4}, {8, 10, 0, 0}}
	for i, b := range bins {
		if b.From != want[i].From || b.To != want[i].To || b.Cycles != want[i].Cycles || math.Abs(b.Damage-want[i].Damage) > 1e-15 {
			t.Errorf("bin %d = %+v, want %+v", i, b, want[i])
		}
	}
	if err := s.Add(-1, 1, 0); err == nil {
		t.Error("negative range accepted")
	}
}
