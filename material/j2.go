package material

import (
	"errors"
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
//
// A J2 is one pointer to its constants (make it with NewJ2; the zero
// value answers with an error): an element calls the law at every
// integration point through the Law interface, and a law of 144 bytes
// held by value was copied at each call and again into each method the
// return uses.
type J2 struct{ *j2Law }

// j2Law holds the constants of a J2 law, fixed by NewJ2.
type j2Law struct {
	elastic   Elastic
	hardening Hardening
	damage    DuctileDamage
	moduli    j2Moduli
}

// j2Moduli are the elastic constants the returns use at every point,
// found once (four divisions a point otherwise, at the head of the chain
// of dependent operations a point's return is).
type j2Moduli struct {
	shear   float64 // G = E/(2(1+ν))
	bulk    float64 // K = E/(3(1−2ν))
	biaxial float64 // E/(1−ν), the modulus of the equal-biaxial plane-stress mode
	rateA   float64 // E/(3(1−ν)), its rate in the plane-stress return
	nuOverE float64 // ν/E
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
	mod := j2Moduli{
		shear:   el.ShearModulus(),
		bulk:    el.E / (3 * (1 - 2*el.Nu)),
		biaxial: el.E / (1 - el.Nu),
		rateA:   el.E / (1 - el.Nu) / 3,
		nuOverE: el.Nu / el.E,
	}
	return J2{&j2Law{elastic: el, hardening: h, damage: d, moduli: mod}}, nil
}

// Elasticity is the elastic part of the law (zero for the zero J2).
func (m J2) Elasticity() Elastic {
	if m.j2Law == nil {
		return Elastic{}
	}
	return m.elastic
}

// HardeningCurve is the hardening table of the law (empty for the zero
// J2).
func (m J2) HardeningCurve() Hardening {
	if m.j2Law == nil {
		return Hardening{}
	}
	return m.hardening
}

// DamageModel is the damage indicator of the law (off for the zero J2).
func (m J2) DamageModel() DuctileDamage {
	if m.j2Law == nil {
		return DuctileDamage{}
	}
	return m.damage
}

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
// must hold StateSize values. The return works on trial in place (a copy
// of committed first), so committed and trial must not be the same
// slice.
func (m J2) Respond(c Condition, strain Vec4, committed, trial []float64, stress *Vec4, tangent *Mat4) error {
	if m.j2Law == nil {
		return errors.New("material: J2 law: zero value: make the law with NewJ2")
	}
	if len(trial) < j2StateSize {
		return fmt.Errorf("material: J2 law: trial state has %d values, need %d", len(trial), j2StateSize)
	}
	next := (*[j2StateSize]float64)(trial)
	var virgin [j2StateSize]float64
	old := &virgin
	switch {
	case committed == nil:
	case len(committed) < j2StateSize:
		return fmt.Errorf("material: J2 law: committed state has %d values, need %d", len(committed), j2StateSize)
	case &committed[0] == &trial[0]:
		return errors.New("material: J2 law: committed and trial state are the same slice")
	default:
		old = (*[j2StateSize]float64)(committed)
	}
	for i, v := range strain {
		if !(math.Abs(v) <= math.MaxFloat64) { // NaN or ±Inf: one comparison
			return fmt.Errorf("material: J2 law: strain component %d = %g: not finite", i, v)
		}
	}
	*next = *old
	var err error
	switch c {
	case PlaneStrain, Axisymmetric:
		m.respond3D(&strain, old, next, stress, tangent)
	case PlaneStress:
		err = m.respondPlaneStress(&strain, old, next, stress, tangent)
	default:
		err = fmt.Errorf("material: J2 law: condition %v: not supported", c)
	}
	if err != nil {
		return err
	}
	next[StateDamage] += m.damage.increment(next[StateEquivalentPlasticStrain]-old[StateEquivalentPlasticStrain], *stress)
	return nil
}

// respond3D is the radial return of the full stress; strain[2] is the yy
// strain the caller imposes (0 in plane strain, the hoop strain in
// axisymmetry). It writes the stress and the tangent into s and d.
func (m *j2Law) respond3D(strain *Vec4, old, next *[j2StateSize]float64, s *Vec4, d *Mat4) {
	g, k := m.moduli.shear, m.moduli.bulk
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
		*s = Vec4{str[0] + p, str[1] + p, str[2] + p, str[3]}
		m.elastic.tangentTo(PlaneStrain, d)
		return
	}
	ep, h := m.hardening.radialReturn(qtr, 3*g, ep0)
	dg := ep - ep0
	factor := 1 - 3*g*dg/qtr
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
	*d = Mat4{}
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
}

