package material

import (
	"fmt"
	"math"
)

// State layout of J2: the indices of the history values in a state slice
// (StateSize values per point).
const (
	StateEquivalentPlasticStrain = 0 // ε̄_p, accumulated equivalent plastic strain
	StatePlasticStrain           = 1 // 4 values from here: ε^p_xx, ε^p_zz, ε^p_yy, γ^p_xz (engineering shear)
	StateDamage                  = 5 // D, the ductile damage indicator
	StateOutOfPlaneStrain        = 6 // total ε_yy of the last response: in plane stress its outcome
	j2StateSize                  = 7
)

// History is implemented by laws whose state holds plastic strain and
// damage, so callers can read them without knowing the layout.
type History interface {
	// EquivalentPlasticStrain is ε̄_p held in a state slice.
	EquivalentPlasticStrain(state []float64) float64
	// Damage is the ductile damage indicator D held in a state slice.
	Damage(state []float64) float64
	// OutOfPlaneStrain is the total yy strain of the response that wrote
	// the state; in plane stress the thickness strain.
	OutOfPlaneStrain(state []float64) float64
}

// J2 is small-strain J2 (von Mises) plasticity: additive split of the
// strain, von Mises yield surface, associative flow, isotropic multilinear
// hardening, and a damage indicator accumulated alongside. It implements
// Law and History.
//
// Plane strain and axisymmetric use the radial return of the full
// three-dimensional stress (yy out of plane; the hoop strain in
// axisymmetry) with its algorithmically consistent tangent (J. C. Simo and
// R. L. Taylor, Comput. Methods Appl. Mech. Eng. 48 (1985) 101–118;
// J. C. Simo and T. J. R. Hughes, Computational Inelasticity, Springer 1998,
// ch. 3). Plane stress uses the plane-stress projected return map of J. C.
// Simo and R. L. Taylor, "A return mapping algorithm for plane stress
// elastoplasticity", Int. J. Numer. Methods Eng. 22 (1986) 649–670: σ_yy = 0
// holds exactly, the consistency parameter is found by a safeguarded scalar
// Newton iteration, and ε_yy is an outcome stored in the state at
// StateOutOfPlaneStrain.
type J2 struct {
	elastic   Elastic
	hardening Hardening
	damage    DuctileDamage
}

// NewJ2 validates the parts of a J2 law. The damage indicator may be the
// zero value (off).
func NewJ2(el Elastic, h Hardening, d DuctileDamage) (J2, error) {
	if _, err := NewElastic(el.E, el.Nu); err != nil {
		return J2{}, fmt.Errorf("material: J2 law: %w", err)
	}
	if h.Len() == 0 {
		return J2{}, fmt.Errorf("material: J2 law: empty hardening table")
	}
	if d != (DuctileDamage{}) {
		if _, err := NewDuctileDamage(d.Alpha, d.Beta); err != nil {
			return J2{}, fmt.Errorf("material: J2 law: %w", err)
		}
	}
	return J2{elastic: el, hardening: h, damage: d}, nil
}

// Elasticity is the elastic part of the law.
func (m J2) Elasticity() Elastic { return m.elastic }

// HardeningCurve is the hardening table of the law.
func (m J2) HardeningCurve() Hardening { return m.hardening }

// DamageModel is the damage indicator of the law.
func (m J2) DamageModel() DuctileDamage { return m.damage }

// StateSize implements Law: see the State… constants for the layout.
func (J2) StateSize() int { return j2StateSize }

// EquivalentPlasticStrain implements History.
func (J2) EquivalentPlasticStrain(state []float64) float64 {
	return stateValue(state, StateEquivalentPlasticStrain)
}

// Damage implements History.
func (J2) Damage(state []float64) float64 { return stateValue(state, StateDamage) }

// OutOfPlaneStrain implements History.
func (J2) OutOfPlaneStrain(state []float64) float64 {
	return stateValue(state, StateOutOfPlaneStrain)
}

// PlasticStrain returns the plastic strain held in a state slice, in the
// order of Vec4 with engineering shear.
func (J2) PlasticStrain(state []float64) Vec4 {
	var p Vec4
	for i := range p {
		p[i] = stateValue(state, StatePlasticStrain+i)
	}
	return p
}

