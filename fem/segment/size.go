package segment

import (
	"flangeseg/fem/segment/modelfile"
)

// Size is what a model will ask of the machine, estimated from its keys
// before anything is built (EstimateSize).
type Size struct {
	Elements, Nodes float64 // of the mesh (Nodes an upper bound, see mesh.FlangeSize)
	Equations       float64 // two per node
	States          int     // converged states whose fields are kept: the preload and every planned increment
	PeakBytes       float64 // peak resident memory of a run
}

// The memory model, calibrated on runs of the flat demo joint (quad8,
// small strain, elastic and elastoplastic, 2 750 to 101 000 equations, 3
// to 40 increments; peak resident memory by GNU time; BENCHMARKS.md
// "Memory estimate"): a fixed part, a part per equation (mesh, assembly,
// the sparse factor, the solver's vectors, the garbage collector's
// headroom) and a part per equation and kept state (its solution and
// stresses, and with plasticity the history of every integration point).
// The constants are the upper envelope of the measured peaks: the
// estimate is 1.15 to 1.7 times the measured peak.
const (
	baseBytes               = 40 << 20
	bytesPerEquation        = 8_000
	bytesPerEquationState   = 300 // elastic
	bytesPerEquationStatePl = 550 // elastoplastic
)

// EstimateSize counts the mesh of a valid model from its plan
// (mesh.FlangeSegment.PlanSize) and estimates the equations and the peak
// memory of a run. It builds nothing, so it is quick for a model of any
// size.
func EstimateSize(spec *modelfile.Spec) (Size, error) {
	fs, err := geometry(spec, spec.Derive()).PlanSize()
	if err != nil {
		return Size{}, inputError(err)
	}
	s := Size{Elements: fs.Elements, Nodes: fs.Nodes, Equations: 2 * fs.Nodes, States: spec.Load.Increments + 1}
	perState := bytesPerEquationState
	if spec.Analysis.Materials == modelfile.Elastoplastic {
		perState = bytesPerEquationStatePl
	}
	s.PeakBytes = baseBytes + s.Equations*(bytesPerEquation+float64(perState*s.States))
	if spec.Contact.Taper != 0 || spec.Contact.ParallelGap > 0 {
		// The closing search builds and solves a second model of the same
		// size while the analysis's states are kept (findClosing).
		s.PeakBytes += s.Equations * bytesPerEquation
	}
	return s, nil
}
