package fem

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"flangeseg/material"
	"flangeseg/mesh"
)

// glOf returns the Green–Lagrange strain (Vec4 order, engineering shear)
// of an in-plane deformation gradient f and an out-of-plane stretch.
func glOf(f [2][2]float64, yy float64) [4]float64 {
	h := deformation{xx: f[0][0] - 1, xz: f[0][1], zx: f[1][0], zz: f[1][1] - 1, yy: yy - 1}
	return h.greenLagrange()
}

// spectralHencky is ½ ln C from the eigen-decomposition of C (the
// definition of the logarithmic strain), engineering shear.
func spectralHencky(t *testing.T, gl [4]float64) material.Vec4 {
	t.Helper()
	c := mat.NewSymDense(2, []float64{1 + 2*gl[0], gl[3], gl[3], 1 + 2*gl[1]})
	var eig mat.EigenSym
	if !eig.Factorize(c, true) {
		t.Fatal("eigen-decomposition failed")
	}
	var v mat.Dense
	eig.VectorsTo(&v)
	l := eig.Values(nil)
	var e [2][2]float64
	for k := 0; k < 2; k++ {
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				e[i][j] += 0.5 * math.Log(l[k]) * v.At(i, k) * v.At(j, k)
			}
		}
	}
	return material.Vec4{e[0][0], e[1][1], 0.5 * math.Log1p(2*gl[2]), 2 * e[0][1]}
}

// henckyStates span the closed form's branches: near the identity, equal
// eigenvalues (pure dilation, s = 0), either side of the series limit
// s = 0.2, and a large stretch with rotation.
var henckyStates = []struct {
	name string
	f    [2][2]float64
	yy   float64
}{
	{"near identity", [2][2]float64{{1 + 1e-7, 3e-8}, {-2e-8, 1 - 5e-8}}, 1 + 2e-8},
	{"pure dilation", [2][2]float64{{1.3, 0}, {0, 1.3}}, 1.1},
	{"dilation and rotation", [2][2]float64{{1.2 * math.Cos(0.7), -1.2 * math.Sin(0.7)}, {1.2 * math.Sin(0.7), 1.2 * math.Cos(0.7)}}, 1},
	{"s just below 0.2", [2][2]float64{{1.5635, 0}, {0, 0.69}}, 0.9},
	{"s just above 0.2", [2][2]float64{{1.5645, 0}, {0, 0.69}}, 0.9},
	{"stretch, shear, rotation", [2][2]float64{{1.6, 0.7}, {-0.5, 0.8}}, 1.4},
	{"simple shear 1", [2][2]float64{{1, 1}, {0, 1}}, 1},
}

// The closed form of ½ ln C equals the spectral definition (Hill 1968;
// Miehe, Apel & Lambrecht 2002, eq. 2.2) away from the identity; near it,
// where the logarithms of eigenvalues close to 1 lose digits, it equals
// the series ½ ln(I + 2G) = G − G² + O(G³) to rounding.
func TestHenckyMatchesSpectral(t *testing.T) {
	for _, tc := range henckyStates {
		gl := glOf(tc.f, tc.yy)
		got, _, _ := henckyStrain(gl, nil)
		want := spectralHencky(t, gl)
		tol := 1e-13 * (math.Abs(want[0]) + math.Abs(want[1]) + math.Abs(want[3]))
		if tc.name == "near identity" {
			g := [2][2]float64{{gl[0], gl[3] / 2}, {gl[3] / 2, gl[1]}}
			g2 := func(i, j int) float64 { return g[i][0]*g[0][j] + g[i][1]*g[1][j] }
			want = material.Vec4{g[0][0] - g2(0, 0), g[1][1] - g2(1, 1), want[2], 2 * (g[0][1] - g2(0, 1))}
			tol = 1e-20 // O(G³) ≈ 1e-21
		}
		for k := range got {
			if math.Abs(got[k]-want[k]) > tol {
				t.Errorf("%s: E[%d] = %.17g, want %.17g", tc.name, k, got[k], want[k])
			}
		}
	}
}

