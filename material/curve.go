package material

import (
	"fmt"
	"math"
)

// CurveKind says what a user's stress–strain curve holds.
type CurveKind int

const (
	// TrueCurve: true (logarithmic) strain and true (Cauchy) stress.
	TrueCurve CurveKind = iota
	// EngineeringCurve: nominal strain and nominal stress of a tensile test.
	EngineeringCurve
)

// String is the model-file word for the kind.
func (k CurveKind) String() string {
	switch k {
	case TrueCurve:
		return "true"
	case EngineeringCurve:
		return "engineering"
	}
	return fmt.Sprintf("curve kind(%d)", int(k))
}

// ParseCurveKind reads "true" or "engineering".
func ParseCurveKind(s string) (CurveKind, error) {
	switch s {
	case "true":
		return TrueCurve, nil
	case "engineering":
		return EngineeringCurve, nil
	}
	return 0, fmt.Errorf("material: curve kind %q: must be \"true\" or \"engineering\"", s)
}

// TrueFromEngineering converts a point of an engineering curve to true
// strain and stress, ε_t = ln(1+ε_e), σ_t = σ_e(1+ε_e), valid while the
// deformation is uniform (up to the tensile strength; common practice, e.g.
// EN 1993-1-5 Annex C.6).
func TrueFromEngineering(strain, stress float64) (trueStrain, trueStress float64) {
	return math.Log1p(strain), stress * (1 + strain)
}

// LingExtension is the true stress past necking of Y. Ling, "Uniaxial true
// stress-strain after necking", AMP Journal of Technology 5 (1996) 37–48:
//
//	σ = σ_u·[w·(1 + ε − ε_u) + (1 − w)·(ε/ε_u)^ε_u],
//
// a weighted mean of the linear extension (w = 1) and the power law
// (w = 0) that both leave the necking point (ε_u, σ_u, true values) with
// the slope dσ/dε = σ_u of Considère's condition. eps is the true strain.
func LingExtension(eps, epsU, sigmaU, w float64) float64 {
	return sigmaU * (w*(1+eps-epsU) + (1-w)*math.Pow(eps/epsU, epsU))
}

// Necking sets the extension of an engineering curve past its tensile
// strength (Ling 1996).
type Necking struct {
	// Weight is w of LingExtension, in [0, 1].
	Weight float64
	// UpTo is the true strain to which the extension is tabulated; past
	// it the hardening goes on linearly with the last slope.
	UpTo float64
}

// DefaultNecking is w = 0.5, the midpoint of Ling's two bounds (engineering
// judgement: Ling fits w per material to a necked-specimen test; use such
// a fit where available), tabulated to a true strain of 1.0, beyond the
// fracture strain of the steels here.
func DefaultNecking() Necking { return Necking{Weight: 0.5, UpTo: 1.0} }

// lingSteps is the number of table segments of the extension: the curve is
// smooth, so 100 chords keep the interpolation error far below 0.1 %.
const lingSteps = 100

// Validate checks 0 ≤ w ≤ 1 and a positive finite UpTo.
func (nk Necking) Validate() error {
	if !(nk.Weight >= 0 && nk.Weight <= 1) {
		return fmt.Errorf("material: necking weight %g: must lie in [0, 1]", nk.Weight)
	}
	if !(nk.UpTo > 0) || math.IsInf(nk.UpTo, 0) {
		return fmt.Errorf("material: necking extension up to true strain %g: must be positive and finite", nk.UpTo)
	}
	return nil
}

