package fem

import (
	"errors"
	"math"
	"strings"
	"testing"

	"flangeseg/material"
	"flangeseg/mesh"
)

// stackedBar is a plane-stress bar of three blocks along z: bottom, slice,
// top, 10 mm wide, 1 mm thick; the slice is 10 mm long, the bar 100 mm.
func stackedBar(t *testing.T) *mesh.Mesh {
	t.Helper()
	v := []mesh.Point{{X: 0, Z: 0}, {X: 10, Z: 0}, {X: 10, Z: 45}, {X: 0, Z: 45}, {X: 10, Z: 55}, {X: 0, Z: 55}, {X: 10, Z: 100}, {X: 0, Z: 100}}
	blk := func(c [4]int, n int, region string, sides [4]string) mesh.Block {
		return mesh.Block{Corners: c, Divisions: [2]int{2, n}, Region: region, Sides: sides}
	}
	plan := mesh.Plan{
		Vertices: v,
		Blocks: []mesh.Block{
			blk([4]int{0, 1, 2, 3}, 6, "bar", [4]string{"bottom", "", "", ""}),
			blk([4]int{3, 2, 4, 5}, 2, "slice", [4]string{"", "", "", ""}),
			blk([4]int{5, 4, 6, 7}, 6, "bar", [4]string{"", "", "top", ""}),
		},
		Regions: []mesh.Region{{Name: "bar", Thickness: 1, Material: "steel"}, {Name: "slice", Thickness: 1, Material: "steel"}},
		Sets:    []mesh.VertexSet{{Name: "cut", Vertex: 5}},
	}
	m, err := mesh.Build(plan, mesh.Quad8)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// barModel holds the bar's bottom in z (and one node in x) and ties its
// top to a rigid edge held at zero.
func barModel(t *testing.T, msh *mesh.Mesh) (*Model, RigidEdge) {
	t.Helper()
	m, err := NewModel(msh, steel, Options{Condition: material.PlaneStress})
	if err != nil {
		t.Fatal(err)
	}
	if err := m.FixSet("bottom", Z, 0); err != nil {
		t.Fatal(err)
	}
	if err := m.Fix(m.NodeDof(msh.NearestNode(mesh.Point{}), X), 0); err != nil {
		t.Fatal(err)
	}
	edge, err := m.AddRigidEdge("top", mesh.Point{X: 5, Z: 100}, RigidEdgeOptions{FixRotation: true, LateralFree: true})
	if err != nil {
		t.Fatal(err)
	}
	if err := m.Fix(edge.Axial, 0); err != nil {
		t.Fatal(err)
	}
	return m, edge
}

// sliceTopForce measures the axial force of the stacked bar in the
// section at the slice's top (z = 55), from the elements above it.
func sliceTopForce(s *Solver, msh *mesh.Mesh) func() (float64, error) {
	var above, cut []int
	for e, el := range msh.Elements {
		z := 0.0
		for _, n := range el.Nodes {
			z += msh.Nodes[n].Z / float64(len(el.Nodes))
		}
		if z > 55 {
			above = append(above, e)
		}
	}
	for n, p := range msh.Nodes {
		if math.Abs(p.Z-55) < 1e-9 {
			cut = append(cut, n)
		}
	}
	return func() (float64, error) {
		f, _, _, err := s.SectionForce(above, cut, 5)
		return f, err
	}
}

// A bar held at both ends with a shortened slice carries the uniaxial force
// σ·A with σ = E·ε·l_slice/L (springs in series, statics); Preload finds the
// eigenstrain for a target force within the tolerance asked.
func TestPreloadBar(t *testing.T) {
	msh := stackedBar(t)
	m, edge := barModel(t, msh)
	s, err := NewSolver(m, nil, NewtonOptions{})
	if err != nil {
		t.Fatal(err)
	}
	force := sliceTopForce(s, msh)
	const target = 12000.0 // N
	res, err := s.Preload("slice", target, force, PreloadOptions{Tolerance: 0.005})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(res.Force-target) > 0.005*target {
		t.Errorf("preload %g N, want %g ± 0.5 %%", res.Force, target)
	}
	want := -target / (10 * 1) / 210000 * 100 / 10 // ε = σ L / (E l_slice)
	if math.Abs(res.Eigenstrain-want) > 1e-6*math.Abs(want) {
		t.Errorf("eigenstrain %g, want %g (series springs)", res.Eigenstrain, want)
	}
	pull, err := s.Reaction(edge.Axial)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(pull-res.Force) > 1e-6*target { // the edge pulls the shortened bar up
		t.Errorf("edge reaction %g N, section force %g N", pull, res.Force)
	}
}

// A second Preload of the same bar to a target 3 % higher, given the first
// one's secant slope, takes one solve: the bar is linear, so the root
// along the slope is exact (without it, the first step is a quarter of
// the estimate, far past). The slope is the series springs' stiffness
// over the strain, dF/dε = −E·A·l_slice/L (statics).
func TestPreloadCorrectionAlongSlope(t *testing.T) {
	msh := stackedBar(t)
	m, _ := barModel(t, msh)
	s, err := NewSolver(m, nil, NewtonOptions{})
	if err != nil {
		t.Fatal(err)
	}
	force := sliceTopForce(s, msh)
	first, err := s.Preload("slice", 12000, force, PreloadOptions{Tolerance: 0.005})
	if err != nil {
		t.Fatal(err)
	}
	want := -210000.0 * 10 * 1 * 10 / 100
	if math.Abs(first.Slope-want) > 1e-6*math.Abs(want) {
		t.Fatalf("slope %g N per unit strain, want %g", first.Slope, want)
	}
	second, err := s.Preload("slice", 12360, force, PreloadOptions{Tolerance: 0.001, Estimate: first.Eigenstrain, Slope: first.Slope})
	if err != nil {
		t.Fatal(err)
	}
	if second.Iterations != 1 {
		t.Errorf("the correction took %d solves, want 1", second.Iterations)
	}
	if math.Abs(second.Force-12360) > 0.001*12360 {
		t.Errorf("preload %g N, want 12360 ± 0.1 %%", second.Force)
	}
}

// Ramping a rigid-edge pull through the Newton solver gives the same
// response as the linear solve (a linear model converges in one step).
func TestRampMatchesLinear(t *testing.T) {
	msh := stackedBar(t)
	m, edge := barModel(t, msh)
	s, err := NewSolver(m, nil, NewtonOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var last Increment
	err = s.Ramp(edge.Axial, 0.1, RampOptions{Increments: 4}, func(inc Increment) (bool, error) {
		last = inc
		if inc.Iterations > 1 {
			t.Errorf("increment %d: %d iterations for a linear model", inc.Index, inc.Iterations)
		}
		return false, nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if last.Index != 4 || math.Abs(last.Value-0.1) > 1e-15 {
		t.Errorf("last increment %+v", last)
	}
	pull, _ := s.Reaction(edge.Axial)
	lm, ledge := barModel(t, msh)
	if err := lm.SetValue(ledge.Axial, 0.1); err != nil {
		t.Fatal(err)
	}
	sol, err := lm.SolveLinear(LinearOptions{})
	if err != nil {
		t.Fatal(err)
	}
	want := sol.DofReaction(ledge.Axial)
	if math.Abs(pull-want) > 1e-9*math.Abs(want) {
		t.Errorf("ramp pull %g N, linear %g N", pull, want)
	}
	// Bar force: E·A·u/L.
	if exact := 210000 * 10 * 0.1 / 100; math.Abs(want-exact) > 1e-6*exact {
		t.Errorf("pull %g N, E·A·u/L = %g N", want, exact)
	}
}

// The first increment of a ramp starts from the tangent's response to the
// prescribed change: on a linear model, through the rigid edge's ties,
// that is the solution, so no Newton step is left to take. The first
// increment of a ramp that follows another extrapolates the last
// increment scaled by the change of the prescribed value, not by the
// fractions of the two ramps' spans (a release of the shell end is a row
// of short ramps): on a linear model that too is the solution.
func TestRampFirstIncrementPredicted(t *testing.T) {
	for _, before := range []int{0, 10} {
		m, edge := barModel(t, stackedBar(t))
		s, err := NewSolver(m, nil, NewtonOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if before > 0 {
			none := func(Increment) (bool, error) { return false, nil }
			if err := s.Ramp(edge.Axial, 0.1, RampOptions{Increments: before}, none); err != nil {
				t.Fatal(err)
			}
		}
		err = s.Ramp(edge.Axial, 0.13, RampOptions{Increments: 1}, func(inc Increment) (bool, error) {
			if inc.Iterations != 0 {
				t.Errorf("after a ramp of %d increments: %d Newton steps after the prediction, want 0", before, inc.Iterations)
			}
			return false, nil
		})
		if err != nil {
			t.Fatal(err)
		}
	}
}

// TestRampBudget: an increment that needs more Newton iterations than its
// budget is halved rather than iterated on; once halved BudgetCuts times
// it gets the solver's full limit, so the ramp still reaches its end. A
// Hencky bar stretched by half its length in one step needs more than two
// iterations, and elasticity makes the end force independent of the path.
func TestRampBudget(t *testing.T) {
	run := func(opt RampOptions) (float64, []Increment) {
		m, edge := stretchedBlock(t, material.PlaneStress, material.Elastic{E: 1000, Nu: 0.3})
		s, err := NewSolver(m, nil, NewtonOptions{Tolerance: 1e-11})
		if err != nil {
			t.Fatal(err)
		}
		var incs []Increment
		err = s.Ramp(edge.Axial, 10, opt, func(inc Increment) (bool, error) {
			incs = append(incs, inc)
			return false, nil
		})
		if err != nil {
			t.Fatal(err)
		}
		f, err := s.Reaction(edge.Axial)
		if err != nil {
			t.Fatal(err)
		}
		return f, incs
	}
	free, whole := run(RampOptions{Increments: 1})
	if len(whole) != 1 || whole[0].Iterations <= 2 {
		t.Fatalf("without a budget: %+v; the case needs one increment of more than 2 iterations", whole)
	}
	const budget, budgetCuts = 2, 2
	held, incs := run(RampOptions{Increments: 1, Budget: budget, BudgetCuts: budgetCuts})
	if len(incs) < 2 {
		t.Errorf("with a budget of %d iterations the step was not halved: %+v", budget, incs)
	}
	// The budget holds for steps above the nominal one halved budgetCuts
	// times (here a quarter of the ramp), reached in fewer halvings.
	quarter := math.Ldexp(1, -budgetCuts)
	from := 0.0
	for _, inc := range incs {
		if size := inc.Fraction - from; inc.Cuts < budgetCuts && size > quarter*(1+1e-9) && inc.Iterations > budget {
			t.Errorf("increment %d (%.3g of the ramp): %d iterations after %d halvings, budget %d", inc.Index, size, inc.Iterations, inc.Cuts, budget)
		}
		from = inc.Fraction
	}
	if math.Abs(held-free) > 1e-6*math.Abs(free) {
		t.Errorf("end force %.9g with the budget, %.9g without: an elastic bar's force does not depend on the path", held, free)
	}
	// Every increment of this bar needs more than one iteration: with a
	// budget of one, the steps come down to a quarter, and there they get
	// the full limit, however often they succeed, instead of being halved
	// again after each success down to nothing.
	tight, steps := run(RampOptions{Increments: 1, Budget: 1, BudgetCuts: budgetCuts})
	if math.Abs(tight-free) > 1e-6*math.Abs(free) {
		t.Errorf("end force %.9g with a budget of one iteration, %.9g without", tight, free)
	}
	from = 0
	for _, inc := range steps {
		if size := inc.Fraction - from; size < quarter*(1-1e-9) {
			t.Errorf("budget of one: increment %d is %.3g of the ramp, below a quarter: a step that small is not halved for the budget", inc.Index, size)
		}
		from = inc.Fraction
	}
	// Each of those increments took more than half the budget, so the
	// step is not grown after it, and none after the first is halved.
	for _, inc := range steps[1:] {
		if inc.Cuts > 0 {
			t.Errorf("budget of one: increment %d was halved %d times: the step grew after an increment that took more than half the budget", inc.Index, inc.Cuts)
		}
	}
}

// A tangent that is not positive definite in a model with a
// path-dependent law is a failed solve, not a setup error: the ramp halves
// its step, then stops with a RampError around a NotConvergedError that
// says the tangent lost positive definiteness, names the failing pivot's
// place with its region, and carries the residual of the solve's own
// iterations (not the run's iteration count).
func TestIndefiniteTangentIsNotConverged(t *testing.T) {
	msh := stackedBar(t)
	laws := map[string]material.Law{"steel": recorder{material.Elastic{E: 210000, Nu: 0.3}}}
	m, err := NewModel(msh, laws, Options{Condition: material.PlaneStress})
	if err != nil {
		t.Fatal(err)
	}
	// Held in z only: nothing holds the bar in x.
	if err := m.FixSet("bottom", Z, 0); err != nil {
		t.Fatal(err)
	}
	edge, err := m.AddRigidEdge("top", mesh.Point{X: 5, Z: 100}, RigidEdgeOptions{FixRotation: true, LateralFree: true})
	if err != nil {
		t.Fatal(err)
	}
	if err := m.Fix(edge.Axial, 0); err != nil {
		t.Fatal(err)
	}
	s, err := NewSolver(m, nil, NewtonOptions{})
	if err != nil {
		t.Fatal(err)
	}
	err = s.Ramp(edge.Axial, 0.1, RampOptions{Increments: 2, MaxCuts: 2}, func(Increment) (bool, error) { return false, nil })
	var re *RampError
	if !errors.As(err, &re) {
		t.Fatalf("got %v, want a RampError", err)
	}
	if re.Cuts != 2 || re.Reached != 0 || math.Abs(re.Step-0.1/8) > 1e-15 {
		t.Errorf("ramp error %+v: want 2 halvings from 0 with a last step of 0.0125 mm", re)
	}
	var nc *NotConvergedError
	if !errors.As(err, &nc) {
		t.Fatalf("got %v, want a NotConvergedError inside", err)
	}
	if !nc.Indefinite || !strings.Contains(nc.Reason, "not positive definite") {
		t.Errorf("reason %q (indefinite %v): want the tangent named", nc.Reason, nc.Indefinite)
	}
	if !strings.Contains(nc.Pivot, "node ") || !strings.HasSuffix(nc.Pivot, " in bar") && !strings.HasSuffix(nc.Pivot, " in slice") {
		t.Errorf("pivot %q: want a node with its region", nc.Pivot)
	}
	if nc.Iterations != 0 || !(nc.First > 0) || nc.Best != nc.First {
		t.Errorf("iterations %d, first %g, best %g: want the solve's own first residual and no step taken", nc.Iterations, nc.First, nc.Best)
	}
}
