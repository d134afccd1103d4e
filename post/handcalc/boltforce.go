package handcalc

import (
	"fmt"
	"math"
)

// BoltForceCurve is a segment bolt-force model: the bolt force F_s (N) as a
// function of the segment force Z (N) and its slope dF_s/dZ. At a break point
// Slope returns the slope of the branch that starts there. For Z < 0
// (compression) the joint stays closed and the first branch is extended.
type BoltForceCurve interface {
	Force(z float64) float64
	Slope(z float64) float64
}

// Point is a characteristic point of a bolt-force curve.
type Point struct {
	Name string  `json:"name"`
	Z    float64 `json:"z"`   // segment force, N
	Fs   float64 `json:"f_s"` // bolt force, N
}

// Names of characteristic points.
const (
	PointPreload = "preload" // Z = 0, F_s = F_p
	PointOpening = "opening" // the joint diagram meets the lever law
	PointZ1      = "z_1"     // trilinear: end of the closed branch
	PointZ2      = "z_2"     // trilinear: start of the lever branch
	PointEnd     = "end"     // the end of the curve asked for (the ultimate load)
)

// JointDiagram is the linear joint-diagram model of VDI 2230 Part 1 (from
// memory) carried over to an L-flange segment: while the joint is closed the
// bolt takes the share Φ of the segment force,
//
//	F_s = F_p + Φ·Z,
//
// and once the shell side has opened the flange pries about its free edge
// and the bolt takes the lever force
//
//	F_s = λ·Z,  λ = (a + b)/a
//
// (moment equilibrium of the flange about the free edge, with no moment in
// the shell). The model switches where the two lines meet,
// Z_open = F_p/(λ − Φ), so F_s is continuous there. Taking that meeting
// point as the opening is our choice: a joint diagram alone does not know
// where an eccentrically loaded flange opens. Decompression
// holds the concentric decompression force of the joint diagram,
// Z_D = F_p/(1 − Φ), at which the clamp force F_p − (1 − Φ)·Z vanishes;
// it is reported for reference and lies above Z_open whenever λ > 1.
type JointDiagram struct {
	Preload       float64 `json:"preload"`       // F_p, N
	LoadFactor    float64 `json:"load_factor"`   // Φ
	LeverRatio    float64 `json:"lever_ratio"`   // λ = (a + b)/a
	Opening       float64 `json:"opening"`       // Z_open = F_p/(λ − Φ), N
	Decompression float64 `json:"decompression"` // Z_D = F_p/(1 − Φ), N
}

// NewJointDiagram returns the joint-diagram model for preload fp (N), load
// factor phi (see LoadFactor) and lever arms a, b (mm).
func NewJointDiagram(fp, phi, a, b float64) (JointDiagram, error) {
	var v violations
	v.check("preload", fp, fp > 0, "must be > 0")
	v.check("load factor", phi, phi >= 0 && phi < 1, "must be in [0, 1)")
	v.check("a", a, a > 0, "must be > 0")
	v.check("b", b, b > 0, "must be > 0")
	if err := v.err("joint diagram"); err != nil {
		return JointDiagram{}, err
	}
	lambda := (a + b) / a
	return JointDiagram{
		Preload:       fp,
		LoadFactor:    phi,
		LeverRatio:    lambda,
		Opening:       fp / (lambda - phi),
		Decompression: fp / (1 - phi),
	}, nil
}

// Force returns F_s(Z), N.
func (m JointDiagram) Force(z float64) float64 {
	if z < m.Opening {
		return m.Preload + m.LoadFactor*z
	}
	return m.LeverRatio * z
}

// Slope returns dF_s/dZ.
func (m JointDiagram) Slope(z float64) float64 {
	if z < m.Opening {
		return m.LoadFactor
	}
	return m.LeverRatio
}

// Points returns the characteristic points from Z = 0 up to end (N): the
// preload, the opening if it lies below end, and end itself.
func (m JointDiagram) Points(end float64) []Point {
	return points(m, end, []Point{{Name: PointOpening, Z: m.Opening}})
}