// HardeningFromCurve makes the hardening table of a uniaxial curve given as
// [strain, stress] points (total strain, stress in MPa) for Young's modulus
// e (MPa), the E of the law the table goes into.
//
// An engineering curve is converted to true values up to its tensile
// strength (the largest engineering stress; at a tie the last such point)
// and the points past it are dropped: the neck makes them a measure of the
// specimen, not of the material. Past the tensile strength the true curve
// follows LingExtension with the parameters nk up to nk.UpTo. A true curve
// is taken as given, and extended linearly with its last slope.
//
// The plastic strain of a point is ε_p = ε_t − σ_t/E. Leading points on the
// elastic line (|ε_p| at most 5 % of σ_t/E, which allows for rounding and
// for the conversion of the elastic line) are elastic; the last of them is
// the yield point (ε_p = 0). A curve without such a point starts at its
// first point, whose stress is then held from ε_p = 0 to that point's
// plastic strain. A point left of the elastic line by more, a plastic
// strain that does not grow, or a true stress that falls is an error
// naming the point.
func HardeningFromCurve(e float64, points [][2]float64, kind CurveKind, nk Necking) (Hardening, error) {
	if !(e > 0) {
		return Hardening{}, fmt.Errorf("material: curve: E = %g: must be positive", e)
	}
	if len(points) == 0 {
		return Hardening{}, fmt.Errorf("material: curve: no points")
	}
	if kind != TrueCurve && kind != EngineeringCurve {
		return Hardening{}, fmt.Errorf("material: curve: kind %v: not known", kind)
	}
	for i, p := range points {
		if math.IsNaN(p[0]) || math.IsInf(p[0], 0) || math.IsNaN(p[1]) || math.IsInf(p[1], 0) {
			return Hardening{}, fmt.Errorf("material: curve point %d (%g, %g): not finite", i+1, p[0], p[1])
		}
		if p[0] < 0 || p[1] < 0 {
			return Hardening{}, fmt.Errorf("material: curve point %d (%g, %g): strain and stress must not be negative (a tension curve)", i+1, p[0], p[1])
		}
	}
	tr := make([][2]float64, 0, len(points)+lingSteps)
	neck := -1
	if kind == EngineeringCurve {
		if err := nk.Validate(); err != nil {
			return Hardening{}, err
		}
		neck = 0
		for i, p := range points {
			if p[1] >= points[neck][1] {
				neck = i
			}
		}
		for _, p := range points[:neck+1] {
			et, st := TrueFromEngineering(p[0], p[1])
			tr = append(tr, [2]float64{et, st})
		}
		eu, su := tr[neck][0], tr[neck][1]
		if eu > 0 && nk.UpTo > eu {
			for j := 1; j <= lingSteps; j++ {
				et := eu + (nk.UpTo-eu)*float64(j)/lingSteps
				tr = append(tr, [2]float64{et, LingExtension(et, eu, su, nk.Weight)})
			}
		}
	} else {
		tr = append(tr, points...)
	}
	return hardeningFromTrue(e, tr, neck)
}

// hardeningFromTrue subtracts the elastic strain and builds the table;
// neck is the index of the tensile strength in the input (−1 for none),
// named in errors.
func hardeningFromTrue(e float64, tr [][2]float64, neck int) (Hardening, error) {
	name := func(i int) string {
		if neck >= 0 && i > neck {
			return fmt.Sprintf("necking extension point %d (true %g, %g)", i-neck, tr[i][0], tr[i][1])
		}
		return fmt.Sprintf("curve point %d (true %g, %g)", i+1, tr[i][0], tr[i][1])
	}
	first := 0 // index of the yield point
	ep0 := 0.0
	for i, p := range tr {
		ep := p[0] - p[1]/e
		tol := 0.05 * p[1] / e
		if ep < -tol {
			return Hardening{}, fmt.Errorf("material: %s: lies left of the elastic line σ = E·ε (E = %g MPa) by a plastic strain %g: check E or the strain column", name(i), e, ep)
		}
		if ep > tol {
			if i == 0 {
				ep0 = ep
			}
			break
		}
		first = i
	}
	if !(tr[first][1] > 0) {
		return Hardening{}, fmt.Errorf("material: %s: yield stress must be positive", name(first))
	}
	strain := []float64{0}
	stress := []float64{tr[first][1]}
	if ep0 > 0 {
		strain = append(strain, ep0)
		stress = append(stress, tr[0][1])
	}
	for i := first + 1; i < len(tr); i++ {
		ep := tr[i][0] - tr[i][1]/e
		last := len(strain) - 1
		if !(ep > strain[last]) {
			return Hardening{}, fmt.Errorf("material: %s: plastic strain %g does not exceed the previous point's %g", name(i), ep, strain[last])
		}
		if tr[i][1] < stress[last] {
			return Hardening{}, fmt.Errorf("material: %s: true stress falls below the previous point's %g MPa: softening is not supported", name(i), stress[last])
		}
		strain = append(strain, ep)
		stress = append(stress, tr[i][1])
	}
	return NewHardening(strain, stress)
}