func stateValue(state []float64, i int) float64 {
	if i >= len(state) {
		return 0
	}
	return state[i]
}

// Respond implements Law. A nil committed state is the virgin state; trial
// must hold StateSize values.
func (m J2) Respond(c Condition, strain Vec4, committed, trial []float64) (Vec4, Mat4, error) {
	if len(trial) < j2StateSize {
		return Vec4{}, Mat4{}, fmt.Errorf("material: J2 law: trial state has %d values, need %d", len(trial), j2StateSize)
	}
	var old [j2StateSize]float64
	switch {
	case committed == nil:
	case len(committed) < j2StateSize:
		return Vec4{}, Mat4{}, fmt.Errorf("material: J2 law: committed state has %d values, need %d", len(committed), j2StateSize)
	default:
		copy(old[:], committed)
	}
	for i, v := range strain {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Vec4{}, Mat4{}, fmt.Errorf("material: J2 law: strain component %d = %g: not finite", i, v)
		}
	}
	var (
		s   Vec4
		d   Mat4
		err error
	)
	next := old
	switch c {
	case PlaneStrain, Axisymmetric:
		s, d = m.respond3D(strain, &old, &next)
	case PlaneStress:
		s, d, err = m.respondPlaneStress(strain, &old, &next)
	default:
		err = fmt.Errorf("material: J2 law: condition %v: not supported", c)
	}
	if err != nil {
		return Vec4{}, Mat4{}, err
	}
	next[StateDamage] += m.damage.increment(next[StateEquivalentPlasticStrain]-old[StateEquivalentPlasticStrain], s)
	copy(trial, next[:])
	return s, d, nil
}

// respond3D is the radial return of the full stress; strain[2] is the yy
// strain the caller imposes (0 in plane strain, the hoop strain in
// axisymmetry).
func (m J2) respond3D(strain Vec4, old, next *[j2StateSize]float64) (Vec4, Mat4) {
	g := m.elastic.ShearModulus()
	k := m.elastic.E / (3 * (1 - 2*m.elastic.Nu))
	var e Vec4 // elastic trial strain
	for i := range e {
		e[i] = strain[i] - old[StatePlasticStrain+i]
	}
	ev := e[0] + e[1] + e[2]
	p := k * ev
	// Trial deviator as a tensor (xz is the tensor component, γ/2).
	str := Vec4{2 * g * (e[0] - ev/3), 2 * g * (e[1] - ev/3), 2 * g * (e[2] - ev/3), g * e[3]}
	norm := math.Sqrt(str[0]*str[0] + str[1]*str[1] + str[2]*str[2] + 2*str[3]*str[3])
	qtr := math.Sqrt(1.5) * norm
	ep0 := old[StateEquivalentPlasticStrain]
	next[StateOutOfPlaneStrain] = strain[2]
	sy, _ := m.hardening.Yield(ep0)
	if qtr <= sy {
		return Vec4{str[0] + p, str[1] + p, str[2] + p, str[3]}, m.elastic.Tangent(PlaneStrain)
	}
	ep, h := m.hardening.radialReturn(qtr, 3*g, ep0)
	dg := ep - ep0
	factor := 1 - 3*g*dg/qtr
	var s Vec4
	for i := 0; i < 3; i++ {
		s[i] = factor*str[i] + p
		// Δε^p = Δγ·(3/2)·s_tr/q_tr
		next[StatePlasticStrain+i] += 1.5 * dg * str[i] / qtr
	}
	s[3] = factor * str[3]
	next[StatePlasticStrain+3] += 3 * dg * str[3] / qtr // engineering shear: twice the tensor component
	next[StateEquivalentPlasticStrain] = ep

	// D = K 1⊗1 + 2G·factor·I_dev + 6G²(Δγ/q_tr − 1/(3G+H)) n̂⊗n̂, with n̂
	// the unit trial deviator (Simo and Hughes 1998, Box 3.2).
	var d Mat4
	beta := 6 * g * g * (dg/qtr - 1/(3*g+h))
	nh := Vec4{str[0] / norm, str[1] / norm, str[2] / norm, str[3] / norm}
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			d[i][j] = k - 2*g*factor/3
		}
		d[i][i] += 2 * g * factor
	}
	d[3][3] = g * factor
	for i := range d {
		for j := range d[i] {
			d[i][j] += beta * nh[i] * nh[j]
		}
	}
	return s, d
}

