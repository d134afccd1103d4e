package fem

import (
	"fmt"
	"math"

	"flangeseg/material"
)

// FiniteStrain is the large-deformation formulation: total Lagrangian,
// with the logarithmic (Hencky) strain E = ½ ln C of the right
// Cauchy–Green tensor C = FᵀF as the strain a material.Law sees, and the
// law's stress T taken as the stress work-conjugate to it. T is mapped to
// the second Piola–Kirchhoff stress S = T : ∂E/∂E_GL (E_GL = ½(C − I)
// the Green–Lagrange strain), and the tangent is the law's tangent pulled
// back the same way plus the curvature of the logarithm contracted with T,
// plus the initial-stress (geometric) part of S. This is the
// "logarithmic strain space" of C. Miehe, N. Apel and M. Lambrecht,
// Comput. Methods Appl. Mech. Engrg. 191 (2002) 5383–5425. Select it with
// Options{Kinematics: FiniteStrain{}}.
//
// Why this one. A small-strain law plugs in unchanged, J2 plasticity with
// its plane-stress return included: its additive split becomes an additive
// split of the logarithmic strain, so a hardening curve given as true
// stress against logarithmic strain is followed in uniaxial tension at any
// strain (exactly in the Kirchhoff stress τ = J·σ; the Cauchy stress
// differs by the elastic volume change, (1−2ν)σ/E, below 0.2 % for steel).
// The strain is a function of C alone, so it is objective by construction:
// a superposed rotation of any size, in one increment or many, leaves the
// law's input unchanged, and no rotation-rate update (co-rotational frame,
// Jaumann or Green–Naghdi rate) is integrated. With a Green–Lagrange strain
// instead the law would be used as a St. Venant–Kirchhoff material, which
// does not reproduce a uniaxial curve beyond a few per cent strain. The
// total-Lagrangian form keeps the reference geometry and integration
// weights, so nothing about the mesh is updated. The price is the
// logarithm of C and its first two derivatives at every point, found here
// in closed form for the 2D section; and, for plasticity, that the
// additive split in logarithmic strain is exact for coaxial stretching
// (the uniaxial curve, the bolt in tension) and an approximation of
// multiplicative plasticity when principal axes turn under plastic flow
// (Miehe et al. 2002, section 2).
//
// The three conditions. Plane strain: the out-of-plane stretch is 1.
// Axisymmetric: the hoop stretch is 1 + u_x/x (x the reference radius).
// Plane stress: the law returns σ_yy = 0 and finds the thickness strain
// itself; in the total-Lagrangian work ∫ T : δE dV₀, taken over the
// reference volume, the out-of-plane direction is principal and carries no
// stress, so the thickness change is accounted for exactly and needs no
// update of the weights. It enters only the Cauchy stress, through the
// volume ratio J (see Solution.CauchyPoints).
//
// Limits, all owed to the parts around the element, not to it: edge
// tractions and pressures (AddTraction, AddPressure) stay dead loads on
// the reference edge (no follower pressure); nodal forces are dead loads;
// rigid edges (AddRigidEdge) tie the nodes with the linearised rotation
// u_x = U − θ(z − z_ref), u_z = W + θ(x − x_ref), exact for translation
// but stretching a rotated edge by √(1+θ²) − 1 ≈ θ²/2; the
// incompatible-modes formulation is always small strain.
//
// PointResult.Strain holds the logarithmic strain (engineering shear; yy is
// 0 in plane stress, as in small strain), PointResult.Stress the law's
// stress T; Solution.CauchyPoints turns it into the Cauchy stress.
type FiniteStrain struct{}

// deformation is the deformation gradient at a point less the identity:
// in plane h = [[xx, xz], [zx, zz]] with h_ij = ∂u_i/∂X_j (rows current,
// columns reference direction), and the out-of-plane stretch less one, yy.
// Keeping F − I rather than F keeps the strain of a small displacement
// accurate to rounding.
type deformation struct{ xx, xz, zx, zz, yy float64 }

