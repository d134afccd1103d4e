package verify

import (
	"fmt"
	"math"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// stretch is the homogeneous deformation the rotation case starts from:
// stretches of a few per cent with shear, so that no principal axis lies
// along x or z.
var stretch = [2][2]float64{{1.04, 0.02}, {-0.01, 0.97}}

// tensor2 is a 2×2 matrix.
type tensor2 = [2][2]float64

func mul2(a, b tensor2) (c tensor2) {
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			c[i][j] = a[i][0]*b[0][j] + a[i][1]*b[1][j]
		}
	}
	return c
}

func rotation2(rad float64) tensor2 {
	c, s := math.Cos(rad), math.Sin(rad)
	return tensor2{{c, -s}, {s, c}}
}

// runRotation: the distorted patch of the patch test (Q8), every boundary
// node moved as x − c = F·(X − c) about the centre c. First F goes from I
// to a stretch with shear F₀ (eight increments), then a rigid rotation R is
// superposed, F = R·F₀, in thirty increments of 3° to 90°; the interior
// nodes follow by equilibrium. Plane strain and plane stress. The
// Cauchy stress must turn with the body, σ = R·σ₀·Rᵀ, and its invariants
// (trace, von Mises) must not change (objectivity; any nonlinear FE text,
// e.g. T. Belytschko, W. K. Liu and B. Moran, Nonlinear Finite Elements for
// Continua and Structures, 2000, §3.7 and §5.4). A formulation that is not
// objective fails by orders of magnitude: small strain reads the 90° turn
// as strains of −1.
func runRotation(o Options) (*Outcome, error) {
	out := &Outcome{}
	for _, c := range []material.Condition{material.PlaneStrain, material.PlaneStress} {
		if err := rotateStressedPatch(c, out); err != nil {
			return nil, fmt.Errorf("rotation, %v: %w", c, err)
		}
	}
	return out, nil
}

