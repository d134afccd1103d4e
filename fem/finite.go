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

func (FiniteStrain) strain(c material.Condition, g *PointGeometry, u []float64, k *kernelWork) material.Vec4 {
	k.h = deformationAt(c, g, u)
	k.valid = k.h.valid()
	if !k.valid {
		return invalidStrain()
	}
	k.log.evaluate(k.h.greenLagrange())
	return k.log.e
}

// point of the total-Lagrangian B at the deformation strain found
// (δE_GL = B·δu), with the law's stress T pulled back to the second
// Piola–Kirchhoff stress S and its tangent to dS/dE_GL through the
// derivatives of the logarithm that strain kept. An inverted point makes
// the force NaN and keeps nothing.
func (FiniteStrain) point(c material.Condition, g *PointGeometry, k *kernelWork, fe []float64, keep bool) {
	if !k.valid {
		for j := range fe {
			fe[j] = math.NaN()
		}
		return
	}
	h := &k.h
	w := g.Weight
	axi := c == material.Axisymmetric
	s := k.log.pullBack(k.stress)
	s0, s1, s2, s3 := w*s[0], w*s[1], w*s[2], w*s[3]
	fxx, fzz := 1+h.xx, 1+h.zz
	hoop := 0.0 // F_yy/x: the yy row of B is hoop·N at the x dofs
	if axi {
		hoop = (1 + h.yy) / g.X
	}
	n := len(g.N)
	fe = fe[:2*n]
	cols := k.finite[:n]
	p := k.kept
	for a := range cols {
		dx, dz := g.DNdx[a], g.DNdz[a]
		col := &cols[a][p]
		x0, x1, x3 := fxx*dx, h.xz*dz, fxx*dz+h.xz*dx
		z0, z1, z3 := h.zx*dx, fzz*dz, h.zx*dz+fzz*dx
		col.b.x = [4]float64{x0, x1, 0, x3}
		col.b.z = [4]float64{z0, z1, 0, z3}
		fx := s0*x0 + s1*x1 + s3*x3
		if axi {
			x2 := hoop * g.N[a]
			col.b.x[2] = x2
			fx += s2 * x2
		}
		fe[2*a] += fx
		fe[2*a+1] += s0*z0 + s1*z1 + s3*z3
		if keep {
			col.dx, col.dz = dx, dz
			col.gx, col.gz = s0*dx+s3*dz, s1*dz+s3*dx
		}
	}
	if !keep {
		return
	}
	// w·D·B in a loop of its own with the entries of w·dS/dE_GL it needs
	// in scalars: with the force's terms too they would not fit the
	// registers, and an array's elements are loaded at every use.
	dm := k.log.tangent(&k.d, k.stress, axi)
	d00, d01, d03 := dm[0][0]*w, dm[0][1]*w, dm[0][3]*w
	d10, d11, d13 := dm[1][0]*w, dm[1][1]*w, dm[1][3]*w
	d30, d31, d33 := dm[3][0]*w, dm[3][1]*w, dm[3][3]*w
	for a := range cols {
		col := &cols[a][p]
		b, db := &col.b, &col.db
		x0, x1, x3 := b.x[0], b.x[1], b.x[3]
		db.x[0] = d00*x0 + d01*x1 + d03*x3
		db.x[1] = d10*x0 + d11*x1 + d13*x3
		db.x[3] = d30*x0 + d31*x1 + d33*x3
		z0, z1, z3 := b.z[0], b.z[1], b.z[3]
		db.z[0] = d00*z0 + d01*z1 + d03*z3
		db.z[1] = d10*z0 + d11*z1 + d13*z3
		db.z[3] = d30*z0 + d31*z1 + d33*z3
	}
	if axi {
		hoopGeo := s2 / (g.X * g.X) // w·S_yy/x², the hoop part of the geometric stiffness
		d02, d12, d32 := dm[0][2]*w, dm[1][2]*w, dm[3][2]*w
		d20, d21, d22, d23 := dm[2][0]*w, dm[2][1]*w, dm[2][2]*w, dm[2][3]*w
		for a := range cols {
			col := &cols[a][p]
			b, db := &col.b, &col.db
			x2 := b.x[2]
			db.x[0] += d02 * x2
			db.x[1] += d12 * x2
			db.x[3] += d32 * x2
			db.x[2] = d20*b.x[0] + d21*b.x[1] + d22*x2 + d23*b.x[3]
			db.z[2] = d20*b.z[0] + d21*b.z[1] + d23*b.z[3] // B_yy is 0 at u_z
			col.n, col.hoop = g.N[a], hoopGeo*g.N[a]
		}
	}
	k.kept++
}

