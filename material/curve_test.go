package material

import (
	"math"
	"testing"
)

// Engineering → true on hand values: ε_t = ln(1+ε_e), σ_t = σ_e(1+ε_e)
// (common practice; EN 1993-1-5 Annex C.6).
func TestTrueFromEngineeringHandValues(t *testing.T) {
	cases := []struct{ ee, se, et, st float64 }{
		{0, 0, 0, 0},
		{0.002, 420, 0.001998002662673058, 420.84},
		{0.1, 500, 0.09531017980432493, 550},
		{0.2, 450, 0.1823215567939546, 540},
	}
	for _, c := range cases {
		et, st := TrueFromEngineering(c.ee, c.se)
		if math.Abs(et-c.et) > 1e-15 || math.Abs(st-c.st) > 1e-12 {
			t.Errorf("(%g, %g): true (%.16g, %.16g), want (%.16g, %.16g)", c.ee, c.se, et, st, c.et, c.st)
		}
	}
}

// The table of an engineering curve: the yield point on the elastic line,
// the tensile strength converted by hand (ε_p = ln 1.1 − 550/E), the
// falling point past it dropped, and Ling's extension to true strain 1.0
// (σ = 550·[w(1 + 1 − ln 1.1) + (1−w)(1/ln 1.1)^(ln 1.1)], w = 0.5:
// 867.847 MPa by hand).
func TestHardeningFromEngineeringCurve(t *testing.T) {
	h, err := HardeningFromCurve(testE, [][2]float64{{0.002, 420}, {0.1, 500}, {0.15, 480}}, EngineeringCurve, DefaultNecking())
	if err != nil {
		t.Fatal(err)
	}
	if h.Len() != 2+lingSteps {
		t.Fatalf("table has %d points, want 2 + %d", h.Len(), lingSteps)
	}
	want := [][2]float64{{0, 420.84}, {0.09269113218527732, 550}}
	for i, w := range want {
		e, s := h.Point(i)
		if math.Abs(e-w[0]) > 1e-14 || math.Abs(s-w[1]) > 1e-10 {
			t.Errorf("point %d: (%.16g, %.12g), want (%.16g, %.12g)", i, e, s, w[0], w[1])
		}
	}
	e, s := h.Point(h.Len() - 1)
	if math.Abs(s-867.8472658583228) > 1e-9 || math.Abs(e-0.9958673939721032) > 1e-12 {
		t.Errorf("end of the extension: (%.16g, %.13g), want (0.9958673939721032, 867.8472658583228)", e, s)
	}
}

// Ling's extension leaves the necking point with σ = σ_u and dσ/dε = σ_u
// for any weight (Considère's condition; Ling 1996), and its bounds are the
// linear (w = 1) and power-law (w = 0) extensions.
func TestLingExtension(t *testing.T) {
	eu, su := 0.15, 600.0
	for _, w := range []float64{0, 0.3, 0.5, 1} {
		if s := LingExtension(eu, eu, su, w); math.Abs(s-su) > 1e-12*su {
			t.Errorf("w = %g: σ(ε_u) = %g, want %g", w, s, su)
		}
		const h = 1e-6
		slope := (LingExtension(eu+h, eu, su, w) - LingExtension(eu-h, eu, su, w)) / (2 * h)
		if math.Abs(slope-su) > 1e-6*su {
			t.Errorf("w = %g: slope at ε_u %g, want σ_u = %g", w, slope, su)
		}
	}
	e := 0.6
	lin, pow := su*(1+e-eu), su*math.Pow(e/eu, eu)
	if s := LingExtension(e, eu, su, 1); math.Abs(s-lin) > 1e-12*lin {
		t.Errorf("w = 1: %g, want the linear %g", s, lin)
	}
	if s := LingExtension(e, eu, su, 0); math.Abs(s-pow) > 1e-12*pow {
		t.Errorf("w = 0: %g, want the power law %g", s, pow)
	}
}