// planeStressModes holds the trial values of the three modes that
// diagonalise both the plane-stress elasticity and the von Mises matrix P:
// A = σ_xx+σ_zz (equal biaxial), B = σ_zz−σ_xx, T = σ_xz. Along the return
// they fall as A(Δγ) = a/p, B(Δγ) = b/r, T(Δγ) = t/r with p = 1 + k_A·Δγ,
// r = 1 + k_B·Δγ (k_A = E/(3(1−ν)), k_B = 2G: B and T share their rate).
// With σ_yy = 0, q² = 3J₂ = A²/4 + 3B²/4 + 3T² = α/p² + β/r².
type planeStressModes struct {
	a, b, t         float64 // trial values of A, B, T
	ka, kb          float64 // rates of A and of B, T
	alpha, beta     float64 // α = a²/4, β = 3(b²/4 + t²): q_tr² = α + β
	alphaKB, betaKA float64 // α·k_B and β·k_A, for the derivative of 1/q
}

func newPlaneStressModes(a, b, t, ka, kb float64) planeStressModes {
	alpha, beta := a*a/4, 3*(b*b/4+t*t)
	return planeStressModes{a: a, b: b, t: t, ka: ka, kb: kb, alpha: alpha, beta: beta, alphaKB: alpha * kb, betaKA: beta * ka}
}

// inverseQ returns 1/q at Δγ = x and its derivative. 1/q = p·r/√(αr² +
// βp²) needs one square root and one division, and no division by p or r.
func (md *planeStressModes) inverseQ(x float64) (g, dg float64) {
	p, r := 1+md.ka*x, 1+md.kb*x
	w := 1 / math.Sqrt(md.alpha*r*r+md.beta*p*p)
	n := p * r
	// d/dx of n·D^(−1/2), D = αr² + βp², D' = 2(αk_B·r + βk_A·p).
	return n * w, w * (md.ka*r + md.kb*p - n*w*w*(md.alphaKB*r+md.betaKA*p))
}