// The Jacobian ∂E/∂E_GL and the curvature Σ t_k ∂²E_k/∂E_GL² match central
// differences of the strain and of the Jacobian.
func TestHenckyDerivatives(t *testing.T) {
	stress := material.Vec4{310, -170, 90, 55}
	for _, tc := range henckyStates[1:] {
		gl := glOf(tc.f, tc.yy)
		_, jac, curv := henckyStrain(gl, &stress)
		const h = 1e-6
		for j := 0; j < 4; j++ {
			p, q := gl, gl
			p[j] += h
			q[j] -= h
			ep, jp, _ := henckyStrain(p, nil)
			eq, jq, _ := henckyStrain(q, nil)
			sp, sq := pullBack(&jp, stress), pullBack(&jq, stress)
			for k := 0; k < 4; k++ {
				fd := (ep[k] - eq[k]) / (2 * h)
				if math.Abs(fd-jac[k][j]) > 1e-8*(1+math.Abs(jac[k][j])) {
					t.Errorf("%s: ∂E_%d/∂gl_%d = %.12g, differences %.12g", tc.name, k, j, jac[k][j], fd)
				}
				fdc := (sp[k] - sq[k]) / (2 * h)
				if math.Abs(fdc-curv[k][j]) > 1e-6*(1+math.Abs(curv[k][j])) {
					t.Errorf("%s: curvature[%d][%d] = %.12g, differences %.12g", tc.name, k, j, curv[k][j], fdc)
				}
			}
		}
	}
}

// oneElement is a single 10 × 8 element off the axis (x from 2 to 12), so
// that it serves the axisymmetric case as well.
func oneElement(t *testing.T, kind mesh.Kind, c material.Condition, law material.Law) *Model {
	t.Helper()
	msh, err := mesh.Rect(2, 0, 12, 8, 1, 1, mesh.Region{Name: "block", Thickness: 3, Material: "steel"}, kind)
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewModel(msh, map[string]material.Law{"steel": law}, Options{Condition: c, Kinematics: FiniteStrain{}})
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// imposed is a displacement field: a homogeneous deformation F about the
// point (7, 4), plus a quadratic part so that the state is not uniform.
func imposed(f [2][2]float64, quad float64) func(p mesh.Point) (float64, float64) {
	return func(p mesh.Point) (float64, float64) {
		x, z := p.X-7, p.Z-4
		ux := f[0][0]*x + f[0][1]*z - x + quad*x*z
		uz := f[1][0]*x + f[1][1]*z - z - quad*x*x/2
		return ux, uz
	}
}

func elementDisplacements(m *Model, field func(mesh.Point) (float64, float64)) []float64 {
	el := m.mesh.Elements[0]
	u := make([]float64, 2*len(el.Nodes))
	for a, n := range el.Nodes {
		u[2*a], u[2*a+1] = field(m.mesh.Nodes[n])
	}
	return u
}

// The element tangent is the derivative of the internal force: central
// differences of fe agree to 1e-6 relative (Frobenius norm), at the
// reference state and at large, non-uniform pre-deformations, for every
// condition and both element kinds. The Hencky-elastic law makes the
// response hyperelastic, so the tangent is symmetric as well.
func TestFiniteStrainTangent(t *testing.T) {
	law := material.Elastic{E: 210000, Nu: 0.3}
	rot := func(a float64) [2][2]float64 {
		return [2][2]float64{{math.Cos(a), -math.Sin(a)}, {math.Sin(a), math.Cos(a)}}
	}
	mul := func(a, b [2][2]float64) (c [2][2]float64) {
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				c[i][j] = a[i][0]*b[0][j] + a[i][1]*b[1][j]
			}
		}
		return c
	}
	states := []struct {
		name string
		f    [2][2]float64
		quad float64
	}{
		{"reference state", [2][2]float64{{1, 0}, {0, 1}}, 0},
		{"stretch 30 %, shear, rotation 40°", mul(rot(0.7), [2][2]float64{{1.3, 0.25}, {0, 0.85}}), 0.01},
		{"compression 20 %, rotation 100°", mul(rot(1.75), [2][2]float64{{0.95, -0.1}, {0.05, 0.8}}), -0.008},
	}
	worst := 0.0
	defer func() { t.Logf("largest ‖K − K_fd‖/‖K‖: %.3g", worst) }()
	for _, kind := range []mesh.Kind{mesh.Quad4, mesh.Quad8} {
		for _, c := range []material.Condition{material.PlaneStress, material.PlaneStrain, material.Axisymmetric} {
			for _, st := range states {
				name := fmt.Sprintf("%d-node %v, %s", kind, c, st.name)
				m := oneElement(t, kind, c, law)
				u := elementDisplacements(m, imposed(st.f, st.quad))
				nd := len(u)
				sc := newScratch()
				fe, ke := make([]float64, nd), make([]float64, nd*nd)
				if err := m.elementResponse(0, u, fe, ke, nil, sc); err != nil {
					t.Fatalf("%s: %v", name, err)
				}
				var diff, norm2, asym float64
				fp, fm := make([]float64, nd), make([]float64, nd)
				const h = 1e-5 // mm, on a 10 mm element
				for j := 0; j < nd; j++ {
					up := append([]float64(nil), u...)
					um := append([]float64(nil), u...)
					up[j] += h
					um[j] -= h
					if err := m.elementResponse(0, up, fp, nil, nil, sc); err != nil {
						t.Fatal(err)
					}
					if err := m.elementResponse(0, um, fm, nil, nil, sc); err != nil {
						t.Fatal(err)
					}
					for i := 0; i < nd; i++ {
						fd := (fp[i] - fm[i]) / (2 * h)
						diff += (fd - ke[i*nd+j]) * (fd - ke[i*nd+j])
						norm2 += ke[i*nd+j] * ke[i*nd+j]
						asym = math.Max(asym, math.Abs(ke[i*nd+j]-ke[j*nd+i]))
					}
				}
				rel := math.Sqrt(diff / norm2)
				worst = math.Max(worst, rel)
				if !(rel <= 1e-6) {
					t.Errorf("%s: ‖K − K_fd‖/‖K‖ = %.3g", name, rel)
				}
				if asym > 1e-9*math.Sqrt(norm2) {
					t.Errorf("%s: tangent not symmetric, max |K_ij − K_ji| = %.3g", name, asym)
				}
			}
		}
	}
}

