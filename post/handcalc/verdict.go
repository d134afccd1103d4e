package handcalc

import "math"

// DefaultBorderline is the margin around a utilisation of 1.0 within which
// a hand check is called borderline: the refined analysis is worth its
// cost there.
const DefaultBorderline = 0.10

// Verdict is the design check of the hand methods against a design
// segment force.
type Verdict struct {
	DesignForceKN float64       `json:"design_force_kN"`
	Margin        float64       `json:"borderline_margin"`
	Lines         []VerdictLine `json:"methods"`
	Borderline    bool          `json:"borderline"` // any method within 1 ± margin
	Exceeded      bool          `json:"exceeded"`   // any method above 1
}

// VerdictLine is one method's utilisation.
type VerdictLine struct {
	Method      string  `json:"method"`
	CapacityKN  float64 `json:"capacity_kN"`
	Utilisation float64 `json:"utilisation"`
	Mode        string  `json:"governing_mode"`
	Status      string  `json:"status"` // "ok", "borderline" or "exceeded"
}

// CheckDesignForce compares the design segment force (N) with the
// design-basis ultimate loads of both mechanism methods; nil without a
// design force.
func CheckDesignForce(r Results, design *float64, margin float64) *Verdict {
	if design == nil {
		return nil
	}
	u, ok := r.UltimateOn(BasisDesign)
	if !ok {
		return nil
	}
	v := &Verdict{DesignForceKN: *design / 1e3, Margin: margin}
	for _, m := range []struct {
		name string
		mech Mechanisms
	}{
		{"plastic hinges, Petersen (design, with k2)", u.Petersen},
		{"plastic hinges with M–N interaction, Seidel (design, with k2)", u.Seidel},
	} {
		l := VerdictLine{Method: m.name, CapacityKN: m.mech.Z / 1e3, Mode: string(m.mech.Governing)}
		l.Utilisation = *design / m.mech.Z
		l.Status = UtilisationStatus(l.Utilisation, margin)
		v.Borderline = v.Borderline || l.Status == "borderline"
		v.Exceeded = v.Exceeded || l.Utilisation > 1
		v.Lines = append(v.Lines, l)
	}
	return v
}

// UtilisationStatus names a utilisation: borderline within 1 ± margin,
// else ok below and exceeded above.
func UtilisationStatus(eta, margin float64) string {
	switch {
	case math.Abs(eta-1) <= margin+1e-12: // inclusive, whatever the rounding of 1 ± margin
		return "borderline"
	case eta < 1:
		return "ok"
	}
	return "exceeded"
}