// respondPlaneStress is the Simo–Taylor plane-stress return: the stress is
// σ(Δγ) = Ξ(Δγ)·(ε − ε^p_n), Ξ = (C⁻¹ + Δγ P)⁻¹, and Δγ solves
// q(Δγ) = σ_y(ε̄_n + (2/3)Δγ q(Δγ)). It writes the stress and the tangent
// into s and d.
func (m *j2Law) respondPlaneStress(strain *Vec4, old, next *[j2StateSize]float64, s *Vec4, d *Mat4) error {
	g, eA := m.moduli.shear, m.moduli.biaxial
	exx := strain[0] - old[StatePlasticStrain]
	ezz := strain[1] - old[StatePlasticStrain+1]
	gxz := strain[3] - old[StatePlasticStrain+3]
	md := newPlaneStressModes(eA*(exx+ezz), 2*g*(ezz-exx), g*gxz, m.moduli.rateA, 2*g)
	ep0 := old[StateEquivalentPlasticStrain]
	seg := m.hardening.segment(ep0)
	sy0 := m.hardening.onSegment(seg, ep0)
	*d = Mat4{}
	if md.alpha+md.beta <= sy0*sy0 { // q_tr ≤ σ_y: elastic
		a, b, t := md.a, md.b, md.t
		sxx, szz := (a-b)/2, (a+b)/2
		*s = Vec4{sxx, szz, 0, t}
		d[0][0], d[0][1], d[1][0], d[1][1] = (eA+2*g)/2, (eA-2*g)/2, (eA-2*g)/2, (eA+2*g)/2
		d[3][3] = g
		next[StateOutOfPlaneStrain] = -m.moduli.nuOverE*(sxx+szz) + old[StatePlasticStrain+2]
		return nil
	}
	dg, seg, err := m.planeStressConsistency(&md, ep0, seg)
	if err != nil {
		return err
	}
	h := m.hardening.slope(seg)
	p, r := 1+md.ka*dg, 1+md.kb*dg
	inv := 1 / (p * r)
	ip, ir := r*inv, p*inv // 1/p, 1/r
	a, b, t := md.a*ip, md.b*ir, md.t*ir
	sxx, szz := (a-b)/2, (a+b)/2
	*s = Vec4{sxx, szz, 0, t}
	// Ξ(Δγ) in xx, zz, xz (engineering shear): the modes' moduli E/(1−ν),
	// 2G and G, each over its p or r.
	ma, mb, mt := eA*ip, 2*g*ir, g*ir
	x00, x01, x33 := (ma+mb)/2, (ma-mb)/2, mt
	// Plastic flow Δε^p = Δγ·P·σ, P·σ = (s_xx, s_zz, 2σ_xz) with σ_yy = 0.
	n0, n1, n3 := (2*sxx-szz)/3, (2*szz-sxx)/3, 2*t
	q := math.Sqrt(a*a/4 + 3*(b*b/4+t*t))
	next[StatePlasticStrain] += dg * n0
	next[StatePlasticStrain+1] += dg * n1
	next[StatePlasticStrain+2] -= dg * (n0 + n1) // plastic incompressibility
	next[StatePlasticStrain+3] += dg * n3
	next[StateEquivalentPlasticStrain] = ep0 + 2*dg*q/3
	next[StateOutOfPlaneStrain] = -m.moduli.nuOverE*(sxx+szz) + next[StatePlasticStrain+2]

	// Consistent tangent D = Ξ − c·(Ξn)(Ξn)ᵀ/(c·nᵀΞn + (4/9)H q²), with
	// c = 1 − (2/3)HΔγ: linearise σ = Ξ(ε − ε^p_n) and q = σ_y(ε̄) with
	// ε̄ = ε̄_n + (2/3)Δγ q in ε, σ and Δγ together.
	xn0, xn1, xn3 := x00*n0+x01*n1, x01*n0+x00*n1, x33*n3
	nxn := n0*xn0 + n1*xn1 + n3*xn3
	c := 1 - 2*h*dg/3
	den := c*nxn + 4*h*q*q/9
	if !(den > 0) {
		return fmt.Errorf("material: J2 law, plane stress: plastic step too large for the hardening slope %g MPa (Δγ = %g): tangent undefined; cut the increment", h, dg)
	}
	f := c / den
	d[0][0], d[0][1], d[0][3] = x00-f*xn0*xn0, x01-f*xn0*xn1, -f*xn0*xn3
	d[1][0], d[1][1], d[1][3] = d[0][1], x00-f*xn1*xn1, -f*xn1*xn3
	d[3][0], d[3][1], d[3][3] = d[0][3], d[1][3], x33-f*xn3*xn3
	return nil
}

// Stopping rule of planeStressConsistency: the iteration ends once the
// residual ρ (dimensionless, ρ = −(q − σ_y)/q) to be expected after the
// next Newton step, C·ρ_k² with the contraction C = |ρ_k|/ρ_{k−1}² of the
// last step, is below consistencyPredicted/10 (a safety factor of 10 on
// the estimate, which overrates ρ_{k+1} before the iteration reaches its
// quadratic phase), or ρ_k itself is below consistencyResidual; the last
// step is taken without a further evaluation. The bound before was
// |q − σ_y| ≤ 1e-13·σ_y(ε̄_n); TestJ2PlaneStressConsistencyMatchesReference
// holds this one to 1e-14·σ_y.
const (
	consistencyResidual  = 1e-14
	consistencyPredicted = 1e-14
)

