package verify

import (
	"fmt"
	"math"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// uniaxialSetting is one kinematic setting of the uniaxial bar.
type uniaxialSetting struct {
	label     string
	condition material.Condition
	finite    bool
	// axial is the stress component along the bar (0 xx, 1 zz).
	axial int
	// strain is the total strain the ramp ends at: engineering u/L under
	// small strain, logarithmic ln(1 + u/L) under finite strain.
	strain     float64
	increments int
}

// runUniaxial: a bar pulled along its axis reproduces its hardening curve
// (the curve itself is the reference; CHECKS.md). Three kinematic
// settings: a plane-stress strip (small strain), an axisymmetric solid bar
// with its radius free (small strain), and the plane-stress strip under
// finite strain to 20 % logarithmic strain. The curve is the built-in S355
// curve for 16 < t ≤ 40 mm (material.SteelStrength, engineering curve
// converted to true, Ling's extension past necking at ε ≈ 0.14).
//
// The reference at a total strain ε solves ε = σ/E + ε̄_p with σ = σ_y(ε̄_p),
// the additive split of the small-strain law; under finite strain the same
// relation holds in logarithmic strain for the Kirchhoff stress τ = J·σ
// (material/doc.go), and the row compares the Cauchy stress σ, so it
// carries J − 1 ≈ (1 − 2ν)·σ/E ≈ 0.1 % of elastic volume change: the input
// curve read as a Cauchy curve. The error is the largest deviation of any
// stress component from the uniaxial state (σ_ref along the bar, zero
// across it) over σ_ref, at every integration point and every increment.
//
// The loaded end's nodes are tied to one node whose displacement is
// ramped, so every increment starts from the solver's predictor (see
// hillCollapse); the strip is held at x = 0 and on its lower edge, the
// bar on its axis and its lower end.
func runUniaxial(o Options) (*Outcome, error) {
	st, err := material.SteelStrength("S355", 20)
	if err != nil {
		return nil, fmt.Errorf("uniaxial: %w", err)
	}
	el := material.Elastic{E: 210000, Nu: 0.3}
	hard, err := st.Hardening(el.E, material.DefaultNecking())
	if err != nil {
		return nil, fmt.Errorf("uniaxial: %w", err)
	}
	law, err := material.NewJ2(el, hard, material.DuctileDamage{})
	if err != nil {
		return nil, fmt.Errorf("uniaxial: %w", err)
	}
	settings := []uniaxialSetting{
		{label: "plane stress strip", condition: material.PlaneStress, axial: 0, strain: 0.15, increments: 30},
		{label: "axisymmetric bar", condition: material.Axisymmetric, axial: 1, strain: 0.15, increments: 30},
		{label: "plane stress strip, finite strain", condition: material.PlaneStress, finite: true, axial: 0, strain: 0.20, increments: 40},
	}
	out := &Outcome{}
	for _, set := range settings {
		if err := pullBar(law, set, out); err != nil {
			return nil, fmt.Errorf("uniaxial, %s: %w", set.label, err)
		}
	}
	return out, nil
}

// curveStress is the uniaxial stress of the law's curve at the total
// strain eps: eps = σ/E + ε̄_p, σ = σ_y(ε̄_p), solved by bisection on ε̄_p
// (the left side rises with ε̄_p since the curve does not fall).
func curveStress(law material.J2, eps float64) float64 {
	e := law.Elasticity().E
	h := law.HardeningCurve()
	if e*eps <= h.InitialYield() {
		return e * eps
	}
	lo, hi := 0.0, eps
	for i := 0; i < 200 && hi-lo > 1e-15; i++ {
		mid := (lo + hi) / 2
		if sy, _ := h.Yield(mid); sy/e+mid < eps {
			lo = mid
		} else {
			hi = mid
		}
	}
	sy, _ := h.Yield((lo + hi) / 2)
	return sy
}

func pullBar(law material.J2, set uniaxialSetting, out *Outcome) error {
	const (
		length = 100.0 // L, mm
		width  = 10.0  // strip width or bar radius, mm
	)
	var msh *mesh.Mesh
	var err error
	region := mesh.Region{Name: "bar", Thickness: width, Material: "steel"}
	// The strip lies along x, the bar along z (its axis at x = 0).
	loaded, fixed, held := "right", "left", "bottom"
	dir, across := fem.X, fem.Z
	if set.condition == material.Axisymmetric {
		msh, err = mesh.Rect(0, 0, width, length, 1, 4, region, mesh.Quad8)
		loaded, fixed, held = "top", "bottom", "left"
		dir, across = fem.Z, fem.X
	} else {
		msh, err = mesh.Rect(0, 0, length, width, 4, 1, region, mesh.Quad8)
	}
	if err != nil {
		return err
	}
	if err := msh.Check(); err != nil {
		return err
	}
	opt := fem.Options{Condition: set.condition}
	if set.finite {
		opt.Kinematics = fem.FiniteStrain{}
	}
	m, err := fem.NewModel(msh, map[string]material.Law{"steel": law}, opt)
	if err != nil {
		return err
	}
	if err := m.FixSet(fixed, dir, 0); err != nil {
		return err
	}
	if err := m.FixSet(held, across, 0); err != nil {
		return err
	}
	end := msh.NodeSets[loaded]
	lead := m.NodeDof(end[0], dir)
	if err := m.Fix(lead, 0); err != nil {
		return err
	}
	for _, n := range end[1:] {
		if err := m.Tie(m.NodeDof(n, dir), lead); err != nil {
			return err
		}
	}
	s, err := fem.NewSolver(m, nil, fem.NewtonOptions{})
	if err != nil {
		return err
	}
	target := set.strain * length
	if set.finite {
		target = (math.Exp(set.strain) - 1) * length
	}
	var worst, atStress, atRef float64
	var sol *fem.Solution
	check := func(inc fem.Increment) (bool, error) {
		if sol, err = s.Snapshot(); err != nil {
			return false, err
		}
		eps := inc.Value / length
		if set.finite {
			if sol.Points, err = sol.CauchyPoints(); err != nil {
				return false, err
			}
			eps = math.Log1p(eps)
		}
		ref := curveStress(law, eps)
		for _, pts := range sol.Points {
			for _, p := range pts {
				for k, v := range p.Stress {
					want := 0.0
					if k == set.axial {
						want = ref
					}
					if e := math.Abs(v-want) / ref; e >= worst {
						worst, atStress, atRef = e, p.Stress[set.axial], ref
					}
				}
			}
		}
		return false, nil
	}
	if err := s.Ramp(lead, target, fem.RampOptions{Increments: set.increments}, check); err != nil {
		return err
	}
	measure := "engineering strain"
	if set.finite {
		measure = "logarithmic strain, Cauchy stress"
	}
	out.Snapshots = append(out.Snapshots, Snapshot{Name: "uniaxial " + set.label, Solution: sol})
	out.Rows = append(out.Rows, Row{Case: "uniaxial",
		Quantity: fmt.Sprintf("%s to %.0f %% %s: stress at the worst point and increment, largest deviation from the curve / σ_ref", set.label, 100*set.strain, measure),
		Unit:     "MPa", Computed: atStress, Reference: atRef, Error: worst, Tolerance: 0.005,
		Source: "the input curve (S355, material.SteelStrength)"})
	return nil
}
