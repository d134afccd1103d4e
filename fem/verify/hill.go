package verify

import (
	"fmt"
	"math"
	"sort"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/mesh"
)

// Hill's thick-walled cylinder, elastic–perfectly plastic, von Mises, plane
// strain (R. Hill, The Mathematical Theory of Plasticity, Oxford 1950,
// ch. V, the expansion of a cylindrical tube). With k = σ_y/√3 the shear
// yield stress, the internal pressure that has spread the plastic zone to
// the radius c (a ≤ c ≤ b) is
//
//	p(c) = k·(1 − c²/b² + 2 ln(c/a)),
//
// and the tube is fully plastic, and collapses, at p(b) = 2k·ln(b/a). The
// closed form takes σ_z as the mean of σ_r and σ_θ, exact for an
// incompressible body; for ν = 0.3 the elastic σ_z = 2νA is off that mean,
// which moves the first-yield pressure by 0.2 % (q² = 3B²/r⁴ + (1 − 2ν)²A²
// at the bore against 3B²/r⁴), and plastic flow, which keeps volume, draws
// σ_z towards the mean as it grows.
const (
	hillInner = 100.0 // a, mm
	hillOuter = 200.0 // b, mm
	hillYield = 250.0 // σ_y, MPa
	// hillMid is the radius of the elastic–plastic boundary at which the
	// partly plastic state is compared, mm.
	hillMid = 150.0
)

const hillSource = "R. Hill, The Mathematical Theory of Plasticity (1950), thick tube"

// hillPressure is Hill's p(c) for the boundary radius c, MPa.
func hillPressure(c float64) float64 {
	k := hillYield / math.Sqrt(3)
	return k * (1 - c*c/(hillOuter*hillOuter) + 2*math.Log(c/hillInner))
}

