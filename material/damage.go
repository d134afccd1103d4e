package material

import (
	"fmt"
	"math"
)

// DuctileDamage is the ductile damage indicator
//
//	D = ∫ dε̄_p / ε_f(η),  ε_f(η) = α·exp(−β·η),  η = σ_m/σ_eq,
//
// a fracture strain that falls exponentially with the stress triaxiality η
// (mean stress over von Mises stress). The exponential form is the one of
// the void-growth analysis of J. R. Rice and D. M. Tracey, "On the ductile
// enlargement of voids in triaxial stress fields", J. Mech. Phys. Solids 17
// (1969) 201–217 (growth rate ∝ exp(3η/2)), used as a fracture criterion by
// J. W. Hancock and A. C. Mackenzie, J. Mech. Phys. Solids 24 (1976) 147–169,
// and by G. R. Johnson and W. H. Cook, Eng. Fract. Mech. 21 (1985) 31–48
// (their D₁ = 0, D₂ = α, D₃ = −β). D only indicates: it does not weaken the
// stress (no coupling), so the tangent is that of the plasticity alone.
// Rupture is D ≥ 1; the caller decides what follows.
//
// The zero value (α = 0) switches the indicator off: D stays 0.
type DuctileDamage struct {
	Alpha float64 // α: fracture strain at η = 0
	Beta  float64 // β: its decay with triaxiality (3/2 after Rice and Tracey)
}

// NewDuctileDamage validates α > 0 and a finite β ≥ 0.
func NewDuctileDamage(alpha, beta float64) (DuctileDamage, error) {
	if !(alpha > 0) || math.IsInf(alpha, 0) {
		return DuctileDamage{}, fmt.Errorf("material: damage alpha = %g: must be positive and finite", alpha)
	}
	if !(beta >= 0) || math.IsInf(beta, 0) {
		return DuctileDamage{}, fmt.Errorf("material: damage beta = %g: must be finite and not negative", beta)
	}
	return DuctileDamage{Alpha: alpha, Beta: beta}, nil
}

// Rice–Tracey exponent and the neck used to calibrate α for the families.
const (
	riceTraceyBeta = 1.5
	// neckTriaxiality is η at the centre of a tensile specimen's neck with
	// a/R = 1 after Bridgman's analysis, η = 1/3 + ln(1 + a/(2R))
	// (P. W. Bridgman, Studies in Large Plastic Flow and Fracture, 1952).
	neckTriaxiality = 1.0/3 + 0.4054651081081644 // ln(1.5)
)

// calibratedDamage sets α so that ε_f at the neck equals the true fracture
// strain ln(1/(1−Z)) of a reduction of area Z.
func calibratedDamage(z float64) DuctileDamage {
	ef := math.Log(1 / (1 - z))
	return DuctileDamage{Alpha: ef * math.Exp(riceTraceyBeta*neckTriaxiality), Beta: riceTraceyBeta}
}

// StructuralSteelDamage is the default indicator for structural steels
// S235–S460: β = 3/2 (Rice and Tracey) and α from a reduction of area of
// 50 % at the neck (α ≈ 2.10, ε_f(1/3) ≈ 1.27). The reduction of area is an
// engineering estimate, not a value of EN 10025; calibrate α on a test of
// the actual plate where the result depends on it.
func StructuralSteelDamage() DuctileDamage { return calibratedDamage(0.50) }

// BoltSteelDamage is the default indicator for quenched and tempered bolt
// steels of classes 8.8–12.9: β = 3/2 and α from a reduction of area of
// 44 %, the ISO 898-1 minimum for class 12.9, from memory (α ≈ 1.76,
// ε_f(1/3) ≈ 1.07). An engineering estimate for the family; the thread root
// sees a higher triaxiality than the neck, which the η-dependence covers.
func BoltSteelDamage() DuctileDamage { return calibratedDamage(0.44) }

// FractureStrain is ε_f(η) = α·exp(−β·η); +Inf when the indicator is off.
func (d DuctileDamage) FractureStrain(eta float64) float64 {
	if d.Alpha == 0 {
		return math.Inf(1)
	}
	return d.Alpha * math.Exp(-d.Beta*eta)
}

// Triaxiality is η = σ_m/σ_eq of a stress (0 for a stress without
// deviatoric part, where no plastic flow occurs).
func Triaxiality(s Vec4) float64 {
	q := VonMises(s)
	if q == 0 {
		return 0
	}
	return (s[0] + s[1] + s[2]) / 3 / q
}

// increment is the growth of D over a step with plastic strain increment
// dep ending at stress s (backward Euler in η: the end-of-step triaxiality).
func (d DuctileDamage) increment(dep float64, s Vec4) float64 {
	if dep <= 0 || d.Alpha == 0 {
		return 0
	}
	return dep / d.FractureStrain(Triaxiality(s))
}
