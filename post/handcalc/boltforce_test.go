package handcalc

import (
	"fmt"
	"math"
	"testing"
)

// Joint-diagram model on invented numbers, by hand: F_p = 500 kN, Φ = 0.05,
// a = 70, b = 80 mm. λ = 150/70 = 2.142857; opening where
// 500e3 + 0.05·Z = 2.142857·Z: Z_open = 500e3/2.092857 = 238 907.8 N;
// concentric decompression Z_D = 500e3/0.95 = 526 315.8 N.
func TestJointDiagramHandWorked(t *testing.T) {
	m, err := NewJointDiagram(500e3, 0.05, 70, 80)
	if err != nil {
		t.Fatal(err)
	}
	if !near(m.LeverRatio, 2.142857, 1e-6) || !near(m.Opening, 238907.8, 1e-6) || !near(m.Decompression, 526315.8, 1e-6) {
		t.Errorf("λ %g, Z_open %g, Z_D %g", m.LeverRatio, m.Opening, m.Decompression)
	}
	cases := []struct{ z, fs, slope float64 }{
		{-100e3, 495e3, 0.05}, // closed in compression: first branch extended
		{0, 500e3, 0.05},
		{100e3, 505e3, 0.05},
		{300e3, 642857.1, 2.142857},
	}
	for _, c := range cases {
		if !near(m.Force(c.z), c.fs, 1e-6) || !near(m.Slope(c.z), c.slope, 1e-6) {
			t.Errorf("Z = %g: F_s %g, slope %g; hand %g, %g", c.z, m.Force(c.z), m.Slope(c.z), c.fs, c.slope)
		}
	}
}

// Trilinear model on invented numbers, by hand: F_p = 500 kN, p = 0.13,
// a = 70, b = 80 mm, a' = 0.7·70 = 49 mm.
// λ = 150/70 = 2.142857, λ' = 129/49 = 2.632653;
// Z_I = 500e3·(70 − 40)/150 = 100 000 N, F_s(Z_I) = 500e3 + 0.13·2.142857·1e5 = 527 857.1 N;
// Z_II = 500e3/(2.632653·0.87) = 218 301.7 N, F_s(Z_II) = 500e3/0.87 = 574 712.6 N;
// branch II slope (574712.6 − 527857.1)/(118301.7) = 0.396068.
func TestTrilinearHandWorked(t *testing.T) {
	m, err := NewTrilinear(500e3, 0.13, 70, 80, 0.7)
	if err != nil {
		t.Fatal(err)
	}
	if !near(m.ReducedLeverRatio, 2.632653, 1e-6) || !near(m.Z1, 100e3, 1e-12) || !near(m.Z2, 218301.7, 1e-6) {
		t.Errorf("λ' %g, Z_I %g, Z_II %g", m.ReducedLeverRatio, m.Z1, m.Z2)
	}
	cases := []struct{ z, fs, slope float64 }{
		{0, 500e3, 0.278571},
		{100e3, 527857.1, 0.396068},
		{218302, 574713.4, 2.632653}, // just past Z_II
		{400e3, 1053061.2, 2.632653},
	}
	for _, c := range cases {
		if !near(m.Force(c.z), c.fs, 1e-6) || !near(m.Slope(c.z), c.slope, 1e-5) {
			t.Errorf("Z = %g: F_s %g, slope %g; hand %g, %g", c.z, m.Force(c.z), m.Slope(c.z), c.fs, c.slope)
		}
	}
}

