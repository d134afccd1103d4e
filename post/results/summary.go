package results

import (
	"encoding/json"
	"os"
	"path/filepath"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/figures"
	"flangeseg/post"
	"flangeseg/post/handcalc"
)

// Summary is summary.json.
type Summary struct {
	Title     string            `json:"title"`
	Model     string            `json:"model"`
	Caution   string            `json:"caution"`
	Converged bool              `json:"converged"`
	Ending    string            `json:"ending"`
	Failure   string            `json:"failure,omitempty"`
	Diagnosis string            `json:"diagnosis,omitempty"`
	Joint     figures.Joint     `json:"joint"`
	Mesh      MeshSummary       `json:"mesh"`
	Solver    SolverSummary     `json:"solver"`
	Hand      handcalc.Results  `json:"hand_methods"`
	Verdict   *handcalc.Verdict `json:"verdict,omitempty"` // with [load] design_force
}

// MeshSummary is the mesh of a run: its size and element quality.
type MeshSummary struct {
	Nodes            int     `json:"nodes"`
	Elements         int     `json:"elements"`
	Equations        int     `json:"equations"`
	Element          string  `json:"element"`
	MinJacobianRatio float64 `json:"min_jacobian_ratio"`
	MaxAspectRatio   float64 `json:"max_aspect_ratio"`
}

// SolverSummary counts the solver's work. Wall-clock times are not in it:
// they differ from run to run and would make the run directory differ, so
// the command prints them on the terminal.
type SolverSummary struct {
	Increments       int `json:"increments"`
	NewtonIterations int `json:"newton_iterations"`
	Factorizations   int `json:"factorizations"`
	// ContactFactorizations: of the contact equations' block alone, in a
	// model linear apart from contact (see fem's contact-space solve).
	ContactFactorizations int     `json:"contact_block_factorizations"`
	KrylovSteps           int     `json:"krylov_steps"`
	PenaltyMPaPerMM       float64 `json:"contact_penalty_MPa_per_mm"`
	PreloadSolves         int     `json:"preload_solves"`
	FieldStatesWritten    int     `json:"field_states"`
}

// NewSummary is the summary of a run of the model file at path.
func NewSummary(path string, r *segment.Result) Summary {
	q := r.Segment.Mesh().Quality()
	s := Summary{
		Title: r.Segment.Spec().Title, Model: filepath.Base(path), Caution: post.Caution,
		Converged: r.Failure == nil, Ending: r.Ending, Joint: r.Figures, Hand: r.Segment.Hand(),
		Verdict: handcalc.CheckDesignForce(r.Segment.Hand(), r.Segment.Spec().Load.DesignForce, handcalc.DefaultBorderline),
		Mesh: MeshSummary{Nodes: len(r.Segment.Mesh().Nodes), Elements: len(r.Segment.Mesh().Elements), Equations: r.Equations,
			Element: r.Segment.Spec().Mesh.Element, MinJacobianRatio: q.MinJacobianRatio, MaxAspectRatio: q.MaxAspectRatio},
		Solver: SolverSummary{Increments: len(r.History) - 1, NewtonIterations: r.Timing.Iterations,
			Factorizations: r.Timing.Factorizations, ContactFactorizations: r.Timing.ContactFactorizations,
			KrylovSteps:     r.Timing.KrylovSteps,
			PenaltyMPaPerMM: r.Segment.Penalty(),
			PreloadSolves:   r.Preload.Iterations, FieldStatesWritten: len(r.FieldStates())},
	}
	if r.Failure != nil {
		s.Failure = r.Failure.Error()
		s.Diagnosis = r.Diagnosis
	}
	return s
}

// ReadSummary reads a run's summary.json.
func ReadSummary(path string) (Summary, error) {
	var s Summary
	data, err := os.ReadFile(path)
	if err != nil {
		return s, err
	}
	return s, json.Unmarshal(data, &s)
}