func deformationAt(c material.Condition, g *PointGeometry, u []float64) deformation {
	var h deformation
	ux := 0.0
	for a := range g.N {
		uxa, uza := u[2*a], u[2*a+1]
		h.xx += g.DNdx[a] * uxa
		h.xz += g.DNdz[a] * uxa
		h.zx += g.DNdx[a] * uza
		h.zz += g.DNdz[a] * uza
		ux += g.N[a] * uxa
	}
	if c == material.Axisymmetric {
		h.yy = ux / g.X
	}
	return h
}

// valid reports whether the point is not inverted: det F > 0 in plane and
// a positive out-of-plane stretch.
func (h deformation) valid() bool {
	det := (1+h.xx)*(1+h.zz) - h.xz*h.zx
	return det > 0 && 1+h.yy > 0
}

// greenLagrange is E_GL = ½(FᵀF − I) in the order of material.Vec4 with
// engineering shear (the xz entry is C_xz).
func (h deformation) greenLagrange() [4]float64 {
	return [4]float64{
		h.xx + (h.xx*h.xx+h.zx*h.zx)/2,
		h.zz + (h.xz*h.xz+h.zz*h.zz)/2,
		h.yy + h.yy*h.yy/2,
		h.xz + h.zx + h.xx*h.xz + h.zx*h.zz,
	}
}

// invalidStrain marks an inverted point: the NaN makes an elastic
// residual NaN, which the Newton solver reports as not converged.
func invalidStrain() material.Vec4 {
	n := math.NaN()
	return material.Vec4{n, n, n, n}
}

// Strain implements Kinematics: the logarithmic strain ½ ln C.
func (FiniteStrain) Strain(c material.Condition, g *PointGeometry, u []float64) material.Vec4 {
	h := deformationAt(c, g, u)
	if !h.valid() {
		return invalidStrain()
	}
	return henckyValue(h.greenLagrange())
}

// Accumulate implements Kinematics. stress is the law's stress T and d its
// tangent dT/dE, both in logarithmic strain space.
func (FiniteStrain) Accumulate(c material.Condition, g *PointGeometry, u []float64, stress material.Vec4, d *material.Mat4, fe, ke []float64) {
	nd := len(u)
	h := deformationAt(c, g, u)
	if !h.valid() {
		for j := range fe {
			fe[j] = math.NaN()
		}
		return
	}
	var curvature *material.Vec4
	if ke != nil {
		curvature = &stress
	}
	_, jac, curv := henckyStrain(h.greenLagrange(), curvature)
	s := pullBack(&jac, stress)
	var bb [4][maxElementDofs]float64
	b := [][]float64{bb[0][:nd], bb[1][:nd], bb[2][:nd], bb[3][:nd]}
	fillNonlinearB(c, g, h, b)
	w := g.Weight
	for j := 0; j < nd; j++ {
		fe[j] += w * (b[0][j]*s[0] + b[1][j]*s[1] + b[2][j]*s[2] + b[3][j]*s[3])
	}
	if ke == nil {
		return
	}
	dm := materialTangent(&jac, d, &curv)
	var scratch [4 * maxElementDofs]float64
	addBtDB(b, &dm, w, ke, scratch[:])
	addInitialStress(c, g, s, w, ke)
}

// pullBack is S_j = Σ_k T_k ∂E_k/∂E_GL,j: the second Piola–Kirchhoff
// stress of the law's stress T.
func pullBack(jac *material.Mat4, t material.Vec4) material.Vec4 {
	var s material.Vec4
	for j := range s {
		for k := range t {
			s[j] += t[k] * jac[k][j]
		}
	}
	return s
}