func rotateStressedPatch(c material.Condition, out *Outcome) error {
	msh, err := buildMesh(patchPlan(0), mesh.Quad8)
	if err != nil {
		return err
	}
	// Stresses of several GPa: beyond any steel, but the check is of the
	// kinematics, and the elastic law only scales them.
	steel := material.Elastic{E: 210000, Nu: 0.3}
	m, err := fem.NewModel(msh, map[string]material.Law{"steel": steel},
		fem.Options{Condition: c, Kinematics: fem.FiniteStrain{}})
	if err != nil {
		return err
	}
	var boundary []int
	for n, p := range msh.Nodes {
		if p.X < 1e-9 || p.X > 10-1e-9 || p.Z < 1e-9 || p.Z > 10-1e-9 {
			boundary = append(boundary, n)
			for _, d := range []fem.Direction{fem.X, fem.Z} {
				if err := m.Fix(m.NodeDof(n, d), 0); err != nil {
					return err
				}
			}
		}
	}
	// A tight tolerance: the check is at 1e-8 of the stress.
	s, err := fem.NewSolver(m, nil, fem.NewtonOptions{Tolerance: 1e-12})
	if err != nil {
		return err
	}
	moveTo := func(f tensor2) error {
		for _, n := range boundary {
			x, z := msh.Nodes[n].X-5, msh.Nodes[n].Z-5 // about the centre
			ux := f[0][0]*x + f[0][1]*z - x
			uz := f[1][0]*x + f[1][1]*z - z
			if err := m.SetValue(m.NodeDof(n, fem.X), ux); err != nil {
				return err
			}
			if err := m.SetValue(m.NodeDof(n, fem.Z), uz); err != nil {
				return err
			}
		}
		if _, err := s.Equilibrium(); err != nil {
			return err
		}
		s.Commit()
		return nil
	}
	stresses := func() ([]material.Vec4, error) {
		sol, err := s.Snapshot()
		if err != nil {
			return nil, err
		}
		pts, err := sol.CauchyPoints()
		if err != nil {
			return nil, err
		}
		var all []material.Vec4
		for _, el := range pts {
			for _, p := range el {
				all = append(all, p.Stress)
			}
		}
		return all, nil
	}
	// Increments small enough for Newton's method from a state in which
	// only the boundary has moved: 0.5 % strain, 3° of rotation.
	const stretchSteps, turnSteps = 8, 30
	for i := 1; i <= stretchSteps; i++ {
		t := float64(i) / stretchSteps
		var f tensor2
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				f[i][j] = t * stretch[i][j]
				if i == j {
					f[i][j] += 1 - t
				}
			}
		}
		if err := moveTo(f); err != nil {
			return fmt.Errorf("stretching: %w", err)
		}
	}
	before, err := stresses()
	if err != nil {
		return err
	}
	var worstTrace, worstMises, worstTensor float64
	var after []material.Vec4
	for k := 1; k <= turnSteps; k++ {
		r := rotation2(float64(k) * math.Pi / 2 / turnSteps)
		if err := moveTo(mul2(r, stretch)); err != nil {
			return fmt.Errorf("rotating, step %d: %w", k, err)
		}
		if after, err = stresses(); err != nil {
			return err
		}
		for i, s0 := range before {
			s1 := after[i]
			worstTrace = math.Max(worstTrace, relErr(trace(s1), trace(s0)))
			worstMises = math.Max(worstMises, relErr(material.VonMises(s1), material.VonMises(s0)))
			worstTensor = math.Max(worstTensor, tensorError(s1, rotated(r, s0)))
		}
	}
	const src = "objectivity requirement (any nonlinear FE text)"
	name := "rotation " + c.String()
	out.Rows = append(out.Rows,
		Row{Case: "rotation", Quantity: c.String() + ": trace of the Cauchy stress, largest relative change at any point and step to 90°",
			Unit: "MPa", Computed: trace(after[0]), Reference: trace(before[0]), Error: worstTrace, Tolerance: 1e-8, Source: src},
		Row{Case: "rotation", Quantity: c.String() + ": von Mises stress, largest relative change at any point and step to 90°",
			Unit: "MPa", Computed: material.VonMises(after[0]), Reference: material.VonMises(before[0]), Error: worstMises, Tolerance: 1e-8, Source: src},
		Row{Case: "rotation", Quantity: c.String() + ": Cauchy stress against R·σ₀·Rᵀ, largest component error / |σ₀|",
			Unit: "MPa", Computed: after[0][0], Reference: rotated(rotation2(math.Pi/2), before[0])[0], Error: worstTensor, Tolerance: 1e-8, Source: src},
	)
	sol, err := s.Snapshot()
	if err != nil {
		return err
	}
	if sol.Points, err = sol.CauchyPoints(); err != nil {
		return err
	}
	out.Snapshots = append(out.Snapshots, Snapshot{Name: name, Solution: sol})
	return nil
}

func trace(s material.Vec4) float64 { return s[0] + s[1] + s[2] }

// rotated is R·σ·Rᵀ for a rotation in the x–z plane (yy unchanged).
func rotated(r tensor2, s material.Vec4) material.Vec4 {
	in := tensor2{{s[0], s[3]}, {s[3], s[1]}}
	rt := tensor2{{r[0][0], r[1][0]}, {r[0][1], r[1][1]}}
	o := mul2(mul2(r, in), rt)
	return material.Vec4{o[0][0], o[1][1], s[2], o[0][1]}
}

// tensorError is the largest component difference over the Frobenius norm
// of the reference.
func tensorError(s, ref material.Vec4) float64 {
	norm := math.Sqrt(ref[0]*ref[0] + ref[1]*ref[1] + ref[2]*ref[2] + 2*ref[3]*ref[3])
	worst := 0.0
	for k := range s {
		worst = math.Max(worst, math.Abs(s[k]-ref[k]))
	}
	return worst / norm
}