// For a small displacement the formulation is the small-strain one: the
// strain and the internal force agree to the order of the displacement
// gradient (1e-7), and the reference tangents agree to rounding.
func TestFiniteStrainSmallLimit(t *testing.T) {
	law := material.Elastic{E: 210000, Nu: 0.3}
	field := imposed([2][2]float64{{1 + 1e-7, 4e-8}, {-3e-8, 1 - 6e-8}}, 2e-9)
	for _, kind := range []mesh.Kind{mesh.Quad4, mesh.Quad8} {
		for _, c := range []material.Condition{material.PlaneStress, material.PlaneStrain, material.Axisymmetric} {
			large := oneElement(t, kind, c, law)
			small := oneElement(t, kind, c, law)
			small.kin = SmallStrain{}
			u := elementDisplacements(large, field)
			nd := len(u)
			sc := newScratch()
			fl, kl := make([]float64, nd), make([]float64, nd*nd)
			fs, ks := make([]float64, nd), make([]float64, nd*nd)
			zero := make([]float64, nd)
			if err := large.elementResponse(0, u, fl, nil, nil, sc); err != nil {
				t.Fatal(err)
			}
			if err := small.elementResponse(0, u, fs, nil, nil, sc); err != nil {
				t.Fatal(err)
			}
			if err := large.elementResponse(0, zero, make([]float64, nd), kl, nil, sc); err != nil {
				t.Fatal(err)
			}
			if err := small.elementResponse(0, zero, make([]float64, nd), ks, nil, sc); err != nil {
				t.Fatal(err)
			}
			if d := relDiff(fl, fs); d > 1e-6 {
				t.Errorf("%d-node %v: internal force differs from small strain by %.3g", kind, c, d)
			}
			if d := relDiff(kl, ks); d > 1e-13 {
				t.Errorf("%d-node %v: reference tangent differs from small strain by %.3g", kind, c, d)
			}
		}
	}
}

func relDiff(a, b []float64) float64 {
	var d, n float64
	for i := range a {
		d += (a[i] - b[i]) * (a[i] - b[i])
		n += b[i] * b[i]
	}
	return math.Sqrt(d / n)
}

