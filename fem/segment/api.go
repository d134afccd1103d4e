package segment

import (
	"context"
	"fmt"

	"flangeseg/contact"
	"flangeseg/fem"
	"flangeseg/fem/segment/figures"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/fem/sparse"
	"flangeseg/mesh"
	"flangeseg/post/handcalc"
)

// Segment is one bolt segment turned into a finite-element model, ready to
// run (the analysis's own state is the unexported segment of analysis.go).
type Segment struct{ g *segment }

// Build meshes the joint of a valid model and sets up the finite-element
// model (supports, ring springs, the bolt's tie, the contact pairs, the
// loaded edge) and the hand methods beside it. A model the mesh refuses
// (beyond the model file's own rules) gives a *modelfile.Error.
func Build(spec *modelfile.Spec) (*Segment, error) {
	g, err := buildSegment(spec, spec.Derive())
	if err != nil {
		return nil, inputError(err)
	}
	return &Segment{g}, nil
}

// Spec is the model the segment was built from; do not modify it.
func (s *Segment) Spec() *modelfile.Spec { return s.g.spec }

// Derived are the model's derived quantities.
func (s *Segment) Derived() modelfile.Derived { return s.g.der }

// Mesh is the strip model's mesh.
func (s *Segment) Mesh() *mesh.Mesh { return s.g.mesh }

// Model is the finite-element model.
func (s *Segment) Model() *fem.Model { return s.g.model }

// Hand are the hand methods' results for the joint.
func (s *Segment) Hand() handcalc.Results { return s.g.hand }

// Zones are the contact zones of the flange face whose contact force the
// history records (Row.ZoneForce, in this order): the model's
// contact.zones, or the whole face as one zone.
func (s *Segment) Zones() []Zone {
	out := make([]Zone, len(s.g.zones))
	for i, z := range s.g.zones {
		out[i] = Zone{Name: z.name, From: z.x0, To: z.x1}
	}
	return out
}

// Zone is a band of the flange face, x ∈ [From, To] in mm.
type Zone struct {
	Name     string // "face", or "zone1", "zone2" … for contact.zones
	From, To float64
}

// Penalty is the contact penalty stiffness, MPa/mm.
func (s *Segment) Penalty() float64 { return s.g.penalty }

// SliceLength is the length of the bolt slice the preload shortens, mm.
func (s *Segment) SliceLength() float64 { return s.g.slice }

// Options are the choices of a run that do not come from the model file.
// Every callback may be nil; they are called from the goroutine that runs.
type Options struct {
	// Progress receives the increments of the tension stage done and
	// planned, after each converged increment.
	Progress func(done, all int)
	// Log receives the solver's lines: preload steps, increments,
	// halvings and Newton iterations.
	Log func(line string)
	// Inspect sees the first assembled tangent and residual.
	Inspect func(k *sparse.Matrix, rhs []float64) error
	// Keep says which increments keep their fields (nil: every one; the
	// preload and the last increment are always kept).
	Keep func(increment int) bool
}

// Result is what a run produced, up to its last converged increment.
type Result struct {
	Segment *Segment
	// History has one row per converged state: the preload, then each
	// increment of the tension stage.
	History []figures.Row
	// States are the converged states kept for field output.
	States []State
	// Figures are the joint figures and the failure mechanism read off
	// the history (Figures.FailureLocation names the mechanism).
	Figures figures.Joint
	Preload fem.PreloadResult
	// Ending says why the tension stage ended; Failure is non-nil when
	// the run stopped before its end (a stage did not converge, or ctx
	// ended: an *InterruptedError).
	Ending  string
	Failure error
	// Diagnosis says in words, when Failure is set, what happened, where,
	// what the out-of-balance force did and what to try.
	Diagnosis string
	// WashersHeldSticking: the washers were held sticking, not only
	// pressed, while the bolt was tightened: first for a joint whose
	// faces start apart, else where the preload with sliding washers
	// failed and the run was made again (see the preload stage).
	WashersHeldSticking bool
	Timing              fem.Timing
	Equations           int
}