// pairs of the total-Lagrangian B: the 2×2 block of nodes a ≤ b sums
// B_aᵀ·(w·D·B)_b over the points in four scalars, with the geometric
// stiffness w·Σ_k S_k ∂²E_GL,k/∂u∂u, the same scalar ∇N_a·(w·S)·∇N_b in
// its xx and zz entries.
func (FiniteStrain) pairs(c material.Condition, k *kernelWork, n int, ke []float64) {
	if c == material.Axisymmetric {
		finitePairsAxisymmetric(k, n, ke)
		return
	}
	nd := 2 * n
	for a := 0; a < n; a++ {
		ca := k.finite[a][:k.kept]
		rx, rz := ke[2*a*nd:(2*a+1)*nd], ke[(2*a+1)*nd:(2*a+2)*nd]
		// The diagonal block: its zx entry is in the lower triangle.
		xx, xz, zz := rx[2*a], rx[2*a+1], rz[2*a+1]
		for p := range ca {
			q := &ca[p]
			geo := q.gx*q.dx + q.gz*q.dz
			xx += q.b.x[0]*q.db.x[0] + q.b.x[1]*q.db.x[1] + q.b.x[3]*q.db.x[3] + geo
			xz += q.b.x[0]*q.db.z[0] + q.b.x[1]*q.db.z[1] + q.b.x[3]*q.db.z[3]
			zz += q.b.z[0]*q.db.z[0] + q.b.z[1]*q.db.z[1] + q.b.z[3]*q.db.z[3] + geo
		}
		rx[2*a], rx[2*a+1], rz[2*a+1] = xx, xz, zz
		for b := a + 1; b < n; b++ {
			cb := k.finite[b][:len(ca)]
			px, pz := rx[2*b:2*b+2], rz[2*b:2*b+2]
			xx, xz, zx, zz := px[0], px[1], pz[0], pz[1]
			for p := range ca {
				qa, qb := &ca[p], &cb[p]
				geo := qa.gx*qb.dx + qa.gz*qb.dz
				xx += qa.b.x[0]*qb.db.x[0] + qa.b.x[1]*qb.db.x[1] + qa.b.x[3]*qb.db.x[3] + geo
				xz += qa.b.x[0]*qb.db.z[0] + qa.b.x[1]*qb.db.z[1] + qa.b.x[3]*qb.db.z[3]
				zx += qa.b.z[0]*qb.db.x[0] + qa.b.z[1]*qb.db.x[1] + qa.b.z[3]*qb.db.x[3]
				zz += qa.b.z[0]*qb.db.z[0] + qa.b.z[1]*qb.db.z[1] + qa.b.z[3]*qb.db.z[3] + geo
			}
			px[0], px[1], pz[0], pz[1] = xx, xz, zx, zz
		}
	}
}