// How the start of a curve is read: elastic points before yield, a curve
// that starts past yield, a single point.
func TestHardeningFromCurveStart(t *testing.T) {
	cases := []struct {
		name string
		pts  [][2]float64
		want [][2]float64 // table points
	}{
		{"elastic points before the yield point", [][2]float64{{0, 0}, {0.001, 210}, {0.002, 420}, {0.05, 500}},
			[][2]float64{{0, 420}, {0.05 - 500/testE, 500}}},
		{"first point past yield: its stress held from zero", [][2]float64{{0.01, 400}, {0.05, 500}},
			[][2]float64{{0, 400}, {0.01 - 400/testE, 400}, {0.05 - 500/testE, 500}}},
		{"single point: perfectly plastic", [][2]float64{{0.002, 420}},
			[][2]float64{{0, 420}}},
	}
	for _, c := range cases {
		h, err := HardeningFromCurve(testE, c.pts, TrueCurve, Necking{})
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if h.Len() != len(c.want) {
			t.Errorf("%s: %d points, want %d", c.name, h.Len(), len(c.want))
			continue
		}
		for i, w := range c.want {
			if e, s := h.Point(i); math.Abs(e-w[0]) > 1e-15 || math.Abs(s-w[1]) > 1e-12 {
				t.Errorf("%s: point %d (%g, %g), want (%g, %g)", c.name, i, e, s, w[0], w[1])
			}
		}
	}
}

func TestHardeningFromCurveRejects(t *testing.T) {
	cases := []struct {
		name string
		e    float64
		pts  [][2]float64
		kind CurveKind
		nk   Necking
	}{
		{"no points", testE, nil, TrueCurve, DefaultNecking()},
		{"zero modulus", 0, [][2]float64{{0.002, 420}}, TrueCurve, DefaultNecking()},
		{"left of the elastic line", testE, [][2]float64{{0.001, 400}, {0.05, 500}}, TrueCurve, DefaultNecking()},
		{"plastic strain goes back", testE, [][2]float64{{0.002, 420}, {0.05, 500}, {0.04, 510}}, TrueCurve, DefaultNecking()},
		{"true stress falls", testE, [][2]float64{{0.002, 420}, {0.05, 500}, {0.1, 490}}, TrueCurve, DefaultNecking()},
		{"negative strain", testE, [][2]float64{{-0.002, 420}}, TrueCurve, DefaultNecking()},
		{"NaN stress", testE, [][2]float64{{0.002, math.NaN()}}, TrueCurve, DefaultNecking()},
		{"zero yield", testE, [][2]float64{{0, 0}}, TrueCurve, DefaultNecking()},
		{"unknown kind", testE, [][2]float64{{0.002, 420}}, CurveKind(7), DefaultNecking()},
		{"necking weight above 1", testE, [][2]float64{{0.002, 420}, {0.1, 500}}, EngineeringCurve, Necking{Weight: 1.5, UpTo: 1}},
		{"necking range zero", testE, [][2]float64{{0.002, 420}, {0.1, 500}}, EngineeringCurve, Necking{Weight: 0.5}},
	}
	for _, c := range cases {
		if _, err := HardeningFromCurve(c.e, c.pts, c.kind, c.nk); err == nil {
			t.Errorf("%s: accepted", c.name)
		}
	}
}

func TestParseCurveKind(t *testing.T) {
	for _, k := range []CurveKind{TrueCurve, EngineeringCurve} {
		got, err := ParseCurveKind(k.String())
		if err != nil || got != k {
			t.Errorf("ParseCurveKind(%q) = %v, %v", k.String(), got, err)
		}
	}
	if _, err := ParseCurveKind("nominal"); err == nil {
		t.Error(`ParseCurveKind("nominal") accepted`)
	}
}

// The hardening table interpolates linearly, continues with the last slope
// and refuses tables that soften or do not start at zero.
func TestHardeningTable(t *testing.T) {
	h, err := NewHardening([]float64{0, 0.1, 0.3}, []float64{300, 400, 450})
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct{ ep, sy, slope float64 }{
		{0, 300, 1000}, {0.05, 350, 1000}, {0.1, 400, 250}, {0.2, 425, 250}, {0.5, 500, 250},
	}
	for _, c := range cases {
		sy, k := h.Yield(c.ep)
		if math.Abs(sy-c.sy) > 1e-12 || math.Abs(k-c.slope) > 1e-9 {
			t.Errorf("Yield(%g) = %g, %g; want %g, %g", c.ep, sy, k, c.sy, c.slope)
		}
	}
	bad := [][2][]float64{
		{{0.01, 0.1}, {300, 400}},
		{{0, 0.1}, {300, 290}},
		{{0, 0}, {300, 300}},
		{{0}, {-1}},
		{{0, 0.1}, {300}},
	}
	for _, b := range bad {
		if _, err := NewHardening(b[0], b[1]); err == nil {
			t.Errorf("NewHardening(%v, %v) accepted", b[0], b[1])
		}
	}
}
