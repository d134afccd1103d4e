package handcalc

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Thread is an ISO metric thread.
type Thread struct {
	D     float64 `json:"d"`     // d, nominal (major) diameter, mm
	Pitch float64 `json:"pitch"` // P, pitch, mm
}

// Thread profile constants of the ISO basic profile (ISO 68-1, H = (√3/2)·P):
// d₂ = d − (3/4)·H and d₃ = d₁ − H/6 = d − (17/12)·H. The rounded forms
// 0.6495·P and 1.2269·P are what ISO 898-1 prints.
const (
	pitchDiameterFactor = 0.6495190528383290 // 3√3/8
	minorDiameterFactor = 1.2268693220279547 // 17√3/24
)

// CoarseThread returns the ISO 261 coarse thread of a size name such as
// "M36". Sizes M12 to M72 are known.
//
// Source: ISO 261, coarse pitch series. The first-choice sizes and M27 are
// the ones CHECKS.md lists; the second-choice sizes (M14, M18, M22, M33, M39,
// M45, M52, M60, M68) are from memory.
func CoarseThread(size string) (Thread, error) {
	digits, ok := strings.CutPrefix(size, "M")
	d, err := strconv.ParseFloat(digits, 64)
	if !ok || err != nil {
		return Thread{}, fmt.Errorf("handcalc: bolt size %q: want M<diameter>, e.g. M36", size)
	}
	p := coarsePitch(d)
	if p == 0 {
		return Thread{}, fmt.Errorf("handcalc: bolt size %q: not an ISO 261 coarse size in M12…M72 (known: %s)",
			size, strings.Join(CoarseSizes(), ", "))
	}
	return Thread{D: d, Pitch: p}, nil
}

// CoarseSizes returns the size names CoarseThread knows, in ascending order.
func CoarseSizes() []string {
	return []string{"M12", "M14", "M16", "M18", "M20", "M22", "M24", "M27", "M30", "M33",
		"M36", "M39", "M42", "M45", "M48", "M52", "M56", "M60", "M64", "M68", "M72"}
}

// coarsePitch returns the ISO 261 coarse pitch of nominal diameter d, or 0.
func coarsePitch(d float64) float64 {
	switch d {
	case 12:
		return 1.75
	case 14, 16:
		return 2
	case 18, 20, 22:
		return 2.5
	case 24, 27:
		return 3
	case 30, 33:
		return 3.5
	case 36, 39:
		return 4
	case 42, 45:
		return 4.5
	case 48, 52:
		return 5
	case 56, 60:
		return 5.5
	case 64, 68, 72:
		return 6
	}
	return 0
}

// PitchDiameter returns d₂ = d − 0.6495·P (ISO 898-1), mm.
func (t Thread) PitchDiameter() float64 { return t.D - pitchDiameterFactor*t.Pitch }

// MinorDiameter returns d₃ = d − 1.2269·P, the minor diameter of the bolt
// thread (ISO 898-1), mm.
func (t Thread) MinorDiameter() float64 { return t.D - minorDiameterFactor*t.Pitch }

// NominalArea returns A = π·d²/4, the shank area, mm².
func (t Thread) NominalArea() float64 { return math.Pi / 4 * t.D * t.D }

// MinorArea returns A_d3 = π·d₃²/4, the core area VDI 2230 Part 1 uses for
// the resilience of the thread, mm².
func (t Thread) MinorArea() float64 {
	d3 := t.MinorDiameter()
	return math.Pi / 4 * d3 * d3
}

// StressArea returns A_s = π/4·((d₂ + d₃)/2)², mm² (ISO 898-1).
func (t Thread) StressArea() float64 {
	m := (t.PitchDiameter() + t.MinorDiameter()) / 2
	return math.Pi / 4 * m * m
}

func (t Thread) valid() error {
	if !(t.D > 0) || !(t.Pitch > 0) || !(t.MinorDiameter() > 0) {
		return fmt.Errorf("handcalc: thread d = %g, P = %g: want d > 0, P > 0 and d − 1.2269·P > 0", t.D, t.Pitch)
	}
	return nil
}

// Grade is a bolt property class with its yield and tensile strength.
type Grade struct {
	Name string  `json:"name"` // property class, e.g. "10.9"
	Fyb  float64 `json:"f_yb"` // f_yb (R_p0.2), yield strength, MPa
	Fub  float64 `json:"f_ub"` // f_ub (R_m), tensile strength, MPa
}

// NominalGrade returns the nominal strengths design codes use.
//
// Source: EN 1993-1-8 Table 3.1 for 8.8 (f_yb/f_ub = 640/800 MPa) and 10.9
// (900/1000). Class 12.9 is not in that table; its values 1080/1200 are the
// nominal ones the class designation encodes (first number × 100 = f_ub, the
// second / 10 = f_yb/f_ub), which is how the table's own values arise.
func NominalGrade(name string) (Grade, error) {
	switch name {
	case "8.8":
		return Grade{Name: name, Fyb: 640, Fub: 800}, nil
	case "10.9":
		return Grade{Name: name, Fyb: 900, Fub: 1000}, nil
	case "12.9":
		return Grade{Name: name, Fyb: 1080, Fub: 1200}, nil
	}
	return Grade{}, fmt.Errorf("handcalc: bolt grade %q: want 8.8, 10.9 or 12.9", name)
}

// MinimumGrade returns the minimum strengths R_p0.2 and R_m that ISO 898-1
// requires of a bolt of nominal diameter d (mm) in the class: 8.8 with
// d ≤ 16 mm 640/800, with d > 16 mm 660/830; 10.9 940/1040; 12.9
// 1100/1220 MPa.
//
// Source: ISO 898-1, minimum values — from memory (as CHECKS.md records
// them). Use them to compare a test or finite-element bolt with its class;
// design formulas take NominalGrade.
func MinimumGrade(name string, d float64) (Grade, error) {
	switch name {
	case "8.8":
		if d <= 16 {
			return Grade{Name: name, Fyb: 640, Fub: 800}, nil
		}
		return Grade{Name: name, Fyb: 660, Fub: 830}, nil
	case "10.9":
		return Grade{Name: name, Fyb: 940, Fub: 1040}, nil
	case "12.9":
		return Grade{Name: name, Fyb: 1100, Fub: 1220}, nil
	}
	return Grade{}, fmt.Errorf("handcalc: bolt grade %q: want 8.8, 10.9 or 12.9", name)
}

// TensionResistance returns F_t,Rd = k₂·f_ub·A_s/γ_M2, N, with A_s in mm²
// and f_ub in MPa. k₂ = 0.9 (0.63 for countersunk bolts) and γ_M2 = 1.25 are
// the code's values (see DefaultParams); γ_M2 = 1 gives the characteristic
// resistance, k₂ = 1 the plain A_s·f_ub.
//
// Source: EN 1993-1-8, Table 3.4 (and 2.2 for γ_M2).
func TensionResistance(as, fub, k2, gammaM2 float64) float64 {
	return k2 * fub * as / gammaM2
}

// PreloadForce returns the design preload F_p,C = 0.7·f_ub·A_s, N.
//
// Source: EN 1993-1-8, 3.9.1.
func PreloadForce(as, fub float64) float64 { return 0.7 * fub * as }
