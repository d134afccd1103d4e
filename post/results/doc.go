// Package results writes and reads a segment run's directory: the
// resolved model, history.csv (one row per converged state, the column
// names of the design card), summary.json (Summary: joint figures, hand
// methods, mesh and solver statistics), the load–response plots (SVG and
// PNG) and the fields of the kept states (fields/*.vtu, fields.pvd). A
// comparison reads a run back from its directory (ReadSummary,
// ReadHistory), so it needs no analysis in memory. Stage and
// Staging.Commit put a result directory in place whole, marked by
// MarkerFile; CheckOutDir refuses a directory that is not new, empty or
// an earlier result.
//
//	res, err := segment.Run(ctx, spec, segment.Options{})
//	sum, err := results.Write("joint_results", "joint.toml", res)
package results