// A rigid rotation of any size strains nothing and loads nothing
// (objectivity); the small-strain formulation, for contrast, reports a
// strain of order 1 − cos θ.
func TestFiniteStrainRigidRotation(t *testing.T) {
	law := material.Elastic{E: 210000, Nu: 0.3}
	for _, deg := range []float64{1, 37, 90, 180} {
		a := deg * math.Pi / 180
		field := imposed([2][2]float64{{math.Cos(a), -math.Sin(a)}, {math.Sin(a), math.Cos(a)}}, 0)
		for _, c := range []material.Condition{material.PlaneStress, material.PlaneStrain} {
			m := oneElement(t, mesh.Quad8, c, law)
			u := elementDisplacements(m, field)
			fe := make([]float64, len(u))
			pts := make([]PointResult, len(m.rule))
			if err := m.elementResponse(0, u, fe, nil, pts, newScratch()); err != nil {
				t.Fatal(err)
			}
			for _, p := range pts {
				for k, e := range p.Strain {
					if math.Abs(e) > 1e-15 {
						t.Errorf("rotation %g°, %v: strain[%d] = %.3g", deg, c, k, e)
					}
				}
			}
			for i, f := range fe {
				if math.Abs(f) > 1e-13*law.E*10*3 { // rounding of E × thickness × size
					t.Errorf("rotation %g°, %v: force at dof %d = %.3g N", deg, c, i, f)
				}
			}
		}
	}
}

// uniaxialBar stretches a 10 × 20 block (x from 0, or a solid cylinder of
// radius 10 in axisymmetry) in z to the stretch lambda, the top held by a
// rigid edge free in x and moved in a ramp, the sides free: a homogeneous
// uniaxial state (in plane strain, uniaxial in the plane). It returns the
// end force and the solution.
func uniaxialBar(t *testing.T, c material.Condition, law material.Law, lambda float64, steps int) (float64, *Solution) {
	t.Helper()
	m, edge := stretchedBlock(t, c, law)
	s, err := NewSolver(m, nil, NewtonOptions{Tolerance: 1e-11})
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Ramp(edge.Axial, 20*(lambda-1), RampOptions{Increments: steps}, func(Increment) (bool, error) { return false, nil }); err != nil {
		t.Fatalf("%v: %v", c, err)
	}
	force, err := s.Reaction(edge.Axial)
	if err != nil {
		t.Fatal(err)
	}
	sol, err := s.Snapshot()
	if err != nil {
		t.Fatal(err)
	}
	return force, sol
}

// stretchedBlock is the model of uniaxialBar before any stretch.
func stretchedBlock(t *testing.T, c material.Condition, law material.Law) (*Model, RigidEdge) {
	t.Helper()
	msh, err := mesh.Rect(0, 0, 10, 20, 2, 3, mesh.Region{Name: "bar", Thickness: 2, Material: "steel"}, mesh.Quad8)
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewModel(msh, map[string]material.Law{"steel": law}, Options{Condition: c, Kinematics: FiniteStrain{}})
	if err != nil {
		t.Fatal(err)
	}
	if err := m.FixSet("bottom", Z, 0); err != nil {
		t.Fatal(err)
	}
	if err := m.FixSet("left", X, 0); err != nil {
		t.Fatal(err)
	}
	edge, err := m.AddRigidEdge("top", mesh.Point{X: 0, Z: 20}, RigidEdgeOptions{FixRotation: true, LateralFree: true})
	if err != nil {
		t.Fatal(err)
	}
	if err := m.Fix(edge.Axial, 0); err != nil {
		t.Fatal(err)
	}
	return m, edge
}