// planeStressConsistency finds Δγ > 0 with q(Δγ) = σ_y(ε̄(Δγ)), ε̄(Δγ) =
// ε̄_n + (2/3)Δγ·q(Δγ), starting on segment seg of the hardening table
// (the one that holds ε̄_n); it returns Δγ and the segment that holds
// ε̄ there.
//
// On segment i the table is the line σ_y = s_i + H_i·(ε̄ − ε̄_n), s_i its
// value at ε̄_n, and the condition divided by q reads
//
//	ρ_i(Δγ) = s_i/q(Δγ) − 1 + (2/3)H_i·Δγ = 0.
//
// This is the Simo–Taylor consistency condition (Simo and Taylor 1986;
// Simo and Hughes 1998, §3.4, solve it squared); the reciprocal form is
// chosen because 1/q is then linear in Δγ for a single mode (A, or B and
// T), so that Newton's method is exact in one step for equal-biaxial,
// shear-only and B-only states and nearly so in between: typically two
// evaluations after the one at Δγ = 0 instead of the four or five of
// Newton on q − σ_y. ρ_i is increasing (H_i ≥ 0) and concave: 1/q =
// (Σ h_j⁻²)^(−1/2) with h_j = p/√α, r/√β (twice) affine in Δγ, and
// f(h) = (Σ h_j⁻²)^(−1/2) is positive, homogeneous of degree one and has
// convex upper level sets ({Σ h_j⁻² ≤ c}, Σ h_j⁻² being convex), which
// makes it concave on h > 0. Newton's method started left of the root of
// an increasing concave function climbs to it monotonically, without
// overshoot, so no bracket is needed.
//
// The segment: ε̄(Δγ) rises with Δγ, so the root lies on the first
// segment whose line's root has ε̄ within it (as radialReturn walks). An
// iterate whose ε̄ passes the end of segment i shows the root is beyond
// it; the iteration goes on with the next segment from the last iterate
// that stayed within segment i, which lies left of the root of every
// later segment's line (ρ_{i+1} = ρ_i there, and ρ_{i+1} is increasing
// with its root past the end of segment i).
func (m *j2Law) planeStressConsistency(md *planeStressModes, ep0 float64, seg int) (dg float64, _ int, err error) {
	hd := &m.hardening
	last := hd.Len() - 1
	hs, s := hd.slope(seg), hd.onSegment(seg, ep0)
	x := 0.0
	lo := 0.0     // the last iterate that stayed within segment seg
	prev := 0.0   // ρ at the previous iterate on this segment
	fresh := true // no previous iterate on this segment
	for it := 0; it < 60+4*last; it++ {
		g, dgx := md.inverseQ(x)
		if seg < last && 2*x > 3*(hd.strain[seg+1]-ep0)*g { // ε̄(x) past the segment's end
			j := hd.segment(ep0 + 2*x/(3*g))
			if hd.onSegment(j, ep0)*g-1+2*hd.slope(j)*x/3 < 0 {
				// x is left of the root, which lies on segment j or later.
				seg, fresh = j, true
			} else {
				// x is past the root (a slope rose at a point between):
				// go on with the next segment from the last iterate left
				// of its end.
				seg++
				hs, s = hd.slope(seg), hd.onSegment(seg, ep0)
				x, fresh = lo, true
				continue
			}
			hs, s = hd.slope(seg), hd.onSegment(seg, ep0)
		}
		lo = x
		rho := s*g - 1 + 2*hs*x/3
		drho := s*dgx + 2*hs/3
		if !(drho > 0) || math.IsNaN(rho) {
			break
		}
		x -= rho / drho
		ar := math.Abs(rho)
		if ar <= consistencyResidual || (!fresh && 10*ar*ar*ar <= consistencyPredicted*prev*prev) {
			return x, seg, nil
		}
		prev, fresh = rho, false
	}
	return 0, 0, fmt.Errorf("material: J2 law, plane stress: return map did not converge (trial q = %g MPa, yield %g MPa)", math.Sqrt(md.alpha+md.beta), hd.onSegment(seg, ep0))
}
