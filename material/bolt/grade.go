package bolt

import (
	"fmt"
	"strings"
)

// Grade is a bolt property class with its yield and tensile strength.
type Grade struct {
	Name string  `json:"name"` // property class, e.g. "10.9"
	Fyb  float64 `json:"f_yb"` // f_yb (R_p0.2), yield strength, MPa
	Fub  float64 `json:"f_ub"` // f_ub (R_m), tensile strength, MPa
}

// class is one property class of the table.
type class struct {
	name             string
	fyb, fub         float64 // nominal, EN 1993-1-8 Table 3.1
	rp, rm           float64 // ISO 898-1 minimum R_p0.2, R_m (for 8.8 those of d > 16 mm)
	rpSmall, rmSmall float64 // the same for d ≤ 16 mm
	elongation       float64 // ISO 898-1 minimum elongation after fracture A
}

// classes is the one table of the property classes.
//
// Nominal values: EN 1993-1-8 Table 3.1 for 8.8 (f_yb/f_ub = 640/800 MPa)
// and 10.9 (900/1000). Class 12.9 is not in that table; its values
// 1080/1200 are the nominal ones the class designation encodes (first
// number × 100 = f_ub, the second / 10 = f_yb/f_ub), which is how the
// table's own values arise.
//
// Minimum values: ISO 898-1 — from memory (as CHECKS.md records them):
// 8.8 with d ≤ 16 mm 640/800, with d > 16 mm 660/830; 10.9 940/1040;
// 12.9 1100/1220 MPa; elongation after fracture A 12 %, 9 %, 8 %.
func classes() []class {
	return []class{
		{"8.8", 640, 800, 660, 830, 640, 800, 0.12},
		{"10.9", 900, 1000, 940, 1040, 940, 1040, 0.09},
		{"12.9", 1080, 1200, 1100, 1220, 1100, 1220, 0.08},
	}
}

func lookup(name string) (class, error) {
	for _, c := range classes() {
		if c.name == name {
			return c, nil
		}
	}
	return class{}, fmt.Errorf("bolt: property class %q: want one of %s", name, strings.Join(Classes(), ", "))
}

// Classes lists the known property classes.
func Classes() []string {
	var out []string
	for _, c := range classes() {
		out = append(out, c.name)
	}
	return out
}

// NominalGrade returns the nominal strengths design codes use
// (EN 1993-1-8 Table 3.1; see classes for 12.9).
func NominalGrade(name string) (Grade, error) {
	c, err := lookup(name)
	if err != nil {
		return Grade{}, err
	}
	return Grade{Name: name, Fyb: c.fyb, Fub: c.fub}, nil
}

// MinimumGrade returns the minimum strengths R_p0.2 and R_m that ISO 898-1
// requires of a bolt of nominal diameter d (mm) in the class. Use them to
// compare a test or finite-element bolt with its class; design formulas
// take NominalGrade.
func MinimumGrade(name string, d float64) (Grade, error) {
	c, err := lookup(name)
	if err != nil {
		return Grade{}, err
	}
	if d <= 16 {
		return Grade{Name: name, Fyb: c.rpSmall, Fub: c.rmSmall}, nil
	}
	return Grade{Name: name, Fyb: c.rp, Fub: c.rm}, nil
}

// MinimumElongation returns the minimum elongation after fracture A of the
// class (ISO 898-1, from memory), as a strain.
func MinimumElongation(name string) (float64, error) {
	c, err := lookup(name)
	if err != nil {
		return 0, err
	}
	return c.elongation, nil
}

// DesignPreload returns the design preload F_p,C = 0.7·f_ub·A_s, N, with
// A_s in mm² and f_ub in MPa.
//
// Source: EN 1993-1-8, 3.9.1.
func DesignPreload(as, fub float64) float64 { return 0.7 * fub * as }