// Hencky elasticity in uniaxial tension to 50 % stretch: the law's stress
// (Kirchhoff) is T_zz = E'·ln λ, with E' = E in plane stress and
// axisymmetry and E/(1 − ν²) in plane strain (where T_yy = ν·T_zz); the
// lateral stretches are λ^(−ν') and the Cauchy stress is T/J; the end
// force is T_zz·A₀/λ.
// Closed form from the definitions of the Hencky material (Miehe, Apel &
// Lambrecht 2002) and of the Cauchy stress.
func TestFiniteStrainUniaxialHencky(t *testing.T) {
	law := material.Elastic{E: 1000, Nu: 0.3}
	const lambda = 1.5
	cases := []struct {
		c        material.Condition
		modulus  float64
		nuX, nuY float64 // lateral strain ratios: ln λx = −nuX ln λ, ln λy = −nuY ln λ
		yy       float64 // T_yy/T_zz: ν in plane strain, 0 otherwise
		area     float64
	}{
		{material.PlaneStress, law.E, law.Nu, law.Nu, 0, 10 * 2},
		{material.PlaneStrain, law.E / (1 - law.Nu*law.Nu), law.Nu / (1 - law.Nu), 0, law.Nu, 10 * 2},
		{material.Axisymmetric, law.E, law.Nu, law.Nu, 0, math.Pi * 10 * 10},
	}
	for _, tc := range cases {
		force, sol := uniaxialBar(t, tc.c, law, lambda, 5)
		tzz := tc.modulus * math.Log(lambda)
		j := lambda * math.Pow(lambda, -tc.nuX) * math.Pow(lambda, -tc.nuY)
		cauchy, err := sol.CauchyPoints()
		if err != nil {
			t.Fatal(err)
		}
		for e := range cauchy {
			for ip, p := range cauchy[e] {
				if got := sol.Points[e][ip].Stress[1]; math.Abs(got-tzz) > 1e-8*tzz {
					t.Fatalf("%v: law stress T_zz = %.10g, want %.10g", tc.c, got, tzz)
				}
				want := material.Vec4{0, tzz / j, tc.yy * tzz / j, 0}
				for k := range want {
					if math.Abs(p.Stress[k]-want[k]) > 1e-8*tzz {
						t.Fatalf("%v: Cauchy stress[%d] = %.10g, want %.10g", tc.c, k, p.Stress[k], want[k])
					}
				}
			}
		}
		ux, _ := sol.Displacement(sol.Model().Mesh().NearestNode(mesh.Point{X: 10, Z: 20}))
		if want := 10 * (math.Pow(lambda, -tc.nuX) - 1); math.Abs(ux-want) > 1e-8*10 {
			t.Errorf("%v: lateral displacement %.10g mm, want %.10g", tc.c, ux, want)
		}
		if want := tzz * tc.area / lambda; math.Abs(force-want) > 1e-8*want {
			t.Errorf("%v: end force %.10g N, want %.10g", tc.c, force, want)
		}
	}
}

// J2 plasticity in logarithmic strain space follows its hardening curve in
// uniaxial tension to 40 % stretch: the law's (Kirchhoff) stress equals the
// curve's stress at the plastic strain reached, and the Cauchy stress stays
// within 0.5 % of it (CHECKS.md: uniaxial bar, the input curve itself;
// the difference is the elastic volume change).
func TestFiniteStrainUniaxialJ2(t *testing.T) {
	el := material.Elastic{E: 210000, Nu: 0.3}
	// Hardening steeper than the stress throughout (dσ/dε̄p > σ), so that
	// the bar stays short of the Considère point and does not neck: past
	// it the homogeneous state is unstable and the tangent indefinite.
	h, err := material.NewHardening([]float64{0, 0.1, 0.6}, []float64{355, 470, 1000})
	if err != nil {
		t.Fatal(err)
	}
	law, err := material.NewJ2(el, h, material.DuctileDamage{})
	if err != nil {
		t.Fatal(err)
	}
	const lambda = 1.4
	for _, c := range []material.Condition{material.PlaneStress, material.Axisymmetric} {
		_, sol := uniaxialBar(t, c, law, lambda, 40)
		cauchy, err := sol.CauchyPoints()
		if err != nil {
			t.Fatal(err)
		}
		p := sol.Points[0][0]
		ep := law.EquivalentPlasticStrain(p.History)
		curve, _ := h.Yield(ep)
		if tzz := p.Stress[1]; math.Abs(tzz-curve) > 1e-6*curve {
			t.Errorf("%v: T_zz = %.8g MPa, curve at ε̄p = %.5f: %.8g MPa", c, tzz, ep, curve)
		}
		if want := math.Log(lambda) - curve/el.E; math.Abs(ep-want) > 1e-6 {
			t.Errorf("%v: ε̄p = %.8f, ln λ − σ/E = %.8f", c, ep, want)
		}
		if s := cauchy[0][0].Stress[1]; math.Abs(s-curve) > 0.005*curve {
			t.Errorf("%v: Cauchy σ_zz = %.6g MPa, curve %.6g MPa: off by more than 0.5 %%", c, s, curve)
		}
	}
}

