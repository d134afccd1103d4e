// Package note fills the calculation note, report.html (package
// post/report draws it), of one segment run and of a comparison of runs:
// the inputs with where each value comes from, the derived quantities
// with their rules, the preload, the joint figures, the FE beside the
// hand methods, the curves, the field pictures and the limits of the
// model. A run's note is built from its Result in memory; a comparison
// rebuilds each run's note from its run directory (package results).
//
//	sum, err := results.Write(dir, "joint.toml", res)
//	err = note.WriteRun(dir, "joint.toml", nil, res, sum)
package note
