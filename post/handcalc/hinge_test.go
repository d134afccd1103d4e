package handcalc

import (
	"math"
	"testing"
)

// handJoint is an invented segment (our numbers, not a published case):
// a = 60, b = 50, c = 100, t = 20, t_f = 60, d_h = 33 mm, f_y = 300 MPa,
// bolt resistance F_u = 560 kN (about A_s·f_ub of an M30 10.9). Per segment:
//
//	M_pl,shell  = 300·100·20²/4      =  3.000e6 N·mm
//	N_pl        = 300·100·20         =  6.000e5 N
//	flange, shell face = 300·100·60²/4 = 27.000e6 N·mm
//	M_pl,flange = 300·(100 − 33)·60²/4 = 18.090e6 N·mm
func handJoint() Hinges {
	return Hinges{A: 60, B: 50, Bolt: 560e3, Shell: 3e6, ShellAxial: 600e3,
		FlangeGross: 27e6, FlangeNet: 18.09e6, LeverLimit: 1.25}
}

// Petersen's three mechanisms (Petersen, Stahlbau — formulas from memory,
// arithmetic by hand) on handJoint. a' = min(60, 1.25·50 = 62.5) = 60.
//
//	A: Z = F_u = 560 000 N
//	B: junction in the shell, (560e3·60 + 3e6)/(60 + 50) = 36.6e6/110 = 332 727.3 N
//	   (in the flange it would be (33.6e6 + 27e6)/110 = 550 909 N)
//	C: (18.09e6 + 3e6)/50 = 421 800 N
//
// so mode B governs.
func TestPetersenHandWorked(t *testing.T) {
	m, err := Petersen(handJoint())
	if err != nil {
		t.Fatal(err)
	}
	checkMechanisms(t, "Petersen", m, [3]float64{560e3, 332727.3, 421800}, ModeB, SiteShell)
}

// Seidel's extension on handJoint (from memory; arithmetic by hand).
// k = M_pl/N_pl² = 3e6/(6e5)² = 8.3333e-6 /N.
//
//	B: L = 110, R = 36.6e6: √(110² + 4·8.3333e-6·36.6e6) = √(12100 + 1220) = 115.412,
//	   Z = 2·36.6e6/(110 + 115.412) = 324 738 N.
//	   Check: M_pl,N = 3e6·(1 − (324738/6e5)²) = 2.1212e6, (33.6e6 + 2.1212e6)/110 = 324 738 N.
//	C: L = 50, R = 21.09e6: √(2500 + 703) = 56.595, Z = 42.18e6/106.595 = 395 703 N.
func TestSeidelHandWorked(t *testing.T) {
	m, err := Seidel(handJoint())
	if err != nil {
		t.Fatal(err)
	}
	checkMechanisms(t, "Seidel", m, [3]float64{560e3, 324738, 395703}, ModeB, SiteShell)
}

func checkMechanisms(t *testing.T, name string, m Mechanisms, want [3]float64, mode Mode, site Site) {
	t.Helper()
	for i, got := range []float64{m.A, m.B, m.C} {
		if !near(got, want[i], 2e-6) {
			t.Errorf("%s: mode %c = %.1f N, hand %.1f", name, 'A'+i, got, want[i])
		}
	}
	if m.Governing != mode || m.Junction != site {
		t.Errorf("%s: governing %s at %q, want %s at %q", name, m.Governing, m.Junction, mode, site)
	}
	if m.Z != math.Min(m.A, math.Min(m.B, m.C)) {
		t.Errorf("%s: Z = %g is not the smallest mode", name, m.Z)
	}
}

// The mode-B lever arm bound a' = min(a, 1.25·b) (from memory; see
// Petersen). With a = 80, b = 50: a' = 62.5,
// Z_B = (560e3·62.5 + 3e6)/(62.5 + 50) = 38e6/112.5 = 337 777.8 N; without the
// bound (560e3·80 + 3e6)/130 = 47.8e6/130 = 367 692.3 N.
func TestLeverLimit(t *testing.T) {
	cases := []struct {
		limit, arm, zB float64
	}{
		{1.25, 62.5, 337777.8},
		{0, 80, 367692.3},
	}
	for _, c := range cases {
		h := handJoint()
		h.A, h.LeverLimit = 80, c.limit
		m, err := Petersen(h)
		if err != nil {
			t.Fatal(err)
		}
		if m.LeverArm != c.arm || !near(m.B, c.zB, 1e-6) {
			t.Errorf("limit %g: a' = %g, Z_B = %.1f; want %g, %.1f", c.limit, m.LeverArm, m.B, c.arm, c.zB)
		}
	}
}