// materialTangent is dS/dE_GL = Jᵀ·D·J + Σ_k T_k ∂²E_k/∂E_GL², J = ∂E/∂E_GL.
func materialTangent(jac, d, curv *material.Mat4) material.Mat4 {
	var dj, out material.Mat4
	for i := 0; i < 4; i++ {
		for j := 0; j < 4; j++ {
			for k := 0; k < 4; k++ {
				dj[i][j] += d[i][k] * jac[k][j]
			}
		}
	}
	for i := 0; i < 4; i++ {
		for j := 0; j < 4; j++ {
			v := curv[i][j]
			for k := 0; k < 4; k++ {
				v += jac[k][i] * dj[k][j]
			}
			out[i][j] = v
		}
	}
	return out
}

// fillNonlinearB writes δE_GL = B·δu, 4 rows × 2n columns, at the current
// deformation: the rows of sym(Fᵀ∇δu) and, in axisymmetry, F_yy·δu_x/x.
func fillNonlinearB(c material.Condition, g *PointGeometry, h deformation, b [][]float64) {
	fxx, fzz, fyy := 1+h.xx, 1+h.zz, 1+h.yy
	for a := range g.N {
		ix, iz := 2*a, 2*a+1
		dx, dz := g.DNdx[a], g.DNdz[a]
		b[0][ix], b[0][iz] = fxx*dx, h.zx*dx
		b[1][ix], b[1][iz] = h.xz*dz, fzz*dz
		b[2][ix], b[2][iz] = 0, 0
		if c == material.Axisymmetric {
			b[2][ix] = fyy * g.N[a] / g.X
		}
		b[3][ix], b[3][iz] = fxx*dz+h.xz*dx, h.zx*dz+fzz*dx
	}
}

// addInitialStress adds w·Σ_k S_k ∂²E_GL,k/∂u∂u, the geometric stiffness:
// the same scalar in the x and the z block of every node pair, and the hoop
// term in the x block alone.
func addInitialStress(c material.Condition, g *PointGeometry, s material.Vec4, w float64, ke []float64) {
	nd := 2 * len(g.N)
	axi := c == material.Axisymmetric
	for a := range g.N {
		dxa, dza := g.DNdx[a], g.DNdz[a]
		sx, sz := w*(s[0]*dxa+s[3]*dza), w*(s[1]*dza+s[3]*dxa)
		for b := a; b < len(g.N); b++ {
			v := sx*g.DNdx[b] + sz*g.DNdz[b]
			hoop := 0.0
			if axi {
				hoop = w * s[2] * g.N[a] * g.N[b] / (g.X * g.X)
			}
			ke[(2*a)*nd+2*b] += v + hoop
			ke[(2*a+1)*nd+2*b+1] += v
			if b != a {
				ke[(2*b)*nd+2*a] += v + hoop
				ke[(2*b+1)*nd+2*a+1] += v
			}
		}
	}
}

// Cauchy maps the law's stress T at a point to the Cauchy (true) stress of
// the deformed body, σ = F·S·Fᵀ/J with S the second Piola–Kirchhoff stress
// and J = det F, in the order of material.Vec4 (xx, zz, yy, xz) and in the
// fixed x–z axes. thicknessStrain is the logarithmic thickness strain
// ln(t/t₀) in plane stress, which the law finds, and is ignored otherwise.
// Solution.CauchyPoints applies it to a whole solution.
func (FiniteStrain) Cauchy(c material.Condition, g *PointGeometry, u []float64, stress material.Vec4, thicknessStrain float64) material.Vec4 {
	h := deformationAt(c, g, u)
	if !h.valid() {
		return invalidStrain()
	}
	_, jac, _ := henckyStrain(h.greenLagrange(), nil)
	s := pullBack(&jac, stress)
	fxx, fzz, fyy := 1+h.xx, 1+h.zz, 1+h.yy
	if c == material.PlaneStress {
		fyy = math.Exp(thicknessStrain)
	}
	j := (fxx*fzz - h.xz*h.zx) * fyy
	// F·S, then (F·S)·Fᵀ.
	a00, a01 := fxx*s[0]+h.xz*s[3], fxx*s[3]+h.xz*s[1]
	a10, a11 := h.zx*s[0]+fzz*s[3], h.zx*s[3]+fzz*s[1]
	return material.Vec4{
		(a00*fxx + a01*h.xz) / j,
		(a10*h.zx + a11*fzz) / j,
		fyy * fyy * s[2] / j,
		(a00*h.zx + a01*fzz) / j,
	}
}

