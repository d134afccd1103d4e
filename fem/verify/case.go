package verify

import (
	"fmt"
	"math"

	"flangeseg/fem"
	"flangeseg/fem/sparse"
	"flangeseg/mesh"
)

// Row is one checked quantity of a case.
type Row struct {
	Case      string
	Quantity  string
	Unit      string
	Computed  float64
	Reference float64
	// Error is the measure compared with Tolerance: the relative error
	// |computed − reference| / |reference| unless the case says otherwise in
	// Quantity (e.g. a maximum over all points).
	Error     float64
	Tolerance float64
	Source    string
}

// Pass reports whether the error is within the tolerance.
func (r Row) Pass() bool { return r.Error <= r.Tolerance && !math.IsNaN(r.Error) }

// Snapshot is a solved model kept for field output.
type Snapshot struct {
	Name     string
	Solution *fem.Solution
}

// Outcome is what a case produced.
type Outcome struct {
	Rows      []Row
	Snapshots []Snapshot
}

// Options tune how the cases run.
type Options struct {
	// Inspect, if set, receives every assembled system (see
	// fem.LinearOptions.Inspect) with the name of the solve.
	Inspect func(name string, k *sparse.Matrix, rhs []float64) error
}

// Case is one verification problem.
type Case struct {
	Name   string
	Source string
	Run    func(o Options) (*Outcome, error)
}

// Cases lists every verification problem in a fixed order.
func Cases() []Case {
	return []Case{
		{"patch", "Irons' patch test (constant-stress patch)", runPatch},
		{"cantilever", "Timoshenko & Gere: δ = PL³/(3EI) + PL/(κGA)", runCantilever},
		{"LE1", "The Standard NAFEMS Benchmarks (1990), LE1", runLE1},
		{"lame", "Lamé, Timoshenko & Goodier, Theory of Elasticity", runLame},
		{"kirsch", "Kirsch, Timoshenko & Goodier, Theory of Elasticity", runKirsch},
		{"hertz", "Hertz; K. L. Johnson, Contact Mechanics (1985)", runHertz},
		{"contact-patch", "contact patch test (Taylor & Papadopoulos 1991)", runContactPatch},
		{"elastica", "Bisshopp & Drucker (1945): elastica, elliptic integrals", runElastica},
		{"rotation", "objectivity requirement (any nonlinear FE text)", runRotation},
		{"hill", "R. Hill, The Mathematical Theory of Plasticity (1950): thick tube, Mises, plane strain", runHill},
		{"uniaxial", "the input curve itself (uniaxial bar, three kinematic settings)", runUniaxial},
	}
}

// relErr is |c − r| / |r|.
func relErr(c, r float64) float64 { return math.Abs(c-r) / math.Abs(r) }

// solve runs a linear solve and records its residual as a row.
func solve(o Options, out *Outcome, caseName, name string, m *fem.Model) (*fem.Solution, error) {
	opt := fem.LinearOptions{}
	if o.Inspect != nil {
		opt.Inspect = func(k *sparse.Matrix, rhs []float64) error { return o.Inspect(name, k, rhs) }
	}
	sol, err := m.SolveLinear(opt)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	out.Snapshots = append(out.Snapshots, Snapshot{Name: name, Solution: sol})
	out.Rows = append(out.Rows, Row{
		Case: caseName, Quantity: name + ": relative residual ‖Ku − f‖/‖f‖",
		Computed: sol.RelativeResidual, Error: sol.RelativeResidual, Tolerance: 1e-10,
		Source: "solver accuracy requirement",
	})
	return sol, nil
}

// buildMesh meshes a plan and runs the mesh checks (inverted elements,
// duplicate nodes) that every model goes through.
func buildMesh(p mesh.Plan, kind mesh.Kind) (*mesh.Mesh, error) {
	m, err := mesh.Build(p, kind)
	if err != nil {
		return nil, err
	}
	if err := m.Check(); err != nil {
		return nil, err
	}
	return m, nil
}

// fixSymmetry holds the symmetry cuts of a quarter model: the node set
// "symmetry_z" (on z = 0) in z and "symmetry_x" (on x = 0) in x.
func fixSymmetry(m *fem.Model) error {
	if err := m.FixSet("symmetry_z", fem.Z, 0); err != nil {
		return err
	}
	return m.FixSet("symmetry_x", fem.X, 0)
}
