package fem

import (
	"fmt"
	"math"
	"testing"

	"flangeseg/material"
	"flangeseg/mesh"
)

// The element kernels (kinematics.go, finite.go) are written for speed: the
// upper triangle of the tangent, the zeros of B skipped, the geometric
// stiffness in the same pass as BᵀDB, the curvature of the logarithm
// contracted with the stress in closed form. This file keeps the
// straightforward forms they replaced — a dense B, the whole product
// BᵀDB, a Hessian per strain component summed with the stress weights —
// as the reference the kernels are checked against.

// henckyReference returns the logarithmic strain E = ½ ln C as a function of
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
func henckyReference(gl [4]float64, t *material.Vec4) (e material.Vec4, jac, curv material.Mat4) {
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

	gEll, hEll := ell.referenceDerivatives(a, b)
	gPhi, hPhi := phi.referenceDerivatives(a, b)
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

// derivatives returns the gradient and Hessian of f(m, q = a² + b²) in
// the coordinates (m, a, b).
func (f scalar) referenceDerivatives(a, b float64) (g [3]float64, h [3][3]float64) {
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

// henckyStrain is logStrain in the form of henckyReference: E, the 4×4
// Jacobian ∂E/∂gl and, if t is not nil, the curvature Σ_k t_k ∂²E_k/∂gl².
func henckyStrain(gl [4]float64, t *material.Vec4) (e material.Vec4, jac, curv material.Mat4) {
	var l logStrain
	l.evaluate(gl)
	in := [3]int{0, 1, 3}
	for r := 0; r < 3; r++ {
		for c := 0; c < 3; c++ {
			jac[in[r]][in[c]] = l.jac[r][c]
		}
	}
	jac[2][2] = l.jyy
	if t != nil {
		c00, c01, c03, c11, c13, c33, c22 := l.curvature(*t)
		curv = material.Mat4{{c00, c01, 0, c03}, {c01, c11, 0, c13}, {0, 0, c22, 0}, {c03, c13, 0, c33}}
	}
	return l.e, jac, curv
}

// pullBack is S_j = Σ_k T_k ∂E_k/∂E_GL,j for a 4×4 Jacobian.
func pullBack(jac *material.Mat4, t material.Vec4) material.Vec4 {
	var s material.Vec4
	for j := range s {
		for k := range t {
			s[j] += t[k] * jac[k][j]
		}
	}
	return s
}

// referenceResponse is elementResponse of the standard formulation written
// plainly: B as a dense 4 × 2n matrix (δε, or δE_GL at the current
// deformation), the tangent as the whole of w·BᵀDB (plus, in finite
// strain, the geometric stiffness and the law's tangent pulled back with
// henckyReference), the foundation over all node pairs.
func referenceResponse(t *testing.T, m *Model, e int, ue []float64) (fe, ke []float64) {
	t.Helper()
	nd := len(ue)
	fe, ke = make([]float64, nd), make([]float64, nd*nd)
	_, finite := m.kin.(FiniteStrain)
	c := m.opt.Condition
	region := m.mesh.Elements[e].Region
	s := newScratch()
	for ip, p := range m.rule {
		g, err := m.pointGeometry(e, p, s)
		if err != nil {
			t.Fatal(err)
		}
		var b [4][]float64
		for r := range b {
			b[r] = make([]float64, nd)
		}
		var h deformation
		var strain material.Vec4
		if finite {
			h = deformationAt(c, g, ue)
			strain, _, _ = henckyReference(h.greenLagrange(), nil)
		}
		fxx, fzz, fyy := 1+h.xx, 1+h.zz, 1+h.yy
		for a := range g.N {
			ix, iz := 2*a, 2*a+1
			dx, dz := g.DNdx[a], g.DNdz[a]
			b[0][ix], b[0][iz] = fxx*dx, h.zx*dx
			b[1][ix], b[1][iz] = h.xz*dz, fzz*dz
			if c == material.Axisymmetric {
				b[2][ix] = fyy * g.N[a] / g.X
			}
			b[3][ix], b[3][iz] = fxx*dz+h.xz*dx, h.zx*dz+fzz*dx
		}
		if !finite {
			for r := range b {
				for j, v := range b[r] {
					strain[r] += v * ue[j]
				}
			}
		}
		elastic := strain
		for k := range elastic {
			elastic[k] -= m.eigen[region][k]
		}
		committed, trial := m.history.point(e, ip)
		var stress material.Vec4
		var d material.Mat4
		if err := m.laws[region].Respond(c, elastic, committed, trial, &stress, &d); err != nil {
			t.Fatal(err)
		}
		sv, dm := stress, d
		if finite {
			_, jac, curv := henckyReference(h.greenLagrange(), &stress)
			sv = pullBack(&jac, stress)
			for i := 0; i < 4; i++ {
				for j := 0; j < 4; j++ {
					v := curv[i][j]
					for k := 0; k < 4; k++ {
						for l := 0; l < 4; l++ {
							v += jac[k][i] * d[k][l] * jac[l][j]
						}
					}
					dm[i][j] = v
				}
			}
		}
		w := g.Weight
		for i := 0; i < nd; i++ {
			for r := 0; r < 4; r++ {
				fe[i] += w * b[r][i] * sv[r]
			}
			for j := 0; j < nd; j++ {
				v := 0.0
				for r := 0; r < 4; r++ {
					for q := 0; q < 4; q++ {
						v += b[r][i] * dm[r][q] * b[q][j]
					}
				}
				ke[i*nd+j] += w * v
			}
		}
		for a := range g.N {
			for bn := range g.N {
				k := m.foundation[region]
				nn := w * g.N[a] * g.N[bn]
				ke[2*a*nd+2*bn] += k[0] * nn
				ke[(2*a+1)*nd+2*bn+1] += k[1] * nn
				fe[2*a] += k[0] * nn * ue[2*bn]
				fe[2*a+1] += k[1] * nn * ue[2*bn+1]
				if !finite {
					continue
				}
				geo := w * (sv[0]*g.DNdx[a]*g.DNdx[bn] + sv[1]*g.DNdz[a]*g.DNdz[bn] + sv[3]*(g.DNdx[a]*g.DNdz[bn]+g.DNdz[a]*g.DNdx[bn]))
				hoop := 0.0
				if c == material.Axisymmetric {
					hoop = w * sv[2] * g.N[a] * g.N[bn] / (g.X * g.X)
				}
				ke[2*a*nd+2*bn] += geo + hoop
				ke[(2*a+1)*nd+2*bn+1] += geo
			}
		}
	}
	return fe, ke
}

// logStrain gives the strain, Jacobian and curvature of henckyReference,
// the sums it replaces, to rounding: at and near the identity, either
// side of the series limit of ψ, and at large stretches with rotation.
func TestLogStrainMatchesReference(t *testing.T) {
	stress := material.Vec4{310, -170, 90, 55}
	cases := [][4]float64{{0, 0, 0, 0}, {1e-6, -2e-6, 3e-7, 1e-6}, {0.01, -0.004, 0.002, 0.003}, {0.2, -0.1, 0.05, 0.15}, {0.6, 0.3, -0.2, 0.4}}
	for _, tc := range henckyStates {
		cases = append(cases, glOf(tc.f, tc.yy))
	}
	for _, gl := range cases {
		e, jac, curv := henckyStrain(gl, &stress)
		we, wjac, wcurv := henckyReference(gl, &stress)
		for i := 0; i < 4; i++ {
			if math.Abs(e[i]-we[i]) > 1e-15*(1+math.Abs(we[i])) {
				t.Errorf("gl %v: E[%d] = %.17g, reference %.17g", gl, i, e[i], we[i])
			}
			for j := 0; j < 4; j++ {
				if math.Abs(jac[i][j]-wjac[i][j]) > 1e-14*(1+math.Abs(wjac[i][j])) {
					t.Errorf("gl %v: jac[%d][%d] = %.17g, reference %.17g", gl, i, j, jac[i][j], wjac[i][j])
				}
				if math.Abs(curv[i][j]-wcurv[i][j]) > 1e-12*(1+math.Abs(wcurv[i][j])) {
					t.Errorf("gl %v: curv[%d][%d] = %.17g, reference %.17g", gl, i, j, curv[i][j], wcurv[i][j])
				}
			}
		}
	}
}

// kernelLaws are an elastic law and a J2 law that yields at the states of
// TestElementKernelMatchesReference.
func kernelLaws(t testing.TB) []material.Law {
	el := material.Elastic{E: 210000, Nu: 0.3}
	h, err := material.NewHardening([]float64{0, 0.1, 0.6}, []float64{355, 470, 1000})
	if err != nil {
		t.Fatal(err)
	}
	j2, err := material.NewJ2(el, h, material.DuctileDamage{})
	if err != nil {
		t.Fatal(err)
	}
	return []material.Law{el, j2}
}

// The element kernels give the internal force and tangent of
// referenceResponse to rounding, in both kinematics, the three conditions,
// both element kinds, elastic and yielding, with an eigenstrain and a
// foundation.
func TestElementKernelMatchesReference(t *testing.T) {
	field := imposed([2][2]float64{{1.04, 0.03}, {-0.02, 0.97}}, 0.004) // about 4 % strain: J2 yields
	for _, law := range kernelLaws(t) {
		for _, kin := range []Kinematics{SmallStrain{}, FiniteStrain{}} {
			for _, kind := range []mesh.Kind{mesh.Quad4, mesh.Quad8} {
				for _, c := range []material.Condition{material.PlaneStress, material.PlaneStrain, material.Axisymmetric} {
					name := fmt.Sprintf("%T, %T, %d-node, %v", law, kin, kind, c)
					m := oneElement(t, kind, c, law)
					m.kin = kin
					if err := m.SetEigenstrain("block", material.Vec4{1e-4, -3e-4, 2e-5, 5e-5}); err != nil {
						t.Fatal(err)
					}
					if err := m.SetFoundation("block", 30, 7); err != nil {
						t.Fatal(err)
					}
					u := elementDisplacements(m, field)
					nd := len(u)
					fe, ke := make([]float64, nd), make([]float64, nd*nd)
					if err := m.elementResponse(0, u, fe, ke, nil, newScratch()); err != nil {
						t.Fatalf("%s: %v", name, err)
					}
					wf, wk := referenceResponse(t, m, 0, u)
					if d := relDiff(fe, wf); !(d < 1e-13) {
						t.Errorf("%s: internal force differs from the reference by %.3g", name, d)
					}
					if d := relDiff(ke, wk); !(d < 1e-13) {
						t.Errorf("%s: tangent differs from the reference by %.3g", name, d)
					}
				}
			}
		}
	}
}
