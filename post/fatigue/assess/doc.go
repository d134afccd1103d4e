// Package assess is the bolt fatigue assessment of a flange joint: the
// segment-force cycles of a load file (time series or range–mean tables,
// of the segment or of the tower section) go through bolt-force functions
// — the FE one from a run's history.csv, the hand trilinear and joint-
// diagram ones — to bolt stress ranges, summed by Palmgren–Miner on an S–N
// curve with γ_Mf. It writes fatigue_bins.csv, fatigue_blocks.csv,
// fatigue_summary.json and the plots; package post/fatigue supplies the
// counting, curves and damage.
//
//	job, err := assess.New(spec, "joint.toml", assess.Options{Loads: "loads.csv", Curve: assess.CurveEN1993Bolt, …})
//	err = job.Count()
//	err = job.Write("joint_fatigue")
//	d := job.Functions()[0].Damage() // the governing function's damage
package assess