// henckyStrain returns the logarithmic strain E = ½ ln C as a function of
// the Green–Lagrange strain gl (both in Vec4 order with engineering shear),
// its Jacobian ∂E/∂gl and, if t is not nil, the curvature
// Σ_k t_k ∂²E_k/∂gl².
//
// In the plane the closed form follows from Cayley–Hamilton for a 2×2
// tensor: with m = ½ tr C, the deviator D = C − m·I and r = |D| (so the
// eigenvalues are m ± r),
//
//	½ ln C = ¼ ln(det C)·I + φ·D,  φ = atanh(r/m)/(2r) = ψ(r²/m²)/(2m),
//
// where ψ(s) = atanh(√s)/√s = Σ sᵏ/(2k+1) is smooth in s = r²/m² ∈ [0, 1).
// Unlike the spectral form it has no special case for equal eigenvalues.
// Out of plane E_yy = ½ ln(1 + 2 gl_yy).
func henckyStrain(gl [4]float64, t *material.Vec4) (e material.Vec4, jac, curv material.Mat4) {
	// Coordinates (m, a, b) of the in-plane C: m = ½(C_xx + C_zz),
	// a = ½(C_xx − C_zz), b = C_xz; q = a² + b² = r².
	dm := gl[0] + gl[1]
	m, a, b := 1+dm, gl[0]-gl[1], gl[3]
	q := a*a + b*b
	det := m*m - q // det of the in-plane C
	var ell, phi scalar
	ell.v = math.Log1p(dm*(2+dm)-q) / 4
	ell.m, ell.q = m/(2*det), -1/(4*det)
	ell.mm, ell.mq, ell.qq = 1/(2*det)-m*m/(det*det), m/(2*det*det), -1/(4*det*det)

	p, dp, ddp := psi(q / (m * m))
	sm, sq := -2*q/(m*m*m), 1/(m*m) // ds/dm, ds/dq
	smm, smq := 6*q/(m*m*m*m), -2/(m*m*m)
	phi.v = p / (2 * m)
	phi.m = -p/(2*m*m) + dp*sm/(2*m)
	phi.q = dp * sq / (2 * m)
	phi.mm = p/(m*m*m) - dp*sm/(m*m) + (ddp*sm*sm+dp*smm)/(2*m)
	phi.mq = -dp*sq/(2*m*m) + (ddp*sq*sm+dp*smq)/(2*m)
	phi.qq = ddp * sq * sq / (2 * m)

	gEll, hEll := ell.derivatives(a, b)
	gPhi, hPhi := phi.derivatives(a, b)
	// φ·a and φ·b: product rule with the unit vectors of a and b.
	gPa, hPa := timesCoordinate(phi.v, a, 1, gPhi, hPhi)
	gPb, hPb := timesCoordinate(phi.v, b, 2, gPhi, hPhi)

	e[0] = ell.v + phi.v*a
	e[1] = ell.v - phi.v*a
	e[2] = math.Log1p(2*gl[2]) / 2
	e[3] = 2 * phi.v * b
	var grads [4][3]float64 // ∂E_k/∂(m, a, b), in-plane components
	for i := 0; i < 3; i++ {
		grads[0][i] = gEll[i] + gPa[i]
		grads[1][i] = gEll[i] - gPa[i]
		grads[3][i] = 2 * gPb[i]
	}
	// ∂(m, a, b)/∂gl: m = 1 + gl_xx + gl_zz, a = gl_xx − gl_zz, b = gl_xz.
	coord := [3][4]float64{{1, 1, 0, 0}, {1, -1, 0, 0}, {0, 0, 0, 1}}
	for _, k := range [3]int{0, 1, 3} {
		for j := 0; j < 4; j++ {
			for i := 0; i < 3; i++ {
				jac[k][j] += grads[k][i] * coord[i][j]
			}
		}
	}
	cyy := 1 + 2*gl[2]
	jac[2][2] = 1 / cyy
	if t == nil {
		return e, jac, curv
	}
	var hs [3][3]float64 // Σ_k t_k ∂²E_k/∂(m, a, b)²
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			hs[i][j] = t[0]*(hEll[i][j]+hPa[i][j]) + t[1]*(hEll[i][j]-hPa[i][j]) + 2*t[3]*hPb[i][j]
		}
	}
	for r := 0; r < 4; r++ {
		for c := 0; c < 4; c++ {
			v := 0.0
			for i := 0; i < 3; i++ {
				for j := 0; j < 3; j++ {
					v += coord[i][r] * hs[i][j] * coord[j][c]
				}
			}
			curv[r][c] = v
		}
	}
	curv[2][2] = -2 * t[2] / (cyy * cyy)
	return e, jac, curv
}

