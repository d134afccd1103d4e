package material

import (
	"math"
	"testing"
)

// Minimum yield strength by nominal thickness band and the lower bound of
// R_m: EN 10025-2 for S235–S355, EN 10025-3/-4 for S420 and S460 (those
// rows from memory), as in CHECKS.md. Band edges belong to the band below.
func TestSteelStrengthThicknessBands(t *testing.T) {
	cases := []struct {
		grade  string
		t      float64
		fy, fu float64
	}{
		{"S235", 10, 235, 360}, {"S235", 16, 235, 360}, {"S235", 16.5, 225, 360}, {"S235", 63, 215, 360}, {"S235", 150, 195, 350},
		{"S275", 40, 265, 410}, {"S275", 80, 245, 410}, {"S275", 100, 235, 410},
		{"S355", 16, 355, 470}, {"S355", 40, 345, 470}, {"S355", 41, 335, 470}, {"S355", 63, 335, 470},
		{"S355", 80, 325, 470}, {"S355", 100, 315, 470}, {"S355", 120, 295, 450}, {"S355J2", 30, 345, 470},
		{"S420", 16, 420, 520}, {"S420", 40, 400, 520}, {"S420", 63, 390, 520}, {"S420", 80, 370, 520}, {"S420", 100, 360, 520},
		{"S460", 16, 460, 540}, {"S460", 40, 440, 540}, {"S460", 63, 430, 540}, {"S460", 80, 410, 540}, {"S460", 100, 400, 540}, {"S460", 150, 385, 530},
	}
	for _, c := range cases {
		s, err := SteelStrength(c.grade, c.t)
		if err != nil {
			t.Errorf("%s, t = %g: %v", c.grade, c.t, err)
			continue
		}
		if s.Fy != c.fy || s.Fu != c.fu {
			t.Errorf("%s, t = %g mm: f_y = %g, f_u = %g; want %g, %g", c.grade, c.t, s.Fy, s.Fu, c.fy, c.fu)
		}
	}
	for _, b := range []struct {
		grade string
		t     float64
	}{{"S355", 151}, {"S355", 0}, {"S355", -5}, {"S690", 20}, {"S3550", 20}, {"", 20}} {
		if _, err := SteelStrength(b.grade, b.t); err == nil {
			t.Errorf("SteelStrength(%q, %g) accepted", b.grade, b.t)
		}
	}
}

// The plateau end and uniform elongation follow Yun and Gardner (2017,
// from memory): ε_sh = 0.1 f_y/f_u − 0.055 within [0.015, 0.03],
// ε_u = 0.6(1 − f_y/f_u); hand values for S355 at t ≤ 16 (355/470) and
// S235 (clamped plateau).
func TestSteelCurveShape(t *testing.T) {
	s, err := SteelStrength("S355", 12)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(s.PlateauEnd-0.020531914893617) > 1e-12 || math.Abs(s.Uniform-0.146808510638298) > 1e-12 {
		t.Errorf("S355: plateau end %.15g, uniform %.15g; want 0.0205319…, 0.146809…", s.PlateauEnd, s.Uniform)
	}
	s, err = SteelStrength("S235", 12)
	if err != nil {
		t.Fatal(err)
	}
	if s.PlateauEnd != 0.015 {
		t.Errorf("S235: plateau end %g, want the lower limit 0.015", s.PlateauEnd)
	}
	pts, err := s.EngineeringCurve(testE)
	if err != nil {
		t.Fatal(err)
	}
	last := pts[len(pts)-1]
	if math.Abs(last[0]-s.Uniform) > 1e-15 || math.Abs(last[1]-s.Fu) > 1e-12 {
		t.Errorf("S235 curve ends at %v, want (ε_u, f_u) = (%g, %g)", last, s.Uniform, s.Fu)
	}
}

// Bolt classes: ISO 898-1 minimum values (from memory; 8.8 for d > 16 mm)
// and the nominal values of EN 1993-1-8 Table 3.1 (CHECKS.md); 12.9
// nominal from its ISO 898-1 designation (1200/1080).
func TestBoltStrength(t *testing.T) {
	cases := []struct {
		class  string
		v      BoltValues
		fy, fu float64
		a      float64
	}{
		{"8.8", BoltMinimum, 660, 830, 0.12},
		{"10.9", BoltMinimum, 940, 1040, 0.09},
		{"12.9", BoltMinimum, 1100, 1220, 0.08},
		{"8.8", BoltNominal, 640, 800, 0.12},
		{"10.9", BoltNominal, 900, 1000, 0.09},
		{"12.9", BoltNominal, 1080, 1200, 0.08},
	}
	for _, c := range cases {
		s, err := BoltStrength(c.class, c.v)
		if err != nil {
			t.Errorf("%s %v: %v", c.class, c.v, err)
			continue
		}
		if s.Fy != c.fy || s.Fu != c.fu || s.Elongation != c.a || s.Uniform != c.a/2 || s.PlateauEnd != 0 {
			t.Errorf("%s %v: %+v; want f_y %g, f_u %g, A %g, ε_u A/2, no plateau", c.class, c.v, s, c.fy, c.fu, c.a)
		}
		if _, err := s.Hardening(testE, DefaultNecking()); err != nil {
			t.Errorf("%s %v: %v", c.class, c.v, err)
		}
	}
	if _, err := BoltStrength("9.8", BoltMinimum); err == nil {
		t.Error("class 9.8 accepted")
	}
	if _, err := BoltStrength("10.9", BoltValues(5)); err == nil {
		t.Error("unknown bolt values accepted")
	}
}

// Every built-in grade makes a valid hardening table whose initial yield is
// the grade's f_y converted to true stress.
func TestBuiltinGradesMakeHardening(t *testing.T) {
	for _, g := range SteelGrades() {
		for _, th := range []float64{10, 30, 50, 70, 90, 140} {
			s, err := SteelStrength(g, th)
			if err != nil {
				t.Fatal(err)
			}
			h, err := s.Hardening(testE, DefaultNecking())
			if err != nil {
				t.Errorf("%s, t = %g: %v", g, th, err)
				continue
			}
			if want := s.Fy * (1 + s.Fy/testE); math.Abs(h.InitialYield()-want) > 1e-9 {
				t.Errorf("%s, t = %g: initial yield %g, want %g", g, th, h.InitialYield(), want)
			}
		}
	}
}
