// Package ring is the check of a whole bolted ring flange from a flatness
// survey: the survey file (gaps at the inner and outer edge of the face at
// measuring positions around the circle), each bolt's segment imperfection
// from it (radial taper, parallel gap, and the ring's resistance to
// closing that gap as a spring on the segment), the classes of bolts
// whose imperfections agree within a tolerance (one analysis each, run as
// the cases of a generated sweep plan), each bolt's segment force from
// the tower loads and their direction, and the per-bolt results: preload
// left after closing, gap left open, bolt-force function, stress range
// spectrum and damage (EN 1993-1-9, through post/fatigue/assess) beside
// the hand model's, written as ring.csv, ring.json, plots and a page.
//
//	s, err := ring.ReadSurvey(file, "survey.csv", spec.Tower.Bolts)
//	bolts, err := ring.Bolts(spec, s, ring.Options{})
//	p, err := ring.NewPlan(spec, "joint.toml", modelText, "survey.csv", ring.Options{}, bolts)
//	recs, err := sweep.Run(ctx, p.Cases, sweep.Options{Dir: dir})
//	res, err := ring.Evaluate(dir, p, recs, ring.FatigueOptions{Loads: "loads.csv"})
//	err = res.Write(dir)
//
// Input arguments are never modified. Results are deterministic.
package ring