// Trilinear is the segment bolt-force model of Schmidt and Neuper for
// L-flanges, as we recall its commonly cited form — from memory, check it
// against the source before relying on the factors. Three straight
// branches:
//
//	I    0 ≤ Z ≤ Z_I:     F_s = F_p + p·λ·Z  (the slope p·λ as we recall it)
//	II   Z_I < Z < Z_II:  straight from (Z_I, F_p + p·λ·Z_I) to (Z_II, λ'·Z_II)
//	III  Z ≥ Z_II:        F_s = λ'·Z
//
// with
//
//	p    = δ_P/(δ_S + δ_P) = C_S/(C_S + C_D): the bolt's share of an axial
//	       load on the closed joint (stiffness ratio of bolt and clamped
//	       parts, here from the VDI 2230 resiliences, without a load-
//	       introduction factor);
//	λ    = (a + b)/a: the lever ratio about the free edge, by which the
//	       eccentric segment force is amplified at the bolt;
//	λ'   = (a' + b)/a', a' = k_a·a: the lever ratio of the opened joint with
//	       a reduced lever arm, because the prying force acts somewhat inside
//	       the free edge; k_a (ArmFactor) is a parameter — we recall a
//	       reduced arm but not reliably its value (0.7 by default; 1 gives
//	       the plain lever law, and then branch II lies on branch I);
//	Z_I  = F_p·(a − b/2)/(a + b): the load at which the shell-side edge of
//	       the face begins to open (recalled, and checked by this
//	       derivation: take a linear contact pressure over the face from −a
//	       to b and neglect the rise of the bolt force; the contact
//	       resultant F_p − Z sits at x = −Z·b/(F_p − Z) and reaches the kern
//	       edge x = (b − 2a)/3 at that Z); for a ≤ b/2 the face opens at once
//	       and Z_I = 0;
//	Z_II = F_p/(λ'·q), q = 1 − p: the load from which the flange pries on
//	       its edge, where the lever branch reaches the bolt force F_p/(1 − p)
//	       at which a concentric joint of the same stiffness decompresses
//	       (our closure of q: we recall the form F_p/(λ'·q) but not q itself).
type Trilinear struct {
	Preload           float64 `json:"preload"`             // F_p, N
	Stiffness         float64 `json:"stiffness_ratio"`     // p
	LeverRatio        float64 `json:"lever_ratio"`         // λ = (a + b)/a
	ReducedLeverRatio float64 `json:"reduced_lever_ratio"` // λ' = (a' + b)/a'
	Z1                float64 `json:"z_1"`                 // Z_I, N
	Z2                float64 `json:"z_2"`                 // Z_II, N
}

// NewTrilinear returns the trilinear model for preload fp (N), stiffness
// ratio p, lever arms a, b (mm) and the factor armFactor = a'/a in (0, 1].
func NewTrilinear(fp, p, a, b, armFactor float64) (Trilinear, error) {
	var v violations
	v.check("preload", fp, fp > 0, "must be > 0")
	v.check("stiffness ratio", p, p >= 0 && p < 1, "must be in [0, 1)")
	v.check("arm factor", armFactor, armFactor > 0 && armFactor <= 1, "must be in (0, 1]")
	v.check("a", a, a > 0, "must be > 0")
	v.check("b", b, b > 0, "must be > 0")
	if err := v.err("trilinear"); err != nil {
		return Trilinear{}, err
	}
	ar := armFactor * a
	m := Trilinear{
		Preload:           fp,
		Stiffness:         p,
		LeverRatio:        (a + b) / a,
		ReducedLeverRatio: (ar + b) / ar,
		Z1:                fp * math.Max(0, a-b/2) / (a + b),
	}
	m.Z2 = fp / (m.ReducedLeverRatio * (1 - p))
	if !(m.Z2 > m.Z1) {
		return Trilinear{}, fmt.Errorf("handcalc: trilinear: Z_II = %g N is not above Z_I = %g N: the reduced lever arm a' = %g·a is too short",
			m.Z2, m.Z1, armFactor)
	}
	return m, nil
}

// Force returns F_s(Z), N.
func (m Trilinear) Force(z float64) float64 {
	switch {
	case z <= m.Z1:
		return m.Preload + m.Stiffness*m.LeverRatio*z
	case z < m.Z2:
		f1 := m.Preload + m.Stiffness*m.LeverRatio*m.Z1
		return f1 + m.transition()*(z-m.Z1)
	}
	return m.ReducedLeverRatio * z
}

// Slope returns dF_s/dZ.
func (m Trilinear) Slope(z float64) float64 {
	switch {
	case z < m.Z1:
		return m.Stiffness * m.LeverRatio
	case z < m.Z2:
		return m.transition()
	}
	return m.ReducedLeverRatio
}

// transition returns the slope of branch II.
func (m Trilinear) transition() float64 {
	f1 := m.Preload + m.Stiffness*m.LeverRatio*m.Z1
	return (m.ReducedLeverRatio*m.Z2 - f1) / (m.Z2 - m.Z1)
}

// Points returns the characteristic points from Z = 0 up to end (N): the
// preload, Z_I and Z_II where they lie below end, and end itself.
func (m Trilinear) Points(end float64) []Point {
	return points(m, end, []Point{{Name: PointZ1, Z: m.Z1}, {Name: PointZ2, Z: m.Z2}})
}

// points evaluates the curve at Z = 0, at the break points inside (0, end)
// and at end.
func points(c BoltForceCurve, end float64, breaks []Point) []Point {
	out := []Point{{Name: PointPreload, Z: 0, Fs: c.Force(0)}}
	for _, p := range breaks {
		if p.Z > 0 && p.Z < end {
			out = append(out, Point{Name: p.Name, Z: p.Z, Fs: c.Force(p.Z)})
		}
	}
	if end > 0 {
		out = append(out, Point{Name: PointEnd, Z: end, Fs: c.Force(end)})
	}
	return out
}