// finitePairsAxisymmetric is pairs of FiniteStrain with the hoop row of B
// and the hoop part of the geometric stiffness, both at the x dofs; kept
// apart so that the plane conditions' inner loop has no branch.
func finitePairsAxisymmetric(k *kernelWork, n int, ke []float64) {
	nd := 2 * n
	for a := 0; a < n; a++ {
		ca := k.finite[a][:k.kept]
		rx, rz := ke[2*a*nd:(2*a+1)*nd], ke[(2*a+1)*nd:(2*a+2)*nd]
		xx, xz, zz := rx[2*a], rx[2*a+1], rz[2*a+1]
		for p := range ca {
			q := &ca[p]
			geo := q.gx*q.dx + q.gz*q.dz
			xx += q.b.x[0]*q.db.x[0] + q.b.x[1]*q.db.x[1] + q.b.x[3]*q.db.x[3] + geo + (q.b.x[2]*q.db.x[2] + q.hoop*q.n)
			xz += q.b.x[0]*q.db.z[0] + q.b.x[1]*q.db.z[1] + q.b.x[3]*q.db.z[3] + q.b.x[2]*q.db.z[2]
			zz += q.b.z[0]*q.db.z[0] + q.b.z[1]*q.db.z[1] + q.b.z[3]*q.db.z[3] + geo
		}
		rx[2*a], rx[2*a+1], rz[2*a+1] = xx, xz, zz
		for b := a + 1; b < n; b++ {
			cb := k.finite[b][:len(ca)]
			px, pz := rx[2*b:2*b+2], rz[2*b:2*b+2]
			xx, xz, zx, zz := px[0], px[1], pz[0], pz[1]
			for p := range ca {
				qa, qb := &ca[p], &cb[p]
				geo := qa.gx*qb.dx + qa.gz*qb.dz
				xx += qa.b.x[0]*qb.db.x[0] + qa.b.x[1]*qb.db.x[1] + qa.b.x[3]*qb.db.x[3] + geo + (qa.b.x[2]*qb.db.x[2] + qa.hoop*qb.n)
				xz += qa.b.x[0]*qb.db.z[0] + qa.b.x[1]*qb.db.z[1] + qa.b.x[3]*qb.db.z[3] + qa.b.x[2]*qb.db.z[2]
				zx += qa.b.z[0]*qb.db.x[0] + qa.b.z[1]*qb.db.x[1] + qa.b.z[3]*qb.db.x[3]
				zz += qa.b.z[0]*qb.db.z[0] + qa.b.z[1]*qb.db.z[1] + qa.b.z[3]*qb.db.z[3] + geo
			}
			px[0], px[1], pz[0], pz[1] = xx, xz, zx, zz
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
	var l logStrain
	l.evaluate(h.greenLagrange())
	s := l.pullBack(stress)
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

// logStrain is the logarithmic strain E = ½ ln C at a point, as a function
// of the Green–Lagrange strain gl (both in Vec4 order with engineering
// shear), with what its first and second derivatives need: evaluate finds
// E and the Jacobian ∂E/∂gl once per point; pullBack and tangent use them
// with the law's stress.
//
// In the plane the closed form follows from Cayley–Hamilton for a 2×2
// tensor: with m = ½ tr C, the deviator D = C − m·I and r = |D| (so the
// eigenvalues are m ± r),
//
//	½ ln C = ℓ·I + φ·D,  ℓ = ¼ ln(det C),  φ = atanh(r/m)/(2r) = ψ(r²/m²)/(2m),
//
// where ψ(s) = atanh(√s)/√s = Σ sᵏ/(2k+1) is smooth in s = r²/m² ∈ [0, 1).
// Unlike the spectral form it has no special case for equal eigenvalues.
// Out of plane E_yy = ½ ln(1 + 2 gl_yy). In the coordinates (m, a, b) of
// the in-plane C, m = ½(C_xx + C_zz), a = ½(C_xx − C_zz), b = C_xz, the
// strain is E_xx = ℓ + φa, E_zz = ℓ − φa, E_xz = 2φb (engineering), with ℓ
// and φ functions of m and q = a² + b² = r²; and m = 1 + gl_xx + gl_zz,
// a = gl_xx − gl_zz, b = gl_xz, so ∂/∂gl_xx = ∂_m + ∂_a, ∂/∂gl_zz =
// ∂_m − ∂_a, ∂/∂gl_xz = ∂_b.
type logStrain struct {
	e   material.Vec4
	jac [3][3]float64 // ∂(E_xx, E_zz, E_xz)/∂(gl_xx, gl_zz, gl_xz)
	jyy float64       // ∂E_yy/∂gl_yy = 1/C_yy
	// For the curvature: the coordinates a and b, ℓ and φ with their
	// derivatives in (m, q).
	a, b     float64
	ell, phi scalar
}

// scalar is a function of (m, q) with its first and second derivatives.
type scalar struct{ v, m, q, mm, mq, qq float64 }

// evaluate sets E and its Jacobian at gl.
func (l *logStrain) evaluate(gl [4]float64) {
	dm := gl[0] + gl[1]
	m, a, b := 1+dm, gl[0]-gl[1], gl[3]
	q := a*a + b*b
	id := 1 / (m*m - q) // 1/det of the in-plane C
	l.ell = scalar{
		v: math.Log1p(dm*(2+dm)-q) / 4,
		m: m * id / 2, q: -id / 4,
		mm: id/2 - m*m*id*id, mq: m * id * id / 2, qq: -id * id / 4,
	}
	im := 1 / m
	s := q * im * im
	p, dp, ddp := psi(s)
	sm, sq := -2*s*im, im*im // ∂s/∂m, ∂s/∂q
	smm, smq := 6*s*im*im, -2*im*im*im
	hm := im / 2
	l.phi = scalar{
		v: p * hm,
		m: (dp*sm - p*im) * hm, q: dp * sq * hm,
		mm: p*im*im*im - dp*sm*im*im + (ddp*sm*sm+dp*smm)*hm,
		mq: -dp*sq*im*hm + (ddp*sq*sm+dp*smq)*hm,
		qq: ddp * sq * sq * hm,
	}
	l.a, l.b = a, b
	ell, phi := &l.ell, &l.phi
	l.e = material.Vec4{ell.v + phi.v*a, ell.v - phi.v*a, math.Log1p(2*gl[2]) / 2, 2 * phi.v * b}
	// Gradients in (m, a, b): ∇ℓ + a∇φ + φ·e_a, ∇ℓ − a∇φ − φ·e_a and
	// 2b∇φ + 2φ·e_b, with ∇f = (f_m, 2a·f_q, 2b·f_q).
	lm, la, lb := ell.m, 2*a*ell.q, 2*b*ell.q
	pm, pa, pb := phi.m, 2*a*phi.q, 2*b*phi.q
	grads := [3][3]float64{
		{lm + a*pm, la + a*pa + phi.v, lb + a*pb},
		{lm - a*pm, la - a*pa - phi.v, lb - a*pb},
		{2 * b * pm, 2 * b * pa, 2*b*pb + 2*phi.v},
	}
	for k, gr := range grads {
		l.jac[k] = [3]float64{gr[0] + gr[1], gr[0] - gr[1], gr[2]}
	}
	l.jyy = 1 / (1 + 2*gl[2])
}

// pullBack is S_j = Σ_k T_k ∂E_k/∂E_GL,j: the second Piola–Kirchhoff
// stress of the law's stress T.
func (l *logStrain) pullBack(t material.Vec4) material.Vec4 {
	j := &l.jac
	return material.Vec4{
		t[0]*j[0][0] + t[1]*j[1][0] + t[3]*j[2][0],
		t[0]*j[0][1] + t[1]*j[1][1] + t[3]*j[2][1],
		t[2] * l.jyy,
		t[0]*j[0][2] + t[1]*j[1][2] + t[3]*j[2][2],
	}
}

// curvature is Σ_k t_k ∂²E_k/∂gl² on the in-plane components (xx, zz, xz)
// as the six entries of the upper triangle, c00, c01, c03, c11, c13, c33,
// and on yy, c22. With ts = t_xx + t_zz, td = t_xx − t_zz, tb = 2·t_xz the
// sum is ts·H(ℓ) + td·H(φa) + tb·H(φb) in (m, a, b), where H(φa) =
// a·H(φ) + e_a∇φᵀ + ∇φe_aᵀ (likewise b), so the Hessians of ℓ and φ enter
// as the one function f = ts·ℓ + (td·a + tb·b)·φ.
func (l *logStrain) curvature(t material.Vec4) (c00, c01, c03, c11, c13, c33, c22 float64) {
	a, b, ell, phi := l.a, l.b, &l.ell, &l.phi
	ts, td, tb := t[0]+t[1], t[0]-t[1], 2*t[3]
	cp := td*a + tb*b
	fq, fmm, fmq, fqq := ts*ell.q+cp*phi.q, ts*ell.mm+cp*phi.mm, ts*ell.mq+cp*phi.mq, ts*ell.qq+cp*phi.qq
	// Hessian in (m, a, b).
	hmm := fmm
	hma := 2*a*fmq + td*phi.m
	hmb := 2*b*fmq + tb*phi.m
	haa := 2*fq + 4*a*a*fqq + 4*a*td*phi.q
	hab := 4*a*b*fqq + 2*(b*td+a*tb)*phi.q
	hbb := 2*fq + 4*b*b*fqq + 4*b*tb*phi.q
	c00 = hmm + 2*hma + haa
	c01 = hmm - haa
	c03 = hmb + hab
	c11 = hmm - 2*hma + haa
	c13 = hmb - hab
	c33 = hbb
	c22 = -2 * t[2] * l.jyy * l.jyy
	return
}

// tangent is dS/dE_GL = Jᵀ·D·J + Σ_k T_k ∂²E_k/∂E_GL², J = ∂E/∂E_GL, for a
// symmetric D (every law's in package material is). The yy row and column
// are left zero unless hoop is set: outside axisymmetry the yy row of B is
// zero, so they are never used.
func (l *logStrain) tangent(d *material.Mat4, t material.Vec4, hoop bool) material.Mat4 {
	j := &l.jac
	in := [3]int{0, 1, 3} // the in-plane components in Vec4 order
	var dj [4][3]float64  // D·J on the in-plane columns
	for r := 0; r < 4; r++ {
		if r == 2 && !hoop {
			continue
		}
		for c := 0; c < 3; c++ {
			dj[r][c] = d[r][0]*j[0][c] + d[r][1]*j[1][c] + d[r][3]*j[2][c]
		}
	}
	var out material.Mat4
	for r := 0; r < 3; r++ {
		for c := r; c < 3; c++ {
			v := j[0][r]*dj[0][c] + j[1][r]*dj[1][c] + j[2][r]*dj[3][c]
			out[in[r]][in[c]], out[in[c]][in[r]] = v, v
		}
	}
	c00, c01, c03, c11, c13, c33, c22 := l.curvature(t)
	out[0][0] += c00
	out[1][1] += c11
	out[3][3] += c33
	out[0][1] += c01
	out[1][0] = out[0][1]
	out[0][3] += c03
	out[3][0] = out[0][3]
	out[1][3] += c13
	out[3][1] = out[1][3]
	if hoop {
		for c := 0; c < 3; c++ {
			v := l.jyy * dj[2][c]
			out[2][in[c]], out[in[c]][2] = v, v
		}
		out[2][2] = l.jyy*d[2][2]*l.jyy + c22
	}
	return out
}

// psiSeries: below this s the series of ψ is summed (40 terms reach
// rounding for s < 0.2); above it the closed forms lose at most a digit.
const psiSeries = 0.2

// psiTerms holds the coefficients of the k-th terms of the series of ψ,
// ψ' and ψ": 1/(2k+1), (k+1)/(2k+3) and (k+2)(k+1)/(2k+5), so that a term
// costs multiplications, not divisions. Read only.
var psiTerms = func() (c [40][3]float64) {
	for k := range c {
		fk := float64(k)
		c[k] = [3]float64{1 / (2*fk + 1), (fk + 1) / (2*fk + 3), (fk + 2) * (fk + 1) / (2*fk + 5)}
	}
	return c
}()

// psi returns ψ(s) = atanh(√s)/√s and its first two derivatives, s ∈ [0, 1).
func psi(s float64) (p, dp, ddp float64) {
	if s < psiSeries {
		sk := 1.0
		for k := range psiTerms {
			c := &psiTerms[k]
			t := c[2] * sk
			p += c[0] * sk
			dp += c[1] * sk
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
			g, err := m.geometryAt(e, ip, p, sc)
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