// henckyValue is the E of henckyStrain without its derivatives: the
// strain alone is asked for once per point and iteration, before the
// stress is known.
func henckyValue(gl [4]float64) material.Vec4 {
	dm := gl[0] + gl[1]
	m, a, b := 1+dm, gl[0]-gl[1], gl[3]
	q := a*a + b*b
	ell := math.Log1p(dm*(2+dm)-q) / 4
	phi := psiValue(q/(m*m)) / (2 * m)
	return material.Vec4{ell + phi*a, ell - phi*a, math.Log1p(2*gl[2]) / 2, 2 * phi * b}
}

// psiValue is ψ(s) of psi alone.
func psiValue(s float64) float64 {
	if s < psiSeries {
		p, sk := 0.0, 1.0
		for k := 0; k < 40; k++ {
			t := sk / float64(2*k+1)
			p += t
			if t < 1e-17*p {
				break
			}
			sk *= s
		}
		return p
	}
	x := math.Sqrt(s)
	return math.Atanh(x) / x
}

// scalar is a function of (m, q) with its first and second derivatives.
type scalar struct{ v, m, q, mm, mq, qq float64 }

// derivatives returns the gradient and Hessian of f(m, q = a² + b²) in
// the coordinates (m, a, b).
func (f scalar) derivatives(a, b float64) (g [3]float64, h [3][3]float64) {
	g = [3]float64{f.m, 2 * a * f.q, 2 * b * f.q}
	h[0][0] = f.mm
	h[0][1], h[0][2] = 2*a*f.mq, 2*b*f.mq
	h[1][1] = 2*f.q + 4*a*a*f.qq
	h[2][2] = 2*f.q + 4*b*b*f.qq
	h[1][2] = 4 * a * b * f.qq
	h[1][0], h[2][0], h[2][1] = h[0][1], h[0][2], h[1][2]
	return g, h
}

// timesCoordinate returns the gradient and Hessian of f·x, where x is
// coordinate i of (m, a, b) with value x and f has value v, gradient g and
// Hessian h.
func timesCoordinate(v, x float64, i int, g [3]float64, h [3][3]float64) ([3]float64, [3][3]float64) {
	var gx [3]float64
	var hx [3][3]float64
	for r := 0; r < 3; r++ {
		gx[r] = x * g[r]
		for c := 0; c < 3; c++ {
			hx[r][c] = x * h[r][c]
		}
	}
	for r := 0; r < 3; r++ {
		hx[r][i] += g[r]
		hx[i][r] += g[r]
	}
	gx[i] += v
	return gx, hx
}

// psiSeries: below this s the series of ψ is summed (40 terms reach
// rounding for s < 0.2); above it the closed forms lose at most a digit.
const psiSeries = 0.2