// State is a converged state kept for field output.
type State struct {
	Label string // "preload", "increment 7" …
	Row   figures.Row
	// Solution holds the displacements and, for the states that get a
	// field file (Result.FieldStates) and for every state of a model with
	// path-dependent laws, the integration point results; a state of an
	// elastic model that gets none has nil Points (Solution.EvaluatePoints
	// computes them).
	Solution *fem.Solution
	// Contacts are the node results of the contact pairs "faces",
	// "head" and "nut".
	Contacts map[string][]contact.NodeResult
	// Plastic and Damage are the equivalent plastic strain and damage
	// indicator per element and integration point; nil with elastic laws,
	// and nil for an element whose law keeps none.
	Plastic, Damage [][]float64
}

// Run builds the segment of a valid model and analyses it: the preload,
// then the tension stage to its end. A stage that does not converge ends
// the run with the increments that did (Result.Failure). ctx ending is
// checked at the safe points — before and after the preload, after each
// increment, between the levels of the closing search: before the
// preload it is returned as the error (nothing has converged), later it
// ends the run with every converged state and an *InterruptedError as
// Result.Failure. A model that cannot be built is returned as the error.
func Run(ctx context.Context, spec *modelfile.Spec, opt Options) (*Result, error) {
	g, err := Build(spec)
	if err != nil {
		return nil, err
	}
	return g.Run(ctx, opt)
}

// Run analyses the segment, as Run does. A Segment runs once.
func (s *Segment) Run(ctx context.Context, opt Options) (*Result, error) {
	g := s.g
	g.stickWashers = g.facesStartApart()
	aopt := analyseOptions{inspect: opt.Inspect, log: opt.Log, progress: opt.Progress, keep: opt.Keep, stop: stopper(ctx)}
	a, err := g.analyse(aopt)
	if err != nil {
		return nil, err
	}
	if a.failure != nil && len(a.rows) == 0 {
		// The preload failed: once more, from a fresh model, with the
		// washers held the other way while the bolt is tightened.
		if opt.Log != nil {
			opt.Log(fmt.Sprintf("preload failed; once more with the washers %s while the bolt is tightened", washerHold(!g.stickWashers)))
		}
		again, err := buildSegment(g.spec, g.der)
		if err != nil {
			return nil, err
		}
		again.stickWashers = !g.stickWashers
		b, err := again.analyse(aopt)
		if err != nil {
			return nil, err
		}
		if b.failure == nil || len(b.rows) > 0 {
			b.timing = addTiming(a.timing, b.timing)
			b.retried = true
			s.g, g, a = again, again, b
		}
	}
	if gap, _, ok := g.gapAfterPreload(a); ok && gap <= closedGap && !IsInterrupted(a.failure) {
		// The faces closed: how much of the preload that took is looked
		// for apart from the analysis, which it leaves as it is.
		if a.closing, err = g.findClosing(a.preload.Force, aopt.stop, opt.Log); err != nil {
			if a.failure != nil {
				return nil, err
			}
			a.interrupt(err)
			a.closing.failed = fmt.Errorf("interrupted: %w", err)
		}
	}
	r := &Result{Segment: s, History: a.rows, Preload: a.preload, Ending: a.ending, Failure: a.failure, Diagnosis: a.diagnosis,
		WashersHeldSticking: g.stickWashers,
		Timing:              a.timing, Equations: a.equation, Figures: jointFigures(g, a)}
	for _, st := range a.states {
		r.States = append(r.States, State{Label: st.label, Row: st.row, Solution: st.solution, Contacts: st.contacts,
			Plastic: st.history.plastic, Damage: st.history.damage})
	}
	if err := r.EvaluateFieldPoints(); err != nil {
		return nil, err
	}
	return r, nil
}

// stopper is the analysis's stop callback: nil until ctx ends, then the
// cause of its end (context.Cause: the context's error, or what its
// canceller said, which wraps it).
func stopper(ctx context.Context) func() error {
	return func() error {
		if ctx.Err() == nil {
			return nil
		}
		return context.Cause(ctx)
	}
}

// addTiming sums the solver statistics of two attempts.
func addTiming(a, b fem.Timing) fem.Timing {
	b.Assembly += a.Assembly
	b.Contact += a.Contact
	b.Factorization += a.Factorization
	b.Analysis += a.Analysis
	b.Solve += a.Solve
	b.Iterations += a.Iterations
	b.Factorizations += a.Factorizations
	b.Analyses += a.Analyses
	b.KrylovSteps += a.KrylovSteps
	b.ContactFactorizations += a.ContactFactorizations
	return b
}

// washerHold says how the washers are held while the bolt is tightened.
func washerHold(stick bool) string {
	if stick {
		return "held sticking"
	}
	return "held pressed, free to slide"
}