// Both models are continuous at their break points, their slopes never
// fall, and the last slope is the stated lever ratio (exact constructions).
func TestBoltForceContinuity(t *testing.T) {
	type curve struct {
		name   string
		m      BoltForceCurve
		breaks []float64
		lambda float64 // the stated final lever ratio
	}
	jd, err := NewJointDiagram(500e3, 0.05, 70, 80)
	if err != nil {
		t.Fatal(err)
	}
	cases := []curve{{"joint diagram", jd, []float64{jd.Opening}, 150.0 / 70}}
	for _, f := range []float64{0.5, 0.7, 1} {
		for _, a := range []float64{30, 70, 120} { // a ≤ b/2 gives Z_I = 0
			m, err := NewTrilinear(500e3, 0.13, a, 80, f)
			if err != nil {
				t.Fatalf("a = %g, a'/a = %g: %v", a, f, err)
			}
			cases = append(cases, curve{fmt.Sprintf("trilinear a = %g, a'/a = %g", a, f),
				m, []float64{m.Z1, m.Z2}, (f*a + 80) / (f * a)})
		}
	}
	for _, c := range cases {
		for _, z := range c.breaks {
			left, right := c.m.Force(z*(1-1e-12)), c.m.Force(z)
			if math.Abs(left-right) > 1e-6*right {
				t.Errorf("%s: jump at Z = %g: %g → %g", c.name, z, left, right)
			}
		}
		prev := c.m.Slope(0)
		for z := 0.0; z < 1e6; z += 1e3 {
			s := c.m.Slope(z)
			if s < prev-1e-12 {
				t.Errorf("%s: slope falls at Z = %g: %g → %g", c.name, z, prev, s)
			}
			const h = 1.0 // the slope is the derivative of the force
			if z > 0 && !nearBreak(z, h, c.breaks) {
				if fd := (c.m.Force(z+h) - c.m.Force(z-h)) / (2 * h); math.Abs(fd-s) > 1e-6 {
					t.Errorf("%s: Z = %g: slope %g, difference quotient %g", c.name, z, s, fd)
				}
			}
			prev = s
		}
		if got := c.m.Slope(1e7); !near(got, c.lambda, 1e-12) {
			t.Errorf("%s: final slope %g, stated lever ratio %g", c.name, got, c.lambda)
		}
	}
}

func nearBreak(z, h float64, breaks []float64) bool {
	for _, b := range breaks {
		if math.Abs(z-b) <= h {
			return true
		}
	}
	return false
}

func TestPoints(t *testing.T) {
	m, _ := NewTrilinear(500e3, 0.13, 70, 80, 0.7)
	cases := []struct {
		end   float64
		names []string
	}{
		{1e6, []string{PointPreload, PointZ1, PointZ2, PointEnd}},
		{150e3, []string{PointPreload, PointZ1, PointEnd}},
		{0, []string{PointPreload}},
	}
	for _, c := range cases {
		ps := m.Points(c.end)
		if len(ps) != len(c.names) {
			t.Fatalf("end %g: %+v", c.end, ps)
		}
		for i, p := range ps {
			if p.Name != c.names[i] || p.Fs != m.Force(p.Z) || (i > 0 && p.Z <= ps[i-1].Z) {
				t.Errorf("end %g: point %d = %+v", c.end, i, p)
			}
		}
	}
}

func TestBoltForceInvalid(t *testing.T) {
	if _, err := NewJointDiagram(0, 0.05, 70, 80); err == nil || !contains(err.Error(), "preload") {
		t.Errorf("zero preload: %v", err)
	}
	if _, err := NewJointDiagram(500e3, 1, 70, 80); err == nil || !contains(err.Error(), "load factor") {
		t.Errorf("Φ = 1: %v", err)
	}
	if _, err := NewTrilinear(500e3, 0.13, 70, 0, 0.7); err == nil || !contains(err.Error(), "b = 0") {
		t.Errorf("b = 0: %v", err)
	}
	if _, err := NewTrilinear(500e3, 0.13, 70, 80, 0); err == nil || !contains(err.Error(), "arm factor") {
		t.Errorf("arm factor 0: %v", err)
	}
	// a' so short that Z_II ≤ Z_I: λ' = (0.7 + 80)/0.7 = 115.3,
	// Z_II = 500e3/(115.3·0.87) = 4985 N < Z_I = 500e3·30/150 = 100 kN.
	if _, err := NewTrilinear(500e3, 0.13, 70, 80, 0.01); err == nil || !contains(err.Error(), "Z_II") {
		t.Errorf("short arm: %v", err)
	}
}