// psi returns ψ(s) = atanh(√s)/√s and its first two derivatives, s ∈ [0, 1).
func psi(s float64) (p, dp, ddp float64) {
	if s < psiSeries {
		sk := 1.0
		for k := 0; k < 40; k++ {
			fk := float64(k)
			t := (fk + 2) * (fk + 1) * sk / (2*fk + 5)
			p += sk / (2*fk + 1)
			dp += (fk + 1) * sk / (2*fk + 3)
			ddp += t
			// The terms fall as sᵏ; the second derivative's falls last.
			if t < 1e-17*ddp {
				break
			}
			sk *= s
		}
		return p, dp, ddp
	}
	x := math.Sqrt(s)
	p = math.Atanh(x) / x
	dp = (1/(1-s) - p) / (2 * s)
	ddp = (1/((1-s)*(1-s)) - 3*dp) / (2 * s)
	return p, dp, ddp
}

// cauchyMapper is implemented by kinematics whose law stress is not the
// Cauchy stress.
type cauchyMapper interface {
	Cauchy(c material.Condition, g *PointGeometry, u []float64, stress material.Vec4, thicknessStrain float64) material.Vec4
}

// CauchyPoints returns a copy of the solution's integration point results
// with Stress the Cauchy (true) stress of the deformed body. Under
// FiniteStrain the points hold the law's stress, which is not; under small
// strain (and with incompatible modes) the copy equals Points. Position and
// strain are left as they are (reference position, logarithmic strain).
// Assign the result to Points before NodalStress to recover true nodal
// stresses.
//
// In plane stress the thickness strain comes from the law: computed from
// Hooke's law for material.Elastic, read from the point's state for a law
// that implements material.History. That state aliases the model's
// storage, so call this before the model is evaluated again.
func (s *Solution) CauchyPoints() ([][]PointResult, error) {
	m := s.model
	if len(s.Points) != len(m.mesh.Elements) {
		return nil, fmt.Errorf("fem: Cauchy stress: solution has point results for %d elements, model has %d", len(s.Points), len(m.mesh.Elements))
	}
	out := m.newPointResults()
	cm, ok := m.kin.(cauchyMapper)
	ok = ok && m.opt.Formulation == Standard
	sc := newScratch()
	for e, el := range m.mesh.Elements {
		copy(out[e], s.Points[e])
		if !ok {
			continue
		}
		nd := 2 * len(el.Nodes)
		ue := sc.ue[:nd]
		for a, n := range el.Nodes {
			ue[2*a], ue[2*a+1] = s.U[2*n], s.U[2*n+1]
		}
		for ip, p := range m.rule {
			g, err := m.pointGeometry(e, p, sc)
			if err != nil {
				return nil, err
			}
			pr := s.Points[e][ip]
			yy := 0.0
			if m.opt.Condition == material.PlaneStress {
				if yy, err = m.thicknessStrain(el.Region, pr); err != nil {
					return nil, fmt.Errorf("fem: Cauchy stress, element %d: %w", e, err)
				}
			}
			out[e][ip].Stress = cm.Cauchy(m.opt.Condition, g, ue, pr.Stress, yy)
		}
	}
	return out, nil
}

// thicknessStrain is the total out-of-plane strain of a plane-stress point:
// the region's eigenstrain plus what the law found for σ_yy = 0.
func (m *Model) thicknessStrain(region int, p PointResult) (float64, error) {
	eig := m.eigen[region]
	switch law := m.laws[region].(type) {
	case material.Elastic:
		mech := (p.Strain[0] - eig[0]) + (p.Strain[1] - eig[1])
		return eig[2] - law.Nu/(1-law.Nu)*mech, nil
	case material.History:
		return eig[2] + law.OutOfPlaneStrain(p.History), nil
	}
	return 0, fmt.Errorf("region %q: law %T does not report its thickness strain (material.History)", m.mesh.Regions[region].Name, m.laws[region])
}