// planeStressModes holds the elastic moduli of the three modes that
// diagonalise both the plane-stress elasticity and the von Mises matrix P:
// A = σ_xx+σ_zz (equal biaxial), B = σ_zz−σ_xx, T = σ_xz.
type planeStressModes struct {
	a, b, t    float64 // trial values of A, B, T
	ka, kb, kt float64 // rates: A(Δγ) = a/(1+ka·Δγ), likewise B and T
}

// at returns A, B, T at the consistency parameter dg.
func (md *planeStressModes) at(dg float64) (a, b, t float64) {
	return md.a / (1 + md.ka*dg), md.b / (1 + md.kb*dg), md.t / (1 + md.kt*dg)
}

// q returns the von Mises stress q = √(3J₂) at dg and dq/dΔγ. With σ_yy = 0,
// J₂ = A²/12 + B²/4 + T². B and T share their rate (kb = kt = 2G), so two
// divisions serve the three modes.
func (md *planeStressModes) q(dg float64) (q, dq float64) {
	ra, rb := 1/(1+md.ka*dg), 1/(1+md.kb*dg)
	rt := rb
	if md.kt != md.kb {
		rt = 1 / (1 + md.kt*dg)
	}
	a, b, t := md.a*ra, md.b*rb, md.t*rt
	j2 := a*a*(1.0/12) + b*b/4 + t*t
	q = math.Sqrt(3 * j2)
	if q == 0 {
		return 0, 0
	}
	da := -a * md.ka * ra
	db := -b * md.kb * rb
	dt := -t * md.kt * rt
	dj2 := a*da*(1.0/6) + b*db/2 + 2*t*dt
	return q, 1.5 * dj2 / q
}

// respondPlaneStress is the Simo–Taylor plane-stress return: the stress is
// σ(Δγ) = Ξ(Δγ)·(ε − ε^p_n), Ξ = (C⁻¹ + Δγ P)⁻¹, and Δγ solves
// q(Δγ) = σ_y(ε̄_n + (2/3)Δγ q(Δγ)).
func (m J2) respondPlaneStress(strain Vec4, old, next *[j2StateSize]float64) (Vec4, Mat4, error) {
	el := m.elastic
	g := el.ShearModulus()
	eA := el.E / (1 - el.Nu) // modulus of the equal-biaxial mode
	exx := strain[0] - old[StatePlasticStrain]
	ezz := strain[1] - old[StatePlasticStrain+1]
	gxz := strain[3] - old[StatePlasticStrain+3]
	md := planeStressModes{
		a: eA * (exx + ezz), b: 2 * g * (ezz - exx), t: g * gxz,
		ka: eA / 3, kb: 2 * g, kt: 2 * g,
	}
	ep0 := old[StateEquivalentPlasticStrain]
	sy0, _ := m.hardening.Yield(ep0)
	qtr, _ := md.q(0)
	dg := 0.0
	var h float64
	if qtr > sy0 {
		var err error
		dg, h, err = m.planeStressConsistency(&md, ep0, qtr, sy0)
		if err != nil {
			return Vec4{}, Mat4{}, err
		}
	}
	a, b, t := md.at(dg)
	s := Vec4{(a - b) / 2, (a + b) / 2, 0, t}
	// Ξ(Δγ) in xx, zz, xz (engineering shear).
	ma, mb, mt := eA/(1+md.ka*dg), 2*g/(1+md.kb*dg), g/(1+md.kt*dg)
	xi := [3][3]float64{{(ma + mb) / 2, (ma - mb) / 2, 0}, {(ma - mb) / 2, (ma + mb) / 2, 0}, {0, 0, mt}}
	var d Mat4
	put := func(x [3][3]float64) {
		idx := [3]int{0, 1, 3}
		for i, r := range idx {
			for j, c := range idx {
				d[r][c] = x[i][j]
			}
		}
	}
	if dg == 0 {
		put(xi)
		next[StateOutOfPlaneStrain] = -el.Nu/el.E*(s[0]+s[1]) + old[StatePlasticStrain+2]
		return s, d, nil
	}
	// Plastic flow Δε^p = Δγ·P·σ, P·σ = (s_xx, s_zz, 2σ_xz) with σ_yy = 0.
	n := [3]float64{(2*s[0] - s[1]) / 3, (2*s[1] - s[0]) / 3, 2 * s[3]}
	q, _ := md.q(dg)
	next[StatePlasticStrain] += dg * n[0]
	next[StatePlasticStrain+1] += dg * n[1]
	next[StatePlasticStrain+2] -= dg * (n[0] + n[1]) // plastic incompressibility
	next[StatePlasticStrain+3] += dg * n[2]
	next[StateEquivalentPlasticStrain] = ep0 + 2*dg*q/3
	next[StateOutOfPlaneStrain] = -el.Nu/el.E*(s[0]+s[1]) + next[StatePlasticStrain+2]

	// Consistent tangent D = Ξ − c·(Ξn)(Ξn)ᵀ/(c·nᵀΞn + (4/9)H q²), with
	// c = 1 − (2/3)HΔγ: linearise σ = Ξ(ε − ε^p_n) and q = σ_y(ε̄) with
	// ε̄ = ε̄_n + (2/3)Δγ q in ε, σ and Δγ together.
	var xn [3]float64
	for i := range xn {
		for j := range n {
			xn[i] += xi[i][j] * n[j]
		}
	}
	nxn := n[0]*xn[0] + n[1]*xn[1] + n[2]*xn[2]
	c := 1 - 2*h*dg/3
	den := c*nxn + 4*h*q*q/9
	if !(den > 0) {
		return Vec4{}, Mat4{}, fmt.Errorf("material: J2 law, plane stress: plastic step too large for the hardening slope %g MPa (Δγ = %g): tangent undefined; cut the increment", h, dg)
	}
	f := c / den
	for i := range xi {
		for j := range xi[i] {
			xi[i][j] -= f * xn[i] * xn[j]
		}
	}
	put(xi)
	return s, d, nil
}