// Under a homogeneous F = R·U (U a stretch along x and z) the Cauchy
// stress is R·(T/J)·Rᵀ with T = D·ln U the Hencky stress and J = det F
// including the out-of-plane stretch (the hoop stretch in axisymmetry, the
// thickness stretch of Hooke's law in plane stress). Definitions of the
// Cauchy stress and of the Hencky material (Miehe, Apel & Lambrecht 2002).
func TestFiniteStrainCauchyHomogeneous(t *testing.T) {
	law := material.Elastic{E: 1000, Nu: 0.3}
	const lx, lz, turn = 1.3, 0.8, 0.6
	for _, c := range []material.Condition{material.PlaneStress, material.PlaneStrain, material.Axisymmetric} {
		a := turn
		var field func(mesh.Point) (float64, float64)
		ly := 1.0
		switch c {
		case material.Axisymmetric: // no rotation; u_x ∝ x, so the hoop stretch is lx
			a, ly = 0, lx
			field = func(p mesh.Point) (float64, float64) { return (lx - 1) * p.X, (lz - 1) * p.Z }
		default:
			r := [2][2]float64{{math.Cos(a), -math.Sin(a)}, {math.Sin(a), math.Cos(a)}}
			f := [2][2]float64{{r[0][0] * lx, r[0][1] * lz}, {r[1][0] * lx, r[1][1] * lz}}
			field = imposed(f, 0)
		}
		m := oneElement(t, mesh.Quad8, c, law)
		d := law.Tangent(c)
		e := material.Vec4{math.Log(lx), math.Log(lz), math.Log(ly), 0}
		tau := d.MulVec(e)
		if c == material.PlaneStress {
			ly = math.Exp(-law.Nu / (1 - law.Nu) * (e[0] + e[1]))
		}
		j := lx * lz * ly
		cs, sn := math.Cos(a), math.Sin(a)
		want := material.Vec4{
			(cs*cs*tau[0] + sn*sn*tau[1]) / j,
			(sn*sn*tau[0] + cs*cs*tau[1]) / j,
			tau[2] / j,
			cs * sn * (tau[0] - tau[1]) / j,
		}
		u := elementDisplacements(m, field)
		pts := make([]PointResult, len(m.rule))
		sc := newScratch()
		if err := m.elementResponse(0, u, make([]float64, len(u)), nil, pts, sc); err != nil {
			t.Fatal(err)
		}
		for ip, p := range m.rule {
			g, err := m.pointGeometry(0, p, sc)
			if err != nil {
				t.Fatal(err)
			}
			yy, err := m.thicknessStrain(0, pts[ip])
			if err != nil {
				t.Fatal(err)
			}
			got := FiniteStrain{}.Cauchy(c, g, u, pts[ip].Stress, yy)
			for k := range want {
				if math.Abs(got[k]-want[k]) > 1e-10*law.E {
					t.Errorf("%v, point %d: σ[%d] = %.10g, want %.10g", c, ip, k, got[k], want[k])
				}
			}
		}
	}
}

// BenchmarkElementTangent times one Q8 element's force and tangent (3×3
// points, plane strain) in the two kinematics.
func BenchmarkElementTangent(b *testing.B) {
	law := material.Elastic{E: 210000, Nu: 0.3}
	for _, kin := range []Kinematics{SmallStrain{}, FiniteStrain{}} {
		b.Run(fmt.Sprintf("%T", kin), func(b *testing.B) {
			msh, err := mesh.Rect(2, 0, 12, 8, 1, 1, mesh.Region{Name: "block", Thickness: 3, Material: "steel"}, mesh.Quad8)
			if err != nil {
				b.Fatal(err)
			}
			m, err := NewModel(msh, map[string]material.Law{"steel": law}, Options{Condition: material.PlaneStrain, Kinematics: kin})
			if err != nil {
				b.Fatal(err)
			}
			u := elementDisplacements(m, imposed([2][2]float64{{1.1, 0.2}, {-0.1, 0.95}}, 0.01))
			fe, ke := make([]float64, len(u)), make([]float64, len(u)*len(u))
			sc := newScratch()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if err := m.elementResponse(0, u, fe, ke, nil, sc); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
