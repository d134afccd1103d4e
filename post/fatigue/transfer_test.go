package fatigue

import (
	"errors"
	"math"
	"testing"
)

// trilinear is an invented bolt-force function of the trilinear kind
// (a closed branch, a transition, a lever branch) for an M36 bolt,
// A_s = 816.7 mm² (ISO 898-1): F_p = 510 kN, slope 0.15 while the joint is
// closed, decompressed from Z = 300 kN, then slope 1.8.
func trilinear(t *testing.T) (*BoltForceFunction, float64) {
	t.Helper()
	z := []float64{0, 150e3, 300e3, 600e3}
	fs := []float64{510e3, 532.5e3, 575e3, 1115e3}
	f, err := NewBoltForceFunction(z, fs, nil)
	if err != nil {
		t.Fatal(err)
	}
	return f, 816.7
}

func TestBoltForceFunctionAt(t *testing.T) {
	f, _ := trilinear(t)
	cases := []struct{ z, fs float64 }{
		{0, 510e3}, {75e3, 521.25e3}, {150e3, 532.5e3}, {450e3, 845e3}, {600e3, 1115e3},
		{-100e3, 495e3}, // below the samples: the first segment goes on
	}
	for _, c := range cases {
		got, _, err := f.At(c.z)
		if err != nil || !near(got, c.fs, 1e-14) {
			t.Errorf("F_s(%g) = %g, %v; want %g", c.z, got, err, c.fs)
		}
	}
	if _, _, err := f.At(600.001e3); !errors.Is(err, ErrBeyond) {
		t.Errorf("above the last sample: err = %v, want ErrBeyond", err)
	}
	for _, bad := range [][2][]float64{{{0}, {1}}, {{0, 0}, {1, 2}}, {{0, 1}, {1}}, {{0, math.NaN()}, {1, 2}}} {
		if _, err := NewBoltForceFunction(bad[0], bad[1], nil); err == nil {
			t.Errorf("samples %v accepted", bad)
		}
	}
}

// Each cycle maps its own extremes: the same segment-force range gives
// the bolt-force difference of its own stretch of the function.
func TestTransferMapsMinAndMax(t *testing.T) {
	f, as := trilinear(t)
	tr, err := NewTransfer(f, as, Axial)
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		c  Cycle
		ds float64
	}{
		{Cycle{0, 100e3, 1}, 0.15 * 100e3 / as},
		{Cycle{400e3, 500e3, 1}, 1.8 * 100e3 / as},
		{Cycle{350e3, 250e3, 1}, (1.8*50e3 + (42.5e3/150e3)*50e3) / as}, // across the knee, falling
	}
	for _, k := range cases {
		got, err := tr.Range(k.c)
		if err != nil || !near(got, k.ds, 1e-12) {
			t.Errorf("cycle %v: Δσ = %g, %v; want %g", k.c, got, err, k.ds)
		}
	}
	if !tr.Monotone() {
		t.Error("a rising function reported as not monotone")
	}
}

// W = π·d_s³/32 on the stress-area diameter d_s = √(4·A_s/π): for A_s
// = π·d²/4 it is the round bar's π·d³/32 (common practice), and the
// bending stress adds at the fibre the larger moments put in tension.
func TestTransferBending(t *testing.T) {
	d := 30.0
	as := math.Pi * d * d / 4
	if got, want := SectionModulus(as), math.Pi*d*d*d/32; !near(got, want, 1e-14) {
		t.Errorf("W = %g, want π·d³/32 = %g", got, want)
	}
	z := []float64{0, 100e3}
	fs := []float64{400e3, 420e3}
	for _, sgn := range []float64{1, -1} {
		ms := []float64{sgn * 0.1e6, sgn * 0.6e6}
		f, _ := NewBoltForceFunction(z, fs, ms)
		tr, err := NewTransfer(f, as, AxialBending)
		if err != nil {
			t.Fatal(err)
		}
		got, _ := tr.Range(Cycle{0, 100e3, 1})
		want := 20e3/as + 0.5e6/SectionModulus(as)
		if !near(got, want, 1e-12) {
			t.Errorf("moments of sign %g: Δσ = %g, want %g", sgn, got, want)
		}
	}
	f, _ := NewBoltForceFunction(z, fs, nil)
	if _, err := NewTransfer(f, as, AxialBending); err == nil {
		t.Error("bending asked of a function without moments")
	}
	// A moment that falls faster than the axial stress rises makes the
	// stress fall: Monotone says so.
	f, _ = NewBoltForceFunction(z, fs, []float64{2e6, 0.5e6})
	tr, _ := NewTransfer(f, as, AxialBending)
	if tr.Monotone() {
		t.Error("a falling stress reported as monotone")
	}
}

// The same spectrum of segment-force ranges does far less damage while
// the joint stays closed than once it has decompressed (common practice:
// the bolt takes a small share of Z in the closed joint and the lever
// force after). With the invented trilinear function above, EN 1993-1-9
// bolt curve of an M36 and γ_Mf = 1: 10⁶ cycles of ΔZ = 150 kN give
// D = 0.0588 between Z = 0 and 150 kN and D = 166 between 310 and 460 kN,
// a ratio of 3.5·10⁻⁴.
func TestDamageBelowAndAboveDecompression(t *testing.T) {
	f, as := trilinear(t)
	tr, _ := NewTransfer(f, as, Axial)
	curve, _ := Bolt(36)
	m, _ := NewMiner(curve, 1)
	damage := func(zmin float64) float64 {
		c := Cycle{From: zmin, To: zmin + 150e3, Count: 1e6}
		ds, err := tr.Range(c)
		if err != nil {
			t.Fatal(err)
		}
		return m.Damage(ds, c.Count)
	}
	below, above := damage(0), damage(310e3)
	ratio := below / above
	t.Logf("D below decompression %.4g, above %.4g, ratio %.3g", below, above, ratio)
	if !(below > 0) || !(ratio < 1e-3) {
		t.Errorf("D below = %g, above = %g: ratio %g, want a damaging spectrum below and a ratio < 1e-3", below, above, ratio)
	}
}
