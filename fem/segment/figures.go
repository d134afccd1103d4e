package segment

import (
	"flangeseg/fem/segment/figures"
	"flangeseg/post/handcalc"
)

// handCurves samples the hand bolt-force models over [0, zmax] (N).
func handCurves(h handcalc.Results, zmax float64) (z, diagram, trilinear []float64) {
	const n = 60
	for i := 0; i <= n; i++ {
		x := zmax * float64(i) / n
		z = append(z, x/1e3)
		diagram = append(diagram, h.JointDiagram.Force(x)/1e3)
		trilinear = append(trilinear, h.Trilinear.Force(x)/1e3)
	}
	return z, diagram, trilinear
}

// jointFigures reads the joint figures and the failure mechanism off a
// run (package figures).
func jointFigures(g *segment, res *analysis) figures.Joint {
	// Both shell stubs stretch as bars, Z·L/(E·t·c) each.
	stub := 2 * g.spec.Shell.Length / (g.shellE * g.spec.Shell.Thickness * g.der.SegmentWidth)
	return figures.Read(res.rows, figures.Input{PreloadTarget: g.der.PreloadForce, PreloadReached: res.preload.Force,
		PreloadEigenstrain: res.preload.Eigenstrain, Hand: g.hand, ServiceForce: g.spec.Load.ServiceForce,
		StubElongation: stub, Yielding: g.model.HasHistory()})
}
