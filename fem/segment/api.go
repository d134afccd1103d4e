package segment

import (
	"flangeseg/fem"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/fem/sparse"
	"flangeseg/mesh"
	"flangeseg/post/handcalc"
)

// Segment is one bolt segment turned into a finite-element model, ready to
// run.
type Segment = segment

// Build meshes the joint of a valid model and sets up the finite-element
// model (supports, ring springs, the bolt's tie, the contact pairs, the
// loaded edge) and the hand methods beside it.
func Build(spec *modelfile.Spec) (*Segment, error) { return buildSegment(spec, spec.Derive()) }

// Spec is the model the segment was built from; do not modify it.
func (g *segment) Spec() *modelfile.Spec { return g.spec }

// Derived are the model's derived quantities.
func (g *segment) Derived() modelfile.Derived { return g.der }

// Mesh is the strip model's mesh.
func (g *segment) Mesh() *mesh.Mesh { return g.mesh }

// Model is the finite-element model.
func (g *segment) Model() *fem.Model { return g.model }

// Hand are the hand methods' results for the joint.
func (g *segment) Hand() handcalc.Results { return g.hand }

// Options are the choices of a run that do not come from the model file.
// Every callback may be nil.
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
	a       *analysis
}

// Analyse runs the preload and tension stages. A failure to converge ends
// the run but keeps every converged increment (Result.Failure); setup
// errors are returned.
func (g *segment) Analyse(opt Options) (*Result, error) {
	a, err := g.analyse(analyseOptions{inspect: opt.Inspect, log: opt.Log, progress: opt.Progress, keep: opt.Keep})
	if err != nil {
		return nil, err
	}
	return &Result{Segment: g, a: a}, nil
}

// Failure is why the run stopped before its end, or nil.
func (r *Result) Failure() error { return r.a.failure }

// Summary is summary.json.
type Summary = summary

// WriteResults writes every output file of a run into dir: the resolved
// model, history.csv, summary.json, report.html, the plots and the VTK
// fields. modelPath names the model file in them; text is the model's text
// when it is not on disk at modelPath, else nil.
func WriteResults(dir, modelPath string, text []byte, r *Result) (Summary, error) {
	return writeResults(dir, modelPath, text, r.Segment, r.a)
}

// WriteCompareReport writes dir/report.html, one note for the runs of a
// comparison (names, jobs and sums in the same order, the first the
// reference of every ratio), from their run directories.
func WriteCompareReport(dir string, names []string, jobs []ModelJob, sums []Summary) error {
	return writeCompareReport(dir, names, jobs, sums)
}

// ModelJob is one model of a demo or compare run.
type ModelJob struct {
	Spec *modelfile.Spec
	Path string // as the user named it, for messages
	Dir  string // its run directory
	Text []byte // the model's text when it is not on disk at Path (the embedded demo models), else nil
}

// ComparedColumns are the summary.json columns of the joint figures that
// the comparison note sets side by side, in its order.
func ComparedColumns() []string {
	var out []string
	for _, f := range comparedFigures() {
		out = append(out, f.column)
	}
	return out
}
