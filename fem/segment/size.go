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
// elastic and elastoplastic, 9 000 to 90 000 equations, 4 to 40
// increments; BENCHMARKS.md "Memory estimate"): a fixed part, a part per
// equation (mesh, assembly, the sparse factor, the solver's vectors and
// the garbage collector's headroom) and a part per equation and kept
// state (its solution, stresses and history). The constants are the
// upper envelope of the measured peaks, so the estimate errs high.
const (
	baseBytes                = 40 << 20
	bytesPerEquation         = 7_500
	bytesPerEquationAndState = 300
)

// EstimateSize counts the mesh of a valid model from its plan
// (mesh.FlangeSegment.PlanSize) and estimates the equations and the peak
// memory of a run. It builds nothing, so it is quick for a model of any
// size.
func EstimateSize(spec *modelfile.Spec) (Size, error) {
	fs, err := geometry(spec, spec.Derive()).PlanSize()
	if err != nil {
		return Size{}, err
	}
	s := Size{Elements: fs.Elements, Nodes: fs.Nodes, Equations: 2 * fs.Nodes, States: spec.Load.Increments + 1}
	s.PeakBytes = baseBytes + s.Equations*(bytesPerEquation+bytesPerEquationAndState*float64(s.States))
	return s, nil
}
