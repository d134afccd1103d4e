// Package segment is the finite-element analysis of one bolt segment of an
// L-flange joint: a valid model (package modelfile) becomes a strip-model
// mesh, a finite-element model with supports, ring springs and contact
// pairs (analysis.go, laws.go), then runs the preload and the tension
// stage (stages.go: analyse, preload, record) and returns the history,
// the kept states, the joint figures and the failure mechanism (package
// figures) in a Result.
//
//	spec, err := modelfile.Load("joint.toml")
//	res, err := segment.Run(ctx, spec, segment.Options{Progress: func(done, all int) { … }})
//	res.Figures.OpeningLoadKN, res.Figures.FailureLocation, res.History[i].Fs …
//
// Run returns an error when the model cannot be built or ctx ends before
// the preload has converged; a stage that does not converge, or ctx
// ending later, ends the run with the increments that did
// (Result.Failure; an *InterruptedError for ctx). EstimateSize says,
// before anything is built, how many equations and how much memory a
// model will take. Several runs may go on at once in one process, each
// on its own Spec; the Spec is not modified. Units are mm, N, MPa inside;
// the figures are in kN and kN/mm, as summary.json writes them.
package segment
