package fem

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"flangeseg/contact"
	"flangeseg/material"
	"flangeseg/mesh"
)

// frictionBlocks is two elastic blocks of different stiffness (the
// blocks of the verify contact patch, which this package cannot import)
// pressed together through non-matching meshes with friction: the soft
// upper block spreads more under the push, so the interface slides near
// its free end and sticks near the symmetry line, and the tangent carries
// sliding couplings.
func frictionBlocks(t *testing.T) (*Model, []ContactPair, RigidEdge) {
	t.Helper()
	const width, height = 10.0, 5.0
	plan := mesh.Plan{
		Vertices: []mesh.Point{{X: 0, Z: -height}, {X: width, Z: -height}, {X: width, Z: 0}, {X: 0, Z: 0},
			{X: 0, Z: 0}, {X: width, Z: 0}, {X: width, Z: height}, {X: 0, Z: height}},
		Blocks: []mesh.Block{
			{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{5, 3}, Region: "lower", Sides: [4]string{"lower_bottom", "", "lower_top", "lower_left"}},
			{Corners: [4]int{4, 5, 6, 7}, Divisions: [2]int{7, 3}, Region: "upper", Sides: [4]string{"upper_bottom", "", "upper_top", "upper_left"}},
		},
		Regions: []mesh.Region{{Name: "lower", Thickness: 1, Material: "steel"}, {Name: "upper", Thickness: 1, Material: "soft"}},
	}
	msh, err := mesh.Build(plan, mesh.Quad8)
	if err != nil {
		t.Fatal(err)
	}
	steel, soft := material.Elastic{E: 210000, Nu: 0.3}, material.Elastic{E: 30000, Nu: 0.45}
	m, err := NewModel(msh, map[string]material.Law{"steel": steel, "soft": soft}, Options{Condition: material.PlaneStress})
	if err != nil {
		t.Fatal(err)
	}
	for _, set := range []string{"lower_left", "upper_left"} {
		if err := m.FixSet(set, X, 0); err != nil {
			t.Fatal(err)
		}
	}
	if err := m.FixSet("lower_bottom", Z, 0); err != nil {
		t.Fatal(err)
	}
	edge, err := m.AddRigidEdge("upper_top", mesh.Point{X: width / 2, Z: height}, RigidEdgeOptions{FixRotation: true, LateralFree: true})
	if err != nil {
		t.Fatal(err)
	}
	if err := m.Fix(edge.Axial, 0); err != nil {
		t.Fatal(err)
	}
	set := contact.Settings{Penalty: 1e3 * steel.E / height, Friction: 0.02, Tolerance: 1e-3,
		SymmetricTangent: true, SmallSliding: true, NoSlidingStiffness: true}
	pair, err := NewContactPair("blocks", msh, "upper_bottom", "lower_top", set, nil, func(x, z float64) float64 { return 1 })
	if err != nil {
		t.Fatal(err)
	}
	return m, []ContactPair{pair}, edge
}

// denseDirection solves the whole current tangent, sliding couplings
// included, densely: the reference for the contact-space solve.
func denseDirection(t *testing.T, s *Solver, r []float64) []float64 {
	t.Helper()
	if err := s.wholeTangent(); err != nil {
		t.Fatal(err)
	}
	n := len(r)
	a := mat.NewDense(n, n, nil)
	e := make([]float64, n)
	col := make([]float64, n)
	for j := range n {
		clear(e)
		e[j] = 1
		if err := s.mulTangent(col, e); err != nil {
			t.Fatal(err)
		}
		for i := range n {
			a.Set(i, j, col[i])
		}
	}
	var x mat.VecDense
	if err := x.SolveVec(a, mat.NewVecDense(n, append([]float64(nil), r...))); err != nil {
		t.Fatal(err)
	}
	return x.RawVector().Data
}

// TestContactDirectionIsExact: for a model linear apart from contact the
// Newton direction through the contact equations (an old factor, the
// change of the contact stiffness and the sliding couplings solved on the
// contact equations alone) is the solution of the whole current tangent,
// block elimination being exact (Golub & Van Loan, Matrix Computations,
// §3.2.10).
func TestContactDirectionIsExact(t *testing.T) {
	m, pairs, edge := frictionBlocks(t)
	s, err := NewSolver(m, pairs, NewtonOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Ramp(edge.Axial, -0.01, RampOptions{Increments: 2}, func(Increment) (bool, error) { return false, nil }); err != nil {
		t.Fatal(err)
	}
	if s.cs == nil {
		t.Fatal("no contact space for an elastic model with contact")
	}
	// A further push changes the contact stiffness since the last
	// factorization; keep that factor and solve with it.
	if err := m.SetValue(edge.Axial, -0.03); err != nil {
		t.Fatal(err)
	}
	s.applyPrescribed()
	if err := s.ensurePattern(); err != nil {
		t.Fatal(err)
	}
	// Assembled twice: at the first evaluation after the push the sliding
	// points' slip may turn round (it stands at the Coulomb limit), and a
	// point whose slip turned is linearised as sticking, without a
	// coupling (package contact).
	for range 2 {
		if err := s.assemble(true); err != nil {
			t.Fatal(err)
		}
	}
	s.coupled = true
	if len(s.couplings) == 0 {
		t.Fatal("no sliding couplings: the case does not test them")
	}
	fext, err := m.externalForces()
	if err != nil {
		t.Fatal(err)
	}
	r := m.freeResidual(fext, s.fint)
	want := denseDirection(t, s, r)
	check := func(what string, interiorBelow float64) {
		t.Helper()
		du := make([]float64, len(r))
		if err := s.contactDirection(du, r, 1e-12, interiorBelow); err != nil {
			t.Fatal(err)
		}
		num, den := 0.0, 0.0
		for i := range du {
			num += (du[i] - want[i]) * (du[i] - want[i])
			den += want[i] * want[i]
		}
		if d := math.Sqrt(num / den); d > 1e-8 {
			t.Errorf("%s: contact-space direction differs from the dense solve by %.3g (relative)", what, d)
		}
	}
	factorizations := s.Timing.Factorizations
	check("old factor", 0)
	// The contact block refactorized alone (the elements' Schur
	// complement plus the current contact stiffness) serves as a new
	// factorization of the whole tangent would.
	s.cs.refresh = true
	check("contact block refactorized", 0)
	if !s.cs.dense || s.Timing.ContactFactorizations == 0 {
		t.Error("the contact block was not refactorized")
	}
	if s.Timing.Factorizations != factorizations {
		t.Errorf("%d factorizations of the whole tangent, want none", s.Timing.Factorizations-factorizations)
	}

	// A residual in the contact equations alone is solved without the
	// forward solve (the interior is in balance after a step).
	for q := range r {
		if s.cs.at[q] < 0 {
			r[q] = 0
		}
	}
	want = denseDirection(t, s, r)
	check("interior in balance", 1e-300)
}
