package verify

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// elasticaTip is the closed-form tip of an inextensible cantilever under a
// dead tip load P perpendicular to its straight axis: the load parameter
// α = P·L²/(EI) that turns the tip through θ₀, and the tip displacements
// along the axis (shortening) and across it, as fractions of L.
//
// With θ(s) the slope, EI·θ″ + P·cos θ = 0, θ(0) = 0 at the clamp and
// θ′(L) = 0 at the tip; one integration gives EI·θ′²/2 = P(sin θ₀ − sin θ).
// The substitution 1 + sin θ = 2k²·sin²φ, k² = (1 + sin θ₀)/2, turns
// ds = dθ·√(EI/(2P))/√(sin θ₀ − sin θ) into √(EI/P)·dφ/√(1 − k² sin²φ),
// with φ from φ₁ = asin(1/(k√2)) at the clamp to π/2 at the tip. So
//
//	√α = K(k) − F(φ₁, k),
//	u/L = 1 − √(2 sin θ₀/α)              (from ∫cos θ ds),
//	v/L = 1 − 2(E(k) − E(φ₁, k))/√α      (from ∫sin θ ds),
//
// F, E the incomplete elliptic integrals of the first and second kind and
// K, E(k) the complete ones (K. E. Bisshopp and D. C. Drucker, "Large
// deflection of cantilever beams", Q. Appl. Math. 3 (1945) 272–275; the
// elastica as in S. P. Timoshenko and J. M. Gere, Theory of Elastic
// Stability, 2nd ed. 1961, §2.7). gonum's mathext takes the parameter
// m = k².
func elasticaTip(theta0 float64) (alpha, u, v float64) {
	m := (1 + math.Sin(theta0)) / 2
	phi1 := math.Asin(1 / math.Sqrt(2*m))
	root := mathext.CompleteK(m) - mathext.EllipticF(phi1, m)
	alpha = root * root
	u = 1 - math.Sqrt(2*math.Sin(theta0)/alpha)
	v = 1 - 2*(mathext.CompleteE(m)-mathext.EllipticE(phi1, m))/root
	return alpha, u, v
}

// runElastica: a slender plane-stress cantilever, L/h = 100 (shear and
// axial strain below 1e-4 of the bending terms), clamped at x = 0, with a
// dead load in −z spread uniformly over its end face, large enough to turn
// the tip through 60°. Large-deformation kinematics, the load in forty
// equal increments: Newton's method from the straight beam fails for a
// tenth of the load, whose linear step bends the beam 113 mm down without
// shortening it and so stretches it far off. Reference: the elastica
// (elasticaTip).
func runElastica(o Options) (*Outcome, error) {
	const (
		length   = 1000.0 // L, mm
		depth    = 10.0   // h, mm
		width    = 10.0   // out-of-plane thickness, mm
		tipAngle = 60.0   // θ₀, degrees
		steps    = 40     // load increments, 1.5° of tip rotation each
	)
	steel := material.Elastic{E: 210000, Nu: 0.3}
	ei := steel.E * width * depth * depth * depth / 12
	alpha, wantU, wantV := elasticaTip(tipAngle * math.Pi / 180)
	force := alpha * ei / (length * length) // P, N
	msh, err := mesh.Rect(0, -depth/2, length, depth/2, 100, 2,
		mesh.Region{Name: "beam", Thickness: width, Material: "steel"}, mesh.Quad8)
	if err != nil {
		return nil, fmt.Errorf("elastica: %w", err)
	}
	m, err := fem.NewModel(msh, map[string]material.Law{"steel": steel},
		fem.Options{Condition: material.PlaneStress, Kinematics: fem.FiniteStrain{}})
	if err != nil {
		return nil, fmt.Errorf("elastica: %w", err)
	}
	for _, d := range []fem.Direction{fem.X, fem.Z} { // fully clamped root
		if err := m.FixSet("left", d, 0); err != nil {
			return nil, fmt.Errorf("elastica: %w", err)
		}
	}
	s, err := fem.NewSolver(m, nil, fem.NewtonOptions{})
	if err != nil {
		return nil, fmt.Errorf("elastica: %w", err)
	}
	// A traction on the reference end face is a dead load: fixed direction,
	// total P whatever the deformation.
	if err := loadInSteps(s, func(f float64) error {
		return m.AddTraction("right", 0, -f*force/(depth*width))
	}, steps); err != nil {
		return nil, fmt.Errorf("elastica: %w", err)
	}
	sol, err := s.Snapshot()
	if err != nil {
		return nil, fmt.Errorf("elastica: %w", err)
	}
	if sol.Points, err = sol.CauchyPoints(); err != nil {
		return nil, fmt.Errorf("elastica: %w", err)
	}
	ux, uz := sol.Displacement(msh.NearestNode(mesh.Point{X: length, Z: 0}))
	tx, tz := sol.Displacement(msh.NearestNode(mesh.Point{X: length, Z: depth / 2}))
	bx, bz := sol.Displacement(msh.NearestNode(mesh.Point{X: length, Z: -depth / 2}))
	// The end face stays normal to the axis (no shear): its turn is the
	// tip slope.
	rot := math.Atan2(tx-bx, depth+tz-bz) * 180 / math.Pi
	const src = "elastica, Bisshopp & Drucker (1945), elliptic integrals"
	out := &Outcome{}
	out.Snapshots = append(out.Snapshots, Snapshot{Name: "elastica Q8 100×2", Solution: sol})
	out.Rows = append(out.Rows,
		Row{Case: "elastica", Quantity: fmt.Sprintf("tip shortening along the axis, PL²/EI = %.4f", alpha), Unit: "mm",
			Computed: -ux, Reference: wantU * length, Error: relErr(-ux, wantU*length), Tolerance: 0.01, Source: src},
		Row{Case: "elastica", Quantity: "tip deflection across the axis", Unit: "mm",
			Computed: -uz, Reference: wantV * length, Error: relErr(-uz, wantV*length), Tolerance: 0.01, Source: src},
		Row{Case: "elastica", Quantity: "tip rotation", Unit: "deg",
			Computed: rot, Reference: tipAngle, Error: relErr(rot, tipAngle), Tolerance: 0.01, Source: src},
	)
	return out, nil
}

// loadInSteps applies a dead load in increments: add(f) adds the fraction
// f of the full load to the model (negative f takes it back). An increment
// that does not converge is taken back and halved, at most six times in a
// row; every converged increment is committed.
func loadInSteps(s *fem.Solver, add func(f float64) error, steps int) error {
	at, step, cuts := 0.0, 1/float64(steps), 0
	for at < 1-1e-12 {
		df := math.Min(step, 1-at)
		if err := add(df); err != nil {
			return err
		}
		if _, err := s.Equilibrium(); err != nil {
			s.Revert()
			if err := add(-df); err != nil {
				return err
			}
			if !fem.IsNotConverged(err) || cuts == 6 {
				return fmt.Errorf("load stopped at %.4g of the full load: %w", at, err)
			}
			step, cuts = step/2, cuts+1
			continue
		}
		s.Commit()
		at, cuts = at+df, 0
	}
	return nil
}
