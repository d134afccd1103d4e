// Package report writes the calculation note of a run, report.html: one
// self-contained HTML file with inline SVG and CSS (no script, no font,
// image or style sheet from elsewhere) that reads like an engineering
// calculation note — numbered sections, a table of contents, units on
// every number and a source on every result, and the design-aid caution
// near the top and again at the end.
//
// The input is plain data filled in by the caller: a Report for one run,
// a Compare for several runs side by side. The package knows nothing of
// the finite-element model; it draws what it is given:
//
//	r := report.Report{
//		Title:     "Tower joint T3 — defined contact bands",
//		Model:     "t3-bands.toml",
//		Generated: "flangeseg 0.4.0, model file sha256 1f3c…",
//		Caution:   caution,
//		Inputs: []report.Quantities{{Caption: "Flange", Rows: []report.Quantity{
//			{Symbol: "t_f", Name: "flange thickness", Value: report.Num(84, "mm"), Source: "model file"},
//		}}},
//		Curves: []post.Plot{boltForce},
//	}
//	err := report.Write(filepath.Join(dir, "report.html"), r)
//
// Line charts are post.Plot values rendered by post.EncodeSVG. Fields
// (von Mises stress, plastic strain) and the joint drawing are drawn from
// the mesh: node coordinates x, z in mm and cells listing node numbers,
// corners counter-clockwise first, then any midside nodes (the order of
// mesh.Element). Outlines turns such a mesh into region outlines for the
// joint drawing.
//
// Colours of the field pictures follow a sequential scale of our own,
// interpolated in the OKLab colour space (Ottosson 2020) so that equal
// steps in value look like equal steps in colour; its lightness falls
// monotonically from the lowest to the highest value, so the picture
// also reads in grey.
//
// Output is deterministic: the same input gives a byte-identical file
// (fixed number formatting, no maps iterated, no clock read; the caller
// passes the Generated text). Input arguments are never modified.
package report