// planeStressConsistency finds Δγ > 0 with r(Δγ) = q(Δγ) − σ_y(ε̄(Δγ)) = 0.
// r falls strictly (q falls, ε̄ and σ_y rise), r(0) > 0 and r → −σ_y < 0,
// so a bracket exists; Newton steps that leave it are replaced by
// bisection, which keeps the iteration safe at the kinks of a multilinear
// table. It returns Δγ and the hardening modulus at the solution.
func (m J2) planeStressConsistency(md *planeStressModes, ep0, qtr, sy0 float64) (dg, h float64, err error) {
	resid := func(x float64) (r, dr, h float64) {
		q, dq := md.q(x)
		sy, h := m.hardening.Yield(ep0 + 2*x*q/3)
		return q - sy, dq - h*2*(q+x*dq)/3, h
	}
	g := m.elastic.ShearModulus()
	_, h0 := m.hardening.Yield(ep0)
	// Start from the radial-return estimate Δε̄ = (q_tr − σ_y)/(3G + H),
	// Δγ = (3/2)Δε̄/σ_y.
	dg = 1.5 * (qtr - sy0) / (3*g + h0) / sy0
	lo, hi := 0.0, math.Inf(1)
	tol := 1e-13 * sy0
	for it := 0; it < 200; it++ {
		r, dr, hh := resid(dg)
		if math.Abs(r) <= tol {
			return dg, hh, nil
		}
		if r > 0 {
			lo = dg
		} else {
			hi = dg
		}
		next := dg - r/dr
		if !(dr < 0) || !(next > lo && next < hi) {
			if math.IsInf(hi, 1) {
				next = 2*dg + 1e-12
			} else {
				next = (lo + hi) / 2
			}
		}
		if !math.IsInf(hi, 1) && hi-lo <= 1e-15*hi {
			return next, hh, nil
		}
		dg = next
	}
	return 0, 0, fmt.Errorf("material: J2 law, plane stress: return map did not converge (trial q = %g MPa, yield %g MPa)", qtr, sy0)
}