// hillRadius inverts hillPressure on [a, b], where it rises (dp/dc =
// 2k(1/c − c/b²) > 0 inside the wall); a pressure above the collapse
// pressure gives b.
func hillRadius(p float64) float64 {
	lo, hi := hillInner, hillOuter
	if p >= hillPressure(hi) {
		return hi
	}
	for i := 0; i < 100; i++ {
		mid := (lo + hi) / 2
		if hillPressure(mid) < p {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// runHill checks the tube twice. The collapse pressure needs displacement
// control, to carry the analysis past the limit load (where a pressure has
// no equilibrium to converge to) and read it as a plateau, so that an
// element that locks in isochoric plastic flow shows as a pressure going on
// above it: hillCollapse, an axisymmetric strip with ε_z = 0. The partly
// plastic state is read under pressure control in the plane-strain quarter
// ring of CHECKS.md (hillPartlyPlastic), and in the strip at the pressure
// its ramp reaches.
func runHill(o Options) (*Outcome, error) {
	out := &Outcome{}
	if err := hillCollapse(out); err != nil {
		return nil, fmt.Errorf("Hill, axisymmetric tube: %w", err)
	}
	if err := hillPartlyPlastic(out); err != nil {
		return nil, fmt.Errorf("Hill, plane-strain quarter ring: %w", err)
	}
	return out, nil
}

// hillLaw is the elastic–perfectly plastic steel of the tube.
func hillLaw() (material.J2, error) {
	hard, err := material.PerfectlyPlastic(hillYield)
	if err != nil {
		return material.J2{}, err
	}
	return material.NewJ2(material.Elastic{E: 210000, Nu: 0.3}, hard, material.DuctileDamage{})
}

// hillCollapse: the tube as an axisymmetric strip a ≤ r ≤ b of one
// element's height, held in z at top and bottom: ε_z = 0 and u = u(r), the
// plane-strain state of a long tube, with the same three-dimensional radial
// return that plane strain uses (the hoop strain as the out-of-plane
// component). Q8 with 3×3 Gauss points. The bore nodes are tied in x to
// one node whose x is ramped; the pressure is that node's reaction over
// the bore area 2π·a·h. For locking the strip is the harder setting of the
// two: its volume constraint ε_r + u/r = 0 also holds the hoop strain.
//
// Why not the quarter ring with every bore node moved along its radius:
// fem.Solver predicts the next state only inside a Ramp of one dof, so with
// many prescribed dofs each increment enters its first iteration with the
// whole bore displacement in the layer of elements at the bore; that layer
// yields in the trial state and the Newton iterations stall under the
// solver's step halving (bore steps of 5 µm on 5 mm elements already fail).
// A Ramp of the tied dof has the predictor.
func hillCollapse(out *Outcome) error {
	const (
		radial = 40  // elements through the wall: 2.5 mm, 120 Gauss stations
		height = 5.0 // h, mm
	)
	law, err := hillLaw()
	if err != nil {
		return err
	}
	el := law.Elasticity()
	msh, err := mesh.Rect(hillInner, 0, hillOuter, height, radial, 1,
		mesh.Region{Name: "wall", Thickness: 1, Material: "steel"}, mesh.Quad8)
	if err != nil {
		return err
	}
	if err := msh.Check(); err != nil {
		return err
	}
	m, err := fem.NewModel(msh, map[string]material.Law{"steel": law}, fem.Options{Condition: material.Axisymmetric})
	if err != nil {
		return err
	}
	for _, set := range []string{"bottom", "top"} {
		if err := m.FixSet(set, fem.Z, 0); err != nil {
			return err
		}
	}
	bore := msh.NodeSets["left"]
	lead := m.NodeDof(bore[0], fem.X)
	if err := m.Fix(lead, 0); err != nil {
		return err
	}
	for _, n := range bore[1:] {
		if err := m.Tie(m.NodeDof(n, fem.X), lead); err != nil {
			return err
		}
	}
	s, err := fem.NewSolver(m, nil, fem.NewtonOptions{})
	if err != nil {
		return err
	}
	pressure := func() (float64, error) {
		r, err := s.Reaction(lead)
		return r / (2 * math.Pi * hillInner * height), err
	}

	// The bore displacement at which Hill's incompressible tube has its
	// boundary at c: u(a) = k·c²/(2G·a) (u = U/r everywhere, the elastic
	// strain at c just at yield). The first ramp ends there; the second
	// runs on to three times the displacement of full plasticity.
	k, g := hillYield/math.Sqrt(3), el.ShearModulus()
	uMid := k * hillMid * hillMid / (2 * g * hillInner)
	uFull := k * hillOuter * hillOuter / (2 * g * hillInner)
	var pMax, pEnd float64
	track := func(fem.Increment) (bool, error) {
		p, err := pressure()
		pMax, pEnd = math.Max(pMax, p), p
		return false, err
	}
	if err := s.Ramp(lead, uMid, fem.RampOptions{Increments: 15}, track); err != nil {
		return err
	}
	pMid := pEnd
	pts, err := s.Points()
	if err != nil {
		return err
	}
	cMid, err := plasticFront(pts, law, g)
	if err != nil {
		return err
	}
	if err := s.Ramp(lead, 3*uFull, fem.RampOptions{Increments: 30}, track); err != nil {
		return err
	}
	sol, err := s.Snapshot()
	if err != nil {
		return err
	}
	elastic := 0
	for _, pts := range sol.Points {
		for _, p := range pts {
			if law.EquivalentPlasticStrain(p.History) == 0 {
				elastic++
			}
		}
	}
	if elastic > 0 {
		return fmt.Errorf("%d integration points still elastic at three times the displacement of full plasticity", elastic)
	}

	pLimit := hillPressure(hillOuter)
	cRef := hillRadius(pMid)
	out.Snapshots = append(out.Snapshots, Snapshot{Name: fmt.Sprintf("Hill tube, ε_z = 0, Q8 %d×1, fully plastic", radial), Solution: sol})
	out.Rows = append(out.Rows,
		Row{Case: "hill", Quantity: fmt.Sprintf("axisymmetric, ε_z = 0: collapse pressure 2k·ln(b/a): plateau at bore displacement %.3g mm (3× full plasticity)", 3*uFull),
			Unit: "MPa", Computed: pEnd, Reference: pLimit, Error: relErr(pEnd, pLimit), Tolerance: 0.02, Source: hillSource},
		Row{Case: "hill", Quantity: "axisymmetric, ε_z = 0: largest pressure of the ramp over the collapse pressure, excess (locking in plastic flow)",
			Unit: "MPa", Computed: pMax, Reference: pLimit, Error: math.Max(0, pMax/pLimit-1), Tolerance: 0.02, Source: hillSource},
		Row{Case: "hill", Quantity: fmt.Sprintf("axisymmetric, ε_z = 0: elastic–plastic boundary c at p = %.4g MPa, from p = k(1 − c²/b² + 2 ln(c/a))", pMid),
			Unit: "mm", Computed: cMid, Reference: cRef, Error: relErr(cMid, cRef), Tolerance: 0.03, Source: hillSource},
	)
	return nil
}

// hillPartlyPlastic: the quarter ring in plane strain with symmetry
// supports on both cuts, Q8 with 3×3 Gauss points, 20 elements through the
// wall and 6 over 90°, the bore pressure raised in ten steps to Hill's p(c)
// for c = hillMid; the boundary found from the integration points must lie
// at c.
func hillPartlyPlastic(out *Outcome) error {
	law, err := hillLaw()
	if err != nil {
		return err
	}
	ring := mesh.Plan{
		Vertices: []mesh.Point{{X: hillInner}, {X: hillOuter}, {Z: hillOuter}, {Z: hillInner}},
		Curves: []mesh.Curve{
			{From: 1, To: 2, At: mesh.Arc(mesh.Point{}, mesh.Point{X: hillOuter}, mesh.Point{Z: hillOuter})},
			{From: 0, To: 3, At: mesh.Arc(mesh.Point{}, mesh.Point{X: hillInner}, mesh.Point{Z: hillInner})},
		},
		Blocks: []mesh.Block{{
			Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{20, 6}, Region: "wall",
			Sides: [4]string{"symmetry_z", "outer", "symmetry_x", "inner"},
		}},
		Regions: []mesh.Region{{Name: "wall", Thickness: 1, Material: "steel"}},
	}
	msh, err := buildMesh(ring, mesh.Quad8)
	if err != nil {
		return err
	}
	m, err := fem.NewModel(msh, map[string]material.Law{"steel": law}, fem.Options{Condition: material.PlaneStrain})
	if err != nil {
		return err
	}
	if err := fixSymmetry(m); err != nil {
		return err
	}
	s, err := fem.NewSolver(m, nil, fem.NewtonOptions{})
	if err != nil {
		return err
	}
	p := hillPressure(hillMid)
	if err := loadInSteps(s, func(f float64) error { return m.AddPressure("inner", f*p) }, 10); err != nil {
		return err
	}
	sol, err := s.Snapshot()
	if err != nil {
		return err
	}
	c, err := plasticFront(sol.Points, law, law.Elasticity().ShearModulus())
	if err != nil {
		return err
	}
	out.Snapshots = append(out.Snapshots, Snapshot{Name: "Hill plane-strain quarter ring Q8 20×6, partly plastic", Solution: sol})
	out.Rows = append(out.Rows, Row{Case: "hill",
		Quantity: fmt.Sprintf("plane strain: elastic–plastic boundary c at p = %.4g MPa, from p = k(1 − c²/b² + 2 ln(c/a))", p),
		Unit:     "mm", Computed: c, Reference: hillMid, Error: relErr(c, hillMid), Tolerance: 0.03, Source: hillSource})
	return nil
}

// plasticFront finds the radius where the plastic zone ends: between the
// outermost integration point with ε̄_p > 0 and the innermost elastic one
// outside it, interpolated linearly in r on an indicator that is c²/r² − 1
// on both sides in Hill's solution: 3G·ε̄_p/σ_y where the point has yielded
// (ε̄_p = σ_y/(3G)·(c²/r² − 1) for the incompressible tube) and
// q/σ_y − 1 where it is elastic (q ∝ 1/r² in the elastic ring).
func plasticFront(pts [][]fem.PointResult, law material.J2, g float64) (float64, error) {
	type station struct{ r, indicator float64 }
	var plastic, elastic []station
	for _, el := range pts {
		for _, p := range el {
			r := math.Hypot(p.X, p.Z)
			if ep := law.EquivalentPlasticStrain(p.History); ep > 0 {
				plastic = append(plastic, station{r, 3 * g * ep / hillYield})
			} else {
				elastic = append(elastic, station{r, p.VonMises()/hillYield - 1})
			}
		}
	}
	if len(plastic) == 0 || len(elastic) == 0 {
		return 0, fmt.Errorf("plastic front: %d plastic and %d elastic points: need both", len(plastic), len(elastic))
	}
	sort.Slice(plastic, func(i, j int) bool { return plastic[i].r < plastic[j].r })
	sort.Slice(elastic, func(i, j int) bool { return elastic[i].r < elastic[j].r })
	in, out := plastic[len(plastic)-1], elastic[0]
	if out.r < in.r {
		return 0, fmt.Errorf("plastic front: an elastic point at r = %.4g mm lies inside the plastic point at r = %.4g mm: the zone is not a ring", out.r, in.r)
	}
	return in.r + (out.r-in.r)*in.indicator/(in.indicator-out.indicator), nil
}