// With a stiff shell the junction hinge sits in the flange, and as the
// flange thickens the governing mode runs C → B → A (the trend of the
// plastic-hinge method). On handJoint with f_y = 300, c = 100, d_h = 33 the
// flange moments are 7500·t_f² (shell face) and 5025·t_f² (bolt line), so
// C < B for t_f < 40.9 mm and B < A for t_f < 61.1 mm (by hand).
func TestGoverningModeTrend(t *testing.T) {
	cases := []struct {
		tf   float64
		mode Mode
	}{
		{20, ModeC}, {30, ModeC}, {40, ModeC},
		{42, ModeB}, {50, ModeB}, {60, ModeB},
		{62, ModeA}, {80, ModeA}, {120, ModeA},
	}
	for _, c := range cases {
		h := handJoint()
		h.Shell, h.ShellAxial = 1e12, 1e12 // a shell that never yields
		h.FlangeGross = 300 * 100 * c.tf * c.tf / 4
		h.FlangeNet = 300 * 67 * c.tf * c.tf / 4
		for _, method := range []struct {
			name string
			f    func(Hinges) (Mechanisms, error)
		}{{"Petersen", Petersen}, {"Seidel", Seidel}} {
			m, err := method.f(h)
			if err != nil {
				t.Fatal(err)
			}
			if m.Governing != c.mode {
				t.Errorf("%s t_f = %g: mode %s (A %.0f, B %.0f, C %.0f), want %s",
					method.name, c.tf, m.Governing, m.A, m.B, m.C, c.mode)
			}
			if c.mode != ModeA && m.Junction != SiteFlange {
				t.Errorf("%s t_f = %g: junction hinge in the %s, want the flange", method.name, c.tf, m.Junction)
			}
		}
	}
}

// The M–N reduction only lowers the shell-hinge modes, and as N/N_pl → 0
// (N_pl grown with M_pl fixed) Seidel's values tend to Petersen's; the gap
// shrinks with 1/N_pl².
func TestSeidelTendsToPetersen(t *testing.T) {
	h := handJoint()
	p, _ := Petersen(h)
	prev := math.Inf(1)
	for _, scale := range []float64{1, 10, 100, 1000} {
		hs := h
		hs.ShellAxial *= scale
		s, err := Seidel(hs)
		if err != nil {
			t.Fatal(err)
		}
		if s.B > p.B || s.C > p.C || s.A != p.A {
			t.Errorf("N_pl×%g: Seidel (%g, %g, %g) above Petersen (%g, %g, %g)", scale, s.A, s.B, s.C, p.A, p.B, p.C)
		}
		gap := (p.B - s.B) / p.B
		if scale > 1 && !(gap < prev/50) {
			t.Errorf("N_pl×%g: relative gap %g did not shrink ~1/N_pl² from %g", scale, gap, prev)
		}
		prev = gap
	}
	if prev > 1e-7 {
		t.Errorf("N_pl×1000: Seidel B still %g below Petersen", prev)
	}
}

// When the shell's axial capacity lies below the M–N root, the shell yields
// in tension first and the mode's capacity is N_pl. handJoint with
// N_pl = 100 kN: k = 3e6/1e10 = 3e-4, mode B root
// 73.2e6/(110 + √(12100 + 43920)) = 211 kN > N_pl, so Z_B = 100 kN.
func TestSeidelShellTension(t *testing.T) {
	h := handJoint()
	h.ShellAxial = 100e3
	s, err := Seidel(h)
	if err != nil {
		t.Fatal(err)
	}
	if s.B != 100e3 || s.C != 100e3 {
		t.Errorf("B = %g, C = %g; want N_pl = 100000", s.B, s.C)
	}
}

func TestHingesInvalid(t *testing.T) {
	cases := []struct {
		name string
		edit func(*Hinges)
	}{
		{"a", func(h *Hinges) { h.A = 0 }},
		{"b", func(h *Hinges) { h.B = -1 }},
		{"bolt", func(h *Hinges) { h.Bolt = math.NaN() }},
		{"shell", func(h *Hinges) { h.Shell = 0 }},
		{"flange_net", func(h *Hinges) { h.FlangeNet = math.Inf(1) }},
		{"lever_limit", func(h *Hinges) { h.LeverLimit = -1 }},
	}
	for _, c := range cases {
		h := handJoint()
		c.edit(&h)
		if _, err := Petersen(h); err == nil || !contains(err.Error(), c.name) {
			t.Errorf("%s: Petersen error %v", c.name, err)
		}
	}
	h := handJoint()
	h.ShellAxial = 0
	if _, err := Petersen(h); err != nil {
		t.Errorf("Petersen needs no N_pl: %v", err)
	}
	if _, err := Seidel(h); err == nil || !contains(err.Error(), "shell_axial") {
		t.Errorf("Seidel without N_pl: %v", err)
	}
}
